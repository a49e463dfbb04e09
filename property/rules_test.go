package property

import (
	"math/big"
	"strings"
	"testing"
	"time"
	"unicode/utf8"

	"github.com/stretchr/testify/require"

	"github.com/proofsheet/proofsheet/fixtures"
)

// generateMany makes n samples of rows rows each and hands every one to
// check.
func generateMany(t *testing.T, schema fixtures.Schema, opts Options, n, rows int, check func(s *Sample)) {
	t.Helper()
	for seed := int64(1); seed <= int64(n); seed++ {
		s, err := Generate(schema, rows, seed, opts)
		require.NoError(t, err)
		check(s)
	}
}

func ratCell(t *testing.T, c *fixtures.Column, i int) *big.Rat {
	t.Helper()
	switch c.Kind() {
	case fixtures.KindInt64:
		return new(big.Rat).SetInt64(c.Int64(i))
	case fixtures.KindFloat64:
		r, ok := new(big.Rat).SetString(fixtures.FormatFloat(c.Float64(i)))
		require.True(t, ok)
		return r
	case fixtures.KindDecimal:
		return c.Decimal(i).Rat()
	}
	t.Fatalf("column %s is %s", c.Name(), c.Type())
	return nil
}

func TestRulesBoundNumbers(t *testing.T) {
	schema := fixtures.Schema{
		fixtures.Col("minutes", fixtures.Int64),
		fixtures.Col("price", fixtures.DecimalOf(10, 2)),
		fixtures.Col("share", fixtures.Float64),
		fixtures.Col("whole", fixtures.Float64),
		fixtures.Col("temp", fixtures.Float64),
	}
	opts := Options{Mess: Heavy, Columns: map[string]Rules{
		"minutes": {NonNegative: true, Max: "720"},
		"price":   {Min: "0.50", Max: "2500"},
		"share":   {Min: "0", Max: "1", Decimals: 3},
		"whole":   {Integer: true, Min: "-40", Max: "40"},
		"temp":    {Min: "-5.5", Max: "-0.25"},
	}}
	lo := map[string]*big.Rat{"minutes": big.NewRat(0, 1), "price": big.NewRat(1, 2), "share": big.NewRat(0, 1), "whole": big.NewRat(-40, 1), "temp": big.NewRat(-11, 2)}
	hi := map[string]*big.Rat{"minutes": big.NewRat(720, 1), "price": big.NewRat(2500, 1), "share": big.NewRat(1, 1), "whole": big.NewRat(40, 1), "temp": big.NewRat(-1, 4)}
	seenSmall, seenLarge := map[string]bool{}, map[string]bool{}
	generateMany(t, schema, opts, 40, 200, func(s *Sample) {
		clean := s.Clean()
		for _, name := range schema.Names() {
			c := clean.Column(name)
			for i := 0; i < c.Len(); i++ {
				if c.IsNull(i) {
					continue
				}
				v := ratCell(t, c, i)
				require.True(t, v.Cmp(lo[name]) >= 0 && v.Cmp(hi[name]) <= 0, "%s = %s outside its bounds", name, v.FloatString(4))
				span := new(big.Rat).Sub(hi[name], lo[name])
				if new(big.Rat).Sub(v, lo[name]).Cmp(new(big.Rat).Mul(span, big.NewRat(1, 10))) < 0 {
					seenSmall[name] = true
				}
				if new(big.Rat).Sub(hi[name], v).Cmp(new(big.Rat).Mul(span, big.NewRat(1, 10))) < 0 {
					seenLarge[name] = true
				}
				switch name {
				case "whole":
					require.True(t, v.IsInt(), "whole = %s", v.FloatString(3))
				case "share":
					thousandths := new(big.Rat).Mul(v, big.NewRat(1000, 1))
					require.True(t, thousandths.IsInt(), "share = %s has more than 3 decimals", v.FloatString(6))
				}
			}
		}
		// Extreme values would break the bounds: none.
		require.Zero(t, s.MessCounts()[MessExtreme])
	})
	for _, name := range schema.Names() {
		require.True(t, seenSmall[name] && seenLarge[name], "%s: both ends of the range occur", name)
	}
}

