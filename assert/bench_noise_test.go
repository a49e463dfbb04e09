package assert

import (
	"bytes"
	"math"
	"math/rand/v2"
	"os"
	"runtime"
	"sync"
	"sync/atomic"
	"testing"
	"time"

	"github.com/apache/arrow-go/v18/arrow"
	"github.com/apache/arrow-go/v18/arrow/array"
	"github.com/apache/arrow-go/v18/arrow/memory"

	"github.com/proofsheet/proofsheet/fixtures"
)

// Benchmarks of the case a tolerance compare exists for: every float
// differs a little. Tables of an int64 id and three float64 columns
// (1M rows unless named otherwise); got's floats are want's times
// (1 + 1e-12), all within Tol("*", 1e-9, 0). Each benchmark runs its peer
// in the same run and reports the ratio:
//
//	go test ./assert -run '^$' -bench Noise -benchtime 5x -count 3
//
// x-vs-arrow        Arrow's array.ApproxEqual over the same columns / ours (≥ 5; with nulls ≥ 4)
// x-of-plain-loop   ours / a single-core loop that only checks the rule (≤ 2)
// x-of-noise        1 % of cells truly different / all within tolerance (≤ 1.5)
// x-of-positional   keyed, rows shuffled, ids spread apart / positional (≤ 4)
// x-of-1M           10M rows keyed / 1M rows keyed (≤ 12; needs
//                   PROOFSHEET_BENCH_10M=1)
// x-of-unique-keys  10 rows per key / 1 row per key, same row count (≤ 2)
//
// The keyed ones also report -cold ratios, cpu- ratios and page faults
// (see raceHeap): their time depends on whether their scratch memory is
// fresh from the operating system.
// x-of-memcmp       identical tables / bytes.Equal over every buffer on all cores (≤ 1.2)
// ns-per-cell       listing every differing cell: Compare, and Text, per listed cell (≤ 500, ≤ 1000)

const noiseRows = 1 << 20

var noiseTol = []Option{Tol(AllColumns, 1e-9, 0)}

// noiseTable is the columns of one benchmark table.
type noiseTable struct {
	ids    []int64
	floats [3][]float64
	valid  []bool // nil: no nulls; else the validity of every float cell
}

// table builds the fixtures.Table (over Arrow arrays) of the columns.
func (nt noiseTable) table() *fixtures.Table {
	mem := memory.NewGoAllocator()
	ib := array.NewInt64Builder(mem)
	ib.AppendValues(nt.ids, nil)
	arrs := []arrow.Array{ib.NewArray()}
	fields := []arrow.Field{{Name: "id", Type: arrow.PrimitiveTypes.Int64}}
	for j, f := range nt.floats {
		fb := array.NewFloat64Builder(mem)
		fb.AppendValues(f, nt.valid)
		arrs = append(arrs, fb.NewArray())
		fields = append(fields, arrow.Field{Name: []string{"tmin", "tmax", "tmean"}[j], Type: arrow.PrimitiveTypes.Float64, Nullable: true})
	}
	t, err := fixtures.FromRecord(array.NewRecord(arrow.NewSchema(fields, nil), arrs, int64(len(nt.ids))))
	if err != nil {
		panic(err)
	}
	return t
}

// noiseWant returns want's columns: ids i·step + base, readings around
// 15 °C; nullShare of the float cells null (the same cells on both sides).
func noiseWant(n int, step, base int64, nullShare float64, seed uint64) noiseTable {
	rng := rand.New(rand.NewPCG(seed, 99))
	nt := noiseTable{ids: make([]int64, n)}
	for i := range nt.ids {
		nt.ids[i] = int64(i)*step + base
	}
	for j := range nt.floats {
		nt.floats[j] = make([]float64, n)
		for i := range nt.floats[j] {
			nt.floats[j][i] = rng.NormFloat64()*8 + 15
		}
	}
	if nullShare > 0 {
		nt.valid = make([]bool, n)
		for i := range nt.valid {
			nt.valid[i] = rng.Float64() >= nullShare
		}
	}
	return nt
}

