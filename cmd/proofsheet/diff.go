package main

import (
	"fmt"
	"io"
	"runtime/debug"
	"slices"
	"strconv"
	"strings"
	"time"

	"github.com/proofsheet/proofsheet/assert"
	"github.com/proofsheet/proofsheet/fixtures"
	"github.com/proofsheet/proofsheet/golden"
	"github.com/proofsheet/proofsheet/internal/suggest"
)

// didYouMean returns ": did you mean "X"?" when a name among names is
// close to typed, else "".
func didYouMean(typed string, names []string) string {
	if best, ok := suggest.Closest(typed, names); ok {
		return fmt.Sprintf(": did you mean %q?", best)
	}
	return ""
}

func diffCommand() *command {
	c := &command{
		name:    "diff",
		summary: "compare two table files cell by cell, with keys and tolerances",
		usage: `Usage: proofsheet diff [options] WANT GOT

Loads two tables — CSV/TSV, JSON Lines, JSON array, Arrow IPC, Parquet
or .xlsx files, each by its extension (the two may differ in format),
compressed or not, standard input (-), or folders of such files — and
compares GOT with WANT as assert.Compare does: schema, rows, then cells
under per-column rules. Prints what differs: schema changes, differing
cells with their distances, missing and extra rows, repeated keys and
the largest deltas per column.

Options:
  --key COLS         match rows by these comma-separated key columns
  --any-row-order    match rows in any order, with no key
` + tolHelp + `
  --ignore COLS      leave these comma-separated columns out
  --loose-types      compare values across types: 3 equals 3.0, a category
                     equals its text, a date a midnight timestamp
  --format F         text (default), markdown, json (the Diff's JSON) or
                     html (one self-contained page)
  --out FILE         write the report to FILE instead of stdout; FILE is
                     written only when the comparison could be made
  --max-cells N      list at most N differing cells, missing and extra
                     rows (default 20; -1 lists all); counts stay exact
  --junit FILE       also write a JUnit XML report to FILE: one test case,
                     failed with the text diff when the tables differ
  --quiet            draw no progress bar
  --by-file          WANT and GOT are folders: compare their table files
                     pair by pair (by path below each folder), list each
                     file's outcome, the diffs, and a summary line
` + engineHelp + `

When ` + stepSummaryVar + ` names a file (CI job summaries), the Markdown
report is appended to it. The JSON has a "schema_version" field.

` + readerHelp + `

Text goes to a terminal in colour unless NO_COLOR is set. A progress bar
shows on stderr while large files load, when stderr is a terminal.

Example:
  proofsheet diff --key house,day --tol 'tmean=abs:1e-9' --tol '*=rel:1e-12' \
      want/daily.parquet got/daily.csv
  proofsheet diff --any-row-order --format markdown --out diff.md \
      want.csv got.csv
  proofsheet diff --engine duckdb --memory-limit 300MB --key house,at \
      --tol 'temp_c=abs:1e-9' 'want/readings-*.parquet' got/readings.csv
  proofsheet diff --engine postgres://ci@127.0.0.1:5432/warehouse \
      --key house,day greenhouse.daily_expected 'sql:SELECT * FROM daily'

Exit status: 0 when the tables are equal, 1 when they differ, 2 on
trouble (a file that cannot be read, a bad option).
`,
	}
	c.run = func(e *env, args []string) int { return runDiff(e, c, args) }
	return c
}

// reportFormats are the --format values of diff and changes.
var reportFormats = map[string]bool{"text": true, "markdown": true, "json": true, "html": true}

// gcWhileReading is the GC percentage (see runtime/debug.SetGCPercent)
// while diff reads and compares tables in memory: the heap may grow 10 %
// past what is live before a collection, instead of 100 %.
const gcWhileReading = 10

