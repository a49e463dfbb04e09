package assert

import (
	"strings"
	"testing"
	"time"

	"github.com/stretchr/testify/require"

	"github.com/proofsheet/proofsheet/fixtures"
)

func lit(t *testing.T, text string) *fixtures.Table {
	t.Helper()
	return fixtures.MustParse(t, text)
}

// counts is the shape of a Diff that most tests check.
type counts struct {
	equal          bool
	cells          int
	missing, extra int
	schema         int
	problems       int
	dupWant        int
	dupGot         int
}

func countsOf(d *Diff) counts {
	return counts{d.Equal(), d.CellsDiffering, d.Missing.Count, d.Extra.Count, len(d.Schema), len(d.Problems), d.Duplicates.WantKeys, d.Duplicates.GotKeys}
}

// countCase compares two literal tables and checks the Diff's counts.
type countCase struct {
	name      string
	want, got string
	opts      []Option
	expect    counts
}

// runCounts runs the cases, each with the lead options before its own.
func runCounts(t *testing.T, cases []countCase, lead ...Option) {
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			opts := append(append([]Option(nil), lead...), c.opts...)
			d := Compare(lit(t, c.want), lit(t, c.got), opts...)
			require.Equal(t, c.expect, countsOf(d), d.Text())
		})
	}
}

func TestCompareDefaults(t *testing.T) {
	runCounts(t, []countCase{
		{"identical", `a:int64 | b:string
			1 | x
			2 | y`, `a:int64 | b:string
			1 | x
			2 | y`, nil, counts{equal: true}},
		{"positional order matters", `a:int64
			1
			2`, `a:int64
			2
			1`, nil, counts{cells: 2}},
		{"floats exact by default", `x:float64
			0.3`, `x:float64
			0.30000000000000004`, nil, counts{cells: 1}},
		// Source: IEEE 754-2019 §5.11: −0 and +0 compare equal.
		{"-0 equals +0", `x:float64
			-0`, `x:float64
			0`, nil, counts{equal: true}},
		{"NaN equals NaN", `x:float64
			NaN`, `x:float64
			NaN`, nil, counts{equal: true}},
		{"null equals null", `x:float64 | s:string
			~ | ~`, `x:float64 | s:string
			~ | ~`, nil, counts{equal: true}},
		{"null is not NaN", `x:float64
			~`, `x:float64
			NaN`, nil, counts{cells: 1}},
		{"NaNIsNull makes null equal NaN", `x:float64
			~
			NaN`, `x:float64
			NaN
			~`, []Option{NaNIsNull()}, counts{equal: true}},
		{"NaNIsNull: NaN still differs from a number", `x:float64
			NaN`, `x:float64
			1`, []Option{NaNIsNull()}, counts{cells: 1}},
		{"null is not the empty string", `s:string
			~`, `s:string
			""`, nil, counts{cells: 1}},
		{"infinities", `x:float64
			+Inf
			-Inf`, `x:float64
			+Inf
			+Inf`, []Option{Tol("x", 1e300, 1)}, counts{cells: 1}},
		{"more want rows: missing tail", `a:int64
			1
			2
			3`, `a:int64
			1`, nil, counts{missing: 2}},
		{"more got rows: extra tail", `a:int64
			1`, `a:int64
			1
			2`, nil, counts{extra: 1}},
		{"decimals compare by value", `m:decimal(6,2)
			12.30`, `m:decimal(6,2)
			12.30`, nil, counts{equal: true}},
		{"decimals differ by a cent", `m:decimal(6,2)
			12.30`, `m:decimal(6,2)
			12.31`, nil, counts{cells: 1}},
		{"decimal of other scale: type change, equal value", `m:decimal(6,1)
			12.3`, `m:decimal(6,2)
			12.30`, nil, counts{schema: 1}},
		{"decimal of other scale under LooseTypes", `m:decimal(6,1)
			12.3`, `m:decimal(6,2)
			12.30`, []Option{LooseTypes()}, counts{equal: true}},
		{"bools", `b:bool
			true`, `b:bool
			false`, nil, counts{cells: 1}},
		{"dates", `d:date
			2026-04-01`, `d:date
			2026-04-02`, nil, counts{cells: 1}},
		{"empty tables", `a:int64`, `a:int64`, nil, counts{equal: true}},
	})
}

