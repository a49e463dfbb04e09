package assert

import (
	"hash/maphash"
	"math"
	"math/bits"
	"runtime"
	"slices"
	"sync"
	"sync/atomic"

	"github.com/proofsheet/proofsheet/fixtures"
)

// Row matching by key (ByKey) and as a multiset (AnyRowOrder). Both hash
// the matching columns of every row, column by column, and find equal rows
// through open-addressing tables of want rows; cells are compared only to
// confirm a hash hit. A single int64 key with dense values skips the
// hashing (see denseJoin).

// hashBlock is how many rows are hashed at a time.
const hashBlock = 4096

// rowKeys hashes and compares the matching cells of rows on both sides.
type rowKeys struct {
	cols []*colCmp
	seed maphash.Seed
	// int64 fast path: a single int64 key column without nulls.
	wInts, gInts []int64
}

func newRowKeys(cols []*colCmp) *rowKeys {
	k := &rowKeys{cols: cols, seed: maphash.MakeSeed()}
	if len(cols) == 1 && cols[0].class == classInt && cols[0].wc.NullCount() == 0 && cols[0].gc.NullCount() == 0 {
		k.wInts, k.gInts = cols[0].wc.Int64s(), cols[0].gc.Int64s()
	}
	return k
}

// mix is a 64-bit finaliser (from the splitmix64 generator) that spreads
// the bits of x over the whole word.
func mix(x uint64) uint64 {
	x ^= x >> 30
	x *= 0xbf58476d1ce4e5b9
	x ^= x >> 27
	x *= 0x94d049bb133111eb
	x ^= x >> 31
	return x
}

const nullHash = 0x6a09e667f3bcc908

// hash writes the hashes of rows [from, from+len(out)) of a side.
func (k *rowKeys) hash(side Side, from int, out []uint64) {
	if k.wInts != nil {
		v := pick(side == WantSide, k.wInts, k.gInts)[from : from+len(out)]
		for i, x := range v {
			out[i] = mix(uint64(x))
		}
		return
	}
	clear(out)
	for _, cc := range k.cols {
		col := pick(side == WantSide, cc.wc, cc.gc)
		cc.hashCells(col, from, out, k.seed)
	}
}

// hashCells mixes the hashes of cells [from, from+len(out)) of col, one of
// cc's columns, into out. Cells that cc counts equal hash alike.
func (cc *colCmp) hashCells(col *fixtures.Column, from int, out []uint64, seed maphash.Seed) {
	put := func(i int, v uint64) { out[i] = mix(bits.RotateLeft64(out[i], 23) ^ v) }
	nulls := col.NullCount() > 0 || (cc.nanNul && col.Kind() == fixtures.KindFloat64)
	var levelHash []uint64
	if col.Kind() == fixtures.KindCategory {
		levelHash = make([]uint64, col.NumLevels())
		for l := range levelHash {
			levelHash[l] = maphash.String(seed, cc.normText(col.Level(l)))
		}
	}
	for i := range out {
		r := from + i
		if nulls && cc.isNull(col, r) {
			put(i, nullHash)
			continue
		}
		var v uint64
		switch col.Kind() {
		case fixtures.KindBool:
			v = 1
			if col.Bool(r) {
				v = 2
			}
		case fixtures.KindInt64:
			if cc.class == classIntFloat {
				v = floatHash(float64(col.Int64(r)))
			} else {
				v = uint64(col.Int64(r))
			}
		case fixtures.KindFloat64:
			v = floatHash(col.Float64(r))
		case fixtures.KindDate:
			v = uint64(col.Days(r))
		case fixtures.KindTime, fixtures.KindDuration:
			v = uint64(col.Ticks(r))
		case fixtures.KindTimestamp:
			if cc.wc.Type().Unit() == cc.gc.Type().Unit() {
				v = uint64(col.Ticks(r))
			} else {
				t := col.Time(r)
				v = mix(uint64(t.Unix())) ^ uint64(t.Nanosecond())
			}
		case fixtures.KindDecimal:
			v = maphash.String(seed, col.Decimal(r).Rat().RatString())
		case fixtures.KindString:
			v = maphash.String(seed, cc.normText(col.Str(r)))
		case fixtures.KindCategory:
			v = levelHash[col.Code(r)]
		}
		put(i, v)
	}
}

// floatHash hashes a float so that == values (−0, +0) and all NaNs hash
// alike.
func floatHash(f float64) uint64 {
	switch {
	case f == 0:
		return 0
	case f != f:
		return 0x7ff8000000000001
	}
	return math.Float64bits(f)
}

func (cc *colCmp) normText(s string) string {
	if cc.norm != 0 {
		return normalize(s, cc.norm)
	}
	return s
}

