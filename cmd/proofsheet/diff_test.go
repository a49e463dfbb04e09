package main

import (
	"encoding/json"
	"fmt"
	"os"
	"path/filepath"
	"runtime"
	"strings"
	"testing"

	"github.com/stretchr/testify/require"

	"github.com/proofsheet/proofsheet/assert"
	"github.com/proofsheet/proofsheet/fixtures"
	"github.com/proofsheet/proofsheet/internal/textwidth"
)

// writeFiles writes files into a fresh temporary directory and returns it.
func writeFiles(t *testing.T, files map[string]string) string {
	t.Helper()
	dir := t.TempDir()
	for name, content := range files {
		p := filepath.Join(dir, filepath.FromSlash(name))
		require.NoError(t, os.MkdirAll(filepath.Dir(p), 0o755))
		require.NoError(t, os.WriteFile(p, []byte(content), 0o644))
	}
	return dir
}

const (
	dailyWant = "house,day,tmax,kept\nÉtang,2026-04-01,21.5,140\nLes Pins,2026-04-01,18.25,139\nMas,2026-04-02,17,120\n"
	// Rows reordered; Les Pins tmax off by 0.05, Étang kept off by one,
	// Mas gone and Ruche new.
	dailyGot = "house,day,tmax,kept\nLes Pins,2026-04-01,18.3,139\nÉtang,2026-04-01,21.5,141\nRuche,2026-04-02,17,120\n"
)

func TestDiffExitStatusAndFormats(t *testing.T) {
	dir := writeFiles(t, map[string]string{"want.csv": dailyWant, "got.csv": dailyGot})
	want, got := filepath.Join(dir, "want.csv"), filepath.Join(dir, "got.csv")

	// Source: POSIX diff(1), EXIT STATUS — 0 no differences, 1 differences,
	// >1 an error.
	r := runBin(t, "", nil, "diff", want, want)
	require.Equal(t, exitSame, r.code, r.stderr)
	require.Contains(t, r.stdout, "tables are equal (3 rows, 4 columns compared)")

	r = runBin(t, "", nil, "diff", "--key", "house,day", want, got)
	require.Equal(t, exitDiffers, r.code, r.stderr)
	require.Empty(t, r.stderr)
	require.Contains(t, r.stdout, "tables differ: 2 differing cells in 2 rows, 1 missing row, 1 extra row")
	require.Regexp(t, `(?m)^  Les Pins +2026-04-01 +tmax +18\.25 +18\.3 +0\.05`, r.stdout)
	require.NotContains(t, r.stdout, "\x1b[", "no colour into a pipe")

	// The JSON is the Diff's JSON: the same as assert writes for the same
	// tables and options.
	r = runBin(t, "", nil, "diff", "--key", "house,day", "--format", "json", want, got)
	require.Equal(t, exitDiffers, r.code, r.stderr)
	wt, _, err := fixtures.ReadFile(want)
	require.NoError(t, err)
	gt, _, err := fixtures.ReadFile(got)
	require.NoError(t, err)
	js, err := assert.Compare(wt, gt, assert.ByKey("house", "day")).JSON()
	require.NoError(t, err)
	js, err = versioned(js) // with "schema_version" first
	require.NoError(t, err)
	require.Equal(t, string(js), r.stdout)

	r = runBin(t, "", nil, "diff", "--key", "house,day", "--format", "markdown", want, got)
	require.Equal(t, exitDiffers, r.code)
	require.True(t, strings.HasPrefix(r.stdout, "**Tables differ: "), r.stdout)
	require.Contains(t, r.stdout, "| `Étang` | `2026-04-01` | `kept` | `140` | `141` |")

	r = runBin(t, "", nil, "diff", "--key", "house,day", "--format", "html", want, got)
	require.Equal(t, exitDiffers, r.code)
	require.True(t, strings.HasPrefix(r.stdout, "<!DOCTYPE html>"))
	require.Equal(t, 2, strings.Count(r.stdout, `class="`+assert.HTMLChangedCell+`"`))
	require.Contains(t, r.stdout, "1 table differs")
}

