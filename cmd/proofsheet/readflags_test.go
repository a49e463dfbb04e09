package main

import (
	"bytes"
	"compress/gzip"
	"encoding/json"
	"errors"
	"os"
	"os/exec"
	"path/filepath"
	"testing"

	"github.com/apache/arrow-go/v18/arrow"
	"github.com/apache/arrow-go/v18/arrow/array"
	"github.com/apache/arrow-go/v18/arrow/ipc"
	"github.com/apache/arrow-go/v18/arrow/memory"
	pq "github.com/apache/arrow-go/v18/parquet"
	"github.com/apache/arrow-go/v18/parquet/pqarrow"
	"github.com/klauspost/compress/zstd"
	"github.com/stretchr/testify/require"

	"github.com/proofsheet/proofsheet/fixtures"
)

// runBinStdin runs the built binary with the given standard input.
func runBinStdin(t *testing.T, stdin []byte, args ...string) result {
	t.Helper()
	cmd := exec.Command(binPath, args...)
	cmd.Env = append(os.Environ(), "NO_COLOR=1")
	cmd.Stdin = bytes.NewReader(stdin)
	var so, se bytes.Buffer
	cmd.Stdout, cmd.Stderr = &so, &se
	err := cmd.Run()
	code := 0
	if err != nil {
		var ee *exec.ExitError
		require.True(t, errors.As(err, &ee), "run %v: %v", args, err)
		code = ee.ExitCode()
	}
	return result{code, so.String(), se.String()}
}

func TestParseTypes(t *testing.T) {
	s, err := parseTypes(`amount=decimal(12,2), day=date,"air temp"=float64,at=timestamp(ms,UTC),opens=time(s),vented=duration(ms)`)
	require.NoError(t, err)
	require.Equal(t, "amount:decimal(12,2), day:date, air temp:float64, at:timestamp(ms,UTC), opens:time(s), vented:duration(ms)", s.String())
	for spec, msg := range map[string]string{
		"":                     "no column declared",
		"amount":               `"amount": want NAME=TYPE`,
		"=int64":               `"=int64": want NAME=TYPE`,
		"a=int64,a=date":       `column "a" is declared twice`,
		"a=decimal(40,2)":      `column "a": type "decimal(40,2)": decimal precision 40 is outside 1..38`,
		`"unclosed=int64`:      "a quoted name must be a Go string literal",
		"a=int64,b=money(2,1)": `column "b": unknown column type "money(2,1)"`,
	} {
		_, err := parseTypes(spec)
		require.ErrorContains(t, err, msg, spec)
	}
}

func TestParseTypesFile(t *testing.T) {
	s, err := parseTypesFile("t.tbl", []byte("# money as decimal\n\n  amount:decimal(12,2) | day:date\n1.00 | 2026-04-01\n"))
	require.NoError(t, err)
	require.Equal(t, "amount:decimal(12,2), day:date", s.String())

	// The gen schema file of the demo declares the uploads' columns.
	data, err := os.ReadFile(repoFile("testdata", "greenhouse", "uploads.schema"))
	require.NoError(t, err)
	s, err = parseTypesFile("uploads.schema", data)
	require.NoError(t, err)
	require.NotEmpty(t, s)

	_, err = parseTypesFile("e.tbl", []byte("# nothing\n"))
	require.ErrorContains(t, err, "no column declared")
	_, err = parseTypesFile("e.tbl", []byte("a:money\n"))
	require.ErrorContains(t, err, "money")
}

