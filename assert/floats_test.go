package assert

import (
	"math"
	"testing"

	"github.com/stretchr/testify/require"
)

func tolRule(abs, rel float64) floatRule { return floatRule{abs: abs, rel: rel, hasTol: true} }

// Variables, so that 0.1 + 0.2 is computed in float64 rather than as an
// exact constant.
var tenth, fifth = 0.1, 0.2

func TestToleranceFollowsPEP485(t *testing.T) {
	inf := math.Inf(1)
	cases := []struct {
		name     string
		w, g     float64
		abs, rel float64
		want     bool
	}{
		// Source: PEP 485, "Relative Tolerance Default": with a relative
		// tolerance only, no value except exactly zero is close to zero.
		{"rel only: tiny is not close to 0", 0, 1e-300, 0, 0.5, false},
		{"rel only: smallest subnormal is not close to 0", 0, math.SmallestNonzeroFloat64, 0, 0.4, false},
		{"rel only: 0 is close to 0", 0, 0, 0, 1e-9, true},
		{"rel only: -0 is close to +0", math.Copysign(0, -1), 0, 0, 1e-9, true},
		// Source: PEP 485, "Proposed Implementation": the test is
		// abs(a-b) <= max(rel_tol * max(abs(a), abs(b)), abs_tol), so a
		// difference equal to the tolerance passes.
		{"rel boundary passes", 100, 90, 0, 0.1, true},
		{"rel just past boundary fails", 100, 89.99, 0, 0.1, false},
		{"rel is scaled by the larger magnitude", 90, 100, 0, 0.1, true},
		// Source: PEP 485, "Absolute Tolerance": abs_tol applies alone
		// where values are near zero.
		{"abs only: near zero passes", 0, 1e-10, 1e-9, 0, true},
		{"abs only: boundary passes", 1, 1.5, 0.5, 0, true},
		{"abs only: past boundary fails", 1, 1.5000001, 0.5, 0, false},
		{"abs only: large values need the same absolute closeness", 1e12, 1e12 + 1, 0.5, 0, false},
		{"abs or rel: either suffices", 1000, 1000.5, 0.1, 1e-3, true},
		// Source: PEP 485, "Non-finite Numbers": inf and -inf are only
		// close to themselves.
		{"inf close to inf", inf, inf, 0, 1e-9, true},
		{"inf not close to -inf", inf, -inf, 1e300, 1, false},
		{"inf not close to MaxFloat64 even with rel 1", inf, math.MaxFloat64, 0, 1, false},
		{"-inf not close to finite with huge abs", -inf, -1e308, math.MaxFloat64, 0, false},
		// Our rule, not PEP 485 (where NaN is close to nothing): NaN
		// equals NaN, so a computed NaN in both tables is not a difference.
		{"NaN equals NaN (our rule)", math.NaN(), math.NaN(), 0, 0, true},
		{"NaN is not close to a number", math.NaN(), 1, 1e300, 1, false},
		{"exact without tolerance", tenth + fifth, 0.3, 0, 0, false},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			r := tolRule(c.abs, c.rel)
			require.Equal(t, c.want, floatEqual(c.w, c.g, r))
			// Source: PEP 485, "Symmetry": the chosen test is symmetric,
			// isclose(a, b) == isclose(b, a).
			require.Equal(t, c.want, floatEqual(c.g, c.w, r), "symmetry")
		})
	}
}

func TestToleranceIsSymmetricOverAGrid(t *testing.T) {
	// Source: PEP 485, "Symmetry" — checked over a grid of values and
	// tolerances rather than single examples.
	vals := []float64{0, math.Copysign(0, -1), 1e-300, 1e-9, 0.5, 1, 1.1, 2, -1, -1.05, 1e10, 1e10 + 7, math.MaxFloat64, -math.MaxFloat64}
	tols := [][2]float64{{0, 0}, {1e-9, 0}, {0, 1e-9}, {0.1, 0}, {0, 0.1}, {0.05, 0.05}, {0, 0.99}}
	for _, a := range vals {
		for _, b := range vals {
			for _, tl := range tols {
				r := tolRule(tl[0], tl[1])
				require.Equal(t, floatEqual(a, b, r), floatEqual(b, a, r), "a=%v b=%v tol=%v", a, b, tl)
			}
		}
	}
}

