package property

import (
	"bytes"
	"fmt"
	"strings"
	"testing"
	"unicode/utf16"

	"github.com/stretchr/testify/require"

	"github.com/proofsheet/proofsheet/fixtures"
)

// allStyles lists every CSV style.
func allStyles() []CSVStyle {
	var out []CSVStyle
	for _, d := range Delimiters() {
		for q := QuoteMinimal; q <= QuoteMixed; q++ {
			for _, e := range Encodings() {
				for le := LF; le <= MixedEndings; le++ {
					out = append(out, CSVStyle{Delimiter: d, Quoting: q, Encoding: e, LineEnding: le})
				}
			}
		}
	}
	return out
}

func TestCSVRoundTripsThroughTheLoader(t *testing.T) {
	// Invalid UTF-8 and Windows-1252 bytes inside a UTF-8 file make the
	// loader decode the line as Windows-1252, so they cannot round trip
	// byte for byte; they are tested apart below. Line breaks inside
	// values count in the report's line endings, so they are left out to
	// check the record terminators.
	opts := Options{Mess: Heavy, Avoid: []Mess{MessInvalidUTF8, MessWindows1252, MessLineEndings}, ExtraColumns: 2, HeaderMess: true}
	for i, st := range allStyles() {
		t.Run(fmt.Sprint(st), func(t *testing.T) {
			f, err := GenerateFile(greenhouse, 40, int64(i), opts, st)
			require.NoError(t, err)
			got, rep, err := fixtures.ReadBytes(f.Name(), f.Data, fixtures.AllText())
			require.NoError(t, err)
			requireSame(t, f.Sample.Raw(), got)
			require.Equal(t, st.Encoding, rep.Encoding)
			require.Equal(t, string(st.Delimiter), rep.Delimiter)
			switch st.LineEnding {
			case LF:
				require.Zero(t, rep.LineEndings.CRLF)
				require.Positive(t, rep.LineEndings.LF)
			case CRLF:
				require.Zero(t, rep.LineEndings.LF)
				require.Positive(t, rep.LineEndings.CRLF)
			case MixedEndings:
				require.True(t, rep.LineEndings.Mixed(), "%+v", rep.LineEndings)
			}
		})
	}
}

func TestCSVKeepsInvalidBytes(t *testing.T) {
	s := sampleOf([]string{"house", "note"},
		[]Messy{{Raw: "\xc9tang", Clean: "Étang", Mess: MessWindows1252}, {Raw: "a\xed\xa0\x80b", Clean: "ab", Mess: MessInvalidUTF8}})
	data, err := s.CSV(CSVStyle{})
	require.NoError(t, err)
	require.Equal(t, "house,note\n\xc9tang,a\xed\xa0\x80b\n", string(data))
	for _, enc := range []fixtures.Encoding{fixtures.EncodingUTF16LE, fixtures.EncodingWindows1252} {
		_, err := s.CSV(CSVStyle{Encoding: enc})
		require.ErrorContains(t, err, `row 1, column "house"`)
	}
}

