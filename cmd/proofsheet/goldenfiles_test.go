package main

import (
	"encoding/json"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"github.com/stretchr/testify/require"

	"github.com/proofsheet/proofsheet/assert"
	"github.com/proofsheet/proofsheet/fixtures"
	"github.com/proofsheet/proofsheet/golden"
)

// goldenEnv clears the variables that change golden's update mode and the
// CI summaries.
var goldenEnv = []string{"CI=", golden.EnvUpdateInCI + "=", stepSummaryVar + "="}

const (
	outDaily          = "house,day,tmax,kept\nÉtang,2026-04-01,21.5,140\nLes Pins,2026-04-01,18.25,139\n"
	outNoise          = "house,day,tmax,kept\nLes Pins,2026-04-01,18.250000000000004,139\nÉtang,2026-04-01,21.5,140\n"
	outChanged        = "house,day,tmax,kept\nLes Pins,2026-04-01,18.35,139\nÉtang,2026-04-01,21.5,140\n"
	outSummary        = `{"houses": 2, "gdd": {"Étang": 12.5}}`
	outNotes          = "season 2026\nall loggers reported\n"
	goldenDailyStored = "# proofsheet sheet v2\n# keys: house, day\n# rows: 2\n# match: by key\n# tol: *=abs:1e-09\n" +
		"house:string | day:date | tmax:float64 | kept:int64\nLes Pins | 2026-04-01 | 18.25 | 139\nÉtang | 2026-04-01 | 21.5 | 140\n"
)

func TestGoldenLifecycle(t *testing.T) {
	dir := writeFiles(t, map[string]string{"out/daily.csv": outDaily, "out/summary.json": outSummary, "out/notes.txt": outNotes})
	outs := []string{"out/daily.csv", "out/summary.json", "out/notes.txt"}
	run := func(env []string, args ...string) result {
		return runBin(t, dir, append(append([]string{}, goldenEnv...), env...), append([]string{"golden"}, args...)...)
	}

	// Missing golden files are trouble, and the message gives the command
	// that creates them.
	r := run(nil, append([]string{"--key", "house,day", "--tol", "*=abs:1e-9"}, outs...)...)
	require.Equal(t, exitTrouble, r.code, r.stderr)
	require.Contains(t, r.stdout, "3 outputs: 3 missing")
	require.Contains(t, r.stderr, "testdata/golden/daily.gold.tbl does not exist (the golden file of out/daily.csv)")
	const create = "proofsheet golden --update --key house,day --tol '*=abs:1e-9' out/daily.csv out/summary.json out/notes.txt"
	require.Contains(t, r.stderr, "Create them from the outputs, and review them before you commit them:\n\t"+create+"\n")
	require.NoDirExists(t, filepath.Join(dir, "testdata"), "nothing is written without --update")

	// The command as printed creates them.
	sh := exec.Command("sh", "-c", strings.Replace(create, "proofsheet", binPath, 1))
	sh.Dir = dir
	sh.Env = append(os.Environ(), goldenEnv...)
	out, err := sh.CombinedOutput()
	require.NoError(t, err, "%s", out)
	require.Contains(t, string(out), "3 outputs: 3 created")
	stored := func(name string) string {
		b, err := os.ReadFile(filepath.Join(dir, "testdata", "golden", name))
		require.NoError(t, err)
		return string(b)
	}
	// The same formats as golden.Table, Text and JSON write.
	require.Equal(t, goldenDailyStored, stored("daily.gold.tbl"))
	require.Equal(t, outNotes, stored("notes.gold.txt"))
	canon, err := golden.CanonicalJSON(jsonRawMessage(outSummary))
	require.NoError(t, err)
	require.Equal(t, string(canon), stored("summary.gold.json"))

	// Checking needs no flags: the rules are stored.
	r = run(nil, outs...)
	require.Equal(t, exitSame, r.code, r.stdout+r.stderr)
	require.Contains(t, r.stdout, "3 outputs: 3 equal")

	// Float noise within the stored tolerance, rows in another order: equal.
	writeTree(t, dir, map[string]string{"out/daily.csv": outNoise, "out/summary.json": `{"gdd":{"Étang":12.50},"houses":2}`})
	r = run(nil, outs...)
	require.Equal(t, exitSame, r.code, r.stdout+r.stderr)

	// --update leaves files equal under their rules untouched.
	old := time.Date(2021, 3, 4, 5, 6, 7, 0, time.UTC)
	for _, n := range []string{"daily.gold.tbl", "summary.gold.json", "notes.gold.txt"} {
		require.NoError(t, os.Chtimes(filepath.Join(dir, "testdata", "golden", n), old, old))
	}
	r = run(nil, append([]string{"--update"}, outs...)...)
	require.Equal(t, exitSame, r.code, r.stdout+r.stderr)
	require.Contains(t, r.stdout, "3 outputs: 3 unchanged")
	for _, n := range []string{"daily.gold.tbl", "summary.gold.json", "notes.gold.txt"} {
		fi, err := os.Stat(filepath.Join(dir, "testdata", "golden", n))
		require.NoError(t, err)
		require.True(t, fi.ModTime().Equal(old), n)
	}
	require.Equal(t, goldenDailyStored, stored("daily.gold.tbl"))

	// A real change fails with the table diff and the text diff.
	writeTree(t, dir, map[string]string{"out/daily.csv": outChanged, "out/notes.txt": "season 2026\none logger silent\n"})
	r = run(nil, outs...)
	require.Equal(t, exitDiffers, r.code, r.stdout+r.stderr)
	require.Contains(t, r.stdout, "3 outputs: 2 differs, 1 equal")
	require.Regexp(t, `Les Pins +2026-04-01 +tmax +18\.25 +18\.35 +0\.1`, r.stdout)
	require.Contains(t, r.stdout, "2   -  all loggers reported\n  2 +  one logger silent")

	// Updates are refused under CI, unless forced.
	r = run([]string{"CI=true"}, append([]string{"--update"}, outs...)...)
	require.Equal(t, exitTrouble, r.code)
	require.Contains(t, r.stderr, "not updated: golden files are not updated in CI: --update was given but CI=true is set")
	require.Equal(t, goldenDailyStored, stored("daily.gold.tbl"))
	r = run([]string{"CI=true", golden.EnvUpdateInCI + "=1"}, append([]string{"--update"}, outs...)...)
	require.Equal(t, exitSame, r.code, r.stdout+r.stderr)
	require.Contains(t, r.stdout, "3 outputs: 2 rewrote, 1 unchanged")
	require.Contains(t, stored("daily.gold.tbl"), "| 18.35 |")
	require.Contains(t, stored("daily.gold.tbl"), "# tol: *=abs:1e-09\n", "the rules stay stored")
}

