package main

import (
	"fmt"
	"io"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
	"time"

	"github.com/stretchr/testify/require"

	"github.com/proofsheet/proofsheet/fixtures"
)

// quietEnv is an env that discards the command's output.
func quietEnv() *env {
	return &env{stdout: io.Discard, stderr: io.Discard, getenv: func(string) string { return "" }}
}

// benchParquetPair writes two Parquet files of n rows that differ in one
// cell (row n/2, tmax) and returns their paths.
func benchParquetPair(b *testing.B, n int) (string, string) {
	b.Helper()
	schema := fixtures.Schema{
		fixtures.Col("id", fixtures.Int64),
		fixtures.Col("house", fixtures.String),
		fixtures.Col("day", fixtures.Date),
		fixtures.Col("tmax", fixtures.Float64),
		fixtures.Col("kept", fixtures.Int64),
	}
	houses := []string{"Étang", "Les Pins", "Mühlbach", "Søndergård", "Quinta do Açude"}
	build := func(changed bool) *fixtures.Table {
		bl := fixtures.NewBuilder(schema)
		for i := 0; i < n; i++ {
			tmax := 10 + float64(i%977)/8
			if changed && i == n/2 {
				tmax += 0.25
			}
			day := fmt.Sprintf("2026-%02d-%02d", 1+i%12, 1+i%28)
			bl.Row(int64(i), houses[i%len(houses)], day, tmax, int64(100+i%50))
		}
		tb, err := bl.Build()
		if err != nil {
			b.Fatal(err)
		}
		return tb
	}
	dir := b.TempDir()
	want, got := filepath.Join(dir, "want.parquet"), filepath.Join(dir, "got.parquet")
	if err := fixtures.WriteFile(want, build(false)); err != nil {
		b.Fatal(err)
	}
	if err := fixtures.WriteFile(got, build(true)); err != nil {
		b.Fatal(err)
	}
	return want, got
}

// BenchmarkDiffParquet runs the diff command in-process on two 1M-row
// Parquet files that differ in one cell, next to the peer: loading both
// files with fixtures.ReadFile. The target is a ratio ≤ 2.
//
//	go test ./cmd/proofsheet -run '^$' -bench DiffParquet -benchtime 3x
func BenchmarkDiffParquet(b *testing.B) {
	want, got := benchParquetPair(b, 1_000_000)
	for _, mode := range []struct {
		name string
		args []string
	}{
		{"by-position", nil},
		{"by-key", []string{"--key", "id"}},
	} {
		b.Run(mode.name, func(b *testing.B) {
			c := diffCommand()
			args := append(append([]string{}, mode.args...), want, got)
			var load, diff time.Duration
			for b.Loop() {
				t0 := time.Now()
				for _, p := range []string{want, got} {
					if _, _, err := fixtures.ReadFile(p); err != nil {
						b.Fatal(err)
					}
				}
				t1 := time.Now()
				if code := c.run(quietEnv(), args); code != exitDiffers {
					b.Fatalf("diff exited %d, want %d", code, exitDiffers)
				}
				load += t1.Sub(t0)
				diff += time.Since(t1)
			}
			b.ReportMetric(float64(diff)/float64(load), "x-vs-load")
			b.ReportMetric(load.Seconds()/float64(b.N), "load-s")
			b.ReportMetric(diff.Seconds()/float64(b.N), "diff-s")
		})
	}
}

// BenchmarkChanges50 runs the changes command in-process, to HTML, on a git
// repository where 50 golden tables of 500 rows changed. The target is
// under 2 seconds a review.
//
//	go test ./cmd/proofsheet -run '^$' -bench Review50 -benchtime 3x
func BenchmarkChanges50(b *testing.B) {
	old, cur := map[string]string{}, map[string]string{}
	for f := 0; f < 50; f++ {
		var ob, nb strings.Builder
		head := "# proofsheet sheet v1\n# keys: house, day\n# rows: 500\nhouse:string | day:date | tmax:float64 | kept:int64\n"
		ob.WriteString(head)
		nb.WriteString(head)
		for i := 0; i < 500; i++ {
			day := fixtures.FormatDate(int32(20500 + i%7))
			tmax := 10 + float64(i%97)/4
			fmt.Fprintf(&ob, "house-%03d | %s | %g | %d\n", i, day, tmax, 100+i%50)
			if i%10 == f%10 { // a tenth of the rows change
				tmax += 0.5
			}
			fmt.Fprintf(&nb, "house-%03d | %s | %g | %d\n", i, day, tmax, 100+i%50)
		}
		name := fmt.Sprintf("pkg/testdata/report-%02d.gold.tbl", f)
		old[name], cur[name] = ob.String(), nb.String()
	}
	repo := newRepo(b, old)
	writeTree(b, repo, cur)
	b.Chdir(repo)
	c := changesCommand()
	var total time.Duration
	for b.Loop() {
		t0 := time.Now()
		if code := c.run(quietEnv(), []string{"--format", "html"}); code != exitDiffers {
			b.Fatalf("changes exited %d, want %d", code, exitDiffers)
		}
		total += time.Since(t0)
	}
	b.ReportMetric(total.Seconds()/float64(b.N), "s/summary")
	b.ReportMetric(total.Seconds()/float64(b.N)/2, "x-vs-2s")
}

