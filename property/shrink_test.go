package property

import (
	"bytes"
	"strings"
	"testing"

	"github.com/leanovate/gopter"
	"github.com/stretchr/testify/require"

	"github.com/proofsheet/proofsheet/fixtures"
)

// planted returns a sample of n rows in which exactly one temp_c cell, at
// row at, is written with a Unicode minus.
func planted(t testing.TB, n, at int) (*Sample, Messy) {
	s, err := Generate(greenhouse, n, 2026, Options{Mess: Heavy, Avoid: []Mess{MessUnicodeMinus}})
	require.NoError(t, err)
	bad := Messy{Raw: "\u221212.5", Clean: -12.5, Mess: MessUnicodeMinus}
	j := s.colIndex("temp_c")
	require.GreaterOrEqual(t, j, 0)
	return s.withCell(at, j, bad), bad
}

func (s *Sample) colIndex(name string) int {
	for j, c := range s.cols {
		if c.plain == name {
			return j
		}
	}
	return -1
}

// choke is a chain step that fails on a Unicode minus in temp_c.
func choke(in *fixtures.Table) (*fixtures.Table, error) {
	c := in.Column("temp_c")
	if c == nil {
		return in, nil
	}
	for i := 0; i < c.Len(); i++ {
		if !c.IsNull(i) && strings.Contains(c.Str(i), "\u2212") {
			panic("strconv.ParseFloat: " + c.Str(i))
		}
	}
	return in, nil
}

func chokes(s *Sample) bool {
	o := call(func() (*fixtures.Table, error) { return choke(s.Raw()) })
	return o.panicked
}

func TestShrinkFindsThePlantedCell(t *testing.T) {
	s, bad := planted(t, 1000, 637)
	require.True(t, chokes(s))
	got, steps := Shrink(s, chokes)
	require.Equal(t, 1, got.NumRows())
	require.Equal(t, []string{"temp_c"}, got.Names())
	require.Equal(t, bad, got.Cell(0, 0))
	require.Positive(t, steps)
	require.Less(t, steps, 40, "halving, not row by row")
	require.True(t, chokes(got))
}

func TestShrinkThroughGopter(t *testing.T) {
	s, bad := planted(t, 1000, 321)
	gen := func(*gopter.GenParameters) *gopter.GenResult { return gopter.NewGenResult(s, SampleShrinker) }
	res := Prop(choke, gen, NoPanic()).Check(gopter.DefaultTestParametersWithSeed(1))
	require.Equal(t, gopter.TestFailed, res.Status)
	got := res.Args[0].Arg.(*Sample)
	require.Equal(t, 1, got.NumRows())
	require.Equal(t, bad, got.Cell(0, 0))
	require.Contains(t, res.Labels[0], "panicked: strconv.ParseFloat: \u221212.5")
	require.Same(t, s, res.Args[0].OrigArg)
}

func TestShrinkSpellsCellsPlainly(t *testing.T) {
	s, err := Generate(greenhouse, 300, 9, Options{Mess: Heavy, MessRate: 1, NullRate: -1, SentinelRate: -1})
	require.NoError(t, err)
	// Fails whenever a house cell is there at all.
	hasHouse := func(s *Sample) bool { return s.NumRows() > 0 && s.colIndex("house") >= 0 }
	got, _ := Shrink(s, hasHouse)
	require.Equal(t, 1, got.NumRows())
	require.Equal(t, []string{"house"}, got.Names())
	c := got.Cell(0, 0)
	require.Equal(t, MessNone, c.Mess)
	require.Equal(t, c.Clean, c.Raw)
	// Header names shrink to the schema's.
	h, err := Generate(greenhouse, 20, 9, Options{HeaderMess: true})
	require.NoError(t, err)
	got, _ = Shrink(h, func(s *Sample) bool { return s.NumCols() == len(greenhouse) })
	require.Equal(t, greenhouse.Names(), got.Names())
}

func TestShrinkPeelsEdgeSpaceFirst(t *testing.T) {
	s := sampleOf([]string{"temp_c"}, []Messy{{Raw: " \u22121,5\t", Clean: "-1.5", Mess: MessUnicodeMinus.and(MessDecimalComma).and(MessEdgeSpace)}})
	got, steps := Shrink(s, func(s *Sample) bool { return s.NumRows() > 0 && strings.Contains(s.Cell(0, 0).Raw, "\u2212") })
	require.Equal(t, 1, steps)
	require.Equal(t, Messy{Raw: "\u22121,5", Clean: "-1.5", Mess: MessUnicodeMinus.and(MessDecimalComma)}, got.Cell(0, 0))
}

func TestShrinkTable(t *testing.T) {
	s, err := Generate(greenhouse, 400, 4, Options{Mess: None, NullRate: -1})
	require.NoError(t, err)
	tb := s.Clean()
	target := tb.Column("kept").Int64(123)
	fails := func(t *fixtures.Table) bool {
		c := t.Column("kept")
		if c == nil {
			return false
		}
		for i := 0; i < c.Len(); i++ {
			if c.Int64(i) == target {
				return true
			}
		}
		return false
	}
	got, steps := ShrinkTable(tb, fails)
	require.Equal(t, 1, got.NumRows())
	require.Equal(t, []string{"kept"}, got.Names())
	require.Equal(t, target, got.Column("kept").Int64(0))
	require.Positive(t, steps)
}