func TestTolOptions(t *testing.T) {
	want := `a:float64 | b:float64
		1.0 | 100
		2.0 | 200`
	got := `a:float64 | b:float64
		1.05 | 100.5
		2.0  | 201`
	cases := []struct {
		name  string
		opts  []Option
		cells int
	}{
		{"exact", nil, 3},
		{"abs on one column", []Option{Tol("a", 0.1, 0)}, 2},
		{"star covers every float column", []Option{Tol("*", 0.1, 0)}, 2},
		{"rel on b", []Option{Tol("b", 0, 0.01)}, 1},
		{"named column wins over star", []Option{Tol("*", 0, 0.01), Tol("a", 0.01, 0)}, 1},
		{"ULPs too small", []Option{ULPs("*", 4)}, 3},
		{"later Tol replaces ULPs", []Option{ULPs("a", 4), Tol("a", 0.1, 0)}, 2},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			d := Compare(lit(t, want), lit(t, got), c.opts...)
			require.Equal(t, c.cells, d.CellsDiffering, d.Text())
			require.Empty(t, d.Problems)
		})
	}
}

func TestColumnSummaries(t *testing.T) {
	want := lit(t, `id:int64 | v:float64
		1 | 10
		2 | 20
		3 | 30`)
	got := lit(t, `id:int64 | v:float64
		1 | 10.001
		2 | 20.5
		3 | 33`)
	d := Compare(want, got, Tol("v", 0.01, 0))
	require.Equal(t, 2, d.CellsDiffering)
	require.Equal(t, 2, d.RowsDiffering)
	var v ColumnSummary
	for _, c := range d.Columns {
		if c.Name == "v" {
			v = c
		}
	}
	require.Equal(t, 2, v.Differing)
	require.True(t, v.HasDelta)
	require.InDelta(t, 3, v.MaxAbs, 1e-12)
	require.Equal(t, 2, v.MaxAbsAt.Want)
	require.InDelta(t, 3.0/33, v.MaxRel, 1e-12)
	require.Equal(t, 2, v.MaxRelAt.Want)
	require.Equal(t, "abs. diff ≤ 0.01", v.Rule)
	// The within-tolerance cell counts toward the maximum only if larger;
	// here the listed cells are rows 1 and 2.
	require.Equal(t, 2, d.Cells.Len())
	require.Equal(t, 1, d.Cells.At(0).Row.Want)
	require.Equal(t, "20", d.Cells.At(0).Want.Text)
	require.Equal(t, "20.5", d.Cells.At(0).Got.Text)
	require.InDelta(t, 0.5, d.Cells.At(0).Delta.Abs, 1e-12)
}

func TestMaxDeltaCountsCellsWithinTolerance(t *testing.T) {
	d := Compare(lit(t, `v:float64
		1
		2`), lit(t, `v:float64
		1.004
		2`), Tol("v", 0.01, 0))
	require.True(t, d.Equal())
	require.InDelta(t, 0.004, d.Columns[0].MaxAbs, 1e-12)
	require.Equal(t, 0, d.Columns[0].MaxAbsAt.Want)
}

func TestCountsExactListingCapped(t *testing.T) {
	b := fixtures.NewBuilder(fixtures.Schema{fixtures.Col("id", fixtures.Int64), fixtures.Col("v", fixtures.Int64)})
	g := fixtures.NewBuilder(fixtures.Schema{fixtures.Col("id", fixtures.Int64), fixtures.Col("v", fixtures.Int64)})
	for i := range 100 {
		b.Row(i, i)
		v := i
		if i%2 == 0 {
			v = -i - 1
		}
		g.Row(i, v)
	}
	want, got := b.MustBuild(t), g.MustBuild(t)
	d := Compare(want, got)
	require.Equal(t, 50, d.CellsDiffering)
	require.Equal(t, DefaultListLimit, d.Cells.Len())
	require.Equal(t, 0, d.Cells.At(0).Row.Want)
	require.Equal(t, 38, d.Cells.At(19).Row.Want)
	require.Equal(t, 5, Compare(want, got, ListLimit(5)).Cells.Len())
	require.Equal(t, 50, Compare(want, got, ListLimit(-1)).Cells.Len())
	short, _ := want.Slice(0, 10), 0
	d = Compare(want, short, ListLimit(3))
	require.Equal(t, 90, d.Missing.Count)
	require.Equal(t, 3, d.Missing.Rows.Len())
	require.Equal(t, 10, d.Missing.Rows.At(0).Want)
	require.Equal(t, []string{"10", "10"}, d.Missing.Rows.At(0).Cells)
}

