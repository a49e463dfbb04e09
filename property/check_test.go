package property

import (
	"bytes"
	"errors"
	"fmt"
	"math"
	"strconv"
	"strings"
	"testing"

	"github.com/leanovate/gopter"
	"github.com/stretchr/testify/require"

	"github.com/proofsheet/proofsheet/assert"
	"github.com/proofsheet/proofsheet/fixtures"
)

var readings = fixtures.Schema{
	fixtures.Col("house", fixtures.Category),
	fixtures.Col("temp_c", fixtures.Float64),
}

var cleaned = fixtures.Schema{
	fixtures.Col("house", fixtures.String),
	fixtures.Col("temp_c", fixtures.Float64),
}

// cleanTemps is a small chain step under test: it reads temp_c written
// with a decimal point or comma and edge blanks, treats the null words it
// knows as missing, drops rows without a reading, and types the columns.
func cleanTemps(in *fixtures.Table) (*fixtures.Table, error) {
	house, temp := in.Column("house"), in.Column("temp_c")
	if house == nil || temp == nil {
		return nil, fmt.Errorf("want columns house and temp_c, got %s", strings.Join(in.Names(), ", "))
	}
	b := fixtures.NewBuilder(cleaned)
	for i := 0; i < in.NumRows(); i++ {
		var h any
		if !house.IsNull(i) && !nullWord(house.Str(i)) {
			h = strings.TrimSpace(house.Str(i))
		}
		var v float64
		switch {
		case temp.IsNull(i):
			continue
		case temp.Kind() == fixtures.KindFloat64:
			v = temp.Float64(i)
		default:
			if nullWord(temp.Str(i)) {
				continue
			}
			s := strings.ReplaceAll(strings.Trim(temp.Str(i), " \t\u00a0"), ",", ".")
			f, err := strconv.ParseFloat(s, 64)
			if err != nil {
				return nil, fmt.Errorf("row %d: temp_c %q: %w", i+1, temp.Str(i), err)
			}
			v = f
		}
		b.Row(h, v)
	}
	return b.Build()
}

func nullWord(s string) bool { return s == "NA" || s == "N/A" || s == "null" }

// cleanTempsRef is the same step written over the clean typed table.
func cleanTempsRef(in *fixtures.Table) (*fixtures.Table, error) {
	b := fixtures.NewBuilder(cleaned)
	house, temp := in.Column("house"), in.Column("temp_c")
	for i := 0; i < in.NumRows(); i++ {
		if temp.IsNull(i) {
			continue
		}
		var h any
		if !house.IsNull(i) {
			h = house.Str(i)
		}
		b.Row(h, temp.Float64(i))
	}
	return b.Build()
}

// tameMess is the mess cleanTemps handles.
var tameMess = Options{Mess: Heavy, Locale: "de-DE", Spellings: []Mess{MessDecimalComma, MessEdgeSpace, MessNullToken},
	NullTokens: []string{"NA", "N/A", "null"}, Seed: 11, Runs: 60}

func TestCheckPassesAGoodFunction(t *testing.T) {
	ft := &fakeT{name: "TestCleanTemps"}
	opts := tameMess
	opts.DuplicateRate = -1 // MatchesClean compares with the table without duplicates
	ok := Check(ft, readings, cleanTemps, opts,
		NoPanic(),
		Idempotent(),
		OrderFree(),
		SameOnPlain(assert.Tol("temp_c", 1e-12, 0)),
		NoNulls("temp_c"),
		KeepsTotal("temp_c", "temp_c", 1e-6),
		Agrees(cleanTemps),
		MatchesClean(cleanTempsRef),
		Holds("no more rows than in", func(s *Sample, out *fixtures.Table) error {
			if out.NumRows() > s.NumRows() {
				return fmt.Errorf("got %d rows, want at most %d", out.NumRows(), s.NumRows())
			}
			return nil
		}),
	)
	require.Empty(t, ft.msgs)
	require.True(t, ok)
}

