package printable

import (
	"testing"

	"github.com/stretchr/testify/require"
)

func TestName(t *testing.T) {
	tests := []struct{ in, want string }{
		{"tmax", "tmax"},
		{"air temp", "air temp"},
		{"Étang 🌱", "Étang 🌱"},
		{"a\"b|c", "a\"b|c"},
		// Source: ECMA-48 — ESC [ 31 m is SGR red; ESC ] 0 ; … BEL sets
		// the window title; 0x9B is the 8-bit CSI.
		{"t\x1b[31mred\x1b]0;title\x07", `"t\x1b[31mred\x1b]0;title\a"`},
		{"x\by", `"x\by"`},
		{"a\u009b31m", `"a\u009b31m"`},
		// Source: Unicode Standard — U+202E RIGHT-TO-LEFT OVERRIDE (Cf),
		// U+2028 LINE SEPARATOR (Zl), U+00A0 NO-BREAK SPACE (Zs).
		{"abc\u202edef", `"abc\u202edef"`},
		{"a\u2028b", `"a\u2028b"`},
		{"a\u00a0b", `"a\u00a0b"`},
		{"caf\xe9", `"caf\xe9"`},
		{"a`b\x00", `"a\x60b\x00"`},
		{"", ""},
	}
	for _, tc := range tests {
		require.Equal(t, tc.want, Name(tc.in), "%q", tc.in)
	}
}