func TestRulesUniqueness(t *testing.T) {
	schema := fixtures.Schema{
		fixtures.Col("seq", fixtures.Int64),
		fixtures.Col("gap", fixtures.Int64),
		fixtures.Col("id", fixtures.Int64),
		fixtures.Col("code", fixtures.String),
		fixtures.Col("day", fixtures.Date),
		fixtures.Col("amount", fixtures.DecimalOf(6, 2)),
	}
	opts := Options{Mess: Heavy, DuplicateRate: 0.2, Columns: map[string]Rules{
		"seq":    {Unique: Sequential, Min: "1001"},
		"gap":    {Unique: Gapped},
		"id":     {Unique: Distinct, Min: "1", Max: "500"},
		"code":   {Unique: Distinct, Alphabet: "upper", MinLen: 2, MaxLen: 2},
		"day":    {Unique: Distinct},
		"amount": {Unique: Distinct, Min: "0", Max: "3"},
	}}
	gaps := 0
	generateMany(t, schema, opts, 30, 250, func(s *Sample) {
		clean := s.Clean()
		require.Positive(t, s.Duplicates(), "duplicate rows repeat their unique values")
		for _, name := range schema.Names() {
			c := clean.Column(name)
			seen := map[string]bool{}
			for i := 0; i < c.Len(); i++ {
				require.False(t, c.IsNull(i), "%s: a unique column has no nulls", name)
				v := c.Format(i)
				require.False(t, seen[v], "%s: %s twice", name, v)
				seen[v] = true
			}
		}
		seq, gap := clean.Column("seq"), clean.Column("gap")
		for i := 0; i < seq.Len(); i++ {
			require.Equal(t, int64(1001+i), seq.Int64(i))
			if i == 0 {
				require.Equal(t, int64(1), gap.Int64(0))
				continue
			}
			require.Greater(t, gap.Int64(i), gap.Int64(i-1))
			if gap.Int64(i)-gap.Int64(i-1) > 1 {
				gaps++
			}
		}
		code := clean.Column("code")
		for i := 0; i < code.Len(); i++ {
			require.Len(t, code.Str(i), 2)
			require.Equal(t, strings.ToUpper(code.Str(i)), code.Str(i))
		}
	})
	require.Positive(t, gaps, "gapped numbers have gaps")
	// A range too small for the rows is refused.
	_, err := Generate(schema[:1], 10, 1, Options{MaxRows: 10, Columns: map[string]Rules{"seq": {Unique: Distinct, Min: "1", Max: "5"}}})
	require.ErrorContains(t, err, `column "seq": only 5 distinct values fit its rules`)
}

func TestRulesValuesByWeight(t *testing.T) {
	schema := fixtures.Schema{
		fixtures.Col("house", fixtures.Category),
		fixtures.Col("status", fixtures.Int64),
	}
	opts := Options{Mess: None, NullRate: -1, Columns: map[string]Rules{
		"house":  {Values: []Choice{{"Bellecôte", 6}, {"Kæreby", 3}, {"Ørnely", 1}}},
		"status": {Values: []Choice{{Value: "200"}, {Value: "404"}}},
	}}
	counts := map[string]int{}
	total := 0
	generateMany(t, schema, opts, 20, 500, func(s *Sample) {
		clean := s.Clean()
		h, st := clean.Column("house"), clean.Column("status")
		for i := 0; i < clean.NumRows(); i++ {
			counts[h.Str(i)]++
			counts[st.Format(i)]++
			total++
		}
	})
	require.Len(t, counts, 5, "only the listed values: %v", counts)
	// Shares within 2 points of the weights (about 10 000 draws: the
	// standard error of a share is below 0.5 points).
	require.InDelta(t, 0.6, float64(counts["Bellecôte"])/float64(total), 0.02)
	require.InDelta(t, 0.3, float64(counts["Kæreby"])/float64(total), 0.02)
	require.InDelta(t, 0.1, float64(counts["Ørnely"])/float64(total), 0.02)
	require.InDelta(t, 0.5, float64(counts["200"])/float64(total), 0.02)
}