func TestByKey(t *testing.T) {
	want := `house:string | day:date   | tmax:float64
		Étang        | 2026-04-01 | 21.5
		Étang        | 2026-04-02 | 19
		"Les Pins"   | 2026-04-01 | 18.25`
	cases := []struct {
		name   string
		got    string
		opts   []Option
		expect counts
		check  func(t *testing.T, d *Diff)
	}{
		{"any order", `house:string | day:date | tmax:float64
			"Les Pins" | 2026-04-01 | 18.25
			Étang | 2026-04-02 | 19
			Étang | 2026-04-01 | 21.5`, nil, counts{equal: true}, nil},
		{"differing cell by key", `house:string | day:date | tmax:float64
			Étang | 2026-04-02 | 19
			"Les Pins" | 2026-04-01 | 18.5
			Étang | 2026-04-01 | 21.5`, nil, counts{cells: 1}, func(t *testing.T, d *Diff) {
			require.Equal(t, []string{"Les Pins", "2026-04-01"}, d.Cells.At(0).Row.Key)
			require.Equal(t, 2, d.Cells.At(0).Row.Want)
			require.Equal(t, 1, d.Cells.At(0).Row.Got)
		}},
		{"missing and extra by key", `house:string | day:date | tmax:float64
			Étang | 2026-04-01 | 21.5
			Étang | 2026-04-03 | 19`, nil, counts{missing: 2, extra: 1}, func(t *testing.T, d *Diff) {
			require.Equal(t, []string{"Étang", "2026-04-02"}, d.Missing.Rows.At(0).Key)
			require.Equal(t, []string{"Étang", "2026-04-03"}, d.Extra.Rows.At(0).Key)
			require.Equal(t, 1, d.Extra.Rows.At(0).Got)
		}},
		{"repeated key in got", `house:string | day:date | tmax:float64
			Étang | 2026-04-01 | 21.5
			Étang | 2026-04-02 | 19
			"Les Pins" | 2026-04-01 | 18.25
			Étang | 2026-04-01 | 21.5`, nil, counts{extra: 1, dupGot: 1}, func(t *testing.T, d *Diff) {
			require.Len(t, d.Duplicates.Keys, 1)
			k := d.Duplicates.Keys[0]
			require.Equal(t, GotSide, k.Side)
			require.Equal(t, []string{"Étang", "2026-04-01"}, k.Key)
			require.Equal(t, []int{0, 3}, k.Rows)
			require.Equal(t, 2, k.Count)
			require.Equal(t, 3, d.Extra.Rows.At(0).Got)
		}},
		{"tolerance applies to non-key cells", `house:string | day:date | tmax:float64
			Étang | 2026-04-02 | 19.01
			"Les Pins" | 2026-04-01 | 18.25
			Étang | 2026-04-01 | 21.49`, []Option{Tol("tmax", 0.05, 0)}, counts{equal: true}, nil},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			opts := append([]Option{ByKey("house", "day")}, c.opts...)
			d := Compare(lit(t, want), lit(t, c.got), opts...)
			require.Equal(t, c.expect, countsOf(d), d.Text())
			if c.check != nil {
				c.check(t, d)
			}
		})
	}
}

func TestByKeyRepeatedOnBothSides(t *testing.T) {
	want := lit(t, `k:int64 | v:int64
		1 | 10
		1 | 11
		2 | 20
		2 | 21
		2 | 22`)
	got := lit(t, `k:int64 | v:int64
		2 | 20
		1 | 10
		1 | 12
		2 | 21
		3 | 30
		3 | 31`)
	d := Compare(want, got, ByKey("k"))
	// Rows with a repeated key pair in order of appearance: want (1,11)
	// with got (1,12); want (2,22) has no partner.
	require.Equal(t, counts{cells: 1, missing: 1, extra: 2, dupWant: 2, dupGot: 3}, countsOf(d), d.Text())
	require.Equal(t, "11", d.Cells.At(0).Want.Text)
	require.Equal(t, "12", d.Cells.At(0).Got.Text)
	require.Equal(t, 4, d.Missing.Rows.At(0).Want)
	var sides []string
	for _, k := range d.Duplicates.Keys {
		sides = append(sides, string(k.Side)+":"+strings.Join(k.Key, ","))
	}
	require.Equal(t, []string{"want:1", "want:2", "got:2", "got:1", "got:3"}, sides)
}

func TestKeyedMatchingAtScale(t *testing.T) {
	// Large enough for the partitioned, parallel join; rows reversed.
	const n = 50000
	wb := fixtures.NewBuilder(fixtures.Schema{fixtures.Col("id", fixtures.String), fixtures.Col("n", fixtures.Int64), fixtures.Col("v", fixtures.Float64)})
	gb := fixtures.NewBuilder(fixtures.Schema{fixtures.Col("id", fixtures.String), fixtures.Col("n", fixtures.Int64), fixtures.Col("v", fixtures.Float64)})
	for i := range n {
		wb.Row("h"+strings.Repeat("x", i%5)+itoa(i), i%7, float64(i)/3)
	}
	for i := n - 1; i >= 0; i-- {
		v := float64(i) / 3
		if i%1000 == 0 {
			v++
		}
		if i == 777 {
			continue
		}
		gb.Row("h"+strings.Repeat("x", i%5)+itoa(i), i%7, v)
	}
	gb.Row("extra", 0, 0.0)
	d := Compare(wb.MustBuild(t), gb.MustBuild(t), ByKey("id", "n"))
	require.Equal(t, counts{cells: 50, missing: 1, extra: 1}, countsOf(d))
	require.Equal(t, 777, d.Missing.Rows.At(0).Want)
	require.Equal(t, 0, d.Cells.At(0).Row.Want)
	require.Equal(t, n-2, d.Cells.At(0).Row.Got) // got is reversed and lacks one row
	require.Equal(t, 1000, d.Cells.At(1).Row.Want)
}

