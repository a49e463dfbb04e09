package main

import (
	"context"
	"database/sql"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strconv"
	"testing"
	"time"

	"github.com/stretchr/testify/require"

	"github.com/proofsheet/proofsheet/assert"
	"github.com/proofsheet/proofsheet/assert/pushdown/duckdb"
)

// The out-of-core measurement: two Parquet files of N readings each
// (N = PROOFSHEET_OOC_ROWS, default 20 000 000), made by the generator
// below, compared by `proofsheet diff --engine duckdb --memory-limit
// 300MB` under /usr/bin/time -v. It checks the Diff's counts against the
// differences the generator put in, that peak RSS stays under 1 GB, and,
// on a 1M-row sample made by the same generator, that the engine's Diff
// is the in-memory Diff. It writes about 240 MB of files and spills to disk, so it runs
// only when asked:
//
//	PROOFSHEET_OOC=1 go test ./cmd/proofsheet -run '^$' -bench DiffDuckDBOutOfCore -benchtime 1x -timeout 60m

// oocRows is N.
func oocRows() int64 {
	if s := os.Getenv("PROOFSHEET_OOC_ROWS"); s != "" {
		n, err := strconv.ParseInt(s, 10, 64)
		if err == nil && n >= 1_000_000 {
			return n / 1_000_000 * 1_000_000
		}
	}
	return 20_000_000
}

// oocGenerate writes want.parquet and got.parquet of n readings into dir.
// Row i of want is reading id i; got lacks ids with i % 1e6 = 17, has n/1e6
// ids of its own, and is shuffled; got's temp_c is off by 1e-3 where
// i % 1000 = 3 and by 1e-9 (within the tolerance) where i % 7 = 0; its
// kept is off by one where i % 100000 = 5.
func oocGenerate(b testing.TB, dir string, n int64) (want, got string) {
	require.NoError(b, os.MkdirAll(dir, 0o755))
	db, err := duckdb.Open(duckdb.Options{MemoryLimit: "2GB", TempDir: filepath.Join(dir, "gen-tmp")})
	require.NoError(b, err)
	defer db.Close()
	want, got = filepath.Join(dir, "want.parquet"), filepath.Join(dir, "got.parquet")
	row := `i AS id, 'house-' || CAST(i % 977 AS VARCHAR) AS house, TIMESTAMP '2025-01-01 00:00:00' + to_seconds(i) AS at`
	wantSQL := fmt.Sprintf(`COPY (SELECT %s, CAST(i %% 100003 AS DOUBLE) * 0.001 AS temp_c, (i * 7) %% 1000 AS kept
		FROM range(%d) t(i)) TO '%s' (FORMAT parquet, COMPRESSION zstd)`, row, n, want)
	gotSQL := fmt.Sprintf(`COPY (SELECT * FROM (
		SELECT %s,
			CAST(i %% 100003 AS DOUBLE) * 0.001 + CASE WHEN i %% 1000 = 3 THEN 1e-3 WHEN i %% 7 = 0 THEN 1e-9 ELSE 0 END AS temp_c,
			(i * 7) %% 1000 + CASE WHEN i %% 100000 = 5 THEN 1 ELSE 0 END AS kept
		FROM range(%d) t(i) WHERE i %% 1000000 <> 17
		UNION ALL
		SELECT %s, 1.5 AS temp_c, 1 AS kept FROM range(%d, %d) t(i)
	) ORDER BY (id * 48271) %% 2147483647) TO '%s' (FORMAT parquet, COMPRESSION zstd)`, row, n, row, n, n+n/1_000_000, got)
	for _, q := range []string{wantSQL, gotSQL} {
		_, err := db.ExecContext(context.Background(), q)
		require.NoError(b, err)
	}
	return want, got
}

// oocExpected is what the generator put in: missing and extra rows and
// the differing cells of temp_c (beyond 1e-6) and kept.
func oocExpected(n int64) (missing, extra, temp, kept int) {
	for i := int64(0); i < n; i++ {
		if i%1_000_000 == 17 {
			missing++
			continue
		}
		if i%1000 == 3 {
			temp++
		}
		if i%100000 == 5 {
			kept++
		}
	}
	return missing, int(n / 1_000_000), temp, kept
}

