package assert

import (
	"github.com/proofsheet/proofsheet/fixtures"
)

// TestingT is the part of a test that Tables reports through: *testing.T,
// *testing.B, testing.TB and testify's assert.TestingT all fit. When t also
// has a Helper method (as *testing.T does), Tables calls it, so the failure
// points at the caller's line.
type TestingT interface {
	Errorf(format string, args ...any)
}

// StopT is a TestingT that can also stop the test at once, as *testing.T
// and testify's require.TestingT can.
type StopT interface {
	TestingT
	FailNow()
}

type helper interface{ Helper() }

// Tables compares got with want under the options and, when they differ,
// reports the difference through t.Errorf with the Diff's Text. It returns
// whether the tables are equal. The test goes on after a failure; use
// MustMatch to stop it.
func Tables(t TestingT, want, got *fixtures.Table, opts ...Option) bool {
	if h, ok := t.(helper); ok {
		h.Helper()
	}
	d := Compare(want, got, opts...)
	if d.Equal() {
		return true
	}
	name := "table comparison"
	if n, ok := t.(interface{ Name() string }); ok {
		name = n.Name() + ": table comparison"
	}
	t.Errorf("%s%s", d.Text(), artifactNote(t, d, name))
	return false
}

// MustMatch is Tables that stops the test (t.FailNow) when the tables
// differ.
func MustMatch(t StopT, want, got *fixtures.Table, opts ...Option) {
	if h, ok := t.(helper); ok {
		h.Helper()
	}
	if !Tables(t, want, got, opts...) {
		t.FailNow()
	}
}
