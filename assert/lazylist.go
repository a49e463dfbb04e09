package assert

import (
	"math/bits"
	"sort"
	"sync"

	"github.com/proofsheet/proofsheet/fixtures"
)

// Listings that Compare builds on demand. A listing of at most
// holdListing entries is built at once and held (so a small Diff does not
// keep the tables alive); a longer one keeps what it needs to build its
// entries from the tables: the columns, the pairing of rows, and a bitmap
// of differing slots per column (one bit a slot) or the listed row
// numbers (four bytes a row).

// holdListing is the longest listing Compare builds at once.
const holdListing = 1024

// tablesRef is what an on-demand listing reads: the tables, the compared
// columns, the key columns and the pairing of rows. It never holds the
// comparison's scratch memory.
type tablesRef struct {
	want, got *fixtures.Table
	cols      []*colCmp
	keyCols   []*colCmp
	pairs     pairing
}

// keyText returns the literal spelling of a row's key cells, nil when rows
// are not keyed.
func (t *tablesRef) keyText(side Side, row int) []string {
	if len(t.keyCols) == 0 || row < 0 {
		return nil
	}
	out := make([]string, len(t.keyCols))
	for i, k := range t.keyCols {
		col := k.wc
		if side == GotSide {
			col = k.gc
		}
		out[i] = fixtures.LiteralCell(col, row)
	}
	return out
}

// rowRef names the rows of pair slot p (p < 0: no row).
func (t *tablesRef) rowRef(p int) RowRef {
	if p < 0 {
		return RowRef{Want: -1, Got: -1}
	}
	wi, gi := t.pairs.at(p)
	return RowRef{Want: wi, Got: gi, Key: t.keyText(WantSide, wi)}
}

// cellSource lists the differing cells of a comparison: by slot, then by
// column in want's order, at most n of them.
type cellSource struct {
	t    *tablesRef
	bits [][]uint64 // per compared column: bit s set when slot s differs; nil for none
	n    int

	once   sync.Once
	before []int // listed cells in the words before word w, for at
}

func (s *cellSource) count() int { return s.n }

// words returns how many bitmap words the slots take.
func (s *cellSource) words() int { return (s.t.pairs.n + 63) / 64 }

// word returns the union of the columns' words w: the slots with a
// differing cell.
func (s *cellSource) word(w int) uint64 {
	var u uint64
	for _, b := range s.bits {
		if b != nil {
			u |= b[w]
		}
	}
	return u
}

// walk calls f(i, slot, col) for listed cells i = from, from+1, … in
// order until f returns false or the listing ends.
func (s *cellSource) walk(from int, f func(i, slot, col int) bool) {
	if from >= s.n {
		return
	}
	w, i := 0, 0
	if from > 0 {
		s.index()
		w = sort.Search(len(s.before), func(w int) bool { return s.before[w] > from }) - 1
		i = s.before[w]
	}
	base := s.t.pairs.base
	for ; w < s.words(); w++ {
		u := s.word(w)
		for u != 0 {
			t := bits.TrailingZeros64(u)
			u &= u - 1
			slot := w*64 + t
			for j, b := range s.bits {
				if b == nil || b[w]&(1<<uint(t)) == 0 {
					continue
				}
				if i >= from && !f(i, base+slot, j) {
					return
				}
				i++
				if i >= s.n {
					return
				}
			}
		}
	}
}

// index counts the listed cells before each word, once.
func (s *cellSource) index() {
	s.once.Do(func() {
		s.before = make([]int, s.words())
		n := 0
		for w := range s.before {
			s.before[w] = n
			for _, b := range s.bits {
				if b != nil {
					n += bits.OnesCount64(b[w])
				}
			}
		}
	})
}

// cell builds listed cell (slot, col); the key texts of the row are
// passed in, shared by the cells of one row. values says whether to fill
// the cells' Value fields.
func (s *cellSource) cell(slot, col int, key []string, values bool) CellDiff {
	cc := s.t.cols[col]
	wi, gi := s.t.pairs.at(slot - s.t.pairs.base)
	c := CellDiff{Row: RowRef{Want: wi, Got: gi, Key: key}, Column: cc.name,
		Want: cellText(cc.wc, wi), Got: cellText(cc.gc, gi), Delta: cc.delta(wi, gi)}
	if values {
		c.Want.Value, c.Got.Value = cc.wc.Value(wi), cc.gc.Value(gi)
	}
	return c
}

func (s *cellSource) at(i int) CellDiff {
	var out CellDiff
	s.walk(i, func(_, slot, col int) bool {
		wi, _ := s.t.pairs.at(slot - s.t.pairs.base)
		out = s.cell(slot, col, s.t.keyText(WantSide, wi), true)
		return false
	})
	return out
}

