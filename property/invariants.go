package property

import (
	"errors"
	"fmt"
	"math"
	"runtime/debug"
	"slices"
	"strings"

	"github.com/proofsheet/proofsheet/assert"
	"github.com/proofsheet/proofsheet/fixtures"
)

// Func is a transformation under test: a raw table in, a result table out.
type Func func(*fixtures.Table) (*fixtures.Table, error)

// FileFunc is a loader and transformation under test: raw file bytes in,
// a result table out. name is a file name whose extension tells the
// format (see File.Name), to pass on to fixtures.ReadBytes.
type FileFunc func(name string, data []byte) (*fixtures.Table, error)

// Invariant is one property a transformation must have on every input.
// Build one with NoPanic, Idempotent, OrderFree, KeepsTotal, NoNulls,
// SameOnPlain, Agrees, MatchesClean or Holds.
//
// Every invariant runs the function with panics recovered: a panic, or a
// nil table with a nil error, fails any invariant. An error from the
// function fails every invariant but NoPanic unless ErrorsOK allows it.
type Invariant struct {
	name     string
	errorsOK bool
	check    func(tr *trial, base outcome) string
}

// Name returns the invariant's name, as reports give it.
func (inv Invariant) Name() string { return inv.name }

// ErrorsOK returns the invariant with errors allowed: when the function
// returns an error for an input, the invariant holds for that input.
func (inv Invariant) ErrorsOK() Invariant {
	inv.errorsOK = true
	inv.name += " (errors allowed)"
	return inv
}

// outcome is one run of the function under test.
type outcome struct {
	out      *fixtures.Table
	err      error
	panicked bool
	panicVal any
	stack    string
}

// trouble describes a run that broke the contract: a panic, or neither a
// table nor an error. It returns "" for a table or an error.
func (o outcome) trouble(what string) string {
	switch {
	case o.panicked:
		return fmt.Sprintf("%s panicked: %v\n%s", what, o.panicVal, o.stack)
	case o.out == nil && o.err == nil:
		return what + " returned a nil table and a nil error"
	}
	return ""
}

// trial runs the function under test on one sample and its variants.
type trial struct {
	sample *Sample
	run    func(s *Sample) outcome         // the function on a sample
	again  func(t *fixtures.Table) outcome // the function on a table it made
}

// call runs f with panics recovered.
func call(f func() (*fixtures.Table, error)) (o outcome) {
	defer func() {
		if r := recover(); r != nil {
			o = outcome{panicked: true, panicVal: r, stack: trimStack(string(debug.Stack()))}
		}
	}()
	out, err := f()
	return outcome{out: out, err: err}
}

// trimStack keeps the frames from the one that panicked down to the first
// frame of this package's own machinery, at most 12 lines.
func trimStack(s string) string {
	lines := strings.Split(strings.TrimRight(s, "\n"), "\n")
	for i, l := range lines {
		if strings.HasPrefix(l, "panic(") {
			lines = lines[min(i+2, len(lines)):] // the panic call and its file line
			break
		}
	}
	for i := 2; i < len(lines); i++ {
		if strings.HasPrefix(lines[i], "github.com/proofsheet/proofsheet/property.") {
			lines = lines[:i]
			break
		}
	}
	if len(lines) > 12 {
		lines = append(lines[:12], "\t…")
	}
	return strings.Join(lines, "\n")
}

// verdict checks one invariant on one trial: "" when it holds.
func (inv Invariant) verdict(tr *trial) string {
	base := tr.run(tr.sample)
	if m := base.trouble("the function"); m != "" {
		return m
	}
	if base.err != nil {
		if inv.errorsOK {
			return ""
		}
		if inv.check == nil { // NoPanic: an error is an answer
			return ""
		}
		return fmt.Sprintf("the function returned an error: %v", base.err)
	}
	if inv.check == nil {
		return ""
	}
	return inv.check(tr, base)
}

// compare returns "" when want and got are equal under opts, else the
// diff's text after a heading.
func compare(heading string, want, got *fixtures.Table, opts []assert.Option) string {
	d := assert.Compare(want, got, opts...)
	if d.Equal() {
		return ""
	}
	return heading + ":\n" + indent(d.Text(), "    ")
}

func indent(s, by string) string {
	s = strings.TrimRight(s, "\n")
	return by + strings.ReplaceAll(s, "\n", "\n"+by)
}