func runDiff(e *env, c *command, args []string) int {
	fs := newFlags(c)
	cf := addCompareFlags(fs)
	rf := addReaderFlags(fs)
	format := fs.String("format", "text", "")
	out := fs.String("out", "", "")
	maxCells := fs.Int("max-cells", assert.DefaultListLimit, "")
	junit := fs.String("junit", "", "")
	quiet := fs.Bool("quiet", false, "")
	byFile := fs.Bool("by-file", false, "")
	var ef engineFlags
	fs.StringVar(&ef.engine, "engine", "", "")
	fs.StringVar(&ef.memoryLimit, "memory-limit", "", "")
	fs.StringVar(&ef.tempDir, "temp-dir", "", "")
	fs.StringVar(&ef.wantEngine, "want-engine", "", "")
	fs.StringVar(&ef.gotEngine, "got-engine", "", "")
	files, status, ok := parseFlags(e, c, fs, args)
	if !ok {
		return status
	}
	if err := checkJUnit(*junit); err != nil {
		return trouble(e, c, "%v", err)
	}
	start := time.Now()
	suite := &junitSuite{name: "proofsheet diff"}
	// fail reports trouble, in the JUnit report too once there are files.
	fail := func(format string, args ...any) int {
		if len(files) == 2 {
			suite.cases = []junitCase{{name: files[1] + " against " + files[0], class: "proofsheet.diff", errMsg: fmt.Sprintf(format, args...)}}
			suite.took = time.Since(start)
			if err := suite.write(*junit); err != nil {
				fmt.Fprintf(e.stderr, "proofsheet %s: %v\n", c.name, err)
			}
		}
		return trouble(e, c, format, args...)
	}
	if len(files) != 2 {
		return trouble(e, c, "want two files, WANT and GOT, got %d\n\n%s", len(files), c.usage)
	}
	if !ef.used() && (ef.memoryLimit != "" || ef.tempDir != "") {
		return trouble(e, c, "--memory-limit and --temp-dir are for --engine duckdb")
	}
	if ef.used() && rf.asText {
		return trouble(e, c, "--as-text reads files in memory; with --engine the engine reads them: cast the columns in a sql: query instead")
	}
	if name := rf.given(); ef.used() && name != "" {
		return trouble(e, c, "--%s is a reader option; with --engine the engine reads the files: cast or parse the columns in a sql: query instead", name)
	}
	if !reportFormats[*format] {
		return trouble(e, c, "--format %q: unknown format (want text, markdown, json or html)", *format)
	}
	opts, err := cf.options()
	if err != nil {
		return trouble(e, c, "%v", err)
	}
	opts = append(opts, assert.ListLimit(*maxCells))
	if err := checkOut(*out); err != nil {
		return trouble(e, c, "%v", err)
	}
	// An option naming a column neither table has is a mistake in the
	// command line, not a difference between the tables.
	named := cf.named()
	what := "file"
	if ef.used() {
		what = "table"
	}
	unknown := func(wantNames, gotNames []string) (string, bool) {
		for _, col := range named {
			if col != assert.AllColumns && !slices.Contains(wantNames, col) && !slices.Contains(gotNames, col) {
				return fmt.Sprintf("no column %q in either %s%s (want: %s; got: %s)", col, what,
					didYouMean(col, append(slices.Clone(wantNames), gotNames...)), strings.Join(wantNames, ", "), strings.Join(gotNames, ", ")), true
			}
		}
		return "", false
	}
	if *byFile {
		if ef.used() {
			return trouble(e, c, "--by-file reads the files in memory; it does not go with --engine")
		}
		if *format == "html" {
			return trouble(e, c, "--by-file writes text, markdown or json, not html")
		}
		readOpts, err := rf.options()
		if err != nil {
			return trouble(e, c, "%v", err)
		}
		read := func(p string) (*fixtures.Table, error) {
			t, _, err := fixtures.ReadFile(p, readOpts...)
			return t, err
		}
		res, err := compareByFile(files[0], files[1], read, opts)
		if err != nil {
			return fail("%v", err)
		}
		write := func(w io.Writer) error {
			switch *format {
			case "json":
				return res.writeJSON(w)
			case "markdown":
				return res.writeMarkdown(w)
			}
			return res.writeText(w, assert.TextStyle{Color: *out == "" && useColor(e, e.stdout), Flags: true})
		}
		if err := writeResultWith(e, *out, write); err != nil {
			return fail("%v", err)
		}
		suite.cases, suite.took = nil, time.Since(start)
		for _, f := range res.Files {
			tc := junitCase{name: f.Path, class: "proofsheet.diff"}
			switch f.Status {
			case fileDiffers:
				tc.detail = f.Diff.TextWith(assert.TextStyle{Flags: true})
				tc.failure = tc.detail
			case fileOnlyWant, fileOnlyGot:
				tc.failure = f.Path + ": " + strings.ReplaceAll(string(f.Status), "-", " ")
			case fileUnreadble:
				tc.errMsg = f.Err.Error()
			}
			suite.cases = append(suite.cases, tc)
		}
		if err := suite.write(*junit); err != nil {
			return trouble(e, c, "%v", err)
		}
		switch {
		case res.count(fileUnreadble) > 0:
			return exitTrouble
		case res.equal():
			return exitSame
		}
		return exitDiffers
	}
	bar := newProgress(e, *quiet)
	var d *assert.Diff
	if ef.used() {
		d, err = engineDiff(ef, bar, files[0], files[1], opts)
		if err != nil {
			return fail("%v", err)
		}
		if msg, bad := unknown(d.WantColumns, d.GotColumns); bad {
			return fail("%s", msg)
		}
	} else {
		readOpts, err := rf.options()
		if err != nil {
			bar.finish()
			return trouble(e, c, "%v", err)
		}
		// Decoders (Arrow's Parquet reader above all) leave garbage about
		// as large as the columns they build. The columns hold no
		// pointers, so collecting often costs little: while the files are
		// read the heap is kept close to what is live, which keeps the
		// peak memory near the size of the tables. GOGC, when set, wins.
		if e.getenv("GOGC") == "" {
			defer debug.SetGCPercent(debug.SetGCPercent(gcWhileReading))
		}
		want, _, err := rf.read(e, bar, files[0], readOpts)
		if err != nil {
			bar.finish()
			return fail("%v", err)
		}
		got, _, err := rf.read(e, bar, files[1], readOpts)
		if err != nil {
			bar.finish()
			return fail("%v", err)
		}
		if msg, bad := unknown(want.Names(), got.Names()); bad {
			bar.finish()
			return fail("%s", msg)
		}
		if want.NumRows()+got.NumRows() >= 100_000 {
			bar.start("comparing "+strconv.Itoa(want.NumRows())+" and "+strconv.Itoa(got.NumRows())+" rows …", 0)
		}
		d = assert.Compare(want, got, opts...)
		bar.finish()
	}

	// The report is written as it is made: with --max-cells -1 it may list
	// millions of cells, which the Diff builds one at a time.
	write := func(w io.Writer) error {
		switch *format {
		case "json":
			vw := &versionWriter{w: w}
			if err := d.WriteJSON(vw); err != nil {
				return err
			}
			_, err := io.WriteString(w, "\n")
			return err
		case "markdown":
			return d.WriteMarkdown(w)
		case "html":
			fr := golden.ReviewDiff(files[1], d)
			fr.Rules = assert.RulesOf(opts...) // the page says what the rows were compared under
			rv := &golden.Review{Title: "Table comparison", Noun: "table", Against: files[0], Files: []golden.FileReview{fr}}
			return rv.WriteHTML(w)
		}
		return d.WriteText(w, assert.TextStyle{Color: *out == "" && useColor(e, e.stdout), Flags: true})
	}
	if err := writeResultWith(e, *out, write); err != nil {
		return fail("%v", err)
	}
	tc := junitCase{name: files[1] + " against " + files[0], class: "proofsheet.diff", took: time.Since(start)}
	if !d.Equal() {
		tc.detail = d.TextWith(assert.TextStyle{Flags: true})
		tc.failure = tc.detail
	}
	suite.cases, suite.took = []junitCase{tc}, time.Since(start)
	if err := suite.write(*junit); err != nil {
		return trouble(e, c, "%v", err)
	}
	if e.getenv(stepSummaryVar) != "" {
		if err := stepSummary(e, "## proofsheet diff: "+mdCodeSpan(files[1])+" against "+mdCodeSpan(files[0])+"\n\n"+d.Markdown()); err != nil {
			return trouble(e, c, "%v", err)
		}
	}
	if d.Equal() {
		return exitSame
	}
	return exitDiffers
}

// mdCodeSpan writes s as a Markdown code span.
func mdCodeSpan(s string) string {
	s = strings.NewReplacer("\n", " ", "\r", " ").Replace(s)
	tick := "`"
	for strings.Contains(s, tick) {
		tick += "`"
	}
	if strings.HasPrefix(s, "`") || strings.HasSuffix(s, "`") {
		s = " " + s + " "
	}
	return tick + s + tick
}