func (s *cellSource) each(from int, yield func(int, CellDiff) bool) {
	s.walkRows(from, true, func(i int, c *CellDiff) bool { return yield(i, *c) })
}

// views is each for the renderers: the CellDiff passed to f is reused
// from call to call (its Row.Key is shared by the cells of a row), and
// the cells' Value fields are not filled.
func (s *cellSource) views(from int, f func(int, *CellDiff) bool) {
	s.walkRows(from, false, f)
}

func (s *cellSource) walkRows(from int, values bool, f func(int, *CellDiff) bool) {
	lastSlot := -1
	var key []string
	var c CellDiff
	s.walk(from, func(i, slot, col int) bool {
		if slot != lastSlot {
			wi, _ := s.t.pairs.at(slot - s.t.pairs.base)
			key, lastSlot = s.t.keyText(WantSide, wi), slot
		}
		c = s.cell(slot, col, key, values)
		return f(i, &c)
	})
}

// compared returns the names of the columns with a listed cell, in
// want's order.
func (s *cellSource) compared() []string {
	var out []string
	seen := make([]bool, len(s.bits))
	s.walk(0, func(_, _, col int) bool {
		if !seen[col] {
			seen[col] = true
		}
		return true
	})
	for j, ok := range seen {
		if ok {
			out = append(out, s.t.cols[j].name)
		}
	}
	return out
}

func cellText(col *fixtures.Column, row int) Cell {
	return Cell{Text: fixtures.LiteralCell(col, row), Kind: col.Kind(), Null: col.IsNull(row)}
}

func cellOf(col *fixtures.Column, row int) Cell {
	c := cellText(col, row)
	c.Value = col.Value(row)
	return c
}

// cellViewer is a cell lister that can hand out cells without building
// their values (see cellSource.views).
type cellViewer interface {
	views(from int, f func(int, *CellDiff) bool)
	compared() []string
}

// eachCell calls f for every listed cell of l in order until f returns
// false. The CellDiff passed may be reused from call to call and its
// Value fields may be unset: f must neither keep nor change it.
func eachCell(l Listing[CellDiff], f func(int, *CellDiff) bool) {
	if v, ok := l.src.(cellViewer); ok {
		v.views(0, f)
		return
	}
	if l.src != nil {
		l.src.each(0, func(i int, c CellDiff) bool { return f(i, &c) })
		return
	}
	for i := range l.held {
		c := l.held[i]
		if !f(i, &c) {
			return
		}
	}
}

// listedColumns returns the names of the columns of l's cells: in the
// order of compared, then those not among compared in listing order.
func listedColumns(l Listing[CellDiff], compared []string) []string {
	used := map[string]bool{}
	var order []string
	if v, ok := l.src.(cellViewer); ok {
		order = v.compared()
		for _, n := range order {
			used[n] = true
		}
	} else {
		for _, c := range l.All() {
			if !used[c.Column] {
				used[c.Column] = true
				order = append(order, c.Column)
			}
		}
	}
	var cols []string
	for _, name := range compared {
		if used[name] {
			cols = append(cols, name)
			delete(used, name)
		}
	}
	for _, name := range order {
		if used[name] {
			cols = append(cols, name)
			delete(used, name)
		}
	}
	return cols
}

// rowSource lists rows present on one side only: rows[i], or first+i
// when rows is nil.
type rowSource struct {
	t     *tablesRef
	side  Side
	rows  []int32
	first int
	n     int
}

func (s *rowSource) count() int { return s.n }

func (s *rowSource) at(i int) RowRef {
	row := s.first + i
	if s.rows != nil {
		row = int(s.rows[i])
	}
	tb := s.t.want
	ref := RowRef{Want: row, Got: -1}
	if s.side == GotSide {
		tb, ref = s.t.got, RowRef{Want: -1, Got: row}
	}
	ref.Key, ref.Cells = s.t.keyText(s.side, row), rowCells(tb, row)
	return ref
}

func (s *rowSource) each(from int, yield func(int, RowRef) bool) {
	for i := from; i < s.n; i++ {
		if !yield(i, s.at(i)) {
			return
		}
	}
}

// listing returns a listing of the lister's entries: held when there are
// at most hold of them, else built on demand.
func listing[T any](src lister[T], hold int) Listing[T] {
	n := src.count()
	if n == 0 {
		return Listing[T]{}
	}
	if n > hold {
		return Listing[T]{src: src}
	}
	held := make([]T, 0, n)
	src.each(0, func(_ int, x T) bool {
		held = append(held, x)
		return true
	})
	return Listing[T]{held: held}
}