// equal reports whether row i of side a and row j of side b agree on every
// matching column.
func (k *rowKeys) equal(a Side, i int, b Side, j int) bool {
	if k.wInts != nil {
		return pick(a == WantSide, k.wInts, k.gInts)[i] == pick(b == WantSide, k.wInts, k.gInts)[j]
	}
	for _, cc := range k.cols {
		if !cc.eqSides(a, i, b, j) {
			return false
		}
	}
	return true
}

// eqSides is eq for cells that may both come from the same side.
func (cc *colCmp) eqSides(a Side, i int, b Side, j int) bool {
	switch {
	case a == WantSide && b == GotSide:
		return cc.eq(i, j)
	case a == GotSide && b == WantSide:
		return cc.eq(j, i)
	}
	col := pick(a == WantSide, cc.wc, cc.gc)
	self := *cc
	self.wc, self.gc = col, col
	self.intOnWant = col.Kind() == fixtures.KindInt64 || col.Kind() == fixtures.KindDate
	if cc.class == classIntFloat || cc.class == classDateTime {
		// Same column on both sides: plain exact comparison of its kind.
		self.class = map[fixtures.Kind]class{fixtures.KindInt64: classInt, fixtures.KindFloat64: classFloat,
			fixtures.KindDate: classDate, fixtures.KindTimestamp: classTime}[col.Kind()]
	}
	return self.eq(i, j)
}

// Grouping is a radix-partitioned hash join: rows of both sides are
// scattered by the top bits of their hash into partitions small enough for
// a partition's hash table to stay in the processor's cache, then each
// partition is joined on its own. Within a partition rows keep their table
// order, and rows with equal cells always share a partition, so "first
// row with these cells" means the same as in one big table.

// partitionRows is about how many rows of a side a partition holds.
const partitionRows = 1 << 12

// radixBits is the widest fan-out of one scatter pass: 2^radixBits
// partitions. Writing to more places at once (two arrays each) overflows
// the processor's write buffers and TLB, and a larger table is then
// partitioned in two passes, so that the work grows linearly with the rows.
const radixBits = 8

// partitioned holds one side's rows sorted by partition: hashes and row
// indexes, with start[p] the first entry of partition p.
type partitioned struct {
	h     []uint64
	row   []int32
	start []int
}

// partitionBits returns how many top bits of the hash choose a partition
// for n rows: partitions of about partitionRows rows.
func partitionBits(n int) uint {
	bits := uint(0)
	for (n>>bits) > partitionRows && bits < 20 {
		bits++
	}
	return bits
}

// partition scatters the n rows of a side by the top bitsP bits of their
// hashes, keeping rows in order within each partition. A first pass
// scatters by the top bits (at most radixBits of them), hashing the rows
// twice (once to count, once to place) so that no per-row hash array
// outlives the scatter; a second pass refines each first partition by the
// remaining bits.
func partition(k *rowKeys, side Side, n int, bitsP uint) *partitioned {
	b1 := min(bitsP, radixBits)
	var out *partitioned
	if k.wInts != nil {
		out = partitionInts(pick(side == WantSide, k.wInts, k.gInts), b1)
	} else {
		np := 1 << b1
		counts := make([]int, np+1)
		buf := make([]uint64, min(hashBlock, max(n, 1)))
		shift := 64 - b1 // a shift by 64 gives 0: one partition
		for from := 0; from < n; from += hashBlock {
			hs := buf[:min(hashBlock, n-from)]
			k.hash(side, from, hs)
			for _, h := range hs {
				counts[h>>shift+1]++
			}
		}
		for p := 1; p <= np; p++ {
			counts[p] += counts[p-1]
		}
		out = &partitioned{h: make([]uint64, n), row: make([]int32, n), start: append([]int(nil), counts...)}
		sc := newScatter(out, counts[:np])
		for from := 0; from < n; from += hashBlock {
			hs := buf[:min(hashBlock, n-from)]
			k.hash(side, from, hs)
			for i, h := range hs {
				sc.put(h>>shift, h, int32(from+i))
			}
		}
		sc.flush()
	}
	if bitsP > b1 {
		out = refine(out, b1, bitsP-b1)
	}
	return out
}

// partitionInts is the first pass of partition for a single int64 key
// without nulls, whose hash is mix of the value: each pass is one loop
// over the values.
func partitionInts(keys []int64, bitsP uint) *partitioned {
	np := 1 << bitsP
	shift := 64 - bitsP // a shift by 64 gives 0: one partition
	counts := make([]int, np+1)
	for _, x := range keys {
		counts[mix(uint64(x))>>shift+1]++
	}
	for p := 1; p <= np; p++ {
		counts[p] += counts[p-1]
	}
	out := &partitioned{h: make([]uint64, len(keys)), row: make([]int32, len(keys)), start: append([]int(nil), counts...)}
	sc := newScatter(out, counts[:np])
	for i, x := range keys {
		h := mix(uint64(x))
		sc.put(h>>shift, h, int32(i))
	}
	sc.flush()
	return out
}