// noisy returns got's columns: want's floats times (1 + 1e-12); then a
// share of the float cells off by 0.5 (truly different); then rows in the
// order perm (nil: the same order).
func (nt noiseTable) noisy(differ float64, perm []int, seed uint64) noiseTable {
	rng := rand.New(rand.NewPCG(seed, 7))
	out := noiseTable{ids: append([]int64(nil), nt.ids...), valid: nt.valid}
	for j := range nt.floats {
		out.floats[j] = make([]float64, len(nt.ids))
		for i, v := range nt.floats[j] {
			v *= 1 + 1e-12
			if differ > 0 && rng.Float64() < differ {
				v += 0.5
			}
			out.floats[j][i] = v
		}
	}
	if perm != nil {
		shuffled := noiseTable{ids: make([]int64, len(perm))}
		if nt.valid != nil {
			shuffled.valid = make([]bool, len(perm))
		}
		for j := range out.floats {
			shuffled.floats[j] = make([]float64, len(perm))
		}
		for to, from := range perm {
			shuffled.ids[to] = out.ids[from]
			for j := range out.floats {
				shuffled.floats[j][to] = out.floats[j][from]
			}
			if nt.valid != nil {
				shuffled.valid[to] = nt.valid[from]
			}
		}
		out = shuffled
	}
	return out
}

// noiseTables holds the benchmark tables, built once per process.
var noiseTables = sync.OnceValue(func() map[string]*fixtures.Table {
	n := noiseRows
	want := noiseWant(n, 1, 0, 0, 1)
	nulls := noiseWant(n, 1, 0, 0.05, 2)
	spread := noiseWant(n, 1_000_003, 1<<40, 0, 1)
	perm := rand.New(rand.NewPCG(3, 4)).Perm(n)
	return map[string]*fixtures.Table{
		"want":          want.table(),
		"noisy":         want.noisy(0, nil, 5).table(),
		"onepct":        want.noisy(0.01, nil, 6).table(),
		"nulls":         nulls.table(),
		"nulls-noisy":   nulls.noisy(0, nil, 7).table(),
		"spread":        spread.table(),
		"spread-noisy":  spread.noisy(0, perm, 8).table(),
		"identical-got": want.table(),
	}
})

// arrowApprox runs Arrow's ApproxEqual over every column pair.
func arrowApprox(want, got arrow.Record) bool {
	ok := true
	for j := 0; j < int(want.NumCols()); j++ {
		ok = array.ApproxEqual(want.Column(j), got.Column(j), array.WithAbsTolerance(1e-9), array.WithNaNsEqual(true)) && ok
	}
	return ok
}

// plainLoop is the simplest correct check of the same columns on one
// goroutine: ids equal, floats within |w − g| ≤ max(abs, rel·max(|w|, |g|)),
// nulls equal; no distances, no listing. It uses the built-in max, which
// the compiler inlines (math.Max is a call), so that the peer is as fast
// as a plain loop gets.
func plainLoop(want, got *fixtures.Table, abs, rel float64) int {
	bad := 0
	a, b := want.Column("id").Int64s(), got.Column("id").Int64s()
	for i := range a {
		if a[i] != b[i] {
			bad++
		}
	}
	for _, name := range []string{"tmin", "tmax", "tmean"} {
		wc, gc := want.Column(name), got.Column(name)
		x, y := wc.Float64s(), gc.Float64s()
		nulls := wc.NullCount() > 0 || gc.NullCount() > 0
		for i := range x {
			if nulls {
				wn, gn := wc.IsNull(i), gc.IsNull(i)
				if wn || gn {
					if wn != gn {
						bad++
					}
					continue
				}
			}
			if !(math.Abs(x[i]-y[i]) <= max(abs, rel*max(math.Abs(x[i]), math.Abs(y[i])))) {
				bad++
			}
		}
	}
	return bad
}

// BenchmarkNoiseVsArrow: every float ×(1 + 1e-12), by position, against
// Arrow's ApproxEqual (target ≥ 5×) and against the plain loop (ours at
// most 2× its time).
func BenchmarkNoiseVsArrow(b *testing.B) {
	ts := noiseTables()
	wr, gr := ts["want"].Record(), ts["noisy"].Record()
	defer wr.Release()
	defer gr.Release()
	var tOurs, tArrow, tPlain, cOurs, cArrow, cPlain time.Duration
	for b.Loop() {
		timed(&tOurs, &cOurs, compareFn(b, ts["want"], ts["noisy"], true, noiseTol...))
		timed(&tArrow, &cArrow, func() {
			if !arrowApprox(wr, gr) {
				b.Fatal("Arrow: tables within tolerance differ")
			}
		})
		timed(&tPlain, &cPlain, func() {
			if plainLoop(ts["want"], ts["noisy"], 1e-9, 0) != 0 {
				b.Fatal("plain loop: tables within tolerance differ")
			}
		})
	}
	reportMS(b, "ours", tOurs, cOurs)
	reportMS(b, "arrow", tArrow, cArrow)
	reportMS(b, "plain-loop", tPlain, cPlain)
	b.ReportMetric(float64(tArrow)/float64(tOurs), "x-vs-arrow")
	b.ReportMetric(float64(tOurs)/float64(tPlain), "x-of-plain-loop")
}

