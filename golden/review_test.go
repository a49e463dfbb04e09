package golden

import (
	"encoding/json"
	"fmt"
	"os"
	"path/filepath"
	"slices"
	"strconv"
	"strings"
	"testing"

	"github.com/stretchr/testify/require"

	"github.com/proofsheet/proofsheet/assert"
	"github.com/proofsheet/proofsheet/fixtures"
	"github.com/proofsheet/proofsheet/internal/textwidth"
)

const reviewOld = `# proofsheet sheet v1
# keys: house, day
# rows: 3
house:string | day:date | tmax:float64 | kept:int64
Les Pins | 2026-04-01 | 18.25 | 140
Mas | 2026-04-01 | 17 | 139
Étang | 2026-04-01 | 21.5 | 140
`

func change(path, old, cur string) FileChange {
	return FileChange{Path: path, Old: []byte(old), New: []byte(cur), OldExists: old != "", NewExists: cur != ""}
}

func TestReviewChange(t *testing.T) {
	cellChanged := strings.Replace(reviewOld, "21.5 | 140", "22 | 140", 1)
	noise := strings.Replace(reviewOld, "18.25", "18.250000000000004", 1)
	reordered := strings.Replace(reviewOld, "Les Pins | 2026-04-01 | 18.25 | 140\nMas | 2026-04-01 | 17 | 139\n", "Mas | 2026-04-01 | 17 | 139\nLes Pins | 2026-04-01 | 18.25 | 140\n", 1)
	rowAdded := strings.Replace(reviewOld, "# rows: 3", "# rows: 4", 1) + "Ruche | 2026-04-02 | ~ | 0\n"
	keysDrift := strings.Replace(reviewOld, "# keys: house, day", "# keys: house", 1)
	badCount := strings.Replace(reviewOld, "# rows: 3", "# rows: 5", 1)
	cases := []struct {
		name     string
		c        FileChange
		opts     []assert.Option
		status   ReviewStatus
		check    func(t *testing.T, f FileReview)
		summary  string
		problems int
	}{
		{"one cell of a table", change("d/daily.gold.tbl", reviewOld, cellChanged), nil, ReviewChanged, func(t *testing.T, f FileReview) {
			require.Equal(t, 1, f.Diff.CellsDiffering)
			require.Equal(t, []string{"Étang", "2026-04-01"}, f.Diff.Cells.At(0).Row.Key, "rows matched by the file's keys")
			require.Equal(t, assert.MatchByKey, f.Diff.Match)
			require.Equal(t, 3, f.OldRows)
			require.Equal(t, 3, f.NewRows)
		}, "1 differing cell in 1 row; max abs. diff 0.5 (tmax)", 0},
		{"float noise without a tolerance", change("d/daily.gold.tbl", reviewOld, noise), nil, ReviewChanged, nil, "", 0},
		{"float noise within a tolerance", change("d/daily.gold.tbl", reviewOld, noise), []assert.Option{assert.Tol("*", 0, 1e-12)}, ReviewUnchanged, nil, "equal within tolerance; max abs. diff 3.55e-15 (tmax)", 0},
		{"rows reordered under a key", change("d/daily.gold.tbl", reviewOld, reordered), nil, ReviewUnchanged, nil, "equal within tolerance", 0},
		{"a row added", change("d/daily.gold.tbl", reviewOld, rowAdded), nil, ReviewChanged, func(t *testing.T, f FileReview) {
			require.Equal(t, 1, f.Diff.Extra.Count)
			require.Equal(t, "3 → 4", f.Rows())
		}, "1 extra row", 0},
		{"key columns changed", change("d/daily.gold.tbl", reviewOld, keysDrift), nil, ReviewUnchanged, func(t *testing.T, f FileReview) {
			require.Equal(t, []string{"house", "day"}, f.OldKeys)
			require.Equal(t, []string{"house"}, f.NewKeys)
		}, "equal within tolerance", 0},
		{"a new table", change("d/new.gold.tbl", "", reviewOld), nil, ReviewNew, func(t *testing.T, f FileReview) {
			require.Equal(t, []string{"house:string", "day:date", "tmax:float64", "kept:int64"}, f.Columns)
			require.Len(t, f.Preview, 3)
			require.Equal(t, []string{"Les Pins", "2026-04-01", "18.25", "140"}, f.Preview[0])
			require.Equal(t, "— → 3", f.Rows())
		}, "new table, 3 rows × 4 columns", 0},
		{"a removed table", change("d/old.gold.tbl", reviewOld, ""), nil, ReviewRemoved, nil, "removed table, 3 rows × 4 columns", 0},
		{"an unreadable table", change("d/daily.gold.tbl", reviewOld, badCount), nil, ReviewChanged, nil, "", 1},
		{"text lines", change("r/summary.gold.txt", "a\nb\nc\nd\ne\nf\ng\nh\ni\nj\n", "a\nb\nc\nd\nE\nf\ng\nh\ni\nj\nk\n"), nil, ReviewChanged, func(t *testing.T, f FileReview) {
			require.Equal(t, 2, f.Added)
			require.Equal(t, 1, f.Removed)
			var marks strings.Builder
			for _, l := range f.Lines {
				marks.WriteRune(l.Mark)
			}
			// Changes 6 lines apart form one group; three lines of context
			// before it, the line above them elided.
			require.Equal(t, "…   -+     +", marks.String())
			require.Equal(t, ReviewLine{Mark: '…', Text: "1 unchanged line"}, f.Lines[0])
			require.Equal(t, ReviewLine{Mark: '-', Old: 5, Text: "e"}, f.Lines[4])
			require.Equal(t, ReviewLine{Mark: '+', New: 5, Text: "E"}, f.Lines[5])
			require.Equal(t, ReviewLine{Mark: '+', New: 11, Text: "k"}, f.Lines[len(f.Lines)-1])
		}, "+2 −1 lines", 0},
		{"text with a trailing blank", change("r/x.gold.txt", "a\n", "a \n"), nil, ReviewChanged, func(t *testing.T, f FileReview) {
			require.Equal(t, `"a "`, f.Lines[1].Text, "invisible content is quoted")
		}, "+1 −1 lines", 0},
		{"new text", change("r/new.gold.txt", "", "one\ntwo\n"), nil, ReviewNew, func(t *testing.T, f FileReview) {
			require.Equal(t, [][]string{{"one"}, {"two"}}, f.Preview)
		}, "new text file, 2 lines", 0},
		{"JSON respaced", change("j/season.gold.json", `{"a": 1, "b": [1, 2]}`, "{\n  \"b\": [1,2],\n  \"a\": 1.0\n}\n"), nil, ReviewUnchanged, nil, "the same JSON, spaced or ordered differently", 0},
		{"JSON value", change("j/season.gold.json", `{"a": 1, "b": [1, 2]}`, `{"a": 2, "b": [1, 2, 3]}`), nil, ReviewChanged, func(t *testing.T, f FileReview) {
			require.Equal(t, []string{"$.a: before 1, after 2", "$.b[2]: added: 3"}, f.Paths)
		}, "2 JSON paths differ", 0},
		{"JSON broken", change("j/season.gold.json", `{"a": 1}`, `{"a": `), nil, ReviewChanged, nil, "", 1},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			f := ReviewChange(c.c, c.opts...)
			require.Equal(t, c.status, f.Status)
			require.Len(t, f.Problems, c.problems, "%v", f.Problems)
			if c.summary != "" {
				require.Equal(t, c.summary, f.Summary())
			}
			if c.check != nil {
				c.check(t, f)
			}
		})
	}
}