func TestShrinkFileMakesTheStylePlain(t *testing.T) {
	st := CSVStyle{Delimiter: ';', Quoting: QuoteAll, Encoding: fixtures.EncodingWindows1252, LineEnding: CRLF}
	f, err := GenerateFile(greenhouse, 300, 5, Options{Mess: Heavy, SentinelRate: 0.05}, st)
	require.NoError(t, err)
	load := func(f *File) *fixtures.Table {
		tb, _, err := fixtures.ReadBytes(f.Name(), f.Data, fixtures.AllText())
		require.NoError(t, err)
		return tb
	}
	hasERR := func(f *File) bool {
		tb := load(f)
		for _, c := range tb.Columns() {
			for i := 0; i < c.Len(); i++ {
				if !c.IsNull(i) && c.Str(i) == "ERR" {
					return true
				}
			}
		}
		return false
	}
	require.True(t, hasERR(f))
	got, _ := ShrinkFile(f, hasERR)
	require.Equal(t, 1, got.Sample.NumRows())
	require.Equal(t, 1, got.Sample.NumCols())
	require.Equal(t, CSVStyle{Delimiter: ',', Encoding: fixtures.EncodingUTF8}, got.Style)
	require.Equal(t, got.Sample.Names()[0]+"\nERR\n", string(got.Data))
	// The gopter shrinker offers the same candidates.
	var viaGopter [][]byte
	shrink := FileShrinker(f)
	for v, ok := shrink(); ok && len(viaGopter) < 5; v, ok = shrink() {
		viaGopter = append(viaGopter, v.(*File).Data)
	}
	next := fileStream(f)
	for _, want := range viaGopter {
		c, ok := next()
		require.True(t, ok)
		require.True(t, bytes.Equal(want, c.Data))
	}
}

func TestShrinkStreamOrder(t *testing.T) {
	s := sampleOf([]string{"a", "b"},
		[]Messy{text("1"), {Raw: "1,5", Clean: "1.5", Mess: MessDecimalComma}},
		[]Messy{text("2"), text("x")},
		[]Messy{text("3"), text("y")},
		[]Messy{text("4"), text("z")},
	)
	var got []string
	next := shrinkStream(s)
	for c, ok := next(); ok; c, ok = next() {
		got = append(got, strings.Join(c.Names(), ",")+":"+firstCol(c))
	}
	require.Equal(t, []string{
		"a,b:",        // all rows dropped
		"a,b:3 4",     // first half
		"a,b:1 2",     // second half
		"a,b:2 3 4",   // single rows
		"a,b:1 3 4",   //
		"a,b:1 2 4",   //
		"a,b:1 2 3",   //
		"b:1,5 x y z", // columns
		"a:1 2 3 4",   //
		"a,b:1 2 3 4", // the messy cell spelled plainly
	}, got)
}

func firstCol(s *Sample) string {
	var parts []string
	for i := 0; i < s.NumRows(); i++ {
		parts = append(parts, s.Cell(i, 0).Raw)
	}
	return strings.Join(parts, " ")
}

func TestPasteReadyParsesBack(t *testing.T) {
	s := sampleOf([]string{"house", "odd name|x", "note"},
		[]Messy{text("Étang"), text("a|b"), {Raw: "\xc9tang", Clean: "Étang", Mess: MessWindows1252}},
		[]Messy{{}, text(""), text("~")},
		[]Messy{text(" edge\u00a0"), text("back`quote"), {Raw: "\ufeffL1\r\nL2\rL3", Clean: "L1\nL2\nL3", Mess: MessStrayBOM}},
		[]Messy{text("#hash"), text(`"quoted"`), {Raw: "a\xed\xa0\x80b\u200b", Clean: "ab", Mess: MessInvalidUTF8}},
	)
	raw := s.Raw()
	code := PasteReady("in", raw)
	require.True(t, strings.HasPrefix(code, "in := fixtures.MustParse(t, `\n\t"))
	require.True(t, strings.HasSuffix(code, "\n`)\n"))
	body := code[strings.Index(code, "`")+1 : strings.LastIndex(code, "`")]
	require.NotContains(t, body, "`", "a raw string cannot hold a backquote")
	back, err := fixtures.Parse(body)
	require.NoError(t, err)
	requireSame(t, raw, back)
	require.Equal(t, raw.Literal(), back.Literal())

	simple := sampleOf([]string{"house", "temp_c"}, []Messy{text("Étang"), {Raw: "1,5", Clean: "1.5", Mess: MessDecimalComma}})
	require.Equal(t, "raw := fixtures.MustParse(t, `\n\thouse:string | temp_c:string\n\tÉtang        | 1,5\n`)\n", PasteReady("", simple.Raw()))
}

func TestFileSmallerIsTheShrinkOrder(t *testing.T) {
	f, err := GenerateFile(greenhouse, 6, 5, Options{Mess: Heavy}, CSVStyle{Delimiter: ';', Encoding: fixtures.EncodingWindows1252})
	require.NoError(t, err)
	next := fileStream(f)
	n := 0
	for c := range f.Smaller() {
		want, ok := next()
		require.True(t, ok)
		require.Equal(t, want.Data, c.Data)
		n++
		if n == 50 {
			break
		}
	}
	require.Positive(t, n)
}
