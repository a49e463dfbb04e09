// Package printable makes names that come from files safe to print: a column
// or file name holding a terminal escape sequence, a control character,
// a bidirectional override or bytes that are not UTF-8 is written as a
// quoted Go string literal (as a literal table writes such a cell), so a
// report shows it and a terminal never obeys it. It is internal: shared by
// the renderers of assert, golden and fixtures' load report.
//
// Typical use:
//
//	row = append(row, printable.Name(col.Name()))
package printable

import (
	"strconv"
	"strings"
	"unicode"
	"unicode/utf8"
)

// Name returns s as it is when every character of it shows as itself,
// else quoted as a Go string literal with backquotes escaped (\x60), so
// that it can also sit in Markdown code and Go raw strings.
func Name(s string) string {
	if Plain(s) {
		return s
	}
	return strings.ReplaceAll(strconv.Quote(s), "`", `\x60`)
}

// Plain reports whether every character of s shows as itself: valid
// UTF-8 without control characters (C0, DEL, C1), format characters (Cf:
// bidirectional controls, zero-width joiners, the byte order mark), line
// or paragraph separators, or spaces other than U+0020.
//
// Source: Unicode Standard, General Categories Cc, Cf, Zl, Zp and Zs
// (Unicode Character Database, as Go's unicode package has them); ECMA-48
// §5 (terminal control functions begin with a C0 or C1 control, ESC or
// CSI).
func Plain(s string) bool {
	for i := 0; i < len(s); {
		r, size := utf8.DecodeRuneInString(s[i:])
		if r == utf8.RuneError && size == 1 {
			return false
		}
		if r != ' ' && (unicode.IsControl(r) || unicode.In(r, unicode.Cf, unicode.Zl, unicode.Zp, unicode.Zs)) {
			return false
		}
		i += size
	}
	return true
}

// Text returns s with each character that does not show as itself (see
// Plain) written as the escape a Go string literal uses (\x7f, \t,
// \u202e, \xff for a byte that is not UTF-8), and every other character,
// spaces included, as it is: for sentences such as a problem or a hint,
// which read best unquoted.
func Text(s string) string {
	if Plain(s) {
		return s
	}
	var b strings.Builder
	for i := 0; i < len(s); {
		r, size := utf8.DecodeRuneInString(s[i:])
		switch {
		case r == utf8.RuneError && size == 1:
			b.WriteString(`\x` + strconv.FormatUint(uint64(s[i])>>4, 16) + strconv.FormatUint(uint64(s[i])&15, 16))
		case r != ' ' && (unicode.IsControl(r) || unicode.In(r, unicode.Cf, unicode.Zl, unicode.Zp, unicode.Zs)):
			q := strconv.QuoteRuneToASCII(r)
			b.WriteString(q[1 : len(q)-1])
		default:
			b.WriteString(s[i : i+size])
		}
		i += size
	}
	return b.String()
}
