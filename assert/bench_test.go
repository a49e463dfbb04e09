package assert

import (
	"bytes"
	"fmt"
	"math/rand/v2"
	"runtime"
	"runtime/debug"
	"sync"
	"sync/atomic"
	"testing"
	"time"

	"github.com/apache/arrow-go/v18/arrow"
	"github.com/apache/arrow-go/v18/arrow/array"
	"github.com/apache/arrow-go/v18/arrow/memory"
	tfassert "github.com/stretchr/testify/assert"

	"github.com/proofsheet/proofsheet/fixtures"
)

// The benchmarks compare two 1M-row tables of 8 columns (4 float64 under a
// tolerance, 2 int64, 1 string, 1 category) and run the peers over the same
// data in the same run, reporting ratios:
//
//	go test ./assert -run '^$' -bench . -benchtime 5x
//
// x-vs-arrow   Arrow's array.ApproxEqual time / ours (target ≥ 5)
// x-vs-memcmp  bytes.Equal over all buffers, on one goroutine
//              (PositionalVsMemcmp) or on all (…BothCores) / ours
// x-vs-testify testify's InDeltaSlice + ObjectsAreEqual time / ours (≥ 100)
// x-of-positional keyed compare of shuffled rows / positional (≤ 10); the
//              ids 7i+3 take the dense-key join, the same ids spread
//              apart (…SpreadKeys) the hash join
// x-of-equal   compare with 1 % of cells differing / equal tables (≤ 2)
// alloc-%      heap allocated by one compare / the tables' buffer bytes (≤ 25)
//
// Each benchmark also reports the CPU milliseconds of each side
// (cpu-ms-…). The figures measured, with the command and how busy the
// machine was, are in README.md's performance section; the benchmarks of
// float noise, nulls, repeated keys and long listings are in
// bench_noise_test.go.
//
// The positional compare of equal tables runs at the speed of bytes.Equal
// over all buffers on both cores: it reads each of the 138 MB once, and
// this machine's two cores read about 26–32 GB/s, so it cannot take much
// under 4.5 ms, and the testify ratio is capped near testify's time /
// 4.5 ms.

const benchRows = 1 << 20

var houses = []string{"Étang", "Les Pins", "Mas Blanc", "Colline", "Verger", "Source", "Prairie", "Ruisseau"}

// benchTables builds the want table, an equal copy, a copy with 1 % of
// cells changed and a copy with rows shuffled, once per process.
var benchTables = sync.OnceValue(func() [4]*fixtures.Table {
	rng := rand.New(rand.NewPCG(1, 2))
	n := benchRows
	f := make([][]float64, 4)
	for j := range f {
		f[j] = make([]float64, n)
		for i := range f[j] {
			f[j][i] = rng.NormFloat64()*8 + 15
		}
	}
	ids := make([]int64, n)
	kept := make([]int64, n)
	names := make([]string, n)
	codes := make([]int8, n)
	for i := range ids {
		ids[i] = int64(i)*7 + 3
		kept[i] = rng.Int64N(200)
		names[i] = fmt.Sprintf("%s-%d", houses[i%len(houses)], i%997)
		codes[i] = int8(rng.IntN(3))
	}
	build := func(f [][]float64, ids, kept []int64, names []string, codes []int8) *fixtures.Table {
		mem := memory.NewGoAllocator()
		var arrs []arrow.Array
		var fields []arrow.Field
		for j := range f {
			b := array.NewFloat64Builder(mem)
			b.AppendValues(f[j], nil)
			arrs = append(arrs, b.NewArray())
			fields = append(fields, arrow.Field{Name: fmt.Sprintf("t%d", j), Type: arrow.PrimitiveTypes.Float64})
		}
		for j, v := range [][]int64{ids, kept} {
			b := array.NewInt64Builder(mem)
			b.AppendValues(v, nil)
			arrs = append(arrs, b.NewArray())
			fields = append(fields, arrow.Field{Name: []string{"id", "kept"}[j], Type: arrow.PrimitiveTypes.Int64})
		}
		sb := array.NewStringBuilder(mem)
		sb.AppendValues(names, nil)
		arrs = append(arrs, sb.NewArray())
		fields = append(fields, arrow.Field{Name: "house", Type: arrow.BinaryTypes.String})
		ib := array.NewInt8Builder(mem)
		ib.AppendValues(codes, nil)
		idx := ib.NewArray()
		db := array.NewStringBuilder(mem)
		db.AppendValues([]string{"ok", "fault", "calibrating"}, nil)
		dict := db.NewArray()
		dt := &arrow.DictionaryType{IndexType: arrow.PrimitiveTypes.Int8, ValueType: arrow.BinaryTypes.String}
		arrs = append(arrs, array.NewDictionaryArray(dt, idx, dict))
		fields = append(fields, arrow.Field{Name: "status", Type: dt})
		rec := array.NewRecord(arrow.NewSchema(fields, nil), arrs, int64(len(ids)))
		t, err := fixtures.FromRecord(rec)
		if err != nil {
			panic(err)
		}
		return t
	}
	clone := func() ([][]float64, []int64, []int64, []string, []int8) {
		g := make([][]float64, 4)
		for j := range f {
			g[j] = append([]float64(nil), f[j]...)
		}
		return g, append([]int64(nil), ids...), append([]int64(nil), kept...), append([]string(nil), names...), append([]int8(nil), codes...)
	}
	want := build(f, ids, kept, names, codes)
	equal := build(clone())
	// 1 % of the cells of every column differ (ids too, so those rows
	// simply differ in id under positional matching).
	g, gi, gk, gn, gc := clone()
	for i := 0; i < n; i++ {
		for j := 0; j < 8; j++ {
			if rng.IntN(100) != 0 {
				continue
			}
			switch {
			case j < 4:
				g[j][i] += 0.5
			case j == 4:
				gi[i]++
			case j == 5:
				gk[i]++
			case j == 6:
				gn[i] += "x"
			default:
				gc[i] = (gc[i] + 1) % 3
			}
		}
	}
	changed := build(g, gi, gk, gn, gc)
	perm := rng.Perm(n)
	sg, si, sk, sn, sc := clone()
	for to, from := range perm {
		for j := range sg {
			sg[j][to] = f[j][from]
		}
		si[to], sk[to], sn[to], sc[to] = ids[from], kept[from], names[from], codes[from]
	}
	shuffled := build(sg, si, sk, sn, sc)
	return [4]*fixtures.Table{want, equal, changed, shuffled}
})

