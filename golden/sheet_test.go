package golden

import (
	"math"
	"strings"
	"testing"

	"github.com/proofsheet/proofsheet/assert"
	"github.com/proofsheet/proofsheet/fixtures"
	"github.com/stretchr/testify/require"
)

// allKinds is a table with every column kind and the awkward cells:
// null beside the empty string and "~", NaN, ±Inf, −0, text with pipes,
// quotes, newlines and edge blanks, category levels in a set order.
func allKinds(t *testing.T) *fixtures.Table {
	t.Helper()
	tenth := 0.1 // a variable, so 0.1+0.2 is rounded at run time
	return fixtures.NewBuilder(fixtures.Schema{
		fixtures.Col("house", fixtures.String),
		fixtures.Col("day", fixtures.Date),
		fixtures.Col("status", fixtures.Category),
		fixtures.Col("tmax", fixtures.Float64),
		fixtures.Col("kept", fixtures.Int64),
		fixtures.Col("ok", fixtures.Bool),
		fixtures.Col("at", fixtures.TimestampOf(fixtures.Millis, "UTC")),
		fixtures.Col("wall", fixtures.TimestampOf(fixtures.Seconds, "")),
		fixtures.Col("gdd", fixtures.DecimalOf(9, 2)),
		fixtures.Col("odd | name", fixtures.String),
	}).Levels("status", "fault", "ok", "unused").
		Row("Étang", "2026-04-01", "ok", 21.5, 140, true, "2026-04-01T06:00:00.125Z", "2026-04-01T06:00:00", "12.30", "a|b").
		Row("", "2026-04-02", nil, math.NaN(), int64(math.MinInt64), false, nil, nil, "-0.05", "~").
		Row(nil, nil, "fault", math.Inf(1), 0, nil, "2026-04-03T00:00:00Z", "2026-04-03T23:59:59", nil, nil).
		Row("  edge  ", "1969-12-31", "ok", math.Copysign(0, -1), -1, true, nil, nil, "0.00", "line\nbreak \"q\"").
		Row("#not a comment", "2026-04-05", "ok", tenth+0.2, math.MaxInt64, false, nil, nil, "9999999.99", "`tick`").
		Row("Les Pins", "2026-04-06", "ok", math.Inf(-1), 3, false, nil, nil, nil, "\u00a0").
		Row("tiny", "2026-04-07", "ok", 5e-324, 4, false, nil, nil, nil, "x").
		MustBuild(t)
}

// requireSameTable checks that two tables are identical: schema, category
// levels, null positions and cells (floats by their bits, NaN as NaN).
func requireSameTable(t *testing.T, want, got *fixtures.Table) {
	t.Helper()
	require.True(t, want.Schema().Equal(got.Schema()), "schema: got %s want %s", got.Schema(), want.Schema())
	require.Equal(t, want.NumRows(), got.NumRows())
	for j := range want.NumCols() {
		wc, gc := want.ColumnAt(j), got.ColumnAt(j)
		if wc.Kind() == fixtures.KindCategory {
			require.Equal(t, wc.Levels(), gc.Levels(), wc.Name())
		}
		for i := range want.NumRows() {
			require.Equal(t, wc.IsNull(i), gc.IsNull(i), "%s row %d", wc.Name(), i)
			if wc.IsNull(i) {
				continue
			}
			if wc.Kind() == fixtures.KindFloat64 {
				w, g := wc.Float64(i), gc.Float64(i)
				if math.IsNaN(w) {
					require.True(t, math.IsNaN(g))
				} else {
					require.Equal(t, math.Float64bits(w), math.Float64bits(g), "%s row %d: got %v want %v", wc.Name(), i, g, w)
				}
				continue
			}
			require.Equal(t, wc.Format(i), gc.Format(i), "%s row %d", wc.Name(), i)
		}
	}
}

