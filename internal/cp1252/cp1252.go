package cp1252

import (
	"unicode/utf8"

	"golang.org/x/text/encoding/charmap"
)

var decode = func() (t [256]rune) {
	for i := range t {
		t[i] = charmap.Windows1252.DecodeByte(byte(i))
		if t[i] == utf8.RuneError {
			t[i] = rune(i)
		}
	}
	return t
}()

// Rune returns the character of byte b.
func Rune(b byte) rune { return decode[b] }

// Byte returns the byte of character r, and false when Windows-1252 has
// none.
func Byte(r rune) (byte, bool) {
	if r < 0x80 {
		return byte(r), true
	}
	switch r {
	case 0x81, 0x8D, 0x8F, 0x90, 0x9D:
		return byte(r), true
	}
	return charmap.Windows1252.EncodeRune(r)
}

// Decode turns Windows-1252 bytes into UTF-8.
func Decode(data []byte) []byte {
	out := make([]byte, 0, len(data)+len(data)/8)
	for _, c := range data {
		if c < 0x80 {
			out = append(out, c)
			continue
		}
		out = utf8.AppendRune(out, decode[c])
	}
	return out
}

// Encode turns UTF-8 text into Windows-1252 bytes; ok is false when a
// character has no byte (or s is not valid UTF-8).
func Encode(s []byte) (out []byte, ok bool) {
	out = make([]byte, 0, len(s))
	for i := 0; i < len(s); {
		c := s[i]
		if c < 0x80 {
			out = append(out, c)
			i++
			continue
		}
		r, n := utf8.DecodeRune(s[i:])
		if r == utf8.RuneError && n == 1 {
			return nil, false
		}
		b, ok := Byte(r)
		if !ok {
			return nil, false
		}
		out = append(out, b)
		i += n
	}
	return out, true
}