// TestDiffHints checks that the command line shows each hint with the
// flag that fixes it in every output format (text, Markdown, HTML, JSON),
// and shows none where the hint does not fit.
func TestDiffHints(t *testing.T) {
	dir := writeFiles(t, map[string]string{
		"want.csv":     dailyWant,
		"shuffled.csv": "house,day,tmax,kept\nMas,2026-04-02,17,120\nÉtang,2026-04-01,21.5,140\nLes Pins,2026-04-01,18.25,139\n",
		// In another order, and Mas's kept changed: not the same rows.
		"shuffled-changed.csv": "house,day,tmax,kept\nMas,2026-04-02,17,121\nÉtang,2026-04-01,21.5,140\nLes Pins,2026-04-01,18.25,139\n",
		"floats.csv":           "house,day,tmax,kept\nÉtang,2026-04-01,21.5,140.0\nLes Pins,2026-04-01,18.25,139.5\nMas,2026-04-02,17,120.0\n",
		"pct.csv":              "house,day,tmax,kept\nÉtang,2026-04-01,2150,140\nLes Pins,2026-04-01,1825,139\nMas,2026-04-02,1700,120\n",
		"drift.csv":            "house,day,tmax,kept\nÉtang,2026-04-01,21.7,140\nLes Pins,2026-04-01,18.2,139\nMas,2026-04-02,17.9,120\n",
		// Source: WHATWG Encoding Standard — É is C3 89 in UTF-8; read as
		// windows-1252 those bytes are Ã (U+00C3) and ‰ (U+2030).
		"mojibake.csv":    "house,day,tmax,kept\nÃ‰tang,2026-04-01,21.5,140\nLes Pins,2026-04-01,18.25,139\nMas,2026-04-02,17,120\n",
		"other-house.csv": "house,day,tmax,kept\nOrée,2026-04-01,21.5,140\nLes Pins,2026-04-01,18.25,139\nMas,2026-04-02,17,120\n",
		"renamed.csv":     "house,day,t_max,kept\nÉtang,2026-04-01,21.5,140\nLes Pins,2026-04-01,18.25,139\nMas,2026-04-02,17,120\n",
		"replaced.csv":    "house,day,status,kept\nÉtang,2026-04-01,ok,140\nLes Pins,2026-04-01,ok,139\nMas,2026-04-02,ok,120\n",
	})
	f := func(name string) string { return filepath.Join(dir, name) }
	key := []string{"--key", "house,day"}
	cases := []struct {
		name  string
		args  []string
		kind  string   // the hint's kind in the JSON
		shows []string // in the text, the first also in Markdown and HTML
		not   bool     // the hint must not be given
	}{
		{"rows in another order", []string{f("want.csv"), f("shuffled.csv")}, "row_order",
			[]string{"the tables hold the same rows in another order", "fix: --key house or --any-row-order"}, false},
		{"rows in another order, one changed", []string{f("want.csv"), f("shuffled-changed.csv")}, "row_order", nil, true},
		{"int64 became float64", append(key, f("want.csv"), f("floats.csv")), "loose_types",
			[]string{`column "kept" is int64 in want and float64 in got`, "fix: --loose-types"}, false},
		{"int64 became float64, loose types given", append(key, "--loose-types", f("want.csv"), f("floats.csv")), "loose_types", nil, true},
		{"a column ×100", append(key, f("want.csv"), f("pct.csv")), "scale",
			[]string{`every cell of column "tmax" in got is its want cell × 100`}, false},
		{"a column drifted", append(key, f("want.csv"), f("drift.csv")), "scale", nil, true},
		{"a key in another encoding", append(key, f("want.csv"), f("mojibake.csv")), "near_match",
			[]string{"differ only by encoding", "⇄"}, false},
		{"another key", append(key, f("want.csv"), f("other-house.csv")), "near_match", nil, true},
		{"a column renamed", append(key, f("want.csv"), f("renamed.csv")), "renamed",
			[]string{`column "tmax" is missing from got and "t_max" is extra`}, false},
		{"a column replaced", append(key, f("want.csv"), f("replaced.csv")), "renamed", nil, true},
		{"no hint", append(key, f("want.csv"), f("want.csv")), "", nil, true},
	}
	words := map[string]string{ // what each kind says, in every format
		"row_order": "same rows in another order", "loose_types": "with loose types", "scale": "in got is its want cell",
		"near_match": "differ only by", "renamed": "the same column renamed?",
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			outs := map[string]string{}
			for _, format := range []string{"text", "markdown", "html", "json"} {
				r := runBin(t, "", nil, append([]string{"diff", "--format", format}, c.args...)...)
				require.Empty(t, r.stderr)
				require.Contains(t, []int{exitSame, exitDiffers}, r.code)
				outs[format] = r.stdout
			}
			var js struct {
				Hints []struct {
					Kind, Text, Flag string
				} `json:"hints"`
			}
			require.NoError(t, json.Unmarshal([]byte(outs["json"]), &js))
			var kinds []string
			for _, h := range js.Hints {
				kinds = append(kinds, h.Kind)
			}
			if c.not {
				require.NotContains(t, kinds, c.kind)
				require.NotContains(t, outs["html"], `data-hint="`+c.kind+`"`)
				for format, out := range outs {
					if w := words[c.kind]; w != "" {
						require.NotContains(t, out, w, format)
					}
				}
				if c.kind == "" {
					require.Empty(t, kinds)
					require.NotContains(t, outs["text"], "hint")
					require.NotContains(t, outs["markdown"], "Hint")
					require.NotContains(t, outs["html"], `class="ps-hint`)
				}
				return
			}
			require.Contains(t, kinds, c.kind)
			require.Contains(t, outs["html"], `data-hint="`+c.kind+`"`)
			for _, s := range c.shows {
				require.Contains(t, outs["text"], s)
			}
			for format, out := range outs {
				require.Contains(t, out, words[c.kind], format)
			}
			require.NotContains(t, outs["text"], "fix: AnyRowOrder", "the command line names flags")
			for _, h := range js.Hints {
				if h.Flag != "" {
					require.True(t, strings.HasPrefix(h.Flag, "--"), h.Flag)
					require.Contains(t, outs["markdown"], h.Flag)
				}
			}
		})
	}

	// A misspelt key is trouble, with the closest name; one with nothing
	// close is trouble without a guess.
	r := runBin(t, "", nil, "diff", "--key", "hause", f("want.csv"), f("want.csv"))
	require.Equal(t, exitTrouble, r.code)
	require.Contains(t, r.stderr, `did you mean "house"?`)
	r = runBin(t, "", nil, "diff", "--key", "zone", f("want.csv"), f("want.csv"))
	require.Equal(t, exitTrouble, r.code)
	require.NotContains(t, r.stderr, "did you mean")
}

