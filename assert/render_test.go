package assert

import (
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/stretchr/testify/require"

	"github.com/proofsheet/proofsheet/internal/textwidth"
)

func TestTextEditMarkers(t *testing.T) {
	cases := []struct {
		name      string
		want, got string
		edit      string
	}{
		{"no-break space", "Les Pins", "Les\u00a0Pins", "Les⟦⟨sp⟩→⟨nbsp⟩⟧Pins"},
		{"byte order mark", "Étang", "\ufeffÉtang", "⟦→⟨bom⟩⟧Étang"},
		{"zero-width space", "Mas", "M\u200bas", "M⟦→⟨zwsp⟩⟧as"},
		{"trailing space", "Verger", "Verger ", "Verger⟦→⟨sp⟩⟧"},
		{"leading spaces shown in unchanged text", "  a-b", "  a+b", "⟨sp⟩⟨sp⟩a⟦-→+⟧b"},
		{"tab", "a b", "a\tb", "a⟦⟨sp⟩→⟨tab⟩⟧b"},
		{"carriage return", "fault", "fault\r", "fault⟦→⟨cr⟩⟧"},
		{"other control character", "ok", "o\x07k", "o⟦→⟨U+0007⟩⟧k"},
		{"narrow no-break space", "10 kg", "10\u202fkg", "10⟦⟨sp⟩→⟨U+202F⟩⟧kg"},
		{"invalid byte", "caf", "caf\xe9", "caf⟦→⟨0xE9⟩⟧"},
		{"plain change", "Colline", "Coline", "Col⟦l→⟧ine"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			got, ok := textEdit(c.want, c.got, editStyle{})
			require.True(t, ok)
			require.Equal(t, c.edit, got)
		})
	}
	_, ok := textEdit("Mas", "Bois", editStyle{})
	require.False(t, ok, "strings that share too little are shown whole")
}

func TestTextEditElidesLongUnchangedText(t *testing.T) {
	long := strings.Repeat("abcdefghij", 10)
	got, ok := textEdit(long+"X"+long, long+"Y"+long, editStyle{})
	require.True(t, ok)
	require.Equal(t, "…"+long[len(long)-editContext:]+"⟦X→Y⟧"+long[:editContext]+"…", got)
}

func differingTables(t *testing.T) (*Diff, *Diff) {
	want := lit(t, `house:string | day:date | tmax:float64 | note:string
		Étang | 2026-04-01 | 21.5 | "vent open"
		"Les Pins" | 2026-04-01 | 18.25 | "a note long enough to be cut in the listing, since it goes on and on and on"
		Mas | 2026-04-02 | 17 | ok`)
	got := lit(t, `house:string | day:date | tmax:float64 | note:string | extra:bool
		"Les Pins" | 2026-04-01 | 18.3 | "a note long enough to be cut in the listing, since it goes on and on and on!"
		Étang | 2026-04-01 | 21.5 | "vent\u00a0open" | true
		Bois | 2026-04-03 | +Inf | "a|b" | false`[:0]+`house:string | day:date | tmax:float64 | note:string | extra:bool
		"Les Pins" | 2026-04-01 | 18.3 | "a note long enough to be cut in the listing, since it goes on and on and on!" | true
		Étang | 2026-04-01 | 21.5 | "vent\u00a0open" | true
		Bois | 2026-04-03 | +Inf | "a|b" | false`)
	return Compare(want, got, ByKey("house", "day"), Tol("tmax", 0.01, 0)), Compare(want, got)
}