func itoa(i int) string { return fixtures.FormatFloat(float64(i)) }

func TestBadInputBecomesProblems(t *testing.T) {
	tb := lit(t, `k:int64 | x:float64 | s:string
		1 | 1.5 | a`)
	other := lit(t, `j:int64 | x:float64 | s:string
		1 | 1.5 | a`)
	cases := []struct {
		name      string
		want, got *fixtures.Table
		opts      []Option
		contains  []string
	}{
		{"nil want", nil, tb, nil, []string{"want is a nil table"}},
		{"nil got", tb, nil, nil, []string{"got is a nil table"}},
		{"both nil", nil, nil, nil, []string{"want is a nil table", "got is a nil table"}},
		{"float key refused", tb, tb, []Option{ByKey("x")}, []string{`key column "x" is float64, which cannot be a key`}},
		{"key missing from got", tb, other, []Option{ByKey("k")}, []string{`key column "k" is missing from got`}},
		{"key missing from want", tb, other, []Option{ByKey("j")}, []string{`key column "j" is missing from want`}},
		{"unknown column in Tol", tb, tb, []Option{Tol("nope", 1, 0)}, []string{`Tol names column "nope", which neither table has`}},
		{"unknown key", tb, tb, []Option{ByKey("nope")}, []string{`ByKey names column "nope"`}},
		{"unknown ignored column", tb, tb, []Option{IgnoreColumns("nope")}, []string{`IgnoreColumns names column "nope"`}},
		{"negative tolerance", tb, tb, []Option{Tol("x", -1, 0)}, []string{"abs and rel must be finite and ≥ 0"}},
		{"NaN tolerance", tb, tb, []Option{Tol("x", 0, nan())}, []string{"abs and rel must be finite and ≥ 0"}},
		{"Tol on a string column", tb, tb, []Option{Tol("s", 1, 0)}, []string{`Tol names column "s", which is string`}},
		{"Tol on an int column", tb, tb, []Option{Tol("k", 1, 0)}, []string{`which is int64; tolerances apply to float64 columns`}},
		{"TimeTol on a float column", tb, tb, []Option{TimeTol("x", time.Second)}, []string{`TimeTol names column "x", which is float64`}},
		{"NormText on an int column", tb, tb, []Option{NormText("k", NFC)}, []string{`NormText names column "k", which is int64`}},
		{"ByKey with no columns", tb, tb, []Option{ByKey()}, []string{"ByKey: no key columns given"}},
		{"key also ignored", tb, tb, []Option{ByKey("k"), IgnoreColumns("k")}, []string{"a key cannot be ignored"}},
		{"key of different kinds", tb, lit(t, `k:string | x:float64 | s:string
			1 | 1.5 | a`), []Option{ByKey("k")}, []string{`key column "k" is int64 in want but string in got`}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			require.NotPanics(t, func() {
				d := Compare(c.want, c.got, c.opts...)
				require.False(t, d.Equal())
				all := strings.Join(d.Problems, "\n")
				for _, s := range c.contains {
					require.Contains(t, all, s)
				}
				text := d.Text()
				for _, s := range c.contains {
					require.Contains(t, text, s)
				}
				_, err := d.JSON()
				require.NoError(t, err)
				_ = d.Markdown()
			})
		})
	}
}

func nan() float64 { var z float64; return z / z }

func TestDecimalTolRefused(t *testing.T) {
	tb := lit(t, `m:decimal(8,2)
		1.00`)
	d := Compare(tb, tb, Tol("m", 0.01, 0))
	require.Contains(t, strings.Join(d.Problems, "\n"), "decimals always compare exactly")
}