// snippet returns the literal table inside the first MustParse of a report.
func snippet(t *testing.T, report string) *fixtures.Table {
	t.Helper()
	i := strings.Index(report, "fixtures.MustParse(t, `")
	require.GreaterOrEqual(t, i, 0, report)
	rest := report[i+len("fixtures.MustParse(t, `"):]
	j := strings.Index(rest, "`)")
	require.GreaterOrEqual(t, j, 0)
	tb, err := fixtures.Parse(rest[:j])
	require.NoError(t, err, rest[:j])
	return tb
}

func TestCheckReportsAShrunkPasteReadyInput(t *testing.T) {
	ft := &fakeT{name: "TestCleanTemps/heavy"}
	ok := Check(ft, readings, cleanTemps, Options{Mess: Heavy, Seed: 5}, SameOnPlain())
	require.False(t, ok)
	require.Len(t, ft.msgs, 1)
	rep := ft.msgs[0]
	require.Contains(t, rep, `property: invariant "same on plain spellings" failed after`)
	require.Contains(t, rep, "seed 5 (from Options.Seed); re-run with: PROOFSHEET_SEED=5 go test -run '^TestCleanTemps$/^heavy$'")
	require.Contains(t, rep, "shrunk in ")
	require.Contains(t, rep, "paste it into a test:\n\traw := fixtures.MustParse(t, `\n")
	tb := snippet(t, rep)
	require.LessOrEqual(t, tb.NumRows(), 3)
	require.Positive(t, tb.NumRows())
	// The pasted table is the shrunk sample gopter ended with.
	params := gopter.DefaultTestParametersWithSeed(5)
	params.MaxSize = 100
	res := Prop(cleanTemps, Tables(readings, Options{Mess: Heavy}), SameOnPlain()).Check(params)
	require.Equal(t, gopter.TestFailed, res.Status)
	requireSame(t, res.Args[0].Arg.(*Sample).Raw(), tb)

	// Same seed, same report.
	again := &fakeT{name: "TestCleanTemps/heavy"}
	Check(again, readings, cleanTemps, Options{Mess: Heavy, Seed: 5}, SameOnPlain())
	require.Equal(t, ft.text(), again.text())
}

func TestCheckSeedFromTheEnvironment(t *testing.T) {
	t.Setenv(SeedEnv, "12345")
	ft := &fakeT{name: "TestX"}
	Check(ft, readings, cleanTemps, Options{Mess: Heavy, Seed: 5}, NoPanic().ErrorsOK(), Idempotent())
	require.Contains(t, ft.text(), "seed 12345 (from PROOFSHEET_SEED); re-run with: PROOFSHEET_SEED=12345 go test -run '^TestX$'")
	again := &fakeT{name: "TestX"}
	Check(again, readings, cleanTemps, Options{Mess: Heavy}, NoPanic().ErrorsOK(), Idempotent())
	require.Equal(t, ft.text(), again.text())

	t.Setenv(SeedEnv, "twelve")
	bad := &fakeT{name: "TestX"}
	require.False(t, Check(bad, readings, cleanTemps, Options{}))
	require.Equal(t, `property: PROOFSHEET_SEED="twelve" is not a 64-bit integer`, bad.text())
}

func TestCheckCatchesPanicsAndNilResults(t *testing.T) {
	t.Setenv(SeedEnv, "")
	ft := &fakeT{name: "TestP"}
	Check(ft, readings, choke, Options{Seed: 3, Spellings: []Mess{MessUnicodeMinus}, MessRate: 0.3})
	rep := ft.text()
	require.Contains(t, rep, `invariant "no panic" failed`)
	require.Contains(t, rep, "the function panicked: strconv.ParseFloat: \u2212")
	require.Contains(t, rep, "property.choke(")
	tb := snippet(t, rep)
	require.Equal(t, 1, tb.NumRows())
	require.Equal(t, []string{"temp_c"}, tb.Names())

	nilnil := &fakeT{name: "TestN"}
	Check(nilnil, readings, func(*fixtures.Table) (*fixtures.Table, error) { return nil, nil }, Options{Seed: 1})
	require.Contains(t, nilnil.text(), "the function returned a nil table and a nil error")
	require.Equal(t, 0, snippet(t, nilnil.text()).NumRows(), "shrinks to the empty table")

	none := &fakeT{name: "TestNil"}
	Check(none, readings, nil, Options{Seed: 1}, Idempotent())
	require.Contains(t, none.text(), "property: nil function")
}

