package main

import (
	"encoding/json"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"

	"github.com/stretchr/testify/require"

	"github.com/proofsheet/proofsheet/assert"
	"github.com/proofsheet/proofsheet/golden"
)

// gitT runs git in dir for a test, failing it on error.
func gitT(t testing.TB, dir string, args ...string) string {
	t.Helper()
	cmd := exec.Command("git", args...)
	cmd.Dir = dir
	cmd.Env = append(os.Environ(), "LC_ALL=C", "GIT_CONFIG_NOSYSTEM=1", "GIT_CONFIG_GLOBAL="+os.DevNull)
	out, err := cmd.CombinedOutput()
	require.NoError(t, err, "git %v: %s", args, out)
	return string(out)
}

// newRepo makes a git repository in a temporary directory with the files
// committed, and returns its directory.
func newRepo(t testing.TB, files map[string]string) string {
	t.Helper()
	dir := t.TempDir()
	gitT(t, dir, "init", "-q", "-b", "main")
	gitT(t, dir, "config", "user.name", "Proofsheet Test")
	gitT(t, dir, "config", "user.email", "test@example.invalid")
	gitT(t, dir, "config", "commit.gpgsign", "false")
	writeTree(t, dir, files)
	gitT(t, dir, "add", "-A")
	gitT(t, dir, "commit", "-q", "-m", "goldens")
	return dir
}

func writeTree(t testing.TB, dir string, files map[string]string) {
	t.Helper()
	for name, content := range files {
		p := filepath.Join(dir, filepath.FromSlash(name))
		require.NoError(t, os.MkdirAll(filepath.Dir(p), 0o755))
		require.NoError(t, os.WriteFile(p, []byte(content), 0o644))
	}
}

const goldenDaily = `# proofsheet sheet v1
# keys: house, day
# rows: 3
house:string | day:date | tmax:float64 | kept:int64
Les Pins | 2026-04-01 | 18.25 | 140
Mas | 2026-04-01 | 17 | 139
Étang | 2026-04-01 | 21.5 | 140
`

// noEnv clears the variables that would change a run of changes.
var noEnv = []string{stepSummaryVar + "="}

