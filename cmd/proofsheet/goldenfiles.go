package main

import (
	"encoding/json"
	"flag"
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"time"

	"github.com/proofsheet/proofsheet/assert"
	"github.com/proofsheet/proofsheet/fixtures"
	"github.com/proofsheet/proofsheet/golden"
)

// defaultStore is where golden keeps golden files unless --store says
// otherwise.
const defaultStore = "testdata/golden"

func goldenCommand() *command {
	c := &command{
		name:    "golden",
		summary: "check any program's output files against golden files; --update writes them",
		usage: `Usage: proofsheet golden [options] FILE...

Checks each output FILE of a program against its golden file in the store
(default ` + defaultStore + `/), named from the output's base name in the
formats Go tests write with golden.Table, Text and JSON, so one store
serves both and proofsheet changes summarises it:

  a table (any format diff reads:     NAME.gold.tbl   compared as a table,
  CSV, TSV, JSON Lines, a JSON array                  under the file's rules
  of objects, Arrow, Parquet)
  other .json                         NAME.gold.json  compared by structure
  anything else (.txt, .md, …)        NAME.gold.txt   compared byte for byte

A golden table file stores the rules it was written with — keys,
tolerances, ignored columns, row matching — so checking needs no flags.
Rules given here go on top of the stored ones, rule by rule (a --tol
replaces the stored tolerance of its column); when that changes the
rules, the new rules are used and reported, and --update stores them.

With --update, missing and differing golden files are written from the
outputs, atomically; a file equal under its rules is left untouched, so
float noise within a tolerance makes no churn. --update is refused when
CI is set to a true value, unless ` + golden.EnvUpdateInCI + `=1 is set too: a
golden file rewritten in CI is a change nobody reviewed.

Options:
  --update           write missing and differing golden files
  --store DIR        the golden directory (default ` + defaultStore + `)
  --key COLS         match table rows by these comma-separated key columns
  --any-row-order    match table rows in any order, with no key
` + tolHelp + `
  --ignore COLS      leave these comma-separated table columns out
  --loose-types      compare values across types: 3 equals 3.0
  --format F         text (default), markdown or json
  --max-cells N      list at most N differing cells per table (default 20)
  --junit FILE       also write a JUnit XML report to FILE: one test case
                     per output, failed with its diff
  --quiet            draw no progress bar

When ` + stepSummaryVar + ` names a file (CI job summaries), the Markdown
report is appended to it. The JSON has a "schema_version" field.

` + readerHelp + `
  (Reader options apply to the table outputs; - is not an output.)

Example:
  proofsheet golden --update --key house,day --tol '*=abs:1e-9' \
      out/daily.csv out/summary.json out/notes.txt
  proofsheet golden out/daily.csv out/summary.json out/notes.txt   # in CI

Exit status: 0 when every output equals its golden file (after --update:
when every file is written or equal), 1 when some output differs, 2 on
trouble: a golden file that does not exist (the message gives the command
that creates it), an output that cannot be read, a refused update, a bad
option.
`,
	}
	c.run = func(e *env, args []string) int { return runGolden(e, c, args) }
	return c
}

// goldenFormats are the --format values of golden.
var goldenFormats = map[string]bool{"text": true, "markdown": true, "json": true}

// goldenItem is one output file and what checking it found.
type goldenItem struct {
	file string // the output, as given
	kind golden.FileKind
	name string // the golden name
	out  *golden.Outcome
	err  error // the output could not be read
	took time.Duration
}

