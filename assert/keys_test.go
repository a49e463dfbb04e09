package assert

import (
	"strings"
	"testing"

	"github.com/stretchr/testify/require"

	"github.com/proofsheet/proofsheet/fixtures"
	"github.com/proofsheet/proofsheet/internal/textwidth"
)

// longKeyTables are a want and a got table keyed by three long columns,
// with a changed cell, a missing row, an extra row, a repeated key and a
// near match, so every listing shows keys.
func longKeyTables(t *testing.T) (want, got *fixtures.Table, keys []string) {
	t.Helper()
	schema := fixtures.Schema{
		fixtures.Col("house", fixtures.String), fixtures.Col("bay", fixtures.String), fixtures.Col("day", fixtures.Date),
		fixtures.Col("tmax", fixtures.Float64), fixtures.Col("kept", fixtures.Int64), fixtures.Col("note", fixtures.String),
	}
	house := "Château-Rouge-sur-la-Colline-des-Trois-Moulins"
	bay := "travée nord numéro douze, bâtiment historique"
	note := strings.Repeat("a long note that may be shortened ", 3)
	wb, gb := fixtures.NewBuilder(schema), fixtures.NewBuilder(schema)
	wb.Row(house, bay, "2026-04-01", 21.5, int64(140), note)
	gb.Row(house, bay, "2026-04-01", 22.5, int64(140), note+"!")
	wb.Row(house, bay, "2026-04-02", 20.0, int64(130), note) // missing
	wb.Row(house, "Père-Lachaise", "2026-04-03", 19.0, int64(120), note)
	gb.Row(house, "PÈRE-LACHAISE", "2026-04-03", 19.0, int64(120), note) // near match
	gb.Row(house, bay, "2026-04-05", 18.0, int64(110), note)             // extra, repeated
	gb.Row(house, bay, "2026-04-05", 18.5, int64(111), note)
	var err error
	want, err = wb.Build()
	require.NoError(t, err)
	got, err = gb.Build()
	require.NoError(t, err)
	return want, got, []string{house, bay, "Père-Lachaise", "PÈRE-LACHAISE"}
}

// requireKeysWhole checks that every key appears whole in out and that a
// line wider than width holds a key that needs the room.
func requireKeysWhole(t *testing.T, out string, keys []string, width int) {
	t.Helper()
	for _, k := range keys {
		require.Contains(t, out, k, "key %q whole", k)
	}
	if width <= 0 {
		return
	}
	for _, l := range strings.Split(out, "\n") {
		if textwidth.Width(l) <= width {
			continue
		}
		long := false
		for _, k := range keys {
			long = long || strings.Contains(l, k)
		}
		require.True(t, long, "a line wider than %d without a key: %q", width, l)
	}
}

func TestKeysNeverCut(t *testing.T) {
	want, got, keys := longKeyTables(t)
	d := Compare(want, got, ByKey("house", "bay", "day"))
	require.Equal(t, 2, d.CellsDiffering, d.Text())
	require.Equal(t, 2, d.Missing.Count)
	require.Equal(t, 3, d.Extra.Count)
	require.NotEmpty(t, hintsOf(d, HintNearMatch))
	require.Equal(t, 1, d.Duplicates.GotKeys)

	for _, width := range []int{100, 80, 60} {
		text := d.TextWith(TextStyle{Width: width})
		requireKeysWhole(t, text, keys, width)
		// The note, not a key, is shortened to fit.
		require.NotContains(t, text, strings.Repeat("a long note that may be shortened ", 3)+"!", "width %d", width)
	}
	// The column summary's "at" holds the whole key, even at 100 columns.
	text := d.TextWith(TextStyle{Width: 100})
	require.Contains(t, text, "("+keys[0]+", "+keys[1]+", 2026-04-01)")
	// Colour does not change what is shown.
	requireKeysWhole(t, d.TextWith(TextStyle{Width: 100, Color: true}), keys, 0)
	requireKeysWhole(t, d.Markdown(), keys, 0)
	requireKeysWhole(t, d.HTML(), keys, 0)
	js, err := d.JSON()
	require.NoError(t, err)
	requireKeysWhole(t, string(js), keys, 0)

	// Without keys, rows are named by number and every cell may be
	// shortened to fit.
	for _, l := range strings.Split(Compare(want, got).TextWith(TextStyle{Width: 100}), "\n") {
		require.LessOrEqual(t, textwidth.Width(l), 100, l)
	}
}

func TestNarrowTablesKeepKeys(t *testing.T) {
	// A table whose keys alone are wider than the line: the keys go on
	// lines of their own, whole, and the other columns still fit.
	key := strings.Repeat("Ørnely-", 20) // 140 columns
	want := fixtures.MustParse(t, "house:string | tmax:float64\n"+key+" | 1")
	got := fixtures.MustParse(t, "house:string | tmax:float64\n"+key+" | 2")
	d := Compare(want, got, ByKey("house"))
	text := d.TextWith(TextStyle{Width: 100})
	requireKeysWhole(t, text, []string{key}, 100)
	require.Contains(t, text, "  house: "+key, "the key moved to its own line")
	require.Contains(t, text, "    where max: ("+key+")")
}
