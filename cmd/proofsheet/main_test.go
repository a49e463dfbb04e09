package main

import (
	"bytes"
	"encoding/json"
	"errors"
	"os"
	"os/exec"
	"path/filepath"
	"runtime"
	"strings"
	"testing"

	"github.com/proofsheet/proofsheet/assert"
	"github.com/proofsheet/proofsheet/cmd/proofsheet/internal/greenhouse"
	"github.com/proofsheet/proofsheet/fixtures"
	"github.com/proofsheet/proofsheet/golden"
	"github.com/stretchr/testify/require"
)

// binPath is the proofsheet binary built once for the end-to-end tests.
var binPath string

func TestMain(m *testing.M) {
	dir, err := os.MkdirTemp("", "proofsheet-bin-")
	if err != nil {
		panic(err)
	}
	binPath = filepath.Join(dir, "proofsheet")
	if runtime.GOOS == "windows" {
		binPath += ".exe"
	}
	out, err := exec.Command("go", "build", "-o", binPath, ".").CombinedOutput()
	if err != nil {
		os.Stderr.Write(out)
		os.RemoveAll(dir)
		os.Exit(2)
	}
	code := m.Run()
	os.RemoveAll(dir)
	os.Exit(code)
}

// result is what one run of the binary did.
type result struct {
	code           int
	stdout, stderr string
}

// runBin runs the built binary in dir (or the package directory) with the
// given environment additions.
func runBin(t *testing.T, dir string, extraEnv []string, args ...string) result {
	t.Helper()
	cmd := exec.Command(binPath, args...)
	cmd.Dir = dir
	cmd.Env = append(os.Environ(), "NO_COLOR=1")
	cmd.Env = append(cmd.Env, extraEnv...)
	var so, se bytes.Buffer
	cmd.Stdout, cmd.Stderr = &so, &se
	err := cmd.Run()
	code := 0
	if err != nil {
		var ee *exec.ExitError
		require.True(t, errors.As(err, &ee), "run %v: %v", args, err)
		code = ee.ExitCode()
	}
	return result{code, so.String(), se.String()}
}

// repoFile returns the path of a file of the repository's own testdata.
func repoFile(parts ...string) string {
	return filepath.Join(append([]string{"..", ".."}, parts...)...)
}

func TestUsage(t *testing.T) {
	r := runBin(t, "", nil)
	require.Equal(t, exitTrouble, r.code)
	require.Contains(t, r.stderr, "Usage: proofsheet COMMAND")

	r = runBin(t, "", nil, "nonsense")
	require.Equal(t, exitTrouble, r.code)
	require.Contains(t, r.stderr, `unknown command "nonsense"`)

	r = runBin(t, "", nil, "help")
	require.Equal(t, exitSame, r.code)
	require.Contains(t, r.stdout, "profile")

	for name := range commands() {
		r = runBin(t, "", nil, name, "--help")
		require.Equal(t, exitSame, r.code, name)
		require.Contains(t, r.stdout, "Usage: proofsheet "+name, name)
		require.Contains(t, r.stdout, "Example", name)
		r2 := runBin(t, "", nil, "help", name)
		require.Equal(t, r.stdout, r2.stdout, name)
	}

	r = runBin(t, "", nil, "profile", "--no-such-flag", "x.csv")
	require.Equal(t, exitTrouble, r.code)
	require.Contains(t, r.stderr, "flag provided but not defined")
}

