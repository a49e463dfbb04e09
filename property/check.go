package property

import (
	"fmt"
	"os"
	"regexp"
	"slices"
	"strconv"
	"strings"
	"sync"
	"time"

	"github.com/leanovate/gopter"
	"github.com/leanovate/gopter/prop"

	"github.com/proofsheet/proofsheet/fixtures"
)

// SeedEnv is the environment variable that fixes the seed of Check and
// CheckFiles, to re-run a failure: PROOFSHEET_SEED=1234 go test -run …
const SeedEnv = "PROOFSHEET_SEED"

// TB is the part of testing.TB that Check uses.
type TB interface {
	Helper()
	Errorf(format string, args ...any)
	Name() string
}

// tableTrial makes the trial of a table function on a sample.
func tableTrial(fn Func, s *Sample) *trial {
	run := func(t *fixtures.Table) outcome {
		if fn == nil {
			return outcome{err: errNilFunc}
		}
		return call(func() (*fixtures.Table, error) { return fn(t) })
	}
	return &trial{
		sample: s,
		run:    func(s *Sample) outcome { return run(s.Raw()) },
		again:  run,
	}
}

// fileTrial makes the trial of a file function on a generated file: each
// sample variant is written in the file's style.
func fileTrial(fn FileFunc, f *File) *trial {
	feed := func(data []byte) outcome {
		if fn == nil {
			return outcome{err: errNilFunc}
		}
		return call(func() (*fixtures.Table, error) { return fn(f.Name(), data) })
	}
	return &trial{
		sample: f.Sample,
		run: func(s *Sample) outcome {
			if s == f.Sample {
				return feed(f.Data)
			}
			data, err := s.CSV(f.Style)
			if err != nil {
				return outcome{err: err}
			}
			return feed(data)
		},
		again: func(t *fixtures.Table) outcome {
			data, err := TableCSV(t, f.Style)
			if err != nil {
				return outcome{err: fmt.Errorf("writing the output as CSV: %w", err)}
			}
			return feed(data)
		},
	}
}

// broken is one invariant a sample breaks and why.
type broken struct {
	name, msg string
}

// verdicts checks every invariant on one trial and returns those broken,
// in the order given.
func verdicts(tr *trial, invs []Invariant) []broken {
	if len(invs) == 0 {
		invs = []Invariant{NoPanic()}
	}
	var out []broken
	for _, inv := range invs {
		if m := inv.verdict(tr); m != "" {
			out = append(out, broken{inv.name, m})
		}
	}
	return out
}

// failures remembers, for each generated value that failed, the class of
// its failure — which invariants it broke, and how — so that shrinking
// keeps only candidates that fail the same way: a candidate that breaks
// other invariants, or the same ones otherwise (say, with an error because
// a needed column was dropped), counts as passing.
type failures struct {
	mu    sync.Mutex
	class map[any]string
}

func (fs *failures) judge(root any, isRoot bool, bs []broken) *gopter.PropResult {
	if len(bs) == 0 {
		return &gopter.PropResult{Status: gopter.PropTrue}
	}
	labels := make([]string, len(bs))
	for i, b := range bs {
		labels[i] = b.name + ": " + b.msg
	}
	c := classesOf(bs)
	fs.mu.Lock()
	defer fs.mu.Unlock()
	if fs.class == nil {
		fs.class = map[any]string{}
	}
	if isRoot {
		fs.class[root] = c
	} else if want, ok := fs.class[root]; ok && want != c {
		return &gopter.PropResult{Status: gopter.PropTrue}
	}
	return &gopter.PropResult{Status: gopter.PropFalse, Labels: labels}
}

var (
	quotedText = regexp.MustCompile(`"(?:[^"\\]|\\.)*"`)
	digitRun   = regexp.MustCompile(`[0-9]+([.,][0-9]+)*`)
)

// classOf reduces a failure message to its kind: the first line with
// quoted text and numbers (with their decimal marks) blanked, so that the
// same failure on other data, or on simpler values, has the same class.
func classOf(msg string) string {
	first, _, _ := strings.Cut(msg, "\n")
	return digitRun.ReplaceAllString(quotedText.ReplaceAllString(first, `"…"`), "#")
}