func sampleReview(t *testing.T) *Review {
	t.Helper()
	cellChanged := strings.Replace(reviewOld, "21.5 | 140", "22 | 140", 1)
	reordered := strings.Replace(reviewOld, "Les Pins | 2026-04-01 | 18.25 | 140\nMas | 2026-04-01 | 17 | 139\n", "Mas | 2026-04-01 | 17 | 139\nLes Pins | 2026-04-01 | 18.25 | 140\n", 1)
	var files []FileReview
	for _, c := range []FileChange{
		change("a/daily.gold.tbl", reviewOld, cellChanged),
		change("b/new.gold.txt", "", "hello\n"),
		change("c/gone.gold.json", `{"x":1}`, ""),
		change("d/same.gold.tbl", reviewOld, reordered),
	} {
		files = append(files, ReviewChange(c))
	}
	return &Review{Against: "HEAD (abc1234)", Files: files}
}

func TestReviewHeadlineAndCounts(t *testing.T) {
	r := sampleReview(t)
	require.Equal(t, "3 golden files differ: 1 changed, 1 new, 1 removed; 1 unchanged within tolerance", r.Headline())
	require.True(t, r.Changed())
	require.Equal(t, 1, r.Count(ReviewUnchanged))
	quiet := &Review{Files: r.Files[3:]}
	require.False(t, quiet.Changed())
	require.Equal(t, "no golden file differs; 1 unchanged within tolerance", quiet.Headline())
	require.Equal(t, "no golden file differs", (&Review{}).Headline())
}

