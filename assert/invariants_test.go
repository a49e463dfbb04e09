package assert

import (
	"math"
	"math/rand/v2"
	"testing"
	"time"

	"github.com/stretchr/testify/require"

	"github.com/proofsheet/proofsheet/fixtures"
)

// randomTable builds a table of every kind with nulls, NaN, ±0 and
// repeated values, and a unique id column.
func randomTable(t *testing.T, rng *rand.Rand, n int) *fixtures.Table {
	t.Helper()
	schema := fixtures.Schema{
		fixtures.Col("id", fixtures.Int64), fixtures.Col("b", fixtures.Bool), fixtures.Col("i", fixtures.Int64),
		fixtures.Col("f", fixtures.Float64), fixtures.Col("s", fixtures.String), fixtures.Col("c", fixtures.Category),
		fixtures.Col("d", fixtures.Date), fixtures.Col("ts", fixtures.TimestampOf(fixtures.Millis, "UTC")),
		fixtures.Col("m", fixtures.DecimalOf(9, 2)),
	}
	floats := []float64{0, math.Copysign(0, -1), math.NaN(), math.Inf(1), math.Inf(-1), 1.5, -2.25, 1e-300, math.MaxFloat64}
	texts := []string{"", "Étang", "Les Pins", "Les\u00a0Pins", "\ufeffMas", "a|b", "~"}
	b := fixtures.NewBuilder(schema)
	day := time.Date(2026, 4, 1, 0, 0, 0, 0, time.UTC)
	for r := range n {
		cell := func(v any) any {
			if rng.IntN(6) == 0 {
				return nil
			}
			return v
		}
		b.Row(r, cell(rng.IntN(2) == 0), cell(rng.IntN(5)), cell(floats[rng.IntN(len(floats))]),
			cell(texts[rng.IntN(len(texts))]), cell(texts[1+rng.IntN(3)]), cell(day.AddDate(0, 0, rng.IntN(3))),
			cell(day.Add(time.Duration(rng.IntN(3))*time.Millisecond)), cell(fixtures.NewDecimal(int64(rng.IntN(3)), 2)))
	}
	return b.MustBuild(t)
}

func TestInvariantsOnRandomTables(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 4))
	for trial := range 40 {
		n := rng.IntN(60)
		a := randomTable(t, rng, n)
		perm := rng.Perm(n)
		shuffled, err := a.Take(perm)
		require.NoError(t, err)
		// Every table equals itself in every mode and under any rules.
		for _, opts := range [][]Option{
			nil, {ByKey("id")}, {AnyRowOrder()}, {Tol("*", 0.1, 0.1)}, {ULPs("*", 3), NaNIsNull()},
			{TimeTol("*", time.Second), NormText("*", NFC|TrimSpace|FoldCase)}, {LooseTypes(), AnyColumnOrder()},
			{AnyRowOrder(), Tol("f", 0.5, 0)}, {ByKey("id", "s")},
		} {
			d := Compare(a, a, opts...)
			require.True(t, d.Equal(), "trial %d: %s", trial, d.Text())
		}
		// Row order does not matter by key or as a multiset.
		require.True(t, Compare(a, shuffled, ByKey("id")).Equal(), "trial %d", trial)
		d := Compare(a, shuffled, AnyRowOrder())
		require.True(t, d.Equal(), "trial %d: %s", trial, d.Text())
		// Comparing two different tables is symmetric in its counts.
		other := randomTable(t, rng, n)
		ab, ba := Compare(a, other), Compare(other, a)
		require.Equal(t, ab.CellsDiffering, ba.CellsDiffering)
		require.Equal(t, ab.RowsDiffering, ba.RowsDiffering)
		kab, kba := Compare(a, other, ByKey("id")), Compare(other, a, ByKey("id"))
		require.Equal(t, kab.CellsDiffering, kba.CellsDiffering)
		require.Equal(t, ab.CellsDiffering, kab.CellsDiffering, "same ids in the same order pair the same rows")
		mab, mba := Compare(a, other, AnyRowOrder()), Compare(other, a, AnyRowOrder())
		require.Equal(t, mab.Missing.Count, mba.Extra.Count)
		require.Equal(t, mab.Extra.Count, mba.Missing.Count)
		for _, x := range []*Diff{ab, kab, mab} {
			_ = x.Text()
			_ = x.Markdown()
			_, err := x.JSON()
			require.NoError(t, err)
		}
	}
}
