package main

import (
	"fmt"
	"strings"

	"github.com/proofsheet/proofsheet/assert"
	"github.com/proofsheet/proofsheet/cmd/proofsheet/internal/greenhouse"
	"github.com/proofsheet/proofsheet/fixtures"
	"github.com/proofsheet/proofsheet/golden"
	"github.com/proofsheet/proofsheet/property"
)

func demoCommand() *command {
	c := &command{
		name:    "demo",
		summary: "walk through the whole job on the built-in greenhouse data",
		usage: `Usage: proofsheet demo [--html FILE]

Runs proofsheet's whole job on invented data built into the binary: the
uploads of four community greenhouses' dataloggers (Windows-1252, a byte
order mark, °F, UTF-16, sensor faults, two timestamp spellings, a
re-uploaded block). It profiles the raw files, runs the cleanup chain to a
daily report per house, checks the report against its golden file, throws
generated mess at the chain, and then shows what a reviewer sees when a
step of the chain changes: the table diff and the review summary.

Options:
  --html FILE   also write the review page of the changed report to FILE

Example:
  proofsheet demo
  proofsheet demo --html review.html

Exit status: 0 when the story ran to its end, 2 on trouble.
`,
	}
	c.run = func(e *env, args []string) int { return runDemo(e, c, args) }
	return c
}

// demoSeed fixes the generated mess, so the demo prints the same thing
// every time.
const demoSeed = 20260401