func TestDiffOptions(t *testing.T) {
	dir := writeFiles(t, map[string]string{
		"want.csv":     dailyWant,
		"got.csv":      dailyGot,
		"noise.csv":    "house,day,tmax,kept\nÉtang,2026-04-01,21.500000000000004,140\nLes Pins,2026-04-01,18.25,139\nMas,2026-04-02,17,120\n",
		"shuffled.csv": "house,day,tmax,kept\nMas,2026-04-02,17,120\nÉtang,2026-04-01,21.5,140\nLes Pins,2026-04-01,18.25,139\n",
		"extra.csv":    "house,day,tmax,kept,note\nÉtang,2026-04-01,21.5,140,ok\nLes Pins,2026-04-01,18.25,139,ok\nMas,2026-04-02,17,120,ok\n",
		"floats.csv":   "house,day,tmax,kept\nÉtang,2026-04-01,21.5,140.0\nLes Pins,2026-04-01,18.25,139.0\nMas,2026-04-02,17,120.0\n",
		"trail.csv":    "id,v\n1,1.50\n2,2.0\n",
		"short.csv":    "id,v\n1,1.5\n2,2\n",
	})
	f := func(name string) string { return filepath.Join(dir, name) }
	cases := []struct {
		name string
		args []string
		code int
		has  string
	}{
		{"noise fails exactly", []string{f("want.csv"), f("noise.csv")}, exitDiffers, "1 differing cell"},
		{"noise within a relative tolerance", []string{"--tol", "tmax=rel:1e-12", f("want.csv"), f("noise.csv")}, exitSame, "tables are equal"},
		{"noise within an absolute tolerance for every float", []string{"--tol", "*=abs:1e-9", f("want.csv"), f("noise.csv")}, exitSame, "tables are equal"},
		{"noise within ULPs", []string{"--tol", "tmax=ulp:1", f("want.csv"), f("noise.csv")}, exitSame, "tables are equal"},
		{"tolerance too small", []string{"--tol", "tmax=abs:1e-18", f("want.csv"), f("noise.csv")}, exitDiffers, "abs. diff ≤ 1e-18"},
		{"row order by position", []string{f("want.csv"), f("shuffled.csv")}, exitDiffers, "differing cells"},
		{"any row order", []string{"--any-row-order", f("want.csv"), f("shuffled.csv")}, exitSame, "rows matched in any order"},
		{"by key", []string{"--key", "house, day", f("want.csv"), f("shuffled.csv")}, exitSame, "rows matched by key (house, day)"},
		{"an extra column", []string{f("want.csv"), f("extra.csv")}, exitDiffers, "extra in got"},
		{"an ignored column", []string{"--ignore", "note", f("want.csv"), f("extra.csv")}, exitSame, "tables are equal"},
		{"a type change", []string{f("want.csv"), f("floats.csv")}, exitDiffers, "type changed"},
		{"loose types", []string{"--loose-types", f("want.csv"), f("floats.csv")}, exitSame, "tables are equal"},
		{"inferred numbers", []string{"--loose-types", f("trail.csv"), f("short.csv")}, exitSame, "tables are equal"},
		{"as text", []string{"--as-text", f("trail.csv"), f("short.csv")}, exitDiffers, "1.50"},
		{"max cells", []string{"--max-cells", "1", f("want.csv"), f("shuffled.csv")}, exitDiffers, "first 1 shown"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			r := runBin(t, "", nil, append([]string{"diff"}, c.args...)...)
			require.Equal(t, c.code, r.code, "stdout: %s\nstderr: %s", r.stdout, r.stderr)
			require.Contains(t, r.stdout, c.has)
		})
	}
}

