// Package arrowguard holds the defences fixtures and its format packages
// put around Arrow's readers, which trust the bytes they are given: an
// allocator that refuses absurd single allocations, a bound on the rows a
// file of a given size may claim, and a recover that turns a reader's
// panic into an error. It is internal: shared by fixtures (Arrow IPC) and
// fixtures/parquet, not API.
//
// Typical use:
//
//	func decode(data []byte) (t *fixtures.Table, err error) {
//		defer arrowguard.Recover("Parquet", &err)
//		mem := arrowguard.NewAllocator(len(data))
//		// … hand mem to Arrow's reader, check row counts against
//		// arrowguard.MaxRows(len(data)) …
//	}
package arrowguard
