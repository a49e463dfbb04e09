package textwidth

import (
	"testing"

	"github.com/rivo/uniseg"
	"github.com/stretchr/testify/require"
)

func TestWidth(t *testing.T) {
	cases := []struct {
		s    string
		want int
	}{
		{"", 0},
		{"Bellecôte", 9},
		// Source: Unicode Standard Annex #11 (East Asian Width) — U+6F22 is
		// W (wide) and U+FF21 FULLWIDTH LATIN CAPITAL LETTER A is F: 2 columns each.
		{"漢字", 4},
		{"ＡＢ", 4},
		// Source: Unicode Standard ch. 3 — U+0301 COMBINING ACUTE ACCENT is a
		// nonspacing mark (Mn), drawn on the letter before it.
		{"E\u0301tang", 5},
		// U+200B ZERO WIDTH SPACE and U+FEFF are format characters (Cf).
		{"a\u200bb\ufeff", 2},
		{"tab\tx", 4},
		{"\xff", 1},
		// Source: Unicode Technical Standard #51 (Emoji) — U+1F44D THUMBS UP
		// SIGN has Emoji_Presentation=Yes (2 columns); U+1F3FD is an emoji
		// modifier (§1.4.3) that joins it in one grapheme cluster (UAX #29
		// rule GB9), so the pair stays 2 columns, not 4.
		{"\U0001F44D", 2},
		{"\U0001F44D\U0001F3FD", 2},
		// Source: UTS #51 §2.3 — a ZWJ sequence (man, ZWJ, woman, ZWJ, girl)
		// is one emoji: one cluster (UAX #29 rule GB11), 2 columns.
		{"\U0001F468\u200d\U0001F469\u200d\U0001F467", 2},
		// Source: UTS #51 §1.4.3 — U+2764 HEAVY BLACK HEART defaults to text
		// presentation (1 column); variation selector 16 (U+FE0F) asks for
		// emoji presentation (2 columns), selector 15 (U+FE0E) for text.
		{"\u2764", 1},
		{"\u2764\ufe0f", 2},
		{"\U0001F600\ufe0e", 1},
		// Source: UTS #51 annex B — a flag is a pair of regional indicators
		// (here F, R): one cluster (UAX #29 rule GB12), 2 columns.
		{"\U0001F1EB\U0001F1F7", 2},
		// Source: Unicode Standard ch. 18 — Hangul jamo L+V+T compose one
		// syllable block, a wide character (UAX #11 W for U+1100).
		{"\u1100\u1161\u11a8", 2},
	}
	for _, c := range cases {
		require.Equal(t, c.want, Width(c.s), "%q", c.s)
	}
}

func TestPadAndTruncate(t *testing.T) {
	require.Equal(t, "Ørnely   |", PadRight("Ørnely", 9)+"|")
	require.Equal(t, "   Ørnely", PadLeft("Ørnely", 9))
	require.Equal(t, "漢字", PadRight("漢字", 3), "never cut by padding")
	require.Equal(t, "Bellec…", Truncate("Bellecôte", 7))
	require.Equal(t, 7, Width(Truncate("Bellecôte", 7)))
	require.Equal(t, "漢…", Truncate("漢字漢字", 4), "a wide character that does not fit is left out")
	require.Equal(t, "short", Truncate("short", 10))
	require.Equal(t, "", Truncate("abc", 0))
	require.Equal(t, "E\u0301t…", Truncate("E\u0301tang", 3), "the accent stays on its letter")
	family := "\U0001F468\u200d\U0001F469\u200d\U0001F467"
	require.Equal(t, "ab…", Truncate("ab"+family+"cd", 4), "a ZWJ sequence is kept whole or left out")
	require.Equal(t, "ab"+family+"…", Truncate("ab"+family+"cd", 5))
	require.Equal(t, "PadRight: "+family+"   |", "PadRight: "+PadRight(family, 5)+"|")
}

// TestPrintableASCIIAsSegmented checks the shortcut for printable ASCII
// against the segmentation it skips, on every printable character and
// on strings with a control or a non-ASCII character.
func TestPrintableASCIIAsSegmented(t *testing.T) {
	var all []byte
	for c := byte(0x20); c <= 0x7e; c++ {
		all = append(all, c)
	}
	slow := func(s string) int {
		n, state := 0, -1
		for s != "" {
			var w int
			_, s, w, state = uniseg.FirstGraphemeClusterInString(s, state)
			n += w
		}
		return n
	}
	for _, s := range []string{string(all), "house  tmax", "a\tb", "ab\x7f", "ab\x1b[1m", "Étang"} {
		require.Equal(t, slow(s), Width(s), "%q", s)
	}
	require.Equal(t, "abc…", Truncate("abcdefgh", 4))
	require.Equal(t, 4, Width(Truncate(string(all), 4)))
}

func TestWrap(t *testing.T) {
	cases := []struct {
		in     string
		w, ind int
		want   []string
	}{
		{"a b c", 10, 0, []string{"a b c"}},
		{"aa bb cc", 5, 2, []string{"aa bb", "  cc"}},
		// A word wider than the line stays whole.
		{"x " + "Château-Rouge-sur-la-Colline" + " y", 10, 1, []string{"x", " Château-Rouge-sur-la-Colline", " y"}},
		// Widths are columns: 日本 is 4 columns. Source: Unicode Standard
		// Annex #11 — U+65E5 and U+672C are East Asian Wide.
		{"日本 日本 日本", 9, 0, []string{"日本 日本", "日本"}},
		{"", 5, 0, []string{""}},
	}
	for _, c := range cases {
		require.Equal(t, c.want, Wrap(c.in, c.w, c.ind), c.in)
	}
}