func runGolden(e *env, c *command, args []string) int {
	fs := newFlags(c)
	update := fs.Bool("update", false, "")
	store := fs.String("store", defaultStore, "")
	cf := addCompareFlags(fs)
	rf := addReaderFlags(fs)
	format := fs.String("format", "text", "")
	maxCells := fs.Int("max-cells", assert.DefaultListLimit, "")
	junit := fs.String("junit", "", "")
	quiet := fs.Bool("quiet", false, "")
	files, status, ok := parseFlags(e, c, fs, args)
	if !ok {
		return status
	}
	start := time.Now()
	if len(files) == 0 {
		return trouble(e, c, "no output file given\n\n%s", c.usage)
	}
	if !goldenFormats[*format] {
		return trouble(e, c, "--format %q: unknown format (want text, markdown or json)", *format)
	}
	if *store == "" {
		return trouble(e, c, "--store: no directory given")
	}
	if err := checkJUnit(*junit); err != nil {
		return trouble(e, c, "%v", err)
	}
	opts, err := cf.options()
	if err != nil {
		return trouble(e, c, "%v", err)
	}
	opts = append(opts, assert.ListLimit(*maxCells))
	if *update {
		if err := golden.UpdateRefusedIn(e.getenv, "--update"); err != nil {
			return trouble(e, c, "not updated: %v", err)
		}
	}
	readOpts, err := rf.options()
	if err != nil {
		return trouble(e, c, "%v", err)
	}
	for _, f := range files {
		if f == "-" {
			return trouble(e, c, "- (standard input) has no name to name a golden file by; give the output's file")
		}
	}

	// Name each output's golden file; two outputs may not share one.
	st := golden.Store{Root: *store}
	items := make([]*goldenItem, len(files))
	byPath := map[string]string{}
	for i, f := range files {
		it := &goldenItem{file: f, name: goldenName(f)}
		items[i] = it
		if fi, err := os.Stat(f); err != nil {
			it.err = fmt.Errorf("cannot read the output: %w", err)
			continue
		} else if fi.IsDir() {
			it.err = fmt.Errorf("%s is a directory, not an output file", f)
			continue
		}
		it.kind = kindOfOutput(f)
		p, err := st.Path(it.name, it.kind)
		if err != nil {
			it.err = err
			continue
		}
		if prev, dup := byPath[p]; dup {
			return trouble(e, c, "%s and %s would share the golden file %s; give outputs distinct base names", prev, f, displayPath(p))
		}
		byPath[p] = f
	}

	bar := newProgress(e, *quiet)
	for _, it := range items {
		if it.err != nil {
			continue
		}
		t0 := time.Now()
		it.out, it.kind, it.err = checkOutput(st, it, bar, readOpts, opts)
		it.took = time.Since(t0)
	}
	bar.finish()

	if *update {
		for _, it := range items {
			if it.err != nil || it.out == nil || !it.out.NeedsWrite() {
				continue
			}
			if err := it.out.Update(); err != nil {
				it.err = err
			}
		}
	}

	report := goldenReport(items, *update, *format)
	if _, err := e.stdout.Write([]byte(report)); err != nil {
		return trouble(e, c, "%v", err)
	}
	code := exitSame
	for _, it := range items {
		switch {
		case it.err != nil, it.out.Status == golden.StatusInvalid, it.out.Status == golden.StatusMissing:
			code = exitTrouble
		case it.out.Status == golden.StatusChanged && code == exitSame:
			code = exitDiffers
		}
	}
	// Trouble goes to stderr too, with what to do about it.
	var missing []string
	for _, it := range items {
		switch {
		case it.err != nil:
			fmt.Fprintf(e.stderr, "proofsheet golden: %s: %v\n", it.file, it.err)
		case it.out.Status == golden.StatusInvalid:
			fmt.Fprintf(e.stderr, "proofsheet golden: %s: %v\n", it.file, it.out.Err)
		case it.out.Status == golden.StatusMissing:
			fmt.Fprintf(e.stderr, "proofsheet golden: %s does not exist (the golden file of %s).\n", displayPath(it.out.Path), it.file)
			missing = append(missing, it.file)
		}
	}
	if len(missing) == 1 {
		fmt.Fprintf(e.stderr, "Create it from the output, and review it before you commit it:\n\t%s\n", updateCommandLine(fs, missing))
	} else if len(missing) > 1 {
		fmt.Fprintf(e.stderr, "Create them from the outputs, and review them before you commit them:\n\t%s\n", updateCommandLine(fs, missing))
	}
	if err := goldenJUnit(items, *update, time.Since(start)).write(*junit); err != nil {
		return trouble(e, c, "%v", err)
	}
	if err := stepSummary(e, goldenMarkdown(items, *update)); err != nil {
		return trouble(e, c, "%v", err)
	}
	return code
}

