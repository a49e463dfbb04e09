package arrowguard

import (
	"testing"

	"github.com/stretchr/testify/require"
)

func TestAllocator(t *testing.T) {
	a := NewAllocator(10)
	require.Len(t, a.Allocate(1<<20), 1<<20)
	require.PanicsWithValue(t, ErrTooLarge{1 << 30}, func() { a.Allocate(1 << 30) })
	require.PanicsWithValue(t, ErrTooLarge{-1}, func() { a.Reallocate(-1, nil) })
	var err error
	func() {
		defer Recover("Arrow IPC", &err)
		a.Allocate(1 << 30)
	}()
	require.EqualError(t, err, "corrupt Arrow IPC data: the data asks for a buffer of 1073741824 bytes, far more than the file could hold")
	require.ErrorAs(t, err, new(ErrTooLarge))
}

func TestRecoverNonError(t *testing.T) {
	var err error
	func() {
		defer Recover("Parquet", &err)
		panic("index out of range")
	}()
	require.EqualError(t, err, "corrupt Parquet data: index out of range")
	err = nil
	func() { defer Recover("Parquet", &err) }()
	require.NoError(t, err)
}

func TestMaxRows(t *testing.T) {
	require.Equal(t, int64(1<<20), MaxRows(0))
	require.Equal(t, int64(1<<20+1024*100), MaxRows(100))
}
