package main

import (
	"encoding/json"
	"encoding/xml"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/stretchr/testify/require"

	"github.com/proofsheet/proofsheet/assert"
	"github.com/proofsheet/proofsheet/fixtures"
	"github.com/proofsheet/proofsheet/golden"
)

func TestVersioned(t *testing.T) {
	cases := []struct{ in, want string }{
		{`{"a":1,"b":[1,2]}`, "{\n  \"schema_version\": 1,\n  \"a\": 1,\n  \"b\": [\n    1,\n    2\n  ]\n}\n"},
		{`{ }`, "{\n  \"schema_version\": 1\n}\n"},
		{`[{"a":1},{}]`, "[\n  {\n    \"schema_version\": 1,\n    \"a\": 1\n  },\n  {\n    \"schema_version\": 1\n  }\n]\n"},
	}
	for _, c := range cases {
		got, err := versioned([]byte(c.in))
		require.NoError(t, err)
		require.Equal(t, c.want, string(got))
	}
	_, err := versioned([]byte(`{"a":`))
	require.Error(t, err)
}

// junitDoc is the part of a JUnit XML report the tests read. Source: the
// element and attribute names CI services read from JUnit reports
// (testsuites, testsuite, testcase with name and classname; failure,
// error and skipped with a message), as Apache Ant's junitreport writes
// them — a convention, not a published standard.
type junitDoc struct {
	XMLName  xml.Name `xml:"testsuites"`
	Tests    int      `xml:"tests,attr"`
	Failures int      `xml:"failures,attr"`
	Errors   int      `xml:"errors,attr"`
	Suites   []struct {
		Name     string `xml:"name,attr"`
		Tests    int    `xml:"tests,attr"`
		Failures int    `xml:"failures,attr"`
		Errors   int    `xml:"errors,attr"`
		Cases    []struct {
			Name      string `xml:"name,attr"`
			ClassName string `xml:"classname,attr"`
			Failure   *struct {
				Message string `xml:"message,attr"`
				Text    string `xml:",chardata"`
			} `xml:"failure"`
			Error *struct {
				Message string `xml:"message,attr"`
			} `xml:"error"`
			Skipped *struct {
				Message string `xml:"message,attr"`
			} `xml:"skipped"`
			SystemErr string `xml:"system-err"`
		} `xml:"testcase"`
	} `xml:"testsuite"`
}

func readJUnit(t *testing.T, path string) junitDoc {
	t.Helper()
	data, err := os.ReadFile(path)
	require.NoError(t, err)
	require.True(t, strings.HasPrefix(string(data), `<?xml version="1.0" encoding="UTF-8"?>`), "%s", data)
	var doc junitDoc
	require.NoError(t, xml.Unmarshal(data, &doc), "%s", data)
	require.Len(t, doc.Suites, 1)
	return doc
}

func TestJUnitXML(t *testing.T) {
	s := &junitSuite{name: "proofsheet hammer", cases: []junitCase{
		{name: "runs", class: "proofsheet.hammer"},
		{name: "order-free", class: "proofsheet.hammer", failure: "order-free: outputs differ", detail: "a <b> & \"c\"\n\x1b[31mred\x1b[0m\x00"},
		{name: "agrees", class: "proofsheet.hammer", errMsg: "the reference program is missing"},
		{name: "idempotent", class: "proofsheet.hammer", skipped: "not asked", output: "stderr\n"},
	}}
	path := filepath.Join(t.TempDir(), "report.xml")
	require.NoError(t, s.write(path))
	doc := readJUnit(t, path)
	require.Equal(t, 4, doc.Tests)
	require.Equal(t, 1, doc.Failures)
	require.Equal(t, 1, doc.Errors)
	cs := doc.Suites[0].Cases
	require.Nil(t, cs[0].Failure)
	require.Equal(t, "order-free: outputs differ", cs[1].Failure.Message)
	// Source: XML 1.0 (Fifth Edition) §2.2 — Char excludes C0 controls but
	// tab, LF and CR, so ESC and NUL cannot appear even escaped.
	require.Equal(t, "a <b> & \"c\"\n\uFFFD[31mred\uFFFD[0m\uFFFD", cs[1].Failure.Text)
	require.Equal(t, "the reference program is missing", cs[2].Error.Message)
	require.Equal(t, "not asked", cs[3].Skipped.Message)
	require.Equal(t, "stderr\n", cs[3].SystemErr)
}