// BenchmarkNoiseWithNulls: 5 % of the float cells null (on both sides)
// and the same noise, against ApproxEqual (target ≥ 4×).
func BenchmarkNoiseWithNulls(b *testing.B) {
	ts := noiseTables()
	wr, gr := ts["nulls"].Record(), ts["nulls-noisy"].Record()
	defer wr.Release()
	defer gr.Release()
	var tOurs, tArrow, tPlain, cOurs, cArrow, cPlain time.Duration
	for b.Loop() {
		timed(&tOurs, &cOurs, compareFn(b, ts["nulls"], ts["nulls-noisy"], true, noiseTol...))
		timed(&tArrow, &cArrow, func() {
			if !arrowApprox(wr, gr) {
				b.Fatal("Arrow: tables within tolerance differ")
			}
		})
		timed(&tPlain, &cPlain, func() {
			if plainLoop(ts["nulls"], ts["nulls-noisy"], 1e-9, 0) != 0 {
				b.Fatal("plain loop: tables within tolerance differ")
			}
		})
	}
	reportMS(b, "ours", tOurs, cOurs)
	reportMS(b, "arrow", tArrow, cArrow)
	reportMS(b, "plain-loop", tPlain, cPlain)
	b.ReportMetric(float64(tArrow)/float64(tOurs), "x-vs-arrow")
	b.ReportMetric(float64(tOurs)/float64(tPlain), "x-of-plain-loop")
}

// BenchmarkNoiseOnePercentDiffering: 1 % of the float cells truly
// different (off by 0.5) on top of the noise, against the noise alone
// (target ≤ 1.5×).
func BenchmarkNoiseOnePercentDiffering(b *testing.B) {
	ts := noiseTables()
	race(b, "noise", compareFn(b, ts["want"], ts["noisy"], true, noiseTol...),
		"1pct", compareFn(b, ts["want"], ts["onepct"], false, noiseTol...), "x-of-noise")
}

// BenchmarkNoiseKeyedSpreadKeys: rows shuffled, ids spread far apart (the
// hash join), with the noise, against the positional noisy compare
// (target ≤ 4×). The keyed compare needs scratch memory (about 28 bytes a
// row) and the positional one none, so it is measured warm and cold (see
// raceHeap).
func BenchmarkNoiseKeyedSpreadKeys(b *testing.B) {
	ts := noiseTables()
	keyed := append([]Option{ByKey("id")}, noiseTol...)
	raceHeap(b, "positional", compareFn(b, ts["want"], ts["noisy"], true, noiseTol...),
		"keyed", compareFn(b, ts["spread"], ts["spread-noisy"], true, keyed...), "x-of-positional")
}

// BenchmarkNoiseKeyed10M: the keyed compare of BenchmarkNoiseKeyedSpreadKeys
// on 10M rows against 1M rows (target ≤ 12×), warm and cold. It builds
// 10M-row tables (about 1.5 GB with the 1M ones, half a minute on a busy
// 2-core machine), so it runs only with PROOFSHEET_BENCH_10M set:
//
//	PROOFSHEET_BENCH_10M=1 go test ./assert -run '^$' -bench NoiseKeyed10M -benchtime 2x -count 3 -timeout 60m
func BenchmarkNoiseKeyed10M(b *testing.B) {
	if os.Getenv("PROOFSHEET_BENCH_10M") == "" {
		b.Skip("set PROOFSHEET_BENCH_10M=1 to build the 10M-row tables")
	}
	build := func(n int) (*fixtures.Table, *fixtures.Table) {
		w := noiseWant(n, 1_000_003, 1<<40, 0, 11)
		perm := rand.New(rand.NewPCG(12, 13)).Perm(n)
		return w.table(), w.noisy(0, perm, 14).table()
	}
	w1, g1 := build(1_000_000)
	w10, g10 := build(10_000_000)
	keyed := append([]Option{ByKey("id")}, noiseTol...)
	raceHeap(b, "1M", compareFn(b, w1, g1, true, keyed...), "10M", compareFn(b, w10, g10, true, keyed...), "x-of-1M")
}

// repeatedKeys returns want and got of n rows with each id on per rows,
// ids spread apart; got holds the groups in another order, each group's
// rows in their order, with the noise.
func repeatedKeys(n, per int) (*fixtures.Table, *fixtures.Table) {
	w := noiseWant(n, 1, 0, 0, 21)
	for i := range w.ids {
		w.ids[i] = int64(i/per)*1_000_003 + 1<<40
	}
	groups := rand.New(rand.NewPCG(22, 23)).Perm((n + per - 1) / per)
	perm := make([]int, 0, n)
	for _, gr := range groups {
		for i := gr * per; i < min((gr+1)*per, n); i++ {
			perm = append(perm, i)
		}
	}
	return w.table(), w.noisy(0, perm, 24).table()
}

