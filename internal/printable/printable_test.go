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

func TestText(t *testing.T) {
	cases := []struct{ in, want string }{
		{"column tmax: no such column", "column tmax: no such column"},
		{"Étang 🌱", "Étang 🌱"},
		// Source: ECMA-48 §5.3 (ESC, 0x1B, begins a control sequence);
		// Unicode General Category Cc for DEL (U+007F) and Cf for
		// RIGHT-TO-LEFT OVERRIDE (U+202E).
		{"a\x1b[31mred", `a\x1b[31mred`},
		{"del\x7f", `del\x7f`},
		{"tab\there", `tab\there`},
		{"bidi\u202eevil", `bidi\u202eevil`},
		{"nbsp\u00a0x", `nbsp\u00a0x`},
		{"caf\xe9", `caf\xe9`},
	}
	for _, c := range cases {
		require.Equal(t, c.want, Text(c.in), "%q", c.in)
		require.True(t, Plain(Text(c.in)), "%q", c.in)
	}
}