func TestDiffDeclaredTypesAndStdin(t *testing.T) {
	dir := t.TempDir()
	want := filepath.Join(dir, "want.csv")
	require.NoError(t, os.WriteFile(want, []byte("id,amount,day\n1,10.10,2026-04-01\n2,0.30,2026-04-02\n"), 0o644))
	got := []byte(`{"id":1,"amount":10.1,"day":"2026-04-01"}` + "\n" + `{"id":2,"amount":0.3,"day":"2026-04-02"}` + "\n")
	gotPath := filepath.Join(dir, "got.jsonl")
	require.NoError(t, os.WriteFile(gotPath, got, 0o644))

	// Money declared as decimal in both files: compared exactly, as decimals.
	r := runBin(t, "", nil, "diff", "--format", "json", "--key", "id", "--types", "amount=decimal(12,2),day=date", want, gotPath)
	require.Equal(t, exitSame, r.code, r.stdout+r.stderr)
	var d struct {
		Equal bool `json:"equal"`
	}
	require.NoError(t, json.Unmarshal([]byte(r.stdout), &d))
	require.True(t, d.Equal)

	// The same through a types file, with GOT on standard input (JSON
	// Lines told by its bytes).
	typesFile := filepath.Join(dir, "money.tbl")
	require.NoError(t, os.WriteFile(typesFile, []byte("amount:decimal(12,2) | day:date\n"), 0o644))
	r = runBinStdin(t, got, "diff", "--key", "id", "--types-file", typesFile, want, "-")
	require.Equal(t, exitSame, r.code, r.stdout+r.stderr)

	// A cent off is a difference; a value with more decimals than the
	// declared scale is refused with where it is.
	got2 := bytes.Replace(got, []byte("10.1,"), []byte("10.11,"), 1)
	r = runBinStdin(t, got2, "diff", "--key", "id", "--types", "amount=decimal(12,2)", want, "-")
	require.Equal(t, exitDiffers, r.code, r.stdout+r.stderr)
	got3 := bytes.Replace(got, []byte("10.1,"), []byte("10.125,"), 1)
	r = runBinStdin(t, got3, "diff", "--key", "id", "--types", "amount=decimal(12,2)", want, "-")
	require.Equal(t, exitTrouble, r.code, r.stdout+r.stderr)
	require.Contains(t, r.stderr, `-:1:`)
	require.Contains(t, r.stderr, `"amount"`)

	// Standard input once only.
	r = runBinStdin(t, got, "diff", "-", "-")
	require.Equal(t, exitTrouble, r.code)
	require.Contains(t, r.stderr, "standard input can be read only once")
}

func TestProfileStdinCompressed(t *testing.T) {
	var gz bytes.Buffer
	w := gzip.NewWriter(&gz)
	w.Write([]byte("house;tmax\nÉtang;21,5\nVerger;19\n"))
	require.NoError(t, w.Close())
	r := runBinStdin(t, gz.Bytes(), "profile", "--format", "json", "--delimiter", ";", "--types", "tmax=string", "-")
	require.Equal(t, exitSame, r.code, r.stderr)
	var rep fixtures.LoadReport
	require.NoError(t, json.Unmarshal([]byte(r.stdout), &rep))
	require.Equal(t, "-", rep.Path)
	require.Equal(t, fixtures.CompressionGzip, rep.Compression)
	require.True(t, rep.FormatSniffed)
	require.Equal(t, fixtures.FormatCSV, rep.Format)
	require.Equal(t, 2, rep.Rows)
	require.Equal(t, fixtures.KindString, rep.Column("tmax").Kind)
	require.Equal(t, 1, rep.Column("tmax").Numbers.DecimalComma)

	// --json is --format json.
	r2 := runBinStdin(t, gz.Bytes(), "profile", "--json", "--delimiter", ";", "--types", "tmax=string", "-")
	require.Equal(t, r.stdout, r2.stdout)
}

// arrowRecord builds a small greenhouse record with Arrow's own builders.
func arrowRecord(t *testing.T) arrow.Record {
	t.Helper()
	sc := arrow.NewSchema([]arrow.Field{
		{Name: "house", Type: arrow.BinaryTypes.String, Nullable: true},
		{Name: "tmax", Type: arrow.PrimitiveTypes.Float64, Nullable: true},
	}, nil)
	b := array.NewRecordBuilder(memory.NewGoAllocator(), sc)
	defer b.Release()
	b.Field(0).(*array.StringBuilder).AppendValues([]string{"Étang", "Verger"}, nil)
	b.Field(1).(*array.Float64Builder).AppendValues([]float64{21.5, 19}, nil)
	return b.NewRecord()
}

