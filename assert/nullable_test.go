package assert

import (
	"math"
	"math/rand/v2"
	"testing"
	"time"

	"github.com/stretchr/testify/require"

	"github.com/proofsheet/proofsheet/fixtures"
)

func TestValidityWord(t *testing.T) {
	rng := rand.New(rand.NewPCG(21, 22))
	b := fixtures.NewBuilder(fixtures.Schema{fixtures.Col("v", fixtures.Int64)})
	for i := range 1000 {
		if rng.IntN(3) == 0 {
			b.Row(nil)
		} else {
			b.Row(i)
		}
	}
	full := b.MustBuild(t)
	for _, lo := range []int{0, 1, 7, 8, 9, 63, 64, 65, 333} {
		for _, hi := range []int{lo, lo + 1, lo + 64, lo + 100, 1000} {
			if hi > 1000 || hi < lo {
				continue
			}
			col := full.Slice(lo, hi).Column("v")
			v := validityOf(col)
			for i := 0; i < col.Len(); i++ {
				w := v.word(i, col.Len())
				for bit := range 64 {
					valid := i+bit >= col.Len() || !col.IsNull(i+bit)
					require.Equal(t, valid, w&(1<<bit) != 0, "slice [%d:%d] row %d bit %d", lo, hi, i, bit)
				}
			}
		}
	}
}

// nullTablePair returns two tables of n rows with a column of every kind,
// nulls in both (but for one bool column), the same cells mostly and some differing (values, nulls
// on one side only, NaN, −0), sliced from a larger table so that the
// validity bitmaps start at a bit offset.
func nullTablePair(t *testing.T, rng *rand.Rand, n int) (want, got *fixtures.Table) {
	schema := fixtures.Schema{
		fixtures.Col("f", fixtures.Float64), fixtures.Col("i", fixtures.Int64), fixtures.Col("d", fixtures.Date),
		fixtures.Col("ts", fixtures.TimestampOf(fixtures.Millis, "")), fixtures.Col("s", fixtures.String), fixtures.Col("c", fixtures.Category),
		fixtures.Col("b", fixtures.Bool), fixtures.Col("flag", fixtures.Bool), // flag has no nulls
	}
	day := time.Date(2026, 4, 1, 0, 0, 0, 0, time.UTC)
	levels := []string{"ok", "fault", "calibrating"}
	cell := func(col, i int) any {
		switch col {
		case 0:
			switch i % 50 {
			case 7:
				return math.NaN()
			case 8:
				return math.Copysign(0, -1)
			}
			return float64(i%300) / 8
		case 1:
			return i % 77
		case 2:
			return day.AddDate(0, 0, i%40)
		case 3:
			return day.Add(time.Duration(i) * time.Minute)
		case 4:
			return "h" + itoa(i%97)
		case 5:
			return levels[i%3]
		}
		return i%3 == 0
	}
	wb, gb := fixtures.NewBuilder(schema), fixtures.NewBuilder(schema)
	for i := range n + 5 {
		var wr, gr []any
		for col := range schema {
			w := cell(col, i)
			noNulls := schema[col].Name == "flag"
			if rng.IntN(9) == 0 && !noNulls {
				w = nil
			}
			g := w
			switch rng.IntN(40) {
			case 0:
				if !noNulls {
					g = nil // null on one side only (or on both)
				}
			case 1:
				if w == nil {
					g = cell(col, i)
				}
			case 2:
				if w != nil {
					g = cell(col, i+1) // a different value (mostly)
				}
			case 3:
				if col == 0 && w != nil {
					g = w.(float64) + 1e-12 // within the tolerance
				}
			}
			if col == 0 && i%50 == 8 && g != nil {
				g = 0.0 // +0 against −0
			}
			wr, gr = append(wr, w), append(gr, g)
		}
		wb.Row(wr...)
		gb.Row(gr...)
	}
	return wb.MustBuild(t).Slice(3, 3+n), gb.MustBuild(t).Slice(5, 5+n)
}

func TestNullableByPositionAgreesWithCellByCell(t *testing.T) {
	// The bulk path for columns with nulls must find exactly what the
	// general cell-by-cell loop finds, including the largest deltas.
	rng := rand.New(rand.NewPCG(23, 24))
	for _, n := range []int{1, 63, 64, 65, 200, 3000} {
		want, got := nullTablePair(t, rng, n)
		found := 0
		for _, opts := range [][]Option{nil, {Tol("f", 1e-9, 0)}, {ULPs("f", 4)}, {NaNIsNull()}} {
			cfg := newConfig(opts)
			for _, name := range want.Names() {
				cc := newColCmp(cfg, want.Column(name), got.Column(name))
				p := pairing{n: n}
				bulk, cells := newColResult(0, n), newColResult(0, n)
				cc.compare(p, bulk, nil)
				cc.compareCells(p, cells)
				require.Equal(t, cells.differing, bulk.differing, "n=%d column %s", n, name)
				require.Equal(t, cells.rows, bulk.rows, "n=%d column %s", n, name)
				require.Equal(t, cells.maxAbs, bulk.maxAbs, "n=%d column %s", n, name)
				require.Equal(t, cells.absAt, bulk.absAt, "n=%d column %s", n, name)
				require.Equal(t, cells.maxRel, bulk.maxRel, "n=%d column %s", n, name)
				require.Equal(t, cells.relAt, bulk.relAt, "n=%d column %s", n, name)
				found += cells.differing
			}
		}
		if n >= 200 {
			require.Positive(t, found, "the tables must differ somewhere")
		}
	}
}

func TestNullableCategoriesWithOtherLevelOrder(t *testing.T) {
	want := lit(t, `c:category
		ok
		~
		fault
		ok`)
	got := lit(t, `c:category
		fault
		~
		fault
		~`)
	// got's levels come in another order (fault first), so codes differ
	// for equal texts; row 0 and row 3 differ.
	d := Compare(want, got)
	require.Equal(t, 2, d.CellsDiffering, d.Text())
	require.Equal(t, 0, d.Cells.At(0).Row.Want)
	require.Equal(t, 3, d.Cells.At(1).Row.Want)
}
