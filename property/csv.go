package property

import (
	"fmt"
	"github.com/proofsheet/proofsheet/internal/cp1252"
	"strconv"
	"strings"
	"unicode/utf8"

	"golang.org/x/text/encoding/unicode"

	"github.com/proofsheet/proofsheet/fixtures"
)

// Quoting says which CSV fields are put in double quotes. Null cells are
// always the unquoted empty field, and the empty string always "".
type Quoting uint8

// The quoting styles.
const (
	// QuoteMinimal quotes only the fields RFC 4180 §2 rule 6 requires
	// quotes for: those holding the delimiter, a double quote, CR or LF.
	// Every other field, however odd, goes bare.
	QuoteMinimal Quoting = iota
	// QuoteAll quotes every field.
	QuoteAll
	// QuoteText quotes the fields that do not read as numbers, as many
	// spreadsheet and statistics exports do.
	QuoteText
	// QuoteMixed quotes the fields that need it and a random half of the
	// others, as a file edited by hand ends up.
	QuoteMixed
)

var quotingNames = [...]string{"minimal", "all", "text", "mixed"}

// String returns minimal, all, text or mixed.
func (q Quoting) String() string {
	if int(q) < len(quotingNames) {
		return quotingNames[q]
	}
	return "Quoting(" + strconv.Itoa(int(q)) + ")"
}

// LineEnding is how CSV records end.
type LineEnding uint8

// The line endings.
const (
	LF           LineEnding = iota // "\n"
	CRLF                           // "\r\n", as RFC 4180 §2 rule 1 writes
	MixedEndings                   // LF and CRLF at random, both present when there are two records or more
)

var endingNames = [...]string{"LF", "CRLF", "mixed"}

// String returns LF, CRLF or mixed.
func (e LineEnding) String() string {
	if int(e) < len(endingNames) {
		return endingNames[e]
	}
	return "LineEnding(" + strconv.Itoa(int(e)) + ")"
}

// CSVStyle is how a table is written as CSV bytes. The zero value is
// comma-separated, minimal quoting, UTF-8 without BOM, LF.
type CSVStyle struct {
	// Delimiter is ',' (the default, 0), ';', '\t' or '|'.
	Delimiter rune
	Quoting   Quoting
	// Encoding is fixtures.EncodingUTF8 (the default, ""),
	// EncodingUTF8BOM, EncodingUTF16LE (with its byte order mark) or
	// EncodingWindows1252.
	Encoding   fixtures.Encoding
	LineEnding LineEnding
}

// Delimiters lists the delimiters CSVStyle takes.
func Delimiters() []rune { return []rune{',', ';', '\t', '|'} }

// Encodings lists the encodings CSVStyle takes.
func Encodings() []fixtures.Encoding {
	return []fixtures.Encoding{fixtures.EncodingUTF8, fixtures.EncodingUTF8BOM, fixtures.EncodingUTF16LE, fixtures.EncodingWindows1252}
}

func (st CSVStyle) norm() (CSVStyle, error) {
	if st.Delimiter == 0 {
		st.Delimiter = ','
	}
	if st.Encoding == "" {
		st.Encoding = fixtures.EncodingUTF8
	}
	switch st.Delimiter {
	case ',', ';', '\t', '|':
	default:
		return st, fmt.Errorf("property: CSV delimiter %q is not one of , ; tab |", st.Delimiter)
	}
	switch st.Encoding {
	case fixtures.EncodingUTF8, fixtures.EncodingUTF8BOM, fixtures.EncodingUTF16LE, fixtures.EncodingWindows1252:
	default:
		return st, fmt.Errorf("property: CSV encoding %q is not one of utf-8, utf-8-bom, utf-16le, windows-1252", st.Encoding)
	}
	if st.Quoting > QuoteMixed {
		return st, fmt.Errorf("property: unknown CSV quoting %d", st.Quoting)
	}
	if st.LineEnding > MixedEndings {
		return st, fmt.Errorf("property: unknown CSV line ending %d", st.LineEnding)
	}
	return st, nil
}

// String describes the style: "delimiter ';', quoting all, windows-1252,
// CRLF".
func (st CSVStyle) String() string {
	n, err := st.norm()
	if err != nil {
		return fmt.Sprintf("invalid CSV style (%v)", err)
	}
	return fmt.Sprintf("delimiter %q, quoting %s, %s, %s", n.Delimiter, n.Quoting, n.Encoding, n.LineEnding)
}

// FileName returns a file name whose extension fixtures.FormatFor reads
// as this style's format: name.tsv for tab-separated, else name.csv.
func (st CSVStyle) FileName(name string) string {
	if st.Delimiter == '\t' {
		return name + ".tsv"
	}
	return name + ".csv"
}

