package assert

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/stretchr/testify/require"

	"github.com/proofsheet/proofsheet/fixtures"
)

// intKeys returns the matching keys of two int64 key columns holding w and
// g, as Compare builds them for ByKey.
func intKeys(t *testing.T, w, g []int64) *rowKeys {
	t.Helper()
	build := func(vals []int64) *fixtures.Column {
		b := fixtures.NewBuilder(fixtures.Schema{fixtures.Col("k", fixtures.Int64)})
		for _, v := range vals {
			b.Row(v)
		}
		return b.MustBuild(t).Column("k")
	}
	wc, gc := build(w), build(g)
	k := newRowKeys([]*colCmp{newColCmp(newConfig(nil), wc, gc)})
	require.Equal(t, len(w) > 0, k.wInts != nil)
	return k
}

// joinCase builds want and got key values: want holds n distinct values
// spread over about spread·n, in order or shuffled; got holds most of them
// shuffled, some twice, plus values want lacks (some twice, some outside
// want's span).
func joinCase(rng *rand.Rand, n, spread int, ascending bool) (w, g []int64) {
	base := int64(rng.IntN(1000)) - 500
	for range n {
		base += 1 + int64(rng.IntN(spread))
		w = append(w, base)
	}
	if !ascending {
		rng.Shuffle(len(w), func(i, j int) { w[i], w[j] = w[j], w[i] })
	}
	for _, v := range w {
		switch rng.IntN(20) {
		case 0: // missing from got
		case 1:
			g = append(g, v, v)
		default:
			g = append(g, v)
		}
	}
	for range n/10 + 1 {
		lacking := w[rng.IntN(n)] + int64(rng.IntN(3)) - 1 // often want's, sometimes in a gap
		g = append(g, lacking)
		if rng.IntN(3) == 0 {
			g = append(g, lacking)
		}
	}
	g = append(g, math.MinInt64, math.MaxInt64, w[0]-1_000_000_000)
	rng.Shuffle(len(g), func(i, j int) { g[i], g[j] = g[j], g[i] })
	return w, g
}

func TestDenseJoinAgreesWithHashJoin(t *testing.T) {
	rng := rand.New(rand.NewPCG(11, 12))
	for _, n := range []int{1, 2, 7, 64, 65, 1000, 20000} {
		for _, spread := range []int{1, 3, 15} {
			for _, ascending := range []bool{true, false} {
				w, g := joinCase(rng, n, spread, ascending)
				k := intKeys(t, w, g)
				for _, workers := range []int{1, 2, 3} {
					dense := denseJoin(k, workers)
					require.NotNil(t, dense, "n=%d spread=%d ascending=%v", n, spread, ascending)
					hashed := hashJoin(k, len(w), len(g), workers)
					require.Equal(t, hashed.wantOf, dense.wantOf, "n=%d spread=%d ascending=%v workers=%d", n, spread, ascending, workers)
					require.Equal(t, headsOf(hashed.wantLinks, len(w)), headsOf(dense.wantLinks, len(w)))
					require.Equal(t, headsOf(hashed.gotLinks, len(g)), headsOf(dense.gotLinks, len(g)))
				}
			}
		}
	}
}

func TestDenseJoinFindsEveryPartner(t *testing.T) {
	// Checked against a plain map from value to first want row.
	rng := rand.New(rand.NewPCG(13, 14))
	w, g := joinCase(rng, 5000, 4, false)
	firstWant := map[int64]int32{}
	for i, v := range w {
		if _, ok := firstWant[v]; !ok {
			firstWant[v] = int32(i)
		}
	}
	jn := denseJoin(intKeys(t, w, g), 2)
	require.NotNil(t, jn)
	for j, v := range g {
		want, ok := firstWant[v]
		if !ok {
			want = -1
		}
		require.Equal(t, want, jn.wantOf[j], "got row %d value %d", j, v)
	}
}

