package assert

import (
	"bytes"
	"math/bits"
	"runtime"
	"sync"
	"sync/atomic"

	"github.com/proofsheet/proofsheet/fixtures"
)

// pairing lists the pairs of rows to compare as slots 0..n-1: slot k pairs
// want row w[k] with got row g[k]. A nil w or g means row k itself; a
// negative g[k] means want row w[k] has no partner (it is skipped).
type pairing struct {
	n    int
	w, g []int32
}

func (p pairing) at(k int) (wi, gi int) {
	wi, gi = k, k
	if p.w != nil {
		wi = int(p.w[k])
	}
	if p.g != nil {
		gi = int(p.g[k])
	}
	return wi, gi
}

// colResult is what comparing one column found.
type colResult struct {
	limit     int
	differing int
	first     []int32  // slots of the first differing cells, at most limit
	rows      []uint64 // bitmap of slots with a differing cell, nil if none
	nslots    int
	maxAbs    float64
	maxRel    float64
	absAt     int // slot of the first maximum, -1 when none
	relAt     int
}

func newColResult(limit, nslots int) *colResult {
	return &colResult{limit: limit, nslots: nslots, absAt: -1, relAt: -1}
}

// hit records a differing cell at slot k.
func (r *colResult) hit(k int) {
	r.differing++
	if r.limit < 0 || len(r.first) < r.limit {
		r.first = append(r.first, int32(k))
	}
	if r.rows == nil {
		r.rows = make([]uint64, (r.nslots+63)/64)
	}
	r.rows[k>>6] |= 1 << (uint(k) & 63)
}

// track keeps the largest deltas; NaN deltas are ignored.
func (r *colResult) track(d Delta, k int) {
	if !d.Has {
		return
	}
	if d.Abs > r.maxAbs || (r.absAt < 0 && d.Abs == r.maxAbs) {
		r.maxAbs, r.absAt = d.Abs, k
	}
	if d.Rel > r.maxRel || (r.relAt < 0 && d.Rel == r.maxRel) {
		r.maxRel, r.relAt = d.Rel, k
	}
}

func popcount(w uint64) int { return bits.OnesCount64(w) }

// parallelCells is the table size (cells compared) from which columns are
// compared on several goroutines.
const parallelCells = 1 << 16

// compareColumns runs the kernel of every compared column, on up to
// GOMAXPROCS goroutines for large tables. Each column's result depends
// only on that column, so the outcome does not depend on scheduling.
func (c *comparison) compareColumns() []*colResult {
	results := make([]*colResult, len(c.cols))
	for j := range c.cols {
		results[j] = newColResult(c.d.Limit, c.pairs.n)
	}
	workers := min(runtime.GOMAXPROCS(0), len(c.cols))
	if workers <= 1 || c.pairs.n*len(c.cols) < parallelCells {
		for j, cc := range c.cols {
			cc.compare(c.pairs, results[j])
		}
		return results
	}
	var next atomic.Int64
	var wg sync.WaitGroup
	for range workers {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for {
				j := int(next.Add(1) - 1)
				if j >= len(c.cols) {
					return
				}
				c.cols[j].compare(c.pairs, results[j])
			}
		}()
	}
	wg.Wait()
	return results
}

// compare compares the column's cells over the pairing, using a fast loop
// over the raw values when neither side has nulls.
func (cc *colCmp) compare(p pairing, r *colResult) {
	if cc.wc.NullCount() == 0 && cc.gc.NullCount() == 0 {
		switch cc.class {
		case classFloat:
			cc.compareFloats(p, r)
			return
		case classInt, classTime:
			if cc.class == classInt || (cc.wc.Type().Unit() == cc.gc.Type().Unit() && !cc.hasTT) {
				compareExact(cc, cc.wc.Int64s(), cc.gc.Int64s(), p, r)
				return
			}
		case classDate:
			if !cc.hasTT {
				compareExact(cc, cc.wc.DaysSlice(), cc.gc.DaysSlice(), p, r)
				return
			}
		case classText:
			if cc.wc.Kind() == fixtures.KindString && cc.gc.Kind() == fixtures.KindString {
				cc.compareStrings(p, r)
				return
			}
			if cc.wc.Kind() == fixtures.KindCategory && cc.gc.Kind() == fixtures.KindCategory {
				cc.compareCategories(p, r)
				return
			}
		}
	}
	cc.compareCells(p, r)
}

