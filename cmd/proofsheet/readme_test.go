package main

import (
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strings"
	"testing"

	"github.com/stretchr/testify/require"

	"github.com/proofsheet/proofsheet/assert"
)

// readmeBlock returns the first fenced code block of the given language
// after the README heading.
func readmeBlock(t *testing.T, heading, lang string) string {
	t.Helper()
	data, err := os.ReadFile(repoFile("README.md"))
	require.NoError(t, err)
	re := regexp.MustCompile("(?s)" + regexp.QuoteMeta(heading) + ".*?```" + lang + "\n(.*?)```")
	m := re.FindStringSubmatch(string(data))
	require.NotNil(t, m, "README has no %s block under %q", lang, heading)
	return m[1]
}

// cleanEnv is the environment without CI settings, so the update step of
// the quick start is not refused when the tests themselves run in CI.
func cleanEnv(extra ...string) []string {
	var env []string
	for _, kv := range os.Environ() {
		k, _, _ := strings.Cut(kv, "=")
		switch k {
		case "CI", "PROOFSHEET_UPDATE", "PROOFSHEET_RECORDS", "PROOFSHEET_STALE", "GOFLAGS":
			continue
		}
		env = append(env, kv)
	}
	return append(env, extra...)
}

// TestReadmeQuickStartGo runs the README's Go quick start as written, in a
// module of its own that uses this repository: the first run fails for the
// missing golden file, -update writes it, the next run passes, and a
// changed reading fails both checks with a table diff.
func TestReadmeQuickStartGo(t *testing.T) {
	if testing.Short() {
		t.Skip("builds a module of its own")
	}
	code := readmeBlock(t, "### A Go test", "go")
	root, err := filepath.Abs(repoFile())
	require.NoError(t, err)
	dir := t.TempDir()
	gomod := "module example.com/try\n\ngo 1.26\n\nrequire github.com/proofsheet/proofsheet v0.0.0\n\nreplace github.com/proofsheet/proofsheet => " + root + "\n"
	require.NoError(t, os.WriteFile(filepath.Join(dir, "go.mod"), []byte(gomod), 0o644))
	sum, err := os.ReadFile(filepath.Join(root, "go.sum"))
	require.NoError(t, err)
	require.NoError(t, os.WriteFile(filepath.Join(dir, "go.sum"), sum, 0o644))
	qs := filepath.Join(dir, "quickstart")
	require.NoError(t, os.MkdirAll(qs, 0o755))
	require.NoError(t, os.WriteFile(filepath.Join(qs, "daily_test.go"), []byte(code), 0o644))

	goTest := func(args ...string) (string, bool) {
		cmd := exec.Command("go", append([]string{"test", "-count=1"}, args...)...)
		cmd.Dir = dir
		cmd.Env = cleanEnv("GOFLAGS=-mod=mod")
		out, err := cmd.CombinedOutput()
		return string(out), err == nil
	}
	out, ok := goTest("./quickstart")
	require.False(t, ok, out)
	require.Contains(t, out, "daily-max.gold.tbl does not exist")
	require.Contains(t, out, "-update")

	out, ok = goTest("./quickstart", "-update")
	require.True(t, ok, out)
	stored, err := os.ReadFile(filepath.Join(qs, "testdata", "daily-max.gold.tbl"))
	require.NoError(t, err)
	require.Contains(t, string(stored), "house:string | tmax:float64\nBellecôte | 22.6\nKæreby | 19.5\n")

	out, ok = goTest("./quickstart")
	require.True(t, ok, out)

	// "change 22.6 to 22.7 in raw": the first 22.6 of the file is raw's.
	changed := strings.Replace(code, "Bellecôte    | 22.6", "Bellecôte    | 22.7", 1)
	require.NotEqual(t, code, changed)
	require.NoError(t, os.WriteFile(filepath.Join(qs, "daily_test.go"), []byte(changed), 0o644))
	out, ok = goTest("./quickstart")
	require.False(t, ok, out)
	require.Equal(t, 2, strings.Count(out, "1 differing cell in 1 row"), "both the assert and the golden check fail:\n%s", out)
	require.Contains(t, out, "22.6  22.7")
}