func TestDenseJoinDeclines(t *testing.T) {
	wide := []int64{0, 1 << 40}
	repeated := []int64{5, 6, 5}
	lacking := make([]int64, 0, 2*denseLacking)
	for i := range 2 * denseLacking {
		lacking = append(lacking, int64(-i-1)) // none of them want's
	}
	cases := []struct {
		name string
		w, g []int64
	}{
		{"span too wide for the rows", wide, wide},
		{"want repeats a value", repeated, []int64{5}},
		{"got lacks too many of want's values", []int64{1, 2, 3}, lacking},
		{"no want rows", nil, []int64{1}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			require.Nil(t, denseJoin(intKeys(t, c.w, c.g), 1))
		})
	}
}

func TestDenseJoinAtTheEndsOfInt64(t *testing.T) {
	w := []int64{math.MaxInt64, math.MaxInt64 - 2, math.MaxInt64 - 1}
	g := []int64{math.MinInt64, math.MaxInt64 - 1, -1, math.MaxInt64, 0, math.MaxInt64 - 3}
	jn := denseJoin(intKeys(t, w, g), 1)
	require.NotNil(t, jn)
	require.Equal(t, []int32{-1, 2, -1, 0, -1, -1}, jn.wantOf)
	w = []int64{math.MinInt64 + 1, math.MinInt64}
	jn = denseJoin(intKeys(t, w, []int64{math.MinInt64, math.MaxInt64, math.MinInt64 + 1}), 1)
	require.NotNil(t, jn)
	require.Equal(t, []int32{1, -1, 0}, jn.wantOf)
}

func TestKeyedCompareByEitherJoin(t *testing.T) {
	// The same rows keyed by dense ids (the bitmap join) and by the same
	// ids spread far apart (the hash join) differ in the same cells, rows
	// and repeated keys. Large enough for the parallel, reordered kernels.
	const n = 70000
	schema := fixtures.Schema{fixtures.Col("id", fixtures.Int64), fixtures.Col("s", fixtures.String), fixtures.Col("f", fixtures.Float64)}
	build := func(id func(int) int64) (want, got *fixtures.Table) {
		wb, gb := fixtures.NewBuilder(schema), fixtures.NewBuilder(schema)
		for i := range n {
			wb.Row(id(i), "h"+itoa(i%997), float64(i)/7)
		}
		for r := range n {
			i := (r*7919 + 13) % n
			s, f := "h"+itoa(i%997), float64(i)/7
			switch i % 97 {
			case 1:
				s += "!"
			case 2:
				f += 1
			case 3:
				continue // missing
			case 4:
				gb.Row(id(i), s, f) // twice
			}
			gb.Row(id(i), s, f)
		}
		gb.Row(id(n+5), "extra", 0.5)
		return wb.MustBuild(t), gb.MustBuild(t)
	}
	dw, dg := build(func(i int) int64 { return int64(i)*2 + 1 })
	sw, sg := build(func(i int) int64 { return int64(i)*1_000_003 + 1<<40 })
	keysOf := func(w, g *fixtures.Table) *rowKeys {
		return newRowKeys([]*colCmp{newColCmp(newConfig(nil), w.Column("id"), g.Column("id"))})
	}
	require.NotNil(t, denseJoin(keysOf(dw, dg), 1), "dense ids take the bitmap join")
	require.Nil(t, denseJoin(keysOf(sw, sg), 1), "spread ids take the hash join")
	dense := Compare(dw, dg, ByKey("id"), Tol("f", 0.01, 0))
	sparse := Compare(sw, sg, ByKey("id"), Tol("f", 0.01, 0))
	require.Positive(t, dense.CellsDiffering)
	require.Equal(t, sparse.CellsDiffering, dense.CellsDiffering)
	require.Equal(t, sparse.RowsDiffering, dense.RowsDiffering)
	require.Equal(t, sparse.Missing.Count, dense.Missing.Count)
	require.Equal(t, sparse.Extra.Count, dense.Extra.Count)
	require.Equal(t, sparse.Duplicates.GotKeys, dense.Duplicates.GotKeys)
	require.Positive(t, dense.Duplicates.GotKeys)
	for j := range dense.Cells.All() {
		require.Equal(t, sparse.Cells.At(j).Row.Want, dense.Cells.At(j).Row.Want)
		require.Equal(t, sparse.Cells.At(j).Row.Got, dense.Cells.At(j).Row.Got)
		require.Equal(t, sparse.Cells.At(j).Column, dense.Cells.At(j).Column)
	}
	for j := range dense.Extra.Rows.All() {
		require.Equal(t, sparse.Extra.Rows.At(j).Got, dense.Extra.Rows.At(j).Got)
	}
	for j := range dense.Duplicates.Keys {
		require.Equal(t, sparse.Duplicates.Keys[j].Rows, dense.Duplicates.Keys[j].Rows)
	}
}