func TestSchemaChanges(t *testing.T) {
	cases := []struct {
		name      string
		want, got string
		opts      []Option
		changes   []SchemaChange
		cells     int
	}{
		{"missing and extra columns", `a:int64 | b:string
			1 | x`, `a:int64 | c:bool
			1 | true`, nil, []SchemaChange{
			{Column: "b", Change: ColumnMissing, Want: "string"},
			{Column: "c", Change: ColumnExtra, Got: "bool"},
		}, 0},
		{"type change, cells still compared by value", `a:int64
			3
			4`, `a:float64
			3
			4.5`, nil, []SchemaChange{{Column: "a", Change: TypeChanged, Want: "int64", Got: "float64"}}, 1},
		{"LooseTypes: int and float by value", `a:int64
			3`, `a:float64
			3.0`, []Option{LooseTypes()}, nil, 0},
		{"LooseTypes with tolerance", `a:int64
			3`, `a:float64
			3.001`, []Option{LooseTypes(), Tol("a", 0.01, 0)}, nil, 0},
		{"LooseTypes: category and string by text", `s:category
			ok
			fault`, `s:string
			ok
			fault`, []Option{LooseTypes()}, nil, 0},
		{"LooseTypes: date and timestamp at midnight", `d:date
			2026-04-01`, `d:timestamp(s)
			2026-04-01T00:00:00`, []Option{LooseTypes()}, nil, 0},
		{"LooseTypes: date and timestamp not at midnight", `d:date
			2026-04-01`, `d:timestamp(s)
			2026-04-01T00:00:01`, []Option{LooseTypes()}, nil, 1},
		{"LooseTypes: zoned midnight", `d:date
			2026-04-01`, `d:timestamp(s,Europe/Lisbon)
			2026-04-01T00:00:00+01:00`, []Option{LooseTypes()}, nil, 0},
		{"LooseTypes does not excuse int vs string", `a:int64
			1`, `a:string
			"1"`, []Option{LooseTypes()}, []SchemaChange{{Column: "a", Change: TypeChanged, Want: "int64", Got: "string"}}, 0},
		{"timestamp units differ: same instants", `t:timestamp(s)
			2026-04-01T06:00:00`, `t:timestamp(ms)
			2026-04-01T06:00:00.000`, nil, []SchemaChange{{Column: "t", Change: TypeChanged, Want: "timestamp(s)", Got: "timestamp(ms)"}}, 0},
		{"category levels added and removed", `s:category[ok,fault]
			ok`, `s:category[ok,calibrating]
			ok`, nil, []SchemaChange{
			{Column: "s", Change: LevelsRemoved, Want: "fault"},
			{Column: "s", Change: LevelsAdded, Got: "calibrating"},
		}, 0},
		{"category level order does not matter", `s:category[ok,fault]
			ok
			fault`, `s:category[fault,ok]
			ok
			fault`, nil, nil, 0},
		{"column order", `a:int64 | b:int64
			1 | 2`, `b:int64 | a:int64
			2 | 1`, nil, []SchemaChange{
			{Column: "a", Change: ColumnMoved, Want: "1", Got: "2"},
			{Column: "b", Change: ColumnMoved, Want: "2", Got: "1"},
		}, 0},
		{"AnyColumnOrder", `a:int64 | b:int64
			1 | 2`, `b:int64 | a:int64
			2 | 1`, []Option{AnyColumnOrder()}, nil, 0},
		{"IgnoreColumns hides a column entirely", `a:int64 | run:string
			1 | x`, `a:int64 | run:int64
			1 | 7`, []Option{IgnoreColumns("run")}, nil, 0},
		{"IgnoreColumns on a column only got has", `a:int64
			1`, `a:int64 | run:int64
			1 | 7`, []Option{IgnoreColumns("run")}, nil, 0},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			d := Compare(lit(t, c.want), lit(t, c.got), c.opts...)
			require.Empty(t, d.Problems)
			require.Equal(t, c.changes, d.Schema, d.Text())
			require.Equal(t, c.cells, d.CellsDiffering, d.Text())
			require.Equal(t, len(c.changes) == 0 && c.cells == 0, d.Equal())
		})
	}
}

func TestTextNormalisation(t *testing.T) {
	cases := []struct {
		name string
		w, g string
		how  TextNorm
		eq   bool
	}{
		// Source: Unicode Standard Annex #15 (Normalization Forms): e +
		// U+0301 COMBINING ACUTE ACCENT composes to U+00E9 under NFC.
		{"NFC composes", `"\u00e9tang"`, `"e\u0301tang"`, NFC, true},
		{"without NFC they differ", `"\u00e9tang"`, `"e\u0301tang"`, 0, false},
		// Source: Unicode Standard, PropList.txt: U+00A0 has the
		// White_Space property.
		{"trim drops blanks and NBSP", `Mas`, `"\u00a0 Mas\t"`, TrimSpace, true},
		{"trim keeps inner blanks", `"Les Pins"`, `"Les  Pins"`, TrimSpace, false},
		// Source: Unicode CaseFolding.txt: U+00DF ß full-folds to "ss".
		{"fold: Straße and STRASSE", `Straße`, `STRASSE`, FoldCase, true},
		{"fold and NFC", `"\u00c9TANG"`, `"e\u0301tang"`, NFC | FoldCase, true},
		{"all three", `" Étang "`, `"E\u0301TANG"`, NFC | TrimSpace | FoldCase, true},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			for _, kind := range []string{"string", "category"} {
				want := lit(t, "s:"+kind+"\n"+c.w)
				got := lit(t, "s:"+kind+"\n"+c.g)
				d := Compare(want, got, NormText("s", c.how), LooseTypes())
				require.Equal(t, c.eq, d.Equal(), "%s\n%s", kind, d.Text())
			}
		})
	}
}