func TestDiffAcrossFormats(t *testing.T) {
	dir := writeFiles(t, map[string]string{"want.csv": dailyWant})
	tb, _, err := fixtures.ReadFile(filepath.Join(dir, "want.csv"))
	require.NoError(t, err)
	for _, name := range []string{"same.parquet", "same.arrow", "same.jsonl", "same.json", "same.tsv"} {
		require.NoError(t, fixtures.WriteFile(filepath.Join(dir, name), tb))
		args := []string{"diff", filepath.Join(dir, "want.csv"), filepath.Join(dir, name)}
		if strings.HasPrefix(filepath.Ext(name), ".json") {
			// JSON has no date type: its dates read back as text.
			args = append(args, "--as-text")
		}
		r := runBin(t, "", nil, args...)
		require.Equal(t, exitSame, r.code, "%s: %s%s", name, r.stdout, r.stderr)
	}
	changed, err := tb.SortBy("kept")
	require.NoError(t, err)
	require.NoError(t, fixtures.WriteFile(filepath.Join(dir, "sorted.parquet"), changed))
	r := runBin(t, "", nil, "diff", "--format", "json", filepath.Join(dir, "want.csv"), filepath.Join(dir, "sorted.parquet"))
	require.Equal(t, exitDiffers, r.code, r.stderr)
	var js struct {
		Equal          bool `json:"equal"`
		CellsDiffering int  `json:"cells_differing"`
	}
	require.NoError(t, json.Unmarshal([]byte(r.stdout), &js))
	require.False(t, js.Equal)
	require.Positive(t, js.CellsDiffering)
}

func TestDiffOut(t *testing.T) {
	dir := writeFiles(t, map[string]string{"want.csv": dailyWant, "got.csv": dailyGot, "report.md": "earlier report\n"})
	out := filepath.Join(dir, "report.md")
	r := runBin(t, "", nil, "diff", "--format", "markdown", "--out", out, filepath.Join(dir, "want.csv"), filepath.Join(dir, "got.csv"))
	require.Equal(t, exitDiffers, r.code, r.stderr)
	require.Empty(t, r.stdout, "the report goes to the file")
	data, err := os.ReadFile(out)
	require.NoError(t, err)
	require.True(t, strings.HasPrefix(string(data), "**Tables differ"))
	entries, err := os.ReadDir(dir)
	require.NoError(t, err)
	require.Len(t, entries, 3, "no temporary file left behind")
}