// wcRows is how many entries a partition's staging buffer holds: a cache
// line of hashes.
const wcRows = 8

// scatter writes entries to their partitions through a small staging
// buffer per partition (software write-combining): the buffers stay in
// the L1 cache, and each partition's output is written a cache line at a
// time instead of one entry at a time to hundreds of places.
type scatter struct {
	out  *partitioned
	next []int // per partition: where its next entry goes
	bufs []wcBuf
}

type wcBuf struct {
	h   [wcRows]uint64
	row [wcRows]int32
	n   int
}

func newScatter(out *partitioned, next []int) *scatter {
	return &scatter{out: out, next: next, bufs: make([]wcBuf, len(next))}
}

// put adds entry (h, row) to partition p.
func (s *scatter) put(p uint64, h uint64, row int32) {
	b := &s.bufs[p]
	b.h[b.n&(wcRows-1)], b.row[b.n&(wcRows-1)] = h, row
	b.n++
	if b.n == wcRows {
		at := s.next[p]
		copy(s.out.h[at:at+wcRows], b.h[:])
		copy(s.out.row[at:at+wcRows], b.row[:])
		s.next[p] = at + wcRows
		b.n = 0
	}
}

// flush writes what the staging buffers still hold.
func (s *scatter) flush() {
	for p := range s.bufs {
		b := &s.bufs[p]
		at := s.next[p]
		copy(s.out.h[at:], b.h[:b.n])
		copy(s.out.row[at:], b.row[:b.n])
		s.next[p] = at + b.n
		b.n = 0
	}
}

// refine splits each of the 2^b1 partitions of p by the next b2 bits of
// the hashes, in place, keeping the order of rows within each partition:
// a first partition is copied aside (it fits in the cache) and scattered
// back, so no second table-sized array is needed.
func refine(p *partitioned, b1, b2 uint) *partitioned {
	n1, n2 := 1<<b1, 1<<b2
	start := make([]int, n1*n2+1)
	shift := 64 - b1 - b2
	mask := uint64(n2 - 1)
	counts := make([]int, n2)
	var th []uint64
	var tr []int32
	for q := range n1 {
		lo, hi := p.start[q], p.start[q+1]
		th = append(th[:0], p.h[lo:hi]...)
		tr = append(tr[:0], p.row[lo:hi]...)
		clear(counts)
		for _, h := range th {
			counts[h>>shift&mask]++
		}
		at := lo
		for r := range n2 {
			start[q*n2+r] = at
			c := counts[r]
			counts[r] = at
			at += c
		}
		for e, h := range th {
			r := h >> shift & mask
			x := counts[r]
			counts[r] = x + 1
			p.h[x], p.row[x] = h, tr[e]
		}
	}
	start[n1*n2] = len(p.h)
	p.start = start
	return p
}

// joined is what joinRows found. The head of a row is the first row of its
// side with the same matching cells.
type joined struct {
	// wantOf[j] is, for got row j, the head of the want rows with the same
	// cells, or -1 when want has no such row.
	wantOf []int32
	// wantLinks chains want's rows that share cells; nil when no cells
	// repeat on want's side (every row is its own head). gotLinks likewise
	// for got.
	wantLinks, gotLinks *chains
	// spare is the join's memory, free once the join is done.
	spare spares
}

// chains links the rows of one side that share matching cells, in row
// order, without a list per group: next[r] is the row after r with r's
// cells (-1 after the last), and last[h] is the last row of the group
// whose head is h; last[r] == r for every row that is not the head of a
// group of two or more. The two arrays are all a grouping costs: 8 bytes
// a row, written once, where a list per group grows by copying.
type chains struct {
	next, last []int32
}

// newChains returns the chains of n rows that all stand alone.
func newChains(n int) *chains {
	c := &chains{next: make([]int32, n), last: make([]int32, n)}
	for i := range c.next {
		c.next[i], c.last[i] = -1, int32(i)
	}
	return c
}

// link appends row r to the group of head h; r must come after every row
// already linked to h.
func (c *chains) link(h, r int32) {
	c.next[c.last[h]] = r
	c.last[h] = r
}

// linker is chains made on the first link, so that a side without
// repeated cells costs nothing. Goroutines may link at once as long as
// each group is linked by one of them.
type linker struct {
	once  sync.Once
	n     int
	links *chains
}

func (l *linker) link(h, r int32) {
	l.once.Do(func() { l.links = newChains(l.n) })
	l.links.link(h, r)
}

// chainsOf turns (row, head) pairs, in row order within each group, into
// the chains of n rows, nil when there are none.
func chainsOf(n int, dups []int32) *chains {
	if len(dups) == 0 {
		return nil
	}
	c := newChains(n)
	for t := 0; t < len(dups); t += 2 {
		c.link(dups[t+1], dups[t])
	}
	return c
}

