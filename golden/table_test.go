package golden

import (
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"github.com/proofsheet/proofsheet/assert"
	"github.com/proofsheet/proofsheet/fixtures"
	"github.com/stretchr/testify/require"
)

// daily is a demo-like daily table per house; variant "noise" moves tmean
// by a rounding error, "change" changes a value for real, "reordered"
// lists the rows in another order.
func daily(t testing.TB, variant string) *fixtures.Table {
	t.Helper()
	tmean := "15.125"
	tmax := "21.5"
	switch variant {
	case "noise":
		tmean = "15.125000000000002" // 15.125 + 1 ulp-ish rounding noise
	case "change":
		tmax = "22.5"
	}
	rows := []string{
		"Étang | 2026-04-01 | 8.75 | " + tmax + " | " + tmean + " | 140 | 4",
		"Les Pins | 2026-04-01 | 7.5 | 19.25 | 13.375 | 144 | 0",
		"Étang | 2026-04-02 | 9 | 20 | 14.5 | 138 | 6",
	}
	if variant == "reordered" {
		rows[0], rows[2] = rows[2], rows[0]
	}
	return fixtures.MustParse(t, "house:string | day:date | tmin:float64 | tmax:float64 | tmean:float64 | kept:int64 | dropped:int64\n"+strings.Join(rows, "\n"))
}

var dailyOpts = []assert.Option{assert.ByKey("house", "day"), assert.Tol("*", 1e-9, 0)}

func TestTableCheckLifecycle(t *testing.T) {
	// The "done when": missing fails clearly, -update creates it,
	// it passes next time, passes on float noise within tolerance, fails on
	// a real change with the table diff, refuses to update under CI and
	// refuses an escaping name.
	quietEnv(t, false)
	s := tempStore(t)
	path := filepath.Join(s.Root, "daily", "report.gold.tbl")
	check := func(variant string, opts ...assert.Option) (bool, *fakeT) {
		ft := newFake(t)
		defer ft.end()
		return s.Table(ft, "daily/report", daily(t, variant), opts...), ft
	}

	ok, ft := check("base", dailyOpts...)
	require.False(t, ok)
	require.Contains(t, ft.failures(), "daily/report.gold.tbl does not exist")
	require.Contains(t, ft.failures(), "go test ./golden -run '^TestTableCheckLifecycle$/^fake$' -update")
	require.NoFileExists(t, path)

	*updateFlag = true
	ok, ft = check("reordered", dailyOpts...)
	require.True(t, ok, ft.failures())
	*updateFlag = false
	stored := readFile(t, path)
	// Rows are stored sorted by the key, whatever order got had.
	require.Equal(t, ""+
		"# proofsheet sheet v2\n"+
		"# keys: house, day\n"+
		"# rows: 3\n"+
		"# match: by key\n"+
		"# tol: *=abs:1e-09\n"+
		"house:string | day:date | tmin:float64 | tmax:float64 | tmean:float64 | kept:int64 | dropped:int64\n"+
		"Les Pins | 2026-04-01 | 7.5 | 19.25 | 13.375 | 144 | 0\n"+
		"Étang | 2026-04-01 | 8.75 | 21.5 | 15.125 | 140 | 4\n"+
		"Étang | 2026-04-02 | 9 | 20 | 14.5 | 138 | 6\n", stored)

	ok, ft = check("base", dailyOpts...)
	require.True(t, ok, ft.failures())

	ok, ft = check("noise", dailyOpts...)
	require.True(t, ok, ft.failures())

	// With no rules of its own the check compares under the stored ones.
	ok, ft = check("noise")
	require.True(t, ok, ft.failures())
	require.Empty(t, ft.logs)

	// Given rules go on top of the stored ones, rule by rule: the same key
	// changes nothing.
	ok, ft = check("noise", assert.ByKey("house", "day"))
	require.True(t, ok, ft.failures())
	require.Empty(t, ft.logs)

	// A rule that differs from the stored one is used and reported: with
	// an exact rule the noise is a difference.
	ok, ft = check("noise", assert.Tol("*", 0, 0))
	require.False(t, ok)
	require.Contains(t, ft.failures(), "tmean")
	require.Contains(t, ft.failures(), "Note: rules differ from the stored ones: *=abs:1e-09 → *=abs:0; compared under the new rules; an update stores them.")
	require.Equal(t, []string{"golden: " + displayPath(path) + ": rules differ from the stored ones: *=abs:1e-09 → *=abs:0; compared under the new rules; an update stores them"}, ft.logs)

	ok, ft = check("change", dailyOpts...)
	require.False(t, ok)
	msg := ft.failures()
	require.Contains(t, msg, "got differs from the golden file")
	require.Contains(t, msg, "tmax")
	require.Contains(t, msg, "22.5")
	require.Contains(t, msg, "21.5")
	require.Contains(t, msg, assert.Compare(daily(t, "base"), daily(t, "change"), dailyOpts...).Text()) // the table diff itself
	require.Contains(t, msg, "-update")

	t.Setenv(EnvCI, "true")
	*updateFlag = true
	ok, ft = check("change", dailyOpts...)
	require.False(t, ok)
	require.Contains(t, ft.failures(), "Not updated")
	require.Equal(t, stored, readFile(t, path))
	*updateFlag = false
	t.Setenv(EnvCI, "")

	ft = newFake(t)
	require.False(t, s.Table(ft, "../daily/report", daily(t, "base"), dailyOpts...))
	require.Contains(t, ft.failures(), "bad golden name")
	ft.end()
}

