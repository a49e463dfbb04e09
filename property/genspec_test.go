package property

import (
	"bytes"
	"errors"
	"fmt"
	"strings"
	"testing"
	"time"

	"github.com/stretchr/testify/require"

	"github.com/proofsheet/proofsheet/fixtures"
)

const greenhouseSpec = `# greenhouse datalogger uploads
@delimiter ;
@dates 2026-03-01 2026-06-30
@null-rate 0.08
@quoting text

house   category      levels="Étang|Les Pins|Mühlbach"
at      timestamp(s)  # when the reading was taken
temp_c  float64
kept    int64
"air note" string
`

func TestParseGenSpec(t *testing.T) {
	spec, err := ParseGenSpec("houses.schema", []byte(greenhouseSpec))
	require.NoError(t, err)
	require.Equal(t, fixtures.Schema{
		fixtures.Col("house", fixtures.Category),
		fixtures.Col("at", fixtures.TimestampOf(fixtures.Seconds, "")),
		fixtures.Col("temp_c", fixtures.Float64),
		fixtures.Col("kept", fixtures.Int64),
		fixtures.Col("air note", fixtures.String),
	}, spec.Schema)
	require.Equal(t, map[string][]string{"house": {"Étang", "Les Pins", "Mühlbach"}}, spec.Options.Levels)
	require.Equal(t, ';', spec.Style.Delimiter)
	require.Equal(t, QuoteText, spec.Style.Quoting)
	require.Equal(t, 0.08, spec.Options.NullRate)
	require.Equal(t, time.Date(2026, 3, 1, 0, 0, 0, 0, time.UTC), spec.Options.DateFrom)
	require.Equal(t, time.Date(2026, 6, 30, 23, 59, 59, 0, time.UTC), spec.Options.DateTo, "the last day counts whole")
}

func TestParseGenSpecSettings(t *testing.T) {
	cases := []struct {
		line  string
		check func(t *testing.T, s *GenSpec)
	}{
		{"@mess heavy", func(t *testing.T, s *GenSpec) { require.Equal(t, Heavy, s.Options.Mess) }},
		{"@encoding windows-1252", func(t *testing.T, s *GenSpec) { require.Equal(t, fixtures.EncodingWindows1252, s.Style.Encoding) }},
		{"@delimiter tab", func(t *testing.T, s *GenSpec) { require.Equal(t, '\t', s.Style.Delimiter) }},
		{"@line-ending crlf", func(t *testing.T, s *GenSpec) { require.Equal(t, CRLF, s.Style.LineEnding) }},
		{"@duplicate-rate 0", func(t *testing.T, s *GenSpec) { require.Negative(t, s.Options.DuplicateRate, "0 written means none") }},
		{"@null-tokens NA|-|?", func(t *testing.T, s *GenSpec) { require.Equal(t, []string{"NA", "-", "?"}, s.Options.NullTokens) }},
		{`@sentinels "-999|ERR"`, func(t *testing.T, s *GenSpec) { require.Equal(t, []string{"-999", "ERR"}, s.Options.Sentinels) }},
		{"@spellings thousands currency", func(t *testing.T, s *GenSpec) {
			require.Equal(t, []Mess{MessThousands, MessCurrency}, s.Options.Spellings)
		}},
		{"@avoid mojibake", func(t *testing.T, s *GenSpec) { require.Equal(t, []Mess{MessMojibake}, s.Options.Avoid) }},
		{"@extra-columns 2", func(t *testing.T, s *GenSpec) { require.Equal(t, 2, s.Options.ExtraColumns) }},
		{"@shuffle", func(t *testing.T, s *GenSpec) { require.True(t, s.Options.Shuffle) }},
		{"@header-mess", func(t *testing.T, s *GenSpec) { require.True(t, s.Options.HeaderMess) }},
		{"@decimals 2", func(t *testing.T, s *GenSpec) { require.Equal(t, 2, s.Options.Decimals) }},
		{"@locale fr_fr", func(t *testing.T, s *GenSpec) { require.Equal(t, "fr-FR", s.Options.Locale) }},
		{"@mixed-sources", func(t *testing.T, s *GenSpec) { require.True(t, s.Options.MixedSources) }},
		{"@also total-row cut-short", func(t *testing.T, s *GenSpec) {
			require.Equal(t, []Mess{MessTotalRow, MessCutShort}, s.Options.Also)
		}},
		{"@uploads 4", func(t *testing.T, s *GenSpec) { require.Equal(t, 4, s.Options.Uploads) }},
		{"@overlap 0.5", func(t *testing.T, s *GenSpec) { require.Equal(t, 0.5, s.Options.Overlap) }},
		{"@upload-rate 1", func(t *testing.T, s *GenSpec) { require.Equal(t, 1.0, s.Options.UploadRate) }},
	}
	for _, c := range cases {
		t.Run(c.line, func(t *testing.T) {
			s, err := ParseGenSpec("x", []byte(c.line+"\ntemp_c float64\n"))
			require.NoError(t, err)
			c.check(t, s)
		})
	}
}