// repeated calls f with the rows of each group of two or more rows, in
// the order of their heads, each group in row order. The slice is reused
// between calls.
func (c *chains) repeated(f func(rows []int32)) {
	if c == nil {
		return
	}
	var buf []int32
	for h, l := range c.last {
		if l != int32(h) {
			buf = c.members(int32(h), buf[:0])
			f(buf)
		}
	}
}

// members appends the rows of the group of head h to buf.
func (c *chains) members(h int32, buf []int32) []int32 {
	if c == nil {
		return append(buf, h)
	}
	for r := h; r >= 0; r = c.next[r] {
		buf = append(buf, r)
	}
	return buf
}

// joinRows groups the rows of both sides by their matching cells: a dense
// int64 key through a bitmap (denseJoin), other keys through partitioned
// hash tables (hashJoin). Large inputs are joined on up to GOMAXPROCS
// goroutines; the result depends neither on the scheduling nor on the
// way taken.
func joinRows(k *rowKeys, nw, ng int) *joined {
	workers := workersFor(max(nw, ng))
	if jn := denseJoin(k, workers); jn != nil {
		return jn
	}
	return hashJoin(k, nw, ng, workers)
}

// hashJoin is joinRows by partitioned hash tables, for any matching
// columns.
func hashJoin(k *rowKeys, nw, ng, workers int) *joined {
	return hashJoinBits(k, nw, ng, workers, partitionBits(max(nw, ng)))
}

// hashJoinBits is hashJoin with 2^bitsP partitions.
func hashJoinBits(k *rowKeys, nw, ng, workers int, bitsP uint) *joined {
	var w, g *partitioned
	if workers > 1 {
		var wg sync.WaitGroup
		wg.Add(1)
		go func() { defer wg.Done(); w = partition(k, WantSide, nw, bitsP) }()
		g = partition(k, GotSide, ng, bitsP)
		wg.Wait()
	} else {
		w = partition(k, WantSide, nw, bitsP)
		g = partition(k, GotSide, ng, bitsP)
	}
	out := &joined{wantOf: make([]int32, ng)}
	wantLinks, gotLinks := &linker{n: nw}, &linker{n: ng}
	np := len(w.start) - 1
	workers = min(workers, np)
	parts := make([]*partitionJoin, workers)
	var next atomic.Int64
	var wg sync.WaitGroup
	for t := range workers {
		pj := &partitionJoin{wantLinks: wantLinks, gotLinks: gotLinks}
		parts[t] = pj
		wg.Add(1)
		go func() {
			defer wg.Done()
			for {
				p := int(next.Add(1) - 1)
				if p >= np {
					return
				}
				pj.run(k, w, g, p, out.wantOf)
			}
		}()
	}
	wg.Wait()
	out.spare = spares{rows: g.row, words: w.h, buffers: g.h}
	out.wantLinks, out.gotLinks = wantLinks.links, gotLinks.links
	return out
}

// workersFor returns how many goroutines share the work on n rows: all
// of GOMAXPROCS from parallelCells rows, else one.
func workersFor(n int) int {
	if n >= parallelCells {
		return runtime.GOMAXPROCS(0)
	}
	return 1
}

// partitionJoin holds what one goroutine keeps across partitions (its
// buffers) and the chains it links the rows that are not heads into. A
// group's rows all lie in one partition, so goroutines never link the
// same group.
type partitionJoin struct {
	slots               []int32 // want entries as e-wa ≥ 0, got entries as -(e-ga)-2; empty -1
	firstGot            []int32 // per want entry of the partition: its first got row, or -1
	wantLinks, gotLinks *linker
}