// BenchmarkNoiseRepeatedKeys: 10 rows per key against 1 row per key, 1M
// rows, keyed with spread ids and the noise (target ≤ 2×).
func BenchmarkNoiseRepeatedKeys(b *testing.B) {
	w1, g1 := repeatedKeys(noiseRows, 1)
	w10, g10 := repeatedKeys(noiseRows, 10)
	keyed := append([]Option{ByKey("id")}, noiseTol...)
	raceHeap(b, "unique", compareFn(b, w1, g1, true, keyed...), "10-per-key", compareFn(b, w10, g10, false, keyed...), "x-of-unique-keys")
}

// BenchmarkNoiseIdenticalVsMemcmp: identical tables (no noise) against
// bytes.Equal over every buffer of both tables, in 1 MB pieces on all
// processors: the memory floor (target ≤ 1.2×).
func BenchmarkNoiseIdenticalVsMemcmp(b *testing.B) {
	ts := noiseTables()
	wr, gr := ts["want"].Record(), ts["identical-got"].Record()
	defer wr.Release()
	defer gr.Release()
	var pieces [][2][]byte
	for j := 0; j < int(wr.NumCols()); j++ {
		wb, gb := bufferBytes(wr.Column(j).Data(), nil), bufferBytes(gr.Column(j).Data(), nil)
		for i := range wb {
			for lo := 0; lo < len(wb[i]); lo += 1 << 20 {
				hi := min(lo+1<<20, len(wb[i]))
				pieces = append(pieces, [2][]byte{wb[i][lo:hi], gb[i][lo:min(hi, len(gb[i]))]})
			}
		}
	}
	race(b, "memcmp", func() {
		var next atomic.Int64
		var differ atomic.Bool
		var wg sync.WaitGroup
		for range runtime.GOMAXPROCS(0) {
			wg.Add(1)
			go func() {
				defer wg.Done()
				for i := int(next.Add(1) - 1); i < len(pieces); i = int(next.Add(1) - 1) {
					if !bytes.Equal(pieces[i][0], pieces[i][1]) {
						differ.Store(true)
					}
				}
			}()
		}
		wg.Wait()
		if differ.Load() {
			b.Fatal("memcmp: identical tables differ")
		}
	}, "ours", compareFn(b, ts["want"], ts["identical-got"], true, noiseTol...), "x-of-memcmp")
}

// BenchmarkNoiseListing lists every differing cell (ListLimit(-1)) when
// half of 100k rows differ in all three float columns: Compare's time per
// listed cell (target ≤ 500 ns) and Text's (target ≤ 1000 ns).
func BenchmarkNoiseListing(b *testing.B) {
	n := 100_000
	w := noiseWant(n, 1, 0, 0, 31)
	g := w.noisy(0, nil, 32)
	for j := range g.floats {
		for i := 0; i < n; i += 2 {
			g.floats[j][i] += 0.5
		}
	}
	want, got := w.table(), g.table()
	opts := append([]Option{ListLimit(-1)}, noiseTol...)
	var tCollect, tText, cCollect, cText time.Duration
	var cells int
	for b.Loop() {
		var d *Diff
		timed(&tCollect, &cCollect, func() { d = Compare(want, got, opts...) })
		cells = d.Cells.Len()
		timed(&tText, &cText, func() {
			if err := d.WriteText(discard{}, TextStyle{}); err != nil {
				b.Fatal(err)
			}
		})
	}
	if cells != 3*n/2 {
		b.Fatalf("listed %d cells, want %d", cells, 3*n/2)
	}
	per := func(d time.Duration) float64 { return float64(d.Nanoseconds()) / float64(b.N) / float64(cells) }
	b.ReportMetric(per(tCollect), "ns-per-cell-collect")
	b.ReportMetric(per(tText), "ns-per-cell-text")
	b.ReportMetric(per(cCollect), "cpu-ns-per-cell-collect")
	b.ReportMetric(per(cText), "cpu-ns-per-cell-text")
}

// discard is io.Discard without its ReadFrom, so that writes are counted
// as writes.
type discard struct{}

func (discard) Write(p []byte) (int, error) { return len(p), nil }

// reportMS reports the mean wall-clock and CPU milliseconds of a side.
func reportMS(b *testing.B, name string, wall, cpu time.Duration) {
	b.ReportMetric(float64(wall.Nanoseconds())/float64(b.N)/1e6, "ms-"+name)
	b.ReportMetric(float64(cpu.Nanoseconds())/float64(b.N)/1e6, "cpu-ms-"+name)
}
