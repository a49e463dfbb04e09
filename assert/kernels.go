package assert

import (
	"bytes"
	"math/bits"
	"runtime"
	"slices"
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
	_         [64]byte // keeps results of tasks on other goroutines off this cache line
	differing int
	rows      []uint64 // bitmap of slots from rowsBase with a differing cell, nil if none
	rowsBase  int      // first slot of the bitmap, a multiple of 64
	nslots    int      // slots the bitmap covers
	maxAbs    float64
	maxRel    float64
	absAt     int // slot of the first maximum, -1 when none
	relAt     int
	sink      byte // keeps the cache-warming loads of gathers alive
	_         [64]byte
}

func newColResult(base, nslots int) *colResult {
	return &colResult{rowsBase: base, nslots: nslots, absAt: -1, relAt: -1}
}

// hit records a differing cell at slot k.
func (r *colResult) hit(k int) {
	r.differing++
	if r.rows == nil {
		r.rows = make([]uint64, (r.nslots+63)/64)
	}
	i := k - r.rowsBase
	r.rows[i>>6] |= 1 << (uint(i) & 63)
}

// track keeps the largest deltas and the first slot holding each: only
// distances above zero have a place (cells without a distance are
// skipped). Cells may be tracked in any order: a larger distance wins,
// and of equal ones the smaller slot.
func (r *colResult) track(d Delta, k int) {
	if !d.Has {
		return
	}
	if d.Abs > r.maxAbs || (d.Abs == r.maxAbs && d.Abs > 0 && k < r.absAt) {
		r.maxAbs, r.absAt = d.Abs, k
	}
	if d.Rel > r.maxRel || (d.Rel == r.maxRel && d.Rel > 0 && k < r.relAt) {
		r.maxRel, r.relAt = d.Rel, k
	}
}