var benchOpts = []Option{Tol("t0", 1e-9, 0), Tol("t1", 1e-9, 0), Tol("t2", 1e-9, 0), Tol("t3", 1e-9, 0)}

func elapsed(f func()) time.Duration {
	start := time.Now()
	f()
	return time.Since(start)
}

// race runs base and other alternately b.N times and reports the mean
// milliseconds of each and the ratio other/base under the unit ratio,
// in wall-clock time; it also reports each side's CPU milliseconds
// (cpu-ms-…), which a busy machine distorts less.
func race(b *testing.B, baseName string, base func(), otherName string, other func(), ratio string) {
	var tb, to, cb, co time.Duration
	for b.Loop() {
		c0 := cpuTime()
		tb += elapsed(base)
		c1 := cpuTime()
		to += elapsed(other)
		cb, co = cb+c1-c0, co+cpuTime()-c1
	}
	b.ReportMetric(float64(tb.Nanoseconds())/float64(b.N)/1e6, "ms-"+baseName)
	b.ReportMetric(float64(to.Nanoseconds())/float64(b.N)/1e6, "ms-"+otherName)
	b.ReportMetric(float64(cb.Nanoseconds())/float64(b.N)/1e6, "cpu-ms-"+baseName)
	b.ReportMetric(float64(co.Nanoseconds())/float64(b.N)/1e6, "cpu-ms-"+otherName)
	b.ReportMetric(float64(to)/float64(tb), ratio)
}

// raceHeap is race for work that needs scratch memory, run two ways in
// each iteration, untimed preparation before each side:
//
//   - warm: runtime.GC() first, so that the scratch of earlier runs is
//     free heap again and is reused (a process that compares many tables);
//   - cold: debug.FreeOSMemory() first, so that every page of scratch is
//     fresh from the operating system and faulted in (a process that
//     compares once).
//
// It reports each side's wall and CPU milliseconds and page faults, warm
// and cold, and the ratios other/base under ratio and ratio+"-cold".
func raceHeap(b *testing.B, baseName string, base func(), otherName string, other func(), ratio string) {
	type side struct {
		wall, cpu time.Duration
		faults    int64
	}
	var sides [2][2]side // [warm, cold][base, other]
	run := func(s *side, prep, f func()) {
		prep()
		f0, c0 := pageFaults(), cpuTime()
		s.wall += elapsed(f)
		s.cpu += cpuTime() - c0
		s.faults += pageFaults() - f0
	}
	for b.Loop() {
		for m, prep := range []func(){runtime.GC, debug.FreeOSMemory} {
			run(&sides[m][0], prep, base)
			run(&sides[m][1], prep, other)
		}
	}
	n := float64(b.N)
	for m, mode := range []string{"", "-cold"} {
		for k, name := range []string{baseName, otherName} {
			s := sides[m][k]
			b.ReportMetric(float64(s.wall.Nanoseconds())/n/1e6, "ms-"+name+mode)
			b.ReportMetric(float64(s.cpu.Nanoseconds())/n/1e6, "cpu-ms-"+name+mode)
			b.ReportMetric(float64(s.faults)/n, "faults-"+name+mode)
		}
		b.ReportMetric(float64(sides[m][1].wall)/float64(sides[m][0].wall), ratio+mode)
		b.ReportMetric(float64(sides[m][1].cpu)/float64(sides[m][0].cpu), "cpu-"+ratio+mode)
	}
}