// comparing builds an invariant that runs something else on the trial
// (other) and compares its result with the function's own under opts.
// what names the other run in messages; heading leads the diff. The other
// run's result is the one wanted when otherIsWant, else the function's.
func comparing(name, what, heading string, otherIsWant bool, opts []assert.Option, other func(tr *trial, base outcome) outcome) Invariant {
	return Invariant{name: name, check: func(tr *trial, base outcome) string {
		o := other(tr, base)
		if m := o.trouble(what); m != "" {
			return m
		}
		if o.err != nil {
			return fmt.Sprintf("%s returned an error: %v", what, o.err)
		}
		if otherIsWant {
			return compare(heading, o.out, base.out, opts)
		}
		return compare(heading, base.out, o.out, opts)
	}}
}

// NoPanic checks that the function never panics and returns a table or an
// error, never a nil table with a nil error. Errors are allowed.
func NoPanic() Invariant { return Invariant{name: "no panic"} }

// Idempotent checks that running the function on its own output changes
// nothing: f(f(raw)) equals f(raw) under the assert options. It applies
// to cleanup steps whose output a second pass should leave alone. For a
// FileFunc the output is written as CSV in the input's style and loaded
// again.
func Idempotent(opts ...assert.Option) Invariant {
	return comparing("idempotent", "the function on its own output",
		"f(f(raw)) differs from f(raw) (want f(raw), got f(f(raw)))", false, opts,
		func(tr *trial, base outcome) outcome { return tr.again(base.out) })
}

// OrderFree checks that the order of the input rows does not matter: the
// function gives the same result for the rows shuffled. Results are
// compared by the key columns of an assert.ByKey option among opts, or in
// any row order when there is none.
func OrderFree(opts ...assert.Option) Invariant {
	if len(assert.KeyColumns(opts...)) == 0 {
		opts = append(slices.Clip(opts), assert.AnyRowOrder())
	}
	return comparing("row order free", "the function on the shuffled rows",
		"the result for the shuffled rows differs (want the result for the rows in order, got that for the rows shuffled)", false, opts,
		func(tr *trial, _ outcome) outcome { return tr.run(tr.sample.Shuffled(tr.sample.Seed ^ 0x0dd5)) })
}

// KeepsTotal checks that the sum of the clean values of input column in,
// over the raw rows (duplicates included, nulls and sentinels left out),
// equals the sum of output column out within tol. Samples whose raw table
// lacks column in pass. The output column must exist and be numeric.
// NaN sums equal each other; extreme values make the sums meaningless, so
// use it with the default ExtremeRate of the light level (none).
func KeepsTotal(in, out string, tol float64) Invariant {
	return Invariant{name: fmt.Sprintf("total of %s kept in %s", in, out), check: func(tr *trial, base outcome) string {
		s := tr.sample
		f := s.Schema.Index(in)
		if f < 0 {
			return fmt.Sprintf("KeepsTotal: the schema has no column %q", in)
		}
		if !s.Schema[f].Type.Kind().IsNumeric() {
			return fmt.Sprintf("KeepsTotal: column %q is %s, not a number", in, s.Schema[f].Type)
		}
		j := slices.IndexFunc(s.cols, func(c rawCol) bool { return c.field == f })
		if j < 0 {
			return ""
		}
		want := 0.0
		for _, r := range s.rows {
			want += number(r.cells[j].Clean)
		}
		oc := base.out.Column(out)
		if oc == nil {
			return fmt.Sprintf("the output has no column %q (columns: %s)", out, strings.Join(base.out.Names(), ", "))
		}
		got, err := columnSum(oc)
		if err != nil {
			return err.Error()
		}
		if sameSum(want, got, tol) {
			return ""
		}
		return fmt.Sprintf("sum of output column %q: got %s, want %s (the sum of input column %q), a difference of %s beyond the tolerance %s",
			out, fixtures.FormatFloat(got), fixtures.FormatFloat(want), in, fixtures.FormatFloat(math.Abs(got-want)), fixtures.FormatFloat(tol))
	}}
}

func sameSum(a, b, tol float64) bool {
	switch {
	case math.IsNaN(a) || math.IsNaN(b):
		return math.IsNaN(a) && math.IsNaN(b)
	case math.IsInf(a, 0) || math.IsInf(b, 0):
		return a == b
	}
	return math.Abs(a-b) <= tol
}

