package assert

import (
	"bytes"
	"math/bits"
	"unsafe"
)

// The kernels of the other fixed-width kinds, built like the float kernel
// (see floatkernel.go): got's values and validity are lined up with want's,
// then blocks of floatBlock slots are skipped on identical bytes and
// validity, else screened 64 slots at a time with the validity words as
// masks; only the cells the screen flags go through the exact rule.
//
//   - int64 cells, day counts of dates and ticks of same-unit timestamps
//     (intRun), exactly or under TimeTol as |w − g| ≤ tol whole units,
//     with the largest distance of the cells within tolerance found
//     without looking at them one by one;
//   - category codes (codeRun), through each side's level → id table;
//   - decimals of the same scale (decimalRun), as 128-bit words.

// lineUp returns want's and got's values of the run's slots lined up
// (slot k: wa[k], gb[k]) with their validity and pairing: the columns
// themselves for rows paired by position, got's values gathered through
// the reorder for large keyed pairings, and both sides gathered for other
// pairings. clearGot zeroes got's slots without a partner (for values
// used as indexes).
func lineUp[T int8 | int16 | int32 | int64 | float64](cc *colCmp, p pairing, sc *scratch, a, b []T, clearGot bool) (wa, gb []T, l lineup) {
	wa, l = lineUpWant(cc, p, sc, a)
	gb = lineUpGot(cc, p, sc, b, clearGot, &l)
	return wa, gb, l
}

// gathered reports whether a run's slots are gathered from both sides
// (pairings neither by position nor through the reorder).
func gathered(p pairing, sc *scratch) bool {
	return (p.w != nil || p.g != nil) && !sc.reordered(p)
}

// lineUpWant returns want's values of the run's slots and a lineup with
// want's validity and the pairing.
func lineUpWant[T int8 | int16 | int32 | int64 | float64](cc *colCmp, p pairing, sc *scratch, a []T) ([]T, lineup) {
	l := lineup{p: p}
	if p.g != nil {
		l.paired = pairedWords(p.g)
	}
	if !gathered(p, sc) {
		l.wv = validityOf(cc.wc).from(p.base)
		return a[p.base : p.base+p.n], l
	}
	wa, wbits := make([]T, p.n), make([]uint64, (p.n+63)/64)
	for k := range p.n {
		wi, _ := p.at(k)
		wa[k] = a[wi]
		if !cc.wc.IsNull(wi) {
			wbits[k>>6] |= 1 << uint(k&63)
		}
	}
	l.wv = validity{bits: asBytes(wbits)}
	return wa, l
}

// lineUpGot returns got's values of the run's slots and sets l's got
// validity.
func lineUpGot[T int8 | int16 | int32 | int64 | float64](cc *colCmp, p pairing, sc *scratch, b []T, clearGot bool, l *lineup) []T {
	gv := validityOf(cc.gc)
	switch {
	case p.w == nil && p.g == nil:
		l.gv = gv.from(p.base)
		return b[p.base : p.base+p.n]
	case sc.reordered(p):
		if gv.bits != nil {
			l.gv = sc.validityInWantOrder(p, gv)
		}
		return gotInWantOrder(sc, p, b, clearGot)
	}
	gb, gbits := make([]T, p.n), make([]uint64, (p.n+63)/64)
	for k := range p.n {
		if _, gi := p.at(k); gi >= 0 {
			gb[k] = b[gi]
			if !cc.gc.IsNull(gi) {
				gbits[k>>6] |= 1 << uint(k&63)
			}
		}
	}
	l.gv = validity{bits: asBytes(gbits)}
	return gb
}

// masks returns, for the chunks of block [lo, hi) of n slots, the slots
// where both cells are valid (and paired), the slots where only one is,
// and whether no slot has only one.
func (l lineup) masks(lo, hi, n int, both, oneNull *[floatBlock / 64]uint64) (sameValidity bool) {
	sameValidity = true
	for c := lo; c < hi; c += 64 {
		vw, vg := l.wv.word(c, n), l.gv.word(c, n)
		pm := ^uint64(0)
		if l.paired != nil {
			pm = l.paired(c)
		}
		if left := hi - c; left < 64 {
			pm &= 1<<uint(left) - 1
		}
		i := (c - lo) / 64
		both[i], oneNull[i] = vw&vg&pm, (vw^vg)&pm
		sameValidity = sameValidity && oneNull[i] == 0
	}
	return sameValidity
}