// run joins partition p: wantOf of every got row of the partition, and
// the rows of the partition that are not heads. Rows come in row order
// within a partition, so the first one met with some cells is the head.
func (pj *partitionJoin) run(k *rowKeys, w, g *partitioned, p int, wantOf []int32) {
	wa, wb := w.start[p], w.start[p+1]
	ga, gb := g.start[p], g.start[p+1]
	// Room for every entry plus at least one empty slot, so probing ends;
	// with got's rows mostly matching want's the table is about half full.
	size := 1 << bits.Len(uint(max(wb-wa+gb-ga+1, 8)))
	if cap(pj.slots) < size {
		pj.slots = make([]int32, size)
	}
	slots := pj.slots[:size]
	for i := range slots {
		slots[i] = empty
	}
	if cap(pj.firstGot) < wb-wa {
		pj.firstGot = make([]int32, wb-wa)
	}
	firstGot := pj.firstGot[:wb-wa]
	for i := range firstGot {
		firstGot[i] = -1
	}
	mask := uint64(size - 1)
	for e := wa; e < wb; e++ {
		h, row := w.h[e], w.row[e]
		for s := h & mask; ; s = (s + 1) & mask {
			x := slots[s]
			if x == empty {
				slots[s] = int32(e - wa)
				break
			}
			if x >= 0 && w.h[wa+int(x)] == h && k.same(WantSide, int(w.row[wa+int(x)]), WantSide, int(row)) {
				pj.wantLinks.link(w.row[wa+int(x)], row)
				break
			}
		}
	}
	for e := ga; e < gb; e++ {
		h, row := g.h[e], g.row[e]
		for s := h & mask; ; s = (s + 1) & mask {
			x := slots[s]
			if x == empty {
				slots[s] = -int32(e-ga) - 2
				wantOf[row] = -1
				break
			}
			if x >= 0 {
				we := wa + int(x)
				if w.h[we] == h && k.same(WantSide, int(w.row[we]), GotSide, int(row)) {
					wantOf[row] = w.row[we]
					if f := firstGot[x]; f < 0 {
						firstGot[x] = row
					} else {
						pj.gotLinks.link(f, row)
					}
					break
				}
				continue
			}
			ge := ga + int(-x-2)
			if g.h[ge] == h && k.same(GotSide, int(g.row[ge]), GotSide, int(row)) {
				pj.gotLinks.link(g.row[ge], row)
				wantOf[row] = -1
				break
			}
		}
	}
}

const empty = -1

// same reports whether two rows have equal matching cells, given that
// their hashes are equal: for a single int64 key the hash is a bijection
// of the key, so equal hashes are proof enough.
func (k *rowKeys) same(a Side, i int, b Side, j int) bool {
	if k.wInts != nil {
		return true
	}
	return k.equal(a, i, b, j)
}

// Dense keys: a single int64 key column whose want values are distinct
// and spread over at most denseSpan values per want row (row numbers,
// serial ids) is joined without hashing or partitioning, through a bitmap
// of want's values and the count of set bits before each word: together
// they give every value its rank among want's values. The two take a
// quarter of a byte per value of the span (at most 4 bytes a want row) and
// are read at random, which pays while they stay about the size of the
// cache.

// denseSpan bounds the spread of want's key values, per want row, for the
// dense join.
const denseSpan = 16

// denseLacking is how many got rows whose value want lacks (plus one in 64
// got rows) the dense join groups itself; beyond that it leaves the work
// to the general join.
const denseLacking = 4096

// denseJoin joins by a dense int64 key, or returns nil when the key is not
// dense, want repeats a value, or got holds too many values want lacks.
func denseJoin(k *rowKeys, workers int) *joined {
	w, g := k.wInts, k.gInts
	if len(w) == 0 {
		return nil
	}
	type extent struct {
		lo, hi    int64
		ascending bool
	}
	ext := make([]extent, workers)
	split(workers, len(w), func(t, a, b int) {
		if a == b {
			ext[t] = extent{w[0], w[0], true}
			return
		}
		lo, hi, asc := w[a], w[a], true
		for i := a + 1; i < b; i++ {
			x := w[i]
			asc = asc && w[i-1] < x
			lo, hi = min(lo, x), max(hi, x)
		}
		ext[t] = extent{lo, hi, asc}
	})
	lo, hi, ascending := ext[0].lo, ext[0].hi, ext[0].ascending
	for t, e := range ext[1:] {
		if b := (t + 1) * len(w) / workers; b > 0 && b < len(w) {
			ascending = ascending && w[b-1] < w[b]
		}
		lo, hi, ascending = min(lo, e.lo), max(hi, e.hi), ascending && e.ascending
	}
	span := uint64(hi) - uint64(lo) // exact even where hi − lo overflows int64
	if span/denseSpan >= uint64(len(w)) {
		return nil
	}
	// set holds, per 64 values of the span, the bitmap word and the number
	// of set bits in the words before: one cache line answers a lookup.
	set := make(denseSet, span/64+1)
	if ascending {
		// Values in order fill one word after another: gather each word's
		// bits before storing it.
		at, word := uint64(0), uint64(0)
		for _, x := range w {
			b := uint64(x) - uint64(lo)
			if b>>6 != at {
				set[at].bits, at, word = word, b>>6, 0
			}
			word |= 1 << (b & 63)
		}
		set[at].bits = word
	} else {
		for _, x := range w {
			b := uint64(x) - uint64(lo)
			set[b>>6].bits |= 1 << (b & 63)
		}
	}
	n := 0
	for i := range set {
		set[i].before = int64(n)
		n += bits.OnesCount64(set[i].bits)
	}
	if n < len(w) {
		return nil // a repeated want value: the general join lists them
	}
	var order []int32 // want row of each rank; nil when want is ascending
	if !ascending {
		order = make([]int32, len(w))
		for i, x := range w {
			order[set.rank(uint64(x)-uint64(lo))] = int32(i)
		}
	}
	out := &joined{wantOf: make([]int32, len(g))}
	lacking := make([]int, workers)
	split(workers, len(g), func(t, a, b int) {
		wantOf, none := out.wantOf[a:b], 0
		for j, x := range g[a:b] {
			b := uint64(x) - uint64(lo)
			r := int32(-1)
			if b <= span && set[b>>6].bits&(1<<(b&63)) != 0 {
				r = set.rank(b)
				if order != nil {
					r = order[r]
				}
			}
			wantOf[j] = r
			if r < 0 {
				none++
			}
		}
		lacking[t] = none
	})
	total := 0
	for _, l := range lacking {
		total += l
	}
	if total > denseLacking+len(g)/64 {
		return nil // grouping got's own values is the general join's work
	}
	var gotDup []int32
	if total > 1 {
		first := make(map[int64]int32, total)
		for j, r := range out.wantOf {
			if r >= 0 {
				continue
			}
			if f, ok := first[g[j]]; ok {
				gotDup = append(gotDup, int32(j), f)
			} else {
				first[g[j]] = int32(j)
			}
		}
	}
	gotDup = append(gotDup, repeatedPartners(out.wantOf, len(w))...)
	out.gotLinks = chainsOf(len(g), gotDup)
	return out
}

