package main

import (
	"context"
	"fmt"
	"slices"
	"strings"

	"github.com/proofsheet/proofsheet/assert"
	"github.com/proofsheet/proofsheet/fixtures"
	"github.com/proofsheet/proofsheet/property"
)

// The checks of hammer. The first seven names are fixed; repeatable and
// balance are ours.
const checkHelp = `  runs               the program exits 0 and writes a readable table
  order-free         the input's rows shuffled (and, in a folder, the
                     files' contents swapped between names) give an equal
                     output: by --key, else as a multiset
  same-on-plain      the same values in plain spellings give an equal
                     output
  no-nulls=COLS      the output's COLS have no null
  unique=COLS        no two output rows have the same COLS
  idempotent         the output fed back in as the input gives the same
                     output (for chains whose output reads like their input)
  agrees=CMD         a second program (a slow reference, say), run the same
                     way, gives an equal output
  repeatable         running the program twice on the same input gives
                     equal outputs
  balance=RELATION   a relation between counts and sums of the input and
                     the output holds, e.g.
                       balance=sum(kept) + sum(dropped) = in.rows(house, logged_at)
                     terms: in.rows, in.rows(COLS) (rows whose COLS are not
                     null), in.records (re-uploads counted once), in.files,
                     out.rows, sum(COL), count(COL), whole numbers; joined
                     by + and -; relations = != < <= > >=`

// hammerCheck is one --check.
type hammerCheck struct {
	spec string // as given, e.g. "no-nulls=house,day"
	name string
	cols []string // no-nulls, unique
	ref  string   // agrees
	bal  *balance // balance
}

// parseCheck reads one --check NAME[=ARG].
func parseCheck(spec string) (*hammerCheck, error) {
	name, arg, hasArg := strings.Cut(strings.TrimSpace(spec), "=")
	name = strings.TrimSpace(name)
	c := &hammerCheck{spec: strings.TrimSpace(spec), name: name}
	bad := func(format string, args ...any) (*hammerCheck, error) {
		return nil, fmt.Errorf("--check %q: %s", spec, fmt.Sprintf(format, args...))
	}
	switch name {
	case "runs", "order-free", "same-on-plain", "idempotent", "repeatable":
		if hasArg {
			return bad("%s takes no argument", name)
		}
	case "no-nulls", "unique":
		c.cols = splitList(arg)
		if len(c.cols) == 0 {
			return bad("%s needs columns: %s=COL[,COL…]", name, name)
		}
	case "agrees":
		c.ref = strings.TrimSpace(arg)
		if c.ref == "" {
			return bad("agrees needs a command: agrees='python3 reference.py {in} {out}'")
		}
	case "balance":
		b, err := parseBalance(arg)
		if err != nil {
			return bad("%v", err)
		}
		c.bal = b
	default:
		return bad("unknown check %q (want runs, order-free, same-on-plain, no-nulls=COLS, unique=COLS, idempotent, agrees=CMD, repeatable or balance=RELATION)", name)
	}
	return c, nil
}

// verdict is what one check found on one sample.
type verdict struct {
	check *hammerCheck
	held  bool
	class string // how it failed, without the details that change with the input
	line  string // how it failed, one line
	// detail says more: the output diff, the rows with nulls, the sums.
	detail string
	diff   *assert.Diff
	// base is the run on the sample; other the second run the check made,
	// on variant (named variantName) or by the reference.
	base, other *runResult
	variant     *input
	variantName string
	// trouble is a failure of hammer's, not the program's: a reference
	// that fails, an input that cannot be written.
	trouble error
}

// judge holds what every check needs.
type judge struct {
	rn      *runner
	program string
	opts    []assert.Option // --key, --tol, --ignore, … and the listing limit
	keyed   bool            // opts match rows by key or in any order
}