func TestChangesAgainstGit(t *testing.T) {
	repo := newRepo(t, map[string]string{
		"report/testdata/daily/house.gold.tbl": goldenDaily,
		"report/testdata/daily/noise.gold.tbl": goldenDaily,
		"report/testdata/summary.gold.txt":     "season 2026\nhouses 3\ngdd 120.5\n",
		"report/testdata/season.gold.json":     `{"houses": 3, "gdd": {"Étang": 120.5}}` + "\n",
		"report/testdata/gone.gold.txt":        "old\n",
		"report/testdata/same.gold.txt":        "untouched\n",
		"report/testdata/notes.md":             "not a golden file\n",
		"elsewhere/other.gold.txt":             "outside any testdata directory\n",
	})
	writeTree(t, repo, map[string]string{
		"report/testdata/daily/house.gold.tbl": strings.Replace(goldenDaily, "21.5 | 140", "22 | 141", 1),
		"report/testdata/daily/noise.gold.tbl": strings.Replace(goldenDaily, "| 18.25 |", "| 18.250000000000004 |", 1),
		"report/testdata/summary.gold.txt":     "season 2026\nhouses 4\ngdd 120.5\n",
		"report/testdata/season.gold.json":     `{"houses":3,"gdd":{"Étang":121}}`,
		"report/testdata/fresh.gold.tbl":       goldenDaily, // untracked: new
		"report/testdata/notes.md":             "changed, but not a golden file\n",
		"elsewhere/other.gold.txt":             "changed outside testdata\n",
	})
	require.NoError(t, os.Remove(filepath.Join(repo, "report/testdata/gone.gold.txt")))

	r := runBin(t, repo, noEnv, "changes", "--format", "json", "--tol", "*=rel:1e-12")
	require.Equal(t, exitDiffers, r.code, r.stderr)
	var out struct {
		Against string         `json:"against"`
		Counts  map[string]int `json:"counts"`
		Files   []struct {
			Path   string `json:"path"`
			Status string `json:"status"`
			Diff   *struct {
				CellsDiffering int `json:"cells_differing"`
				Cells          []struct {
					Row struct {
						Key []string `json:"key"`
					} `json:"row"`
					Column string `json:"column"`
				} `json:"cells"`
			} `json:"diff"`
		} `json:"files"`
	}
	require.NoError(t, json.Unmarshal([]byte(r.stdout), &out), r.stdout)
	require.Regexp(t, `^HEAD \([0-9a-f]{7,}\)$`, out.Against)
	got := map[string]string{}
	for _, f := range out.Files {
		got[f.Path] = f.Status
	}
	require.Equal(t, map[string]string{
		"report/testdata/daily/house.gold.tbl": "changed",
		"report/testdata/daily/noise.gold.tbl": "unchanged",
		"report/testdata/summary.gold.txt":     "changed",
		"report/testdata/season.gold.json":     "changed",
		"report/testdata/fresh.gold.tbl":       "new",
		"report/testdata/gone.gold.txt":        "removed",
	}, got)
	require.Equal(t, map[string]int{"changed": 3, "new": 1, "removed": 1, "unchanged": 1, "equal": 0}, out.Counts)
	house := out.Files[0]
	require.Equal(t, "report/testdata/daily/house.gold.tbl", house.Path, "files sorted by path")
	require.Equal(t, 2, house.Diff.CellsDiffering)
	require.Equal(t, []string{"Étang", "2026-04-01"}, house.Diff.Cells[0].Row.Key)

	// Markdown, the default, for a pull request.
	r = runBin(t, repo, noEnv, "changes", "--tol", "*=rel:1e-12")
	require.Equal(t, exitDiffers, r.code, r.stderr)
	require.True(t, strings.HasPrefix(r.stdout, "## Golden file review\n\n**5 golden files differ: 3 changed, 1 new, 1 removed; 1 unchanged within tolerance** — against `HEAD ("), r.stdout)
	require.Contains(t, r.stdout, "| `report/testdata/daily/house.gold.tbl` | **changed** | table | 3 | 2 differing cells in 1 row; max abs. diff 1 (kept) |")
	require.Contains(t, r.stdout, "| `Étang` | `2026-04-01` | `tmax` | `21.5` | `22` |")
	require.Contains(t, r.stdout, "$.gdd[\"Étang\"]: before 120.5, after 121")

	// Without the tolerance the float noise is a change.
	r = runBin(t, repo, noEnv, "changes", "--format", "text")
	require.Equal(t, exitDiffers, r.code)
	require.Regexp(t, `(?m)^  changed +table +3  report/testdata/daily/noise.gold.tbl$`, r.stdout)

	// The HTML page: one marked cell per listed differing cell.
	r = runBin(t, repo, noEnv, "changes", "--format", "html", "--tol", "*=rel:1e-12")
	require.Equal(t, exitDiffers, r.code)
	require.True(t, strings.HasPrefix(r.stdout, "<!DOCTYPE html>"))
	require.Equal(t, 2, strings.Count(r.stdout, `class="`+assert.HTMLChangedCell+`"`))
	require.Equal(t, 6, strings.Count(r.stdout, `<section class="ps-file"`))

	// PATH arguments narrow the summary; any golden file under them counts.
	r = runBin(t, repo, noEnv, "changes", "--format", "json", "elsewhere")
	require.Equal(t, exitDiffers, r.code, r.stderr+r.stdout)
	require.Contains(t, r.stdout, `"path": "elsewhere/other.gold.txt"`)
	require.NotContains(t, r.stdout, "report/testdata")

	// From a subdirectory the default is the testdata below it.
	r = runBin(t, filepath.Join(repo, "report", "testdata", "daily"), noEnv, "changes", "--format", "json")
	require.Equal(t, exitDiffers, r.code, r.stderr)
	require.Contains(t, r.stdout, `"path": "report/testdata/daily/house.gold.tbl"`)
	require.NotContains(t, r.stdout, "summary.gold.txt")
}