func TestReviewMarkdown(t *testing.T) {
	md := sampleReview(t).Markdown()
	require.True(t, strings.HasPrefix(md, "## Golden file review\n\n**3 golden files differ: 1 changed, 1 new, 1 removed; 1 unchanged within tolerance** — against `HEAD (abc1234)`\n"), md)
	require.Contains(t, md, "| `a/daily.gold.tbl` | **changed** | table | 3 | 1 differing cell in 1 row; max abs. diff 0.5 (tmax) |")
	require.Contains(t, md, "| `d/same.gold.tbl` | unchanged within tolerance | table | 3 | equal within tolerance |")
	require.Contains(t, md, "### `a/daily.gold.tbl` — changed")
	require.Contains(t, md, "| `Étang` | `2026-04-01` | `tmax` | `21.5` | `22` |", "the changed cell with its keys")
	require.NotContains(t, md, "### `d/same.gold.tbl`", "nothing more to say about an unchanged file")

	// A review too big for a comment leaves sections out and says so.
	big := &Review{}
	var w, g strings.Builder
	w.WriteString("# proofsheet sheet v1\n# keys: i\n# rows: 40\ni:int64 | note:string\n")
	g.WriteString(w.String())
	for i := 0; i < 40; i++ {
		w.WriteString(strconv.Itoa(i) + " | " + strings.Repeat("x", 200) + "\n")
		g.WriteString(strconv.Itoa(i) + " | " + strings.Repeat("y", 200) + "\n")
	}
	for i := 0; i < 30; i++ {
		big.Files = append(big.Files, ReviewChange(change("t/f"+strconv.Itoa(i)+".gold.tbl", w.String(), g.String())))
	}
	md = big.Markdown()
	require.Less(t, len(md), markdownBudget+1000)
	require.Regexp(t, `_\d+ file sections left out`, md)
	require.Contains(t, md, "| `t/f29.gold.tbl` |", "every file keeps its line in the table")
}

func TestReviewText(t *testing.T) {
	text := sampleReview(t).Text()
	require.Contains(t, text, "Golden file review against HEAD (abc1234)\n3 golden files differ")
	require.Regexp(t, `(?m)^  changed +table +3  a/daily.gold.tbl$`, text)
	require.Contains(t, text, "== b/new.gold.txt (new)")
	require.Contains(t, text, "  tables differ: 1 differing cell in 1 row")
	require.NotContains(t, text, "\x1b[")
	require.Contains(t, sampleReview(t).TextWith(assert.TextStyle{Color: true}), "\x1b[1m")
}

