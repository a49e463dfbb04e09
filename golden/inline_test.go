package golden

import (
	"go/format"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"github.com/stretchr/testify/require"

	"github.com/proofsheet/proofsheet/assert"
	"github.com/proofsheet/proofsheet/fixtures"
)

// tryModule makes a module of its own in a temporary directory that uses
// this repository, with the given files, and returns its directory.
func tryModule(t *testing.T, files map[string]string) string {
	t.Helper()
	root, err := filepath.Abs("..")
	require.NoError(t, err)
	dir := t.TempDir()
	gomod := "module example.com/try\n\ngo 1.26\n\nrequire github.com/proofsheet/proofsheet v0.0.0\n\nreplace github.com/proofsheet/proofsheet => " + root + "\n"
	files["go.mod"] = gomod
	sum, err := os.ReadFile(filepath.Join(root, "go.sum"))
	require.NoError(t, err)
	files["go.sum"] = string(sum)
	for name, content := range files {
		p := filepath.Join(dir, filepath.FromSlash(name))
		require.NoError(t, os.MkdirAll(filepath.Dir(p), 0o755))
		require.NoError(t, os.WriteFile(p, []byte(content), 0o644))
	}
	return dir
}

// goTest runs go test in dir with the arguments and the extra environment,
// without the CI and update settings of this run.
func goTest(t *testing.T, dir string, env []string, args ...string) (string, bool) {
	t.Helper()
	cmd := exec.Command("go", append([]string{"test", "-count=1"}, args...)...)
	cmd.Dir = dir
	for _, kv := range os.Environ() {
		k, _, _ := strings.Cut(kv, "=")
		switch k {
		case EnvCI, EnvUpdate, EnvUpdateInCI, EnvRecords, EnvStale, "GOFLAGS":
			continue
		}
		cmd.Env = append(cmd.Env, kv)
	}
	cmd.Env = append(append(cmd.Env, "GOFLAGS=-mod=mod"), env...)
	out, err := cmd.CombinedOutput()
	return string(out), err == nil
}

// inlineSource is a test file with inline tables: two calls in one test,
// a subtest, a literal written by hand without the "#" lines, and a
// dot-free call nested in a helper's block.
const inlineSource = `package try

import (
	"testing"

	"github.com/proofsheet/proofsheet/assert"
	"github.com/proofsheet/proofsheet/fixtures"
	"github.com/proofsheet/proofsheet/golden"
)

func daily(t *testing.T, tmax string) *fixtures.Table {
	return fixtures.MustParse(t, "house:string | day:date | tmax:float64\n"+
		"Kæreby | 2026-04-01 | "+tmax+"\n"+
		"Bellecôte | 2026-04-01 | 22.6\n"+
		"\"Les Pins\" | 2026-04-02 | 17\n")
}

func TestTwoInOneTest(t *testing.T) {
	golden.InlineTable(t, daily(t, "19.5"), ` + "``" + `, assert.ByKey("house", "day"))
	golden.InlineTable(t, daily(t, "19.5").Slice(0, 1), ` + "``" + `)
}

func TestSubtests(t *testing.T) {
	for _, name := range []string{"first"} {
		t.Run(name, func(t *testing.T) {
			if true {
				golden.InlineTable(t, daily(t, "19.5"), ` + "``" + `,
					assert.ByKey("house", "day"), assert.Tol("tmax", 0.01, 0))
			}
		})
	}
}

func TestByHand(t *testing.T) {
	golden.InlineTable(t, daily(t, "19.5").Slice(2, 3), ` + "`" + `
		house:string | day:date | tmax:float64
		"Les Pins" | 2026-04-02 | 17
	` + "`" + `)
}
`

// inlineRefusals holds the calls whose literal cannot be located.
const inlineRefusals = `package try

import (
	"testing"

	"github.com/proofsheet/proofsheet/fixtures"
	"github.com/proofsheet/proofsheet/golden"
)

func TestTableDriven(t *testing.T) {
	cases := []struct{ in, want string }{{"a", ` + "``" + `}}
	for _, c := range cases {
		golden.InlineTable(t, fixtures.MustParse(t, "x:string\n"+c.in), c.want)
	}
}

func TestLoop(t *testing.T) {
	for _, v := range []string{"a", "b"} {
		golden.InlineTable(t, fixtures.MustParse(t, "x:string\n"+v), ` + "``" + `)
	}
}

func TestTwoOnALine(t *testing.T) {
	tb := fixtures.MustParse(t, "x:string\nc")
	golden.InlineTable(t, tb, ` + "``" + `); golden.InlineTable(t, tb, ` + "``" + `)
}
`