func TestParseGenSpecErrors(t *testing.T) {
	cases := []struct {
		name, text string
		line, col  int
		msg        string
	}{
		{"no columns", "# nothing\n", 0, 0, "no columns"},
		{"no type", "house\n", 1, 1, `column "house" has no type`},
		{"bad type", "house  varchar\n", 1, 8, `unknown column type "varchar"`},
		{"duplicate", "a int64\nb int64\na float64\n", 3, 1, `column "a" is already defined on line 1`},
		{"levels on text", "a string levels=x|y\n", 1, 10, "levels are for category columns"},
		{"unknown option", "a int64 width=3\n", 1, 9, `unknown column option "width"`},
		{"unclosed quote", "a category levels=\"x|y\n", 1, 19, "no closing quote"},
		{"unknown setting", "@colour red\na int64\n", 1, 1, `unknown setting "@colour"`},
		{"bad rate", "@null-rate 1.5\na int64\n", 1, 12, "want a share from 0 to 1"},
		{"bad mess", "@mess chaos\na int64\n", 1, 7, `unknown mess level "chaos"`},
		{"bad mess name", "@avoid glitter\na int64\n", 1, 8, `unknown mess "glitter"`},
		{"dates reversed", "@dates 2026-06-01 2026-03-01\na date\n", 1, 19, "@dates: the range ends on 2026-03-01, before it starts on 2026-06-01: want FROM TO, the earlier date first"},
		{"bad date", "@dates 2026-13-01 2026-03-01\na date\n", 1, 8, "is not a date"},
		{"bad delimiter", "@delimiter :\na int64\n", 1, 12, "unknown delimiter"},
		{"setting value missing", "@quoting\na int64\n", 1, 1, "takes one value"},
		{"flag with value", "@shuffle yes\na int64\n", 1, 10, "takes no value"},
		{"unknown flag", "a int64 unique nonneg\n", 1, 16, `unknown column flag "nonneg"`},
		{"bad share", "a int64 null-rate=2\n", 1, 9, "want a share from 0 to 1"},
		{"bad length", "a string length=5..2\n", 1, 10, "want N or MIN..MAX"},
		{"bad unique", "a int64 unique=often\n", 1, 9, "want unique, unique=sequential or unique=gaps"},
		{"bad derive", "a int64\nb int64 derive=\"a *\"\n", 2, 9, "ends early"},
		{"weights without values", "a int64 weights=1|2\n", 1, 9, "2 weights for 0 values"},
		{"bad locale", "@locale xx\na int64\n", 1, 9, `unknown locale "xx"`},
		{"rule of the column", "id int64\nb int64 unique min=1 max=5\n", 2, 1, `column "b": only 5 distinct values fit its rules`},
		{"mess the locale lacks", "@locale de-DE\nday date mess=month-first\n", 2, 1, `column "day": a date column in de-DE never takes mess month-first`},
		{"min on text", "s string min=3\n", 1, 1, "min and max are for numbers"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			_, err := ParseGenSpec("s.schema", []byte(c.text))
			require.Error(t, err)
			var pe *fixtures.ParseError
			require.True(t, errors.As(err, &pe), "%T", err)
			require.Equal(t, "s.schema", pe.Path)
			require.Equal(t, c.line, pe.Line, err.Error())
			require.Equal(t, c.col, pe.Column, err.Error())
			require.ErrorContains(t, err, c.msg)
		})
	}
}

func TestGenSpecCSVIsDeterministic(t *testing.T) {
	spec, err := ParseGenSpec("houses.schema", []byte(greenhouseSpec))
	require.NoError(t, err)
	a, err := spec.CSV(200, 7)
	require.NoError(t, err)
	b, err := spec.CSV(200, 7)
	require.NoError(t, err)
	require.Equal(t, a, b, "same seed, same bytes")
	c, err := spec.CSV(200, 8)
	require.NoError(t, err)
	require.NotEqual(t, a, c, "another seed, other bytes")

	// The file reads back with the delimiter and columns the spec asks for.
	tb, rep, err := fixtures.ReadBytes("houses.csv", a, fixtures.AllText())
	require.NoError(t, err)
	require.Equal(t, ";", rep.Delimiter)
	require.Equal(t, []string{"house", "at", "temp_c", "kept", "air note"}, tb.Names()[:5])
	require.GreaterOrEqual(t, tb.NumRows(), 200)
}

