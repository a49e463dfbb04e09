package property

import (
	"errors"
	"testing"

	"github.com/proofsheet/proofsheet/fixtures"
	"github.com/stretchr/testify/require"
)

// TestGenSpecRefusesUnwritableNames: column names that no generated file
// can carry so that fixtures reads them back as written are refused at
// their line, before anything is generated.
func TestGenSpecRefusesUnwritableNames(t *testing.T) {
	cases := []struct {
		name, text string
		line, col  int
		msg        string
	}{
		{"NUL in a quoted name", "a int64\n  \"x\\x00y\" float64\n", 2, 3, `column "x\x00y": the name holds a NUL byte`},
		{"bytes FF FE, read as a UTF-16 mark", "\"\\xff\\xfeab\" float64\n", 1, 1, "the name is not valid UTF-8"},
		{"a byte order mark", "\"\\ufeffab\" float64\n", 1, 1, "starts with U+FEFF"},
		{"a raw byte that is not UTF-8", "a int64\ncaf\xe9 float64\n", 2, 4, "byte 0xE9 is not UTF-8: a schema file is UTF-8 text"},
		{"a raw NUL", "a int64 # note\x00\n", 1, 15, "a NUL byte: a schema file is UTF-8 text"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			_, err := ParseGenSpec("s.schema", []byte(c.text))
			var pe *fixtures.ParseError
			require.True(t, errors.As(err, &pe), "%v", err)
			require.Equal(t, [2]int{c.line, c.col}, [2]int{pe.Line, pe.Column}, err.Error())
			require.ErrorContains(t, err, c.msg)
		})
	}
	// The library refuses them too.
	_, err := MessyCSV(fixtures.Schema{fixtures.Col("a\x00b", fixtures.Int64)}, 3, 1, Options{}, CSVStyle{})
	require.ErrorContains(t, err, `property: column "a\x00b": the name holds a NUL byte`)
}

// TestGenSpecMessagesHaveNoPackagePrefix: a schema file's errors speak of
// the file, never of the Go package behind it.
func TestGenSpecMessagesHaveNoPackagePrefix(t *testing.T) {
	for _, text := range []string{
		"a int64 derive=\"b + 1\"\nb int64 derive=\"a + 1\"\n",
		"a float64 min=5 max=1\n",
		"@spellings glitter\na int64\n",
		"a date min=2026-05-01 max=2026-01-01\n",
	} {
		_, err := ParseGenSpec("s.schema", []byte(text))
		require.Error(t, err, text)
		require.NotContains(t, err.Error(), "property:", text)
	}
	_, err := ParseGenSpec("s.schema", []byte("a int64 derive=\"b + 1\"\nb int64 derive=\"a + 1\"\n"))
	var pe *fixtures.ParseError
	require.ErrorAs(t, err, &pe)
	require.Equal(t, 1, pe.Line)
	require.EqualError(t, err, `s.schema:1:1: column "a": derived columns depend on each other in a circle: a → b → a`)
}

// TestGeneratedNamesReadBack: names that are allowed, however odd, come
// back from the generated file exactly.
func TestGeneratedNamesReadBack(t *testing.T) {
	spec, err := ParseGenSpec("s.schema", []byte("\"tab\\there\" int64 mess=none null-rate=0\n\"line\\nbreak, \\\"quoted\\\"\" string mess=none\n\"🌱 Étang\" float64 mess=none\n"))
	require.NoError(t, err)
	for _, enc := range []fixtures.Encoding{fixtures.EncodingUTF8, fixtures.EncodingUTF8BOM, fixtures.EncodingUTF16LE} {
		spec.Style.Encoding = enc
		spec.Options.Mess = None
		data, err := spec.CSV(5, 1)
		require.NoError(t, err)
		tb, _, err := fixtures.ReadBytes("g.csv", data)
		require.NoError(t, err, enc)
		require.Equal(t, []string{"tab\there", "line\nbreak, \"quoted\"", "🌱 Étang"}, tb.Names(), enc)
	}
}