func TestNormalisedTextKeys(t *testing.T) {
	want := lit(t, `house:string | n:int64
		Étang | 1
		Mas | 2`)
	got := lit(t, `house:string | n:int64
		" mas" | 2
		"E\u0301TANG" | 1`)
	require.False(t, Compare(want, got, ByKey("house")).Equal())
	d := Compare(want, got, ByKey("house"), NormText("*", NFC|TrimSpace|FoldCase))
	require.True(t, d.Equal(), d.Text())
}

func TestTimeTol(t *testing.T) {
	want := lit(t, `at:timestamp(ms) | d:date
		2026-04-01T06:00:00.000 | 2026-04-01`)
	got := lit(t, `at:timestamp(ms) | d:date
		2026-04-01T06:00:00.900 | 2026-04-02`)
	require.Equal(t, 2, Compare(want, got).CellsDiffering)
	require.Equal(t, 1, Compare(want, got, TimeTol("at", time.Second)).CellsDiffering)
	require.Equal(t, 2, Compare(want, got, TimeTol("at", 500*time.Millisecond)).CellsDiffering)
	d := Compare(want, got, TimeTol("*", 24*time.Hour))
	require.True(t, d.Equal(), d.Text())
	require.InDelta(t, 0.9, d.Columns[0].MaxAbs, 1e-9)
	require.InDelta(t, 86400, d.Columns[1].MaxAbs, 1e-9)
}

func TestAnyRowOrder(t *testing.T) {
	// Cells of paired rows never differ in this mode: counts.cells is 0.
	runCounts(t, []countCase{
		{"same rows shuffled", `a:int64 | s:string
			1 | x
			2 | y
			2 | y`, `a:int64 | s:string
			2 | y
			1 | x
			2 | y`, nil, counts{equal: true}},
		{"multiplicity matters", `a:int64 | s:string
			1 | x
			2 | y
			2 | y`, `a:int64 | s:string
			1 | x
			1 | x
			2 | y`, nil, counts{missing: 1, extra: 1}},
		{"a changed row is one missing and one extra", `a:int64
			1
			2`, `a:int64
			2
			3`, nil, counts{missing: 1, extra: 1}},
		{"near rows pair under tolerance", `k:string | v:float64
			a | 1.0
			a | 2.0`, `k:string | v:float64
			a | 2.01
			a | 0.99`, []Option{Tol("v", 0.05, 0)}, counts{equal: true}},
		// A pairing that takes the exactly equal pair first would leave
		// 0.9 and 1.1 unpaired; the maximum matching pairs all.
		{"maximum matching beats exact-first", `v:float64
			1.0
			0.9`, `v:float64
			1.0
			1.1`, []Option{Tol("v", 0.1000001, 0)}, counts{equal: true}},
		{"non-tolerant cells must match exactly", `k:string | v:float64
			a | 1.0`, `k:string | v:float64
			b | 1.0`, []Option{Tol("v", 0.05, 0)}, counts{missing: 1, extra: 1}},
		{"NaN and -0 rows match", `v:float64
			NaN
			-0`, `v:float64
			0
			NaN`, nil, counts{equal: true}},
		{"int with float by value", `v:int64
			3
			4`, `v:float64
			4
			3`, []Option{LooseTypes()}, counts{equal: true}},
	}, AnyRowOrder())
}

func TestAnyRowOrderLargeGroups(t *testing.T) {
	// One group of 500 rows (every column is tolerant): sorted first-fit.
	const n = 500
	wb := fixtures.NewBuilder(fixtures.Schema{fixtures.Col("v", fixtures.Float64)})
	gb := fixtures.NewBuilder(fixtures.Schema{fixtures.Col("v", fixtures.Float64)})
	for i := range n {
		wb.Row(float64(i) * 1.5)
	}
	for i := n - 1; i >= 0; i-- {
		gb.Row(float64(i)*1.5 + 0.001*float64(i%3-1))
	}
	gb.Row(9999.0)
	d := Compare(wb.MustBuild(t), gb.MustBuild(t), AnyRowOrder(), Tol("v", 0.01, 0))
	require.Equal(t, counts{extra: 1}, countsOf(d), d.Text())
	require.Equal(t, n, d.Extra.Rows.At(0).Got)
}