func TestTableUpdateWithinToleranceLeavesFile(t *testing.T) {
	quietEnv(t, true)
	s := tempStore(t)
	path := filepath.Join(s.Root, "daily.gold.tbl")
	data, err := EncodeTableRules(daily(t, "base"), assert.RulesOf(dailyOpts...))
	require.NoError(t, err)
	writeFile(t, path, string(data))
	old := time.Date(2021, 3, 4, 5, 6, 7, 0, time.UTC)
	require.NoError(t, os.Chtimes(path, old, old))

	ft := newFake(t)
	require.True(t, s.Table(ft, "daily", daily(t, "noise"), dailyOpts...), ft.failures())
	ft.end()
	st, err := os.Stat(path)
	require.NoError(t, err)
	require.True(t, st.ModTime().Equal(old), "file was rewritten")
	require.Equal(t, string(data), readFile(t, path))

	// A real change is written.
	ft = newFake(t)
	require.True(t, s.Table(ft, "daily", daily(t, "change"), dailyOpts...), ft.failures())
	ft.end()
	require.Contains(t, readFile(t, path), "| 22.5 |")
}

func TestTableStoredFileProblems(t *testing.T) {
	quietEnv(t, false)
	s := tempStore(t)
	path := filepath.Join(s.Root, "bad.gold.tbl")
	writeFile(t, path, "# proofsheet sheet v1\n# keys: -\n# rows: 1\nhouse:string\n")
	ft := newFake(t)
	require.False(t, s.Table(ft, "bad", daily(t, "base")))
	require.Contains(t, ft.failures(), "cannot read")
	require.Contains(t, ft.failures(), "says rows: 1 but has 0")
	ft.end()

	// In update mode an unreadable file is rewritten from got.
	*updateFlag = true
	ft = newFake(t)
	require.True(t, s.Table(ft, "bad", daily(t, "base")), ft.failures())
	ft.end()
	back, _, err := DecodeTable(path, []byte(readFile(t, path)))
	require.NoError(t, err)
	require.True(t, assert.Compare(daily(t, "base"), back).Equal())

	// Options that do not fit got are not written into a file.
	ft = &fakeT{name: t.Name() + "/badopts"}
	require.False(t, s.Table(ft, "badopts", daily(t, "base"), assert.ByKey("greenhouse")))
	require.Contains(t, ft.failures(), "options do not fit got")
	require.NoFileExists(t, filepath.Join(s.Root, "badopts.gold.tbl"))
	ft.end()

	ft = &fakeT{name: t.Name() + "/nil"}
	require.False(t, s.Table(ft, "nil", nil))
	require.Contains(t, ft.failures(), "nil table")
	ft.end()
}

