package assert

import (
	"bytes"
	"math"
	"math/bits"
)

// The float kernel: float64 columns, with or without nulls, rows paired in
// any way, under any rule. Got's values are first lined up with want's
// (slot k of a run holds a[k] and b[k]); then each block of floatBlock
// slots is
//
//  1. skipped when the raw bytes and the validity of both sides are
//     identical (identical values are equal under every rule and are 0
//     apart);
//  2. screened by one straight-line loop per 64 slots that computes, with
//     no call and no branch on the data, which cells may differ (out of
//     tolerance, NaN or infinite, or null against a value: the validity
//     words serve as masks), the largest distance among the others, and
//     whether one of them may hold a new largest relative distance (a
//     multiplication against the current largest, with a safety margin,
//     instead of a division per cell);
//  3. looked at cell by cell only where the screen says so: the cells
//     that may differ go through the exact rule (colCmp.eq and delta),
//     and a block that may hold a new maximum is scanned again to find
//     where it sits.
//
// The answers are exactly those of the cell-by-cell rule: the screen only
// decides which cells are looked at, and its tests are conservative.

// floatBlock is how many slots the float kernel screens at once.
const floatBlock = 512

// relMargin shrinks the current largest relative distance before a cell's
// distance is held against it (d > relMax·m·relMargin): the product is
// rounded twice, so without the margin a cell whose d/m rounds to just
// above relMax could be passed over.
const relMargin = 1 - 0x1p-50

// lineup is one run of slots whose got values are lined up with want's.
type lineup struct {
	p      pairing
	wv, gv validity // validity of want's and of got's value of each slot k (bit k), from slot 0 of the run
	// paired, when not nil, has bit k set when slot k has a partner; its
	// words are read as wanted.
	paired func(c int) uint64
}

// floatRun compares want values a with got values b lined up with them
// (len(a) == len(b) == l.p.n), filling r.
func (cc *colCmp) floatRun(a, b []float64, l lineup, r *colResult) {
	n := len(a)
	rule := cc.rule
	tolerant := rule.hasTol || rule.hasULP
	var bad [floatBlock / 64]uint64
	for lo := 0; lo < n; lo += floatBlock {
		hi := min(lo+floatBlock, n)
		// Validity and pairing words of the block's chunks.
		var both, oneNull [floatBlock / 64]uint64
		same := l.masks(lo, hi, n, &both, &oneNull)
		// Identical bytes and validity: every pair is null with null or
		// equal values (what unpaired slots hold does not matter).
		if same && bytes.Equal(asBytes(a[lo:hi]), asBytes(b[lo:hi])) {
			continue
		}
		goodMax, cand := 0.0, false
		relLimit := r.maxRel * relMargin
		for c := lo; c < hi; c += 64 {
			i := (c - lo) / 64
			e := min(c+64, hi)
			var out uint64
			switch {
			case rule.hasULP:
				out, goodMax, cand = screenULPs(a[c:e], b[c:e], rule.ulps, relLimit, goodMax, cand)
			case rule.hasTol:
				out, goodMax, cand = screenTol(a[c:e], b[c:e], rule.abs, rule.rel, relLimit, goodMax, cand)
			default:
				out = screenExact(a[c:e], b[c:e])
			}
			bad[i] = out&both[i] | oneNull[i]
		}
		// Cells that may differ through the exact rule: a pair of
		// values directly, a null against a value (or NaN that counts as
		// null) through colCmp.
		for c := lo; c < hi; c += 64 {
			i := (c - lo) / 64
			for w := bad[i]; w != 0; w &= w - 1 {
				t := bits.TrailingZeros64(w)
				k := c + t
				if oneNull[i]&(1<<uint(t)) != 0 || cc.nanNul {
					wi, gi := l.p.at(k)
					cc.slowCell(wi, gi, l.p.base+k, r)
					continue
				}
				x, y := a[k], b[k]
				eq := floatEqual(x, y, rule)
				if !eq {
					r.hit(l.p.base + k)
				}
				if !eq || tolerant {
					r.track(cc.withULPs(floatDelta(x, y), x, y), l.p.base+k)
				}
			}
		}
		// A block that may hold a new largest distance: the cells that
		// were not looked at, again, exactly.
		if tolerant && (goodMax > r.maxAbs || cand) {
			for c := lo; c < hi; c += 64 {
				i := (c - lo) / 64
				for w := both[i] &^ bad[i]; w != 0; w &= w - 1 {
					k := c + bits.TrailingZeros64(w)
					if a[k] != b[k] {
						r.trackFinite(a[k], b[k], l.p.base+k)
					}
				}
			}
		}
	}
}

// screenTol screens up to 64 cells under a tolerance: bit t of out is set
// when cell t may differ; max is raised to the largest |w − g| of the
// cells and cand set when one may hold a relative distance above the one
// relLimit was made from. Cells that are not valid (nulls, unpaired slots)
// are the caller's to mask out of out; their distances count in max and
// cand, which only makes the caller look at the block again.
//
// Both tests use |w| where the rule has max(|w|, |g|), which is never
// smaller, so they pass over no cell they should catch: a cell is caught
// when |w − g| > max(abs, rel·|w|) (a NaN or an infinity in g too, as its
// distance is then NaN or infinite), or when w is infinite (an infinity
// equals only itself, whatever the tolerance); a cell's relative distance
// |w − g| / max(|w|, |g|) cannot exceed relLimit unless |w − g| >
// relLimit·|w|.
func screenTol(a, b []float64, abs, rel, relLimit, max float64, cand bool) (uint64, float64, bool) {
	var out uint64
	b = b[:len(a)]
	for t, w := range a {
		d := math.Abs(w - b[t])
		aw := math.Abs(w)
		lim := rel * aw
		if abs > lim {
			lim = abs
		}
		if !(d <= lim) || !(aw <= math.MaxFloat64) {
			out |= 1 << (uint(t) & 63)
		}
		if d > max {
			max = d
		}
		if d > relLimit*aw {
			cand = true
		}
	}
	return out, max, cand
}

// screenULPs is screenTol under a ULP rule: a cell may differ when its
// values are more than n units in the last place apart or its distance is
// not a finite number.
func screenULPs(a, b []float64, n uint64, relLimit, max float64, cand bool) (uint64, float64, bool) {
	var out uint64
	b = b[:len(a)]
	for t, w := range a {
		g := b[t]
		d := math.Abs(w - g)
		if absDiff(orderedBits(w), orderedBits(g)) > n || !(d <= math.MaxFloat64) {
			out |= 1 << (uint(t) & 63)
		}
		if d > max {
			max = d
		}
		if d > relLimit*math.Abs(w) {
			cand = true
		}
	}
	return out, max, cand
}

// screenExact screens up to 64 cells under the exact rule: bit t is set
// when the values are not == (NaN against NaN too, which the exact rule
// then finds equal).
func screenExact(a, b []float64) uint64 {
	var out uint64
	b = b[:len(a)]
	for t, w := range a {
		if w != b[t] {
			out |= 1 << (uint(t) & 63)
		}
	}
	return out
}

// trackFinite tracks the distance of two finite, different floats.
func (r *colResult) trackFinite(w, g float64, slot int) {
	abs := math.Abs(w - g)
	r.track(Delta{Has: true, Abs: abs, Rel: abs / math.Max(math.Abs(w), math.Abs(g))}, slot)
}
