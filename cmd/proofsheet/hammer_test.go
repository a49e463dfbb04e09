package main

import (
	"encoding/json"
	"os"
	"os/exec"
	"path/filepath"
	"runtime"
	"sort"
	"strconv"
	"strings"
	"syscall"
	"testing"
	"time"

	"github.com/stretchr/testify/require"

	"github.com/proofsheet/proofsheet/assert"
	"github.com/proofsheet/proofsheet/fixtures"
)

// chains is the folder of the demo's daily chains in other languages.
func chains(t *testing.T) string {
	t.Helper()
	dir, err := filepath.Abs(repoFile("testdata", "greenhouse", "chains"))
	require.NoError(t, err)
	return dir
}

// needTool skips a test when a program it runs is missing, except under
// CI, where .ci/run installs it.
func needTool(t *testing.T, name string) {
	t.Helper()
	if _, err := exec.LookPath(name); err != nil {
		if os.Getenv("CI") != "" {
			t.Fatalf("%s is not installed; .ci/run installs it", name)
		}
		t.Skipf("%s is not installed", name)
	}
}

// hammerReport is the part of hammer's JSON report the tests read.
type hammerReport struct {
	SchemaVersion int    `json:"schema_version"`
	Seed          int64  `json:"seed"`
	Ran           int    `json:"samples_run"`
	Held          bool   `json:"held"`
	Trouble       string `json:"trouble"`
	Checks        []struct {
		Check  string `json:"check"`
		Result string `json:"result"`
	} `json:"checks"`
	Failure *struct {
		Check      string `json:"check"`
		Class      string `json:"class"`
		Message    string `json:"message"`
		Sample     int    `json:"sample"`
		RowsBefore int    `json:"rows_before"`
		RowsAfter  int    `json:"rows_after"`
		Steps      int    `json:"shrink_steps"`
		Tried      int    `json:"shrink_tried"`
		Input      []struct {
			Name  string `json:"name"`
			Kept  string `json:"kept"`
			Bytes []byte `json:"bytes"`
		} `json:"input"`
		Reproduce string   `json:"reproduce"`
		ByHand    []string `json:"by_hand"`
		Kept      []string `json:"kept"`
		Stderr    string   `json:"stderr"`
	} `json:"failure"`
}

// hammerEnv keeps CI summaries out of the tests' runs.
var hammerEnv = []string{stepSummaryVar + "="}

func runHammerJSON(t *testing.T, dir string, args ...string) (hammerReport, result) {
	t.Helper()
	r := runBin(t, dir, hammerEnv, append(append([]string{"hammer"}, args...), "--format", "json", "--quiet")...)
	var rep hammerReport
	require.NoError(t, json.Unmarshal([]byte(r.stdout), &rep), "stdout: %s\nstderr: %s", r.stdout, r.stderr)
	require.Equal(t, jsonSchemaVersion, rep.SchemaVersion)
	return rep, r
}

// runByHand runs a command as a user would, in dir, and reads the table
// it wrote to out.
func runByHand(t *testing.T, dir, command, out string) *fixtures.Table {
	t.Helper()
	cmd := exec.Command("sh", "-c", command)
	cmd.Dir = dir
	b, err := cmd.CombinedOutput()
	require.NoError(t, err, "%s: %s", command, b)
	tb, _, err := fixtures.ReadFile(filepath.Join(dir, out))
	if err != nil {
		tb, _, err = fixtures.ReadFile(filepath.Join(dir, out), fixtures.AllText())
	}
	require.NoError(t, err)
	return tb
}