func TestULPDistance(t *testing.T) {
	inf := math.Inf(1)
	negZero := math.Copysign(0, -1)
	tiny := math.SmallestNonzeroFloat64
	largestSubnormal := math.Float64frombits(0x000fffffffffffff)
	smallestNormal := math.Float64frombits(0x0010000000000000)
	cases := []struct {
		name string
		a, b float64
		want uint64
	}{
		// Source: IEEE 754-2019 §3.4 (binary interchange encoding): for
		// floats of one sign, consecutive bit patterns are consecutive
		// values, so math.Nextafter neighbours are 1 ULP apart.
		{"1 and its successor", 1, math.Nextafter(1, 2), 1},
		{"1 and its predecessor", 1, math.Nextafter(1, 0), 1},
		{"-1 and its neighbour", -1, math.Nextafter(-1, -2), 1},
		{"1e300 and its neighbour", 1e300, math.Nextafter(1e300, inf), 1},
		// Source: IEEE 754-2019 §3.4: subnormals continue the sequence
		// down to zero; the smallest subnormal is one step from zero.
		{"0 and the smallest subnormal", 0, tiny, 1},
		{"largest subnormal and smallest normal", largestSubnormal, smallestNormal, 1},
		// Source: IEEE 754-2019 §5.11 (−0 compares equal to +0); with the
		// ordered mapping both zeros are the same point.
		{"-0 and +0", negZero, 0, 0},
		{"across zero: -tiny and +tiny", -tiny, tiny, 2},
		{"across zero: -tiny and -0", -tiny, negZero, 1},
		// Source: IEEE 754-2019 §3.4: +Inf's encoding directly follows
		// MaxFloat64's.
		{"MaxFloat64 and +Inf", math.MaxFloat64, inf, 1},
		{"-MaxFloat64 and -Inf", -math.MaxFloat64, math.Inf(-1), 1},
		// Source: IEEE 754-2019 §3.4: binary64 has a 52-bit trailing
		// significand, so each binade holds 2^52 values.
		{"1 to 2 is one binade", 1, 2, 1 << 52},
		{"-Inf to +Inf spans every pattern but NaNs", math.Inf(-1), inf, 2 * 0x7ff0000000000000},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			require.Equal(t, c.want, ulpDistance(c.a, c.b))
			require.Equal(t, c.want, ulpDistance(c.b, c.a))
		})
	}
}

func TestULPRule(t *testing.T) {
	one := 1.0
	three := math.Nextafter(math.Nextafter(math.Nextafter(one, 2), 2), 2)
	cases := []struct {
		name string
		w, g float64
		n    uint64
		want bool
	}{
		{"3 steps within 3 ULPs", one, three, 3, true},
		{"3 steps not within 2 ULPs", one, three, 2, false},
		{"0 ULPs is exact", one, math.Nextafter(one, 2), 0, false},
		// Source: IEEE 754-2019 §3.4 (as above) — yet an infinity equals
		// only itself under every rule of ours.
		{"MaxFloat64 is 1 ULP from +Inf but not equal", math.MaxFloat64, math.Inf(1), 1, false},
		{"subnormals across zero", -math.SmallestNonzeroFloat64, math.SmallestNonzeroFloat64, 2, true},
		{"NaN equals NaN (our rule)", math.NaN(), math.NaN(), 0, true},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			r := floatRule{ulps: c.n, hasULP: true}
			require.Equal(t, c.want, floatEqual(c.w, c.g, r))
			require.Equal(t, c.want, floatEqual(c.g, c.w, r))
		})
	}
}

func TestFloatDelta(t *testing.T) {
	cases := []struct {
		name     string
		w, g     float64
		has      bool
		abs, rel float64
	}{
		{"equal", 2, 2, true, 0, 0},
		{"plain", 100, 90, true, 10, 0.1},
		{"opposite signs", 5, -5, true, 10, 2},
		{"infinity", math.Inf(1), 5, true, math.Inf(1), math.Inf(1)},
		{"NaN has no delta", math.NaN(), 5, false, 0, 0},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			d := floatDelta(c.w, c.g)
			require.Equal(t, c.has, d.Has)
			require.Equal(t, c.abs, d.Abs)
			require.InDelta(t, c.rel, d.Rel, 1e-15)
		})
	}
}
