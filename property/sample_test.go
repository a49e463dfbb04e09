package property

import (
	"slices"
	"testing"
	"time"

	"github.com/stretchr/testify/require"

	"github.com/proofsheet/proofsheet/assert"
	"github.com/proofsheet/proofsheet/fixtures"
)

func TestGenerateIsDeterministic(t *testing.T) {
	opts := Options{Mess: Heavy, Shuffle: true, ExtraColumns: 2, MissingColumns: 2, HeaderMess: true, ShuffleColumns: true}
	a, err := Generate(greenhouse, 200, 42, opts)
	require.NoError(t, err)
	b, err := Generate(greenhouse, 200, 42, opts)
	require.NoError(t, err)
	c, err := Generate(greenhouse, 200, 43, opts)
	require.NoError(t, err)
	require.Equal(t, a.Raw().Literal(), b.Raw().Literal())
	require.Equal(t, a.Clean().Literal(), b.Clean().Literal())
	require.NotEqual(t, a.Raw().Literal(), c.Raw().Literal())
	ca, err := a.CSV(CSVStyle{Quoting: QuoteMixed, LineEnding: MixedEndings})
	require.NoError(t, err)
	cb, err := b.CSV(CSVStyle{Quoting: QuoteMixed, LineEnding: MixedEndings})
	require.NoError(t, err)
	require.Equal(t, ca, cb)
}

func TestNoneLevelIsPlain(t *testing.T) {
	s, err := Generate(greenhouse, 300, 1, Options{Mess: None})
	require.NoError(t, err)
	require.Equal(t, 0, s.Duplicates())
	require.Equal(t, greenhouse.Names(), s.Names())
	requireSame(t, s.Plain(), s.Raw())
	require.Empty(t, s.MessCounts())
	require.Positive(t, s.Clean().Column("temp_c").NullCount(), "nulls are data, not mess")
}

func TestPlainSpellingsLoadAsTheCleanTable(t *testing.T) {
	// Written as CSV and read by the fixtures loader with the schema, the
	// plain spellings give back the clean table.
	s, err := Generate(greenhouse, 300, 2, Options{Mess: None})
	require.NoError(t, err)
	data, err := s.CSV(CSVStyle{})
	require.NoError(t, err)
	got, _, err := fixtures.ReadBytes("plain.csv", data, fixtures.WithSchema(greenhouse))
	require.NoError(t, err)
	requireSame(t, s.Clean(), got)
}

func TestCleanIsTheMeaningOfEveryRawRow(t *testing.T) {
	s, err := Generate(greenhouse, 500, 3, Options{Mess: Heavy, DuplicateRate: 0.3, Shuffle: true})
	require.NoError(t, err)
	require.Greater(t, s.Duplicates(), 50)
	clean := s.Clean()
	require.Equal(t, s.NumRows()-s.Duplicates(), clean.NumRows())
	plain := s.Plain()
	for i := 0; i < s.NumRows(); i++ {
		rec := s.Record(i)
		for j, name := range plain.Names() {
			if s.Field(j) < 0 { // an extra column: text the clean table lacks
				require.NoError(t, checkCell(fixtures.Col(name, fixtures.String), s.Cell(i, j)))
				continue
			}
			c := clean.Column(name)
			want := ""
			if !c.IsNull(rec) {
				want = c.Format(rec)
			}
			pc := plain.ColumnAt(j)
			got := ""
			if !pc.IsNull(i) {
				got = pc.Str(i)
			}
			require.Equal(t, want, got, "row %d column %s", i, name)
			require.NoError(t, checkCell(greenhouse[s.Field(j)], s.Cell(i, j)))
		}
	}
	// Duplicates were sometimes spelled anew at the heavy level.
	respelled := 0
	first := map[int]int{}
	for i := 0; i < s.NumRows(); i++ {
		r := s.Record(i)
		if k, seen := first[r]; seen {
			for j := 0; j < s.NumCols(); j++ {
				if s.Cell(i, j).Raw != s.Cell(k, j).Raw {
					respelled++
					break
				}
			}
		} else {
			first[r] = i
		}
	}
	require.Positive(t, respelled)
}