// The text report shows the failing input with its invisible characters
// made visible: here the blank at the edge of a house name that the Python
// chain's planted bug trips on, found by a one-line awk program.
func TestHammerShowsInvisible(t *testing.T) {
	dir := chains(t)
	edgeBlank := `awk -F, 'NR > 1 && ($1 ~ /^[ \t]|[ \t]$/ || $1 ~ /\302\240/) { exit 1 }' {in} && cp {in} {out}`
	r := runBin(t, dir, hammerEnv, "hammer", "--quiet", "--schema", "uploads.schema", "--run", edgeBlank, "--samples", "12", "--rows", "12", "--seed", "2")
	require.Equal(t, exitDiffers, r.code, r.stderr)
	require.Contains(t, r.stdout, "FAILED runs on sample 2: the program exited with status 1")
	require.Contains(t, r.stdout, "lines marked * hold characters you could not see")
	require.Regexp(t, `(?m)^  2\* "(\\t|\\u00a0| +)?\pL+(\\t|\\u00a0| +)?"$`, r.stdout, "the house's edge blank shows:\n%s", r.stdout)
	require.Contains(t, r.stdout, "Give --keep DIR")
	require.Contains(t, r.stdout, "Reproduce (the same inputs, from the seed):\n  proofsheet hammer --schema uploads.schema --run ")
}

// A POSIX shell and awk chain, whose planted bug reads fault codes and null
// words as 0 °C, is found and shrunk to at most 3 rows, and the kept input
// reproduces the failure by hand; the fixed chain holds every check and
// agrees with the Python one. (The Python chain's own bug is found by the
// README's example; see TestReadmeFromPython.)
func TestHammerAwkChain(t *testing.T) {
	dir := chains(t)
	keep := filepath.Join(t.TempDir(), "failing")
	common := []string{"--schema", "uploads.schema", "--key", "house,day", "--tol", "*=abs:1e-6", "--rows", "15", "--seed", "3"}
	rep, r := runHammerJSON(t, dir, append([]string{"--run", "sh daily_bug.sh {in} {out}", "--keep", keep,
		"--check", "runs", "--check", "same-on-plain", "--samples", "20"}, common...)...)
	require.Equal(t, exitDiffers, r.code, r.stderr)
	f := rep.Failure
	require.NotNil(t, f)
	require.Equal(t, "same-on-plain", f.Check)
	require.LessOrEqual(t, f.RowsAfter, 3)
	in := string(f.Input[0].Bytes)
	require.Regexp(t, `(ERR|NA|n/a|-)\s*\n`, in, "the shrunk input holds a fault code or null word:\n%s", in)

	work := t.TempDir()
	messy := runByHand(t, work, "sh "+shellQuote(filepath.Join(dir, "daily_bug.sh"))+" "+shellQuote(filepath.Join(keep, "sample.csv"))+" out.csv", "out.csv")
	plain := runByHand(t, work, "sh "+shellQuote(filepath.Join(dir, "daily_bug.sh"))+" "+shellQuote(filepath.Join(keep, "plain", "sample.csv"))+" out-plain.csv", "out-plain.csv")
	require.False(t, assert.Compare(typeNullColumns(plain, messy), typeNullColumns(messy, plain), assert.ByKey("house", "day")).Equal())

	checks := []string{"--check", "runs", "--check", "order-free", "--check", "same-on-plain", "--check", "no-nulls=house,day",
		"--check", "unique=house,day", "--check", "repeatable", "--check", "balance=sum(kept) + sum(dropped) = in.rows(house, logged_at)"}
	rep, r = runHammerJSON(t, dir, append(append([]string{"--run", "sh daily.sh {in} {out}", "--samples", "10"}, checks...), common...)...)
	require.Equal(t, exitSame, r.code, "%s\n%s", r.stdout, r.stderr)
	require.Len(t, rep.Checks, 7)
	for _, c := range rep.Checks {
		require.Equal(t, "held on 10 samples", c.Result, c.Check)
	}

	// The fixed chains agree with each other; the buggy one does not.
	if _, err := exec.LookPath("python3"); err == nil {
		rep, r = runHammerJSON(t, dir, append([]string{"--run", "sh daily.sh {in} {out}", "--samples", "4", "--check", "agrees=python3 daily.py {in} {out}"}, common...)...)
		require.Equal(t, exitSame, r.code, "%s\n%s", r.stdout, r.stderr)
	}
	rep, r = runHammerJSON(t, dir, append([]string{"--run", "sh daily_bug.sh {in} {out}", "--samples", "20", "--check", "agrees=sh daily.sh {in} {out}"}, common...)...)
	require.Equal(t, exitDiffers, r.code, r.stderr)
	require.Equal(t, "outputs differ", rep.Failure.Class)
	require.LessOrEqual(t, rep.Failure.RowsAfter, 3)
}