func TestParallelMatchesSequential(t *testing.T) {
	// More slots than one parallel task holds, so results merge across
	// tasks; the differences sit on both sides of the task boundary.
	n := taskSlots + 5000
	wv := make([]float64, n)
	for i := range wv {
		wv[i] = float64(i % 1000)
	}
	gv := append([]float64(nil), wv...)
	for i, add := range map[int]float64{3: 0.25, taskSlots - 1: 2, taskSlots: 0.5, taskSlots + 17: 0.75, n - 1: 1} {
		gv[i] += add
	}
	schema := fixtures.Schema{fixtures.Col("v", fixtures.Float64), fixtures.Col("w", fixtures.Float64)}
	wb, gb := fixtures.NewBuilder(schema), fixtures.NewBuilder(schema)
	for i := range wv {
		wb.Row(wv[i], wv[i])
		gb.Row(gv[i], wv[i])
	}
	d := Compare(wb.MustBuild(t), gb.MustBuild(t))
	require.Equal(t, 5, d.CellsDiffering)
	require.Equal(t, 5, d.RowsDiffering)
	var rows []int
	for _, c := range d.Cells.All() {
		rows = append(rows, c.Row.Want)
	}
	require.Equal(t, []int{3, taskSlots - 1, taskSlots, taskSlots + 17, n - 1}, rows)
	require.Equal(t, 2.0, d.Columns[0].MaxAbs)
	require.Equal(t, taskSlots-1, d.Columns[0].MaxAbsAt.Want)
}

func TestKeyColumns(t *testing.T) {
	require.Nil(t, KeyColumns())
	require.Nil(t, KeyColumns(Tol("*", 1, 0), AnyRowOrder()))
	require.Equal(t, []string{"house", "day"}, KeyColumns(ByKey("house", "day"), Tol("*", 1, 0)))
	require.Equal(t, []string{"b"}, KeyColumns(ByKey("a"), ByKey("b")))
	require.Nil(t, KeyColumns(ByKey("a"), AnyRowOrder()))
}

func TestCompareIsDeterministic(t *testing.T) {
	want := lit(t, `k:int64 | v:float64 | s:string
		1 | 1 | a
		1 | 2 | b
		2 | 3 | c
		3 | 4 | d`)
	got := lit(t, `k:int64 | v:float64 | s:string
		3 | 4.5 | d
		1 | 1 | a
		4 | 0 | z
		4 | 0 | z
		1 | 2 | "b "`)
	first, err := Compare(want, got, ByKey("k"), Tol("*", 0.1, 0), TimeTol("*", 0), NormText("*", 0)).JSON()
	require.NoError(t, err)
	for range 20 {
		again, err := Compare(want, got, ByKey("k"), Tol("*", 0.1, 0), TimeTol("*", 0), NormText("*", 0)).JSON()
		require.NoError(t, err)
		require.Equal(t, string(first), string(again))
	}
}

func TestNullsInEveryKind(t *testing.T) {
	want := lit(t, `b:bool | i:int64 | f:float64 | s:string | c:category | d:date | t:timestamp(s) | m:decimal(5,2)
		~ | ~ | ~ | ~ | ~ | ~ | ~ | ~
		true | 1 | 1.5 | x | ok | 2026-04-01 | 2026-04-01T06:00:00 | 1.25`)
	same := lit(t, `b:bool | i:int64 | f:float64 | s:string | c:category | d:date | t:timestamp(s) | m:decimal(5,2)
		~ | ~ | ~ | ~ | ~ | ~ | ~ | ~
		true | 1 | 1.5 | x | ok | 2026-04-01 | 2026-04-01T06:00:00 | 1.25`)
	swapped := lit(t, `b:bool | i:int64 | f:float64 | s:string | c:category | d:date | t:timestamp(s) | m:decimal(5,2)
		true | 1 | 1.5 | x | ok | 2026-04-01 | 2026-04-01T06:00:00 | 1.25
		~ | ~ | ~ | ~ | ~ | ~ | ~ | ~`)
	require.True(t, Compare(want, same).Equal())
	d := Compare(want, swapped)
	require.Equal(t, 16, d.CellsDiffering)
	for _, c := range d.Cells.All() {
		require.False(t, c.Delta.Has, c.Column)
		require.NotEqual(t, c.Want.Null, c.Got.Null)
	}
}

