package assert

import (
	"encoding/json"
	"strings"
	"testing"

	"github.com/stretchr/testify/require"

	"github.com/proofsheet/proofsheet/fixtures"
)

// hintsOf returns the hints of a kind.
func hintsOf(d *Diff, kind HintKind) []Hint {
	var out []Hint
	for _, h := range d.Hints {
		if h.Kind == kind {
			out = append(out, h)
		}
	}
	return out
}

// requireRendered checks that every renderer shows every hint of d.
func requireRendered(t *testing.T, d *Diff) {
	t.Helper()
	text, flags, md, page := d.Text(), d.TextWith(TextStyle{Flags: true}), d.Markdown(), d.HTML()
	js, err := d.JSON()
	require.NoError(t, err)
	var parsed struct {
		Hints []struct {
			Kind, Text string
		} `json:"hints"`
	}
	require.NoError(t, json.Unmarshal(js, &parsed))
	require.Len(t, parsed.Hints, len(d.Hints))
	back, err := DiffFromJSON(js)
	require.NoError(t, err)
	require.Equal(t, d.Hints, back.Hints, "hints survive JSON")
	wide := d.TextWith(TextStyle{Width: 1000})
	for i, h := range d.Hints {
		require.Equal(t, string(h.Kind), parsed.Hints[i].Kind)
		// The words requireNoHint looks for are there when the hint is.
		found := false
		for _, w := range hintWords[h.Kind] {
			found = found || strings.Contains(h.Text, w)
			if strings.Contains(h.Text, w) {
				require.Contains(t, wide, w)
				require.Contains(t, md, w)
			}
		}
		require.True(t, found, "hintWords[%s] names no words of %q", h.Kind, h.Text)
		first := strings.Fields(h.Text)[0]
		require.Contains(t, text, first)
		require.Contains(t, md, first)
		require.Contains(t, page, `data-hint="`+string(h.Kind)+`"`)
		if h.Option != "" {
			require.Contains(t, text, "fix: "+h.Option)
			require.Contains(t, md, mdCode(h.Option))
		}
		if h.Flag != "" {
			require.Contains(t, flags, "fix: "+h.Flag)
		}
	}
}

// hintWords are words each kind of hint is written with in every
// rendering, and in no other part of a report.
var hintWords = map[HintKind][]string{
	HintRowOrder:   {"the tables hold the same rows in another order"},
	HintLooseTypes: {"with loose types"},
	HintDidYouMean: {"did you mean"},
	HintRenamed:    {"the same column renamed?"},
	HintNearMatch:  {"have keys that differ only by", "⇄"},
	HintScale:      {"is its want cell ×", "follows one conversion"},
}

// requireNoHint checks that d has no hint of the kind, in its fields and
// in none of its renderings: text (with Go options and with flags),
// Markdown, HTML and JSON.
func requireNoHint(t *testing.T, d *Diff, kind HintKind, msgAndArgs ...any) {
	t.Helper()
	require.Empty(t, hintsOf(d, kind), msgAndArgs...)
	js, err := d.JSON()
	require.NoError(t, err)
	var parsed struct {
		Hints []struct{ Kind string } `json:"hints"`
	}
	require.NoError(t, json.Unmarshal(js, &parsed))
	for _, h := range parsed.Hints {
		require.NotEqual(t, string(kind), h.Kind, msgAndArgs...)
	}
	require.NotContains(t, d.HTML(), `data-hint="`+string(kind)+`"`, msgAndArgs...)
	// Wide text, so that no phrase is wrapped onto two lines.
	for _, out := range []string{d.TextWith(TextStyle{Width: 1000}), d.TextWith(TextStyle{Width: 1000, Flags: true}), d.Markdown(), d.HTML(), string(js)} {
		for _, w := range hintWords[kind] {
			require.NotContains(t, out, w, msgAndArgs...)
		}
	}
}

// requireNoHints checks that d has no hint at all, and that no rendering
// has a hints section.
func requireNoHints(t *testing.T, d *Diff) {
	t.Helper()
	require.Empty(t, d.Hints)
	for kind := range hintWords {
		requireNoHint(t, d, kind)
	}
	js, err := d.JSON()
	require.NoError(t, err)
	require.Contains(t, string(js), `"hints": []`, "an empty list, never null")
	require.NotContains(t, d.Text(), "hint")
	require.NotContains(t, d.Markdown(), "Hint")
	require.NotContains(t, d.HTML(), `class="ps-hints"`)
}

