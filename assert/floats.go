package assert

import (
	"math"
)

// floatEqual reports whether want w and got g are equal under rule r,
// leaving nulls aside: identical values (−0 and +0 too) are equal; NaN
// equals only NaN; an infinity equals only the same infinity; then the
// tolerance or ULP rule decides.
func floatEqual(w, g float64, r floatRule) bool {
	if w == g {
		return true
	}
	wn, gn := w != w, g != g
	if wn || gn {
		return wn && gn
	}
	if math.IsInf(w, 0) || math.IsInf(g, 0) {
		return false
	}
	switch {
	case r.hasULP:
		return ulpDistance(w, g) <= r.ulps
	case r.hasTol:
		return withinTol(w, g, r.abs, r.rel)
	}
	return false
}

// withinTol is the tolerance test |w − g| ≤ max(abs, rel × max(|w|, |g|))
// for finite w and g.
func withinTol(w, g, abs, rel float64) bool {
	d := math.Abs(w - g)
	return d <= abs || d <= rel*math.Max(math.Abs(w), math.Abs(g))
}

// orderedBits maps a float64 to an int64 that orders like the floats:
// non-negative floats to their bit patterns, negative floats to the
// negation of their magnitude's bit pattern. −0 and +0 both map to 0;
// adjacent floats map to adjacent integers.
func orderedBits(f float64) int64 {
	b := math.Float64bits(f)
	if b>>63 != 0 {
		return -int64(b &^ (1 << 63))
	}
	return int64(b)
}

// ulpDistance returns how many units in the last place lie between a and
// b: the number of math.Nextafter steps from one to the other. It is
// meaningless for NaN.
func ulpDistance(a, b float64) uint64 {
	x, y := orderedBits(a), orderedBits(b)
	if x < y {
		x, y = y, x
	}
	return uint64(x) - uint64(y)
}

// floatDelta returns the distance of two non-null floats: Abs = |w − g|,
// Rel = Abs / max(|w|, |g|) (0 when both are 0, +Inf when an infinity is
// involved and they differ). No distance when a NaN is involved.
func floatDelta(w, g float64) Delta {
	if w != w || g != g {
		return Delta{}
	}
	if w == g {
		return Delta{Has: true}
	}
	if math.IsInf(w, 0) || math.IsInf(g, 0) {
		return Delta{Has: true, Abs: math.Inf(1), Rel: math.Inf(1)}
	}
	abs := math.Abs(w - g)
	return Delta{Has: true, Abs: abs, Rel: abs / math.Max(math.Abs(w), math.Abs(g))}
}