func TestText(t *testing.T) {
	keyed, positional := differingTables(t)
	text := keyed.Text()
	require.True(t, strings.HasPrefix(text, "tables differ: 1 schema change, 3 differing cells in 2 rows, 1 missing row, 1 extra row\n"), text)
	require.Contains(t, text, "want 3 rows, got 3 rows; rows matched by key (house, day)")
	// Keys first, then the column, want, got and the deltas.
	require.Regexp(t, `(?m)^  house +day +column +want +got +abs\. diff +rel\. diff$`, text)
	require.Regexp(t, `(?m)^  Les Pins +2026-04-01 +tmax +18\.25 +18\.3 +0\.05 +0\.00273$`, text)
	require.Contains(t, text, "edit: vent⟦⟨sp⟩→⟨nbsp⟩⟧open")
	require.Contains(t, text, "missing rows (1, in want, not in got)")
	require.Contains(t, text, "extra rows (1, in got, not in want)")
	require.Contains(t, text, `"a|b"`)
	require.NotContains(t, text, "\x1b[", "Text is plain")
	for _, d := range []*Diff{keyed, positional} {
		for _, line := range strings.Split(d.Text(), "\n") {
			require.LessOrEqual(t, textwidth.Width(line), 100, line)
		}
	}
	colour := keyed.TextWith(TextStyle{Color: true})
	require.Contains(t, colour, ansiWant)
	require.Contains(t, colour, ansiGot)
	require.Contains(t, colour, ansiReset)
	narrow := keyed.TextWith(TextStyle{Width: 60})
	for _, line := range strings.Split(narrow, "\n") {
		require.LessOrEqual(t, textwidth.Width(line), 60, line)
	}
}

func TestTextOfEqualAndBrokenDiffs(t *testing.T) {
	tb := lit(t, `a:int64
		1`)
	// Correct plurals: "1 row", never "1 rows".
	require.Equal(t, "tables are equal (1 row, 1 column compared)\nwant 1 row, got 1 row; rows paired by position\n", Compare(tb, tb).Text())
	text := Compare(nil, tb).Text()
	require.Contains(t, text, "problems")
	require.Contains(t, text, "! want is a nil table")
	var d *Diff
	require.True(t, d.Equal())
	require.NotPanics(t, func() { _ = d.Text(); _ = d.Markdown(); _, _ = d.JSON() })
}

func TestJSON(t *testing.T) {
	keyed, _ := differingTables(t)
	b, err := keyed.JSON()
	require.NoError(t, err)
	var m map[string]any
	require.NoError(t, json.Unmarshal(b, &m))
	for _, field := range []string{"equal", "want_rows", "got_rows", "missing_rows", "extra_rows", "cells_differing", "columns", "schema"} {
		require.Contains(t, m, field)
	}
	require.Equal(t, false, m["equal"])
	require.Equal(t, 3.0, m["want_rows"])
	require.Equal(t, 3.0, m["got_rows"])
	require.Equal(t, 1.0, m["missing_rows"])
	require.Equal(t, 1.0, m["extra_rows"])
	require.Equal(t, 3.0, m["cells_differing"])
	schema := m["schema"].([]any)
	require.Equal(t, map[string]any{"column": "extra", "change": "extra", "want": "", "got": "bool"}, schema[0])
	var tmax map[string]any
	for _, c := range m["columns"].([]any) {
		col := c.(map[string]any)
		for _, f := range []string{"name", "differing", "max_abs_delta", "max_rel_delta"} {
			require.Contains(t, col, f)
		}
		if col["name"] == "tmax" {
			tmax = col
		}
	}
	require.Equal(t, 1.0, tmax["differing"])
	require.InDelta(t, 0.05, tmax["max_abs_delta"], 1e-12)
	// An infinite delta is written as null, never as invalid JSON.
	inf := Compare(lit(t, `x:float64
		1`), lit(t, `x:float64
		+Inf`))
	b, err = inf.JSON()
	require.NoError(t, err)
	require.NoError(t, json.Unmarshal(b, &m))
	require.Nil(t, m["columns"].([]any)[0].(map[string]any)["max_abs_delta"])
	require.Nil(t, m["cells"].([]any)[0].(map[string]any)["abs_delta"])
	// Lists are [] rather than null.
	tb := lit(t, `a:int64
		1`)
	b, err = Compare(tb, tb).JSON()
	require.NoError(t, err)
	require.Contains(t, string(b), `"schema": []`)
	require.Contains(t, string(b), `"problems": []`)
	require.Contains(t, string(b), `"equal": true`)
}