// judgeSample runs the program on the sample and checks each check; base
// may be a run already made on the sample.
func (j *judge) judgeSample(ctx context.Context, s *sample, checks []*hammerCheck) []*verdict {
	base := j.rn.run(ctx, j.program, s.input())
	out := make([]*verdict, len(checks))
	for i, c := range checks {
		out[i] = j.judge(ctx, s, c, base)
	}
	return out
}

// judge checks one check on a sample, given the run on it.
func (j *judge) judge(ctx context.Context, s *sample, c *hammerCheck, base *runResult) *verdict {
	v := &verdict{check: c, base: base, held: true}
	if !base.ok() {
		class, line := base.failure()
		v.held, v.class, v.line = false, class, "the program "+line
		if c.name != "runs" {
			v.class = "the program: " + class
			v.line = "the program " + line + ", so " + c.name + " cannot hold"
		}
		return v
	}
	switch c.name {
	case "runs":
	case "order-free", "same-on-plain", "idempotent", "repeatable":
		var in input
		var err error
		var want, got string
		switch c.name {
		case "order-free":
			in, err = s.shuffled()
			v.variantName, want, got = "shuffled", "input order", "shuffled"
		case "same-on-plain":
			in, err = s.plain()
			v.variantName, want, got = "plain", "plain", "messy"
		case "idempotent":
			in = input{files: []inputFile{{name: "input" + j.rn.outExt, data: base.outBytes}}, folder: s.folder}
			v.variantName, want, got = "fed-back", "first output", "fed back"
		case "repeatable":
			in = s.input()
			v.variantName, want, got = "", "first run", "second run"
		}
		if err != nil {
			v.trouble = fmt.Errorf("writing the %s input: %w", v.variantName, err)
			return v
		}
		if v.variantName != "" {
			v.variant = &in
		}
		v.other = j.rn.run(ctx, j.program, in)
		if !v.other.ok() {
			class, line := v.other.failure()
			what := map[string]string{"order-free": "on the shuffled input", "same-on-plain": "on the plain input",
				"idempotent": "on its own output", "repeatable": "when run again"}[c.name]
			v.held, v.class, v.line = false, what+": "+class, "the program "+line+" "+what
			return v
		}
		opts := j.opts
		if c.name == "order-free" && !j.keyed {
			opts = append(slices.Clone(opts), assert.AnyRowOrder())
		}
		// want is the output on the plainer or earlier input.
		w, g := base.table, v.other.table
		if c.name == "same-on-plain" {
			w, g = v.other.table, base.table
		}
		w, g = typeNullColumns(w, g), typeNullColumns(g, w)
		d := assert.Compare(w, g, opts...)
		if !d.Equal() {
			d.WantName, d.GotName = want, got
			v.held, v.class, v.diff = false, "outputs differ", d
			v.line = map[string]string{
				"order-free":    "the output changes when the input's rows are shuffled",
				"same-on-plain": "the output on the messy spellings differs from the output on the plain ones",
				"idempotent":    "the output fed back in gives another output",
				"repeatable":    "a second run on the same input gives another output",
			}[c.name]
			v.detail = d.TextWith(assert.TextStyle{Flags: true})
		}
	case "agrees":
		ref := j.rn.run(ctx, c.ref, s.input())
		v.other, v.variantName = ref, ""
		if !ref.ok() {
			_, line := ref.failure()
			v.trouble = fmt.Errorf("the reference %s on sample %d: %s", shellQuote(c.ref), s.index+1, line)
			return v
		}
		d := assert.Compare(typeNullColumns(ref.table, base.table), typeNullColumns(base.table, ref.table), j.opts...)
		if !d.Equal() {
			d.WantName, d.GotName = "reference", "program"
			v.held, v.class, v.diff = false, "outputs differ", d
			v.line = "the program's output differs from the reference's"
			v.detail = d.TextWith(assert.TextStyle{Flags: true})
		}
	case "no-nulls":
		for _, col := range c.cols {
			cc := base.table.Column(col)
			if cc == nil {
				v.held, v.class = false, "no column "+col
				v.line = fmt.Sprintf("the output has no column %q (it has %s)%s", col, strings.Join(base.table.Names(), ", "), didYouMean(col, base.table.Names()))
				return v
			}
			if n := cc.NullCount(); n > 0 {
				v.held, v.class = false, "nulls in "+col
				v.line = fmt.Sprintf("column %q of the output has %s", col, pluralWord(n, "null", "nulls"))
				v.detail = rowsWhere(base.table, func(i int) bool { return cc.IsNull(i) })
				return v
			}
		}
	case "unique":
		for _, col := range c.cols {
			if base.table.Column(col) == nil {
				v.held, v.class = false, "no column "+col
				v.line = fmt.Sprintf("the output has no column %q (it has %s)%s", col, strings.Join(base.table.Names(), ", "), didYouMean(col, base.table.Names()))
				return v
			}
		}
		seen := map[string]int{}
		for i := 0; i < base.table.NumRows(); i++ {
			k := keyOf(base.table, c.cols, i)
			if first, dup := seen[k]; dup {
				v.held, v.class = false, "repeated "+strings.Join(c.cols, ",")
				v.line = fmt.Sprintf("output rows %d and %d have the same %s", first+1, i+1, strings.Join(c.cols, ", "))
				v.detail = rowsWhere(base.table, func(r int) bool { return keyOf(base.table, c.cols, r) == k })
				return v
			}
			seen[k] = i
		}
	case "balance":
		msg, err := c.bal.check(s.facts(base.table))
		switch {
		case err != nil:
			v.held, v.class, v.line = false, "cannot be evaluated", "the relation cannot be evaluated: "+err.Error()
		case msg != "":
			v.held, v.class, v.line = false, "does not hold", msg
		}
	}
	return v
}