// fitsFor returns the test a cell's text must pass to be written in the
// encoding, nil when every text fits.
func fitsFor(enc fixtures.Encoding) func(string) bool {
	switch enc {
	case fixtures.EncodingUTF16LE:
		return utf8.ValidString
	case fixtures.EncodingWindows1252:
		return fitsWindows1252
	}
	return nil
}

// MessyCSV generates a table of the given number of data rows from schema
// and writes it as CSV in the given style. The same arguments always give
// the same bytes. The cells are generated so that the encoding can carry
// them (no invalid UTF-8 for UTF-16LE and Windows-1252, only Windows-1252
// characters for Windows-1252); a category level the encoding cannot
// carry is an error.
func MessyCSV(schema fixtures.Schema, rows int, seed int64, opts Options, style CSVStyle) ([]byte, error) {
	f, err := GenerateFile(schema, rows, seed, opts, style)
	if err != nil {
		return nil, err
	}
	return f.Data, nil
}

// File is a generated raw file: its bytes, the style they were written in
// and the sample they hold.
type File struct {
	Data   []byte
	Style  CSVStyle
	Sample *Sample

	root *File // the generated file this one was shrunk from; nil for that one
}

// origin returns the generated file f was shrunk from (f itself when it
// was generated).
func (f *File) origin() *File {
	if f.root != nil {
		return f.root
	}
	return f
}

// Name returns a file name for the data ("sample.csv", "sample.tsv") that
// fixtures.ReadBytes picks the reader by.
func (f *File) Name() string { return f.Style.FileName("sample") }

// String describes the file and its sample.
func (f *File) String() string {
	return fmt.Sprintf("CSV file of %d bytes (%s) holding %v", len(f.Data), f.Style, f.Sample)
}

// GenerateFile is MessyCSV returning the sample along with the bytes.
func GenerateFile(schema fixtures.Schema, rows int, seed int64, opts Options, style CSVStyle) (*File, error) {
	st, err := style.norm()
	if err != nil {
		return nil, err
	}
	c, err := opts.compile(schema)
	if err != nil {
		return nil, err
	}
	if rows < 0 {
		return nil, fmt.Errorf("property: %d rows", rows)
	}
	if err := c.checkCapacity(schema, rows, "the rows asked for,"); err != nil {
		return nil, err
	}
	c.fits = fitsFor(st.Encoding)
	s := generate(schema, rows, seed, c)
	data, err := s.CSV(st)
	if err != nil {
		return nil, err
	}
	return &File{Data: data, Style: st, Sample: s}, nil
}

// CSV writes the raw table as CSV in the given style. Null cells are
// unquoted empty fields, so a one-column table writes a null as an empty
// line, which many readers skip. It fails when a cell cannot be written in
// the style's encoding.
func (s *Sample) CSV(style CSVStyle) ([]byte, error) {
	st, err := style.norm()
	if err != nil {
		return nil, err
	}
	header := make([]Messy, len(s.cols))
	for j, c := range s.cols {
		header[j] = Messy{Raw: c.name, Clean: c.name}
	}
	return writeCSV(st, s.Seed, len(s.rows), func(i int) []Messy {
		if i < 0 {
			return header
		}
		return s.rows[i].cells
	}, func(i int) (bool, int) { return s.rows[i].fileOnly, s.rows[i].cut }, func(i, j int) string {
		if i < 0 {
			return fmt.Sprintf("header of column %d", j+1)
		}
		return fmt.Sprintf("row %d, column %q", i+1, s.cols[j].name)
	})
}

// writeCSV writes a header (row -1) and n rows given by row. shape, when
// not nil, tells rows written as an empty line and rows cut short after a
// number of fields (the last such row of the file has no line ending).
func writeCSV(st CSVStyle, seed int64, n int, row func(i int) []Messy, shape func(i int) (empty bool, cut int), where func(i, j int) string) ([]byte, error) {
	r := newRng(seed ^ 0x5eed_c5f0)
	fits := fitsFor(st.Encoding)
	delim := byte(st.Delimiter)
	est := 64
	if hdr := row(-1); len(hdr) > 0 {
		est = (n + 1) * len(hdr) * 10
	}
	b := make([]byte, 0, est)
	if st.Encoding == fixtures.EncodingUTF8BOM {
		b = append(b, 0xEF, 0xBB, 0xBF)
	}
	sawLF, sawCRLF := false, false
	for i := -1; i < n; i++ {
		cells := row(i)
		empty, cut := false, 0
		if shape != nil && i >= 0 {
			empty, cut = shape(i)
		}
		if empty {
			cells = nil
		} else if cut > 0 {
			cells = cells[:cut]
			if i == n-1 {
				// The file ends inside this line: no line ending.
				var err error
				if b, err = appendFields(b, st, cells, delim, fits, r, i, where); err != nil {
					return nil, err
				}
				break
			}
		}
		var err error
		if b, err = appendFields(b, st, cells, delim, fits, r, i, where); err != nil {
			return nil, err
		}
		crlf := st.LineEnding == CRLF
		if st.LineEnding == MixedEndings {
			switch {
			case i == n-1 && n >= 1 && !sawCRLF:
				crlf = true
			case i == n-1 && n >= 1 && !sawLF:
				crlf = false
			default:
				crlf = r.next()&1 == 1
			}
		}
		if crlf {
			b = append(b, '\r', '\n')
			sawCRLF = true
		} else {
			b = append(b, '\n')
			sawLF = true
		}
	}
	return encodeCSV(st, b)
}