func TestInlineTableOnRealSources(t *testing.T) {
	if testing.Short() {
		t.Skip("runs go test on a module of its own")
	}
	dir := tryModule(t, map[string]string{"inline_test.go": inlineSource, "refusals_test.go": inlineRefusals})
	src := filepath.Join(dir, "inline_test.go")

	// Empty literals fail and say how to fill them; the file is unchanged.
	out, ok := goTest(t, dir, nil, "-run", "TestTwoInOneTest|TestSubtests|TestByHand", ".")
	require.False(t, ok, out)
	require.Contains(t, out, "inline_test.go:19 is empty")
	require.Contains(t, out, "-run '^TestTwoInOneTest$' -update")
	require.NotContains(t, out, "TestByHand", "the hand-written literal matches")
	data, err := os.ReadFile(src)
	require.NoError(t, err)
	require.Equal(t, inlineSource, string(data))

	// Under CI, -update is refused, as for golden files.
	out, ok = goTest(t, dir, []string{"CI=true"}, "-run", "TestTwoInOneTest", ".", "-update")
	require.False(t, ok, out)
	require.Contains(t, out, "Not updated: golden files are not updated in CI")
	data, err = os.ReadFile(src)
	require.NoError(t, err)
	require.Equal(t, inlineSource, string(data))

	// -update fills every empty literal at its call: gofmt-clean, the
	// indentation of the code around it kept, only the literals changed.
	out, ok = goTest(t, dir, nil, "-run", "TestTwoInOneTest|TestSubtests|TestByHand", ".", "-update")
	require.True(t, ok, out)
	data, err = os.ReadFile(src)
	require.NoError(t, err)
	filled := string(data)
	formatted, err := format.Source(data)
	require.NoError(t, err)
	require.Equal(t, string(formatted), filled, "gofmt-clean")
	require.Contains(t, filled, "\tgolden.InlineTable(t, daily(t, \"19.5\"), `\n"+
		"\t\t# proofsheet sheet v2\n"+
		"\t\t# keys: house, day\n"+
		"\t\t# rows: 3\n"+
		"\t\t# match: by key\n"+
		"\t\thouse:string | day:date   | tmax:float64\n"+
		"\t\tBellecôte    | 2026-04-01 | 22.6\n"+
		"\t\tKæreby       | 2026-04-01 | 19.5\n"+
		"\t\tLes Pins     | 2026-04-02 | 17\n"+
		"\t`, assert.ByKey(\"house\", \"day\"))\n", "rows sorted by key, padded, indented under the call")
	require.Contains(t, filled, "\tgolden.InlineTable(t, daily(t, \"19.5\").Slice(0, 1), `\n"+
		"\t\t# proofsheet sheet v2\n\t\t# keys: -\n\t\t# rows: 1\n\t\t# match: by position\n")
	require.Contains(t, filled, "\t\t\t\tgolden.InlineTable(t, daily(t, \"19.5\"), `\n\t\t\t\t\t# proofsheet sheet v2\n", "nested indentation kept")
	require.Contains(t, filled, "\t\t\t\t\t# tol: tmax=abs:0.01\n", "the rules are stored")
	require.Contains(t, filled, "\t\t\t\t`,\n\t\t\t\t\tassert.ByKey(\"house\", \"day\"), assert.Tol(\"tmax\", 0.01, 0))\n")
	require.Contains(t, filled, "func TestByHand(t *testing.T) {\n\tgolden.InlineTable(t, daily(t, \"19.5\").Slice(2, 3), `\n\t\thouse:string | day:date | tmax:float64\n", "an equal hand-written literal is left alone")
	outside := func(s string) string { return regexp.MustCompile("(?s)`.*?`").ReplaceAllString(s, "``") }
	require.Equal(t, outside(inlineSource), outside(filled), "nothing but the literals changed")

	// Later runs pass; a changed value fails with the table diff.
	out, ok = goTest(t, dir, nil, "-run", "TestTwoInOneTest|TestSubtests|TestByHand", ".")
	require.True(t, ok, out)
	changed := strings.Replace(filled, `daily(t, "19.5"), `+"`", `daily(t, "19.75"), `+"`", 1)
	require.NoError(t, os.WriteFile(src, []byte(changed), 0o644))
	out, ok = goTest(t, dir, nil, "-run", "TestTwoInOneTest", ".")
	require.False(t, ok, out)
	require.Contains(t, out, "got differs from the inline table at inline_test.go:")
	require.Regexp(t, `Kæreby +2026-04-01 +tmax +19\.5 +19\.75`, out)
	// Within the stored tolerance, the subtest still passes.
	within := strings.Replace(filled, "t.Run(name, func(t *testing.T) {\n\t\t\tif true {\n\t\t\t\tgolden.InlineTable(t, daily(t, \"19.5\")", "t.Run(name, func(t *testing.T) {\n\t\t\tif true {\n\t\t\t\tgolden.InlineTable(t, daily(t, \"19.505\")", 1)
	require.NotEqual(t, filled, within)
	require.NoError(t, os.WriteFile(src, []byte(within), 0o644))
	out, ok = goTest(t, dir, nil, "-run", "TestSubtests", ".")
	require.True(t, ok, out)

	// -update rewrites the literal that differs, and only it.
	require.NoError(t, os.WriteFile(src, []byte(changed), 0o644))
	out, ok = goTest(t, dir, nil, "-run", "TestTwoInOneTest", ".", "-update")
	require.True(t, ok, out)
	data, err = os.ReadFile(src)
	require.NoError(t, err)
	require.Contains(t, string(data), "\t\tKæreby       | 2026-04-01 | 19.75\n")
	require.Equal(t, strings.Count(filled, "\n"), strings.Count(string(data), "\n"))
	out, ok = goTest(t, dir, nil, "-run", "TestTwoInOneTest|TestSubtests|TestByHand", ".")
	require.True(t, ok, out)

	// Where the literal cannot be located uniquely, -update refuses and
	// says why; the file is untouched.
	before, err := os.ReadFile(filepath.Join(dir, "refusals_test.go"))
	require.NoError(t, err)
	out, ok = goTest(t, dir, nil, "-run", "TestTableDriven|TestLoop|TestTwoOnALine", ".", "-update")
	require.False(t, ok, out)
	require.Contains(t, out, "the want argument of the call at line 13 is c.want, not a string literal")
	require.Contains(t, out, "the call at line 19 ran again in this run with another table")
	require.Contains(t, out, "2 calls of InlineTable span line 25")
	after, err := os.ReadFile(filepath.Join(dir, "refusals_test.go"))
	require.NoError(t, err)
	require.NotEqual(t, string(before), string(after), "the loop's first table was written before the second was refused")
	require.Contains(t, string(after), "golden.InlineTable(t, fixtures.MustParse(t, \"x:string\\n\"+c.in), c.want)")
	require.Contains(t, string(after), "golden.InlineTable(t, tb, ``); golden.InlineTable(t, tb, ``)")
}

