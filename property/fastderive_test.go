package property

import (
	"math/big"
	"testing"

	"github.com/stretchr/testify/require"

	"github.com/proofsheet/proofsheet/fixtures"
)

// The fast path of derived columns against the exact big.Rat one, which
// is the reference: on every record of many samples, the same clean value.
func TestFastDeriveAgreesWithBigRat(t *testing.T) {
	schema := fixtures.Schema{
		fixtures.Col("price", fixtures.DecimalOf(12, 3)),
		fixtures.Col("qty", fixtures.Int64),
		fixtures.Col("rate", fixtures.Float64),
		fixtures.Col("total", fixtures.DecimalOf(18, 2)),
		fixtures.Col("per", fixtures.Float64),
		fixtures.Col("whole", fixtures.Int64),
		fixtures.Col("mix", fixtures.Float64),
	}
	opts := Options{Mess: Heavy, ExtremeRate: -1, Columns: map[string]Rules{
		"total": {Derive: "price * qty"},
		"per":   {Derive: "total / (qty + 0.5)", Decimals: 4},
		"whole": {Derive: "-(qty * 3 - price) / 7"},
		"mix":   {Derive: "rate * rate - price / 3"},
	}, MaxDigits: 9}
	fast, slow := 0, 0
	for seed := int64(1); seed <= 40; seed++ {
		s, err := Generate(schema, 300, seed, opts)
		require.NoError(t, err)
		c, err := opts.compile(schema)
		require.NoError(t, err)
		for _, rec := range s.recs {
			for _, j := range []int{3, 4, 5, 6} {
				g := newColGen(schema[j], c, c.cols[j])
				val, ok := c.cols[j].derive.eval(rec)
				var want any
				if ok {
					if v, fits := g.fromRat(val); fits {
						want = v
					}
				}
				got := rec[j]
				if want == nil {
					// Null: a null input, or a value too large for the column.
					require.Nil(t, got, "column %s", schema[j].Name)
					continue
				}
				require.True(t, sameClean(want, got), "column %s: got %v, want %v", schema[j].Name, got, want)
				// Which path made it: the fast one unless a step overflowed.
				vals := make([]frac, len(schema))
				for k, v := range rec {
					if r, ok := ratOf(v); ok && r.Num().IsInt64() && r.Denom().IsInt64() {
						vals[k] = frac{n: r.Num().Int64(), d: r.Denom().Int64(), ok: true}
					}
				}
				if c.cols[j].derive.evalFast(vals).ok {
					fast++
				} else {
					slow++
				}
			}
		}
	}
	require.Greater(t, fast, 1000, "the fast path is taken")
	require.Positive(t, slow, "and the exact one when a step overflows")

	// Rounding half away from zero, both paths.
	for _, tc := range []struct{ n, d int64 }{{5, 2}, {-5, 2}, {7, 3}, {-7, 3}, {1, 8}, {-1, 8}, {123456789, 1000}} {
		for dec := 0; dec <= 3; dec++ {
			u, ok := roundFrac(frac{n: tc.n, d: tc.d, ok: true}, dec)
			require.True(t, ok)
			require.Equal(t, roundRat(big.NewRat(tc.n, tc.d), dec).Int64(), u, "%d/%d to %d", tc.n, tc.d, dec)
		}
	}
}
