package assert

import (
	"fmt"
	"math/rand/v2"
	"runtime"
	"sync"
	"testing"
	"time"

	"github.com/apache/arrow/go/v17/arrow"
	"github.com/apache/arrow/go/v17/arrow/array"
	"github.com/apache/arrow/go/v17/arrow/memory"
	tfassert "github.com/stretchr/testify/assert"

	"github.com/proofsheet/proofsheet/fixtures"
)

// The benchmarks compare two 1M-row tables of 8 columns (4 float64 under a
// tolerance, 2 int64, 1 string, 1 category) and run the peers over the same
// data in the same run, reporting ratios:
//
//	go test ./assert -run '^$' -bench . -benchtime 3x
//
// x-vs-arrow   Arrow's array.ApproxEqual time / ours (target ≥ 5)
// x-vs-testify testify's InDeltaSlice + ObjectsAreEqual time / ours (≥ 100)
// x-of-positional keyed compare of shuffled rows / positional (≤ 10)
// x-of-equal   compare with 1 % of cells differing / equal tables (≤ 2)
// alloc-%      heap allocated by one compare / the tables' buffer bytes (≤ 25)

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
	want, got := ts[0], ts[1]
	wr, gr := want.Record(), got.Record()
	defer wr.Release()
	defer gr.Release()
	b.ReportAllocs()
	var ours, peer time.Duration
	for b.Loop() {
		ours += elapsed(func() {
			if !Compare(want, got, benchOpts...).Equal() {
				b.Fatal("equal tables differ")
			}
		})
		peer += elapsed(func() {
			if !arrowCompare(wr, gr) {
				b.Fatal("Arrow: equal tables differ")
			}
		})
	}
	b.ReportMetric(float64(ours.Nanoseconds())/float64(b.N)/1e6, "ms-ours")
	b.ReportMetric(float64(peer.Nanoseconds())/float64(b.N)/1e6, "ms-arrow")
	b.ReportMetric(float64(peer)/float64(ours), "x-vs-arrow")
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
	want, got := ts[0], ts[1]
	wf, wi, ws := goSlices(want)
	gf, gi, gs := goSlices(got)
	var ours, peer time.Duration
	for b.Loop() {
		ours += elapsed(func() {
			if !Compare(want, got, benchOpts...).Equal() {
				b.Fatal("equal tables differ")
			}
		})
		peer += elapsed(func() {
			q := &quietT{}
			for j := range wf {
				tfassert.InDeltaSlice(q, wf[j], gf[j], 1e-9)
			}
			for j := range wi {
				if !tfassert.ObjectsAreEqual(wi[j], gi[j]) {
					q.failed = true
				}
			}
			for j := range ws {
				if !tfassert.ObjectsAreEqual(ws[j], gs[j]) {
					q.failed = true
				}
			}
			if q.failed {
				b.Fatal("testify: equal tables differ")
			}
		})
	}
	b.ReportMetric(float64(ours.Nanoseconds())/float64(b.N)/1e6, "ms-ours")
	b.ReportMetric(float64(peer.Nanoseconds())/float64(b.N)/1e6, "ms-testify")
	b.ReportMetric(float64(peer)/float64(ours), "x-vs-testify")
}

func BenchmarkKeyedShuffled(b *testing.B) {
	ts := benchTables()
	want, equal, shuffled := ts[0], ts[1], ts[3]
	keyed := append([]Option{ByKey("id")}, benchOpts...)
	var pos, key time.Duration
	for b.Loop() {
		pos += elapsed(func() {
			if !Compare(want, equal, benchOpts...).Equal() {
				b.Fatal("equal tables differ")
			}
		})
		key += elapsed(func() {
			if d := Compare(want, shuffled, keyed...); !d.Equal() {
				b.Fatal("shuffled tables differ by key:\n" + d.Text())
			}
		})
	}
	b.ReportMetric(float64(key.Nanoseconds())/float64(b.N)/1e6, "ms-keyed")
	b.ReportMetric(float64(pos.Nanoseconds())/float64(b.N)/1e6, "ms-positional")
	b.ReportMetric(float64(key)/float64(pos), "x-of-positional")
}

func BenchmarkOnePercentDiffering(b *testing.B) {
	ts := benchTables()
	want, equal, changed := ts[0], ts[1], ts[2]
	var eq, diff time.Duration
	for b.Loop() {
		eq += elapsed(func() {
			if !Compare(want, equal, benchOpts...).Equal() {
				b.Fatal("equal tables differ")
			}
		})
		diff += elapsed(func() {
			if Compare(want, changed, benchOpts...).Equal() {
				b.Fatal("changed tables compare equal")
			}
		})
	}
	b.ReportMetric(float64(diff.Nanoseconds())/float64(b.N)/1e6, "ms-1pct")
	b.ReportMetric(float64(eq.Nanoseconds())/float64(b.N)/1e6, "ms-equal")
	b.ReportMetric(float64(diff)/float64(eq), "x-of-equal")
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
	want := ts[0]
	cases := []struct {
		name string
		got  *fixtures.Table
		opts []Option
	}{
		{"positional-equal", ts[1], benchOpts},
		{"positional-1pct", ts[2], benchOpts},
		{"keyed-shuffled", ts[3], append([]Option{ByKey("id")}, benchOpts...)},
	}
	for _, c := range cases {
		b.Run(c.name, func(b *testing.B) {
			buffers := float64(want.BufferBytes() + c.got.BufferBytes())
			var total uint64
			for b.Loop() {
				total += allocatedBy(func() { Compare(want, c.got, c.opts...) })
			}
			b.ReportMetric(float64(total)/float64(b.N)/buffers*100, "alloc-%")
			b.ReportMetric(float64(total)/float64(b.N)/1e6, "alloc-MB")
		})
	}
}