// TestReviewKeepsKeysWhole checks that the review's text, 100 columns
// wide, never cuts a key of a changed table.
func TestReviewKeepsKeysWhole(t *testing.T) {
	house := "Château-Rouge-sur-la-Colline-des-Trois-Moulins-du-Haut"
	bay := "travée nord numéro douze du bâtiment historique"
	head := "# proofsheet sheet v1\n# keys: house, bay\n# rows: 1\nhouse:string | bay:string | tmax:float64 | note:string\n"
	note := strings.Repeat("a note that may be shortened ", 4)
	oldT := head + house + " | " + bay + " | 21.5 | " + note + "\n"
	newT := head + house + " | " + bay + " | 22.5 | " + note + "!\n"
	rv := &Review{Files: []FileReview{ReviewChange(change("a/long.gold.tbl", oldT, newT))}}
	text := rv.TextWith(assert.TextStyle{Width: 100})
	require.Contains(t, text, house)
	require.Contains(t, text, bay)
	require.Contains(t, text, "("+house+", "+bay+")")
	require.Contains(t, rv.Markdown(), house)
	require.Contains(t, rv.HTML(), house)

	// Long key column names, many tolerances and a long path: the file's
	// heading and the rules it was compared under are wrapped, never cut.
	keyA, keyB := "greenhouse_name_as_written_by_the_datalogger", "bay_description_from_the_site_survey"
	head2 := "# proofsheet sheet v2\n# keys: " + keyA + ", " + keyB + "\n# rows: 1\n# match: by key\n" +
		"# tol: tmax_daily_maximum_celsius=abs:0.05\n# tol: tmin_daily_minimum_celsius=abs:0.05\n# tol: mean_of_the_readings_kept=rel:1e-06\n" +
		keyA + ":string | " + keyB + ":string | tmax_daily_maximum_celsius:float64 | tmin_daily_minimum_celsius:float64 | mean_of_the_readings_kept:float64\n"
	path := "reports/greenhouses/season-2026/daily-maxima-and-minima-by-house-and-bay/" + strings.Repeat("x", 30) + ".gold.tbl"
	rv = &Review{Files: []FileReview{ReviewChange(change(path, head2+house+" | "+bay+" | 21.5 | 3 | 12\n", head2+house+" | "+bay+" | 22.5 | 3 | 12\n"))}}
	text = rv.TextWith(assert.TextStyle{Width: 100})
	require.Contains(t, text, path, "the path whole")
	flat := strings.Join(strings.Fields(text), " ")
	for _, s := range []string{keyA, keyB, "tmax_daily_maximum_celsius=abs:0.05", "tmin_daily_minimum_celsius=abs:0.05", "mean_of_the_readings_kept=rel:1e-06"} {
		require.Contains(t, flat, s, "%s whole in\n%s", s, text)
	}
	require.NotContains(t, text, "…", "nothing cut:\n%s", text)
	for _, l := range strings.Split(text, "\n") {
		if textwidth.Width(l) > 100 {
			require.True(t, strings.Contains(l, path) || strings.Contains(l, house), "a line wider than 100 columns holds a long path or key: %q", l)
		}
	}
}

func TestReviewJSON(t *testing.T) {
	b, err := sampleReview(t).JSON()
	require.NoError(t, err)
	var out struct {
		Changed bool           `json:"changed"`
		Counts  map[string]int `json:"counts"`
		Files   []struct {
			Path    string          `json:"path"`
			Status  string          `json:"status"`
			OldRows *int            `json:"old_rows"`
			Diff    json.RawMessage `json:"diff"`
			Lines   []any           `json:"lines"`
		} `json:"files"`
	}
	require.NoError(t, json.Unmarshal(b, &out))
	require.True(t, out.Changed)
	require.Equal(t, map[string]int{"changed": 1, "new": 1, "removed": 1, "unchanged": 1, "equal": 0}, out.Counts)
	require.Equal(t, "changed", out.Files[0].Status)
	require.Contains(t, string(out.Files[0].Diff), `"cells_differing": 1`)
	require.Nil(t, out.Files[1].OldRows, "a new file has no old rows")
	require.Equal(t, "null", string(out.Files[1].Diff))
	require.NotNil(t, out.Files[1].Lines, "lists are never null")
}

func TestReviewHTML(t *testing.T) {
	r := sampleReview(t)
	hostile := `<script>window.__pwned=1</script>`
	r.Files = append(r.Files, ReviewChange(change("e/"+hostile+".gold.txt", "<b>old</b>\n", hostile+"\n")))
	page := r.HTML()
	require.True(t, strings.HasPrefix(page, "<!DOCTYPE html>"))
	require.Equal(t, 1, strings.Count(page, "<script>"), "only the page's own script")
	require.Equal(t, 1, strings.Count(page, `class="`+assert.HTMLChangedCell+`"`), "one differing cell in the sample")
	require.Equal(t, 5, strings.Count(page, `<section class="ps-file"`))
	require.Contains(t, page, "&lt;script&gt;window.__pwned=1&lt;/script&gt;")
	require.NotContains(t, page, "<b>old</b>")
	for _, outside := range []string{"http://", "https://", "src=", "@import", "url("} {
		require.NotContains(t, page, outside, "the page loads nothing from outside")
	}
	require.Contains(t, page, "script-src 'sha256-")
	require.Contains(t, page, `id="ps-only-changed"`)
}

