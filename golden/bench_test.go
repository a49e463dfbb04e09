package golden

import (
	"fmt"
	"os"
	"path/filepath"
	"testing"
	"time"

	"github.com/proofsheet/proofsheet/assert"
	"github.com/proofsheet/proofsheet/fixtures"
)

// bigDaily is a demo-like daily table of n rows: 100 houses, n/100 days.
func bigDaily(b testing.TB, n int) *fixtures.Table {
	b.Helper()
	bl := fixtures.NewBuilder(fixtures.Schema{
		fixtures.Col("house", fixtures.String),
		fixtures.Col("day", fixtures.Date),
		fixtures.Col("tmin", fixtures.Float64),
		fixtures.Col("tmax", fixtures.Float64),
		fixtures.Col("tmean", fixtures.Float64),
		fixtures.Col("kept", fixtures.Int64),
	})
	start := time.Date(2020, 1, 1, 0, 0, 0, 0, time.UTC)
	for i := range n {
		h, d := i%100, i/100
		tmin := 2 + float64((i*37)%900)/100
		bl.Row(fmt.Sprintf("Serre %03d", h), start.AddDate(0, 0, d), tmin, tmin+11.3+float64(i%7)/3, tmin+5.65+float64(i%11)/7, 120+i%40)
	}
	return bl.MustBuild(b)
}

// BenchmarkTableUnchanged100k checks an unchanged 100k-row golden table
// and, in the same loop, the peer: reading the file (os.ReadFile and
// fixtures.ParseFile) plus assert.Compare with the same options. The
// x-vs-peer metric is golden time ÷ peer time (target ≤ 2).
func BenchmarkTableUnchanged100k(b *testing.B) {
	quietEnv(b, false)
	s := Store{Root: b.TempDir()}
	got := bigDaily(b, 100_000)
	opts := []assert.Option{assert.ByKey("house", "day"), assert.Tol("*", 1e-9, 0)}
	data, err := EncodeTable(got, assert.KeyColumns(opts...))
	if err != nil {
		b.Fatal(err)
	}
	path := filepath.Join(s.Root, "big.gold.tbl")
	if err := os.WriteFile(path, data, 0o644); err != nil {
		b.Fatal(err)
	}
	b.SetBytes(int64(len(data)))
	b.ResetTimer()
	var golden, peer time.Duration
	checkGolden := func() {
		if !s.Table(b, "big", got, opts...) {
			b.Fatal("golden check failed")
		}
	}
	checkPeer := func() {
		raw, err := os.ReadFile(path)
		if err != nil {
			b.Fatal(err)
		}
		want, err := fixtures.ParseFile(path, string(raw))
		if err != nil {
			b.Fatal(err)
		}
		if !assert.Compare(want, got, opts...).Equal() {
			b.Fatal("peer compare failed")
		}
	}
	for i := range b.N {
		// alternate which runs first, so neither gains from a warm cache
		first, second, df, ds := checkGolden, checkPeer, &golden, &peer
		if i%2 == 1 {
			first, second, df, ds = checkPeer, checkGolden, &peer, &golden
		}
		t0 := time.Now()
		first()
		t1 := time.Now()
		second()
		*df += t1.Sub(t0)
		*ds += time.Since(t1)
	}
	b.ReportMetric(float64(golden)/float64(peer), "x-vs-peer")
	b.ReportMetric(float64(golden)/1e6/float64(b.N), "golden-ms/op")
	b.ReportMetric(float64(peer)/1e6/float64(b.N), "peer-ms/op")
}