func TestShuffleKeepsTheRecords(t *testing.T) {
	a, err := Generate(greenhouse, 100, 5, Options{Mess: Heavy})
	require.NoError(t, err)
	b, err := Generate(greenhouse, 100, 5, Options{Mess: Heavy, Shuffle: true})
	require.NoError(t, err)
	requireSame(t, a.Clean(), b.Clean())
	require.NotEqual(t, a.Raw().Literal(), b.Raw().Literal())
	requireSame(t, a.Raw(), b.Raw(), assert.AnyRowOrder())
	sh := a.Shuffled(9)
	requireSame(t, a.Raw(), sh.Raw(), assert.AnyRowOrder())
	requireSame(t, a.Clean(), sh.Clean())
}

func TestColumnsMissingExtraAndHeaders(t *testing.T) {
	extra, missing, variant := 0, 0, 0
	for seed := int64(0); seed < 40; seed++ {
		s, err := Generate(greenhouse, 5, seed, Options{Mess: Heavy, ExtraColumns: 2, MissingColumns: 3, HeaderMess: true, ShuffleColumns: true})
		require.NoError(t, err)
		require.GreaterOrEqual(t, s.NumCols(), 1)
		seen := map[int]bool{}
		for j := 0; j < s.NumCols(); j++ {
			f := s.Field(j)
			if f < 0 {
				extra++
				require.Contains(t, extraNames, s.Plain().Names()[j])
				continue
			}
			seen[f] = true
			if s.Names()[j] != greenhouse[f].Name {
				variant++
			}
			require.Equal(t, greenhouse[f].Name, s.Plain().Names()[j])
		}
		missing += len(greenhouse) - len(seen)
		require.Equal(t, greenhouse.Names(), s.Clean().Names(), "Clean keeps every schema column")
		require.Len(t, slices.Compact(slices.Sorted(slices.Values(s.Names()))), s.NumCols(), "names stay unique")
	}
	require.Positive(t, extra)
	require.Positive(t, missing)
	require.Positive(t, variant)
	// Light: no extra columns, no header mess by default.
	s, err := Generate(greenhouse, 50, 1, Options{})
	require.NoError(t, err)
	require.Equal(t, greenhouse.Names(), s.Names())
}

func TestMessLevelsAndKnobs(t *testing.T) {
	heavy, err := Generate(greenhouse, 3000, 8, Options{Mess: Heavy, MixedSources: true})
	require.NoError(t, err)
	counts := heavy.MessCounts()
	for _, m := range append(cellMesses(), MessMixedSources) {
		if m == MessUTCOffset || m == MessLong {
			continue // zoned non-UTC columns only; rare
		}
		require.Positive(t, counts[m], "heavy mess %q never made", m)
	}
	light, err := Generate(greenhouse, 3000, 8, Options{})
	require.NoError(t, err)
	for m := range light.MessCounts() {
		require.Contains(t, lightMesses, m)
	}
	only, err := Generate(greenhouse, 1000, 8, Options{Mess: Heavy, Locale: "en-GB", Spellings: []Mess{MessDayFirst}})
	require.NoError(t, err)
	require.Equal(t, []Mess{MessDayFirst}, keys(only.MessCounts()))
	avoid, err := Generate(greenhouse, 2000, 8, Options{Mess: Heavy, Avoid: []Mess{MessInvalidUTF8, MessNullToken}})
	require.NoError(t, err)
	require.Zero(t, avoid.MessCounts()[MessInvalidUTF8])
	require.Zero(t, avoid.MessCounts()[MessNullToken])
	none, err := Generate(greenhouse, 500, 8, Options{Mess: Heavy, NullRate: -1, SentinelRate: -1, DuplicateRate: -1})
	require.NoError(t, err)
	require.Zero(t, none.Duplicates())
	for _, c := range none.Clean().Columns() {
		require.Zero(t, c.NullCount(), c.Name())
	}
	lv, err := Generate(greenhouse, 300, 8, Options{Levels: map[string][]string{"house": {"North", "South"}}})
	require.NoError(t, err)
	require.ElementsMatch(t, []string{"North", "South"}, lv.Clean().Column("house").Levels())
	from, to := time.Date(2026, 4, 1, 0, 0, 0, 0, time.UTC), time.Date(2026, 4, 30, 0, 0, 0, 0, time.UTC)
	dr, err := Generate(greenhouse, 300, 8, Options{DateFrom: from, DateTo: to})
	require.NoError(t, err)
	days := dr.Clean().Column("day")
	for i := 0; i < days.Len(); i++ {
		if !days.IsNull(i) {
			require.False(t, days.Date(i).Before(from) || days.Date(i).After(to))
		}
	}
}