func TestGoldenRules(t *testing.T) {
	dir := writeFiles(t, map[string]string{"out/daily.csv": outChanged, "testdata/golden/daily.gold.tbl": goldenDailyStored})
	run := func(args ...string) result {
		return runBin(t, dir, goldenEnv, append([]string{"golden"}, args...)...)
	}
	// A wider tolerance on the command line: used and reported.
	r := run("--tol", "tmax=abs:0.2", "out/daily.csv")
	require.Equal(t, exitSame, r.code, r.stdout+r.stderr)
	require.Contains(t, r.stdout, "note: out/daily.csv: rules differ from the stored ones: - → tmax=abs:0.2; compared under the new rules; an update stores them")
	r = run("out/daily.csv")
	require.Equal(t, exitDiffers, r.code, "the stored rules are unchanged until an update")
	// An update stores them, and from then on no flag is needed.
	r = run("--update", "--tol", "tmax=abs:0.2", "out/daily.csv")
	require.Equal(t, exitSame, r.code, r.stdout+r.stderr)
	require.Contains(t, r.stdout, "rewrote")
	b, err := os.ReadFile(filepath.Join(dir, "testdata", "golden", "daily.gold.tbl"))
	require.NoError(t, err)
	require.Contains(t, string(b), "# tol: *=abs:1e-09\n# tol: tmax=abs:0.2\n")
	r = run("out/daily.csv")
	require.Equal(t, exitSame, r.code, r.stdout+r.stderr)

	// One store for Go and the command line: Go's golden.Table reads what
	// the command wrote, with the stored rules, and the other way round.
	got, _, err := fixtures.ReadFile(filepath.Join(dir, "out", "daily.csv"))
	require.NoError(t, err)
	o := golden.Store{Root: filepath.Join(dir, "testdata", "golden")}.CheckTable("daily", got)
	require.Equal(t, golden.StatusEqual, o.Status, o.Detail)
	data, err := golden.EncodeTableRules(got, assert.RulesOf(assert.ByKey("house", "day"), assert.Tol("tmax", 0.001, 0)))
	require.NoError(t, err)
	writeTree(t, dir, map[string]string{"testdata/golden/daily.gold.tbl": string(data), "out/daily.csv": outDaily})
	r = run("out/daily.csv")
	require.Equal(t, exitDiffers, r.code, "0.1 is over the stored 0.001")
	require.Contains(t, r.stdout, "abs. diff ≤ 0.001")
}

