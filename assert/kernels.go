package assert

import (
	"bytes"
	"math"
	"math/bits"
	"runtime"
	"sync"
	"sync/atomic"
	"unsafe"

	"github.com/proofsheet/proofsheet/fixtures"
)

// pairing lists the pairs of rows to compare as slots base..base+n-1. Slot
// base+k pairs want row w[k] with got row g[k]; a nil w or g means row
// base+k itself; a negative g[k] means the want row has no partner (the
// slot is skipped). Sub-pairings for parallel work share the full pairing's
// slot numbers through base.
type pairing struct {
	base int
	n    int
	w, g []int32
}

func (p pairing) at(k int) (wi, gi int) {
	wi, gi = p.base+k, p.base+k
	if p.w != nil {
		wi = int(p.w[k])
	}
	if p.g != nil {
		gi = int(p.g[k])
	}
	return wi, gi
}

// slotAt returns the slot number of global slot s, for rendering: the
// want and got rows it pairs.
func (p pairing) slotAt(s int) (wi, gi int) {
	return p.sub(s, s+1).at(0)
}

// sub returns slots [lo, hi) of p (lo and hi are global slot numbers).
func (p pairing) sub(lo, hi int) pairing {
	q := pairing{base: lo, n: hi - lo}
	if p.w != nil {
		q.w = p.w[lo-p.base : hi-p.base]
	}
	if p.g != nil {
		q.g = p.g[lo-p.base : hi-p.base]
	}
	return q
}

// colResult is what comparing one column (or a range of its slots) found.
type colResult struct {
	limit     int
	differing int
	first     []int32  // slots of the first differing cells, at most limit
	rows      []uint64 // bitmap of slots from rowsBase with a differing cell, nil if none
	rowsBase  int      // first slot of the bitmap, a multiple of 64
	nslots    int      // slots the bitmap covers
	maxAbs    float64
	maxRel    float64
	absAt     int // slot of the first maximum, -1 when none
	relAt     int
	sink      byte // keeps the cache-warming loads of gathers alive
}

func newColResult(limit, base, nslots int) *colResult {
	return &colResult{limit: limit, rowsBase: base, nslots: nslots, absAt: -1, relAt: -1}
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
	i := k - r.rowsBase
	r.rows[i>>6] |= 1 << (uint(i) & 63)
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

// merge adds the result of the next range of slots.
func (r *colResult) merge(o *colResult) {
	r.differing += o.differing
	for _, k := range o.first {
		if r.limit >= 0 && len(r.first) >= r.limit {
			break
		}
		r.first = append(r.first, k)
	}
	if o.rows != nil {
		if r.rows == nil {
			r.rows = make([]uint64, (r.nslots+63)/64)
		}
		copy(r.rows[(o.rowsBase-r.rowsBase)>>6:], o.rows)
	}
	if o.absAt >= 0 && (r.absAt < 0 || o.maxAbs > r.maxAbs) {
		r.maxAbs, r.absAt = o.maxAbs, o.absAt
	}
	if o.relAt >= 0 && (r.relAt < 0 || o.maxRel > r.maxRel) {
		r.maxRel, r.relAt = o.maxRel, o.relAt
	}
}

func popcount(w uint64) int { return bits.OnesCount64(w) }

// parallelCells is the table size (cells compared) from which columns are
// compared on several goroutines.
const parallelCells = 1 << 16

// taskSlots is how many slots of one column a parallel task compares (a
// multiple of 64, so that tasks never share a bitmap word).
const taskSlots = 1 << 18

// compareColumns runs the kernels of every compared column over the
// pairing. Large tables are cut into tasks of one column and a range of
// slots, run on up to GOMAXPROCS goroutines; each task's result depends
// only on its column and range, and results merge in range order, so the
// outcome does not depend on the scheduling.
func (c *comparison) compareColumns() []*colResult {
	n := c.pairs.n
	results := make([]*colResult, len(c.cols))
	for j := range c.cols {
		results[j] = newColResult(c.d.Limit, c.pairs.base, n)
	}
	workers := runtime.GOMAXPROCS(0)
	if workers <= 1 || n*len(c.cols) < parallelCells {
		for j, cc := range c.cols {
			if !cc.skip {
				cc.compare(c.pairs, results[j])
			}
		}
		return results
	}
	type task struct {
		col    int
		lo, hi int
		res    *colResult
	}
	var tasks []task
	perCol := make([][]*colResult, len(c.cols))
	for j, cc := range c.cols {
		if cc.skip {
			continue
		}
		for lo := 0; lo < n; lo += taskSlots {
			hi := min(lo+taskSlots, n)
			r := newColResult(c.d.Limit, c.pairs.base+lo, hi-lo)
			tasks = append(tasks, task{j, c.pairs.base + lo, c.pairs.base + hi, r})
			perCol[j] = append(perCol[j], r)
		}
	}
	var next atomic.Int64
	var wg sync.WaitGroup
	for range min(workers, len(tasks)) {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for {
				t := int(next.Add(1) - 1)
				if t >= len(tasks) {
					return
				}
				tk := tasks[t]
				c.cols[tk.col].compare(c.pairs.sub(tk.lo, tk.hi), tk.res)
			}
		}()
	}
	wg.Wait()
	for j, parts := range perCol {
		for _, r := range parts {
			results[j].merge(r)
		}
	}
	return results
}