func TestMarkdown(t *testing.T) {
	keyed, _ := differingTables(t)
	md := keyed.Markdown()
	require.True(t, strings.HasPrefix(md, "**Tables differ: "), md)
	require.Contains(t, md, "| rows | 3 | 3 |")
	require.Contains(t, md, "#### Differing cells (3)")
	require.Contains(t, md, "| `house` | `day` | column | want | got | abs. diff | rel. diff |")
	require.Contains(t, md, "`vent⟦⟨sp⟩→⟨nbsp⟩⟧open`")
	require.Contains(t, md, "`\"a\\|b\"`", "pipes in cells are escaped")
	require.Contains(t, md, "#### Schema changes")
	tb := lit(t, `a:int64
		1`)
	require.True(t, strings.HasPrefix(Compare(tb, tb).Markdown(), "**Tables are equal**"))
}

func TestMarkdownCode(t *testing.T) {
	require.Equal(t, "`a\\|b`", mdCode("a|b"))
	require.Equal(t, "`` a`b ``"[0:2]+"a`b"+"``", mdCode("a`b"))
	require.Equal(t, "`` `x ``", mdCode("`x"))
	require.Equal(t, "", mdCode(""))
}

func TestUseColor(t *testing.T) {
	f, err := os.Create(filepath.Join(t.TempDir(), "out.txt"))
	require.NoError(t, err)
	defer f.Close()
	require.False(t, UseColor(f), "a regular file is not a terminal")
	require.False(t, UseColor(nil))
	// Source: POSIX isatty() — /dev/null is a character device, not a
	// terminal.
	dev, err := os.OpenFile(os.DevNull, os.O_WRONLY, 0)
	require.NoError(t, err)
	defer dev.Close()
	require.False(t, UseColor(dev), "/dev/null is not a terminal")
	t.Setenv("NO_COLOR", "1")
	// Source: no-color.org — when NO_COLOR is present and not empty,
	// output carries no ANSI colour.
	require.False(t, UseColor(os.Stdout))
}

func TestTextOfWideTables(t *testing.T) {
	var head, row []string
	for i := range 40 {
		head = append(head, "column_"+itoa(i)+":int64")
		row = append(row, itoa(i*1000))
	}
	want := lit(t, strings.Join(head, " | ")+"\n"+strings.Join(row, " | "))
	empty := lit(t, strings.Join(head, " | "))
	text := Compare(want, empty).Text()
	for _, line := range strings.Split(text, "\n") {
		require.LessOrEqual(t, textwidth.Width(line), 100, line)
	}
	require.Regexp(t, `…\+\d+`, text, "left-out columns are counted")
}

func TestDiffFromJSONRoundTrip(t *testing.T) {
	keyed, positional := differingTables(t)
	inf := Compare(lit(t, `x:float64 | s:string
		1 | "a\x60b"
		2 | ok`), lit(t, `x:float64 | s:string
		+Inf | "a\x60c"
		2 | ok`))
	dup := Compare(lit(t, `k:int64 | d:date
		1 | 2026-04-01
		1 | 2026-04-02`), lit(t, `k:int64 | d:date
		1 | 2026-04-03`), ByKey("k"), ULPs("*", 1))
	broken := Compare(nil, lit(t, `a:int64`))
	for _, d := range []*Diff{keyed, positional, inf, dup, broken} {
		b, err := d.JSON()
		require.NoError(t, err)
		back, err := DiffFromJSON(b)
		require.NoError(t, err)
		again, err := back.JSON()
		require.NoError(t, err)
		require.Equal(t, string(b), string(again))
		require.Equal(t, d.Equal(), back.Equal())
		require.Equal(t, d.Text(), back.Text(), "the text report survives the round trip")
		require.Equal(t, d.Markdown(), back.Markdown())
	}
	_, err := DiffFromJSON([]byte(`{"columns": [{"name": "x", "want_type": "nope"}]}`))
	require.Error(t, err)
	_, err = DiffFromJSON([]byte(`not json`))
	require.Error(t, err)
}