// compareCells is the general loop: one cell at a time through eq.
func (cc *colCmp) compareCells(p pairing, r *colResult) {
	tol, deltas := cc.tolerant(), cc.hasDelta()
	for k := 0; k < p.n; k++ {
		wi, gi := p.at(k)
		if gi < 0 {
			continue
		}
		eq := cc.eq(wi, gi)
		if !eq {
			r.hit(k)
		}
		if deltas && (!eq || tol) {
			r.track(cc.delta(wi, gi), k)
		}
	}
}

// slowCell handles a pair whose raw values are not identical.
func (cc *colCmp) slowCell(wi, gi, k int, r *colResult) {
	eq := cc.eq(wi, gi)
	if !eq {
		r.hit(k)
	}
	if !eq || cc.tolerant() {
		r.track(cc.delta(wi, gi), k)
	}
}

// compareExact compares columns whose cells are equal exactly when their
// raw values are (int64, same-unit timestamps, dates).
func compareExact[T int64 | int32](cc *colCmp, a, b []T, p pairing, r *colResult) {
	switch {
	case p.w == nil && p.g == nil:
		a, b = a[:p.n], b[:p.n]
		for i := 0; i+4 <= len(a); i += 4 {
			if a[i] != b[i] || a[i+1] != b[i+1] || a[i+2] != b[i+2] || a[i+3] != b[i+3] {
				for k := i; k < i+4; k++ {
					if a[k] != b[k] {
						cc.slowCell(k, k, k, r)
					}
				}
			}
		}
		for k := len(a) &^ 3; k < len(a); k++ {
			if a[k] != b[k] {
				cc.slowCell(k, k, k, r)
			}
		}
	case p.w == nil:
		for k, gi := range p.g[:p.n] {
			if gi >= 0 && a[k] != b[gi] {
				cc.slowCell(k, int(gi), k, r)
			}
		}
	default:
		for k := 0; k < p.n; k++ {
			wi, gi := p.w[k], p.g[k]
			if a[wi] != b[gi] {
				cc.slowCell(int(wi), int(gi), k, r)
			}
		}
	}
}

// compareFloats compares float64 columns without nulls. Values that are
// == (−0 and +0 included) are equal under every rule and have distance 0;
// the rest go through the rule.
func (cc *colCmp) compareFloats(p pairing, r *colResult) {
	a, b := cc.wc.Float64s(), cc.gc.Float64s()
	slow := func(w, g float64, wi, gi, k int) {
		if !floatEqual(w, g, cc.rule) {
			r.hit(k)
		}
		r.track(cc.withULPs(floatDelta(w, g), w, g), k)
	}
	switch {
	case p.w == nil && p.g == nil:
		a, b = a[:p.n], b[:p.n]
		for i := 0; i+4 <= len(a); i += 4 {
			if a[i] != b[i] || a[i+1] != b[i+1] || a[i+2] != b[i+2] || a[i+3] != b[i+3] {
				for k := i; k < i+4; k++ {
					if a[k] != b[k] {
						slow(a[k], b[k], k, k, k)
					}
				}
			}
		}
		for k := len(a) &^ 3; k < len(a); k++ {
			if a[k] != b[k] {
				slow(a[k], b[k], k, k, k)
			}
		}
	case p.w == nil:
		for k, gi := range p.g[:p.n] {
			if gi >= 0 && a[k] != b[gi] {
				slow(a[k], b[gi], k, int(gi), k)
			}
		}
	default:
		for k := 0; k < p.n; k++ {
			wi, gi := p.w[k], p.g[k]
			if a[wi] != b[gi] {
				slow(a[wi], b[gi], int(wi), int(gi), k)
			}
		}
	}
}