// checkOutput reads one output and compares it with its golden file. A
// .json output that is not a table is checked as JSON.
func checkOutput(st golden.Store, it *goldenItem, bar *progress, readOpts []fixtures.ReadOption, opts []assert.Option) (*golden.Outcome, golden.FileKind, error) {
	switch it.kind {
	case golden.KindTable:
		tb, err := readTable(bar, it.file, readOpts...)
		if err != nil {
			if strings.EqualFold(filepath.Ext(it.file), ".json") {
				data, rerr := os.ReadFile(it.file)
				if rerr != nil {
					return nil, it.kind, rerr
				}
				o := st.CheckJSON(it.name, data)
				if o.Status != golden.StatusInvalid || o.Path == "" {
					return o, golden.KindJSON, nil
				}
			}
			return nil, it.kind, err
		}
		return st.CheckTable(it.name, tb, opts...), it.kind, nil
	case golden.KindJSON:
		data, err := os.ReadFile(it.file)
		if err != nil {
			return nil, it.kind, err
		}
		return st.CheckJSON(it.name, data), it.kind, nil
	}
	data, err := os.ReadFile(it.file)
	if err != nil {
		return nil, it.kind, err
	}
	return st.CheckText(it.name, string(data)), it.kind, nil
}

// compressionExts are the extensions of compressed files, which name the
// format of what they hold by the extension before them.
var compressionExts = []string{".gz", ".zst", ".bz2", ".xz", ".lz4", ".br"}

// goldenName is the golden name of an output: its base name without its
// extension (and a compression extension before that).
func goldenName(file string) string {
	base := filepath.Base(file)
	for _, ext := range compressionExts {
		if strings.HasSuffix(strings.ToLower(base), ext) && len(base) > len(ext) {
			base = base[:len(base)-len(ext)]
			break
		}
	}
	if ext := filepath.Ext(base); ext != "" && len(ext) < len(base) {
		base = base[:len(base)-len(ext)]
	}
	return base
}

// kindOfOutput decides how an output is checked from its name: a table
// when fixtures reads its extension (but .txt is text), else text; .json
// is tried as a table first (see checkOutput).
func kindOfOutput(file string) golden.FileKind {
	name := strings.ToLower(file)
	for _, ext := range compressionExts {
		name = strings.TrimSuffix(name, ext)
	}
	if strings.HasSuffix(name, ".txt") {
		return golden.KindText
	}
	if _, err := fixtures.FormatFor(file); err == nil {
		return golden.KindTable
	}
	return golden.KindText
}

// displayPath writes a path relative to the working directory when it is
// below it.
func displayPath(p string) string {
	wd, err := os.Getwd()
	if err != nil {
		return p
	}
	if rel, err := filepath.Rel(wd, p); err == nil && !strings.HasPrefix(rel, "..") && !filepath.IsAbs(rel) {
		return rel
	}
	return p
}

// updateCommandLine is the golden command that writes the golden files of
// the given outputs with the same store, rules and reader options as this
// run.
func updateCommandLine(fs *flag.FlagSet, files []string) string {
	parts := []string{"proofsheet", "golden", "--update"}
	fs.Visit(func(f *flag.Flag) {
		switch f.Name {
		case "update", "format", "junit", "quiet", "max-cells":
			return
		}
		parts = append(parts, flagWords(f)...)
	})
	for _, f := range files {
		parts = append(parts, shellQuote(f))
	}
	return strings.Join(parts, " ")
}

