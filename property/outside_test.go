package property

import (
	"strings"
	"testing"
	"time"
	"unicode/utf8"

	"github.com/stretchr/testify/require"
	"golang.org/x/text/encoding/charmap"
	"golang.org/x/text/unicode/norm"

	"github.com/proofsheet/proofsheet/fixtures"
)

func TestMojibakePairs(t *testing.T) {
	for _, tc := range []struct {
		clean, garbled string
		utf8           []byte
	}{
		// Source: x/text charmap.Windows1252 (WHATWG windows-1252 index):
		// C3 → U+00C3 Ã, A9 → U+00A9 ©.
		{"é", "Ã©", []byte{0xC3, 0xA9}},
		// C3 → Ã, BC → U+00BC ¼.
		{"ü", "Ã¼", []byte{0xC3, 0xBC}},
		// C3 → Ã, 89 → U+2030 ‰.
		{"É", "Ã‰", []byte{0xC3, 0x89}},
		// E2 → â, 82 → U+201A ‚, AC → ¬.
		{"€", "â‚¬", []byte{0xE2, 0x82, 0xAC}},
		// C3 → Ã, B8 → ¸.
		{"Søndergård", "SÃ¸ndergÃ¥rd", nil},
	} {
		if tc.utf8 != nil {
			require.Equal(t, tc.utf8, []byte(tc.clean))
		}
		// The pair as x/text itself decodes the UTF-8 bytes.
		dec, err := charmap.Windows1252.NewDecoder().String(tc.clean)
		require.NoError(t, err)
		require.Equal(t, tc.garbled, dec)
		require.Equal(t, tc.garbled, Mojibake(tc.clean))
		back, ok := UndoMojibake(tc.garbled)
		require.True(t, ok)
		require.Equal(t, tc.clean, back)
	}
	// Á is C3 81 in UTF-8. The WHATWG index maps 81, which Microsoft's code
	// page leaves unassigned, to U+0081 (Source: WHATWG Encoding Standard,
	// index-windows-1252, from memory), where x/text's charmap gives U+FFFD;
	// Mojibake follows WHATWG, as the loader does, so even this text undoes.
	require.Equal(t, "Ã\u0081", Mojibake("Á"))
	back, ok := UndoMojibake(Mojibake("Á"))
	require.True(t, ok)
	require.Equal(t, "Á", back)
	m, ok := mojibakeOf("Ýr")
	require.True(t, ok)
	require.Equal(t, "Ã\u009dr", m)
	// Texts never garbled do not undo.
	_, ok = UndoMojibake("Étang")
	require.False(t, ok)
	_, ok = UndoMojibake("− minus")
	require.False(t, ok)
}

func TestIllFormedUTF8(t *testing.T) {
	// Source: The Unicode Standard, chapter 3, §3.9, Table 3-7
	// Well-Formed UTF-8 Byte Sequences. Each sequence breaks a row:
	cases := map[string]string{
		"\xc0\x80":         "C0 is never a lead byte (overlong)",
		"\xc1\xbf":         "C1 is never a lead byte (overlong)",
		"\xe0\x80\x80":     "after E0 the second byte is A0..BF",
		"\xed\xa0\x80":     "after ED the second byte is 80..9F (U+D800 is a surrogate)",
		"\xed\xbf\xbf":     "U+DFFF is a surrogate",
		"\xf0\x80\x80\x80": "after F0 the second byte is 90..BF",
		"\xf4\x90\x80\x80": "after F4 the second byte is 80..8F (above U+10FFFF)",
		"\xf5\x80\x80\x80": "F5..FF are never lead bytes",
		"\xfe":             "FE is never a byte of UTF-8",
		"\xff":             "FF is never a byte of UTF-8",
		"\x80":             "a continuation byte cannot start a sequence",
		"\xbf":             "a continuation byte cannot start a sequence",
		"\xe2\x82":         "a three-byte sequence cut short",
		"\xf0\x9f\x98":     "a four-byte sequence cut short",
	}
	require.Len(t, IllFormedUTF8(), len(cases))
	for _, seq := range IllFormedUTF8() {
		why, listed := cases[seq]
		require.True(t, listed, "%q is not in the table", seq)
		require.False(t, utf8.ValidString(seq), why)
		require.False(t, utf8.ValidString("a"+seq+"b"), why)
		require.False(t, utf8.ValidString("é"+seq), why)
	}
	// Well-formed neighbours of the same table are accepted.
	for _, ok := range []string{"\xc2\x80", "\xe0\xa0\x80", "\xed\x9f\xbf", "\xf0\x90\x80\x80", "\xf4\x8f\xbf\xbf"} {
		require.True(t, utf8.ValidString(ok), "%q", ok)
	}
	// The generator inserts one of them and nothing else.
	found := map[string]bool{}
	for _, c := range draw[Messy](t, InvalidUTF8(), 400, 1) {
		require.False(t, utf8.ValidString(c.Raw))
		clean := c.Clean.(string)
		require.True(t, utf8.ValidString(clean))
		n := 0
		for _, seq := range IllFormedUTF8() {
			if i := strings.Index(c.Raw, seq); i >= 0 && c.Raw[:i]+c.Raw[i+len(seq):] == clean {
				found[seq] = true
				n++
			}
		}
		require.GreaterOrEqual(t, n, 1, "%q is %q with one sequence inserted", c.Raw, clean)
	}
	require.Len(t, found, len(cases), "every sequence shows up")
}

