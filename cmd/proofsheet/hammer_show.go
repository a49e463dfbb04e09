package main

import (
	"bytes"
	"fmt"
	"strconv"
	"strings"
	"unicode"
	"unicode/utf8"

	xunicode "golang.org/x/text/encoding/unicode"
	"golang.org/x/text/encoding/unicode/utf32"

	"github.com/proofsheet/proofsheet/fixtures"
	"github.com/proofsheet/proofsheet/internal/cp1252"
)

// showBytes writes a raw input file for a person: decoded from its
// encoding, one numbered line per line, and each line that holds anything
// a reader could not see — blanks at an edge, tabs, no-break or
// zero-width spaces, a byte order mark, control characters, a carriage
// return before the line feed, bytes that are not UTF-8 — marked with *
// after its number and written as a quoted Go string, so every such
// character shows as an escape (\t, \u00a0, \r, \xe9). The first line
// says how many bytes, which encoding and which line endings the file
// has.
func showBytes(data []byte, enc fixtures.Encoding, maxLines int) string {
	text, note := decodeFor(data, enc)
	lf, crlf, cr := 0, 0, 0
	for i := 0; i < len(text); i++ {
		switch text[i] {
		case '\n':
			if i > 0 && text[i-1] == '\r' {
				crlf++
			} else {
				lf++
			}
		case '\r':
			if i+1 >= len(text) || text[i+1] != '\n' {
				cr++
			}
		}
	}
	var ends []string
	for _, e := range []struct {
		n    int
		name string
	}{{lf, "LF"}, {crlf, "CRLF"}, {cr, "CR"}} {
		if e.n > 0 {
			ends = append(ends, fmt.Sprintf("%d %s", e.n, e.name))
		}
	}
	if len(ends) == 0 {
		ends = []string{"no line end"}
	}
	var b strings.Builder
	fmt.Fprintf(&b, "%s, %s; line ends: %s", pluralWord(len(data), "byte", "bytes"), note, strings.Join(ends, ", "))
	lines := strings.SplitAfter(string(text), "\n")
	if lines[len(lines)-1] == "" {
		lines = lines[:len(lines)-1]
	}
	width := len(strconv.Itoa(len(lines)))
	var body strings.Builder
	marked := false
	for i, l := range lines {
		if i == maxLines {
			more := "lines"
			if len(lines)-i == 1 {
				more = "line"
			}
			fmt.Fprintf(&body, "%*s   … %d more %s\n", width, "", len(lines)-i, more)
			break
		}
		text, mark := strings.TrimSuffix(l, "\n"), " "
		if hidden(text) {
			text, mark, marked = strconv.Quote(text), "*", true
		}
		fmt.Fprintf(&body, "%*d%s %s\n", width, i+1, mark, text)
	}
	if marked {
		b.WriteString("; lines marked * hold characters you could not see, written as Go strings")
	}
	b.WriteString("\n" + body.String())
	return b.String()
}

// decodeFor decodes a file's bytes for showing, and says how.
func decodeFor(data []byte, enc fixtures.Encoding) ([]byte, string) {
	switch enc {
	case fixtures.EncodingUTF8BOM:
		if bytes.HasPrefix(data, []byte{0xEF, 0xBB, 0xBF}) {
			return data[3:], "UTF-8 after a byte order mark (not shown)"
		}
	case fixtures.EncodingUTF16LE:
		out, err := xunicode.UTF16(xunicode.LittleEndian, xunicode.ExpectBOM).NewDecoder().Bytes(data)
		if err == nil {
			return out, "UTF-16LE with a byte order mark, shown decoded"
		}
	case fixtures.EncodingUTF16BE:
		out, err := xunicode.UTF16(xunicode.BigEndian, xunicode.ExpectBOM).NewDecoder().Bytes(data)
		if err == nil {
			return out, "UTF-16BE with a byte order mark, shown decoded"
		}
	case fixtures.EncodingUTF32LE, fixtures.EncodingUTF32BE:
		order := utf32.LittleEndian
		if enc == fixtures.EncodingUTF32BE {
			order = utf32.BigEndian
		}
		out, err := utf32.UTF32(order, utf32.ExpectBOM).NewDecoder().Bytes(data)
		if err == nil {
			return out, string(enc) + ", shown decoded"
		}
	case fixtures.EncodingWindows1252:
		return cp1252.Decode(data), "Windows-1252, shown decoded"
	}
	return data, "UTF-8"
}

// hidden reports whether a line holds something a reader could not see.
func hidden(s string) bool {
	if s != strings.TrimFunc(s, unicode.IsSpace) {
		return true
	}
	for i := 0; i < len(s); {
		r, size := utf8.DecodeRuneInString(s[i:])
		if r == utf8.RuneError && size == 1 {
			return true
		}
		if r != ' ' && (!unicode.IsPrint(r) || unicode.Is(unicode.Zs, r) || r == '\u00ad') {
			return true
		}
		i += size
	}
	return false
}
