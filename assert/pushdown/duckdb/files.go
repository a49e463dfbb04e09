package duckdb

import (
	"errors"
	"fmt"
	"path/filepath"
	"strings"

	"github.com/proofsheet/proofsheet/assert/pushdown"
)

// Options are the limits of an in-memory DuckDB database.
type Options struct {
	// MemoryLimit caps the memory DuckDB's buffers take ("300MB", "2GB");
	// past it, joins and sorts spill to TempDir. Empty: DuckDB's default
	// (80 % of the machine's memory).
	MemoryLimit string
	// TempDir is where DuckDB spills. Empty: DuckDB's default.
	TempDir string
	// Threads caps DuckDB's worker threads (0: one per core).
	Threads int
}

// ErrNotBuilt is what Open returns in a build without cgo.
var ErrNotBuilt = errors.New("duckdb: this build has no DuckDB engine: it was built without cgo (CGO_ENABLED=0), and DuckDB is a C++ library; rebuild with CGO_ENABLED=1 and a C compiler, or use a PostgreSQL or ClickHouse engine")

// RowNumber is the column Files numbers the rows with.
const RowNumber = "ordinality"

// Files returns the relation of one or more files or globs of one format,
// which DuckDB reads where they lie, without loading them: CSV and TSV
// (.csv .tsv .txt .tab, types and delimiter sniffed by DuckDB), Parquet
// (.parquet .pq) or JSON (.json .jsonl .ndjson). Rows are numbered in
// file order (files in the order the patterns give them, a glob's files
// in name order), as proofsheet's own readers number them.
func Files(patterns ...string) (pushdown.Relation, error) {
	if len(patterns) == 0 {
		return pushdown.Relation{}, fmt.Errorf("duckdb: no file given")
	}
	reader := ""
	quoted := make([]string, len(patterns))
	for i, p := range patterns {
		r, err := readerFor(p)
		if err != nil {
			return pushdown.Relation{}, err
		}
		if reader != "" && r != reader {
			return pushdown.Relation{}, fmt.Errorf("duckdb: %s and %s are read by different readers (%s, %s); give files of one format", patterns[0], p, reader, r)
		}
		reader = r
		quoted[i] = quote(p)
	}
	q := "SELECT * FROM " + reader + "([" + strings.Join(quoted, ", ") + "]) WITH ORDINALITY"
	return pushdown.Query(q).NumberedBy(RowNumber), nil
}

func readerFor(path string) (string, error) {
	ext := strings.ToLower(filepath.Ext(path))
	for _, c := range []string{".gz", ".zst"} {
		if ext == c {
			ext = strings.ToLower(filepath.Ext(strings.TrimSuffix(path, filepath.Ext(path))))
		}
	}
	switch ext {
	case ".csv", ".tsv", ".txt", ".tab":
		return "read_csv", nil
	case ".parquet", ".pq":
		return "read_parquet", nil
	case ".json", ".jsonl", ".ndjson":
		return "read_json", nil
	}
	return "", fmt.Errorf("duckdb: %s: DuckDB reads .csv, .tsv, .txt, .tab, .parquet, .pq, .json, .jsonl and .ndjson files, not %q", path, ext)
}

// quote writes a string literal: DuckDB's strings double their quotes and
// treat backslashes as plain characters.
func quote(s string) string {
	return "'" + strings.ReplaceAll(s, "'", "''") + "'"
}