func TestCSVQuoting(t *testing.T) {
	s := sampleOf([]string{"a", "b", "c"},
		[]Messy{text("x,y"), text(`say "hi"`), text("two\r\nlines")},
		[]Messy{{}, text(""), text("12.5")},
		[]Messy{text(" edge "), text("semi;colon"), text("pipe|tab\t")},
	)
	for _, tc := range []struct {
		st   CSVStyle
		want string
	}{
		// Source: RFC 4180 §2 rule 6 (fields with a delimiter, DQUOTE, CR or
		// LF are enclosed in double quotes) and rule 7 (a DQUOTE inside is
		// doubled). The unquoted empty field is null, "" the empty string.
		{CSVStyle{}, "a,b,c\n\"x,y\",\"say \"\"hi\"\"\",\"two\r\nlines\"\n,\"\",12.5\n edge ,semi;colon,pipe|tab\t\n"},
		{CSVStyle{Delimiter: ';'}, "a;b;c\nx,y;\"say \"\"hi\"\"\";\"two\r\nlines\"\n;\"\";12.5\n edge ;\"semi;colon\";pipe|tab\t\n"},
		{CSVStyle{Delimiter: '|', Quoting: QuoteAll}, "\"a\"|\"b\"|\"c\"\n\"x,y\"|\"say \"\"hi\"\"\"|\"two\r\nlines\"\n|\"\"|\"12.5\"\n\" edge \"|\"semi;colon\"|\"pipe|tab\t\"\n"},
		{CSVStyle{Delimiter: '\t', Quoting: QuoteText, LineEnding: CRLF}, "\"a\"\t\"b\"\t\"c\"\r\n\"x,y\"\t\"say \"\"hi\"\"\"\t\"two\r\nlines\"\r\n\t\"\"\t12.5\r\n\" edge \"\t\"semi;colon\"\t\"pipe|tab\t\"\r\n"},
	} {
		data, err := s.CSV(tc.st)
		require.NoError(t, err)
		require.Equal(t, tc.want, string(data), "%s", tc.st)
	}
	// Mixed quoting quotes what must be and some of the rest.
	data, err := s.CSV(CSVStyle{Quoting: QuoteMixed})
	require.NoError(t, err)
	require.Contains(t, string(data), `"x,y"`)
	require.Contains(t, string(data), `,"",`)
}

func TestCSVEncodings(t *testing.T) {
	s := sampleOf([]string{"house"}, []Messy{text("Étang €")})
	utf8Data, err := s.CSV(CSVStyle{})
	require.NoError(t, err)
	require.Equal(t, "house\nÉtang €\n", string(utf8Data))
	bom, err := s.CSV(CSVStyle{Encoding: fixtures.EncodingUTF8BOM})
	require.NoError(t, err)
	// Source: Unicode Standard §23.8: U+FEFF as a UTF-8 signature is EF BB BF.
	require.Equal(t, append([]byte{0xEF, 0xBB, 0xBF}, utf8Data...), bom)
	u16, err := s.CSV(CSVStyle{Encoding: fixtures.EncodingUTF16LE})
	require.NoError(t, err)
	// Source: Unicode Standard §23.8 / RFC 2781 §3.2: FF FE is the
	// little-endian byte order mark; code units follow low byte first.
	require.Equal(t, []byte{0xFF, 0xFE}, u16[:2])
	units := make([]uint16, (len(u16)-2)/2)
	for i := range units {
		units[i] = uint16(u16[2+2*i]) | uint16(u16[3+2*i])<<8
	}
	require.Equal(t, "house\nÉtang €\n", string(utf16.Decode(units)))
	w, err := s.CSV(CSVStyle{Encoding: fixtures.EncodingWindows1252})
	require.NoError(t, err)
	// Source: x/text charmap.Windows1252 (WHATWG index): É C9, € 80.
	require.Equal(t, "house\n\xc9tang \x80\n", string(w))

	minus := sampleOf([]string{"t"}, []Messy{{Raw: "−1", Clean: "-1", Mess: MessUnicodeMinus}})
	_, err = minus.CSV(CSVStyle{Encoding: fixtures.EncodingWindows1252})
	require.ErrorContains(t, err, "windows-1252")
}

func TestCSVStyleErrorsAndNames(t *testing.T) {
	s := sampleOf([]string{"a"}, []Messy{text("1")})
	for _, st := range []CSVStyle{{Delimiter: ':'}, {Encoding: "ebcdic"}, {Quoting: 9}, {LineEnding: 7}} {
		_, err := s.CSV(st)
		require.Error(t, err, "%+v", st)
		_, err = MessyCSV(greenhouse, 1, 1, Options{}, st)
		require.Error(t, err)
		require.Contains(t, st.String(), "invalid CSV style")
	}
	require.Equal(t, `delimiter ',', quoting minimal, utf-8, LF`, CSVStyle{}.String())
	require.Equal(t, `delimiter '\t', quoting all, utf-16le, mixed`, CSVStyle{Delimiter: '\t', Quoting: QuoteAll, Encoding: fixtures.EncodingUTF16LE, LineEnding: MixedEndings}.String())
	require.Equal(t, "x.tsv", CSVStyle{Delimiter: '\t'}.FileName("x"))
	require.Equal(t, "x.csv", CSVStyle{Delimiter: ';'}.FileName("x"))
}