// TestReadmeQuickStartCLI runs the README's shell quick start, with its
// /tmp paths moved into a temporary directory.
func TestReadmeQuickStartCLI(t *testing.T) {
	if testing.Short() {
		t.Skip("builds the command")
	}
	block := readmeBlock(t, "### The CLI on two files", "sh")
	block = strings.ReplaceAll(block, "/tmp/", t.TempDir()+"/")
	cmd := exec.Command("bash", "-c", block)
	cmd.Dir = repoFile()
	cmd.Env = cleanEnv()
	outb, err := cmd.CombinedOutput()
	out := string(outb)
	require.NoError(t, err, out)
	first := strings.Index(out, "exit status 1")
	second := strings.Index(out, "exit status 0")
	require.True(t, first >= 0 && second > first, out)
	require.Contains(t, out, "Bellecôte  tmax    22.6  22.61")
	require.Contains(t, out, "encoding    windows-1252")
}

// TestReadmeFromPython runs the README's "From Python, R or SQL" blocks as
// written, with their /tmp paths moved into a temporary directory: hammer
// passes the Python chain and finds its planted bug, shrunk to at most 3
// rows in a kept file that reproduces the failure when the chain is run on
// it by hand; golden creates, passes, fails on a real change and refuses
// updates under CI.
func TestReadmeFromPython(t *testing.T) {
	if testing.Short() {
		t.Skip("builds the command and runs a Python chain")
	}
	needTool(t, "python3")
	tmp := t.TempDir()
	run := func(block string) string {
		block = strings.ReplaceAll(block, "/tmp/", tmp+"/")
		cmd := exec.Command("bash", "-c", block)
		cmd.Dir = repoFile()
		cmd.Env = cleanEnv(stepSummaryVar + "=")
		out, err := cmd.CombinedOutput()
		require.NoError(t, err, "%s", out)
		return string(out)
	}
	statuses := func(out string) []string {
		return regexp.MustCompile(`(?m)^exit status (\d)$`).FindAllString(out, -1)
	}

	out := run(readmeBlock(t, "**Throw generated mess at it.**", "sh"))
	require.Equal(t, []string{"exit status 0", "exit status 1"}, statuses(out), out)
	require.Contains(t, out, "FAILED same-on-plain")
	require.Contains(t, out, "Shrunk from")

	// The kept input has at most 3 rows, and the chain run on it by hand,
	// as reproduce.txt says, fails the same way; the fixed chain does not.
	failing := filepath.Join(tmp, "failing")
	kept, err := os.ReadFile(filepath.Join(failing, "sample.csv"))
	require.NoError(t, err)
	require.LessOrEqual(t, strings.Count(string(kept), "\n")-1, 3, "%q", kept)
	repro, err := os.ReadFile(filepath.Join(failing, "reproduce.txt"))
	require.NoError(t, err)
	_, byHand, ok := strings.Cut(string(repro), "# Run the program on the kept input by hand:\n")
	require.True(t, ok, "%s", repro)
	cmds := strings.Split(strings.TrimSpace(byHand), "\n")
	require.Len(t, cmds, 2)
	work := t.TempDir()
	for _, name := range []string{"daily.py", "daily_bug.py"} {
		data, err := os.ReadFile(repoFile("testdata", "greenhouse", "chains", name))
		require.NoError(t, err)
		require.NoError(t, os.WriteFile(filepath.Join(work, name), data, 0o644))
	}
	messy := runByHand(t, work, cmds[0], "out.csv")
	plain := runByHand(t, work, cmds[1], "out-plain.csv")
	require.False(t, assert.Compare(typeNullColumns(plain, messy), typeNullColumns(messy, plain), assert.ByKey("house", "day")).Equal(),
		"the kept input reproduces the failure by hand")
	fixed := func(c string) string { return strings.Replace(c, "daily_bug.py", "daily.py", 1) }
	require.True(t, assert.Compare(runByHand(t, work, fixed(cmds[1]), "out-plain.csv"), runByHand(t, work, fixed(cmds[0]), "out.csv"), assert.ByKey("house", "day")).Equal())

	out = run(readmeBlock(t, "**Keep golden files of its outputs.**", "sh"))
	require.Equal(t, []string{"exit status 0", "exit status 0", "exit status 1", "exit status 2"}, statuses(out), out)
	require.Contains(t, out, "# proofsheet sheet v2\n# keys: house, day\n")
	require.Contains(t, out, "# tol: *=abs:1e-09\n")
	require.Contains(t, out, "golden files are not updated in CI")
	stored, err := os.ReadFile(filepath.Join(tmp, "report", "testdata", "golden", "notes.gold.txt"))
	require.NoError(t, err)
	require.Equal(t, "uploads 3\n", string(stored))
}