// TestBinaryFormatsOnStdin reads standard input written by Arrow's own
// Parquet and IPC writers, plain and compressed with the zstd library and
// compress/gzip: the CLI tells the format by the magic numbers, or takes
// it from --input-format, which also reads a file whose name says nothing.
func TestBinaryFormatsOnStdin(t *testing.T) {
	rec := arrowRecord(t)
	defer rec.Release()
	tbl := array.NewTableFromRecords(rec.Schema(), []arrow.Record{rec})
	defer tbl.Release()
	var pqBuf bytes.Buffer
	// Source: Arrow's Parquet writer (parquet/pqarrow.WriteTable).
	require.NoError(t, pqarrow.WriteTable(tbl, &pqBuf, 1024, pq.NewWriterProperties(), pqarrow.DefaultWriterProps()))
	var ipcBuf bytes.Buffer
	// Source: Arrow's IPC stream writer (arrow/ipc.NewWriter).
	w := ipc.NewWriter(&ipcBuf, ipc.WithSchema(rec.Schema()))
	require.NoError(t, w.Write(rec))
	require.NoError(t, w.Close())
	enc, err := zstd.NewWriter(nil)
	require.NoError(t, err)
	zstdIPC := enc.EncodeAll(ipcBuf.Bytes(), nil)
	require.NoError(t, enc.Close())
	var gzPQ bytes.Buffer
	zw := gzip.NewWriter(&gzPQ)
	_, err = zw.Write(pqBuf.Bytes())
	require.NoError(t, err)
	require.NoError(t, zw.Close())

	dir := t.TempDir()
	want := filepath.Join(dir, "want.csv")
	require.NoError(t, os.WriteFile(want, []byte("house,tmax\nÉtang,21.5\nVerger,19\n"), 0o644))
	tests := []struct {
		name  string
		stdin []byte
		args  []string
		want  fixtures.Format
		comp  fixtures.Compression
	}{
		{"parquet by magic number", pqBuf.Bytes(), nil, fixtures.FormatParquet, ""},
		{"gzip-compressed parquet", gzPQ.Bytes(), nil, fixtures.FormatParquet, fixtures.CompressionGzip},
		{"zstd-compressed arrow stream", zstdIPC, nil, fixtures.FormatArrowStream, fixtures.CompressionZstd},
		{"parquet as told", pqBuf.Bytes(), []string{"--input-format", "parquet"}, fixtures.FormatParquet, ""},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			args := append(append([]string{"profile", "--json"}, tt.args...), "-")
			r := runBinStdin(t, tt.stdin, args...)
			require.Equal(t, exitSame, r.code, r.stderr)
			var rep fixtures.LoadReport
			require.NoError(t, json.Unmarshal([]byte(r.stdout), &rep))
			require.Equal(t, tt.want, rep.Format)
			require.Equal(t, tt.comp, rep.Compression)
			require.Equal(t, tt.args == nil, rep.FormatSniffed)
			require.Equal(t, 2, rep.Rows)

			if tt.args == nil { // --input-format would apply to want.csv too
				r = runBinStdin(t, tt.stdin, "diff", want, "-")
				require.Equal(t, exitSame, r.code, r.stdout+r.stderr)
			}
		})
	}

	// --input-format reads a file by the format given, whatever its name
	// or bytes say: a semicolon-separated file named .dat as TSV keeps
	// one column; and a wrong format is trouble that names the file.
	dat := filepath.Join(dir, "readings.dat")
	require.NoError(t, os.WriteFile(dat, []byte("house;tmax\nÉtang;21.5\n"), 0o644))
	r := runBin(t, "", nil, "profile", "--json", "--input-format", "tsv", dat)
	require.Equal(t, exitSame, r.code, r.stderr)
	var rep fixtures.LoadReport
	require.NoError(t, json.Unmarshal([]byte(r.stdout), &rep))
	require.Equal(t, fixtures.FormatTSV, rep.Format)
	require.Len(t, rep.Columns, 1)
	require.Equal(t, "house;tmax", rep.Columns[0].Name)
	r = runBin(t, "", nil, "profile", "--input-format", "parquet", dat)
	require.Equal(t, exitTrouble, r.code, r.stdout)
	require.Contains(t, r.stderr, dat)
}