// compare compares the column's cells over the pairing, using fast loops
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
			if cc.wc.Kind() == fixtures.KindString && cc.gc.Kind() == fixtures.KindString && cc.norm == 0 {
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
			r.hit(p.base + k)
		}
		if deltas && (!eq || tol) {
			r.track(cc.delta(wi, gi), p.base+k)
		}
	}
}

// slowCell handles a pair whose raw values are not identical.
func (cc *colCmp) slowCell(wi, gi, slot int, r *colResult) {
	eq := cc.eq(wi, gi)
	if !eq {
		r.hit(slot)
	}
	if !eq || cc.tolerant() {
		r.track(cc.delta(wi, gi), slot)
	}
}

// bulkChunk is how many bytes of raw values are checked at once with a
// memory comparison before looking at single values.
const bulkChunk = 2048

// asBytes views a slice of fixed-size numbers as its bytes.
func asBytes[T int8 | int16 | int32 | int64 | float64](s []T) []byte {
	if len(s) == 0 {
		return nil
	}
	return unsafe.Slice((*byte)(unsafe.Pointer(unsafe.SliceData(s))), len(s)*int(unsafe.Sizeof(s[0])))
}

// sameRuns calls each(i, j) for every chunk [i, j) of a and b (rows paired
// by position) whose bytes differ; chunks whose bytes are identical hold
// only equal cells and are skipped.
func sameRuns[T int8 | int16 | int32 | int64 | float64](a, b []T, each func(i, j int)) {
	per := bulkChunk / int(unsafe.Sizeof(a[0]))
	for i := 0; i < len(a); i += per {
		j := min(i+per, len(a))
		if !bytes.Equal(asBytes(a[i:j]), asBytes(b[i:j])) {
			each(i, j)
		}
	}
}

// compareExact compares columns whose cells are equal exactly when their
// raw values are (int64, same-unit timestamps, dates).
func compareExact[T int64 | int32](cc *colCmp, a, b []T, p pairing, r *colResult) {
	switch {
	case p.w == nil && p.g == nil:
		base := p.base
		a, b = a[base:base+p.n], b[base:base+p.n]
		sameRuns(a, b, func(i, j int) {
			for k := i; k < j; k++ {
				if a[k] != b[k] {
					cc.slowCell(base+k, base+k, base+k, r)
				}
			}
		})
	case p.w == nil:
		a = a[p.base : p.base+p.n]
		for k, gi := range p.g {
			if gi >= 0 && a[k] != b[gi] {
				cc.slowCell(p.base+k, int(gi), p.base+k, r)
			}
		}
	default:
		for k, wi := range p.w {
			gi := p.g[k]
			if a[wi] != b[gi] {
				cc.slowCell(int(wi), int(gi), p.base+k, r)
			}
		}
	}
}

// compareFloats compares float64 columns without nulls. Values that are
// == (−0 and +0 included) or bit for bit identical are equal under every
// rule and have distance 0; the rest go through the rule.
func (cc *colCmp) compareFloats(p pairing, r *colResult) {
	a, b := cc.wc.Float64s(), cc.gc.Float64s()
	rule := cc.rule
	slow := func(w, g float64, slot int) {
		if !floatEqual(w, g, rule) {
			r.hit(slot)
		}
		if rule.hasULP || math.IsInf(w, 0) || math.IsInf(g, 0) || w != w || g != g {
			r.track(cc.withULPs(floatDelta(w, g), w, g), slot)
			return
		}
		// Finite values: the distance without building a Delta.
		abs := math.Abs(w - g)
		if abs > r.maxAbs || r.absAt < 0 {
			r.maxAbs, r.absAt = abs, slot
		}
		if rel := abs / math.Max(math.Abs(w), math.Abs(g)); rel > r.maxRel || r.relAt < 0 {
			r.maxRel, r.relAt = rel, slot
		}
	}
	switch {
	case p.w == nil && p.g == nil:
		base := p.base
		a, b = a[base:base+p.n], b[base:base+p.n]
		sameRuns(a, b, func(i, j int) {
			for k := i; k < j; k++ {
				if a[k] != b[k] {
					slow(a[k], b[k], base+k)
				}
			}
		})
	case p.w == nil:
		a = a[p.base : p.base+p.n]
		for k, gi := range p.g {
			if gi >= 0 && a[k] != b[gi] {
				slow(a[k], b[gi], p.base+k)
			}
		}
	default:
		for k, wi := range p.w {
			if x, y := a[wi], b[p.g[k]]; x != y {
				slow(x, y, p.base+k)
			}
		}
	}
}