// typeNullColumns gives each column of t that holds only nulls, and so was
// read as text for want of values to infer a kind from, the type of the
// same column of other, so that two outputs differ only where their values
// do. It returns t itself when no column needs it.
func typeNullColumns(t, other *fixtures.Table) *fixtures.Table {
	schema := t.Schema()
	changed := false
	for j, f := range schema {
		oc := other.Column(f.Name)
		if oc == nil || f.Type.Kind() != fixtures.KindString || oc.Kind() == fixtures.KindString || t.ColumnAt(j).NullCount() != t.NumRows() {
			continue
		}
		schema[j] = fixtures.Col(f.Name, oc.Type())
		changed = true
	}
	if !changed {
		return t
	}
	b := fixtures.NewBuilder(schema)
	for i := 0; i < t.NumRows(); i++ {
		row := t.Row(i)
		for j, f := range schema {
			if f.Type != t.ColumnAt(j).Type() {
				row[j] = nil
			}
		}
		b.Row(row...)
	}
	out, err := b.Build()
	if err != nil {
		return t
	}
	return out
}

// keyOf is the text of a row's cells in cols, for finding repeats.
func keyOf(t *fixtures.Table, cols []string, i int) string {
	var b strings.Builder
	for _, c := range cols {
		b.WriteString(fixtures.LiteralCell(t.Column(c), i))
		b.WriteByte(0)
	}
	return b.String()
}

// rowsWhere writes the first rows of t that match as a literal table.
func rowsWhere(t *fixtures.Table, match func(i int) bool) string {
	var idx []int
	for i := 0; i < t.NumRows() && len(idx) < 10; i++ {
		if match(i) {
			idx = append(idx, i)
		}
	}
	sub, err := t.Take(idx)
	if err != nil {
		return ""
	}
	return sub.LiteralWith(fixtures.LiteralStyle{Pad: true})
}

// sample is one generated input: one file, or a folder of files.
type sample struct {
	index  int   // 0-based
	seed   int64 // the seed it was made from
	files  []*property.File
	names  []string
	folder bool
}

// input is the sample's bytes as generated.
func (s *sample) input() input {
	in := input{folder: s.folder}
	for k, f := range s.files {
		in.files = append(in.files, inputFile{name: s.names[k], data: f.Data})
	}
	return in
}