var oocArgs = []string{"--key", "id", "--tol", "temp_c=abs:1e-6", "--format", "json"}

// timed runs the binary under /usr/bin/time -v and returns its stdout,
// exit code, wall time and peak RSS in bytes.
func timed(b testing.TB, args ...string) (string, int, time.Duration, int64) {
	cmd := exec.Command("/usr/bin/time", append([]string{"-v", binPath}, args...)...)
	var so, se []byte
	start := time.Now()
	so, err := cmd.Output()
	took := time.Since(start)
	code := 0
	if ee, ok := err.(*exec.ExitError); ok {
		code, se = ee.ExitCode(), ee.Stderr
	} else {
		require.NoError(b, err)
	}
	m := regexp.MustCompile(`Maximum resident set size \(kbytes\): (\d+)`).FindSubmatch(se)
	require.NotNil(b, m, "no RSS from /usr/bin/time: %s", se)
	kb, _ := strconv.ParseInt(string(m[1]), 10, 64)
	return string(so), code, took, kb * 1024
}

func BenchmarkDiffDuckDBOutOfCore(b *testing.B) {
	if os.Getenv("PROOFSHEET_OOC") != "1" {
		b.Skip("set PROOFSHEET_OOC=1 to write ~1.2 GB of Parquet and measure the out-of-core diff")
	}
	if !duckdb.Available {
		b.Skip(duckdb.ErrNotBuilt)
	}
	if _, err := os.Stat("/usr/bin/time"); err != nil {
		b.Skip("needs GNU time at /usr/bin/time for the peak RSS")
	}
	dir := b.TempDir()
	// The 1M-row sample: the engine's Diff is the in-memory Diff.
	sw, sg := oocGenerate(b, filepath.Join(dir, "sample"), 1_000_000)
	mem, code, memTook, memRSS := timed(b, append(append([]string{"diff"}, oocArgs...), sw, sg)...)
	require.Equal(b, exitDiffers, code)
	eng, code, engTook, engRSS := timed(b, append(append([]string{"diff", "--engine", "duckdb", "--memory-limit", "300MB"}, oocArgs...), sw, sg)...)
	require.Equal(b, exitDiffers, code)
	require.Equal(b, mem, eng, "1M-row sample: the engine's Diff differs from the in-memory one")
	b.Logf("1M-row sample: in memory %v, peak RSS %d MB; duckdb %v, peak RSS %d MB", memTook.Round(time.Second), memRSS>>20, engTook.Round(time.Second), engRSS>>20)

	n := oocRows()
	genStart := time.Now()
	w, g := oocGenerate(b, filepath.Join(dir, "full"), n)
	wi, err := os.Stat(w)
	require.NoError(b, err)
	gi, err := os.Stat(g)
	require.NoError(b, err)
	b.Logf("%d rows: want.parquet %d MB, got.parquet %d MB, made in %v", n, wi.Size()>>20, gi.Size()>>20, time.Since(genStart).Round(time.Second))
	b.ResetTimer()
	for range b.N {
		out, code, took, rss := timed(b, append(append([]string{"diff", "--engine", "duckdb", "--memory-limit", "300MB", "--temp-dir", filepath.Join(dir, "spill")}, oocArgs...), w, g)...)
		require.Equal(b, exitDiffers, code)
		d, err := assert.DiffFromJSON([]byte(regexp.MustCompile(`(?m)^  "schema_version": \d+,\n`).ReplaceAllString(out, "")))
		require.NoError(b, err)
		missing, extra, temp, kept := oocExpected(n)
		require.Equal(b, int(n), d.WantRows)
		require.Equal(b, missing, d.Missing.Count)
		require.Equal(b, extra, d.Extra.Count)
		for _, c := range d.Columns {
			switch c.Name {
			case "temp_c":
				require.Equal(b, temp, c.Differing)
			case "kept":
				require.Equal(b, kept, c.Differing)
			}
		}
		b.Logf("%d rows: duckdb --memory-limit 300MB took %v, peak RSS %d MB", n, took.Round(time.Second), rss>>20)
		b.ReportMetric(float64(rss)/(1<<20), "peakRSS-MB")
		b.ReportMetric(float64(rss)/float64(1<<30), "RSS/1GB")
		b.ReportMetric(took.Seconds(), "s/diff")
		require.LessOrEqual(b, rss, int64(1<<30), "peak RSS over 1 GB")
	}
}