// repeatedPartners returns, as (row, head) pairs, the got rows whose want
// partner an earlier got row already has (head: the first such got row).
// A bitmap of want's rows finds whether there are any at all.
func repeatedPartners(wantOf []int32, nw int) []int32 {
	seen := make([]uint64, (nw+63)/64)
	repeated := false
	for _, r := range wantOf {
		if r < 0 {
			continue
		}
		if bit := uint64(1) << uint(r&63); seen[r>>6]&bit != 0 {
			repeated = true
			break
		} else {
			seen[r>>6] |= bit
		}
	}
	if !repeated {
		return nil
	}
	first := make([]int32, nw)
	for i := range first {
		first[i] = -1
	}
	var dups []int32
	for j, r := range wantOf {
		switch {
		case r < 0:
		case first[r] < 0:
			first[r] = int32(j)
		default:
			dups = append(dups, int32(j), first[r])
		}
	}
	return dups
}

// denseWord is 64 values of a dense join's span: which are want's, and
// how many of want's values lie below them.
type denseWord struct {
	bits   uint64
	before int64
}

// denseSet is a dense join's span, 64 values a word.
type denseSet []denseWord

// rank returns the rank among want's values of the value at offset b of
// the span, which must be one of want's.
func (s denseSet) rank(b uint64) int32 {
	d := s[b>>6]
	return int32(d.before) + int32(bits.OnesCount64(d.bits&(1<<(b&63)-1)))
}

// pairInOrder pairs the rows of each group in order of appearance: the
// t-th got row whose cells want has with the t-th want row with those
// cells. It returns each want row's partner (-1 for none) and leaves in
// jn.wantOf each got row's partner (-1 for none). Want's chains serve as
// the cursor of each group (their last rows are overwritten; next stays).
func pairInOrder(jn *joined, nw int) (gOf []int32) {
	gOf = jn.spare.rows
	if len(gOf) < nw {
		gOf = make([]int32, nw)
	}
	gOf = gOf[:nw]
	for i := range gOf {
		gOf[i] = -1
	}
	switch {
	case jn.wantLinks == nil && jn.gotLinks == nil:
		for j, i := range jn.wantOf {
			if i >= 0 {
				gOf[i] = int32(j)
			}
		}
	case jn.wantLinks == nil:
		// Each want row is its own group: the first got row takes it.
		for j, i := range jn.wantOf {
			if i >= 0 {
				if gOf[i] < 0 {
					gOf[i] = int32(j)
				} else {
					jn.wantOf[j] = -1
				}
			}
		}
	default:
		// cur[h] is the next want row of head h's group to pair, -1 when
		// all are paired.
		next, cur := jn.wantLinks.next, jn.wantLinks.last
		for i := range cur {
			cur[i] = int32(i)
		}
		for j, h := range jn.wantOf {
			if h < 0 {
				continue
			}
			if i := cur[h]; i >= 0 {
				gOf[i], jn.wantOf[j] = int32(j), i
				cur[h] = next[i]
			} else {
				jn.wantOf[j] = -1
			}
		}
	}
	return gOf
}

