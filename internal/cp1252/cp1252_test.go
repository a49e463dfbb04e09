package cp1252

import (
	"testing"

	"github.com/stretchr/testify/require"
	"golang.org/x/text/encoding/charmap"
)

func TestWHATWGIndex(t *testing.T) {
	// Source: WHATWG Encoding Standard, index-windows-1252 (from memory):
	// 0x80 → U+20AC, 0x8A → U+0160, 0x9F → U+0178, and the five bytes
	// 0x81 0x8D 0x8F 0x90 0x9D → the C1 controls U+0081 … U+009D.
	require.Equal(t, rune(0x20AC), Rune(0x80))
	require.Equal(t, rune(0x0160), Rune(0x8A))
	require.Equal(t, rune(0x0178), Rune(0x9F))
	for _, b := range []byte{0x81, 0x8D, 0x8F, 0x90, 0x9D} {
		require.Equal(t, rune(b), Rune(b))
	}
	for i := 0; i < 256; i++ {
		b := byte(i)
		// Every other byte agrees with x/text's charmap table.
		if want := charmap.Windows1252.DecodeByte(b); want != 0xFFFD {
			require.Equal(t, want, Rune(b), "byte %#x", b)
		}
		back, ok := Byte(Rune(b))
		require.True(t, ok, "byte %#x", b)
		require.Equal(t, b, back, "byte %#x round-trips", b)
	}
}

func TestDecodeEncode(t *testing.T) {
	raw := []byte{'B', 'e', 'l', 'l', 'e', 'c', 0xF4, 't', 'e', ' ', 0x80, 0x81}
	text := Decode(raw)
	require.Equal(t, "Bellecôte €\u0081", string(text))
	back, ok := Encode(text)
	require.True(t, ok)
	require.Equal(t, raw, back)
	_, ok = Encode([]byte("漢"))
	require.False(t, ok, "no Windows-1252 byte for a CJK character")
	_, ok = Encode([]byte{0xFF})
	require.False(t, ok, "not UTF-8")
}