func TestDiffReports(t *testing.T) {
	dir := writeFiles(t, map[string]string{"want.csv": dailyWant, "got.csv": dailyGot})
	want, got := filepath.Join(dir, "want.csv"), filepath.Join(dir, "got.csv")
	junit := filepath.Join(dir, "diff.xml")
	summary := filepath.Join(dir, "summary.md")
	require.NoError(t, os.WriteFile(summary, []byte("earlier step\n"), 0o644))
	r := runBin(t, "", []string{stepSummaryVar + "=" + summary}, "diff", "--key", "house,day", "--junit", junit, "--format", "json", want, got)
	require.Equal(t, exitDiffers, r.code, r.stderr)

	var js struct {
		SchemaVersion *int `json:"schema_version"`
		Equal         bool `json:"equal"`
	}
	require.NoError(t, json.Unmarshal([]byte(r.stdout), &js))
	require.NotNil(t, js.SchemaVersion)
	require.Equal(t, jsonSchemaVersion, *js.SchemaVersion)
	require.True(t, strings.HasPrefix(r.stdout, "{\n  \"schema_version\": 1,\n"), r.stdout)

	doc := readJUnit(t, junit)
	require.Equal(t, 1, doc.Tests)
	require.Equal(t, 1, doc.Failures)
	c := doc.Suites[0].Cases[0]
	require.Equal(t, got+" against "+want, c.Name)
	require.Equal(t, "tables differ: 2 differing cells in 2 rows, 1 missing row, 1 extra row", c.Failure.Message)
	wt, _, err := fixtures.ReadFile(want)
	require.NoError(t, err)
	gt, _, err := fixtures.ReadFile(got)
	require.NoError(t, err)
	require.Equal(t, assert.Compare(wt, gt, assert.ByKey("house", "day")).Text(), c.Failure.Text, "the failure carries the text diff")

	data, err := os.ReadFile(summary)
	require.NoError(t, err)
	require.True(t, strings.HasPrefix(string(data), "earlier step\n## proofsheet diff: `"+got+"` against `"+want+"`\n\n**Tables differ"), "%s", data)

	// Equal tables: a passing case. Trouble: an error case, exit 2.
	r = runBin(t, "", noEnv, "diff", "--junit", junit, want, want)
	require.Equal(t, exitSame, r.code, r.stderr)
	doc = readJUnit(t, junit)
	require.Equal(t, 0, doc.Failures+doc.Errors)
	r = runBin(t, "", noEnv, "diff", "--junit", junit, want, filepath.Join(dir, "absent.csv"))
	require.Equal(t, exitTrouble, r.code)
	doc = readJUnit(t, junit)
	require.Equal(t, 1, doc.Errors)
	r = runBin(t, "", noEnv, "diff", "--junit", filepath.Join(dir, "no", "dir.xml"), want, want)
	require.Equal(t, exitTrouble, r.code)
	require.Contains(t, r.stderr, "--junit")

	r = runBin(t, "", nil, "profile", "--json", want, got)
	require.Equal(t, exitSame, r.code, r.stderr)
	var profiles []struct {
		SchemaVersion int    `json:"schema_version"`
		Path          string `json:"path"`
	}
	require.NoError(t, json.Unmarshal([]byte(r.stdout), &profiles))
	require.Len(t, profiles, 2)
	require.Equal(t, jsonSchemaVersion, profiles[1].SchemaVersion)
}

func TestChangesUnderStoredRules(t *testing.T) {
	tb := func(tmax string) *fixtures.Table {
		return fixtures.MustParse(t, "house:string | day:date | tmax:float64\nÉtang | 2026-04-01 | "+tmax+"\nLes Pins | 2026-04-01 | 18.25")
	}
	enc := func(tb *fixtures.Table, opts ...assert.Option) string {
		data, err := golden.EncodeTableRules(tb, assert.RulesOf(opts...))
		require.NoError(t, err)
		return string(data)
	}
	tight := []assert.Option{assert.ByKey("house", "day"), assert.Tol("tmax", 1e-9, 0)}
	wide := []assert.Option{assert.ByKey("house", "day"), assert.Tol("tmax", 0.5, 0)}
	repo := newRepo(t, map[string]string{
		"pkg/testdata/noise.gold.tbl": enc(tb("21.5"), tight...),
		"pkg/testdata/wider.gold.tbl": enc(tb("21.5"), tight...),
	})
	writeTree(t, repo, map[string]string{
		"pkg/testdata/noise.gold.tbl": enc(tb("21.500000000000004"), tight...),
		"pkg/testdata/wider.gold.tbl": enc(tb("21.75"), wide...),
	})
	junit := filepath.Join(t.TempDir(), "changes.xml")
	r := runBin(t, repo, noEnv, "changes", "--format", "text", "--junit", junit)
	require.Equal(t, exitDiffers, r.code, r.stderr)
	// No --tol: the stored tolerance applies, so noise is no change.
	require.Contains(t, r.stdout, "1 golden file differs: 1 changed; 1 unchanged within tolerance")
	require.Contains(t, r.stdout, "stored rules changed: tmax=abs:1e-09 → tmax=abs:0.5")
	require.Contains(t, r.stdout, "compared under: rows by key house, day; tmax=abs:0.5")
	doc := readJUnit(t, junit)
	require.Equal(t, 2, doc.Tests)
	require.Equal(t, 1, doc.Failures)
	cs := doc.Suites[0].Cases
	require.Equal(t, "pkg/testdata/noise.gold.tbl", cs[0].Name)
	require.Nil(t, cs[0].Failure)
	require.Equal(t, "pkg/testdata/wider.gold.tbl", cs[1].Name)
	require.Equal(t, "changed: stored rules changed; max abs. diff 0.25 (tmax)", cs[1].Failure.Message)
	require.Contains(t, cs[1].Failure.Text, "before")

	r = runBin(t, repo, noEnv, "changes", "--format", "json")
	require.Equal(t, exitDiffers, r.code, r.stderr)
	require.True(t, strings.HasPrefix(r.stdout, "{\n  \"schema_version\": 1,\n"), r.stdout)

	r = runBin(t, repo, noEnv, "review")
	require.Equal(t, exitTrouble, r.code)
	require.Contains(t, r.stderr, "now called changes")
}
