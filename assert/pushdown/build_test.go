package pushdown

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/stretchr/testify/require"
)

// TestLastFloat checks the bounds the tolerance test guards the product
// rel × max(|w|, |g|) with: the largest magnitude whose product is finite,
// and the largest whose product rounds to zero.
func TestLastFloat(t *testing.T) {
	for _, rel := range []float64{1e-300, 1e-12, 1e-9, 0.5, 1, 1.5, 1.9999999999999998} {
		finite := lastFloat(func(x float64) bool { return !math.IsInf(rel*x, 0) })
		require.False(t, math.IsInf(rel*finite, 0), "rel %g", rel)
		if finite < math.MaxFloat64 {
			require.True(t, math.IsInf(rel*math.Nextafter(finite, math.Inf(1)), 0), "rel %g", rel)
		}
		zero := lastFloat(func(x float64) bool { return rel*x == 0 })
		require.Zero(t, rel*zero, "rel %g", rel)
		require.NotZero(t, rel*math.Nextafter(zero, math.Inf(1)), "rel %g", rel)
	}
}

// TestHalvedDifference checks the identity absDiff relies on where
// PostgreSQL would raise an overflow error: for finite w and g of opposite
// signs, one of magnitude > 2^1022, fl(|w − g|) = 2 · fl(|h(w) − h(g)|), where h halves a value of
// magnitude ≥ 2^-1021 and maps a smaller one to 0; and fl(|w − g|)
// overflows exactly when fl(|h(w) − h(g)|) ≥ 2^1023.
// Source: IEEE 754-2019 §4.3 (one rounding of the exact result) and §7.4
// (overflow); halving is exact above the subnormal range.
func TestHalvedDifference(t *testing.T) {
	h := func(x float64) float64 {
		if math.Abs(x) < math.Pow(2, -1021) {
			return 0
		}
		return x * 0.5
	}
	rng := rand.New(rand.NewPCG(1, 2))
	edge := []float64{math.MaxFloat64, math.Pow(2, 1023), math.Pow(2, 1022), 1e308, 8.98846567431158e307, math.SmallestNonzeroFloat64,
		math.Pow(2, -1021), math.Pow(2, -1022), 1, 0}
	var values []float64
	for _, e := range edge {
		values = append(values, e, math.Nextafter(e, 0), math.Nextafter(e, math.Inf(1)))
	}
	for range 20000 {
		values = append(values, math.Float64frombits(rng.Uint64()&^(1<<63)))
		// Magnitudes near the top, where the halved path runs.
		values = append(values, math.Float64frombits(math.Float64bits(math.Pow(2, 1022))+rng.Uint64N(1<<52*2)))
	}
	for i, w := range values {
		if math.IsNaN(w) || math.IsInf(w, 0) {
			continue
		}
		g := -values[(i*7919+13)%len(values)]
		if math.IsNaN(g) || math.IsInf(g, 0) || math.Max(math.Abs(w), math.Abs(g)) <= math.Pow(2, 1022) {
			continue // absDiff subtracts directly: no overflow possible
		}
		direct := math.Abs(w - g)
		halved := math.Abs(h(w) - h(g))
		if halved >= math.Pow(2, 1023) {
			require.True(t, math.IsInf(direct, 1), "w=%g g=%g", w, g)
			continue
		}
		require.Equal(t, direct, halved*2, "w=%g g=%g", w, g)
	}
}

func TestQuoting(t *testing.T) {
	name := "we\"ird`c\\ol 'x'"
	require.Equal(t, `"we""ird`+"`"+`c\ol 'x'"`, duckdbDialect{}.ident(name))
	require.Equal(t, `"we""ird`+"`"+`c\ol 'x'"`, postgresDialect{}.ident(name))
	require.Equal(t, "`we\"ird\\`c\\\\ol 'x'`", clickhouseDialect{}.ident(name))
	require.Equal(t, `'it''s'`, duckdbDialect{}.str("it's"))
	require.Equal(t, `E'it\'s \\'`, postgresDialect{}.str(`it's \`))
	require.Equal(t, `'it\'s \\'`, clickhouseDialect{}.str(`it's \`))
	require.Equal(t, "CAST('1e-09' AS DOUBLE)", duckdbDialect{}.float(1e-9))
	require.Equal(t, "CAST('-Infinity' AS DOUBLE PRECISION)", postgresDialect{}.float(math.Inf(-1)))
	require.Equal(t, "reinterpretAsFloat64(reinterpretAsString(toUInt64(4607182418800017408)))", clickhouseDialect{}.float(1))
}
