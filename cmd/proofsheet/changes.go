package main

import (
	"fmt"
	"os"
	"strings"
	"time"

	"github.com/proofsheet/proofsheet/assert"
	"github.com/proofsheet/proofsheet/golden"
)

// stepSummaryVar is the environment variable by which CI services name a
// file that collects Markdown for the job's summary page, a common CI
// convention; diff, hammer, golden and changes append their Markdown
// there when it is set.
const stepSummaryVar = "GITHUB_STEP_SUMMARY"

func changesCommand() *command {
	c := &command{
		name:    "changes",
		summary: "summarise the golden files changed since a git revision",
		usage: `Usage: proofsheet changes [options] [PATH...]

Finds the golden files (*.gold.tbl, *.gold.txt, *.gold.json) that differ
between a git revision and the working tree — new untracked files too —
under the PATHs (default: every testdata/ directory below the current
one), compares the old and new version of each by its kind, and writes one
summary: a headline count, then per file its status (new, removed,
changed, unchanged within tolerance), row counts, schema and key changes,
the first changed cells with their keys and the largest deltas per column.
Tables are compared under the rules the new version stores in its header
(keys, tolerances, ignored columns, row matching; the old version's when
the new one stores none), with --tol and --ignore on top; a change of the
stored rules counts as a change, since a wider tolerance can hide one.
Text files are compared line by line, JSON files by path. The two sides
are labelled before (the revision) and after (the working tree).

With --records DIR it summarises the run records a test run wrote
(PROOFSHEET_RECORDS=DIR go test ./...) instead of asking git.

Options:
  --base REV         the git revision to compare with (default HEAD)
  --records DIR      read run records from DIR instead of git
  --format F         markdown (default; fits a pull-request comment), text,
                     json, or html (one self-contained page with a
                     "changed only" filter)
  --out FILE         write the summary to FILE instead of stdout; FILE is
                     written only when the summary could be made
` + tolHelp + `
  --ignore COLS      leave these comma-separated table columns out
                     (--tol and --ignore apply to the tables that have the
                     column they name)
  --max-cells N      list at most N changed cells per table (default 10;
                     -1 lists all)
  --junit FILE       also write a JUnit XML report to FILE: one test case
                     per golden file listed, failed when it is new,
                     removed or changed, with its diff
  --quiet            draw no progress bar

When ` + stepSummaryVar + ` names a file (CI job summaries), the
Markdown summary is appended to it as well, whatever --format says. The
JSON has a "schema_version" field.

Example:
  proofsheet changes --base origin/main --format html --out changes.html
  PROOFSHEET_RECORDS=out/records go test ./...
  proofsheet changes --records out/records --format text

Exit status: 0 when no golden file changed (unchanged within tolerance
counts as no change), 1 when some file is new, removed or changed, 2 on
trouble (not a git repository, an unknown revision, a bad option).
`,
	}
	c.run = func(e *env, args []string) int { return runChanges(e, c, args) }
	return c
}