func TestProfileEncodings(t *testing.T) {
	cases := []struct {
		file, encoding, delimiter string
		human                     string // how the text report names the encoding
		rows                      int
		badTemp                   int
		nullTemp                  int
	}{
		// Counts are those gen_raw.go plants: bellecote has 4 ERR, 3 -999
		// (numbers, so not bad) and one empty cell; kaereby one -999;
		// ornely one empty cell; pinonal one ERR and six re-uploaded rows.
		{"bellecote.csv", "windows-1252", ",", "windows-1252", 120, 4, 1},
		{"kaereby.csv", "utf-8-bom", ";", "utf-8, with a byte order mark", 120, 0, 0},
		{"ornely.tsv", "utf-16le", "\t", "utf-16le", 120, 0, 1},
		{"pinonal.csv", "utf-8", ",", "utf-8", 126, 1, 0},
	}
	for _, c := range cases {
		t.Run(c.file, func(t *testing.T) {
			r := runBin(t, "", nil, "profile", "--json", repoFile("testdata", "greenhouse", "raw", c.file))
			require.Equal(t, exitSame, r.code, r.stderr)
			var rep struct {
				Encoding  string `json:"encoding"`
				Delimiter string `json:"delimiter"`
				Rows      int    `json:"rows"`
				Columns   []struct {
					Name            string `json:"name"`
					Kind            string `json:"kind"`
					Nulls           int    `json:"nulls"`
					Distinct        int    `json:"distinct"`
					BadValues       int    `json:"bad_values"`
					SuggestCategory bool   `json:"suggest_category"`
				} `json:"columns"`
			}
			require.NoError(t, json.Unmarshal([]byte(r.stdout), &rep), r.stdout)
			require.Equal(t, c.encoding, rep.Encoding)
			require.Equal(t, c.delimiter, rep.Delimiter)
			require.Equal(t, c.rows, rep.Rows)
			require.Len(t, rep.Columns, 3)
			require.Equal(t, "house", rep.Columns[0].Name)
			require.Equal(t, 1, rep.Columns[0].Distinct, "one house per file")
			require.True(t, rep.Columns[0].SuggestCategory, "one value in 120 rows")
			temp := rep.Columns[2]
			require.Equal(t, c.badTemp, temp.BadValues)
			require.Equal(t, c.nullTemp, temp.Nulls)
			if c.badTemp > 0 {
				require.Equal(t, "string", temp.Kind, "a column with bad values stays text")
			} else {
				require.Equal(t, "float64", temp.Kind)
			}

			text := runBin(t, "", nil, "profile", repoFile("testdata", "greenhouse", "raw", c.file))
			require.Equal(t, exitSame, text.code)
			require.Contains(t, text.stdout, "encoding    "+c.human)
			for _, line := range strings.Split(text.stdout, "\n") {
				require.LessOrEqual(t, len([]rune(line)), 100, "line too wide: %q", line)
			}
		})
	}
}

func TestProfileBadInput(t *testing.T) {
	dir := t.TempDir()
	write := func(name, content string) string {
		p := filepath.Join(dir, name)
		require.NoError(t, os.WriteFile(p, []byte(content), 0o644))
		return p
	}
	cases := []struct {
		name string
		args []string
		msg  string
	}{
		{"no file", []string{"profile"}, "no file given"},
		{"missing", []string{"profile", filepath.Join(dir, "absent.csv")}, "absent.csv"},
		{"bad input format flag", []string{"profile", "--input-format", "xls", write("x.dat", "a,b\n1,2\n")}, `--input-format: unknown format "xls"`},
		{"bad types flag", []string{"profile", "--types", "a=money", write("t.csv", "a\n1\n")}, `--types "a=money": column "a": unknown column type "money"`},
		{"types of an absent column", []string{"profile", "--types", "b=int64", write("t2.csv", "a\n1\n")}, `WithColumnTypes names column "b", which the file does not have`},
		{"bad strict flag", []string{"profile", "--strict=loose", write("s.csv", "a\n1\n")}, `unknown quirk "loose"`},
		{"strict refuses", []string{"profile", "--strict=bare-quote", write("bq.csv", "a,b\n1,5\" pot\n")}, "bq.csv:2:4: bare quote"},
		{"empty", []string{"profile", write("empty.csv", "")}, "empty.csv"},
		{"ragged", []string{"profile", write("ragged.csv", "a,b\n1,2\n3\n")}, "ragged.csv:3"},
		{"unclosed quote", []string{"profile", write("q.csv", "a,b\n\"x,2\n")}, "q.csv:2"},
		{"bad delimiter flag", []string{"profile", "--delimiter", "ab", write("ok.csv", "a\n1\n")}, "want one character"},
		{"bad format flag", []string{"profile", "--format", "csv", write("ok2.csv", "a\n1\n")}, `--format "csv": unknown report format (want text or json; the format of the files read is --input-format)`},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			r := runBin(t, "", nil, c.args...)
			require.Equal(t, exitTrouble, r.code, "stdout: %s", r.stdout)
			require.Contains(t, r.stderr, c.msg)
			require.Empty(t, r.stdout)
			require.NotContains(t, r.stderr, "panic")
		})
	}
}