func TestRulesStringsAndDates(t *testing.T) {
	schema := fixtures.Schema{
		fixtures.Col("note", fixtures.String),
		fixtures.Col("pin", fixtures.String),
		fixtures.Col("booked_on", fixtures.Date),
		fixtures.Col("at", fixtures.TimestampOf(fixtures.Seconds, "UTC")),
	}
	opts := Options{Mess: None, Columns: map[string]Rules{
		"note":      {MinLen: 3, MaxLen: 10},
		"pin":       {Alphabet: "digits", MinLen: 4, MaxLen: 4},
		"booked_on": {Min: "2026-03-01", Max: "2026-03-31"},
		"at":        {Min: "2026-04-01T06:00:00Z", Max: "2026-04-01T18:00:00Z"},
	}}
	from, to := time.Date(2026, 3, 1, 0, 0, 0, 0, time.UTC), time.Date(2026, 3, 31, 0, 0, 0, 0, time.UTC)
	generateMany(t, schema, opts, 20, 200, func(s *Sample) {
		clean := s.Clean()
		for i := 0; i < clean.NumRows(); i++ {
			if c := clean.Column("note"); !c.IsNull(i) {
				n := utf8.RuneCountInString(c.Str(i))
				require.True(t, n >= 3 && n <= 10, "note %q has %d characters", c.Str(i), n)
				require.Equal(t, strings.TrimSpace(c.Str(i)), c.Str(i))
			}
			if c := clean.Column("pin"); !c.IsNull(i) {
				require.Regexp(t, `^[0-9]{4}$`, c.Str(i))
			}
			if c := clean.Column("booked_on"); !c.IsNull(i) {
				d := c.Date(i)
				require.False(t, d.Before(from) || d.After(to), "%s", d)
			}
			if c := clean.Column("at"); !c.IsNull(i) {
				at := c.Time(i).UTC()
				require.True(t, at.Hour() >= 6 && (at.Hour() < 18 || at.Hour() == 18 && at.Minute() == 0 && at.Second() == 0), "%s", at)
				require.Equal(t, 1, at.Day())
			}
		}
	})
}

func TestRulesNullsAndMessesPerColumn(t *testing.T) {
	schema := fixtures.Schema{
		fixtures.Col("id", fixtures.Int64),
		fixtures.Col("price", fixtures.Float64),
		fixtures.Col("note", fixtures.String),
	}
	opts := Options{Mess: Heavy, NullRate: 0.1, Columns: map[string]Rules{
		"id":    {Plain: true, NullRate: -1},
		"price": {Messes: []Mess{MessCurrency, MessNullToken}, MessRate: 1, NullRate: 0.3, NullTokens: []string{"n/a"}},
		"note":  {Avoid: []Mess{MessInvalidUTF8, MessMojibake}},
	}}
	var nulls, cells int
	generateMany(t, schema, opts, 20, 300, func(s *Sample) {
		for i := 0; i < s.NumRows(); i++ {
			for j := 0; j < s.NumCols(); j++ {
				c := s.Cell(i, j)
				switch s.Names()[j] {
				case "id":
					require.Equal(t, MessNone, c.Mess)
					require.NotNil(t, c.Clean)
				case "price":
					cells++
					if c.Clean == nil {
						nulls++
						require.Contains(t, []string{"", "n/a"}, c.Raw)
						continue
					}
					require.Equal(t, MessCurrency, c.Mess, "every price is spelled as money: %q", c.Raw)
					require.True(t, strings.HasPrefix(strings.TrimPrefix(c.Raw, "-"), "$"), "%q", c.Raw)
				case "note":
					require.False(t, c.Mess.Has(MessInvalidUTF8) || c.Mess.Has(MessMojibake))
				}
			}
		}
	})
	require.InDelta(t, 0.3, float64(nulls)/float64(cells), 0.03)
}