// number returns a clean numeric value as a float64 (0 for null).
func number(v any) float64 {
	switch x := v.(type) {
	case int64:
		return float64(x)
	case float64:
		return x
	case fixtures.Decimal:
		return x.Float64()
	}
	return 0
}

// columnSum sums the non-null cells of a numeric column.
func columnSum(c *fixtures.Column) (float64, error) {
	sum := 0.0
	switch c.Kind() {
	case fixtures.KindFloat64:
		for i, v := range c.Float64s() {
			if !c.IsNull(i) {
				sum += v
			}
		}
	case fixtures.KindInt64:
		for i, v := range c.Int64s() {
			if !c.IsNull(i) {
				sum += float64(v)
			}
		}
	case fixtures.KindDecimal:
		for i := 0; i < c.Len(); i++ {
			if !c.IsNull(i) {
				sum += c.Decimal(i).Float64()
			}
		}
	default:
		return 0, fmt.Errorf("output column %q is %s, not a number", c.Name(), c.Type())
	}
	return sum, nil
}

// NoNulls checks that the named output columns exist and hold no null.
func NoNulls(cols ...string) Invariant {
	return Invariant{name: "no nulls in " + strings.Join(cols, ", "), check: func(tr *trial, base outcome) string {
		var msgs []string
		for _, name := range cols {
			c := base.out.Column(name)
			if c == nil {
				msgs = append(msgs, fmt.Sprintf("the output has no column %q (columns: %s)", name, strings.Join(base.out.Names(), ", ")))
				continue
			}
			if n := c.NullCount(); n > 0 {
				first := 0
				for !c.IsNull(first) {
					first++
				}
				msgs = append(msgs, fmt.Sprintf("output column %q: got %s (the first in row %d), want none", name, plural(n, "null cell"), first+1))
			}
		}
		return strings.Join(msgs, "\n")
	}}
}

// SameOnPlain checks that messy spelling does not change the result: the
// function gives the same result for the raw sample as for the same rows
// and columns in their plain spellings (Sample.Simplified), compared under
// the assert options.
func SameOnPlain(opts ...assert.Option) Invariant {
	return comparing("same on plain spellings", "the function on the plain spellings",
		"the result for the messy spellings differs from that for the plain ones (want plain, got messy)", true, opts,
		func(tr *trial, _ outcome) outcome { return tr.run(tr.sample.Simplified()) })
}

// Agrees checks the function against a reference implementation given the
// same raw table (for a FileFunc: the raw table the file holds), compared
// under the assert options, the reference's result being the one wanted.
func Agrees(ref Func, opts ...assert.Option) Invariant {
	return comparing("agrees with the reference", "the reference",
		"the result differs from the reference's (want reference, got function)", true, opts,
		func(tr *trial, _ outcome) outcome {
			return call(func() (*fixtures.Table, error) { return ref(tr.sample.Raw()) })
		})
}

// MatchesClean checks the function on the raw sample against a reference
// given the clean table (Sample.Clean: typed, no duplicates, no extra or
// missing columns, records in order), compared under the assert options.
// The reference can be plain code over typed values; the invariant says
// the function undoes all the mess.
func MatchesClean(ref Func, opts ...assert.Option) Invariant {
	return comparing("matches the reference on clean data", "the reference on the clean table",
		"the result differs from the reference's on the clean table (want reference, got function)", true, opts,
		func(tr *trial, _ outcome) outcome {
			return call(func() (*fixtures.Table, error) { return ref(tr.sample.Clean()) })
		})
}

// Holds checks a property of the user's own: check gets the sample and the
// function's result for its raw table and returns an error when the
// property does not hold.
func Holds(name string, check func(s *Sample, out *fixtures.Table) error) Invariant {
	return Invariant{name: name, check: func(tr *trial, base outcome) string {
		var err error
		o := call(func() (*fixtures.Table, error) { err = check(tr.sample, base.out); return base.out, nil })
		if o.panicked {
			return fmt.Sprintf("the check %q panicked: %v\n%s", name, o.panicVal, o.stack)
		}
		if err != nil {
			return err.Error()
		}
		return ""
	}}
}

var errNilFunc = errors.New("property: nil function")