func TestGoldenReports(t *testing.T) {
	dir := writeFiles(t, map[string]string{
		"out/daily.csv":                     outChanged,
		"out/rows.json":                     `[{"house":"Étang","tmax":21.5},{"house":"Les Pins","tmax":18.25}]`,
		"out/summary.json":                  outSummary,
		"out/notes.md":                      "# notes\n",
		"testdata/golden/daily.gold.tbl":    goldenDailyStored,
		"testdata/golden/summary.gold.json": "{\"gdd\": {\"Étang\": 12.5}, \"houses\": 3}\n",
		"testdata/golden/notes.gold.txt":    "# notes\n",
	})
	junit := filepath.Join(dir, "golden.xml")
	summary := filepath.Join(dir, "summary.md")
	r := runBin(t, dir, []string{"CI=", stepSummaryVar + "=" + summary}, "golden", "--junit", junit, "--format", "json",
		"out/daily.csv", "out/rows.json", "out/summary.json", "out/notes.md")
	require.Equal(t, exitTrouble, r.code, "rows.json has no golden file")
	require.True(t, strings.HasPrefix(r.stdout, "{\n  \"schema_version\": 1,\n"), r.stdout)
	require.Contains(t, r.stdout, `"golden": "testdata/golden/rows.gold.tbl"`, "a JSON array of objects is a table")
	require.Contains(t, r.stdout, `"golden": "testdata/golden/summary.gold.json"`)
	require.Contains(t, r.stdout, `"golden": "testdata/golden/notes.gold.txt"`, "other files are text")
	require.Contains(t, r.stdout, "$.houses: got 2 want 3")

	doc := readJUnit(t, junit)
	require.Equal(t, 4, doc.Tests)
	require.Equal(t, 2, doc.Failures)
	require.Equal(t, 1, doc.Errors)
	cs := doc.Suites[0].Cases
	require.Equal(t, "out/daily.csv", cs[0].Name)
	require.Equal(t, "out/daily.csv differs from testdata/golden/daily.gold.tbl", cs[0].Failure.Message)
	require.Contains(t, cs[0].Failure.Text, "18.35")
	require.Equal(t, "testdata/golden/rows.gold.tbl does not exist", cs[1].Error.Message)
	require.Nil(t, cs[3].Failure)

	md, err := os.ReadFile(summary)
	require.NoError(t, err)
	require.True(t, strings.HasPrefix(string(md), "## proofsheet golden\n\n**4 outputs: 2 differs, 1 missing, 1 equal**\n"), "%s", md)
	require.Contains(t, string(md), "| `out/daily.csv` | **differs** | `testdata/golden/daily.gold.tbl` |")
}