// appendFields writes one record's fields, without the line ending.
func appendFields(b []byte, st CSVStyle, cells []Messy, delim byte, fits func(string) bool, r *rng, i int, where func(i, j int) string) ([]byte, error) {
	for j, c := range cells {
		if fits != nil && !fits(c.Raw) {
			return b, fmt.Errorf("property: %s: %q cannot be written in %s", where(i, j), c.Raw, st.Encoding)
		}
		if j > 0 {
			b = append(b, delim)
		}
		if c.IsNull() {
			continue
		}
		// A header name holding a character the reader could take for the
		// delimiter (",;|" or tab) is always quoted: a one-column file
		// whose header is "|" was read as two empty columns.
		if quoteField(st.Quoting, c.Raw, delim, r) || i == -1 && strings.ContainsAny(c.Raw, ",;|\t") {
			b = append(b, '"')
			for k := 0; k < len(c.Raw); k++ {
				if c.Raw[k] == '"' {
					b = append(b, '"') // RFC 4180 §2 rule 7
				}
				b = append(b, c.Raw[k])
			}
			b = append(b, '"')
		} else {
			b = append(b, c.Raw...)
		}
	}
	return b, nil
}

// encodeCSV encodes UTF-8 CSV text in the style's encoding.
func encodeCSV(st CSVStyle, b []byte) ([]byte, error) {
	switch st.Encoding {
	case fixtures.EncodingUTF16LE:
		out, err := unicode.UTF16(unicode.LittleEndian, unicode.UseBOM).NewEncoder().Bytes(b)
		if err != nil {
			return nil, fmt.Errorf("property: encoding as UTF-16LE: %w", err)
		}
		return out, nil
	case fixtures.EncodingWindows1252:
		out, ok := cp1252.Encode(b)
		if !ok {
			return nil, fmt.Errorf("property: encoding as Windows-1252: the text has a character Windows-1252 lacks")
		}
		return out, nil
	}
	return b, nil
}

// quoteField decides whether a non-null field is quoted.
func quoteField(q Quoting, s string, delim byte, r *rng) bool {
	if s == "" {
		return true // the empty string, not null
	}
	need := false
	for k := 0; k < len(s); k++ {
		if c := s[k]; c == delim || c == '"' || c == '\r' || c == '\n' {
			need = true
			break
		}
	}
	switch q {
	case QuoteAll:
		return true
	case QuoteText:
		if need {
			return true
		}
		_, err := strconv.ParseFloat(s, 64)
		return err != nil
	case QuoteMixed:
		return need || r.next()&1 == 1
	}
	return need
}

// TableCSV writes any table as CSV in the given style, cells in their
// literal table spelling (see fixtures.Column.Format), null as the unquoted
// empty field. Check uses it to feed a function's output back to a file
// loader.
func TableCSV(t *fixtures.Table, style CSVStyle) ([]byte, error) {
	st, err := style.norm()
	if err != nil {
		return nil, err
	}
	names := t.Names()
	header := make([]Messy, len(names))
	for j, n := range names {
		header[j] = Messy{Raw: n, Clean: n}
	}
	cols := t.Columns()
	cells := make([]Messy, len(cols))
	return writeCSV(st, int64(t.NumRows()), t.NumRows(), func(i int) []Messy {
		if i < 0 {
			return header
		}
		for j, c := range cols {
			if c.IsNull(i) {
				cells[j] = Messy{}
			} else {
				s := c.Format(i)
				cells[j] = Messy{Raw: s, Clean: s}
			}
		}
		return cells
	}, nil, func(i, j int) string {
		if i < 0 {
			return fmt.Sprintf("header of column %d", j+1)
		}
		return fmt.Sprintf("row %d, column %q", i+1, names[j])
	})
}

// describeBytes writes data as a Go string literal for a report, cut at
// limit bytes.
func describeBytes(data []byte, limit int) string {
	if len(data) > limit {
		return strconv.Quote(string(data[:limit])) + " …"
	}
	return strings.ReplaceAll(strconv.Quote(string(data)), "`", `\x60`)
}