// flagWords are the command-line words, shell-quoted, that give a flag
// the value it has: --name VALUE, --name for a true switch, one --name
// VALUE per value of a repeatable flag.
func flagWords(f *flag.Flag) []string {
	var out []string
	switch v := f.Value.(type) {
	case *tolFlags:
		for _, s := range *v {
			out = append(out, "--"+f.Name, shellQuote(s))
		}
		return out
	case *listFlag:
		for _, s := range *v {
			out = append(out, "--"+f.Name, shellQuote(s))
		}
		return out
	case *strictFlag:
		if !v.set {
			return nil
		}
		if len(v.kinds) == 0 {
			return []string{"--" + f.Name}
		}
		var kinds []string
		for _, k := range v.kinds {
			kinds = append(kinds, string(k))
		}
		return []string{"--" + f.Name + "=" + shellQuote(strings.Join(kinds, ","))}
	}
	if bf, ok := f.Value.(interface{ IsBoolFlag() bool }); ok && bf.IsBoolFlag() {
		if f.Value.String() == "true" {
			return []string{"--" + f.Name}
		}
		return []string{"--" + f.Name + "=false"}
	}
	return []string{"--" + f.Name, shellQuote(f.Value.String())}
}

// shellQuote quotes s for a POSIX shell when it needs it.
func shellQuote(s string) string {
	if s != "" && strings.Trim(s, "abcdefghijklmnopqrstuvwxyzABCDEFGHIJKLMNOPQRSTUVWXYZ0123456789_./,:=@%+-") == "" {
		return s
	}
	return "'" + strings.ReplaceAll(s, "'", `'\''`) + "'"
}

// statusWord is an item's status as the report shows it.
func (it *goldenItem) statusWord(update bool) string {
	if it.err != nil {
		return "trouble"
	}
	switch it.out.Status {
	case golden.StatusEqual:
		if update {
			return "unchanged"
		}
		return "equal"
	case golden.StatusChanged:
		return "differs"
	case golden.StatusMissing:
		return "missing"
	case golden.StatusNew:
		return "created"
	case golden.StatusUpdated:
		return "rewrote"
	}
	return "trouble"
}

func (it *goldenItem) goldenPath() string {
	if it.out == nil || it.out.Path == "" {
		return "—"
	}
	return displayPath(it.out.Path)
}

func (it *goldenItem) problem() string {
	if it.err != nil {
		return it.err.Error()
	}
	if it.out != nil && it.out.Err != nil {
		return it.out.Err.Error()
	}
	return ""
}

// goldenHeadline sums a run up: "3 outputs: 1 differs, 2 equal".
func goldenHeadline(items []*goldenItem, update bool) string {
	counts := map[string]int{}
	for _, it := range items {
		counts[it.statusWord(update)]++
	}
	var parts []string
	for _, w := range []string{"differs", "missing", "trouble", "created", "rewrote", "unchanged", "equal"} {
		if n := counts[w]; n > 0 {
			parts = append(parts, fmt.Sprintf("%d %s", n, w))
		}
	}
	return fmt.Sprintf("%s: %s", pluralWord(len(items), "output", "outputs"), strings.Join(parts, ", "))
}

// detail is the readable difference of a changed output: for a table,
// the Diff's text with its fixes named as this command's flags.
func (it *goldenItem) detail() string {
	if it.out.Diff != nil {
		return it.out.Diff.TextWith(assert.TextStyle{Flags: true})
	}
	return it.out.Detail
}

func pluralWord(n int, one, many string) string {
	if n == 1 {
		return "1 " + one
	}
	return fmt.Sprintf("%d %s", n, many)
}

// goldenReport writes the report in the asked format.
func goldenReport(items []*goldenItem, update bool, format string) string {
	switch format {
	case "markdown":
		return goldenMarkdown(items, update)
	case "json":
		b, err := goldenJSON(items, update)
		if err != nil {
			return fmt.Sprintf("{\"error\": %q}\n", err.Error())
		}
		return string(b)
	}
	var b strings.Builder
	b.WriteString(goldenHeadline(items, update) + "\n")
	w1, w2 := 0, 0
	for _, it := range items {
		w1, w2 = max(w1, len(it.statusWord(update))), max(w2, len(it.file))
	}
	for _, it := range items {
		fmt.Fprintf(&b, "  %-*s  %-*s  %s\n", w1, it.statusWord(update), w2, it.file, it.goldenPath())
	}
	for _, it := range items {
		if it.out != nil && it.out.Note != "" {
			fmt.Fprintf(&b, "\nnote: %s: %s\n", it.file, it.out.Note)
		}
		if it.out != nil && it.out.Status == golden.StatusChanged {
			fmt.Fprintf(&b, "\n== %s differs from %s (want):\n%s\n", it.file, it.goldenPath(), strings.TrimRight(it.detail(), "\n"))
		}
	}
	return b.String()
}