func TestGoldenBadInput(t *testing.T) {
	dir := writeFiles(t, map[string]string{
		"a/daily.csv": outDaily, "b/daily.csv": outDaily, "out/daily.csv": outDaily,
		"testdata/golden/broken.gold.tbl": "# proofsheet sheet v2\nnot a table\n", "out/broken.csv": outDaily,
	})
	cases := []struct {
		name string
		args []string
		msg  string
	}{
		{"no file", nil, "no output file given"},
		{"missing output", []string{"out/absent.csv"}, "out/absent.csv: cannot read the output"},
		{"a directory", []string{"out"}, "is a directory"},
		{"shared golden file", []string{"a/daily.csv", "b/daily.csv"}, "a/daily.csv and b/daily.csv would share the golden file testdata/golden/daily.gold.tbl"},
		{"unreadable golden file", []string{"out/broken.csv"}, "cannot read testdata/golden/broken.gold.tbl"},
		{"bad tol", []string{"--tol", "tmax=abs:x", "out/daily.csv"}, `--tol "tmax=abs:x"`},
		{"key column absent", []string{"--update", "--key", "greenhouse", "out/daily.csv"}, "options do not fit"},
		{"bad format", []string{"--format", "html", "out/daily.csv"}, "unknown format"},
		{"key and any order", []string{"--key", "house", "--any-row-order", "out/daily.csv"}, "exclude each other"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			r := runBin(t, dir, goldenEnv, append([]string{"golden"}, c.args...)...)
			require.Equal(t, exitTrouble, r.code, "stdout: %s\nstderr: %s", r.stdout, r.stderr)
			require.Contains(t, r.stderr, c.msg)
			require.NotContains(t, r.stderr, "panic")
		})
	}
	require.NoFileExists(t, filepath.Join(dir, "testdata", "golden", "daily.gold.tbl"))
	// An unreadable golden file is rewritten by an update.
	r := runBin(t, dir, goldenEnv, "golden", "--update", "out/broken.csv")
	require.Equal(t, exitSame, r.code, r.stdout+r.stderr)
	require.Contains(t, r.stdout, "rewrote")
}

func jsonRawMessage(s string) any { return json.RawMessage(s) }

func TestUpdateCommandLine(t *testing.T) {
	c := goldenCommand()
	fs := newFlags(c)
	fs.Bool("update", false, "")
	fs.String("store", defaultStore, "")
	var tols tolFlags
	fs.Var(&tols, "tol", "")
	fs.Bool("loose-types", false, "")
	addReaderFlags(fs)
	fs.String("format", "text", "")
	require.NoError(t, fs.Parse([]string{"--format", "json", "--store", "gold en", "--tol", "*=abs:1e-9", "--tol", "tmax=rel:0.1",
		"--loose-types", "--types", "kept=int64", "--types", "day=date", "--strict=bare-quote"}))
	require.Equal(t, "proofsheet golden --update --loose-types --store 'gold en' --strict=bare-quote --tol '*=abs:1e-9' --tol tmax=rel:0.1 --types kept=int64 --types day=date out/daily.csv 'out/my notes.txt'",
		updateCommandLine(fs, []string{"out/daily.csv", "out/my notes.txt"}))
}

// The command names the fixes of hints as its own flags, in its report
// and in the JUnit failure, never as Go options.
func TestGoldenHintsNameFlags(t *testing.T) {
	stored, err := golden.EncodeTableRules(fixtures.MustParse(t, `
		house:string | day:date   | tmax:float64
		Étang        | 2026-04-01 | 21.5
		Les Pins     | 2026-04-01 | 18.25
		Mas          | 2026-04-02 | 17`), assert.Rules{Match: assert.MatchByPosition})
	require.NoError(t, err)
	dir := writeFiles(t, map[string]string{
		"out/daily.csv":                  "house,day,tmax\nMas,2026-04-02,17\nÉtang,2026-04-01,21.5\nLes Pins,2026-04-01,18.25\n",
		"testdata/golden/daily.gold.tbl": string(stored),
	})
	junit := filepath.Join(dir, "golden.xml")
	r := runBin(t, dir, goldenEnv, "golden", "--junit", junit, "out/daily.csv")
	require.Equal(t, exitDiffers, r.code, r.stdout+r.stderr)
	require.Contains(t, r.stdout, "the tables hold the same rows in another order")
	require.Contains(t, r.stdout, "fix: --key house or --any-row-order")
	require.NotContains(t, r.stdout, "AnyRowOrder()")
	doc := readJUnit(t, junit)
	require.Contains(t, doc.Suites[0].Cases[0].Failure.Text, "fix: --key house or --any-row-order")
	// The fix works: with the flag the output is equal.
	r = runBin(t, dir, goldenEnv, "golden", "--key", "house", "out/daily.csv")
	require.Equal(t, exitSame, r.code, r.stdout+r.stderr)
}