// TestPartitionInTwoPasses checks the two-pass partitioning (more
// partitions than one scatter pass writes to) against its definition:
// every row once, in the partition its hash's top bits name, in row order.
func TestPartitionInTwoPasses(t *testing.T) {
	rng := rand.New(rand.NewPCG(41, 42))
	w := make([]int64, 5000)
	for i := range w {
		w[i] = rng.Int64N(1 << 40)
	}
	for _, bitsP := range []uint{0, 3, radixBits, radixBits + 1, radixBits + 4} {
		p := partition(intKeys(t, w, w), WantSide, len(w), bitsP)
		require.Len(t, p.start, 1<<bitsP+1)
		seen := make([]bool, len(w))
		for q := 0; q < 1<<bitsP; q++ {
			last := int32(-1)
			for e := p.start[q]; e < p.start[q+1]; e++ {
				r := p.row[e]
				require.Greater(t, r, last, "rows in order within partition %d", q)
				last = r
				require.False(t, seen[r])
				seen[r] = true
				h := mix(uint64(w[r]))
				require.Equal(t, h, p.h[e])
				if bitsP > 0 {
					require.Equal(t, uint64(q), h>>(64-bitsP), "row %d in partition %d", r, q)
				}
			}
		}
		require.NotContains(t, seen, false)
	}
}

// TestHashJoinAnyPartitioning joins with repeated keys on both sides and
// keys on one side only, in one, few and many partitions (two passes):
// the result must not depend on the partitioning.
func TestHashJoinAnyPartitioning(t *testing.T) {
	rng := rand.New(rand.NewPCG(43, 44))
	w, g := make([]int64, 3000), make([]int64, 3200)
	for i := range w {
		w[i] = rng.Int64N(2000) * 7919
	}
	for i := range g {
		g[i] = rng.Int64N(2100) * 7919
	}
	k := intKeys(t, w, g)
	base := hashJoinBits(k, len(w), len(g), 1, 0)
	require.NotNil(t, base.wantLinks, "want repeats keys")
	require.NotNil(t, base.gotLinks, "got repeats keys")
	for _, bitsP := range []uint{1, 5, radixBits + 2} {
		for _, workers := range []int{1, 2} {
			jn := hashJoinBits(k, len(w), len(g), workers, bitsP)
			require.Equal(t, base.wantOf, jn.wantOf, "bits %d", bitsP)
			require.Equal(t, base.wantLinks, jn.wantLinks)
			require.Equal(t, base.gotLinks, jn.gotLinks)
		}
	}
	// The heads are the first rows with each key, and each chain holds
	// every row of its key in row order.
	first := map[int64]int32{}
	wantHead := headsOf(base.wantLinks, len(w))
	for i, v := range w {
		if _, ok := first[v]; !ok {
			first[v] = int32(i)
		}
		require.Equal(t, first[v], wantHead[i])
	}
	for h, v := range first {
		var rows []int32
		for i, x := range w {
			if x == h {
				rows = append(rows, int32(i))
			}
		}
		require.Equal(t, rows, base.wantLinks.members(v, nil), "key %d", h)
	}
	for j, v := range g {
		f, ok := first[v]
		if !ok {
			f = -1
		}
		require.Equal(t, f, base.wantOf[j])
	}
}

// headsOf returns the head of each of n rows from chains (nil: every row
// is its own head), for tests that compare groupings.
func headsOf(c *chains, n int) []int32 {
	out := make([]int32, n)
	for i := range out {
		out[i] = int32(i)
	}
	if c == nil {
		return out
	}
	for h, l := range c.last {
		if l != int32(h) {
			for r := int32(h); r >= 0; r = c.next[r] {
				out[r] = int32(h)
			}
		}
	}
	return out
}