func TestRulesDerive(t *testing.T) {
	schema := fixtures.Schema{
		fixtures.Col("price", fixtures.DecimalOf(8, 2)),
		fixtures.Col("qty", fixtures.Int64),
		fixtures.Col("total", fixtures.DecimalOf(12, 2)),
		fixtures.Col("net", fixtures.Float64),
	}
	opts := Options{Mess: Heavy, Columns: map[string]Rules{
		"price": {Min: "0", Max: "999.99"},
		"qty":   {NonNegative: true, Max: "50"},
		"total": {Derive: "price × qty"},
		"net":   {Derive: "(total - 2.5) / 2", Decimals: 3},
	}}
	rows := 0
	generateMany(t, schema, opts, 20, 200, func(s *Sample) {
		clean := s.Clean()
		p, q, tot, net := clean.Column("price"), clean.Column("qty"), clean.Column("total"), clean.Column("net")
		for i := 0; i < clean.NumRows(); i++ {
			if p.IsNull(i) || q.IsNull(i) {
				require.True(t, tot.IsNull(i), "a null input makes a null total")
				continue
			}
			rows++
			want := new(big.Rat).Mul(p.Decimal(i).Rat(), new(big.Rat).SetInt64(q.Int64(i)))
			require.Zero(t, want.Cmp(tot.Decimal(i).Rat()), "total %s, want %s × %d", tot.Decimal(i), p.Decimal(i), q.Int64(i))
			n := new(big.Rat).Quo(new(big.Rat).Sub(tot.Decimal(i).Rat(), big.NewRat(5, 2)), big.NewRat(2, 1))
			nf, _ := n.Float64()
			require.InDelta(t, nf, net.Float64(i), 0.0005+1e-9)
		}
		for _, name := range []string{"total", "net"} {
			j := s.colIndex(name)
			for i := 0; i < s.NumRows(); i++ {
				m := s.Cell(i, j).Mess
				require.False(t, m.Has(MessCurrency) || m.Has(MessSentinel) || m.Has(MessNullToken), "derived %s got %s", name, m)
			}
		}
	})
	require.Greater(t, rows, 1000)

	for _, tc := range []struct {
		rules map[string]Rules
		msg   string
	}{
		{map[string]Rules{"total": {Derive: "price * nope"}}, `no column "nope"`},
		{map[string]Rules{"total": {Derive: "price *"}}, "ends early"},
		{map[string]Rules{"total": {Derive: "net"}, "net": {Derive: "total"}}, "in a circle"},
		{map[string]Rules{"qty": {Min: "5", Max: "1"}}, "no value with 0 decimals"},
		{map[string]Rules{"qty": {Min: "-3", NonNegative: true}}, "is negative, yet the column is non-negative"},
		{map[string]Rules{"qty": {Messes: []Mess{MessDayFirst}}}, "never takes mess day-first"},
		{map[string]Rules{"price": {Messes: []Mess{MessTotalRow}}}, "a mess of whole files"},
		{map[string]Rules{"price": {Alphabet: "abc"}}, "length and alphabet are for string columns"},
		{map[string]Rules{"nope": {}}, `rules for unknown column "nope"`},
		{map[string]Rules{"qty": {Unique: Sequential, Values: []Choice{{Value: "1"}}}}, "unique and values together"},
		{map[string]Rules{"price": {Unique: Gapped}}, "numbers int64 columns"},
		{map[string]Rules{"qty": {Locale: "xx-YY"}}, `unknown locale "xx-YY"`},
		{map[string]Rules{"qty": {Values: []Choice{{Value: "ten"}}}}, `value "ten"`},
	} {
		_, err := Generate(schema, 5, 1, Options{Columns: tc.rules})
		require.ErrorContains(t, err, tc.msg)
	}
}

func TestRoundRatAndExpr(t *testing.T) {
	e, err := parseExpr(`"unit price" * qty - -2 / (1 + 3)`)
	require.NoError(t, err)
	require.Equal(t, []string{"unit price", "qty"}, e.columns())
	e.bind(fixtures.Schema{fixtures.Col("unit price", fixtures.Float64), fixtures.Col("qty", fixtures.Int64)})
	v, ok := e.eval([]any{1.5, int64(3)})
	require.True(t, ok)
	require.Equal(t, "5", v.RatString())
	_, ok = e.eval([]any{nil, int64(3)})
	require.False(t, ok, "null in, null out")
	for _, tc := range []struct {
		in   string
		d    int
		want int64
	}{
		// Source: round half away from zero, as ISO 80000-1 Annex B rule B
		// describes ("rounding 0.5 up in magnitude"); from memory.
		{"2.5", 0, 3}, {"-2.5", 0, -3}, {"2.449", 1, 24}, {"0.125", 2, 13}, {"-0.125", 2, -13}, {"7", 0, 7},
	} {
		r, _ := new(big.Rat).SetString(tc.in)
		require.Equal(t, tc.want, roundRat(r, tc.d).Int64(), tc.in)
	}
}