// TestWriteMemoryBenchFiles writes the Parquet files README.md's memory
// figures of proofsheet diff are measured on, into the directory named by
// PROOFSHEET_MEMORY_FILES (the test does nothing without it):
//
//	big-want.parquet, big-got.parquet   2.2M rows × 8 columns, 134 MB
//	                                    decoded each, one cell apart
//	want.parquet, shuffled.parquet      1M rows × 5 columns, 45 MB decoded
//	                                    each, the same rows in another
//	                                    order (every cell differs by
//	                                    position)
//
// then, for example:
//
//	/usr/bin/time -v proofsheet diff --quiet DIR/big-want.parquet DIR/big-got.parquet
//	/usr/bin/time -v proofsheet diff --quiet --max-cells -1 --format json --out /tmp/d.json DIR/want.parquet DIR/shuffled.parquet
//
// and the peer, Arrow's own Parquet reader holding both tables
// (TestArrowReadsBoth in fixtures/parquet).
func TestWriteMemoryBenchFiles(t *testing.T) {
	dir := os.Getenv("PROOFSHEET_MEMORY_FILES")
	if dir == "" {
		t.Skip("set PROOFSHEET_MEMORY_FILES=DIR to write the files")
	}
	houses := []string{"Étang", "Les Pins", "Mühlbach", "Søndergård", "Quinta do Açude"}
	status := []string{"ok", "fault", "calibrating"}
	big := func(changed bool) *fixtures.Table {
		b := fixtures.NewBuilder(fixtures.Schema{
			fixtures.Col("id", fixtures.Int64), fixtures.Col("house", fixtures.String), fixtures.Col("day", fixtures.Date),
			fixtures.Col("tmin", fixtures.Float64), fixtures.Col("tmax", fixtures.Float64), fixtures.Col("tmean", fixtures.Float64),
			fixtures.Col("kept", fixtures.Int64), fixtures.Col("status", fixtures.Category),
		})
		rng := rand.New(rand.NewPCG(1, 2))
		n := 2_200_000
		for i := range n {
			tmax := 10 + float64(i%977)/8
			if changed && i == n/2 {
				tmax += 0.25
			}
			day := fmt.Sprintf("2026-%02d-%02d", 1+i%12, 1+i%28)
			b.Row(int64(i), houses[i%len(houses)]+strconv.Itoa(i%100), day, tmax-5, tmax, tmax-2.5+float64(rng.IntN(4))/4, int64(100+i%50), status[i%3])
		}
		return b.MustBuild(t)
	}
	perm := rand.New(rand.NewPCG(3, 4)).Perm(1_000_000)
	small := func(order func(int) int) *fixtures.Table {
		b := fixtures.NewBuilder(fixtures.Schema{
			fixtures.Col("id", fixtures.Int64), fixtures.Col("house", fixtures.String), fixtures.Col("day", fixtures.Date),
			fixtures.Col("tmax", fixtures.Float64), fixtures.Col("kept", fixtures.Int64),
		})
		for k := range 1_000_000 {
			i := order(k)
			day := fmt.Sprintf("2026-%02d-%02d", 1+i%12, 1+i%28)
			b.Row(int64(i), houses[i%len(houses)]+strconv.Itoa(i%1000), day, 10+float64(i%977)/8+float64(i%7)/64, int64(100+i%50))
		}
		return b.MustBuild(t)
	}
	for name, tb := range map[string]*fixtures.Table{
		"big-want.parquet": big(false),
		"big-got.parquet":  big(true),
		"want.parquet":     small(func(k int) int { return k }),
		"shuffled.parquet": small(func(k int) int { return perm[k] }),
	} {
		require.NoError(t, fixtures.WriteFile(filepath.Join(dir, name), tb))
		t.Logf("%s: %d rows, %d bytes decoded", name, tb.NumRows(), tb.BufferBytes())
	}
}