func TestInvariantsFail(t *testing.T) {
	identity := func(in *fixtures.Table) (*fixtures.Table, error) { return in, nil }
	firstRow := func(in *fixtures.Table) (*fixtures.Table, error) {
		if in.NumRows() == 0 {
			return in, nil
		}
		return in.Slice(0, 1), nil
	}
	dropCold := func(in *fixtures.Table) (*fixtures.Table, error) {
		out, err := cleanTemps(in)
		if err != nil {
			return nil, err
		}
		keep := []int{}
		for i := 0; i < out.NumRows(); i++ {
			if out.Column("temp_c").Float64(i) >= 0 {
				keep = append(keep, i)
			}
		}
		return out.Take(keep)
	}
	failing := func(*fixtures.Table) (*fixtures.Table, error) { return nil, errors.New("cannot read the readings") }
	for _, tc := range []struct {
		name string
		fn   Func
		inv  Invariant
		opts Options
		want string
	}{
		{"idempotent", cleanTemps, Idempotent(), tameMess, ""},
		{"not idempotent", func(in *fixtures.Table) (*fixtures.Table, error) {
			b := fixtures.NewBuilder(fixtures.Schema{fixtures.Col("n", fixtures.Int64)})
			return b.Row(in.NumCols()).Build()
		}, Idempotent(), tameMess, "f(f(raw)) differs from f(raw)"},
		{"order", firstRow, OrderFree(), Options{Seed: 2, MinRows: 2}, "the result for the shuffled rows differs"},
		{"order by key", firstRow, OrderFree(assert.ByKey("house")), Options{Seed: 2, MinRows: 2}, "the result for the shuffled rows differs"},
		{"total", dropCold, KeepsTotal("temp_c", "temp_c", 1e-6), tameMess, `sum of output column "temp_c": got`},
		{"total no column", cleanTemps, KeepsTotal("temp_c", "kelvin", 1e-6), tameMess, `the output has no column "kelvin"`},
		{"total not numeric", identity, KeepsTotal("house", "house", 1), tameMess, `column "house" is category, not a number`},
		{"total output text", identity, KeepsTotal("temp_c", "temp_c", 1), tameMess, `output column "temp_c" is string, not a number`},
		{"nulls", identity, NoNulls("temp_c"), tameMess, `output column "temp_c": got`},
		{"nulls no column", identity, NoNulls("kelvin"), tameMess, `the output has no column "kelvin"`},
		{"plain", identity, SameOnPlain(), tameMess, "the result for the messy spellings differs"},
		{"agrees", firstRow, Agrees(identity), Options{Seed: 2, MinRows: 2}, "the result differs from the reference's"},
		{"clean", cleanTemps, MatchesClean(cleanTempsRef), Options{Seed: 2, Mess: None, DuplicateRate: 0.5, MinRows: 5}, "on the clean table"},
		{"holds", identity, Holds("has rows", func(s *Sample, out *fixtures.Table) error {
			if out.NumRows() == 0 {
				return errors.New("no rows")
			}
			return nil
		}), Options{Seed: 2}, "has rows: no rows"},
		{"holds panics", identity, Holds("x", func(s *Sample, out *fixtures.Table) error { panic("oops") }), Options{Seed: 2}, `the check "x" panicked: oops`},
		{"error", failing, Idempotent(), Options{Seed: 2}, "the function returned an error: cannot read the readings"},
		{"error ok", failing, Idempotent().ErrorsOK(), Options{Seed: 2}, ""},
		{"no panic allows errors", failing, NoPanic(), Options{Seed: 2}, ""},
	} {
		t.Run(tc.name, func(t *testing.T) {
			t.Setenv(SeedEnv, "")
			ft := &fakeT{name: "T"}
			ok := Check(ft, readings, tc.fn, tc.opts, tc.inv)
			if tc.want == "" {
				require.True(t, ok, ft.text())
				return
			}
			require.False(t, ok)
			require.Contains(t, ft.text(), tc.want)
			snippet(t, ft.text())
		})
	}
	require.Equal(t, "idempotent (errors allowed)", Idempotent().ErrorsOK().Name())
}