// timed runs f and adds its wall-clock and CPU time to *wall and *cpu.
func timed(wall, cpu *time.Duration, f func()) {
	c0 := cpuTime()
	*wall += elapsed(f)
	*cpu += cpuTime() - c0
}

// compareFn returns a run of Compare that fails the benchmark unless the
// outcome is as expected.
func compareFn(b *testing.B, want, got *fixtures.Table, equal bool, opts ...Option) func() {
	return func() {
		if d := Compare(want, got, opts...); d.Equal() != equal {
			b.Fatalf("Compare: equal = %v, want %v", d.Equal(), equal)
		}
	}
}

// arrowCompare runs Arrow's ApproxEqual over every column pair.
func arrowCompare(want, got arrow.Record) bool {
	ok := true
	for j := 0; j < int(want.NumCols()); j++ {
		ok = array.ApproxEqual(want.Column(j), got.Column(j), array.WithAbsTolerance(1e-9)) && ok
	}
	return ok
}

func BenchmarkPositionalVsArrow(b *testing.B) {
	ts := benchTables()
	wr, gr := ts[0].Record(), ts[1].Record()
	defer wr.Release()
	defer gr.Release()
	race(b, "ours", compareFn(b, ts[0], ts[1], true, benchOpts...), "arrow", func() {
		if !arrowCompare(wr, gr) {
			b.Fatal("Arrow: equal tables differ")
		}
	}, "x-vs-arrow")
}

// BenchmarkPositionalVsMemcmp puts the equal-tables time beside the floor
// of any exact comparison: bytes.Equal over every Arrow buffer of the two
// tables on one goroutine (it reads each byte once and decides nothing
// per cell). A ratio above 1 means Compare beats that floor, by using both
// cores.
func BenchmarkPositionalVsMemcmp(b *testing.B) {
	ts := benchTables()
	wr, gr := ts[0].Record(), ts[1].Record()
	defer wr.Release()
	defer gr.Release()
	race(b, "ours", compareFn(b, ts[0], ts[1], true, benchOpts...), "memcmp", func() {
		for j := 0; j < int(wr.NumCols()); j++ {
			if !buffersEqual(wr.Column(j).Data(), gr.Column(j).Data()) {
				b.Fatal("memcmp: equal tables differ")
			}
		}
	}, "x-vs-memcmp")
}

// BenchmarkPositionalVsMemcmpBothCores puts the equal-tables time beside
// bytes.Equal over every Arrow buffer of the two tables in 1 MB pieces on
// all processors: the memory bandwidth floor of any comparison that reads
// both tables. A ratio near 1 means Compare runs at that floor.
func BenchmarkPositionalVsMemcmpBothCores(b *testing.B) {
	ts := benchTables()
	wr, gr := ts[0].Record(), ts[1].Record()
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
	race(b, "ours", compareFn(b, ts[0], ts[1], true, benchOpts...), "memcmp", func() {
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
			b.Fatal("memcmp: equal tables differ")
		}
	}, "x-vs-memcmp")
}

// bufferBytes appends the bytes of every buffer of a (dictionary
// included) to out.
func bufferBytes(a arrow.ArrayData, out [][]byte) [][]byte {
	for _, buf := range a.Buffers() {
		if buf != nil {
			out = append(out, buf.Bytes())
		}
	}
	if a.DataType().ID() == arrow.DICTIONARY {
		out = bufferBytes(a.Dictionary(), out)
	}
	return out
}

func buffersEqual(a, b arrow.ArrayData) bool {
	ab, bb := a.Buffers(), b.Buffers()
	for i := range ab {
		if ab[i] != nil && bb[i] != nil && !bytes.Equal(ab[i].Bytes(), bb[i].Bytes()) {
			return false
		}
	}
	if a.DataType().ID() == arrow.DICTIONARY {
		return buffersEqual(a.Dictionary(), b.Dictionary())
	}
	return true
}

// quietT swallows testify's failure reports.
type quietT struct{ failed bool }

func (q *quietT) Errorf(string, ...any) { q.failed = true }

// goSlices copies the tables' columns into plain Go slices, the form
// testify compares.
func goSlices(t *fixtures.Table) (floats [][]float64, ints [][]int64, strs [][]string) {
	for _, c := range t.Columns() {
		switch c.Kind() {
		case fixtures.KindFloat64:
			floats = append(floats, append([]float64(nil), c.Float64s()...))
		case fixtures.KindInt64:
			ints = append(ints, append([]int64(nil), c.Int64s()...))
		default:
			s := make([]string, c.Len())
			for i := range s {
				s[i] = c.Str(i)
			}
			strs = append(strs, s)
		}
	}
	return floats, ints, strs
}