func runChanges(e *env, c *command, args []string) int {
	fs := newFlags(c)
	base := fs.String("base", "HEAD", "")
	recordsDir := fs.String("records", "", "")
	format := fs.String("format", "markdown", "")
	out := fs.String("out", "", "")
	var tols tolFlags
	fs.Var(&tols, "tol", "")
	ignore := fs.String("ignore", "", "")
	maxCells := fs.Int("max-cells", 10, "")
	junit := fs.String("junit", "", "")
	quiet := fs.Bool("quiet", false, "")
	paths, status, ok := parseFlags(e, c, fs, args)
	if !ok {
		return status
	}
	start := time.Now()
	if err := checkJUnit(*junit); err != nil {
		return trouble(e, c, "%v", err)
	}
	if !reportFormats[*format] {
		return trouble(e, c, "--format %q: unknown format (want markdown, text, json or html)", *format)
	}
	tolOpts, err := tolOptions(tols)
	if err != nil {
		return trouble(e, c, "%v", err)
	}
	ignored := splitList(*ignore)
	// Each table gets the rules for the columns it has: one --tol serves
	// goldens that do not all have its column.
	optsFor := func(cols []string) []assert.Option {
		has := map[string]bool{assert.AllColumns: true}
		for _, c := range cols {
			has[c] = true
		}
		var opts []assert.Option
		for i, spec := range tols {
			if has[tolColumn(spec)] {
				opts = append(opts, tolOpts[i])
			}
		}
		var ign []string
		for _, c := range ignored {
			if has[c] {
				ign = append(ign, c)
			}
		}
		if len(ign) > 0 {
			opts = append(opts, assert.IgnoreColumns(ign...))
		}
		return append(opts, assert.ListLimit(*maxCells))
	}
	if err := checkOut(*out); err != nil {
		return trouble(e, c, "%v", err)
	}

	var rv *golden.Review
	if *recordsDir != "" {
		if isSet(fs, "base") || len(paths) > 0 {
			return trouble(e, c, "--records reads a test run's records; it takes no --base and no PATH")
		}
		if fi, err := os.Stat(*recordsDir); err != nil || !fi.IsDir() {
			return trouble(e, c, "--records %s: no such directory", *recordsDir)
		}
		recs, err := golden.ReadRecords(*recordsDir)
		if err != nil {
			return trouble(e, c, "%v", err)
		}
		rv = golden.ReviewRecords(recs)
		rv.Against = "the run records in " + *recordsDir
	} else {
		rv, err = changesGit(*base, paths, optsFor, newProgress(e, *quiet))
		if err != nil {
			return trouble(e, c, "%v", err)
		}
	}

	var report []byte
	switch *format {
	case "json":
		if report, err = rv.JSON(); err == nil {
			report, err = versioned(report)
		}
		if err != nil {
			return trouble(e, c, "%v", err)
		}
	case "html":
		report = []byte(rv.HTML())
	case "text":
		report = []byte(rv.TextWith(assert.TextStyle{Color: *out == "" && useColor(e, e.stdout), Flags: true}))
	default:
		report = []byte(rv.Markdown())
	}
	if err := writeResult(e, *out, report); err != nil {
		return trouble(e, c, "%v", err)
	}
	if err := changesJUnit(rv, time.Since(start)).write(*junit); err != nil {
		return trouble(e, c, "%v", err)
	}
	if err := stepSummary(e, rv.Markdown()); err != nil {
		return trouble(e, c, "%v", err)
	}
	// A working-tree golden file that cannot be read is trouble, not a
	// change: every check that reads it fails too.
	if bad := rv.Unreadable(); len(bad) > 0 {
		return trouble(e, c, "%s in the working tree cannot be read (see the summary): %s", pluralWord(len(bad), "golden file", "golden files"), strings.Join(bad, ", "))
	}
	if rv.Changed() {
		return exitDiffers
	}
	return exitSame
}

// changesJUnit is the JUnit report of a summary: one case per file
// listed, failed unless it is unchanged within tolerance.
func changesJUnit(rv *golden.Review, took time.Duration) *junitSuite {
	s := &junitSuite{name: "proofsheet changes", took: took}
	for _, f := range rv.Files {
		tc := junitCase{name: f.Path, class: "proofsheet.changes." + string(f.Kind)}
		if f.Status != golden.ReviewUnchanged {
			tc.failure = f.Status.Label() + ": " + f.Summary()
			tc.detail = (&golden.Review{Title: f.Path, Against: rv.Against, Files: []golden.FileReview{f}}).TextWith(assert.TextStyle{Flags: true})
		}
		s.cases = append(s.cases, tc)
	}
	return s
}

// changesGit summarises the golden files that differ between base and the
// work tree around the working directory.
func changesGit(base string, paths []string, optsFor golden.OptionsFor, bar *progress) (*golden.Review, error) {
	wd, err := os.Getwd()
	if err != nil {
		return nil, err
	}
	repo, err := openRepo(wd)
	if err != nil {
		return nil, err
	}
	commit, err := repo.resolve(base)
	if err != nil {
		return nil, err
	}
	specs := paths
	if len(specs) == 0 {
		specs = []string{defaultPathspec}
		if repo.inTestdata() {
			specs = []string{"."}
		}
	}
	changes, err := repo.changed(commit, specs)
	if err != nil {
		return nil, err
	}
	rv := &golden.Review{Against: base + " (" + repo.shortCommit(commit) + ")"}
	if len(changes) >= 20 {
		bar.startCount("comparing golden files", int64(len(changes)))
	}
	for _, ch := range changes {
		fc := golden.FileChange{Path: ch.path, OldExists: ch.old, NewExists: ch.cur}
		if ch.old {
			if fc.Old, err = repo.show(commit, ch.path); err != nil {
				bar.finish()
				return nil, err
			}
		}
		if ch.cur {
			if fc.New, err = repo.read(ch.path); err != nil {
				bar.finish()
				return nil, fmt.Errorf("reading %s: %w", ch.path, err)
			}
		}
		rv.Files = append(rv.Files, golden.ReviewChangeFor(fc, optsFor))
		bar.add(1)
	}
	bar.finish()
	return rv, nil
}

// appendFile appends data to the file at path, creating it if need be.
func appendFile(path string, data []byte) error {
	f, err := os.OpenFile(path, os.O_WRONLY|os.O_APPEND|os.O_CREATE, 0o644)
	if err != nil {
		return err
	}
	if _, err := f.Write(data); err != nil {
		f.Close()
		return err
	}
	return f.Close()
}