// TestDiffListsEveryCell lists every differing cell of tables larger
// than a Diff holds at once, in every format, to a file and to stdout.
func TestDiffListsEveryCell(t *testing.T) {
	var w, g strings.Builder
	w.WriteString("id,tmax\n")
	g.WriteString("id,tmax\n")
	const n = 3000
	for i := range n {
		fmt.Fprintf(&w, "%d,%g\n", i, 10+float64(i)/8)
		fmt.Fprintf(&g, "%d,%g\n", i, 10.5+float64(i)/8)
	}
	dir := writeFiles(t, map[string]string{"want.csv": w.String(), "got.csv": g.String()})
	want, got := filepath.Join(dir, "want.csv"), filepath.Join(dir, "got.csv")
	wt, _, err := fixtures.ReadFile(want)
	require.NoError(t, err)
	gt, _, err := fixtures.ReadFile(got)
	require.NoError(t, err)
	d := assert.Compare(wt, gt, assert.ListLimit(-1))
	require.Equal(t, n, d.Cells.Len())
	for _, format := range []string{"text", "markdown", "json", "html"} {
		out := filepath.Join(dir, "report."+format)
		r := runBin(t, "", nil, "diff", "--max-cells", "-1", "--format", format, "--out", out, want, got)
		require.Equal(t, exitDiffers, r.code, r.stderr)
		data, err := os.ReadFile(out)
		require.NoError(t, err)
		page := string(data)
		switch format {
		case "text":
			require.Equal(t, d.Text(), page)
		case "markdown":
			require.Equal(t, d.Markdown(), page)
		case "json":
			js, err := d.JSON()
			require.NoError(t, err)
			js, err = versioned(js)
			require.NoError(t, err)
			require.True(t, string(js) == page, "the streamed JSON is the Diff's JSON with schema_version first")
		case "html":
			require.Equal(t, n, strings.Count(page, `class="`+assert.HTMLChangedCell+`"`))
		}
		r = runBin(t, "", nil, "diff", "--max-cells", "-1", "--format", format, want, got)
		require.Equal(t, exitDiffers, r.code, r.stderr)
		require.Equal(t, page, r.stdout, "stdout gets what the file gets")
	}
}

func TestDiffBadInput(t *testing.T) {
	dir := writeFiles(t, map[string]string{
		"want.csv":   dailyWant,
		"got.csv":    dailyGot,
		"x.dat":      "a,b\n1,\x00\n",
		"ragged.csv": "a,b\n1,2\n3\n",
		"keep.md":    "earlier report\n",
	})
	f := func(name string) string { return filepath.Join(dir, name) }
	keep := f("keep.md")
	cases := []struct {
		name string
		args []string
		msg  string
	}{
		{"one file", []string{f("want.csv")}, "want two files"},
		{"three files", []string{f("want.csv"), f("got.csv"), f("got.csv")}, "want two files"},
		{"missing file", []string{f("want.csv"), f("absent.csv")}, "absent.csv: cannot read the file"},
		{"unknown extension, bad bytes", []string{f("want.csv"), f("x.dat")}, "x.dat:2:3: NUL byte in the text"},
		{"bad csv", []string{f("want.csv"), f("ragged.csv")}, "ragged.csv:3"},
		{"unknown format", []string{"--format", "xml", f("want.csv"), f("got.csv")}, `--format "xml": unknown format`},
		{"bad tol: no rule", []string{"--tol", "tmax", f("want.csv"), f("got.csv")}, `--tol "tmax": want COLUMN=RULE`},
		{"bad tol: kind", []string{"--tol", "tmax=near:0.1", f("want.csv"), f("got.csv")}, `unknown rule kind "near"`},
		{"bad tol: negative", []string{"--tol", "tmax=abs:-1", f("want.csv"), f("got.csv")}, "want a finite number ≥ 0"},
		{"bad tol: mixed ulp", []string{"--tol", "tmax=ulp:2,abs:1", f("want.csv"), f("got.csv")}, "ulp stands alone"},
		{"key and any order", []string{"--key", "house", "--any-row-order", f("want.csv"), f("got.csv")}, "exclude each other"},
		{"empty key", []string{"--key", ",", f("want.csv"), f("got.csv")}, "--key: no column named"},
		{"a key in neither file", []string{"--key", "hause", f("want.csv"), f("got.csv")}, `no column "hause" in either file: did you mean "house"? (want: house, day, tmax, kept;`},
		{"a tolerance for no column", []string{"--tol", "tmx=abs:1", f("want.csv"), f("got.csv")}, `no column "tmx"`},
		{"ignoring no column", []string{"--ignore", "nte", f("want.csv"), f("got.csv")}, `no column "nte"`},
		{"bad max-cells", []string{"--max-cells", "many", f("want.csv"), f("got.csv")}, "invalid value"},
		{"out is a directory", []string{"--out", dir, f("want.csv"), f("got.csv")}, "is a directory"},
		{"out in no directory", []string{"--out", filepath.Join(dir, "no", "such", "r.md"), f("want.csv"), f("got.csv")}, "no directory"},
		{"empty delimiter", []string{"--delimiter", "", f("want.csv"), f("got.csv")}, `--delimiter "": want one character`},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			args := append([]string{"diff"}, c.args...)
			if !strings.HasPrefix(c.name, "out ") {
				args = append([]string{"diff", "--out", keep}, c.args...)
			}
			r := runBin(t, "", nil, args...)
			require.Equal(t, exitTrouble, r.code, "stdout: %s", r.stdout)
			require.Contains(t, r.stderr, c.msg)
			require.NotContains(t, r.stderr, "panic")
			require.Empty(t, r.stdout)
			data, err := os.ReadFile(keep)
			require.NoError(t, err)
			require.Equal(t, "earlier report\n", string(data), "--out is untouched on failure")
		})
	}
}