// A chain that reads a folder of uploads: {in} is a folder of 1 to N
// files, order-free swaps the files' contents between names, and a chain
// that reads only the first file is shrunk to two files.
func TestHammerFolders(t *testing.T) {
	dir := chains(t)
	common := []string{"--schema", "uploads.schema", "--key", "house,day", "--tol", "*=abs:1e-6", "--files", "3", "--rows", "8", "--seed", "5"}
	rep, r := runHammerJSON(t, dir, append([]string{"--run", "sh daily.sh {in} {out}", "--samples", "12",
		"--check", "order-free", "--check", "balance=sum(kept) + sum(dropped) = in.rows", "--check", "balance=in.files <= 3"}, common...)...)
	require.Equal(t, exitSame, r.code, "%s\n%s", r.stdout, r.stderr)
	require.True(t, rep.Held)

	keep := filepath.Join(t.TempDir(), "failing")
	firstOnly := `sh daily.sh "$(ls {in}/*.csv | head -n 1)" {out}`
	rep, r = runHammerJSON(t, dir, append([]string{"--run", firstOnly, "--samples", "20", "--keep", keep,
		"--check", "balance=sum(kept) + sum(dropped) = in.rows"}, common...)...)
	require.Equal(t, exitDiffers, r.code, r.stderr)
	require.Len(t, rep.Failure.Input, 2, "shrunk to the two files the bug needs")
	require.LessOrEqual(t, rep.Failure.RowsAfter, 3)
	entries, err := os.ReadDir(filepath.Join(keep, "input"))
	require.NoError(t, err)
	require.Len(t, entries, 2)
	for _, in := range rep.Failure.Input {
		data, err := os.ReadFile(filepath.Join(keep, "input", in.Name))
		require.NoError(t, err)
		require.Equal(t, in.Bytes, data)
	}
}

// The same schema, seed and flags give the same inputs byte for byte,
// whatever --jobs is; another seed gives others.
func TestHammerReproducible(t *testing.T) {
	dir := chains(t)
	inputs := func(seed string, jobs string) []string {
		log := filepath.Join(t.TempDir(), "inputs.log")
		run := `cksum < {in} >> ` + shellQuote(log) + ` && cp {in} {out}`
		_, r := runHammerJSON(t, dir, "--schema", "uploads.schema", "--run", run, "--samples", "15", "--seed", seed, "--jobs", jobs)
		require.Equal(t, exitSame, r.code, r.stderr)
		data, err := os.ReadFile(log)
		require.NoError(t, err)
		lines := strings.Split(strings.TrimSpace(string(data)), "\n")
		sort.Strings(lines)
		return lines
	}
	a := inputs("42", "1")
	require.Len(t, a, 15)
	require.Equal(t, a, inputs("42", "3"))
	require.NotEqual(t, a, inputs("43", "2"))

	// Shrinking tries candidates --jobs at a time but takes the first
	// failing one in order, and its budget counts candidates in that
	// order: the result is the one a plain sequential greedy search
	// (--jobs 1) finds, byte for byte, also when the budget runs out
	// half-way.
	shrunk := func(jobs string) hammerReport {
		rep, r := runHammerJSON(t, dir, "--schema", "uploads.schema", "--run", "sh daily_bug.sh {in} {out}", "--key", "house,day",
			"--check", "same-on-plain", "--samples", "20", "--rows", "25", "--seed", "8", "--max-shrinks", "14", "--jobs", jobs)
		require.Equal(t, exitDiffers, r.code, r.stderr)
		return rep
	}
	one, three := shrunk("1"), shrunk("3")
	require.Equal(t, 14, one.Failure.Tried)
	require.Less(t, one.Failure.RowsAfter, one.Failure.RowsBefore, "the budget allowed some steps")
	require.Equal(t, one.Failure.Sample, three.Failure.Sample)
	require.Equal(t, one.Failure.Input[0].Bytes, three.Failure.Input[0].Bytes)
	require.Equal(t, one.Failure.Steps, three.Failure.Steps)
	require.Equal(t, one.Failure.Tried, three.Failure.Tried)
}