func TestMessyCSVIsDeterministicAndFitsItsEncoding(t *testing.T) {
	for _, st := range allStyles() {
		a, err := MessyCSV(greenhouse, 60, 77, Options{Mess: Heavy}, st)
		require.NoError(t, err)
		b, err := MessyCSV(greenhouse, 60, 77, Options{Mess: Heavy}, st)
		require.NoError(t, err)
		require.True(t, bytes.Equal(a, b), "%s", st)
		// Every file loads, whatever its mess.
		got, _, err := fixtures.ReadBytes(st.FileName("x"), a, fixtures.AllText())
		require.NoError(t, err, "%s", st)
		require.Equal(t, 60, got.NumRows(), "%s", st)
	}
	// A UTF-8 file keeps the invalid bytes that other encodings cannot.
	a, err := MessyCSV(greenhouse, 200, 1, Options{Mess: Heavy}, CSVStyle{})
	require.NoError(t, err)
	require.False(t, utf8Valid(a))
	for _, enc := range []fixtures.Encoding{fixtures.EncodingUTF16LE, fixtures.EncodingWindows1252} {
		f, err := GenerateFile(greenhouse, 200, 1, Options{Mess: Heavy}, CSVStyle{Encoding: enc})
		require.NoError(t, err)
		require.Zero(t, f.Sample.MessCounts()[MessInvalidUTF8])
		require.Zero(t, f.Sample.MessCounts()[MessWindows1252])
	}
	// A level Windows-1252 cannot write is an error, not a garbled file.
	_, err = MessyCSV(fixtures.Schema{fixtures.Col("house", fixtures.Category)}, 10, 1,
		Options{Mess: None, NullRate: -1, Levels: map[string][]string{"house": {"Łąka"}}}, CSVStyle{Encoding: fixtures.EncodingWindows1252})
	require.ErrorContains(t, err, "Łąka")
}

func utf8Valid(b []byte) bool { return strings.ToValidUTF8(string(b), "\ufffd") == string(b) }

func TestTableCSV(t *testing.T) {
	tb := fixtures.MustParse(t, `
		house:category | temp_c:float64 | day:date
		Étang          | 21.5           | 2026-04-01
		"Les Pins"     | ~              | 2026-04-02
	`)
	data, err := TableCSV(tb, CSVStyle{Delimiter: ';'})
	require.NoError(t, err)
	require.Equal(t, "house;temp_c;day\nÉtang;21.5;2026-04-01\nLes Pins;;2026-04-02\n", string(data))
	back, _, err := fixtures.ReadBytes("t.csv", data, fixtures.WithSchema(tb.Schema()))
	require.NoError(t, err)
	requireSame(t, tb, back)
}

func TestFilesGenerator(t *testing.T) {
	styles := map[string]bool{}
	for _, f := range draw[*File](t, Files(greenhouse, Options{Mess: Heavy}), 60, 3) {
		styles[f.Style.String()] = true
		_, _, err := fixtures.ReadBytes(f.Name(), f.Data, fixtures.AllText())
		require.NoError(t, err)
		require.Contains(t, f.String(), "CSV file of")
	}
	require.Greater(t, len(styles), 20, "styles vary")
	only := CSVStyle{Delimiter: '|', Encoding: fixtures.EncodingUTF8BOM}
	for _, f := range draw[*File](t, Files(greenhouse, Options{}, only), 10, 3) {
		require.Equal(t, only.String(), f.Style.String())
	}
	_, ok := Files(greenhouse, Options{}, CSVStyle{Delimiter: 'x'})(params(1)).Retrieve()
	require.False(t, ok)
}