func TestTableRecordCarriesDiff(t *testing.T) {
	quietEnv(t, false)
	dir := t.TempDir()
	t.Setenv(EnvRecords, dir)
	s := tempStore(t)
	data, err := EncodeTable(daily(t, "base"), nil)
	require.NoError(t, err)
	writeFile(t, filepath.Join(s.Root, "rec.gold.tbl"), string(data))
	ft := newFake(t)
	require.False(t, s.Table(ft, "rec", daily(t, "change"), dailyOpts...))
	ft.end()
	recs, err := ReadRecords(dir)
	require.NoError(t, err)
	require.Len(t, recs, 1)
	r := recs[0]
	require.Equal(t, StatusChanged, r.Status)
	require.Equal(t, KindTable, r.Kind)
	var d struct {
		Equal          bool `json:"equal"`
		CellsDiffering int  `json:"cells_differing"`
	}
	require.NoError(t, json.Unmarshal(r.Diff, &d))
	require.False(t, d.Equal)
	require.Equal(t, 1, d.CellsDiffering)
}

func init() {
	helperScenarios["table"] = func(t *testing.T, s Store, variant string) {
		s.Table(t, "daily", daily(t, variant), dailyOpts...)
	}
}

func TestRealUpdateFlagTable(t *testing.T) {
	root := t.TempDir()
	path := filepath.Join(root, "daily.gold.tbl")
	out, code := runHelper(t, "table", root, "base", nil)
	require.Equal(t, 1, code, out)
	require.Contains(t, out, "does not exist")

	out, code = runHelper(t, "table", root, "reordered", nil, "-update")
	require.Equal(t, 0, code, out)
	stored := readFile(t, path)

	for _, v := range []string{"base", "noise"} {
		out, code = runHelper(t, "table", root, v, nil)
		require.Equal(t, 0, code, "%s: %s", v, out)
	}
	out, code = runHelper(t, "table", root, "change", nil)
	require.Equal(t, 1, code, out)
	require.Contains(t, out, "tmax")

	out, code = runHelper(t, "table", root, "change", []string{"CI=true"}, "-update")
	require.Equal(t, 1, code, out)
	require.Contains(t, out, "Not updated")
	require.Equal(t, stored, readFile(t, path))
}