func TestGenSpecEncodings(t *testing.T) {
	cases := []struct {
		enc    fixtures.Encoding
		prefix []byte
	}{
		// Source: Unicode Standard 15.0 §23.8 (byte order mark) — U+FEFF is
		// EF BB BF in UTF-8 and FF FE in UTF-16 little-endian.
		{fixtures.EncodingUTF8BOM, []byte{0xEF, 0xBB, 0xBF}},
		{fixtures.EncodingUTF16LE, []byte{0xFF, 0xFE}},
	}
	for _, c := range cases {
		t.Run(string(c.enc), func(t *testing.T) {
			spec, err := ParseGenSpec("x", []byte("@encoding "+string(c.enc)+"\nhouse category levels=Étang|Mühlbach\ntemp_c float64\n"))
			require.NoError(t, err)
			data, err := spec.CSV(20, 1)
			require.NoError(t, err)
			require.True(t, bytes.HasPrefix(data, c.prefix))
			_, rep, err := fixtures.ReadBytes("x.csv", data, fixtures.WithDelimiter(','), fixtures.AllText())
			require.NoError(t, err)
			require.Equal(t, c.enc, rep.Encoding)
		})
	}
	spec, err := ParseGenSpec("x", []byte("@encoding windows-1252\n@mess none\nhouse category levels=Étang\n"))
	require.NoError(t, err)
	data, err := spec.CSV(5, 1)
	require.NoError(t, err)
	// Source: WHATWG Encoding Standard, index-windows-1252 — É is byte C9.
	require.Contains(t, string(data), "\xc9tang")
}

func ExampleParseGenSpec() {
	spec, err := ParseGenSpec("houses.schema", []byte(`
@mess none
@null-rate 0
house  category  levels="Étang|Les Pins"
kept   int64
`))
	if err != nil {
		fmt.Println(err)
		return
	}
	data, err := spec.CSV(3, 42)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println(spec.Schema)
	fmt.Print(string(data))
	// Output:
	// house:category, kept:int64
	// house,kept
	// Les Pins,0
	// Étang,-6
	// Les Pins,-797
}

func TestParseGenSpecColumnOptions(t *testing.T) {
	text := `@locale en-US
id     int64          unique=sequential min=1001 mess=none
house  category       levels="Bellecôte|Kæreby" weights=3|1
kind   string         values=seed|cutting weights=1|2 null-rate=0
mins   int64          non-negative max=480 mess=thousands|edge-space mess-rate=0.2
price  decimal(10,2)  min=0.5 max=99 decimals=1 avoid=currency locale=de-DE
pin    string         length=4 alphabet=digits
note   string         length=3..20 null-tokens=n/a|- sentinels=ERR
ok     bool           plain
total  decimal(12,2)  derive="price * mins"
`
	spec, err := ParseGenSpec("r.schema", []byte(text))
	require.NoError(t, err)
	c := spec.Options.Columns
	require.Equal(t, Rules{Unique: Sequential, Min: "1001", Plain: true}, c["id"])
	require.Equal(t, []Choice{{"Bellecôte", 3}, {"Kæreby", 1}}, c["house"].Values)
	require.Equal(t, Rules{Values: []Choice{{"seed", 1}, {"cutting", 2}}, NullRate: -1}, c["kind"])
	require.Equal(t, Rules{NonNegative: true, Max: "480", Messes: []Mess{MessThousands, MessEdgeSpace}, MessRate: 0.2}, c["mins"])
	require.Equal(t, Rules{Min: "0.5", Max: "99", Decimals: 1, Avoid: []Mess{MessCurrency}, Locale: "de-DE"}, c["price"])
	require.Equal(t, Rules{MinLen: 4, MaxLen: 4, Alphabet: "digits"}, c["pin"])
	require.Equal(t, Rules{MinLen: 3, MaxLen: 20, NullTokens: []string{"n/a", "-"}, Sentinels: []string{"ERR"}}, c["note"])
	require.Equal(t, Rules{Plain: true}, c["ok"])
	require.Equal(t, Rules{Derive: "price * mins"}, c["total"])
	data, err := spec.CSV(100, 3)
	require.NoError(t, err)
	raw, _, err := fixtures.ReadBytes("r.csv", data, fixtures.AllText())
	require.NoError(t, err)
	for i := 0; i < raw.NumRows(); i++ {
		if p := raw.Column("pin"); !p.IsNull(i) {
			require.Regexp(t, `^[0-9]{4}$`, strings.Trim(p.Str(i), " \t\u00a0"), "edge blanks are the light mess")
		}
		require.False(t, raw.Column("kind").IsNull(i))
	}
}