func TestChangesNothingChanged(t *testing.T) {
	repo := newRepo(t, map[string]string{"pkg/testdata/a.gold.txt": "a\n", "pkg/testdata/t.gold.tbl": goldenDaily})
	r := runBin(t, repo, noEnv, "changes")
	require.Equal(t, exitSame, r.code, r.stderr)
	require.Contains(t, r.stdout, "**No golden file differs**")

	// Only tolerated noise: still exit 0. A rule for a column this table
	// lacks (gdd) does not get in the way.
	writeTree(t, repo, map[string]string{"pkg/testdata/t.gold.tbl": strings.Replace(goldenDaily, "| 17 |", "| 17.000000000000004 |", 1)})
	r = runBin(t, repo, noEnv, "changes", "--tol", "tmax=ulp:2", "--tol", "gdd=abs:0.1", "--ignore", "note")
	require.Equal(t, exitSame, r.code, r.stdout)
	require.Contains(t, r.stdout, "1 unchanged within tolerance")
	r = runBin(t, repo, noEnv, "changes")
	require.Equal(t, exitDiffers, r.code)
}

func TestChangesBase(t *testing.T) {
	repo := newRepo(t, map[string]string{"pkg/testdata/a.gold.txt": "one\n"})
	first := strings.TrimSpace(gitT(t, repo, "rev-parse", "HEAD"))
	writeTree(t, repo, map[string]string{"pkg/testdata/a.gold.txt": "two\n"})
	gitT(t, repo, "commit", "-q", "-am", "two")
	// Against HEAD the work tree is clean; against the first commit the
	// committed change shows.
	r := runBin(t, repo, noEnv, "changes")
	require.Equal(t, exitSame, r.code, r.stderr)
	r = runBin(t, repo, noEnv, "changes", "--base", first, "--format", "text")
	require.Equal(t, exitDiffers, r.code, r.stderr)
	require.Contains(t, r.stdout, "against "+first)
	require.Contains(t, r.stdout, "-  one")
	require.Contains(t, r.stdout, "+  two")
	r = runBin(t, repo, noEnv, "changes", "--base", "HEAD~1")
	require.Equal(t, exitDiffers, r.code, r.stderr)
}

func TestChangesStepSummary(t *testing.T) {
	repo := newRepo(t, map[string]string{"pkg/testdata/a.gold.txt": "one\n"})
	writeTree(t, repo, map[string]string{"pkg/testdata/a.gold.txt": "two\n"})
	summary := filepath.Join(t.TempDir(), "summary.md")
	require.NoError(t, os.WriteFile(summary, []byte("earlier step\n"), 0o644))
	r := runBin(t, repo, []string{stepSummaryVar + "=" + summary}, "changes", "--format", "json")
	require.Equal(t, exitDiffers, r.code, r.stderr)
	require.True(t, strings.HasPrefix(r.stdout, "{"), "stdout keeps the asked format")
	data, err := os.ReadFile(summary)
	require.NoError(t, err)
	require.True(t, strings.HasPrefix(string(data), "earlier step\n## Golden file review\n"), "appended, as Markdown: %s", data)
}

func TestChangesRecords(t *testing.T) {
	dir := t.TempDir()
	recs := []golden.Record{
		{Test: "TestDaily", Name: "daily", Kind: golden.KindTable, Status: golden.StatusEqual, Path: "pkg/testdata/daily.gold.tbl"},
		{Test: "TestSummary", Name: "summary", Kind: golden.KindText, Status: golden.StatusChanged, Path: "pkg/testdata/summary.gold.txt", Detail: "golden: differs\n-a\n+b"},
	}
	var lines []string
	for _, rec := range recs {
		b, err := json.Marshal(rec)
		require.NoError(t, err)
		lines = append(lines, string(b))
	}
	require.NoError(t, os.WriteFile(filepath.Join(dir, "records-1.jsonl"), []byte(strings.Join(lines, "\n")+"\n"), 0o644))
	r := runBin(t, "", noEnv, "changes", "--records", dir, "--format", "text")
	require.Equal(t, exitDiffers, r.code, r.stderr)
	require.Contains(t, r.stdout, "against the run records in "+dir)
	require.Contains(t, r.stdout, "1 golden file differs: 1 changed; 1 equal")
	require.Contains(t, r.stdout, "checked by TestSummary")

	only := t.TempDir()
	require.NoError(t, os.WriteFile(filepath.Join(only, "records-2.jsonl"), []byte(lines[0]+"\n"), 0o644))
	r = runBin(t, "", noEnv, "changes", "--records", only)
	require.Equal(t, exitSame, r.code, r.stderr)
}

