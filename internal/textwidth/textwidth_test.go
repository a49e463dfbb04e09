package textwidth

import (
	"testing"

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
}