func keys(m map[Mess]int) []Mess {
	out := make([]Mess, 0, len(m))
	for k := range m {
		out = append(out, k)
	}
	slices.Sort(out)
	return out
}

func TestOptionsValidate(t *testing.T) {
	for name, tc := range map[string]struct {
		schema fixtures.Schema
		opts   Options
		want   string
	}{
		"level":    {greenhouse, Options{Mess: "wild"}, `unknown mess level "wild"`},
		"mess":     {greenhouse, Options{Spellings: []Mess{"sparkles"}}, `unknown mess "sparkles"`},
		"avoid":    {greenhouse, Options{Avoid: []Mess{"sparkles"}}, `unknown mess "sparkles"`},
		"rows":     {greenhouse, Options{MinRows: 10, MaxRows: 5}, "MaxRows 5 is below MinRows 10"},
		"dates":    {greenhouse, Options{DateFrom: time.Date(2026, 1, 2, 0, 0, 0, 0, time.UTC), DateTo: time.Date(2026, 1, 1, 0, 0, 0, 0, time.UTC)}, "DateTo"},
		"levels":   {greenhouse, Options{Levels: map[string][]string{"nope": {"a"}}}, `unknown column "nope"`},
		"notcat":   {greenhouse, Options{Levels: map[string][]string{"note": {"a"}}}, "not category"},
		"empty":    {greenhouse, Options{Levels: map[string][]string{"house": {}}}, "no levels"},
		"schema":   {fixtures.Schema{fixtures.Col("a", fixtures.Int64), fixtures.Col("a", fixtures.Int64)}, Options{}, "used twice"},
		"nanos":    {fixtures.Schema{fixtures.Col("at", fixtures.TimestampOf(fixtures.Nanos, ""))}, Options{DateTo: time.Date(2300, 1, 1, 0, 0, 0, 0, time.UTC)}, "1678 to 2261"},
		"tooearly": {greenhouse, Options{DateFrom: time.Date(0, 1, 1, 0, 0, 0, 0, time.UTC)}, "years 1 to 9999"},
	} {
		t.Run(name, func(t *testing.T) {
			err := tc.opts.Validate(tc.schema)
			require.ErrorContains(t, err, tc.want)
			_, err = Generate(tc.schema, 1, 1, tc.opts)
			require.Error(t, err)
			_, ok := Tables(tc.schema, tc.opts)(params(1)).Retrieve()
			require.False(t, ok)
		})
	}
	require.NoError(t, Options{}.Validate(greenhouse))
	_, err := Generate(greenhouse, -1, 1, Options{})
	require.Error(t, err)
}

func TestTablesGrowWithSize(t *testing.T) {
	g := Tables(greenhouse, Options{MinRows: 2, MaxRows: 30})
	p := params(1)
	for size := 0; size <= 60; size += 5 {
		v, ok := g(p.WithSize(size)).Retrieve()
		require.True(t, ok)
		n := v.(*Sample).NumRows()
		require.GreaterOrEqual(t, n, 2)
		require.LessOrEqual(t, n, min(30, max(2, size)))
	}
}

func TestSampleString(t *testing.T) {
	small := sampleOf([]string{"house", "temp_c"}, []Messy{text("Étang"), {Raw: "1,5", Clean: "1.5", Mess: MessDecimalComma}})
	require.Equal(t, "\n\thouse:string | temp_c:string\n\tÉtang        | 1,5\n", small.String())
	big, err := Generate(greenhouse, 50, 4, Options{})
	require.NoError(t, err)
	require.Equal(t, "sample of 50 rows × 8 columns (seed 4)", big.String())
}