// BenchmarkDiffAcrossPostgresParquet measures the merge across two places
// at 1M and 10M rows: WANT a PostgreSQL table, GOT a Parquet file that
// DuckDB reads, both streamed in key order into one proofsheet process.
// Its peak RSS should not grow with the row count. It needs the
// PostgreSQL of .ci/servers and writes ~300 MB:
//
//	PROOFSHEET_ACROSS=1 go test ./cmd/proofsheet -run '^$' -bench DiffAcrossPostgresParquet -benchtime 1x -timeout 60m
func BenchmarkDiffAcrossPostgresParquet(b *testing.B) {
	if os.Getenv("PROOFSHEET_ACROSS") != "1" {
		b.Skip("set PROOFSHEET_ACROSS=1 (and PROOFSHEET_POSTGRES_URL) to measure the merge across two places")
	}
	url := os.Getenv("PROOFSHEET_POSTGRES_URL")
	if url == "" || !duckdb.Available {
		b.Skip("needs PROOFSHEET_POSTGRES_URL and a build with cgo")
	}
	db, err := sql.Open("pgx", url)
	require.NoError(b, err)
	defer db.Close()
	dir := b.TempDir()
	var rss []int64
	for _, n := range []int64{1_000_000, 10_000_000} {
		table := fmt.Sprintf("across_want_%d_%d", n, time.Now().UnixNano())
		_, err := db.Exec(fmt.Sprintf(`CREATE TABLE %s AS SELECT i AS id, 'house-' || (i %% 977) AS house,
			TIMESTAMP '2025-01-01 00:00:00' + i * INTERVAL '1 second' AS at,
			CAST(i %% 100003 AS DOUBLE PRECISION) * CAST(0.001 AS DOUBLE PRECISION) AS temp_c, (i * 7) %% 1000 AS kept
			FROM generate_series(0, %d) AS t(i)`, table, n-1))
		require.NoError(b, err)
		defer db.Exec("DROP TABLE " + table)
		_, g := oocGenerate(b, filepath.Join(dir, fmt.Sprint(n)), n)
		b.ResetTimer()
		out, code, took, peak := timed(b, "diff", "--want-engine", url, "--got-engine", "duckdb", "--memory-limit", "300MB",
			"--key", "id", "--tol", "temp_c=abs:1e-6", "--format", "json", table, g)
		b.StopTimer()
		require.Equal(b, exitDiffers, code, out)
		d, err := assert.DiffFromJSON([]byte(regexp.MustCompile(`(?m)^  "schema_version": \d+,\n`).ReplaceAllString(out, "")))
		require.NoError(b, err)
		missing, extra, temp, kept := oocExpected(n)
		require.Equal(b, missing, d.Missing.Count)
		require.Equal(b, extra, d.Extra.Count)
		for _, c := range d.Columns {
			switch c.Name {
			case "temp_c":
				require.Equal(b, temp, c.Differing)
			case "kept":
				require.Equal(b, kept, c.Differing)
			}
		}
		b.Logf("%d rows: PostgreSQL table against Parquet file took %v, peak RSS %d MB", n, took.Round(time.Second), peak>>20)
		rss = append(rss, peak)
	}
	b.ReportMetric(float64(rss[0])/(1<<20), "peakRSS-1M-MB")
	b.ReportMetric(float64(rss[1])/(1<<20), "peakRSS-10M-MB")
	b.ReportMetric(float64(rss[1])/float64(rss[0]), "RSS10M/RSS1M")
}