// merge adds the result of the next range of slots.
func (r *colResult) merge(o *colResult) {
	r.differing += o.differing
	if o.rows != nil {
		if r.rows == nil {
			r.rows = make([]uint64, (r.nslots+63)/64)
		}
		copy(r.rows[(o.rowsBase-r.rowsBase)>>6:], o.rows)
	}
	if o.absAt >= 0 {
		r.track(Delta{Has: true, Abs: o.maxAbs}, o.absAt)
	}
	if o.relAt >= 0 {
		r.track(Delta{Has: true, Rel: o.maxRel}, o.relAt)
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
		results[j] = newColResult(c.pairs.base, n)
	}
	workers := runtime.GOMAXPROCS(0)
	if workers <= 1 || n*len(c.cols) < parallelCells {
		for j, cc := range c.cols {
			if !cc.skip {
				cc.compare(c.pairs, results[j], nil)
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
			r := newColResult(c.pairs.base+lo, hi-lo)
			tasks = append(tasks, task{j, c.pairs.base + lo, c.pairs.base + hi, r})
			perCol[j] = append(perCol[j], r)
		}
	}
	scratches := make([]*scratch, min(workers, len(tasks)))
	for w := range scratches {
		if c.reorder != nil {
			scratches[w] = &scratch{reorder: c.reorder, buf: c.reorder.buffer(w, len(scratches))}
		}
	}
	run := func(tasks []task) {
		var next atomic.Int64
		var wg sync.WaitGroup
		for _, sc := range scratches[:min(len(scratches), len(tasks))] {
			wg.Add(1)
			go func() {
				defer wg.Done()
				for {
					t := int(next.Add(1) - 1)
					if t >= len(tasks) {
						return
					}
					tk := tasks[t]
					c.cols[tk.col].compare(c.pairs.sub(tk.lo, tk.hi), tk.res, sc)
				}
			}()
		}
		wg.Wait()
	}
	if ro := c.reorder; ro != nil && len(ro.byRange) > c.cfg.sweepFrom {
		// Many ranges: a column whose got values are 8 bytes is first
		// swept into the pairs' order, then its ranges are compared.
		for len(tasks) > 0 {
			col := tasks[0].col
			end := 1
			for end < len(tasks) && tasks[end].col == col {
				end++
			}
			got, ok := c.cols[col].sweepable()
			if ok {
				ro.sweep(got)
			}
			for _, sc := range scratches {
				sc.swept = ok
			}
			run(tasks[:end])
			tasks = tasks[end:]
		}
	} else {
		run(tasks)
	}
	for j, parts := range perCol {
		for _, r := range parts {
			results[j].merge(r)
		}
	}
	return results
}

// reorder lets a keyed comparison read got's cells in want's order without
// random reads: for each range of taskSlots want rows it lists the pairs
// whose want row lies in the range, in ascending got row order, so a task
// can scatter got's values into a range-sized buffer (random writes into a
// buffer that stays in cache) and then compare it with want's values in one
// sequential pass. On large tables this is several times faster than
// reading got's cells at random.
//
// With many ranges (tables of millions of rows) each range's pairs are
// spread thinly over got, and reading them range by range reads every
// cache line of got's column several times over. Then a column of 8-byte
// values is first swept: got's values are read once, in row order, and
// written into a list in the order of the pairs (sweep), which each range
// reads straight through; the work grows linearly with the rows.
type reorder struct {
	// byRange[r] lists the pairs of want rows r*taskSlots.. as
	// got row<<32 | (want row − r*taskSlots), in ascending got row order.
	byRange [][]uint64
	bufs    []uint64 // spare memory for the per-goroutine buffers

	// For the sweep: wantOf (got row → want row or -1), the runs of got
	// rows the pairs were listed by (workers of them) with where each
	// run's pairs of each range start (at[t][r]), where each range's
	// pairs start (starts[r]), and the swept values.
	wantOf  []int32
	workers int
	at      [][]int
	starts  []int
	vals    []uint64
}

// sweepRanges is how many ranges a keyed comparison has before columns
// are swept.
const sweepRanges = 8

// sweep reads got's 8-byte values (as bits) in row order and writes each
// paired one at its pair's place in ro.vals.
func (ro *reorder) sweep(got []uint64) {
	if ro.vals == nil {
		ro.vals = make([]uint64, ro.starts[len(ro.starts)-1])
	}
	split(ro.workers, len(ro.wantOf), func(t, lo, hi int) {
		next := slices.Clone(ro.at[t])
		for j := lo; j < hi; j++ {
			if k := int(ro.wantOf[j]); k >= 0 {
				r := k / taskSlots
				ro.vals[next[r]] = got[j]
				next[r]++
			}
		}
	})
}

// sweepable returns got's values as 8-byte words when the column's
// kernels read them that way: float64, int64, and timestamps of the same
// unit compared exactly.
func (cc *colCmp) sweepable() ([]uint64, bool) {
	var v []int64
	switch {
	case cc.class == classFloat:
		f := cc.gc.Float64s()
		return unsafe.Slice((*uint64)(unsafe.Pointer(unsafe.SliceData(f))), len(f)), true
	case cc.class == classInt && cc.wc.NullCount() == 0 && cc.gc.NullCount() == 0:
		v = cc.gc.Int64s()
	case cc.class == classTime && cc.sameUnit() && !cc.hasTT && cc.wc.NullCount() == 0 && cc.gc.NullCount() == 0:
		v = cc.gc.Int64s()
	default:
		return nil, false
	}
	return unsafe.Slice((*uint64)(unsafe.Pointer(unsafe.SliceData(v))), len(v)), true
}

// pairAt splits an entry of reorder.byRange into the got row and the want
// row's offset in its range.
func pairAt(e uint64) (gi uint64, k uint32) { return e >> 32, uint32(e) }

// buffer returns goroutine w's buffer (of workers): an equal share of the
// spare memory, at least taskSlots words.
func (ro *reorder) buffer(w, workers int) []uint64 {
	share := max(len(ro.bufs)/workers, taskSlots)
	if lo, hi := w*share, (w+1)*share; hi <= len(ro.bufs) {
		return ro.bufs[lo:hi:hi]
	}
	return make([]uint64, taskSlots)
}

// newReorder builds the reorder of a keyed pairing of nw want rows
// (wantOf: got row → want row or -1) on the given number of goroutines,
// reusing spare memory where it is large enough.
func newReorder(wantOf []int32, nw int, sp spares, workers int) *reorder {
	ro := &reorder{bufs: sp.buffers}
	if len(ro.bufs) < workers*2*taskSlots {
		ro.bufs = make([]uint64, workers*2*taskSlots)
	}
	// Each goroutine counts, then places, the pairs of a run of got rows;
	// a range's list holds the first run's pairs, then the second's...
	nr := (nw + taskSlots - 1) / taskSlots
	counts := make([][]int, workers)
	split(workers, len(wantOf), func(t, lo, hi int) {
		c := make([]int, nr)
		for _, k := range wantOf[lo:hi] {
			if k >= 0 {
				c[int(k)/taskSlots]++
			}
		}
		counts[t] = c
	})
	starts := make([]int, nr+1)
	at := make([][]int, workers)
	for t := range at {
		at[t] = make([]int, nr)
	}
	for r := range nr {
		starts[r+1] = starts[r]
		for t := range workers {
			at[t][r] = starts[r+1]
			starts[r+1] += counts[t][r]
		}
	}
	flat := sp.words
	if len(flat) < starts[nr] {
		flat = make([]uint64, starts[nr])
	}
	split(workers, len(wantOf), func(t, lo, hi int) {
		next := slices.Clone(at[t]) // a copy of its own: no cache line shared with other goroutines
		for j := lo; j < hi; j++ {
			if k := int(wantOf[j]); k >= 0 {
				r := k / taskSlots
				flat[next[r]] = uint64(j)<<32 | uint64(k-r*taskSlots)
				next[r]++
			}
		}
	})
	ro.byRange = make([][]uint64, nr)
	for r := range ro.byRange {
		ro.byRange[r] = flat[starts[r]:starts[r+1]:starts[r+1]]
	}
	ro.wantOf, ro.workers, ro.at, ro.starts = wantOf, workers, at, starts
	return ro
}

// split cuts [0, n) into as many contiguous runs as there are workers and
// runs f(t, lo, hi) for run t on its own goroutine, returning when all are
// done.
func split(workers, n int, f func(t, lo, hi int)) {
	var wg sync.WaitGroup
	for t := range workers {
		lo, hi := t*n/workers, (t+1)*n/workers
		if t == workers-1 {
			f(t, lo, hi)
			break
		}
		wg.Add(1)
		go func() {
			defer wg.Done()
			f(t, lo, hi)
		}()
	}
	wg.Wait()
}

// spares is memory of the key join that later steps may reuse.
type spares struct {
	rows           []int32
	words, buffers []uint64
}

// scratch is what one goroutine's tasks share.
type scratch struct {
	reorder *reorder
	buf     []uint64
	bytes   []byte   // string cells that do not fit in buf
	valid   []uint64 // got's validity in want order
	swept   bool     // the current column's values are in reorder.vals
}

// gotInWantOrder scatters got's values paired into the task's range into
// the scratch buffer, viewed as T: out[k] is the partner of want row
// base+k (unpaired rows keep what the buffer held, or zero if clear).
func gotInWantOrder[T int8 | int16 | int32 | int64 | float64](sc *scratch, p pairing, got []T, clearFirst bool) []T {
	var zero T
	words := (p.n*int(unsafe.Sizeof(zero)) + 7) / 8
	out := unsafe.Slice((*T)(unsafe.Pointer(unsafe.SliceData(sc.buf))), words*8/int(unsafe.Sizeof(zero)))[:p.n]
	if clearFirst {
		clear(out)
	}
	r := p.base / taskSlots
	if sc.swept && unsafe.Sizeof(zero) == 8 {
		// The values were swept into the pairs' order.
		ro := sc.reorder
		vals := ro.vals[ro.starts[r]:ro.starts[r+1]]
		words := sc.buf[:p.n]
		for e, x := range ro.byRange[r] {
			_, k := pairAt(x)
			words[k] = vals[e]
		}
		return out
	}
	for _, e := range sc.reorder.byRange[r] {
		j, k := pairAt(e)
		out[k] = got[j]
	}
	return out
}

// validityInWantOrder lines got's validity up with want's rows like
// gotInWantOrder does its values: bit k is set when slot base+k has a
// partner whose cell is not null.
func (sc *scratch) validityInWantOrder(p pairing, gv validity) validity {
	words := (p.n + 63) / 64
	if cap(sc.valid) < words {
		sc.valid = make([]uint64, words)
	}
	out := sc.valid[:words]
	clear(out)
	for _, e := range sc.reorder.byRange[p.base/taskSlots] {
		j, k := pairAt(e)
		if pos := gv.off + int(j); gv.bits[pos>>3]&(1<<uint(pos&7)) != 0 {
			out[k>>6] |= 1 << (k & 63)
		}
	}
	return validity{bits: asBytes(out)}
}

// reordered reports whether the task can use the reorder path.
func (sc *scratch) reordered(p pairing) bool {
	return sc != nil && sc.reorder != nil && p.w == nil && p.g != nil && p.base%taskSlots == 0
}

// compare compares the column's cells over the pairing, using fast loops
// over the raw values when neither side has nulls.
func (cc *colCmp) compare(p pairing, r *colResult, sc *scratch) {
	if p.n == 0 {
		return
	}
	switch cc.class {
	case classFloat:
		cc.compareFloats(p, r, sc)
		return
	case classInt, classTime, classDate:
		if cc.compareInts(p, r, sc) {
			return
		}
	case classDecimal:
		if cc.compareDecimals(p, r, sc) {
			return
		}
	case classText:
		if cc.wc.Kind() == fixtures.KindCategory && cc.gc.Kind() == fixtures.KindCategory {
			cc.compareCategories(p, r, sc)
			return
		}
	}
	nulls := cc.wc.NullCount() > 0 || cc.gc.NullCount() > 0
	if p.w == nil && p.g == nil && (nulls || cc.class == classBool) && cc.compareNullableByPosition(p, r, sc) {
		return
	}
	if !nulls && cc.class == classText && cc.wc.Kind() == fixtures.KindString && cc.gc.Kind() == fixtures.KindString && cc.norm == 0 {
		cc.compareStrings(p, r, sc)
		return
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

// asBytes views a slice of fixed-size numbers as its bytes.
func asBytes[T int8 | int16 | int32 | int64 | uint64 | float64](s []T) []byte {
	if len(s) == 0 {
		return nil
	}
	return unsafe.Slice((*byte)(unsafe.Pointer(unsafe.SliceData(s))), len(s)*int(unsafe.Sizeof(s[0])))
}

// compareFloats compares float64 columns through the float kernel,
// lining got's values (and validity) up with want's first when rows are
// not paired by position.
func (cc *colCmp) compareFloats(p pairing, r *colResult, sc *scratch) {
	a, b, l := lineUp(cc, p, sc, cc.wc.Float64s(), cc.gc.Float64s(), false)
	cc.floatRun(a, b, l, r)
}

// pairedWords returns the pairing words of slots whose got rows are g
// (negative: no partner): bit t of word c is slot c+t.
func pairedWords(g []int32) func(c int) uint64 {
	return func(c int) uint64 {
		var w uint64
		for t, x := range g[c:min(c+64, len(g))] {
			w |= uint64(^uint32(x)>>31) << uint(t)
		}
		return w
	}
}

// gatherBatch is how many rows a gathering loop prepares at once.
const gatherBatch = 64

// stringChunk is how many rows of a string column are checked at once by
// comparing their lengths and bytes in bulk.
const stringChunk = 32

// stringRunRows is how many rows of a string column are first tried as
// one run of identical offsets and bytes.
const stringRunRows = 512

// compareStrings compares string columns without nulls through their raw
// offsets and bytes: a chunk of rows whose lengths and bytes all agree is
// equal as a whole; other chunks go row by row.
func (cc *colCmp) compareStrings(p pairing, r *colResult, sc *scratch) {
	wo, wd := cc.wc.TextBytes()
	gOff, gd := cc.gc.TextBytes()
	if sc.reordered(p) {
		offs, buf := sc.stringsInWantOrder(p, gOff, gd)
		stringRun(cc, wo[p.base:p.base+p.n+1], wd, offs, buf, p.base, p.g, r)
		return
	}
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
	stringRun(cc, wo[p.base:p.base+p.n+1], wd, gOff[p.base:p.base+p.n+1], gd, p.base, nil, r)
}

// stringsInWantOrder copies the got cells paired into the task's range
// into a buffer in want order: offs (n+1 entries) and bytes, row k being
// buf[offs[k]:offs[k+1]]; unpaired rows are empty. Got's offsets and bytes
// are read in ascending order; the random writes go into a buffer that
// stays in cache.
func (sc *scratch) stringsInWantOrder(p pairing, gOff []int32, gd []byte) (offs []int32, buf []byte) {
	half := (p.n + 2) / 2
	offs = unsafe.Slice((*int32)(unsafe.Pointer(unsafe.SliceData(sc.buf))), 2*half)[:p.n+1]
	clear(offs)
	pairs := sc.reorder.byRange[p.base/taskSlots]
	for _, e := range pairs {
		j, k := pairAt(e)
		offs[k+1] = gOff[j+1] - gOff[j]
	}
	for k := 1; k <= p.n; k++ {
		offs[k] += offs[k-1]
	}
	rest := sc.buf[half:]
	if total := int(offs[p.n]); total <= len(rest)*8 {
		buf = unsafe.Slice((*byte)(unsafe.Pointer(unsafe.SliceData(rest))), len(rest)*8)[:total]
	} else {
		if cap(sc.bytes) < total {
			sc.bytes = make([]byte, total)
		}
		buf = sc.bytes[:total]
	}
	for _, e := range pairs {
		j, k := pairAt(e)
		copy(buf[offs[k]:offs[k+1]], gd[gOff[j]:gOff[j+1]])
	}
	return offs, buf
}

// shiftedEqual reports whether b is a with a constant added to every
// entry: two runs of offsets that describe cells of the same lengths.
func shiftedEqual(a, b []int32) bool {
	if len(a) == 0 {
		return true
	}
	if a[0] == b[0] {
		return bytes.Equal(asBytes(a), asBytes(b[:len(a)]))
	}
	d := a[0] - b[0]
	b = b[:len(a)]
	k := 0
	for ; k+8 <= len(a); k += 8 {
		if (a[k]-b[k]-d)|(a[k+1]-b[k+1]-d)|(a[k+2]-b[k+2]-d)|(a[k+3]-b[k+3]-d)|
			(a[k+4]-b[k+4]-d)|(a[k+5]-b[k+5]-d)|(a[k+6]-b[k+6]-d)|(a[k+7]-b[k+7]-d) != 0 {
			return false
		}
	}
	for ; k < len(a); k++ {
		if a[k]-b[k] != d {
			return false
		}
	}
	return true
}

// partner returns the got row of slot base+k: the slot's own row, or its
// entry in gmap (negative: no partner).
func partner(base, k int, gmap []int32) int {
	if gmap == nil {
		return base + k
	}
	return int(gmap[k])
}

// stringRun compares want cells (row k: aData[aOff[k]:aOff[k+1]]) with got
// cells lined up with them, slot base+k; gmap names the got rows, nil when
// they are the slots themselves. A long
// run whose offsets are identical (the usual case while the cells so far
// have had the same lengths) and whose bytes are identical is equal as a
// whole; otherwise chunks of rows are checked by length and bytes, and
// differing chunks row by row.
func stringRun(cc *colCmp, aOff []int32, aData []byte, bOff []int32, bData []byte, base int, gmap []int32, r *colResult) {
	n := len(aOff) - 1
	row := func(k int) {
		if string(aData[aOff[k]:aOff[k+1]]) != string(bData[bOff[k]:bOff[k+1]]) {
			if gi := partner(base, k, gmap); gi >= 0 {
				cc.slowCell(base+k, gi, base+k, r)
			}
		}
	}
	for i := 0; i < n; {
		if end := min(i+stringRunRows, n); aOff[end]-aOff[i] == bOff[end]-bOff[i] &&
			shiftedEqual(aOff[i:end+1], bOff[i:end+1]) && bytes.Equal(aData[aOff[i]:aOff[end]], bData[bOff[i]:bOff[end]]) {
			i = end
			continue
		}
		end := min(i+stringChunk, n)
		same := aOff[end]-aOff[i] == bOff[end]-bOff[i]
		if same {
			da, db := aOff[i], bOff[i]
			for k := i + 1; k < end; k++ {
				if aOff[k]-da != bOff[k]-db {
					same = false
					break
				}
			}
		}
		if !same || !bytes.Equal(aData[aOff[i]:aOff[end]], bData[bOff[i]:bOff[end]]) {
			for k := i; k < end; k++ {
				row(k)
			}
		}
		i = end
	}
}

// compareCategories compares category columns by their codes: each
// side's codes map to ids of the (normalised) level texts, so columns with
// different level orders compare by text.
func (cc *colCmp) compareCategories(p pairing, r *colResult, sc *scratch) {
	wid, gid := cc.levelIDs()
	w8, w16, w32 := cc.wc.CodeSlices()
	g8, g16, g32 := cc.gc.CodeSlices()
	switch {
	case w8 != nil:
		compareCodes(cc, w8, g8, g16, g32, wid, gid, p, r, sc)
	case w16 != nil:
		compareCodes(cc, w16, g8, g16, g32, wid, gid, p, r, sc)
	case w32 != nil:
		compareCodes(cc, w32, g8, g16, g32, wid, gid, p, r, sc)
	}
}

// levelIDs numbers the (normalised) level texts of both sides and returns
// each side's level → id. A side without levels (all cells null) gets one
// id no level has, so that its codes (0) index something.
func (cc *colCmp) levelIDs() (wid, gid []int32) {
	ids := make(map[string]int32, cc.wc.NumLevels())
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
		if len(out) == 0 {
			out = []int32{-1}
		}
		return out
	}
	return idOf(cc.wc.Levels()), idOf(cc.gc.Levels())
}

type code interface{ int8 | int16 | int32 }

func compareCodes[A code](cc *colCmp, a []A, g8 []int8, g16 []int16, g32 []int32, wid, gid []int32, p pairing, r *colResult, sc *scratch) {
	switch {
	case g8 != nil:
		compareCodeRuns(cc, a, g8, wid, gid, p, r, sc)
	case g16 != nil:
		compareCodeRuns(cc, a, g16, wid, gid, p, r, sc)
	case g32 != nil:
		compareCodeRuns(cc, a, g32, wid, gid, p, r, sc)
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

// sameCodes reports whether codes of A and codes of B mean the same level
// exactly when they are equal: same levels in the same order, same width.
func sameCodes[A, B code](wid, gid []int32) bool {
	var a A
	var b B
	return unsafe.Sizeof(a) == unsafe.Sizeof(b) && len(wid) <= len(gid) && identity(wid) && identity(gid[:len(wid)])
}