func TestReviewRecords(t *testing.T) {
	want := fixtures.MustParse(t, `house:string | tmax:float64 | note:string
		Étang | 21.5 | "vent open"
		Mas | 17 | ok
		Bois | +Inf | ~`)
	got := fixtures.MustParse(t, `house:string | tmax:float64 | note:string
		Étang | 22 | "vent\u00a0open"
		Mas | 17 | ok
		Ruche | 1 | x`)
	d := assert.Compare(want, got, assert.ByKey("house"), assert.Tol("tmax", 0.01, 0))
	js, err := d.JSON()
	require.NoError(t, err)

	dir := t.TempDir()
	newFile := filepath.Join(dir, "new.gold.txt")
	require.NoError(t, os.WriteFile(newFile, []byte("fresh\n"), 0o644))
	recs := []Record{
		{Test: "TestA", Name: "a", Kind: KindTable, Status: StatusEqual, Path: "p/a.gold.tbl"},
		{Test: "TestB", Name: "b", Kind: KindTable, Status: StatusEqual, Path: "p/b.gold.tbl"},
		{Test: "TestB2", Name: "b", Kind: KindTable, Status: StatusChanged, Path: "p/b.gold.tbl", Diff: js, Detail: "golden: differs"},
		{Test: "TestC", Name: "c", Kind: KindText, Status: StatusNew, Path: "p/c.gold.txt", File: newFile},
		{Test: "TestD", Name: "d", Kind: KindText, Status: StatusMissing, Path: "p/d.gold.txt", Detail: "golden: p/d.gold.txt does not exist"},
		{Test: "TestE", Name: "../e", Kind: KindJSON, Status: StatusInvalid, Detail: "golden: bad golden name"},
		{Test: "TestF", Name: "f", Kind: KindText, Status: StatusChanged, Path: "p/f.gold.txt", Detail: "golden: p/f.gold.txt: got differs:\n-a\n+b"},
	}
	rv := ReviewRecords(recs)
	require.Equal(t, 1, rv.Equal)
	byPath := map[string]FileReview{}
	for _, f := range rv.Files {
		byPath[f.Path] = f
	}
	require.Len(t, byPath, 5)
	b := byPath["p/b.gold.tbl"]
	require.Equal(t, ReviewChanged, b.Status, "the failed check wins over the passed one")
	require.Equal(t, "TestB2", b.Test)
	require.Equal(t, 2, b.Diff.CellsDiffering)
	require.Equal(t, 3, b.NewRows)
	back, err := b.Diff.JSON()
	require.NoError(t, err)
	require.JSONEq(t, string(js), string(back), "the record's diff, whole")
	c := byPath["p/c.gold.txt"]
	require.Equal(t, ReviewNew, c.Status)
	require.Equal(t, [][]string{{"fresh"}}, c.Preview, "a file created by update mode is read for its preview")
	require.Equal(t, ReviewNew, byPath["p/d.gold.txt"].Status)
	require.Equal(t, ReviewChanged, byPath["../e"].Status)
	require.Len(t, byPath["../e"].Problems, 1)
	require.Contains(t, byPath["p/f.gold.txt"].Summary(), "differs: golden: p/f.gold.txt: got differs:")
	// Records render like any review.
	require.Contains(t, rv.Markdown(), "Checked by `TestB2`.")
	require.Contains(t, rv.HTML(), `class="`+assert.HTMLChangedCell+`"`)
}

func TestReviewDiff(t *testing.T) {
	a := fixtures.MustParse(t, `x:int64
		1`)
	b := fixtures.MustParse(t, `x:int64
		2`)
	f := ReviewDiff("a.csv → b.csv", assert.Compare(a, b))
	require.Equal(t, ReviewChanged, f.Status)
	require.Equal(t, "1", f.Rows())
	require.Equal(t, ReviewUnchanged, ReviewDiff("x", assert.Compare(a, a)).Status)
}

func ExampleReviewChange() {
	old := []byte("# proofsheet sheet v1\n# keys: house\n# rows: 2\nhouse:string | tmax:float64\nLes Pins | 18.25\nÉtang | 21.5\n")
	cur := []byte("# proofsheet sheet v1\n# keys: house\n# rows: 2\nhouse:string | tmax:float64\nLes Pins | 18.25\nÉtang | 22\n")
	f := ReviewChange(FileChange{Path: "daily/report.gold.tbl", Old: old, New: cur, OldExists: true, NewExists: true})
	rv := &Review{Against: "HEAD", Files: []FileReview{f}}
	fmt.Println(rv.Headline())
	fmt.Println(f.Status, "|", f.Summary())
	c := f.Diff.Cells.At(0)
	fmt.Println(c.Row.Key, c.Column, c.Want.Text, "→", c.Got.Text)
	// Output:
	// 1 golden file differs: 1 changed
	// changed | 1 differing cell in 1 row; max abs. diff 0.5 (tmax)
	// [Étang] tmax 21.5 → 22
}