// goldenJSON writes the report as JSON.
func goldenJSON(items []*goldenItem, update bool) ([]byte, error) {
	type jFile struct {
		File    string   `json:"file"`
		Golden  string   `json:"golden"`
		Kind    string   `json:"kind"`
		Status  string   `json:"status"`
		Rules   []string `json:"rules"`
		Note    string   `json:"note,omitempty"`
		Problem string   `json:"problem,omitempty"`
		Detail  string   `json:"detail,omitempty"`
		Diff    any      `json:"diff"`
	}
	out := struct {
		Headline string  `json:"headline"`
		Update   bool    `json:"update"`
		Files    []jFile `json:"files"`
	}{Headline: goldenHeadline(items, update), Update: update, Files: []jFile{}}
	for _, it := range items {
		jf := jFile{File: it.file, Golden: it.goldenPath(), Kind: string(it.kind), Status: it.statusWord(update), Rules: []string{}, Problem: it.problem()}
		if it.out != nil {
			jf.Note, jf.Detail = it.out.Note, it.out.Detail
			if it.kind == golden.KindTable {
				jf.Rules = it.out.Rules.Parts()
			}
			if it.out.Diff != nil && it.out.Status == golden.StatusChanged {
				js, err := it.out.Diff.JSON()
				if err != nil {
					return nil, err
				}
				jf.Diff = json.RawMessage(js)
			}
		}
		out.Files = append(out.Files, jf)
	}
	return marshalVersioned(out)
}

// goldenMarkdown writes the report as Markdown, for a CI job summary.
func goldenMarkdown(items []*goldenItem, update bool) string {
	var b strings.Builder
	fmt.Fprintf(&b, "## proofsheet golden\n\n**%s**\n\n| output | status | golden file |\n|---|---|---|\n", capital(goldenHeadline(items, update)))
	for _, it := range items {
		st := it.statusWord(update)
		if st != "equal" && st != "unchanged" {
			st = "**" + st + "**"
		}
		fmt.Fprintf(&b, "| %s | %s | %s |\n", mdCodeSpan(it.file), st, mdCodeSpan(it.goldenPath()))
	}
	for _, it := range items {
		switch {
		case it.problem() != "":
			fmt.Fprintf(&b, "\n### %s\n\n%s\n", mdCodeSpan(it.file), mdFenced(it.problem()))
		case it.out.Status == golden.StatusChanged && it.out.Diff != nil:
			fmt.Fprintf(&b, "\n### %s\n\n%s", mdCodeSpan(it.file), it.out.Diff.Markdown())
		case it.out.Status == golden.StatusChanged:
			fmt.Fprintf(&b, "\n### %s\n\n%s\n", mdCodeSpan(it.file), mdFenced(it.out.Detail))
		}
	}
	return b.String()
}

// goldenJUnit is the JUnit report of a run: one case per output.
func goldenJUnit(items []*goldenItem, update bool, took time.Duration) *junitSuite {
	s := &junitSuite{name: "proofsheet golden", took: took}
	for _, it := range items {
		tc := junitCase{name: it.file, class: "proofsheet.golden." + string(it.kind), took: it.took}
		switch {
		case it.problem() != "":
			tc.errMsg = it.problem()
		case it.out.Status == golden.StatusMissing:
			tc.errMsg = it.goldenPath() + " does not exist"
		case it.out.Status == golden.StatusChanged:
			tc.failure = it.file + " differs from " + it.goldenPath()
			tc.detail = it.detail()
		}
		s.cases = append(s.cases, tc)
	}
	return s
}

// mdFenced writes text as a fenced code block.
func mdFenced(text string) string {
	fence := "```"
	for strings.Contains(text, fence) {
		fence += "`"
	}
	return fence + "text\n" + strings.TrimRight(text, "\n") + "\n" + fence + "\n"
}

func capital(s string) string {
	if s == "" {
		return s
	}
	return strings.ToUpper(s[:1]) + s[1:]
}
