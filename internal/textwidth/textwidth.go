package textwidth

import (
	"strings"

	"github.com/rivo/uniseg"
)

// Width returns the number of monospace terminal columns s occupies. It
// walks s by grapheme clusters (Unicode Standard Annex #29), so a letter
// with combining marks, an emoji with a skin-tone modifier, a flag (two
// regional indicators) and a zero-width-joiner sequence each count as one
// character, and gives each cluster its East Asian width (Annex #11): wide
// and fullwidth characters and emoji shown as emoji count 2 columns, a
// variation selector 16 turns a text-style pictograph into a 2-column
// emoji (and selector 15 back into 1), control and format characters count
// 0, everything else 1. An invalid UTF-8 byte counts 1.
//
// The measuring is github.com/rivo/uniseg's, whose tables follow the
// Unicode version it was built for.
func Width(s string) int {
	if printableASCII(s) {
		return len(s) // one column a character, and clusters of one byte
	}
	n := 0
	state := -1
	for s != "" {
		var w int
		_, s, w, state = uniseg.FirstGraphemeClusterInString(s, state)
		n += w
	}
	return n
}

// PadRight returns s followed by spaces up to w columns.
func PadRight(s string, w int) string {
	if d := w - Width(s); d > 0 {
		return s + strings.Repeat(" ", d)
	}
	return s
}

// PadLeft returns s preceded by spaces up to w columns.
func PadLeft(s string, w int) string {
	if d := w - Width(s); d > 0 {
		return strings.Repeat(" ", d) + s
	}
	return s
}

// Truncate cuts s to at most w columns, ending it with "…" when cut. It
// cuts only between grapheme clusters, so no accent is torn off its letter
// and no emoji sequence is split.
func Truncate(s string, w int) string {
	if Width(s) <= w {
		return s
	}
	if w <= 0 {
		return ""
	}
	if printableASCII(s) {
		return s[:w-1] + "…"
	}
	n := 0
	var b strings.Builder
	state := -1
	for s != "" {
		var cluster string
		var cw int
		cluster, s, cw, state = uniseg.FirstGraphemeClusterInString(s, state)
		if n+cw > w-1 {
			break
		}
		b.WriteString(cluster)
		n += cw
	}
	b.WriteString("…")
	return b.String()
}

// printableASCII reports whether s holds only the printable ASCII
// characters U+0020 to U+007E: each is a grapheme cluster of its own (UAX
// #29 breaks between any two of them) one column wide, so the common case
// needs no segmentation.
func printableASCII(s string) bool {
	for i := 0; i < len(s); i++ {
		if c := s[i]; c < 0x20 || c > 0x7e {
			return false
		}
	}
	return true
}

// Wrap breaks s at spaces into lines of at most w columns; lines after the
// first start with indent spaces. A word longer than a line stays whole on
// a line of its own: nothing is ever cut.
func Wrap(s string, w, indent int) []string {
	var lines []string
	line := ""
	for _, word := range strings.Split(s, " ") {
		switch {
		case line == "":
			line = word
		case Width(line)+1+Width(word) <= w:
			line += " " + word
		default:
			lines = append(lines, line)
			line = strings.Repeat(" ", indent) + word
		}
	}
	return append(lines, line)
}