// Prop returns a gopter property that the table function has all the
// invariants (NoPanic when none is given) on every sample gen draws. gen
// must draw *Sample values, as Tables does; failing samples shrink with
// gen's shrinker, keeping to candidates that break the same invariants in
// the same way. The result's labels give each broken invariant, "name:
// why". Use it inside your own gopter.Properties:
//
//	props := gopter.NewProperties(nil)
//	props.Property("cleanup", property.Prop(clean, property.Tables(schema, opts), property.Idempotent()))
//	props.TestingRun(t)
func Prop(fn Func, gen gopter.Gen, invs ...Invariant) gopter.Prop {
	fs := &failures{}
	return prop.ForAll(func(s *Sample) *gopter.PropResult {
		return fs.judge(s.origin(), s.root == nil, verdicts(tableTrial(fn, s), invs))
	}, gen)
}

// FileProp is Prop for a file function; gen must draw *File values, as
// Files does.
func FileProp(fn FileFunc, gen gopter.Gen, invs ...Invariant) gopter.Prop {
	fs := &failures{}
	return prop.ForAll(func(f *File) *gopter.PropResult {
		return fs.judge(f.origin(), f.root == nil, verdicts(fileTrial(fn, f), invs))
	}, gen)
}

// seedFor returns the seed of a check: PROOFSHEET_SEED, else opts.Seed,
// else the clock.
func seedFor(opts Options) (int64, string, error) {
	if v, ok := os.LookupEnv(SeedEnv); ok && strings.TrimSpace(v) != "" {
		n, err := strconv.ParseInt(strings.TrimSpace(v), 10, 64)
		if err != nil {
			return 0, "", fmt.Errorf("property: %s=%q is not a 64-bit integer", SeedEnv, v)
		}
		return n, "from " + SeedEnv, nil
	}
	if opts.Seed != 0 {
		return opts.Seed, "from Options.Seed", nil
	}
	return time.Now().UnixNano(), "from the clock", nil
}

// Check tests a table function against the invariants (NoPanic when none
// is given) on Options.Runs generated samples of the schema. A failing
// sample is shrunk while it breaks the same invariants in the same way,
// and reported once, listing every invariant it breaks: the seed, how to
// re-run with it, why each invariant failed and the shrunk raw table as
// code ready to paste into a regression test. The invariants that held on
// it are then checked on further samples, so a second counterexample
// shows only for invariants the first did not break. Check returns
// whether every invariant held.
func Check(t TB, schema fixtures.Schema, fn Func, opts Options, invs ...Invariant) bool {
	t.Helper()
	return check(t, schema, opts, invs, func(active []Invariant) gopter.Prop {
		return Prop(fn, Tables(schema, opts), active...)
	})
}

// CheckFiles is Check for a function that reads raw CSV bytes, as a loader
// followed by the chain does. Each sample is written in a random CSV style
// (delimiter, quoting, encoding, line ending), or in one of the given
// styles; shrinking also makes the style plainer.
func CheckFiles(t TB, schema fixtures.Schema, fn FileFunc, opts Options, invs []Invariant, styles ...CSVStyle) bool {
	t.Helper()
	return check(t, schema, opts, invs, func(active []Invariant) gopter.Prop {
		return FileProp(fn, Files(schema, opts, styles...), active...)
	})
}

func check(t TB, schema fixtures.Schema, opts Options, invs []Invariant, mk func([]Invariant) gopter.Prop) bool {
	t.Helper()
	c, err := opts.compile(schema)
	if err != nil {
		t.Errorf("%v", err)
		return false
	}
	seed, from, err := seedFor(opts)
	if err != nil {
		t.Errorf("%v", err)
		return false
	}
	if len(invs) == 0 {
		invs = []Invariant{NoPanic()}
	}
	active := invs
	ok := true
	for len(active) > 0 {
		params := gopter.DefaultTestParametersWithSeed(seed)
		params.MinSuccessfulTests = c.runs
		params.MinSize = c.minRows
		params.MaxSize = c.maxRows
		res := mk(active).Check(params)
		if res.Passed() {
			break
		}
		ok = false
		names := brokenNames(active, res)
		t.Errorf("%s", report(t.Name(), names, seed, from, res))
		if len(names) == 0 {
			break
		}
		active = slices.DeleteFunc(slices.Clone(active), func(inv Invariant) bool { return slices.Contains(names, inv.name) })
	}
	return ok
}

// brokenNames returns the names of the invariants a failed result's
// labels give, in the order of invs.
func brokenNames(invs []Invariant, res *gopter.TestResult) []string {
	var out []string
	for _, inv := range invs {
		for _, l := range res.Labels {
			if strings.HasPrefix(l, inv.name+": ") {
				out = append(out, inv.name)
				break
			}
		}
	}
	return out
}