func BenchmarkPositionalVsTestify(b *testing.B) {
	ts := benchTables()
	wf, wi, ws := goSlices(ts[0])
	gf, gi, gs := goSlices(ts[1])
	race(b, "ours", compareFn(b, ts[0], ts[1], true, benchOpts...), "testify", func() {
		q := &quietT{}
		for j := range wf {
			tfassert.InDeltaSlice(q, wf[j], gf[j], 1e-9)
		}
		for j := range wi {
			q.failed = !tfassert.ObjectsAreEqual(wi[j], gi[j]) || q.failed
		}
		for j := range ws {
			q.failed = !tfassert.ObjectsAreEqual(ws[j], gs[j]) || q.failed
		}
		if q.failed {
			b.Fatal("testify: equal tables differ")
		}
	}, "x-vs-testify")
}

func BenchmarkKeyedShuffled(b *testing.B) {
	ts := benchTables()
	keyed := append([]Option{ByKey("id")}, benchOpts...)
	race(b, "positional", compareFn(b, ts[0], ts[1], true, benchOpts...),
		"keyed", compareFn(b, ts[0], ts[3], true, keyed...), "x-of-positional")
}

// spreadKeys returns t with its id column i mapped to i·1000003 + 2⁴⁰:
// the same pairing, but ids too far apart for the dense join, so that the
// keyed compare takes the hash join.
func spreadKeys(t *fixtures.Table) *fixtures.Table {
	rec := t.Record()
	defer rec.Release()
	cols := rec.Columns()
	j := t.Schema().Index("id")
	ib := array.NewInt64Builder(memory.NewGoAllocator())
	for _, v := range t.Column("id").Int64s() {
		ib.Append(v*1_000_003 + 1<<40)
	}
	arrs := append([]arrow.Array(nil), cols...)
	arrs[j] = ib.NewArray()
	out, err := fixtures.FromRecord(array.NewRecord(rec.Schema(), arrs, rec.NumRows()))
	if err != nil {
		panic(err)
	}
	return out
}

// spreadTables are want and the shuffled copy with spread ids.
var spreadTables = sync.OnceValue(func() [2]*fixtures.Table {
	ts := benchTables()
	return [2]*fixtures.Table{spreadKeys(ts[0]), spreadKeys(ts[3])}
})

// BenchmarkKeyedShuffledSpreadKeys is BenchmarkKeyedShuffled with ids
// spread far apart, which the dense join does not take.
func BenchmarkKeyedShuffledSpreadKeys(b *testing.B) {
	ts, sp := benchTables(), spreadTables()
	keyed := append([]Option{ByKey("id")}, benchOpts...)
	race(b, "positional", compareFn(b, ts[0], ts[1], true, benchOpts...),
		"keyed", compareFn(b, sp[0], sp[1], true, keyed...), "x-of-positional")
}

func BenchmarkOnePercentDiffering(b *testing.B) {
	ts := benchTables()
	race(b, "equal", compareFn(b, ts[0], ts[1], true, benchOpts...),
		"1pct", compareFn(b, ts[0], ts[2], false, benchOpts...), "x-of-equal")
}

// allocatedBy returns the heap bytes f allocates.
func allocatedBy(f func()) uint64 {
	var before, after runtime.MemStats
	runtime.GC()
	runtime.ReadMemStats(&before)
	f()
	runtime.ReadMemStats(&after)
	return after.TotalAlloc - before.TotalAlloc
}

func BenchmarkCompareMemory(b *testing.B) {
	ts := benchTables()
	sp := spreadTables()
	cases := []struct {
		name      string
		want, got *fixtures.Table
		opts      []Option
	}{
		{"positional-equal", ts[0], ts[1], benchOpts},
		{"positional-1pct", ts[0], ts[2], benchOpts},
		{"keyed-shuffled", ts[0], ts[3], append([]Option{ByKey("id")}, benchOpts...)},
		{"keyed-shuffled-spread-keys", sp[0], sp[1], append([]Option{ByKey("id")}, benchOpts...)},
	}
	for _, c := range cases {
		b.Run(c.name, func(b *testing.B) {
			buffers := float64(c.want.BufferBytes() + c.got.BufferBytes())
			var total uint64
			for b.Loop() {
				total += allocatedBy(func() { Compare(c.want, c.got, c.opts...) })
			}
			b.ReportMetric(float64(total)/float64(b.N)/buffers*100, "alloc-%")
			b.ReportMetric(float64(total)/float64(b.N)/1e6, "alloc-MB")
		})
	}
}