func runDemo(e *env, c *command, args []string) int {
	fs := newFlags(c)
	htmlOut := fs.String("html", "", "")
	rest, status, ok := parseFlags(e, c, fs, args)
	if !ok {
		return status
	}
	if len(rest) > 0 {
		return trouble(e, c, "takes no arguments, got %q", rest[0])
	}
	if err := checkOut(*htmlOut); err != nil {
		return trouble(e, c, "%v", err)
	}
	style := assert.TextStyle{Color: useColor(e, e.stdout)}
	w := e.stdout
	say := func(format string, args ...any) { fmt.Fprintf(w, format, args...) }
	step := func(n int, title string) {
		say("\n%s\n%s\n", heading(style, fmt.Sprintf("%d. %s", n, title)), strings.Repeat("─", len([]rune(title))+3))
	}

	say("%s\n", heading(style, "proofsheet demo: four community greenhouses, five spring days"))
	say("Every name, number and file here is invented. The chain under test is the\n" +
		"demo package cmd/proofsheet/internal/greenhouse: raw datalogger uploads in, a\n" +
		"daily report per house out.\n")

	// 1. Profile what the loggers uploaded.
	step(1, "What the loggers uploaded")
	say("Each file profiled as `proofsheet profile` does it (fixtures.ReadFile and its\n" +
		"LoadReport). The chain itself reads the files as text and fixes the types.\n\n")
	var uploads []*fixtures.Table
	for i, u := range greenhouse.Uploads() {
		tb, _, err := greenhouse.Load(u.Name, u.Data)
		if err != nil {
			return trouble(e, c, "%v", err)
		}
		// The load report of a typed read shows the kinds and bad values.
		_, typed, err := fixtures.ReadBytes(u.Name, u.Data)
		if err != nil {
			return trouble(e, c, "%v", err)
		}
		if i > 0 {
			say("\n")
		}
		say("%s", indent(typed.Text(), "  "))
		uploads = append(uploads, tb)
	}

	// 2. Run the chain.
	step(2, "The cleanup chain")
	report, err := greenhouse.Report(uploads, greenhouse.Options{})
	if err != nil {
		return trouble(e, c, "the chain failed: %v", err)
	}
	kept, dropped := greenhouse.Readings(report)
	readings := 0
	for _, u := range uploads {
		readings += u.NumRows()
	}
	say("Clean types each reading (two time spellings, °F to °C, -999 and ERR as faults,\n"+
		"re-uploads as duplicates); Daily groups by house and day. %d readings in,\n"+
		"%d kept, %d dropped; growing degree days by the averaging method, base 10 °C:\n\n",
		readings, kept, dropped)
	say("%s", indent(report.Literal(), "  "))

	// 3. Check it against its golden file.
	step(3, "The report against its golden file")
	want, _, err := golden.DecodeTable(greenhouse.GoldenPath, greenhouse.DailyGolden())
	if err != nil {
		return trouble(e, c, "the embedded golden file: %v", err)
	}
	opts := greenhouse.GoldenOptions()
	d := assert.Compare(want, report, opts...)
	say("golden.Table(t, %q, report, assert.ByKey(\"house\", \"day\"), assert.Tol(\"*\", %g, 0))\n",
		greenhouse.GoldenName, greenhouse.GoldenTolerance)
	say("compares with %s:\n\n", greenhouse.GoldenPath)
	say("%s", indent(d.TextWith(style), "  "))
	if !d.Equal() {
		say("\nThe chain no longer matches its golden file; the demo stops here.\n")
		return exitDiffers
	}

	// 4. Throw generated mess at it.
	step(4, "Generated mess")
	mess := greenhouse.LoggerMess()
	mess.Seed = demoSeed
	say("property.Check makes %d uploads of up to %d rows each (seed %d), spelled the way\n"+
		"loggers write (edge blanks, +7, 07, 7.0, 7e0, NA, -999, ERR, re-uploads), and checks:\n",
		mess.Runs, mess.MaxRows, demoSeed)
	rec := &demoT{name: "TestChainProperties"}
	cleanOK := property.Check(rec, greenhouse.UploadSchema(), greenhouse.Clean, mess, greenhouse.CleanInvariants()...)
	chainOK := property.Check(rec, greenhouse.UploadSchema(), greenhouse.OneUpload, mess, greenhouse.ReportInvariants()...)
	for _, inv := range greenhouse.CleanInvariants() {
		say("  Clean: %s\n", inv.Name())
	}
	for _, inv := range greenhouse.ReportInvariants() {
		say("  chain: %s\n", inv.Name())
	}
	if !cleanOK || !chainOK {
		say("\nAn invariant broke:\n%s", indent(rec.out.String(), "  "))
		return exitDiffers
	}
	say("All held. (When one breaks, Check prints the seed, the reason and the input\n" +
		"shrunk to its smallest failing table, ready to paste into a regression test.)\n")

	// 5. A reviewer's view of a change.
	step(5, "Someone changes a rounding rule")
	changed, err := greenhouse.Report(uploads, greenhouse.Options{Decimals: 1})
	if err != nil {
		return trouble(e, c, "the changed chain failed: %v", err)
	}
	say("A pull request makes the report round to 1 decimal instead of 2. The golden\n" +
		"check fails, and go test prints this table diff instead of a wall of text:\n\n")
	d2 := assert.Compare(want, changed, append(opts, assert.ListLimit(10))...)
	say("%s", indent(d2.TextWith(style), "  "))

	newBytes, err := golden.EncodeTable(changed, greenhouse.ReportKeys())
	if err != nil {
		return trouble(e, c, "%v", err)
	}
	rv := &golden.Review{
		Title:   "Golden file review",
		Against: "HEAD",
		Files: []golden.FileReview{golden.ReviewChange(golden.FileChange{
			Path: greenhouse.GoldenPath, Old: greenhouse.DailyGolden(), New: newBytes,
			OldExists: true, NewExists: true,
		}, assert.Tol("*", greenhouse.GoldenTolerance, 0), assert.ListLimit(5))},
	}
	say("\nThe author runs `go test ./... -update` and commits the new golden file. CI runs\n" +
		"`proofsheet changes --format markdown` and posts this on the pull request:\n\n")
	say("%s", indent(rv.Markdown(), "  "))
	if *htmlOut != "" {
		// The page lists every changed cell.
		page := *rv
		page.Files = []golden.FileReview{golden.ReviewChange(golden.FileChange{
			Path: greenhouse.GoldenPath, Old: greenhouse.DailyGolden(), New: newBytes,
			OldExists: true, NewExists: true,
		}, assert.Tol("*", greenhouse.GoldenTolerance, 0), assert.ListLimit(-1))}
		if err := writeResult(e, *htmlOut, []byte(page.HTML())); err != nil {
			return trouble(e, c, "%v", err)
		}
		say("\nThe review page is in %s.\n", *htmlOut)
	} else {
		say("\n`proofsheet demo --html review.html` writes the same review as one web page.\n")
	}
	say("\nThat is the whole job: realistic messy input, a keyed and tolerant comparison,\n" +
		"generated mess with shrinking, and golden files a reviewer can read.\n")
	return exitSame
}

// heading marks a heading in bold on a colour terminal.
func heading(st assert.TextStyle, s string) string {
	if st.Color {
		return "\x1b[1m" + s + "\x1b[0m"
	}
	return s
}

// indent puts prefix before every non-empty line of s.
func indent(s, prefix string) string {
	lines := strings.SplitAfter(s, "\n")
	var b strings.Builder
	for _, l := range lines {
		if strings.TrimSpace(l) != "" {
			b.WriteString(prefix)
		}
		b.WriteString(l)
	}
	return b.String()
}

// demoT collects what property.Check reports, for the demo to print.
type demoT struct {
	name string
	out  strings.Builder
}

func (d *demoT) Helper()      {}
func (d *demoT) Name() string { return d.name }
func (d *demoT) Errorf(format string, args ...any) {
	fmt.Fprintf(&d.out, format, args...)
	d.out.WriteString("\n")
}