func TestHintRowOrder(t *testing.T) {
	want := fixtures.MustParse(t, `
		house:string | tmax:float64 | kept:int64
		Bellecôte    | 22.5         | 140
		Kæreby       | 19.25        | 133
		Les Pins     | 17           | 120
	`)
	shuffled := fixtures.MustParse(t, `
		house:string | tmax:float64 | kept:int64
		Les Pins     | 17           | 120
		Bellecôte    | 22.5         | 140
		Kæreby       | 19.25        | 133
	`)
	d := Compare(want, shuffled)
	hs := hintsOf(d, HintRowOrder)
	require.Len(t, hs, 1, d.Text())
	require.Equal(t, `ByKey("house") or AnyRowOrder()`, hs[0].Option, "house is unique on both sides")
	require.Equal(t, "--key house or --any-row-order", hs[0].Flag)
	require.True(t, Compare(want, shuffled, AnyRowOrder()).Equal(), "the fix works")
	require.True(t, Compare(want, shuffled, ByKey("house")).Equal(), "the fix works")
	requireRendered(t, d)

	// Within a tolerance, in another order: still the same rows.
	noisy := fixtures.MustParse(t, `
		house:string | tmax:float64 | kept:int64
		Les Pins     | 17.0000001   | 120
		Bellecôte    | 22.5         | 140
		Kæreby       | 19.25        | 133
	`)
	require.Len(t, hintsOf(Compare(want, noisy, Tol("tmax", 1e-3, 0)), HintRowOrder), 1)

	// No key column: repeated values everywhere.
	dup := fixtures.MustParse(t, `
		house:string | n:int64
		a            | 1
		a            | 2
		b            | 1
	`)
	dupShuffled := fixtures.MustParse(t, `
		house:string | n:int64
		b            | 1
		a            | 2
		a            | 1
	`)
	hs = hintsOf(Compare(dup, dupShuffled), HintRowOrder)
	require.Len(t, hs, 1)
	require.Equal(t, "AnyRowOrder()", hs[0].Option)

	// Must not: a real change in another order, a real change in place,
	// rows matched by key already, equal tables.
	changed := fixtures.MustParse(t, `
		house:string | tmax:float64 | kept:int64
		Les Pins     | 17           | 121
		Bellecôte    | 22.5         | 140
		Kæreby       | 19.25        | 133
	`)
	requireNoHint(t, Compare(want, changed), HintRowOrder)
	inPlace := fixtures.MustParse(t, `
		house:string | tmax:float64 | kept:int64
		Bellecôte    | 22.5         | 140
		Kæreby       | 19.5         | 133
		Les Pins     | 17           | 120
	`)
	requireNoHint(t, Compare(want, inPlace), HintRowOrder)
	requireNoHints(t, Compare(want, changed, ByKey("house")))
	requireNoHints(t, Compare(want, want))
}

func TestHintLooseTypes(t *testing.T) {
	cases := []struct {
		name, want, got string
		agree           bool
	}{
		{"int to float", "n:int64\n3\n4", "n:float64\n3\n4", true},
		{"float to int", "n:float64\n3.5\n4", "n:int64\n3\n4", false},
		{"category to string", "n:category\nok\nfault", "n:string\nok\nfault", true},
		{"string to category", "n:string\nok", "n:category\nok", true},
		{"date to timestamp", "n:date\n2026-04-01", "n:timestamp(s,UTC)\n2026-04-01T00:00:00Z", true},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			d := Compare(fixtures.MustParse(t, c.want), fixtures.MustParse(t, c.got))
			hs := hintsOf(d, HintLooseTypes)
			require.Len(t, hs, 1, d.Text())
			require.Equal(t, "n", hs[0].Column)
			require.Equal(t, "LooseTypes()", hs[0].Option)
			require.Equal(t, "--loose-types", hs[0].Flag)
			require.Equal(t, c.agree, strings.Contains(hs[0].Text, "the values agree"), hs[0].Text)
			requireRendered(t, d)
			// Must not, once the option is given.
			requireNoHint(t, Compare(fixtures.MustParse(t, c.want), fixtures.MustParse(t, c.got), LooseTypes()), HintLooseTypes)
		})
	}
	// Must not: kinds LooseTypes does not bridge.
	d := Compare(fixtures.MustParse(t, "n:int64\n3"), fixtures.MustParse(t, "n:string\n3"))
	require.NotEmpty(t, d.Schema)
	requireNoHint(t, d, HintLooseTypes)
	d = Compare(fixtures.MustParse(t, "n:timestamp(ms)\n2026-04-01T00:00:00"), fixtures.MustParse(t, "n:timestamp(s)\n2026-04-01T00:00:00"))
	requireNoHint(t, d, HintLooseTypes, "a unit change is not a kind change")
}