// alive reports whether a process exists.
func alive(pid int) bool {
	return syscall.Kill(pid, 0) == nil
}

// Each run has a time limit that ends the program's whole process group;
// a program that never finishes is trouble; nothing is left in the
// temporary directory, however the program uses it.
func TestHammerTimeoutAndTempFiles(t *testing.T) {
	if runtime.GOOS == "windows" {
		t.Skip("process groups")
	}
	dir := chains(t)
	tmp := t.TempDir()
	pids := filepath.Join(t.TempDir(), "pids")
	hang := `sleep 60 & echo $! >> ` + shellQuote(pids) + `; sleep 60; cp {in} {out}`
	start := time.Now()
	r := runBin(t, dir, append([]string{"TMPDIR=" + tmp}, hammerEnv...), "hammer", "--schema", "uploads.schema", "--run", hang,
		"--samples", "3", "--timeout", "300ms", "--quiet")
	require.Equal(t, exitTrouble, r.code, r.stdout)
	require.Contains(t, r.stderr, "every run timed out (--timeout 300ms)")
	require.Less(t, time.Since(start), 50*time.Second, "the runs were ended, not waited for")
	data, err := os.ReadFile(pids)
	require.NoError(t, err)
	for _, p := range strings.Fields(string(data)) {
		pid, err := strconv.Atoi(p)
		require.NoError(t, err)
		require.Eventually(t, func() bool { return !alive(pid) }, 5*time.Second, 50*time.Millisecond, "the background sleep %d was killed with its group", pid)
	}
	entries, err := os.ReadDir(tmp)
	require.NoError(t, err)
	require.Empty(t, entries, "nothing left in TMPDIR")

	// A program that leaves temporary files of its own: they go too.
	r = runBin(t, dir, append([]string{"TMPDIR=" + tmp}, hammerEnv...), "hammer", "--schema", "uploads.schema",
		"--run", `mktemp > /dev/null && mkdir "$TMPDIR/scratch" && cp {in} "$TMPDIR/scratch/" && cp {in} {out}`, "--samples", "4", "--quiet")
	require.Equal(t, exitSame, r.code, r.stdout+r.stderr)
	entries, err = os.ReadDir(tmp)
	require.NoError(t, err)
	require.Empty(t, entries, "nothing left in TMPDIR")

	// Hanging on some inputs only is a failure of runs, shrunk like others.
	// The limit leaves a quick run room on a busy machine: at 500 ms a
	// shrink candidate without ERR once timed out too, under load 15, and
	// was taken as still failing.
	slow := `if grep -q ERR {in}; then sleep 60; fi; cp {in} {out}`
	rep, r2 := runHammerJSON(t, dir, "--schema", "uploads.schema", "--run", slow, "--samples", "20", "--rows", "10", "--seed", "4", "--timeout", "1500ms")
	require.Equal(t, exitDiffers, r2.code, r2.stderr)
	require.Equal(t, "timed out", rep.Failure.Class)
	require.Equal(t, 1, rep.Failure.RowsAfter)
	require.Contains(t, string(rep.Failure.Input[0].Bytes), "ERR")
}