func TestDedentAndLiteral(t *testing.T) {
	require.Equal(t, "a | b\n  c\n", dedent("\n\t\ta | b\n\t\t  c\n\t"))
	require.Equal(t, "x\n", dedent("x"))
	require.Equal(t, "`\n\t\tx:string\n\t\ta\n\t`", inlineLiteral("x:string\na\n", "\t"))
	require.Equal(t, strconv.Quote("x:string\n\"`\"\n"), inlineLiteral("x:string\n\"`\"\n", "\t"), "a backquote needs a quoted literal")
	tb := fixtures.MustParse(t, "x:string\n\"`\"")
	text, err := encodeInline(tb, assert.Rules{Match: assert.MatchByPosition})
	require.NoError(t, err)
	back, _, err := decodeInline("t", text)
	require.NoError(t, err)
	require.True(t, assert.Compare(tb, back).Equal())
}

// artifactSource fails a table check, a golden check and an inline check.
const artifactSource = `package try

import (
	"testing"

	"github.com/proofsheet/proofsheet/assert"
	"github.com/proofsheet/proofsheet/fixtures"
	"github.com/proofsheet/proofsheet/golden"
)

func TestFails(t *testing.T) {
	want := fixtures.MustParse(t, "house:string | tmax:float64\nKæreby | 19.5\nBellecôte | 22.6")
	got := fixtures.MustParse(t, "house:string | tmax:float64\nKæreby | 19.75\nBellecôte | 22.6")
	assert.Tables(t, want, got, assert.ByKey("house"))
	golden.Table(t, "daily", got, assert.ByKey("house"))
	golden.InlineTable(t, got, ` + "`" + `
		house:string | tmax:float64
		Kæreby       | 19.5
		Bellecôte    | 22.6
	` + "`" + `)
}
`

func TestArtifactPages(t *testing.T) {
	if testing.Short() {
		t.Skip("runs go test on a module of its own")
	}
	stored, err := EncodeTableRules(fixtures.MustParse(t, "house:string | tmax:float64\nKæreby | 19.5\nBellecôte | 22.6"),
		assert.Rules{Match: assert.MatchByKey, Keys: []string{"house"}})
	require.NoError(t, err)
	dir := tryModule(t, map[string]string{"fails_test.go": artifactSource, "testdata/daily.gold.tbl": string(stored)})

	// Without -artifacts the failures name no page.
	out, ok := goTest(t, dir, nil, ".")
	require.False(t, ok, out)
	require.NotContains(t, out, "HTML diff page")

	// Source: Go 1.26 testing package documentation, T.ArtifactDir — with
	// -artifacts the directory is kept under the output directory
	// (-outputdir), as _artifacts/<package>/<test>/<random>.
	outDir := t.TempDir()
	out, ok = goTest(t, dir, nil, ".", "-artifacts", "-outputdir", outDir)
	require.False(t, ok, out)
	pages := regexp.MustCompile(`HTML diff page: (\S+)`).FindAllStringSubmatch(out, -1)
	require.Len(t, pages, 3, "one page per failing check: %s", out)
	seen := map[string]bool{}
	for _, m := range pages {
		p := m[1]
		require.False(t, seen[p], "each check has a page of its own")
		seen[p] = true
		require.True(t, strings.HasPrefix(p, filepath.Join(outDir, "_artifacts")), p)
		data, err := os.ReadFile(p)
		require.NoError(t, err, p)
		page := string(data)
		require.True(t, strings.HasPrefix(page, "<!DOCTYPE html>"))
		require.Contains(t, page, `class="ps-changed"`)
		require.Contains(t, page, `<svg class="`+assert.HTMLPicture+`"`)
		require.NotContains(t, page, "<script")
	}
}
