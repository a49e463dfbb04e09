package property

import (
	"fmt"
	"math/rand"
	"strings"
	"testing"

	"github.com/leanovate/gopter"
	"github.com/stretchr/testify/require"

	"github.com/proofsheet/proofsheet/assert"
	"github.com/proofsheet/proofsheet/fixtures"
)

// params returns gopter generator parameters with a fixed seed.
func params(seed int64) *gopter.GenParameters {
	return &gopter.GenParameters{MaxSize: 100, MaxShrinkCount: 1000, Rng: rand.New(gopter.NewLockedSource(seed))}
}

// draw takes n values from a generator with a fixed seed, skipping
// discarded draws.
func draw[T any](t *testing.T, g gopter.Gen, n int, seed int64) []T {
	t.Helper()
	p := params(seed)
	out := make([]T, 0, n)
	for i := 0; i < n*3 && len(out) < n; i++ {
		v, ok := g(p).Retrieve()
		if ok {
			out = append(out, v.(T))
		}
	}
	return out
}

// fakeT records what Check reports.
type fakeT struct {
	name string
	msgs []string
}

func (f *fakeT) Helper()      {}
func (f *fakeT) Name() string { return f.name }
func (f *fakeT) Errorf(format string, args ...any) {
	f.msgs = append(f.msgs, fmt.Sprintf(format, args...))
}
func (f *fakeT) text() string { return strings.Join(f.msgs, "\n") }

// requireSame fails unless two tables are equal (assert.Compare).
func requireSame(t *testing.T, want, got *fixtures.Table, opts ...assert.Option) {
	t.Helper()
	d := assert.Compare(want, got, opts...)
	require.True(t, d.Equal(), "%s", d.Text())
}

// sampleOf builds a sample by hand: string columns named by names, one
// record per row, cells as given.
func sampleOf(names []string, rows ...[]Messy) *Sample {
	s := &Sample{Seed: 1}
	for j, n := range names {
		s.Schema = append(s.Schema, fixtures.Col(n, fixtures.String))
		s.cols = append(s.cols, rawCol{name: n, plain: n, field: j})
	}
	for i, r := range rows {
		rec := make([]any, len(r))
		for j, c := range r {
			rec[j] = c.Clean
		}
		s.recs = append(s.recs, rec)
		s.rows = append(s.rows, rawRow{rec: i, cells: r})
	}
	return s
}

// text is a non-null plain string cell.
func text(s string) Messy { return Messy{Raw: s, Clean: s} }

// greenhouse is the schema most tests use: invented datalogger readings.
var greenhouse = fixtures.Schema{
	fixtures.Col("house", fixtures.Category),
	fixtures.Col("day", fixtures.Date),
	fixtures.Col("at", fixtures.TimestampOf(fixtures.Millis, "UTC")),
	fixtures.Col("temp_c", fixtures.Float64),
	fixtures.Col("kept", fixtures.Int64),
	fixtures.Col("cost", fixtures.DecimalOf(10, 2)),
	fixtures.Col("heater_on", fixtures.Bool),
	fixtures.Col("note", fixtures.String),
}
