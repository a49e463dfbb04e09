package assert

import (
	"regexp"
	"strings"
	"testing"

	"github.com/proofsheet/proofsheet/fixtures"
	"github.com/stretchr/testify/require"
)

// ansiRe matches the SGR colour sequences the text report writes itself.
var ansiRe = regexp.MustCompile("\x1b\\[[0-9;]*m")

// controlBytes returns the control characters in s other than newline
// (C0, DEL and C1 in UTF-8), which a terminal would obey.
func controlBytes(s string) []rune {
	var out []rune
	for _, r := range s {
		if r != '\n' && (r < 0x20 || r == 0x7f || (r >= 0x80 && r < 0xa0)) {
			out = append(out, r)
		}
	}
	return out
}

// TestRenderersEscapeNames: terminal escape sequences in column names
// and side names are shown, never obeyed, in text and Markdown, as they
// already were in cells.
//
// Source: ECMA-48 §5.4 (CSI "ESC [", SGR "m", ED "2J"), §8.3.89 (OSC
// "ESC ]" … BEL sets a window title in xterm); 0x9B is the 8-bit CSI.
func TestRenderersEscapeNames(t *testing.T) {
	key := "k\x1b[2J"
	red := "t\x1b[31mred\x1b]0;title\x07"
	only := "only\u009b5m"
	schema := func(last string) fixtures.Schema {
		return fixtures.Schema{fixtures.Col(key, fixtures.Int64), fixtures.Col(red, fixtures.Float64), fixtures.Col(last, fixtures.String)}
	}
	want := fixtures.NewBuilder(schema(only)).Row(1, 1.5, "a").Row(2, 2.5, "b").MustBuild(t)
	got := fixtures.NewBuilder(schema("x\by")).Row(1, 1.75, "a").Row(3, 2.5, "b").MustBuild(t)
	d := Compare(want, got, ByKey(key), Tol(red, 0.01, 0))
	d.WantName, d.GotName = "want\x1b[8m.csv", "got.csv"
	for name, out := range map[string]string{"text": d.Text(), "markdown": d.Markdown(), "colour text": d.TextWith(TextStyle{Color: true})} {
		bad := controlBytes(out)
		if name == "colour text" {
			// Only the report's own SGR colours.
			out = ansiRe.ReplaceAllString(out, "")
			bad = controlBytes(out)
		}
		require.Empty(t, bad, "%s:\n%s", name, out)
		require.Contains(t, out, `"t\x1b[31mred\x1b]0;title\a"`, name)
		require.Contains(t, out, `"k\x1b[2J"`, name)
		require.Contains(t, out, `"want\x1b[8m.csv"`, name)
	}
	require.True(t, strings.Contains(d.Text(), `"only\u009b5m"`), d.Text())
}