func TestSerialDates(t *testing.T) {
	day := func(y, m, d int) time.Time { return time.Date(y, time.Month(m), d, 0, 0, 0, 0, time.UTC) }
	// From memory (no document consulted): in the 1900 date system serial
	// 1 is 1900-01-01, serial 60 is the non-existent 1900-02-29, serial 61
	// is 1900-03-01 and serial 45292 is 2024-01-01.
	for _, tc := range []struct {
		serial float64
		want   time.Time
	}{
		{1, day(1900, 1, 1)},
		{59, day(1900, 2, 28)},
		{61, day(1900, 3, 1)},
		{45292, day(2024, 1, 1)},
		{45292.5, day(2024, 1, 1).Add(12 * time.Hour)},
		{45292.25, day(2024, 1, 1).Add(6 * time.Hour)},
		{2958465, day(9999, 12, 31)},
	} {
		got, err := SerialToTime(tc.serial)
		require.NoError(t, err, "%v", tc.serial)
		require.Equal(t, tc.want, got, "serial %v", tc.serial)
		back, err := TimeToSerial(tc.want)
		require.NoError(t, err)
		require.Equal(t, tc.serial, back)
	}
	_, err := SerialToTime(60)
	require.ErrorIs(t, err, ErrSerial60)
	_, err = SerialToTime(60.5)
	require.ErrorIs(t, err, ErrSerial60)
	for _, bad := range []float64{0, 0.5, -1, 2958466} {
		_, err := SerialToTime(bad)
		require.Error(t, err, "%v", bad)
	}
	_, err = TimeToSerial(day(1899, 12, 31))
	require.Error(t, err)
	// Consecutive days before and after the phantom day are one serial
	// apart, except across it.
	a, _ := TimeToSerial(day(1900, 2, 28))
	b, _ := TimeToSerial(day(1900, 3, 1))
	require.Equal(t, 2.0, b-a)
	// Millisecond round trip of timestamps.
	tm := time.Date(2026, 4, 1, 6, 30, 15, 123e6, time.UTC)
	s, err := TimeToSerial(tm)
	require.NoError(t, err)
	back, err := SerialToTime(s)
	require.NoError(t, err)
	require.Equal(t, tm, back)
}

func TestTwoDigitYear(t *testing.T) {
	// Source: POSIX.1-2017 strptime, %y: "values in the range [69,99] shall
	// refer to years 1969 to 1999 inclusive and values in the range [00,68]
	// shall refer to years 2000 to 2068 inclusive" (from memory).
	for yy, want := range map[int]int{0: 2000, 24: 2024, 68: 2068, 69: 1969, 99: 1999, -1: -1, 100: -1} {
		require.Equal(t, want, TwoDigitYear(yy), "%02d", yy)
	}
	// Go's time package reads "06" with the same rule.
	for yy := 0; yy < 100; yy++ {
		tm, err := time.Parse("06", pad2(yy))
		require.NoError(t, err)
		require.Equal(t, tm.Year(), TwoDigitYear(yy))
	}
}

func TestFullWidthDigits(t *testing.T) {
	// Source: Unicode Standard, Halfwidth and Fullwidth Forms (FF00–FFEF):
	// U+FF10 is FULLWIDTH DIGIT ZERO; NFKC maps the forms to ASCII.
	require.Equal(t, "\uff10\uff11\uff19", fullWidth("019"))
	for _, s := range []string{"-1234.5", "+7", "0,25"} {
		require.Equal(t, s, norm.NFKC.String(fullWidth(s)))
		require.NotEqual(t, s, fullWidth(s))
	}
}

func TestWindows1252Bytes(t *testing.T) {
	// Source: x/text charmap.Windows1252 (WHATWG windows-1252 index): É is
	// byte C9, é E9, € 80; U+2212 MINUS SIGN has no byte.
	s, ok := toWindows1252("Étang €")
	require.True(t, ok)
	require.Equal(t, "\xc9tang \x80", s)
	require.True(t, fitsWindows1252("Étang €"))
	require.False(t, fitsWindows1252("−1"))
	require.False(t, fitsWindows1252("\xc9"))
	_, ok = toWindows1252("−1")
	require.False(t, ok)
	for _, c := range draw[Messy](t, Spelled(fixtures.Col("house", fixtures.Category), MessWindows1252, Options{}), 50, 1) {
		d, err := charmap.Windows1252.NewDecoder().String(c.Raw)
		require.NoError(t, err)
		require.Equal(t, c.Clean, d)
	}
}