func TestReviewChangeForChoosesOptionsByColumns(t *testing.T) {
	noise := strings.Replace(reviewOld, "18.25", "18.250000000000004", 1)
	c := change("d/daily.gold.tbl", reviewOld, noise)
	tmaxTol := assert.Tol("tmax", 0, 1e-12)
	other := assert.Tol("gdd", 0, 1e-12) // a column this table lacks
	f := ReviewChange(c, tmaxTol, other)
	require.Equal(t, ReviewChanged, f.Status, "the same options for every table: gdd is a problem here")
	require.NotEmpty(t, f.Diff.Problems)

	var seen []string
	f = ReviewChangeFor(c, func(cols []string) []assert.Option {
		seen = cols
		var opts []assert.Option
		for name, o := range map[string]assert.Option{"tmax": tmaxTol, "gdd": other} {
			if slices.Contains(cols, name) {
				opts = append(opts, o)
			}
		}
		return opts
	})
	require.Equal(t, []string{"house", "day", "tmax", "kept"}, seen)
	require.Equal(t, ReviewUnchanged, f.Status)
	require.Empty(t, f.Diff.Problems)
}

func TestReviewUnderStoredRules(t *testing.T) {
	tb := fixtures.MustParse(t, `house:string | day:date | tmax:float64 | kept:int64
		Étang    | 2026-04-01 | 21.5  | 140
		Les Pins | 2026-04-01 | 18.25 | 144`)
	noisy := fixtures.MustParse(t, `house:string | day:date | tmax:float64 | kept:int64
		Les Pins | 2026-04-01 | 18.250000000000004 | 144
		Étang    | 2026-04-01 | 21.5  | 140`)
	enc := func(tb *fixtures.Table, opts ...assert.Option) string {
		data, err := EncodeTableRules(tb, assert.RulesOf(opts...))
		require.NoError(t, err)
		return string(data)
	}
	tight := []assert.Option{assert.ByKey("house", "day"), assert.Tol("tmax", 1e-9, 0)}

	// The stored tolerance applies with no options: noise is no change,
	// and the column says how it was compared.
	f := ReviewChange(change("d/daily.gold.tbl", enc(tb, tight...), enc(noisy, tight...)))
	require.Equal(t, ReviewUnchanged, f.Status)
	require.Equal(t, "rows by key house, day; tmax=abs:1e-09", f.Rules.String())
	require.Equal(t, "abs. diff ≤ 1e-09", f.Diff.Columns[0+2].Rule, "%+v", f.Diff.Columns)
	require.Empty(t, f.RulesChange)

	// A tolerance widened in the same change: changed, whatever the data,
	// and the old and new rules are named.
	wide := []assert.Option{assert.ByKey("house", "day"), assert.Tol("tmax", 0.5, 0)}
	f = ReviewChange(change("d/daily.gold.tbl", enc(tb, tight...), enc(noisy, wide...)))
	require.Equal(t, ReviewChanged, f.Status)
	require.Equal(t, "stored rules changed: tmax=abs:1e-09 → tmax=abs:0.5", f.RulesChange)
	require.Equal(t, "stored rules changed; max abs. diff 3.55e-15 (tmax)", f.Summary())
	rv := &Review{Files: []FileReview{f}}
	md := rv.Markdown()
	require.Contains(t, md, "Stored rules changed: tmax=abs:1e-09 → tmax=abs:0.5.")
	require.Contains(t, md, "Compared under: rows by key house, day; tmax=abs:0.5.")
	require.Contains(t, rv.Text(), "compared under: rows by key house, day; tmax=abs:0.5")
	js, err := rv.JSON()
	require.NoError(t, err)
	require.Contains(t, string(js), `"rules": [`)
	require.Contains(t, string(js), `"rules_change": "stored rules changed`)

	// The two sides are the versions, not want and got.
	changed := fixtures.MustParse(t, `house:string | day:date | tmax:float64 | kept:int64
		Étang    | 2026-04-01 | 22.5  | 140
		Les Pins | 2026-04-01 | 18.25 | 144`)
	f = ReviewChange(change("d/daily.gold.tbl", enc(tb, tight...), enc(changed, tight...)))
	require.Equal(t, ReviewChanged, f.Status)
	md = (&Review{Files: []FileReview{f}}).Markdown()
	require.Contains(t, md, "| `house` | `day` | column | before | after |")
	require.NotContains(t, md, "| want |")
}