// exactMasked is the kernel of columns whose cells are equal exactly when
// their raw values are (given the columns' level tables for codes):
// identical(lo, hi) reports whether the raw bytes of slots lo..hi-1 are
// identical on both sides, screen(c, e) which of slots c..e-1 (bit t: slot
// c+t) hold raw values that differ.
func (cc *colCmp) exactMasked(n int, l lineup, r *colResult, identical func(lo, hi int) bool, screen func(c, e int) uint64) {
	var both, oneNull [floatBlock / 64]uint64
	for lo := 0; lo < n; lo += floatBlock {
		hi := min(lo+floatBlock, n)
		if l.masks(lo, hi, n, &both, &oneNull) && identical(lo, hi) {
			continue
		}
		for c := lo; c < hi; c += 64 {
			i := (c - lo) / 64
			for w := screen(c, min(c+64, hi))&both[i] | oneNull[i]; w != 0; w &= w - 1 {
				k := c + bits.TrailingZeros64(w)
				wi, gi := l.p.at(k)
				cc.slowCell(wi, gi, l.p.base+k, r)
			}
		}
	}
}

// intRun compares want values a with got values b lined up with them:
// int64 cells, day counts or same-unit ticks. Cells are equal when |a − b|
// ≤ tol (0: exactly). When tolerant, cells within tol are 0 < |a − b|
// apart too, and their distances (|a − b| as a float64 times perUnit
// seconds, or over perSecond units a second) count for the largest one.
func intRun[T int32 | int64](cc *colCmp, a, b []T, l lineup, r *colResult, tol uint64, tolerant bool) {
	n := len(a)
	b = b[:n]
	dist := func(d uint64) float64 { return float64(d) * 86400 } // days
	if cc.wc.Kind() != cc.gc.Kind() || unitNanos(cc.wc) != 86400e9 {
		perSecond := float64(1e9 / unitNanos(cc.wc))
		dist = func(d uint64) float64 { return float64(d) / perSecond }
	}
	var both, oneNull [floatBlock / 64]uint64
	var bad [floatBlock / 64]uint64
	for lo := 0; lo < n; lo += floatBlock {
		hi := min(lo+floatBlock, n)
		if l.masks(lo, hi, n, &both, &oneNull) && bytes.Equal(asBytes(a[lo:hi]), asBytes(b[lo:hi])) {
			continue
		}
		var dmax uint64
		for c := lo; c < hi; c += 64 {
			e := min(c+64, hi)
			var out uint64
			x, y := a[c:e], b[c:e]
			y = y[:len(x)]
			for t, v := range x {
				d := absDiff(int64(v), int64(y[t]))
				if d > tol {
					out |= 1 << (uint(t) & 63)
				}
				if d > dmax && tolerant {
					dmax = d
				}
			}
			i := (c - lo) / 64
			bad[i] = out&both[i] | oneNull[i]
		}
		for c := lo; c < hi; c += 64 {
			for w := bad[(c-lo)/64]; w != 0; w &= w - 1 {
				k := c + bits.TrailingZeros64(w)
				wi, gi := l.p.at(k)
				cc.slowCell(wi, gi, l.p.base+k, r)
			}
		}
		if tolerant && dmax > 0 && dist(dmax) > r.maxAbs {
			for c := lo; c < hi; c += 64 {
				i := (c - lo) / 64
				for w := both[i] &^ bad[i]; w != 0; w &= w - 1 {
					k := c + bits.TrailingZeros64(w)
					if d := absDiff(int64(a[k]), int64(b[k])); d > 0 {
						r.track(Delta{Has: true, Abs: dist(d)}, l.p.base+k)
					}
				}
			}
		}
	}
}