// report writes a failed check for a person to act on: one counterexample
// and every invariant it breaks.
func report(test string, names []string, seed int64, from string, res *gopter.TestResult) string {
	var b strings.Builder
	switch len(names) {
	case 0:
		fmt.Fprintf(&b, "property: the check failed after %d passing samples\n", res.Succeeded)
	case 1:
		fmt.Fprintf(&b, "property: invariant %q failed after %d passing samples\n", names[0], res.Succeeded)
	default:
		q := make([]string, len(names))
		for i, n := range names {
			q[i] = strconv.Quote(n)
		}
		fmt.Fprintf(&b, "property: %d invariants failed on the same sample after %d passing samples: %s\n", len(names), res.Succeeded, strings.Join(q, ", "))
	}
	fmt.Fprintf(&b, "seed %d (%s); re-run with: %s=%d go test -run '%s'\n", seed, from, SeedEnv, seed, runPattern(test))
	switch res.Status {
	case gopter.TestError:
		fmt.Fprintf(&b, "error: %v\n", res.Error)
		return b.String()
	case gopter.TestExhausted:
		fmt.Fprintf(&b, "no usable sample after %d tries (%s)\n", res.Discarded, strings.Join(res.Labels, "; "))
		return b.String()
	}
	for _, l := range res.Labels {
		b.WriteString(strings.TrimRight(l, "\n"))
		b.WriteByte('\n')
	}
	if len(res.Args) == 0 {
		return b.String()
	}
	arg := res.Args[0]
	switch v := arg.Arg.(type) {
	case *Sample:
		orig, _ := arg.OrigArg.(*Sample)
		describeShrink(&b, orig, v, arg.Shrinks)
		b.WriteString(indentLines(PasteReady("raw", v.Raw()), "\t"))
	case *File:
		orig, _ := arg.OrigArg.(*File)
		var first *Sample
		if orig != nil {
			first = orig.Sample
			fmt.Fprintf(&b, "the file was %s\n", orig.Style)
		}
		describeShrink(&b, first, v.Sample, arg.Shrinks)
		fmt.Fprintf(&b, "\tdata := []byte(%s) // %s\n", describeBytes(v.Data, 4096), v.Style)
		b.WriteString("the raw table it holds:\n")
		b.WriteString(indentLines(PasteReady("raw", v.Sample.Raw()), "\t"))
	}
	return b.String()
}

func describeShrink(b *strings.Builder, orig, s *Sample, steps int) {
	if orig != nil {
		fmt.Fprintf(b, "sample seed %d: %s, ", orig.Seed, size(orig))
	}
	fmt.Fprintf(b, "shrunk in %d steps to %s; paste it into a test:\n", steps, size(s))
}

// size says "3 rows × 1 column".
func size(s *Sample) string {
	return plural(s.NumRows(), "row") + " × " + plural(s.NumCols(), "column")
}

func plural(n int, what string) string {
	if n == 1 {
		return "1 " + what
	}
	return strconv.Itoa(n) + " " + what + "s"
}

// runPattern returns a go test -run pattern matching exactly the test.
func runPattern(name string) string {
	parts := strings.Split(name, "/")
	for i, p := range parts {
		parts[i] = "^" + regexp.QuoteMeta(p) + "$"
	}
	return strings.Join(parts, "/")
}

// PasteReady writes a table as Go code that rebuilds it in a test:
//
//	raw := fixtures.MustParse(t, `
//		house:string | tmax:string
//		Étang        | "1,5"
//	`)
//
// The table is fixtures.LiteralWith a tab indent inside a raw string;
// fixtures.Parse reads the part between the backquotes back to the same
// table. name is the variable (default "raw").
func PasteReady(name string, t *fixtures.Table) string {
	if name == "" {
		name = "raw"
	}
	lit := t.LiteralWith(fixtures.LiteralStyle{Pad: true, Indent: "\t"})
	return name + " := fixtures.MustParse(t, `\n" + lit + "`)\n"
}

// indentLines puts by before every non-empty line of s.
func indentLines(s, by string) string {
	lines := strings.SplitAfter(s, "\n")
	var b strings.Builder
	for _, l := range lines {
		if l == "" {
			continue
		}
		b.WriteString(by)
		b.WriteString(l)
	}
	return b.String()
}