func TestSheetRoundTrip(t *testing.T) {
	tb := allKinds(t)
	for _, keys := range [][]string{nil, {"day"}, {"status", "house"}} {
		data, err := EncodeTable(tb, keys)
		require.NoError(t, err)
		back, info, err := DecodeTable("x.gold.tbl", data)
		require.NoError(t, err, string(data))
		rules := assert.Rules{Match: assert.MatchByPosition}
		if keys != nil {
			rules = assert.Rules{Match: assert.MatchByKey, Keys: keys}
		}
		require.Equal(t, SheetInfo{Version: SheetVersion, Keys: keys, Rows: tb.NumRows(), Rules: rules, HasRules: true}, info)
		want := tb
		if keys != nil {
			want, err = tb.SortBy(keys...)
			require.NoError(t, err)
		}
		requireSameTable(t, want, back)
		again, err := EncodeTable(back, keys)
		require.NoError(t, err)
		require.Equal(t, string(data), string(again), "encoding is stable")
	}
}

func TestSheetLayout(t *testing.T) {
	tb := fixtures.MustParse(t, `
		house:string | day:date   | tmax:float64 | kept:int64
		"Les Pins"   | 2026-04-02 | ~            | 0
		Étang        | 2026-04-01 | 21.5         | 140
		Étang        | 2026-04-02 | 19.25        | 138
	`)
	data, err := EncodeTable(tb, []string{"house", "day"})
	require.NoError(t, err)
	// Source: the format this package defines (sheet.go); rows sorted by
	// key bytes, so "Les Pins" before "Étang" (L < É in UTF-8).
	require.Equal(t, ""+
		"# proofsheet sheet v2\n"+
		"# keys: house, day\n"+
		"# rows: 3\n"+
		"# match: by key\n"+
		"house:string | day:date | tmax:float64 | kept:int64\n"+
		"Les Pins | 2026-04-02 | ~ | 0\n"+
		"Étang | 2026-04-01 | 21.5 | 140\n"+
		"Étang | 2026-04-02 | 19.25 | 138\n", string(data))

	// One long value changes one line only: no padding of other lines.
	longer := fixtures.MustParse(t, `
		house:string | day:date   | tmax:float64 | kept:int64
		"Les Pins"   | 2026-04-02 | ~            | 0
		"Étang, the long-named house by the pond" | 2026-04-01 | 21.5 | 140
		Étang        | 2026-04-02 | 19.25        | 138
	`)
	data2, err := EncodeTable(longer, nil)
	require.NoError(t, err)
	a, b := strings.Split(string(data), "\n"), strings.Split(string(data2), "\n")
	diff := 0
	for i := range a {
		if a[i] != b[i] && !strings.HasPrefix(a[i], "# keys") && !strings.HasPrefix(a[i], "# match") {
			diff++
		}
	}
	require.Equal(t, 1, diff)
}

func TestSheetKeysQuoted(t *testing.T) {
	tb := fixtures.NewBuilder(fixtures.Schema{fixtures.Col("a,b", fixtures.Int64), fixtures.Col(`q"`, fixtures.Int64), fixtures.Col("-", fixtures.Int64)}).
		Row(2, 1, 1).Row(1, 2, 2).MustBuild(t)
	keys := []string{"a,b", `q"`, "-"}
	data, err := EncodeTable(tb, keys)
	require.NoError(t, err)
	require.Contains(t, string(data), "# keys: \"a,b\", \"q\\\"\", \"-\"\n")
	_, info, err := DecodeTable("k", data)
	require.NoError(t, err)
	require.Equal(t, keys, info.Keys)
}

func TestSheetZeroRowsAndCRLF(t *testing.T) {
	tb, err := fixtures.Empty(fixtures.Schema{fixtures.Col("house", fixtures.String), fixtures.Col("status", fixtures.Category)})
	require.NoError(t, err)
	data, err := EncodeTable(tb, nil)
	require.NoError(t, err)
	back, info, err := DecodeTable("e", data)
	require.NoError(t, err)
	require.Equal(t, 0, info.Rows)
	requireSameTable(t, tb, back)

	crlf := strings.ReplaceAll(string(data), "\n", "\r\n")
	back, _, err = DecodeTable("e", []byte(crlf))
	require.NoError(t, err)
	requireSameTable(t, tb, back)
}