func TestKeyedLargeAgreesWithSortedPositional(t *testing.T) {
	// Large enough for the reordered (scatter) kernels of every kind; the
	// keyed result must equal the positional result against got sorted
	// back into want's order.
	const n = 70000
	schema := fixtures.Schema{
		fixtures.Col("id", fixtures.Int64), fixtures.Col("s", fixtures.String), fixtures.Col("c", fixtures.Category),
		fixtures.Col("i", fixtures.Int64), fixtures.Col("d", fixtures.Date), fixtures.Col("f", fixtures.Float64),
	}
	day := time.Date(2026, 4, 1, 0, 0, 0, 0, time.UTC)
	levels := []string{"ok", "fault", "calibrating"}
	wb, gb := fixtures.NewBuilder(schema), fixtures.NewBuilder(schema)
	for i := range n {
		wb.Row(i*3, "h"+itoa(i%997), levels[i%3], i%50, day.AddDate(0, 0, i%40), float64(i)/7)
	}
	for r := range n {
		i := (r*7919 + 13) % n // a permutation of 0..n-1 (7919 is prime, n is not a multiple)
		s, c, iv, f := "h"+itoa(i%997), levels[i%3], i%50, float64(i)/7
		switch i % 101 {
		case 1:
			s += "!"
		case 2:
			c = levels[(i+1)%3]
		case 3:
			iv++
		case 4:
			f += 0.5
		}
		d := day.AddDate(0, 0, i%40)
		if i%103 == 5 {
			d = d.AddDate(0, 0, 1)
		}
		gb.Row(i*3, s, c, iv, d, f)
	}
	want, got := wb.MustBuild(t), gb.MustBuild(t)
	sorted, err := got.SortBy("id")
	require.NoError(t, err)
	keyed := Compare(want, got, ByKey("id"), Tol("f", 0.1, 0))
	positional := Compare(want, sorted, Tol("f", 0.1, 0))
	require.Equal(t, positional.CellsDiffering, keyed.CellsDiffering)
	require.Equal(t, positional.RowsDiffering, keyed.RowsDiffering)
	require.Positive(t, keyed.CellsDiffering)
	for j := range keyed.Columns {
		k, p := keyed.Columns[j], positional.Columns[j]
		require.Equal(t, p.Differing, k.Differing, k.Name)
		require.Equal(t, p.MaxAbs, k.MaxAbs, k.Name)
		require.Equal(t, p.MaxAbsAt.Want, k.MaxAbsAt.Want, k.Name)
	}
	for j := range keyed.Cells.All() {
		require.Equal(t, positional.Cells.At(j).Row.Want, keyed.Cells.At(j).Row.Want)
		require.Equal(t, positional.Cells.At(j).Column, keyed.Cells.At(j).Column)
		require.Equal(t, positional.Cells.At(j).Got.Text, keyed.Cells.At(j).Got.Text)
	}
	// Rows missing from got leave holes in the reordered buffers; they must
	// not show up as differing cells.
	part, err := got.Slice(0, n/2).SortBy("id")
	require.NoError(t, err)
	d := Compare(want, part, ByKey("id"), Tol("f", 0.1, 0))
	require.Equal(t, n-n/2, d.Missing.Count)
	rest := Compare(want, got.Slice(0, n/2), ByKey("id"), Tol("f", 0.1, 0))
	require.Equal(t, d.CellsDiffering, rest.CellsDiffering)
	require.Less(t, d.CellsDiffering, keyed.CellsDiffering)
}

func TestNullKeysMatchEachOther(t *testing.T) {
	want := lit(t, `house:string | n:int64
		~ | 1
		Mas | 2`)
	got := lit(t, `house:string | n:int64
		Mas | 2
		~ | 1`)
	d := Compare(want, got, ByKey("house"))
	require.True(t, d.Equal(), d.Text())
	twice := lit(t, `house:string | n:int64
		~ | 1
		~ | 2`)
	d = Compare(twice, twice, ByKey("house"))
	require.Equal(t, 1, d.Duplicates.WantKeys)
	require.Equal(t, []string{"~"}, d.Duplicates.Keys[0].Key)
}

func TestULPDeltaIsReported(t *testing.T) {
	want := lit(t, `v:float64
		1`)
	got := lit(t, `v:float64
		1.0000000000000007`) // 3 ULPs above 1 (ULP of 1 is 2^-52 ≈ 2.22e-16)
	d := Compare(want, got, ULPs("v", 2))
	require.Equal(t, 1, d.CellsDiffering)
	require.True(t, d.Cells.At(0).Delta.HasULPs)
	require.Equal(t, uint64(3), d.Cells.At(0).Delta.ULPs)
	require.Equal(t, "at most 2 ULPs apart", d.Columns[0].Rule)
	require.Contains(t, d.Text(), "(3 ulp)")
	require.True(t, Compare(want, got, ULPs("v", 3)).Equal())
}