// TestDiffOutNotWritable: an --out file that cannot be written is named
// (not the temporary file) and refused before the files are even read:
// here WANT does not exist, and the error is about --out.
func TestDiffOutNotWritable(t *testing.T) {
	if runtime.GOOS != "linux" {
		t.Skip("uses /sys, where nobody may make files")
	}
	dir := writeFiles(t, map[string]string{"got.csv": dailyGot})
	out := "/sys/proofsheet-report.md"
	r := runBin(t, "", nil, "diff", "--out", out, filepath.Join(dir, "absent.csv"), filepath.Join(dir, "got.csv"))
	require.Equal(t, exitTrouble, r.code)
	require.Equal(t, "proofsheet diff: --out /sys/proofsheet-report.md: permission denied\n", r.stderr)
	r = runBin(t, "", nil, "diff", "--junit", "/sys/proofsheet-junit.xml", filepath.Join(dir, "absent.csv"), filepath.Join(dir, "got.csv"))
	require.Equal(t, exitTrouble, r.code)
	require.Equal(t, "proofsheet diff: --junit /sys/proofsheet-junit.xml: permission denied\n", r.stderr)
}

// TestDiffKeepsKeysWhole checks that the command line's text report,
// 100 columns wide, shows every key whole and shortens other cells.
func TestDiffKeepsKeysWhole(t *testing.T) {
	house := "Château-Rouge-sur-la-Colline-des-Trois-Moulins"
	bay := "travée nord numéro douze du bâtiment historique"
	note := strings.Repeat("a long note that may be shortened ", 4)
	dir := writeFiles(t, map[string]string{
		"want.csv": "house,bay,day,tmax,note\n" + house + "," + bay + ",2026-04-01,21.5," + note + "\n" + house + "," + bay + ",2026-04-02,20," + note + "\n",
		"got.csv":  "house,bay,day,tmax,note\n" + house + "," + bay + ",2026-04-01,22.5," + note + "!\n" + house + "," + bay + ",2026-04-03,20," + note + "\n",
	})
	r := runBin(t, "", nil, "diff", "--key", "house,bay,day", filepath.Join(dir, "want.csv"), filepath.Join(dir, "got.csv"))
	require.Equal(t, exitDiffers, r.code, r.stderr)
	for _, k := range []string{house, bay, "2026-04-01", "2026-04-02", "2026-04-03"} {
		require.Contains(t, r.stdout, k)
	}
	require.Contains(t, r.stdout, "("+house+", "+bay+", 2026-04-01)", "the column summary names the whole key")
	require.NotContains(t, r.stdout, note+"!", "the note, not a key, is shortened")
	// Every line fits in 100 columns, except a line of keys that need
	// the room.
	for _, l := range strings.Split(r.stdout, "\n") {
		if textwidth.Width(l) > 100 {
			require.Contains(t, l, house, "a line wider than 100 columns without a key: %q", l)
		}
	}

	// The other formats cut nothing: every key whole, also in the column
	// summary.
	for _, format := range []string{"markdown", "html", "json"} {
		r := runBin(t, "", nil, "diff", "--format", format, "--key", "house,bay,day", filepath.Join(dir, "want.csv"), filepath.Join(dir, "got.csv"))
		require.Equal(t, exitDiffers, r.code, r.stderr)
		for _, k := range []string{house, bay, "2026-04-01", "2026-04-02", "2026-04-03"} {
			require.Contains(t, r.stdout, k, format)
		}
		if format == "markdown" {
			require.Contains(t, r.stdout, "1 at ("+house+", "+bay+", 2026-04-01)")
		}
	}
}