// compareInts compares int64 columns, dates and same-unit timestamps,
// exactly or under TimeTol, through intRun. It reports false for other
// time columns.
func (cc *colCmp) compareInts(p pairing, r *colResult, sc *scratch) bool {
	switch cc.class {
	case classInt:
		a, b, l := lineUp(cc, p, sc, cc.wc.Int64s(), cc.gc.Int64s(), false)
		intRun(cc, a, b, l, r, 0, false)
	case classTime:
		if !cc.sameUnit() {
			return false
		}
		a, b, l := lineUp(cc, p, sc, cc.wc.Int64s(), cc.gc.Int64s(), false)
		intRun(cc, a, b, l, r, cc.ttUnits, cc.hasTT)
	case classDate:
		a, b, l := lineUp(cc, p, sc, cc.wc.DaysSlice(), cc.gc.DaysSlice(), false)
		intRun(cc, a, b, l, r, cc.ttUnits, cc.hasTT)
	default:
		return false
	}
	return true
}

// codeRun compares category codes lined up (slot k: a[k], b[k]) through
// the level → id tables of each side.
func codeRun[A, B code](cc *colCmp, a []A, b []B, wid, gid []int32, l lineup, r *colResult) {
	b = b[:len(a)]
	identical := func(lo, hi int) bool { return false }
	if sameCodes[A, B](wid, gid) {
		identical = func(lo, hi int) bool {
			return bytes.Equal(asBytes(a[lo:hi]), asBytes(unsafe.Slice((*A)(unsafe.Pointer(unsafe.SliceData(b))), len(b))[lo:hi]))
		}
	}
	cc.exactMasked(len(a), l, r, identical, func(c, e int) uint64 {
		var out uint64
		for t, x := range a[c:e] {
			if wid[x] != gid[b[c+t]] {
				out |= 1 << (uint(t) & 63)
			}
		}
		return out
	})
}

// compareCodeRuns lines up the codes of a pair of category columns and
// compares them through codeRun.
func compareCodeRuns[A, B code](cc *colCmp, a []A, b []B, wid, gid []int32, p pairing, r *colResult, sc *scratch) {
	wa, l := lineUpWant(cc, p, sc, a)
	gb := lineUpGot(cc, p, sc, b, true, &l)
	codeRun(cc, wa, gb, wid, gid, l, r)
}

// compareDecimals compares decimal columns of the same scale by their
// unscaled 128-bit values; it reports false for other scales.
func (cc *colCmp) compareDecimals(p pairing, r *colResult, sc *scratch) bool {
	if cc.wc.Type().Scale() != cc.gc.Type().Scale() {
		return false
	}
	a, b := cc.wc.DecimalWords(), cc.gc.DecimalWords()
	wv, gv := validityOf(cc.wc), validityOf(cc.gc)
	l := lineup{p: p}
	var wa, gb []uint64
	if p.w == nil && p.g == nil {
		l.wv, l.gv = wv.from(p.base), gv.from(p.base)
		wa, gb = a[2*p.base:2*(p.base+p.n)], b[2*p.base:2*(p.base+p.n)]
	} else {
		wa, gb = make([]uint64, 2*p.n), make([]uint64, 2*p.n)
		wbits, gbits := make([]uint64, (p.n+63)/64), make([]uint64, (p.n+63)/64)
		for k := range p.n {
			wi, gi := p.at(k)
			wa[2*k], wa[2*k+1] = a[2*wi], a[2*wi+1]
			if !cc.wc.IsNull(wi) {
				wbits[k>>6] |= 1 << uint(k&63)
			}
			if gi >= 0 {
				gb[2*k], gb[2*k+1] = b[2*gi], b[2*gi+1]
				if !cc.gc.IsNull(gi) {
					gbits[k>>6] |= 1 << uint(k&63)
				}
			}
		}
		l.wv, l.gv = validity{bits: asBytes(wbits)}, validity{bits: asBytes(gbits)}
		if p.g != nil {
			l.paired = pairedWords(p.g)
		}
	}
	cc.exactMasked(p.n, l, r, func(lo, hi int) bool {
		return bytes.Equal(asBytes(wa[2*lo:2*hi]), asBytes(gb[2*lo:2*hi]))
	}, func(c, e int) uint64 {
		var out uint64
		for t := range e - c {
			k := 2 * (c + t)
			if wa[k] != gb[k] || wa[k+1] != gb[k+1] {
				out |= 1 << (uint(t) & 63)
			}
		}
		return out
	})
	return true
}