// gatherBatch is how many rows a gathering loop prepares at once.
const gatherBatch = 64

// stringChunk is how many rows of a string column are checked at once by
// comparing their lengths and bytes in bulk.
const stringChunk = 32

// stringRun is how many rows of a string column are first tried as one
// run of identical offsets and bytes.
const stringRun = 512

// compareStrings compares string columns without nulls through their raw
// offsets and bytes: a chunk of rows whose lengths and bytes all agree is
// equal as a whole; other chunks go row by row.
func (cc *colCmp) compareStrings(p pairing, r *colResult) {
	wo, wd := cc.wc.TextBytes()
	gOff, gd := cc.gc.TextBytes()
	if p.w != nil || p.g != nil {
		// Rows in another order: gather the got offsets of a batch and
		// touch the first byte of each cell first, so that the cache
		// misses of the batch overlap instead of coming one by one.
		var st, en [gatherBatch]int32
		var sink byte
		for lo := 0; lo < p.n; lo += gatherBatch {
			hi := min(lo+gatherBatch, p.n)
			for k := lo; k < hi; k++ {
				_, gi := p.at(k)
				if gi < 0 {
					continue
				}
				a, b := gOff[gi], gOff[gi+1]
				st[k-lo], en[k-lo] = a, b
				if b > a {
					sink ^= gd[a]
				}
			}
			for k := lo; k < hi; k++ {
				wi, gi := p.at(k)
				if gi < 0 {
					continue
				}
				if string(wd[wo[wi]:wo[wi+1]]) != string(gd[st[k-lo]:en[k-lo]]) {
					cc.slowCell(wi, gi, p.base+k, r)
				}
			}
		}
		r.sink = sink
		return
	}
	base, stop := p.base, p.base+p.n
	for i := base; i < stop; {
		// A long run whose offsets are identical (the usual case when the
		// cells so far have had the same lengths) and whose bytes are
		// identical is equal as a whole.
		if end := min(i+stringRun, stop); wo[i] == gOff[i] &&
			bytes.Equal(asBytes(wo[i:end+1]), asBytes(gOff[i:end+1])) && bytes.Equal(wd[wo[i]:wo[end]], gd[gOff[i]:gOff[end]]) {
			i = end
			continue
		}
		end := min(i+stringChunk, stop)
		next := end
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
		if !same || !bytes.Equal(wd[wo[i]:wo[end]], gd[gOff[i]:gOff[end]]) {
			for k := i; k < end; k++ {
				if string(wd[wo[k]:wo[k+1]]) != string(gd[gOff[k]:gOff[k+1]]) {
					cc.slowCell(k, k, k, r)
				}
			}
		}
		i = next
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
			l = cc.normText(l)
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
		compareCodePairs(a, g8, wid, gid, p, r)
	case g16 != nil:
		compareCodePairs(a, g16, wid, gid, p, r)
	case g32 != nil:
		compareCodePairs(a, g32, wid, gid, p, r)
	}
}

// identity reports whether ids maps every code to itself.
func identity(ids []int32) bool {
	for i, id := range ids {
		if id != int32(i) {
			return false
		}
	}
	return true
}

func compareCodePairs[A, B code](a []A, b []B, wid, gid []int32, p pairing, r *colResult) {
	if p.w == nil && p.g == nil {
		base := p.base
		a, b = a[base:base+p.n], b[base:base+p.n]
		check := func(i, j int) {
			for k := i; k < j; k++ {
				if wid[a[k]] != gid[b[k]] {
					r.hit(base + k)
				}
			}
		}
		// Same levels in the same order and the same code width: codes
		// are equal exactly when their bytes are.
		if unsafe.Sizeof(a[0]) == unsafe.Sizeof(b[0]) && len(wid) <= len(gid) && identity(wid) && identity(gid[:len(wid)]) {
			sameRuns(a, unsafe.Slice((*A)(unsafe.Pointer(unsafe.SliceData(b))), len(b)), check)
			return
		}
		check(0, len(a))
		return
	}
	for k := 0; k < p.n; k++ {
		wi, gi := p.at(k)
		if gi >= 0 && wid[a[wi]] != gid[b[gi]] {
			r.hit(p.base + k)
		}
	}
}