func TestTableStoredRules(t *testing.T) {
	quietEnv(t, false)
	s := tempStore(t)
	path := filepath.Join(s.Root, "daily.gold.tbl")
	check := func(variant string, opts ...assert.Option) (bool, *fakeT) {
		ft := newFake(t)
		defer ft.end()
		return s.Table(ft, "daily", daily(t, variant), opts...), ft
	}

	// A version 1 file (written before rules were stored) still reads; a
	// check with no rules matches rows by its keys.
	v1 := "# proofsheet sheet v1\n# keys: house, day\n# rows: 3\n" +
		"house:string | day:date | tmin:float64 | tmax:float64 | tmean:float64 | kept:int64 | dropped:int64\n" +
		"Les Pins | 2026-04-01 | 7.5 | 19.25 | 13.375 | 144 | 0\n" +
		"Étang | 2026-04-01 | 8.75 | 21.5 | 15.125 | 140 | 4\n" +
		"Étang | 2026-04-02 | 9 | 20 | 14.5 | 138 | 6\n"
	writeFile(t, path, v1)
	ok, ft := check("reordered")
	require.True(t, ok, ft.failures())
	require.Empty(t, ft.logs)
	ok, ft = check("noise")
	require.False(t, ok, "a v1 file stores no tolerance")
	// Given rules beyond the keys are used and reported.
	ok, ft = check("noise", dailyOpts...)
	require.True(t, ok, ft.failures())
	require.Len(t, ft.logs, 1)
	require.Contains(t, ft.logs[0], "the file stores no rules (format v1); compared under rows by key house, day; *=abs:1e-09; an update stores them")
	require.Equal(t, v1, readFile(t, path), "checking never writes")

	// An update stores them, even though the table is equal under them.
	*updateFlag = true
	ok, ft = check("noise", dailyOpts...)
	*updateFlag = false
	require.True(t, ok, ft.failures())
	stored := readFile(t, path)
	require.Contains(t, stored, "# proofsheet sheet v2\n# keys: house, day\n# rows: 3\n# match: by key\n# tol: *=abs:1e-09\n")
	require.Contains(t, stored, "| 15.125000000000002 |", "the update writes got")

	// Now no flags are needed, and the same rules given again are silent.
	ok, ft = check("base")
	require.True(t, ok, ft.failures())
	require.Empty(t, ft.logs)
	ok, ft = check("base", dailyOpts...)
	require.True(t, ok, ft.failures())
	require.Empty(t, ft.logs)

	// A wider tolerance given: used, reported, stored on update.
	wide := []assert.Option{assert.ByKey("house", "day"), assert.Tol("*", 2, 0)}
	ok, ft = check("change", wide...)
	require.True(t, ok, ft.failures())
	require.Equal(t, "golden: "+displayPath(path)+": rules differ from the stored ones: *=abs:1e-09 → *=abs:2; compared under the new rules; an update stores them", ft.logs[0])
	*updateFlag = true
	ok, ft = check("change", wide...)
	*updateFlag = false
	require.True(t, ok, ft.failures())
	require.Contains(t, readFile(t, path), "# tol: *=abs:2\n")
	require.Contains(t, readFile(t, path), "| 22.5 |", "an update writes got")
	ok, ft = check("change")
	require.True(t, ok, ft.failures())

	// Rows in any order, an ignored column and the switches survive the file.
	all := []assert.Option{assert.AnyRowOrder(), assert.IgnoreColumns("kept"), assert.NormText("house", assert.NFC), assert.LooseTypes(), assert.NaNIsNull(), assert.AnyColumnOrder(), assert.TimeTol("day", 24*time.Hour)}
	data, err := EncodeTableRules(daily(t, "base"), assert.RulesOf(all...))
	require.NoError(t, err)
	require.Contains(t, string(data), "# keys: -\n# rows: 3\n# match: in any order\n# tol: day=time:24h0m0s\n# ignore: kept\n# text: house=nfc\n# compare: any-column-order, loose-types, nan-is-null\n")
	_, info, err := DecodeTable("x", data)
	require.NoError(t, err)
	require.True(t, info.HasRules)
	require.True(t, assert.RulesOf(all...).Equal(info.Rules), "%v", info.Rules)
}

func TestMergeRules(t *testing.T) {
	stored := assert.RulesOf(assert.ByKey("house", "day"), assert.Tol("*", 1e-9, 0), assert.Tol("tmax", 0.01, 0), assert.IgnoreColumns("note"), assert.NormText("house", assert.NFC))
	cases := []struct {
		name  string
		given []assert.Option
		want  string
	}{
		{"nothing given", nil, "rows by key house, day; *=abs:1e-09; tmax=abs:0.01; ignore note; text house=nfc"},
		{"a tolerance replaces its column's", []assert.Option{assert.Tol("tmax", 0.5, 0)}, "rows by key house, day; *=abs:1e-09; tmax=abs:0.5; ignore note; text house=nfc"},
		{"a time tolerance sits beside a float one", []assert.Option{assert.TimeTol("tmax", time.Second)}, "rows by key house, day; *=abs:1e-09; tmax=abs:0.01; tmax=time:1s; ignore note; text house=nfc"},
		{"row order and ignores", []assert.Option{assert.AnyRowOrder(), assert.IgnoreColumns("kept"), assert.LooseTypes()}, "rows in any order; *=abs:1e-09; tmax=abs:0.01; ignore kept, note; text house=nfc; loose types"},
		{"other keys", []assert.Option{assert.ByKey("house"), assert.NormText("house", assert.TrimSpace)}, "rows by key house; *=abs:1e-09; tmax=abs:0.01; ignore note; text house=trim"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			require.Equal(t, c.want, MergeRules(stored, assert.RulesOf(c.given...)).String())
		})
	}
}