func TestChangesBadInput(t *testing.T) {
	repo := newRepo(t, map[string]string{"pkg/testdata/a.gold.txt": "one\n"})
	writeTree(t, repo, map[string]string{"pkg/testdata/a.gold.txt": "two\n"})
	notRepo := t.TempDir()
	empty := t.TempDir()
	gitT(t, empty, "init", "-q")
	badRecords := t.TempDir()
	require.NoError(t, os.WriteFile(filepath.Join(badRecords, "records-x.jsonl"), []byte("not json\n"), 0o644))
	keep := filepath.Join(t.TempDir(), "keep.md")
	cases := []struct {
		name string
		dir  string
		args []string
		msg  string
	}{
		{"not a git repository", notRepo, nil, "not a git repository"},
		{"unknown revision", repo, []string{"--base", "no-such-branch"}, `unknown revision "no-such-branch"`},
		{"a revision that is an option", repo, []string{"--base", "--output=x"}, "unknown revision"},
		{"no commit yet", empty, nil, "the repository has no commit yet"},
		{"unknown format", repo, []string{"--format", "pdf"}, `--format "pdf": unknown format`},
		{"bad tol", repo, []string{"--tol", "tmax=abs:oops"}, `--tol "tmax=abs:oops"`},
		{"records dir missing", repo, []string{"--records", filepath.Join(notRepo, "nope")}, "no such directory"},
		{"records with a base", repo, []string{"--records", badRecords, "--base", "HEAD"}, "takes no --base"},
		{"bad records", repo, []string{"--records", badRecords}, "records-x.jsonl:1: not a run record"},
		{"a path outside the repository", repo, []string{notRepo}, "outside repository"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			require.NoError(t, os.WriteFile(keep, []byte("earlier\n"), 0o644))
			r := runBin(t, c.dir, noEnv, append([]string{"changes", "--out", keep}, c.args...)...)
			require.Equal(t, exitTrouble, r.code, "stdout: %s\nstderr: %s", r.stdout, r.stderr)
			require.Contains(t, r.stderr, c.msg)
			require.NotContains(t, r.stderr, "panic")
			data, err := os.ReadFile(keep)
			require.NoError(t, err)
			require.Equal(t, "earlier\n", string(data), "--out is untouched on failure")
		})
	}
}

// TestChangesUnreadableWorkingFile: a golden file in the working tree
// that cannot be read is trouble (exit 2), not a change, and the summary
// still says what was found; an unreadable old version is history and
// stays a change.
func TestChangesUnreadableWorkingFile(t *testing.T) {
	repo := newRepo(t, map[string]string{"pkg/testdata/t.gold.tbl": goldenDaily, "pkg/testdata/j.gold.json": "{\"a\": 1}\n"})
	writeTree(t, repo, map[string]string{"pkg/testdata/t.gold.tbl": "house:string\n\"unterminated\n"})
	r := runBin(t, repo, noEnv, "changes", "--format", "text")
	require.Equal(t, exitTrouble, r.code, r.stdout)
	require.Equal(t, "proofsheet changes: 1 golden file in the working tree cannot be read (see the summary): pkg/testdata/t.gold.tbl\n", r.stderr)
	require.Contains(t, r.stdout, "pkg/testdata/t.gold.tbl (new)")

	writeTree(t, repo, map[string]string{"pkg/testdata/j.gold.json": "{\"a\": \n"})
	r = runBin(t, repo, noEnv, "changes", "--format", "text")
	require.Equal(t, exitTrouble, r.code)
	require.Contains(t, r.stderr, "2 golden files in the working tree cannot be read (see the summary): pkg/testdata/j.gold.json, pkg/testdata/t.gold.tbl")

	// Committed damaged, then mended in the working tree: a change.
	gitT(t, repo, "commit", "-qam", "damaged")
	writeTree(t, repo, map[string]string{"pkg/testdata/t.gold.tbl": goldenDaily, "pkg/testdata/j.gold.json": "{\"a\": 1}\n"})
	r = runBin(t, repo, noEnv, "changes", "--format", "text")
	require.Equal(t, exitDiffers, r.code, r.stderr)
}
