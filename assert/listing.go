package assert

import (
	"encoding/json"
	"iter"
)

// Listing is an ordered, read-only list of what a Diff lists: its
// differing cells (Diff.Cells) or its missing and extra rows
// (RowList.Rows). The zero Listing is empty.
//
// A listing either holds its entries or builds them on demand. Compare
// keeps a long listing as row and column numbers into the compared tables
// (a few bytes an entry instead of a few hundred) and builds each entry
// when it is read, so that a comparison can list every one of millions of
// differing cells and the renderers can write them as they go; such a
// Diff keeps the two tables alive while it is reachable. Short listings,
// listings read from JSON (DiffFromJSON) and listings built with ListOf
// hold their entries. Both kinds read alike, and reading is safe from
// several goroutines.
//
// Code that computes a Diff elsewhere (a SQL engine, another process)
// builds its listings with ListOf:
//
//	d.Cells = assert.ListOf(cells...)
//	d.Missing.Rows = assert.ListOf(rows...)
type Listing[T any] struct {
	held []T
	src  lister[T]
}

// lister builds the entries of a listing that does not hold them.
type lister[T any] interface {
	count() int
	// at builds entry i (0 ≤ i < count).
	at(i int) T
	// each builds the entries from entry from on, in order, until yield
	// returns false.
	each(from int, yield func(int, T) bool)
}

// ListOf returns a listing that holds the given entries, in their order.
// It keeps the slice it is given: do not change it afterwards.
func ListOf[T any](entries ...T) Listing[T] {
	return Listing[T]{held: entries}
}

// Len returns the number of entries.
func (l Listing[T]) Len() int {
	if l.src != nil {
		return l.src.count()
	}
	return len(l.held)
}

// At returns entry i; it panics when i is out of range, like a slice
// index.
func (l Listing[T]) At(i int) T {
	if l.src != nil {
		if i < 0 || i >= l.src.count() {
			panic("assert: Listing index out of range")
		}
		return l.src.at(i)
	}
	return l.held[i]
}

// All yields the index and the entry of every entry in order, as ranging
// over a slice does:
//
//	for i, c := range d.Cells.All() { … }
func (l Listing[T]) All() iter.Seq2[int, T] {
	return func(yield func(int, T) bool) {
		if l.src != nil {
			l.src.each(0, yield)
			return
		}
		for i, x := range l.held {
			if !yield(i, x) {
				return
			}
		}
	}
}

// Slice returns the entries as a new slice (nil when there are none).
// For a listing built on demand this builds every entry at once: prefer
// All for long listings.
func (l Listing[T]) Slice() []T {
	n := l.Len()
	if n == 0 {
		return nil
	}
	out := make([]T, 0, n)
	for _, x := range l.All() {
		out = append(out, x)
	}
	return out
}

// MarshalJSON writes the entries as a JSON array.
func (l Listing[T]) MarshalJSON() ([]byte, error) {
	s := l.Slice()
	if s == nil {
		s = []T{}
	}
	return json.Marshal(s)
}

// UnmarshalJSON reads a JSON array of entries into a listing that holds
// them.
func (l *Listing[T]) UnmarshalJSON(b []byte) error {
	var s []T
	if err := json.Unmarshal(b, &s); err != nil {
		return err
	}
	*l = Listing[T]{held: s}
	return nil
}