func TestPropInsideUsersProperties(t *testing.T) {
	props := gopter.NewProperties(gopter.DefaultTestParametersWithSeed(4))
	props.Property("clean temps keep their readings", Prop(cleanTemps, Tables(readings, tameMess), NoNulls("temp_c")))
	props.Property("identity is clean", Prop(func(in *fixtures.Table) (*fixtures.Table, error) { return in, nil },
		Tables(readings, Options{Mess: Heavy}), SameOnPlain()))
	var out bytes.Buffer
	ok := props.Run(gopter.NewFormatedReporter(false, 100, &out))
	require.False(t, ok)
	require.Contains(t, out.String(), "+ clean temps keep their readings: OK")
	require.Contains(t, out.String(), "! identity is clean: Falsified")
	require.Contains(t, out.String(), "same on plain spellings: the result for the messy spellings differs")
	require.Contains(t, out.String(), ":string", "the shrunk sample prints as a literal table")
}

func TestCheckFiles(t *testing.T) {
	t.Setenv(SeedEnv, "")
	load := func(name string, data []byte) (*fixtures.Table, error) {
		tb, _, err := fixtures.ReadBytes(name, data, fixtures.AllText())
		return tb, err
	}
	identity := func(in *fixtures.Table) (*fixtures.Table, error) { return in, nil }
	// The loader reads every generated file back to its raw table (bytes
	// that are not UTF-8 in a UTF-8 file are read as Windows-1252, so
	// they are left out here) and never panics on any of them.
	ft := &fakeT{name: "TestLoad"}
	opts := Options{Mess: Heavy, Seed: 8, MinRows: 1, Avoid: []Mess{MessInvalidUTF8, MessWindows1252}, ExtraColumns: 2}
	require.True(t, CheckFiles(ft, greenhouse, load, opts, []Invariant{NoPanic(), Agrees(identity), Idempotent()}), ft.text())
	require.True(t, CheckFiles(ft, greenhouse, load, Options{Mess: Heavy, Seed: 9}, []Invariant{NoPanic()}), ft.text())

	// A chain that chokes: the report has the bytes and the table.
	chain := func(name string, data []byte) (*fixtures.Table, error) {
		tb, err := load(name, data)
		if err != nil {
			return nil, err
		}
		return cleanTemps(tb)
	}
	bad := &fakeT{name: "TestChain"}
	require.False(t, CheckFiles(bad, readings, chain, Options{Mess: Heavy, Seed: 3}, []Invariant{SameOnPlain()},
		CSVStyle{Delimiter: ';', Encoding: fixtures.EncodingWindows1252, LineEnding: CRLF}))
	rep := bad.text()
	require.Contains(t, rep, "the file was delimiter ';', quoting minimal, windows-1252, CRLF")
	require.Contains(t, rep, "data := []byte(\"")
	require.Contains(t, rep, "// delimiter ',', quoting minimal, utf-8, LF", "the style shrinks too")
	tb := snippet(t, rep)
	require.LessOrEqual(t, tb.NumRows(), 3)
}

func TestSameSum(t *testing.T) {
	require.True(t, sameSum(math.NaN(), math.NaN(), 0))
	require.False(t, sameSum(math.NaN(), 1, 10))
	require.True(t, sameSum(math.Inf(1), math.Inf(1), 0))
	require.False(t, sameSum(math.Inf(1), math.Inf(-1), 1))
	require.True(t, sameSum(1, 1.0000001, 1e-6))
	require.False(t, sameSum(1, 1.1, 1e-6))
}

func TestRunPattern(t *testing.T) {
	require.Equal(t, "^TestA$", runPattern("TestA"))
	require.Equal(t, `^TestA$/^case_1\.5$`, runPattern("TestA/case_1.5"))
}