// matchByKey pairs rows with equal keys, in order of appearance, and
// reports missing and extra rows and repeated keys.
func (c *comparison) matchByKey() {
	nw, ng := c.want.NumRows(), c.got.NumRows()
	k := newRowKeys(c.keyCols)
	jn := joinRows(k, nw, ng)
	// Repeated keys: want's in order of first appearance, then got's
	// (before pairing, which reuses want's chains).
	jn.wantLinks.repeated(func(rows []int32) { c.addDuplicate(WantSide, rows) })
	jn.gotLinks.repeated(func(rows []int32) { c.addDuplicate(GotSide, rows) })
	gOf := pairInOrder(jn, nw)
	c.pairs = pairing{n: nw, g: gOf}
	if workers := runtime.GOMAXPROCS(0); nw*len(c.cols) >= parallelCells && workers > 1 {
		c.reorder = newReorder(jn.wantOf, nw, jn.spare, workers)
	}
	for i, gi := range gOf {
		if gi < 0 {
			c.addMissing(i)
		}
	}
	for j, wi := range jn.wantOf {
		if wi < 0 {
			c.addExtra(j)
		}
	}
}

func (c *comparison) addDuplicate(side Side, rows []int32) {
	d := &c.d.Duplicates
	if side == WantSide {
		d.WantKeys++
	} else {
		d.GotKeys++
	}
	if c.d.listFull(len(d.Keys)) {
		return
	}
	dk := DuplicateKey{Side: side, Key: c.keyText(side, int(rows[0])), Count: len(rows)}
	for _, r := range rows {
		if c.d.listFull(len(dk.Rows)) {
			break
		}
		dk.Rows = append(dk.Rows, int(r))
	}
	d.Keys = append(d.Keys, dk)
}

// byWant is a grouping of got rows by the want head they share cells
// with: the got rows of want head h are rows[start[h]:start[h]+size[h]],
// in row order.
type byWant struct {
	start, size, rows []int32
}

// groupsBy groups the got rows j with wantOf[j] ≥ 0 by wantOf[j], one of
// nw want rows.
func groupsBy(wantOf []int32, nw int) *byWant {
	g := &byWant{start: make([]int32, nw), size: make([]int32, nw)}
	for _, h := range wantOf {
		if h >= 0 {
			g.size[h]++
		}
	}
	at := int32(0)
	for h := range g.size {
		g.start[h] = at
		at += g.size[h]
	}
	g.rows = make([]int32, at)
	// start serves as each group's cursor, then is moved back.
	for j, h := range wantOf {
		if h >= 0 {
			g.rows[g.start[h]] = int32(j)
			g.start[h]++
		}
	}
	for h, n := range g.size {
		g.start[h] -= n
	}
	return g
}

// multisetGroupLimit is the largest group (rows a side) that AnyRowOrder
// pairs by maximum matching; larger groups are paired first-fit.
const multisetGroupLimit = 64

// multisetWindow is how many unpaired got rows within reach a want row of
// a large group is tried against.
const multisetWindow = 64

// matchAsMultiset pairs equal rows in any order. Columns with a tolerance
// (and date-with-timestamp columns) are left out of the hash; rows that
// agree on the other columns form a group, and within a group rows are
// paired when their remaining cells are equal under the rules.
func (c *comparison) matchAsMultiset() {
	nw, ng := c.want.NumRows(), c.got.NumRows()
	var exact, loose []*colCmp
	for _, cc := range c.cols {
		if cc.tolerant() || cc.class == classDateTime {
			loose = append(loose, cc)
		} else {
			exact = append(exact, cc)
		}
	}
	k := newRowKeys(exact)
	jn := joinRows(k, nw, ng)
	var gOf, gotOf []int32
	if len(loose) == 0 {
		gOf = pairInOrder(jn, nw)
		gotOf = jn.wantOf
	} else {
		// Each group: want's rows with some cells and got's rows with
		// them (grouped by the head of want's rows).
		gg := groupsBy(jn.wantOf, nw)
		gOf = make([]int32, nw)
		for i := range gOf {
			gOf[i] = -1
		}
		gotOf = make([]int32, ng)
		for j := range gotOf {
			gotOf[j] = -1
		}
		near := func(wi, gi int32) bool {
			for _, cc := range loose {
				if !cc.eq(int(wi), int(gi)) {
					return false
				}
			}
			return true
		}
		var ws []int32
		for i := range nw {
			h := int32(i)
			if gg.size[i] == 0 {
				continue // not a head (got rows point at heads), or no got rows
			}
			ws = jn.wantLinks.members(h, ws[:0])
			pairGroup(ws, gg.rows[gg.start[i]:gg.start[i]+gg.size[i]], near, loose, gOf, gotOf)
		}
	}
	var pw, pg []int32
	for i, gi := range gOf {
		if gi < 0 {
			c.addMissing(i)
			continue
		}
		pw, pg = append(pw, int32(i)), append(pg, gi)
	}
	for j, wi := range gotOf {
		if wi < 0 {
			c.addExtra(j)
		}
	}
	c.pairs = pairing{n: len(pw), w: pw, g: pg}
}

