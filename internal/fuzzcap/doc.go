// Package fuzzcap bounds the time `go test -fuzz` spends minimizing each
// new interesting input, for the fuzz targets whose inputs are
// kilobytes of structured bytes (Arrow IPC, Parquet, a Diff's JSON).
//
// Go's minimizer tries removing every subset of bytes of such an input:
// its work grows with the square of the input's length, so with the
// default limit of 60 s it used the whole minute on each input that
// found new coverage, and a target ran a handful of executions in its
// first minutes. Minimizing only shortens the inputs kept in the cache;
// a crasher is still kept, minimized within the bound.
//
// Typical use, in the test files of a package with such a target:
//
//	func TestMain(m *testing.M) {
//		fuzzcap.LimitMinimize(3 * time.Second)
//		os.Exit(m.Run())
//	}
//
// A -fuzzminimizetime given on the command line wins.
package fuzzcap