func TestCheckPrintsOneCounterexampleForEveryInvariantItBreaks(t *testing.T) {
	t.Setenv(SeedEnv, "")
	// Fails two invariants on any input with a "$": the result keeps the
	// dollar rows only, and drops the house.
	dollars := func(in *fixtures.Table) (*fixtures.Table, error) {
		temp := in.Column("temp_c")
		var keep []int
		for i := 0; temp != nil && i < in.NumRows(); i++ {
			if !temp.IsNull(i) && strings.Contains(temp.Str(i), "$") {
				keep = append(keep, i)
			}
		}
		return in.Take(keep)
	}
	ft := &fakeT{name: "TestDollars"}
	ok := Check(ft, readings, dollars, Options{Seed: 7, Mess: Light, MessRate: 0.5, DuplicateRate: -1},
		SameOnPlain(), NoNulls("temp_c"), OrderFree(), Holds("never more rows than in", func(s *Sample, out *fixtures.Table) error {
			if out.NumRows() > s.NumRows() {
				return fmt.Errorf("more rows")
			}
			return nil
		}))
	require.False(t, ok)
	require.Len(t, ft.msgs, 1, "one counterexample:\n%s", ft.text())
	rep := ft.msgs[0]
	require.Contains(t, rep, `property: invariant "same on plain spellings" failed after`)
	require.Equal(t, 1, strings.Count(rep, "paste it into a test"), rep)
	require.Contains(t, rep, "same on plain spellings: ")
	require.NotContains(t, rep, "row order free: ", "order does not matter to it")
	tb := snippet(t, rep)
	require.Equal(t, 1, tb.NumRows(), rep)
	require.Equal(t, "$0.00", tb.Column("temp_c").Str(0), "the value shrinks to zero, the $ kept")

	// Two invariants broken by one sample: listed together, once.
	both := func(in *fixtures.Table) (*fixtures.Table, error) {
		if in.NumRows() > 0 {
			return nil, fmt.Errorf("cannot read %d rows", in.NumRows())
		}
		return in, nil
	}
	ft = &fakeT{name: "TestBoth"}
	require.False(t, Check(ft, readings, both, Options{Seed: 2}, Idempotent(), NoNulls("temp_c"), NoPanic()))
	require.Len(t, ft.msgs, 1, ft.text())
	rep = ft.msgs[0]
	require.Contains(t, rep, `property: 2 invariants failed on the same sample after `)
	require.Contains(t, rep, `"idempotent", "no nulls in temp_c"`)
	require.Contains(t, rep, "idempotent: the function returned an error: cannot read 1 rows\n")
	require.Contains(t, rep, "no nulls in temp_c: the function returned an error: cannot read 1 rows\n")
	require.Equal(t, 1, strings.Count(rep, "paste it into a test"))

	// Invariants that held on the first counterexample are checked on, and
	// one that breaks on another sample gets its own report.
	identity := func(in *fixtures.Table) (*fixtures.Table, error) { return in, nil }
	odd := Holds("an even number of rows", func(s *Sample, _ *fixtures.Table) error {
		if s.NumRows()%2 == 1 {
			return fmt.Errorf("%d rows", s.NumRows())
		}
		return nil
	})
	many := Holds("fewer than 4 rows", func(s *Sample, _ *fixtures.Table) error {
		if s.NumRows() >= 4 && s.NumRows()%2 == 0 {
			return fmt.Errorf("%d rows", s.NumRows())
		}
		return nil
	})
	ft = &fakeT{name: "TestLater"}
	require.False(t, Check(ft, readings, identity, Options{Seed: 2, MinRows: 1}, odd, many))
	require.Len(t, ft.msgs, 2, ft.text())
	require.Contains(t, ft.msgs[0], `property: invariant "an even number of rows" failed`)
	require.Contains(t, ft.msgs[1], `property: invariant "fewer than 4 rows" failed`)
	require.Equal(t, 4, snippet(t, ft.msgs[1]).NumRows())
}