// pairGroup pairs the want rows ws with the got rows gs of one group,
// writing partners into gOf and gotOf. Small groups get a maximum matching
// (augmenting paths, seeded with rows in order); large ones are sorted by
// their first tolerant column and paired first-fit.
func pairGroup(ws, gs []int32, near func(wi, gi int32) bool, loose []*colCmp, gOf, gotOf []int32) {
	if len(ws) <= multisetGroupLimit && len(gs) <= multisetGroupLimit {
		adj := make([][]int, len(ws))
		for a, wi := range ws {
			for b, gi := range gs {
				if near(wi, gi) {
					adj[a] = append(adj[a], b)
				}
			}
		}
		mw := make([]int, len(ws)) // partner index in gs, or -1
		mg := make([]int, len(gs))
		for i := range mw {
			mw[i] = -1
		}
		for i := range mg {
			mg[i] = -1
		}
		var try func(a int, seen []bool) bool
		try = func(a int, seen []bool) bool {
			for _, b := range adj[a] {
				if seen[b] {
					continue
				}
				seen[b] = true
				if mg[b] < 0 || try(mg[b], seen) {
					mw[a], mg[b] = b, a
					return true
				}
			}
			return false
		}
		for a := range ws {
			try(a, make([]bool, len(gs)))
		}
		for a, b := range mw {
			if b >= 0 {
				gOf[ws[a]], gotOf[gs[b]] = gs[b], ws[a]
			}
		}
		return
	}
	// Large group: sort got rows by the first tolerant column, then pair
	// each want row (in sorted order) with the first near got row among the
	// unpaired ones whose first tolerant cell lies within that column's
	// tolerance of its own.
	first := loose[0]
	wk := sortKeys(first.wc, ws)
	gs = slices.Clone(gs)
	gk := sortKeys(first.gc, gs)
	slices.SortFunc(gs, func(a, b int32) int {
		if c := cmpFloat(gk[a], gk[b]); c != 0 {
			return c
		}
		return int(a) - int(b)
	})
	keys := make([]float64, len(gs))
	for b, gi := range gs {
		keys[b] = gk[gi]
	}
	ws = slices.Clone(ws)
	slices.SortFunc(ws, func(a, b int32) int {
		if c := cmpFloat(wk[a], wk[b]); c != 0 {
			return c
		}
		return int(a) - int(b)
	})
	for _, wi := range ws {
		x := wk[wi]
		lo, hi := x, x
		if !math.IsInf(x, 0) {
			r := first.reach(x)
			lo, hi = x-r, x+r
		}
		b, _ := slices.BinarySearchFunc(keys, lo, cmpFloat)
		for tried := 0; b < len(gs) && cmpFloat(keys[b], hi) <= 0 && tried < multisetWindow; b++ {
			gi := gs[b]
			if gotOf[gi] >= 0 {
				continue
			}
			tried++
			if near(wi, gi) {
				gOf[wi], gotOf[gi] = gi, wi
				break
			}
		}
	}
}

// sortKeys returns, for the given rows of col, a number to sort them by:
// the value (times in seconds), −Inf for null, +Inf for NaN.
func sortKeys(col *fixtures.Column, rows []int32) map[int32]float64 {
	out := make(map[int32]float64, len(rows))
	for _, r := range rows {
		i := int(r)
		v := 0.0
		switch {
		case col.IsNull(i):
			v = math.Inf(-1)
		case col.Kind() == fixtures.KindFloat64:
			v = col.Float64(i)
			if v != v {
				v = math.Inf(1)
			}
		case col.Kind() == fixtures.KindInt64:
			v = float64(col.Int64(i))
		case col.Kind() == fixtures.KindDate:
			v = float64(col.Days(i)) * 86400
		case col.Kind() == fixtures.KindTimestamp:
			t := col.Time(i)
			v = float64(t.Unix()) + float64(t.Nanosecond())/1e9
		case col.Kind() == fixtures.KindTime, col.Kind() == fixtures.KindDuration:
			v = float64(col.Ticks(i))
		}
		out[r] = v
	}
	return out
}

func cmpFloat(a, b float64) int {
	switch {
	case a < b:
		return -1
	case a > b:
		return 1
	}
	return 0
}

// reach bounds how far (in sort-key units) a cell equal to a cell of value
// x can lie under the column's rule, with some slack for rounding.
func (cc *colCmp) reach(x float64) float64 {
	ax := math.Abs(x)
	var r float64
	switch {
	case cc.hasTT:
		r = cc.tt.Seconds()
	case cc.rule.hasULP:
		r = float64(cc.rule.ulps) * 2 * (math.Nextafter(ax, math.Inf(1)) - ax)
	case cc.rule.hasTol && cc.rule.rel < 1:
		r = math.Max(cc.rule.abs, cc.rule.rel*ax/(1-cc.rule.rel))
	case cc.rule.hasTol:
		return math.Inf(1)
	}
	if cc.class == classDateTime {
		r += 86400 // a date is midnight in the timestamp's zone, up to a day from UTC midnight
	}
	return r*1.000001 + 1e-300
}