// plain is the sample with every cell and header in its plain spelling,
// in the same CSV style.
func (s *sample) plain() (input, error) {
	in := input{folder: s.folder}
	for k, f := range s.files {
		data, err := f.Sample.Simplified().CSV(f.Style)
		if err != nil {
			return in, err
		}
		in.files = append(in.files, inputFile{name: s.names[k], data: data})
	}
	return in, nil
}

// shuffled is the sample with each file's rows in another order, and in
// a folder of several files the contents moved to other names.
func (s *sample) shuffled() (input, error) {
	in := input{folder: s.folder}
	for k, f := range s.files {
		data, err := f.Sample.Shuffled(mix(s.seed, 7001+int64(k))).CSV(f.Style)
		if err != nil {
			return in, err
		}
		in.files = append(in.files, inputFile{name: s.names[k], data: data})
	}
	if n := len(in.files); n > 1 {
		// Rotate the contents by one name, so a chain that depends on the
		// order it reads files in sees another order.
		first := in.files[0].data
		for k := 0; k < n-1; k++ {
			in.files[k].data = in.files[k+1].data
		}
		in.files[n-1].data = first
	}
	return in, nil
}

// rows counts the sample's data rows; cols its widest file's columns.
func (s *sample) rows() int {
	n := 0
	for _, f := range s.files {
		n += f.Sample.NumRows()
	}
	return n
}

func (s *sample) cols() int {
	n := 0
	for _, f := range s.files {
		n = max(n, f.Sample.NumCols())
	}
	return n
}

// size describes the sample: "12 rows × 3 columns", "3 files, 40 rows".
func (s *sample) size() string {
	if len(s.files) == 1 {
		return pluralWord(s.rows(), "row", "rows") + " × " + pluralWord(s.cols(), "column", "columns")
	}
	return fmt.Sprintf("%s, %s", pluralWord(len(s.files), "file", "files"), pluralWord(s.rows(), "row", "rows"))
}

// facts are the input counts a balance reads.
func (s *sample) facts(out *fixtures.Table) balanceFacts {
	f := balanceFacts{inFiles: len(s.files), out: out}
	for _, file := range s.files {
		f.inRows += file.Sample.NumRows()
		f.inRecords += file.Sample.Clean().NumRows()
	}
	f.inRowsOf = func(cols []string) (int, error) {
		n := 0
		for _, file := range s.files {
			for _, c := range cols {
				if file.Sample.Schema.Index(c) < 0 {
					return 0, fmt.Errorf("in.rows: no column %q in the schema%s", c, didYouMean(c, file.Sample.Schema.Names()))
				}
			}
			plain := file.Sample.Plain()
		rows:
			for i := 0; i < plain.NumRows(); i++ {
				for _, c := range cols {
					col := plain.Column(c)
					if col == nil || col.IsNull(i) {
						continue rows
					}
				}
				n++
			}
		}
		return n, nil
	}
	return f
}

// with returns the sample with file k replaced.
func (s *sample) with(k int, f *property.File) *sample {
	c := *s
	c.files = slices.Clone(s.files)
	c.files[k] = f
	return &c
}

// without returns the sample without file k.
func (s *sample) without(k int) *sample {
	c := *s
	c.files = slices.Delete(slices.Clone(s.files), k, k+1)
	c.names = slices.Delete(slices.Clone(s.names), k, k+1)
	return &c
}

// mix derives a seed from a seed and a number (SplitMix64's finaliser,
// after Steele, Lea and Flood, "Fast splittable pseudorandom number
// generators", OOPSLA 2014).
func mix(seed, n int64) int64 {
	z := uint64(seed) + uint64(n+1)*0x9E3779B97F4A7C15
	z = (z ^ (z >> 30)) * 0xBF58476D1CE4E5B9
	z = (z ^ (z >> 27)) * 0x94D049BB133111EB
	return int64(z ^ (z >> 31))
}
