package textwidth

import (
	"strings"
	"unicode"
	"unicode/utf8"

	"golang.org/x/text/width"
)

// Width returns the number of monospace columns s occupies: East Asian wide
// and fullwidth characters count 2 (Unicode Standard Annex #11), combining
// marks and zero-width format characters count 0, everything else 1. An
// invalid UTF-8 byte counts 1.
func Width(s string) int {
	n := 0
	for i := 0; i < len(s); {
		r, size := utf8.DecodeRuneInString(s[i:])
		i += size
		n += RuneWidth(r)
	}
	return n
}

// RuneWidth returns the number of monospace columns r occupies.
func RuneWidth(r rune) int {
	switch {
	case r < 0x300:
		if r < 0x20 || (r >= 0x7f && r < 0xa0) {
			return 0
		}
		return 1
	case unicode.Is(unicode.Mn, r), unicode.Is(unicode.Me, r), unicode.Is(unicode.Cf, r):
		return 0
	}
	switch width.LookupRune(r).Kind() {
	case width.EastAsianWide, width.EastAsianFullwidth:
		return 2
	}
	return 1
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

// Truncate cuts s to at most w columns, ending it with "…" when cut.
func Truncate(s string, w int) string {
	if Width(s) <= w {
		return s
	}
	if w <= 0 {
		return ""
	}
	n := 0
	var b strings.Builder
	for _, r := range s {
		rw := RuneWidth(r)
		if n+rw > w-1 {
			break
		}
		b.WriteRune(r)
		n += rw
	}
	b.WriteString("…")
	return b.String()
}