// The other checks: no-nulls, unique and idempotent, on programs written
// for the test, and output read from stdout when there is no {out}.
func TestHammerChecks(t *testing.T) {
	dir := chains(t)
	base := []string{"--schema", "uploads.schema", "--samples", "12", "--rows", "10", "--seed", "9"}

	// The input copied to stdout: nulls in temp_c, houses repeated.
	rep, r := runHammerJSON(t, dir, append([]string{"--run", "cat {in}", "--check", "no-nulls=house,temp_c"}, base...)...)
	require.Equal(t, exitDiffers, r.code, r.stderr)
	require.Equal(t, "nulls in temp_c", rep.Failure.Class)
	require.Equal(t, 1, rep.Failure.RowsAfter)

	rep, r = runHammerJSON(t, dir, append([]string{"--run", "cat {in}", "--check", "unique=house"}, base...)...)
	require.Equal(t, exitDiffers, r.code, r.stderr)
	require.Equal(t, "repeated house", rep.Failure.Class)
	require.Equal(t, 2, rep.Failure.RowsAfter)

	rep, r = runHammerJSON(t, dir, append([]string{"--run", "cat {in}", "--check", "no-nulls=greenhouse"}, base...)...)
	require.Equal(t, exitDiffers, r.code, r.stderr)
	require.Equal(t, "no column greenhouse", rep.Failure.Class)
	require.NotContains(t, rep.Failure.Message, "did you mean", "nothing close to greenhouse")
	// Unshrunk, as the shrinker would rightly take the house column out.
	rep, r = runHammerJSON(t, dir, append([]string{"--run", "cat {in}", "--check", "unique=hous", "--max-shrinks", "0"}, base...)...)
	require.Equal(t, exitDiffers, r.code, r.stderr)
	require.Contains(t, rep.Failure.Message, `the output has no column "hous" (it has house, logged_at, temp_c): did you mean "house"?`)

	// Copying is idempotent; adding a row on every pass is not.
	rep, r = runHammerJSON(t, dir, append([]string{"--run", "cp {in} {out}", "--check", "idempotent"}, base...)...)
	require.Equal(t, exitSame, r.code, r.stderr)
	grow := `cat {in} > {out} && tail -n 1 {in} >> {out}`
	rep, r = runHammerJSON(t, dir, append([]string{"--run", grow, "--check", "idempotent"}, base...)...)
	require.Equal(t, exitDiffers, r.code, r.stderr)
	require.Equal(t, "outputs differ", rep.Failure.Class)

	// An output that stamps each run: a second run differs in that column
	// only, which --ignore leaves out of the comparison.
	stamped := `printf 'house,rows,run\nBellecôte,%s,%s\n' "$(wc -l < {in})" "$$" > {out}`
	few := []string{"--schema", "uploads.schema", "--samples", "3", "--rows", "5", "--seed", "9", "--check", "repeatable", "--run", stamped}
	rep, r = runHammerJSON(t, dir, few...)
	require.Equal(t, exitDiffers, r.code, r.stderr)
	require.Equal(t, "outputs differ", rep.Failure.Class)
	rep, r = runHammerJSON(t, dir, append(few, "--ignore", "run")...)
	require.Equal(t, exitSame, r.code, "%s\n%s", r.stdout, r.stderr)

	// A failing program: exit status, stderr trimmed, runs fails.
	// (The first sample with an ERR reading is sample 13 or later.)
	rep, r = runHammerJSON(t, dir, append(append([]string{"--run", `grep -q ERR {in} && { echo "cannot read ERR" >&2; exit 3; }; cp {in} {out}`}, base...), "--samples", "25")...)
	require.Equal(t, exitDiffers, r.code, r.stderr)
	require.Equal(t, "exit status 3", rep.Failure.Class)
	require.Equal(t, "cannot read ERR", rep.Failure.Stderr)
	require.Equal(t, 1, rep.Failure.RowsAfter)
}

func TestHammerReports(t *testing.T) {
	dir := chains(t)
	junit := filepath.Join(t.TempDir(), "hammer.xml")
	summary := filepath.Join(t.TempDir(), "summary.md")
	r := runBin(t, dir, []string{stepSummaryVar + "=" + summary}, "hammer", "--schema", "uploads.schema", "--run", "sh daily_bug.sh {in} {out}",
		"--key", "house,day", "--check", "runs", "--check", "same-on-plain", "--check", "unique=house,day",
		"--samples", "20", "--rows", "15", "--seed", "3", "--junit", junit, "--quiet")
	require.Equal(t, exitDiffers, r.code, r.stderr)
	require.Contains(t, r.stdout, "FAILED same-on-plain on sample")
	doc := readJUnit(t, junit)
	require.Equal(t, 3, doc.Tests)
	require.Equal(t, 1, doc.Failures)
	cs := doc.Suites[0].Cases
	require.Equal(t, "runs", cs[0].Name)
	require.Nil(t, cs[0].Failure)
	require.Equal(t, "same-on-plain", cs[1].Name)
	require.Contains(t, cs[1].Failure.Message, "same-on-plain: the output on the messy spellings differs")
	require.Contains(t, cs[1].Failure.Text, "Output diff", "the failure carries the report and the diff")
	require.Nil(t, cs[2].Failure)
	md, err := os.ReadFile(summary)
	require.NoError(t, err)
	require.True(t, strings.HasPrefix(string(md), "## proofsheet hammer\n\n**FAILED same-on-plain"), "%s", md)
	require.Contains(t, string(md), "| `unique=house,day` | held on")
}