func TestSheetRefusals(t *testing.T) {
	_, err := EncodeTable(nil, nil)
	require.Error(t, err)
	_, err = EncodeTable(fixtures.MustParse(t, "a:int64\n1\n"), []string{"nope"})
	require.ErrorContains(t, err, "nope")

	good := "# proofsheet sheet v2\n# keys: -\n# rows: 1\n# match: by position\na:int64\n1\n"
	cases := []struct{ name, text, want string }{
		{"not a sheet", "a:int64\n1\n", "not a golden table file"},
		{"newer version", strings.Replace(good, "v2", "v3", 1), "newer"},
		{"no match line", strings.Replace(good, "# match: by position\n", "", 1), "no \"# match:\""},
		{"bad match", strings.Replace(good, "by position", "by luck", 1), "f.gold.tbl:4: match: want by key"},
		{"key match without keys", strings.Replace(good, "by position", "by key", 1), "names no key"},
		{"keys without key match", strings.Replace(good, "# keys: -", "# keys: a", 1), "not by key"},
		{"bad tol", strings.Replace(good, "# match: by position\n", "# match: by position\n# tol: a=abs:-1\n", 1), "f.gold.tbl:5: tol: abs:-1: want a finite number"},
		{"bad text rule", strings.Replace(good, "# match: by position\n", "# match: by position\n# text: a=shout\n", 1), "unknown normalisation"},
		{"bad switch", strings.Replace(good, "# match: by position\n", "# match: by position\n# compare: lenient\n", 1), "unknown switch \"lenient\""},
		{"unknown metadata", strings.Replace(good, "# match: by position\n", "# match: by position\n# tols: a=abs:1\n", 1), "unknown metadata"},
		{"empty ignore", strings.Replace(good, "# match: by position\n", "# match: by position\n# ignore: -\n", 1), "no column named"},
		{"bad version", strings.Replace(good, "v2", "vx", 1), "bad format version"},
		{"no rows line", strings.Replace(good, "# rows: 1\n", "", 1), "no \"# rows:\""},
		{"bad rows", strings.Replace(good, "# rows: 1", "# rows: many", 1), "want a count"},
		{"cut short", strings.Replace(good, "# rows: 1", "# rows: 2", 1), "says rows: 2 but has 1"},
		{"bad cell", strings.Replace(good, "\n1\n", "\nx\n", 1), ":6:"},
		{"bad keys", strings.Replace(good, "# keys: -", `# keys: "a`, 1), "closing quote"},
		// Found by FuzzDecodeTable: such a file read, but could never be
		// stored again (its rows are sorted by the keys).
		{"key not a column", strings.Replace(strings.Replace(good, "# keys: -", `# keys: "day x"`, 1), "by position", "by key", 1), `f.gold.tbl:2: keys: no column "day x" in the table`},
		{"version 1 key not a column", "# proofsheet sheet v1\n# keys: b\n# rows: 1\na:int64\n1\n", `f.gold.tbl:2: keys: no column "b" in the table`},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			_, _, err := DecodeTable("f.gold.tbl", []byte(c.text))
			require.ErrorContains(t, err, c.want)
		})
	}
	_, _, err = DecodeTable("f", []byte(good))
	require.NoError(t, err)
	// Version 1 files still read; metadata other than keys and rows is a
	// comment there.
	v1 := "# proofsheet sheet v1\n# keys: a\n# rows: 1\n# note: by hand\na:int64\n1\n"
	_, info, err := DecodeTable("f", []byte(v1))
	require.NoError(t, err)
	require.Equal(t, SheetInfo{Version: 1, Keys: []string{"a"}, Rows: 1, Rules: assert.Rules{Match: assert.MatchByKey, Keys: []string{"a"}}}, info)
}