func TestHintDidYouMean(t *testing.T) {
	want := fixtures.MustParse(t, `
		house:string | tmax:float64
		Bellecôte    | 22.5
	`)
	d := Compare(want, want, ByKey("hosue"), Tol("Tmax", 0.1, 0))
	require.False(t, d.Equal())
	hs := hintsOf(d, HintDidYouMean)
	require.Len(t, hs, 2, d.Text())
	require.Equal(t, "hosue", hs[0].Name)
	require.Equal(t, "house", hs[0].Suggest)
	require.Equal(t, `ByKey("house")`, hs[0].Option)
	require.Equal(t, "--key house", hs[0].Flag)
	require.Contains(t, hs[0].Text, `did you mean "house"?`)
	require.Equal(t, "tmax", hs[1].Suggest, "letter case only")
	requireRendered(t, d)

	// A key present on one side only: suggest from the side that lacks it.
	got := fixtures.MustParse(t, `
		House:string | tmax:float64
		Bellecôte    | 22.5
	`)
	hs = hintsOf(Compare(want, got, ByKey("house")), HintDidYouMean)
	require.Len(t, hs, 1)
	require.Equal(t, "House", hs[0].Suggest)

	// Must not: nothing close, and a name that exists.
	requireNoHint(t, Compare(want, want, ByKey("zone")), HintDidYouMean)
	requireNoHints(t, Compare(want, want, ByKey("house")))

	// A renamed column.
	renamed := fixtures.MustParse(t, `
		house:string | t_max:float64
		Bellecôte    | 22.5
	`)
	hs = hintsOf(Compare(want, renamed), HintRenamed)
	require.Len(t, hs, 1)
	require.Equal(t, "tmax", hs[0].Name)
	require.Equal(t, "t_max", hs[0].Suggest)
	other := fixtures.MustParse(t, `
		house:string | kept:int64
		Bellecôte    | 140
	`)
	requireNoHint(t, Compare(want, other), HintRenamed, "tmax and kept are not one column renamed")
}

func TestHintNearMatch(t *testing.T) {
	tb := func(houses ...string) *fixtures.Table {
		b := fixtures.NewBuilder(fixtures.Schema{fixtures.Col("house", fixtures.String), fixtures.Col("day", fixtures.Date), fixtures.Col("tmax", fixtures.Float64)})
		for i, h := range houses {
			b.Row(h, "2026-04-01", float64(20+i))
		}
		out, err := b.Build()
		require.NoError(t, err)
		return out
	}
	cases := []struct {
		name      string
		want, got string
		why       []string
		option    bool
	}{
		// Source: Unicode CaseFolding.txt — È (U+00C8) folds to è (U+00E8).
		{"case", "Père", "PÈRE", []string{"case"}, true},
		{"blanks", "Les Pins", " Les  Pins", []string{"blanks"}, false},
		{"edge blanks", "Les Pins", "Les Pins\u00a0", []string{"blanks"}, true},
		// Source: Unicode Standard Annex #15 — e + U+0300 COMBINING GRAVE
		// ACCENT composes to U+00E8 under NFC.
		{"normalisation", "Père", "Pe\u0300re", []string{"Unicode normalisation"}, true},
		// Source: WHATWG Encoding Standard, index windows-1252 — byte 0xE8
		// is U+00E8 è; alone it is not UTF-8.
		{"Windows-1252 bytes", "Père", "P\xe8re", []string{"encoding"}, false},
		// Source: WHATWG Encoding Standard — è is C3 A8 in UTF-8, and bytes
		// C3 A8 read as windows-1252 are Ã (U+00C3) and ¨ (U+00A8).
		{"UTF-8 read as Windows-1252", "Père", "PÃ¨re", []string{"encoding"}, false},
		{"case and encoding", "Père", "P\xc8RE", []string{"case", "encoding"}, false},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			d := Compare(tb(c.want, "Kæreby"), tb(c.got, "Kæreby"), ByKey("house", "day"))
			require.Equal(t, 1, d.Missing.Count)
			require.Equal(t, 1, d.Extra.Count)
			hs := hintsOf(d, HintNearMatch)
			require.Len(t, hs, 1, d.Text())
			require.Equal(t, 1, hs[0].Count)
			require.Len(t, hs[0].Pairs, 1)
			p := hs[0].Pairs[0]
			require.Equal(t, c.why, p.Why)
			require.Equal(t, 0, p.Missing.Want)
			require.Equal(t, 0, p.Extra.Got)
			require.Equal(t, c.option, hs[0].Option != "", hs[0].Option)
			requireRendered(t, d)
			text := d.Text()
			require.Contains(t, text, "⇄", "side by side")
			require.NotEqual(t, p.Missing.Key, p.Extra.Key, "the two keys never look alike")
		})
	}

	// Several pairs; the listing is capped, the count is not.
	d := Compare(tb("Père", "Mère", "Kæreby"), tb("PÈRE", "MÈRE", "kæreby"), ByKey("house"), ListLimit(2))
	hs := hintsOf(d, HintNearMatch)
	require.Len(t, hs, 1)
	require.Equal(t, 3, hs[0].Count)
	require.Len(t, hs[0].Pairs, 2)
	require.Contains(t, d.Text(), "… 1 more")

	// Must not: keys that are really different, rows not keyed, no
	// extra row.
	requireNoHint(t, Compare(tb("Père"), tb("Mère"), ByKey("house")), HintNearMatch)
	requireNoHint(t, Compare(tb("Père", "x"), tb("PÈRE"), AnyRowOrder()), HintNearMatch)
	requireNoHint(t, Compare(tb("Père", "Mère"), tb("Père"), ByKey("house")), HintNearMatch)
}

