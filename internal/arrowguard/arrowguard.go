package arrowguard

import (
	"fmt"

	"github.com/apache/arrow-go/v18/arrow/memory"
)

// ErrTooLarge is raised (as a panic, caught by Recover at the reader's
// edge) when a corrupt length field asks for an absurd allocation.
type ErrTooLarge struct{ N int }

func (e ErrTooLarge) Error() string {
	return fmt.Sprintf("the data asks for a buffer of %d bytes, far more than the file could hold", e.N)
}

// Allocator refuses single allocations above a limit, so that a corrupt
// length in a file fails with an error instead of exhausting memory.
type Allocator struct {
	limit int
	inner memory.Allocator
}

// NewAllocator returns an allocator for reading dataLen bytes of input:
// generous for compressed data, tight enough to stop nonsense lengths.
func NewAllocator(dataLen int) *Allocator {
	return &Allocator{limit: max(256<<20, 64*dataLen), inner: memory.NewGoAllocator()}
}

// Allocate implements memory.Allocator; it panics with ErrTooLarge above
// the limit.
func (a *Allocator) Allocate(n int) []byte {
	if n < 0 || n > a.limit {
		panic(ErrTooLarge{n})
	}
	return a.inner.Allocate(n)
}

// Reallocate implements memory.Allocator; it panics with ErrTooLarge
// above the limit.
func (a *Allocator) Reallocate(n int, b []byte) []byte {
	if n < 0 || n > a.limit {
		panic(ErrTooLarge{n})
	}
	return a.inner.Reallocate(n, b)
}

// Free implements memory.Allocator.
func (a *Allocator) Free(b []byte) { a.inner.Free(b) }

// MaxRows bounds the rows a file of n bytes may claim: a million, plus
// 1024 per byte (columns of nulls and long runs compress well, but not
// without limit). More is taken for a corrupt row count, which would
// otherwise make the conversion allocate without bound.
func MaxRows(n int) int64 { return 1<<20 + 1024*int64(n) }

// Recover, deferred, turns a panic inside an Arrow reader into the error
// "corrupt WHAT data: cause" stored in *err.
func Recover(what string, err *error) {
	if r := recover(); r != nil {
		cause, ok := r.(error)
		if !ok {
			cause = fmt.Errorf("%v", r)
		}
		*err = fmt.Errorf("corrupt %s data: %w", what, cause)
	}
}