func TestHammerTrouble(t *testing.T) {
	dir := chains(t)
	notEmpty := t.TempDir()
	require.NoError(t, os.WriteFile(filepath.Join(notEmpty, "mine.txt"), []byte("x"), 0o644))
	badSchema := filepath.Join(t.TempDir(), "bad.schema")
	require.NoError(t, os.WriteFile(badSchema, []byte("house category\nat timestump(s)\n"), 0o644))
	cases := []struct {
		name string
		args []string
		msg  string
	}{
		{"no schema", []string{"--run", "cp {in} {out}"}, "no --schema FILE given"},
		{"no program", []string{"--schema", "uploads.schema"}, "no --run CMD given"},
		{"no {in}", []string{"--schema", "uploads.schema", "--run", "cp x {out}"}, "has no {in}"},
		{"bad schema", []string{"--schema", badSchema, "--run", "cp {in} {out}"}, "bad.schema:2:"},
		{"missing schema", []string{"--schema", "nope.schema", "--run", "cp {in} {out}"}, "nope.schema"},
		{"unknown check", []string{"--schema", "uploads.schema", "--run", "cp {in} {out}", "--check", "tidy"}, `unknown check "tidy"`},
		{"bad balance", []string{"--schema", "uploads.schema", "--run", "cp {in} {out}", "--check", "balance=sum(kept) ~ in.rows"}, "want a relation"},
		{"bad unique", []string{"--schema", "uploads.schema", "--run", "cp {in} {out}", "--check", "unique="}, "unique needs columns"},
		{"program missing", []string{"--schema", "uploads.schema", "--run", "no-such-program-anywhere {in} {out}", "--samples", "3"}, "the program was not found"},
		{"reference fails", []string{"--schema", "uploads.schema", "--run", "cp {in} {out}", "--check", "agrees=exit 4 {in}", "--samples", "3"}, "the reference"},
		{"keep not empty", []string{"--schema", "uploads.schema", "--run", "cp {in} {out}", "--keep", notEmpty}, "files hammer did not write"},
		{"bad out format", []string{"--schema", "uploads.schema", "--run", "cp {in} {out}", "--out-format", "xls"}, "--out-format"},
		{"bad timeout", []string{"--schema", "uploads.schema", "--run", "cp {in} {out}", "--timeout", "0s"}, "--timeout"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			r := runBin(t, dir, hammerEnv, append([]string{"hammer", "--quiet"}, c.args...)...)
			require.Equal(t, exitTrouble, r.code, "stdout: %s\nstderr: %s", r.stdout, r.stderr)
			require.Contains(t, r.stderr, c.msg)
			require.NotContains(t, r.stderr, "panic")
		})
	}
}

func TestBalanceParse(t *testing.T) {
	good := []struct{ in, want string }{
		{"sum(kept) + sum(dropped) = in.rows(house, logged_at)", "sum(kept) + sum(dropped) = in.rows(house, logged_at)"},
		{"out.rows<=in.records", "out.rows <= in.records"},
		{`-count("air temp") + 3 == 0`, `-count("air temp") + 3 = 0`},
		{"out.sum(kept) != in.files - 1", "sum(kept) != in.files - 1"},
	}
	for _, c := range good {
		b, err := parseBalance(c.in)
		require.NoError(t, err, c.in)
		require.Equal(t, c.want, sideText(b.left)+" "+b.op+" "+sideText(b.right))
	}
	bad := []struct{ in, msg string }{
		{"sum(kept)", "want a relation"},
		{"sum = 1", "sum takes a column"},
		{"rows = 1", `unknown term "rows"`},
		{"in.records(x) = 1", "takes no columns"},
		{"sum(a, b) = 1", "takes one column"},
		{"sum(a = 1", "no closing )"},
		{"1 = 1 1", "unexpected"},
		{"= 1", "want a term"},
	}
	for _, c := range bad {
		_, err := parseBalance(c.in)
		require.ErrorContains(t, err, c.msg, c.in)
	}
}