func TestHintScale(t *testing.T) {
	col := func(name string, vals ...float64) *fixtures.Table {
		b := fixtures.NewBuilder(fixtures.Schema{fixtures.Col("house", fixtures.String), fixtures.Col(name, fixtures.Float64)})
		for i, v := range vals {
			b.Row([]string{"Bellecôte", "Kæreby", "Les Pins", "Étang"}[i], v)
		}
		out, err := b.Build()
		require.NoError(t, err)
		return out
	}
	share := col("share", 0.25, 0.5, 0, 0.125)
	d := Compare(share, col("share", 25, 50, 0, 12.5))
	hs := hintsOf(d, HintScale)
	require.Len(t, hs, 1, d.Text())
	require.Equal(t, 100.0, hs[0].Factor)
	require.Equal(t, "share", hs[0].Column)
	require.Equal(t, 4, hs[0].Count)
	require.Contains(t, hs[0].Text, "× 100")
	requireRendered(t, d)

	// ×0.001, computed in floats (0.1 × 0.001 is not exactly 1e-4).
	grams := col("mass", 1200, 0.1, 33, 7)
	d = Compare(grams, col("mass", 1200*0.001, 0.1*0.001, 33*0.001, 7*0.001))
	hs = hintsOf(d, HintScale)
	require.Len(t, hs, 1, d.Text())
	require.Equal(t, 0.001, hs[0].Factor)

	// Source: NIST SP 811 (2008) appendix B.8 — t/°F = 1.8 t/°C + 32:
	// 0 °C = 32 °F, 100 °C = 212 °F, −40 °C = −40 °F, 21.5 °C = 70.7 °F.
	celsius := col("tmax", 0, 100, -40, 21.5)
	fahrenheit := col("tmax", 32, 212, -40, 70.7)
	hs = hintsOf(Compare(celsius, fahrenheit), HintScale)
	require.Len(t, hs, 1)
	require.Equal(t, 1.8, hs[0].Factor)
	require.Equal(t, 32.0, hs[0].Offset)
	require.Contains(t, hs[0].Text, "°F where want is °C")
	hs = hintsOf(Compare(fahrenheit, celsius), HintScale)
	require.Len(t, hs, 1)
	require.Contains(t, hs[0].Text, "°C where want is °F")
	// Rounded to 0.1 on both sides: 22.3 °C is 72.14 °F, written 72.1.
	hs = hintsOf(Compare(col("tmax", 22.3, 18.7), col("tmax", 72.1, 65.7)), HintScale)
	require.Len(t, hs, 1)

	// Must not: one cell off the factor, random changes, a null on one
	// side, a single cell.
	requireNoHint(t, Compare(share, col("share", 25, 50, 0, 12.6)), HintScale)
	requireNoHint(t, Compare(share, col("share", 0.3, 0.4, 0.1, 0.2)), HintScale)
	requireNoHint(t, Compare(col("share", 0.25, 0.5), col("share", 0.25, 50)), HintScale, "one cell is no pattern")
	nulls := fixtures.MustParse(t, "share:float64\n25\n~\n12.5")
	requireNoHint(t, Compare(fixtures.MustParse(t, "share:float64\n0.25\n0.5\n0.125"), nulls), HintScale)
	requireNoHint(t, Compare(col("x", 1, 2), col("x", 3, 4)), HintScale)
}