func TestProfileOptions(t *testing.T) {
	dir := t.TempDir()
	p := filepath.Join(dir, "x.csv")
	require.NoError(t, os.WriteFile(p, []byte("1|-\n2|3\n"), 0o644))
	r := runBin(t, "", nil, "profile", "--json", "--no-header", "--delimiter", "|", "--null", "-", p)
	require.Equal(t, exitSame, r.code, r.stderr)
	var rep struct {
		Rows    int `json:"rows"`
		Columns []struct {
			Name  string `json:"name"`
			Kind  string `json:"kind"`
			Nulls int    `json:"nulls"`
		} `json:"columns"`
	}
	require.NoError(t, json.Unmarshal([]byte(r.stdout), &rep))
	require.Equal(t, 2, rep.Rows)
	require.Equal(t, "col2", rep.Columns[1].Name)
	require.Equal(t, 1, rep.Columns[1].Nulls)
	require.Equal(t, "int64", rep.Columns[1].Kind)

	r = runBin(t, "", nil, "profile", "--json", "--as-text", "--no-header", "--delimiter", "|", p)
	require.Equal(t, exitSame, r.code, r.stderr)
	require.NoError(t, json.Unmarshal([]byte(r.stdout), &rep))
	require.Equal(t, "string", rep.Columns[0].Kind)

	r = runBin(t, "", nil, "profile", "--json", p, p)
	require.Equal(t, exitSame, r.code, r.stderr)
	require.True(t, strings.HasPrefix(strings.TrimSpace(r.stdout), "["), "several files give a JSON array")
}

func TestDemo(t *testing.T) {
	out := filepath.Join(t.TempDir(), "review.html")
	r := runBin(t, "", nil, "demo", "--html", out)
	require.Equal(t, exitSame, r.code, r.stderr)
	for _, want := range []string{
		"1. What the loggers uploaded", "encoding    windows-1252", "encoding    utf-16le",
		"2. The cleanup chain", "3. The report against its golden file", "tables are equal",
		"4. Generated mess", "All held", "5. Someone changes a rounding rule", "## Golden file review",
	} {
		require.Contains(t, r.stdout, want)
	}
	require.NotContains(t, r.stdout, "\x1b[", "no colour when stdout is not a terminal")

	// The page highlights exactly the cells the changed chain changes.
	uploads := greenhouse.Uploads()
	var tables []*fixtures.Table
	for _, u := range uploads {
		tb, _, err := greenhouse.Load(u.Name, u.Data)
		require.NoError(t, err)
		tables = append(tables, tb)
	}
	changed, err := greenhouse.Report(tables, greenhouse.Options{Decimals: 1})
	require.NoError(t, err)
	want, _, err := golden.DecodeTable("daily", greenhouse.DailyGolden())
	require.NoError(t, err)
	d := assert.Compare(want, changed, greenhouse.GoldenOptions()...)
	require.False(t, d.Equal())
	page, err := os.ReadFile(out)
	require.NoError(t, err)
	require.Equal(t, d.CellsDiffering, strings.Count(string(page), `class="`+assert.HTMLChangedCell+`"`))

	r = runBin(t, "", nil, "demo", "extra")
	require.Equal(t, exitTrouble, r.code)
	require.Contains(t, r.stderr, "takes no arguments")
	r = runBin(t, "", nil, "demo", "--html", filepath.Join(t.TempDir(), "no", "such", "dir.html"))
	require.Equal(t, exitTrouble, r.code)
	require.Empty(t, r.stdout, "nothing runs when the page cannot be written")
}