// stringChunk is how many rows of a string column are checked at once by
// comparing their offsets and bytes in bulk.
const stringChunk = 32

// compareStrings compares string columns without nulls through their raw
// offsets and bytes: a chunk of rows whose lengths and bytes all agree is
// equal as a whole; other chunks go row by row.
func (cc *colCmp) compareStrings(p pairing, r *colResult) {
	wo, wd := cc.wc.TextBytes()
	gOff, gd := cc.gc.TextBytes()
	row := func(wi, gi, k int) {
		if string(wd[wo[wi]:wo[wi+1]]) != string(gd[gOff[gi]:gOff[gi+1]]) {
			cc.slowCell(wi, gi, k, r)
		}
	}
	if p.w != nil || p.g != nil {
		for k := 0; k < p.n; k++ {
			wi, gi := p.at(k)
			if gi >= 0 {
				row(wi, gi, k)
			}
		}
		return
	}
	for i := 0; i < p.n; i += stringChunk {
		end := min(i+stringChunk, p.n)
		same := wo[end]-wo[i] == gOff[end]-gOff[i]
		if same {
			dw, dg := wo[i], gOff[i]
			for k := i + 1; k < end; k++ {
				if wo[k]-dw != gOff[k]-dg {
					same = false
					break
				}
			}
		}
		if same && bytes.Equal(wd[wo[i]:wo[end]], gd[gOff[i]:gOff[end]]) {
			continue
		}
		for k := i; k < end; k++ {
			row(k, k, k)
		}
	}
}

// compareCategories compares category columns without nulls by their
// codes: each side's codes map to ids of the (normalised) level texts, so
// columns with different level orders compare by text.
func (cc *colCmp) compareCategories(p pairing, r *colResult) {
	wl, gl := cc.wc.Levels(), cc.gc.Levels()
	ids := make(map[string]int32, len(wl))
	idOf := func(levels []string) []int32 {
		out := make([]int32, len(levels))
		for i, l := range levels {
			if cc.norm != 0 {
				l = normalize(l, cc.norm)
			}
			id, ok := ids[l]
			if !ok {
				id = int32(len(ids))
				ids[l] = id
			}
			out[i] = id
		}
		return out
	}
	wid, gid := idOf(wl), idOf(gl)
	w8, w16, w32 := cc.wc.CodeSlices()
	g8, g16, g32 := cc.gc.CodeSlices()
	switch {
	case w8 != nil:
		compareCodes(cc, w8, g8, g16, g32, wid, gid, p, r)
	case w16 != nil:
		compareCodes(cc, w16, g8, g16, g32, wid, gid, p, r)
	case w32 != nil:
		compareCodes(cc, w32, g8, g16, g32, wid, gid, p, r)
	}
}

type code interface{ int8 | int16 | int32 }

func compareCodes[A code](cc *colCmp, a []A, g8 []int8, g16 []int16, g32 []int32, wid, gid []int32, p pairing, r *colResult) {
	switch {
	case g8 != nil:
		compareCodePairs(cc, a, g8, wid, gid, p, r)
	case g16 != nil:
		compareCodePairs(cc, a, g16, wid, gid, p, r)
	case g32 != nil:
		compareCodePairs(cc, a, g32, wid, gid, p, r)
	}
}

func compareCodePairs[A, B code](cc *colCmp, a []A, b []B, wid, gid []int32, p pairing, r *colResult) {
	if p.w == nil && p.g == nil {
		a, b = a[:p.n], b[:p.n]
		for k := range a {
			if wid[a[k]] != gid[b[k]] {
				r.hit(k)
			}
		}
		return
	}
	for k := 0; k < p.n; k++ {
		wi, gi := p.at(k)
		if gi >= 0 && wid[a[wi]] != gid[b[gi]] {
			r.hit(k)
		}
	}
}
