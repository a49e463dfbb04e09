package assert

import (
	"fmt"
	"testing"

	tfassert "github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"github.com/proofsheet/proofsheet/fixtures"
)

// recorder is a TestingT that records what the helpers do.
type recorder struct {
	helpers int
	errors  []string
	stopped bool
}

func (r *recorder) Helper() { r.helpers++ }
func (r *recorder) Errorf(format string, a ...any) {
	r.errors = append(r.errors, sprintf(format, a...))
}
func (r *recorder) FailNow() { r.stopped = true }

// errorsOnly has only Errorf, like testify's assert.TestingT.
type errorsOnly struct{ errors int }

func (e *errorsOnly) Errorf(string, ...any) { e.errors++ }

// oneCellApart returns two one-cell tables that differ.
func oneCellApart(t *testing.T) (want, got *fixtures.Table) {
	return lit(t, `a:int64
		1`), lit(t, `a:int64
		2`)
}

func TestTablesReports(t *testing.T) {
	want, got := oneCellApart(t)
	r := &recorder{}
	require.True(t, Tables(r, want, want))
	require.Empty(t, r.errors)
	require.False(t, Tables(r, want, got))
	require.Len(t, r.errors, 1)
	require.Equal(t, Compare(want, got).Text(), r.errors[0])
	require.Positive(t, r.helpers)
	require.False(t, r.stopped, "Tables lets the test go on")

	e := &errorsOnly{}
	require.False(t, Tables(e, want, got))
	require.Equal(t, 1, e.errors)
	require.False(t, Tables(e, nil, got), "a nil table fails with a message, no panic")
	require.Equal(t, 2, e.errors)
}

func TestMustMatchStops(t *testing.T) {
	want, got := oneCellApart(t)
	r := &recorder{}
	MustMatch(r, want, want)
	require.False(t, r.stopped)
	MustMatch(r, want, got, ByKey("a"))
	require.True(t, r.stopped)
	require.Len(t, r.errors, 1)
	require.Contains(t, r.errors[0], "missing rows (1, in want, not in got)")
}

func TestTestingTFitsTheUsualTypes(t *testing.T) {
	var _ TestingT = t
	var _ TestingT = (*testing.B)(nil)
	var _ TestingT = testing.TB(t)
	var _ StopT = t
	// testify's interfaces: anything that satisfies them satisfies ours.
	var tfa tfassert.TestingT = &errorsOnly{}
	var _ TestingT = tfa
	var tfr require.TestingT = &recorder{}
	var _ StopT = tfr
}

func sprintf(format string, a ...any) string { return fmt.Sprintf(format, a...) }