func TestBalanceCheck(t *testing.T) {
	out := fixtures.MustParse(t, `house:string | kept:int64 | share:float64 | cost:decimal(6,2)
		Bellecôte | 3 | 0.1 | 1.10
		Kæreby    | 4 | 0.2 | 2.20
		Ørnely    | ~ | 0.7 | ~`)
	facts := balanceFacts{inRows: 9, inRecords: 8, inFiles: 2, out: out,
		inRowsOf: func(cols []string) (int, error) { return 7, nil }}
	cases := []struct {
		rel  string
		held bool
	}{
		{"sum(kept) = 7", true},
		{"sum(kept) + 2 = in.rows", true},
		{"count(kept) = 2", true},
		{"out.rows < in.records - 4", true},
		{"in.rows(house) = sum(kept)", true},
		// 0.1 + 0.2 + 0.7 is not 1 in float64; the sum is exact, so the
		// slack for float columns makes it equal. Source: IEEE 754 binary64
		// — 0.1, 0.2 and 0.7 have no exact representation.
		{"sum(share) = 1", true},
		{"sum(kept) > 7", false},
		{"in.files != 2", false},
	}
	for _, c := range cases {
		b, err := parseBalance(c.rel)
		require.NoError(t, err, c.rel)
		msg, err := b.check(facts)
		require.NoError(t, err, c.rel)
		require.Equal(t, c.held, msg == "", "%s: %s", c.rel, msg)
	}
	b, err := parseBalance("sum(house) = 0")
	require.NoError(t, err)
	_, err = b.check(facts)
	require.ErrorContains(t, err, `column "house" is string`)
	b, err = parseBalance("sum(kep) = 7")
	require.NoError(t, err)
	_, err = b.check(facts)
	require.ErrorContains(t, err, `no column "kep" in the output (it has house, kept, share, cost): did you mean "kept"?`)
	b, err = parseBalance("sum(cost) = 3")
	require.NoError(t, err)
	msg, err := b.check(facts)
	require.NoError(t, err)
	require.Equal(t, "sum(cost) = 3 does not hold: sum(cost) is 3.3, 3 is 3 (sum(cost) = 3.3; 3 = 3)", msg, "decimals sum exactly")
}

func TestShowBytes(t *testing.T) {
	data := []byte("house,temp_c\r\n\u00a0Bellecôte,12.5\r\nK\xe6reby,\t7\r\n")
	got := showBytes(data, fixtures.EncodingUTF8, 10)
	require.Equal(t, strconv.Itoa(len(data))+" bytes, UTF-8; line ends: 3 CRLF; lines marked * hold characters you could not see, written as Go strings\n"+
		"1* \"house,temp_c\\r\"\n"+
		"2* \"\\u00a0Bellecôte,12.5\\r\"\n"+
		"3* \"K\\xe6reby,\\t7\\r\"\n", got)
	// Windows-1252 bytes are shown decoded. Source: WHATWG Encoding
	// Standard, index-windows-1252 — 0xE6 is U+00E6 æ.
	got = showBytes([]byte("house\nK\xe6reby\n"), fixtures.EncodingWindows1252, 10)
	require.Equal(t, "13 bytes, Windows-1252, shown decoded; line ends: 2 LF\n1  house\n2  Kæreby\n", got)
	got = showBytes([]byte("a\nb\nc\n"), fixtures.EncodingUTF8, 2)
	require.Contains(t, got, "… 1 more line\n", "one line, not one lines")
	require.Contains(t, showBytes([]byte("a\nb\nc\nd\n"), fixtures.EncodingUTF8, 2), "… 2 more lines\n")
}
