package golden

import (
	"bufio"
	"bytes"
	"encoding/json"
	"fmt"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"sync"
)

// Status is the outcome of one golden check.
type Status string

// The outcomes of a check.
const (
	StatusEqual   Status = "equal"   // got matches the stored file; nothing written
	StatusChanged Status = "changed" // got differs; the check failed
	StatusMissing Status = "missing" // there is no stored file; the check failed
	StatusNew     Status = "new"     // update mode created the file
	StatusUpdated Status = "updated" // update mode rewrote the file
	StatusRefused Status = "refused" // an update was asked for but refused (CI); the check failed
	StatusInvalid Status = "invalid" // bad or reused name, unreadable file, failed write; the check failed
)

// Failed reports whether the check failed.
func (s Status) Failed() bool {
	switch s {
	case StatusEqual, StatusNew, StatusUpdated:
		return false
	}
	return true
}

// Record is one golden check, as written to the run records when
// PROOFSHEET_RECORDS names a directory: one JSON object per line, in files
// named records-*.jsonl there, one file per test process. Readers should
// ignore fields they do not know.
type Record struct {
	// Test is the name of the test that made the check.
	Test string `json:"test"`
	// Name is the golden name the check was given.
	Name string `json:"name"`
	// Kind is what the file holds: table, text or json.
	Kind FileKind `json:"kind"`
	// Status is the outcome.
	Status Status `json:"status"`
	// Path is the golden file, slash-separated and relative to the module
	// root (the directory of go.mod), or absolute outside a module; empty
	// when the name was refused.
	Path string `json:"path,omitempty"`
	// File is the golden file's absolute path, slash-separated.
	File string `json:"file,omitempty"`
	// Diff is, for a table that differs (changed, updated, refused), the
	// assert.Diff as its JSON method writes it.
	Diff json.RawMessage `json:"diff,omitempty"`
	// Detail is the failure message, for checks that failed.
	Detail string `json:"detail,omitempty"`
}

// recordFilePattern is the name pattern of run record files.
const recordFilePattern = "records-*.jsonl"

// recorder is the open run record file of this process. Writes are
// serialised by its mutex and each record is one Write of one line, so
// parallel tests never interleave; each process has its own file, so
// parallel test binaries never share one.
type recorder struct {
	mu  sync.Mutex
	dir string
	f   *os.File
}

var records recorder

// appendRecord writes r to the run records in dir (PROOFSHEET_RECORDS).
func appendRecord(dir string, r Record) error {
	line, err := json.Marshal(r)
	if err != nil {
		return fmt.Errorf("run record: %w", err)
	}
	line = append(line, '\n')
	records.mu.Lock()
	defer records.mu.Unlock()
	if records.f == nil || records.dir != dir {
		if records.f != nil {
			records.f.Close()
		}
		records.f, records.dir = nil, dir
		if err := os.MkdirAll(dir, 0o755); err != nil {
			return fmt.Errorf("run records (%s=%s): %w", EnvRecords, dir, err)
		}
		f, err := os.CreateTemp(dir, recordFilePattern)
		if err != nil {
			return fmt.Errorf("run records (%s=%s): %w", EnvRecords, dir, err)
		}
		records.f = f
	}
	if _, err := records.f.Write(line); err != nil {
		return fmt.Errorf("run records (%s=%s): %w", EnvRecords, dir, err)
	}
	return nil
}

// ReadRecords reads every run record file in dir (as written under
// PROOFSHEET_RECORDS) and returns the records sorted by Path, then Name,
// then Test; records of one check made several times (go test -count)
// keep their order. A line that is not a record is an error giving file
// and line.
func ReadRecords(dir string) ([]Record, error) {
	files, err := filepath.Glob(filepath.Join(dir, recordFilePattern))
	if err != nil {
		return nil, fmt.Errorf("golden: reading records: %w", err)
	}
	slices.Sort(files)
	var all []Record
	for _, file := range files {
		data, err := os.ReadFile(file)
		if err != nil {
			return nil, fmt.Errorf("golden: reading records: %w", err)
		}
		recs, err := parseRecords(file, data)
		if err != nil {
			return nil, err
		}
		all = append(all, recs...)
	}
	sortRecords(all)
	return all, nil
}

// parseRecords reads the records of one run record file, named file in
// errors.
func parseRecords(file string, data []byte) ([]Record, error) {
	var all []Record
	sc := bufio.NewScanner(bytes.NewReader(data))
	sc.Buffer(nil, len(data)+1)
	for n := 1; sc.Scan(); n++ {
		line := bytes.TrimSpace(sc.Bytes())
		if len(line) == 0 {
			continue
		}
		var r Record
		if err := json.Unmarshal(line, &r); err != nil {
			return nil, fmt.Errorf("golden: %s:%d: not a run record: %w", file, n, err)
		}
		all = append(all, r)
	}
	if err := sc.Err(); err != nil {
		return nil, fmt.Errorf("golden: %s: %w", file, err)
	}
	return all, nil
}

// sortRecords puts records in the order ReadRecords returns them.
func sortRecords(all []Record) {
	slices.SortStableFunc(all, func(a, b Record) int {
		if c := strings.Compare(a.Path, b.Path); c != 0 {
			return c
		}
		if c := strings.Compare(a.Name, b.Name); c != 0 {
			return c
		}
		return strings.Compare(a.Test, b.Test)
	})
}
