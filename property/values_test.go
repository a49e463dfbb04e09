package property

import (
	"math/big"
	"strings"
	"testing"

	"github.com/stretchr/testify/require"

	"github.com/proofsheet/proofsheet/fixtures"
)

// cleanOf returns the clean value of raw column name in row i.
func cleanOf(s *Sample, i int, name string) any {
	return s.Cell(i, s.colIndex(name)).Clean
}

func TestShrinkValuesToShortHumanOnes(t *testing.T) {
	s, err := Generate(greenhouse, 1000, 21, Options{Mess: Heavy, ExtremeRate: -1})
	require.NoError(t, err)
	// Fails on a reading below -100 °C.
	cold := func(s *Sample) bool {
		j := s.colIndex("temp_c")
		if j < 0 {
			return false
		}
		for i := 0; i < s.NumRows(); i++ {
			if v, ok := s.Cell(i, j).Clean.(float64); ok && v < -100 {
				return true
			}
		}
		return false
	}
	require.True(t, cold(s))
	got, _ := Shrink(s, cold)
	require.Equal(t, 1, got.NumRows())
	require.Equal(t, []string{"temp_c"}, got.Names())
	c := got.Cell(0, 0)
	v := c.Clean.(float64)
	require.Less(t, v, -100.0)
	require.GreaterOrEqual(t, v, -200.0, "shrunk toward the boundary: %v", v)
	require.LessOrEqual(t, len(c.Raw), 6, "a short value: %q", c.Raw)
	require.Equal(t, MessNone, c.Mess, "spelled plainly: %q", c.Raw)

	// Two houses above 30 °C: two rows stay, each value near 30, and the
	// houses become the first levels.
	hot := func(s *Sample) bool {
		h, j := s.colIndex("house"), s.colIndex("temp_c")
		if h < 0 || j < 0 {
			return false
		}
		houses := map[any]bool{}
		for i := 0; i < s.NumRows(); i++ {
			if v, ok := s.Cell(i, j).Clean.(float64); ok && v > 30 && s.Cell(i, h).Clean != nil {
				houses[s.Cell(i, h).Clean] = true
			}
		}
		return len(houses) >= 2
	}
	got, _ = Shrink(s, hot)
	require.Equal(t, 2, got.NumRows())
	require.ElementsMatch(t, []string{"house", "temp_c"}, got.Names())
	lit := got.Raw().Literal()
	for i := 0; i < 2; i++ {
		v := cleanOf(got, i, "temp_c").(float64)
		require.True(t, v > 30 && v < 60, "temp %v", v)
		require.Contains(t, []any{"Étang", "Les Pins"}, cleanOf(got, i, "house"), lit)
	}
	require.LessOrEqual(t, len(lit), 80, "short values:\n%s", lit)
}

func TestShrinkValuesKeepTheRules(t *testing.T) {
	schema := fixtures.Schema{
		fixtures.Col("id", fixtures.Int64),
		fixtures.Col("code", fixtures.Int64),
		fixtures.Col("price", fixtures.DecimalOf(8, 2)),
		fixtures.Col("qty", fixtures.Int64),
		fixtures.Col("total", fixtures.DecimalOf(12, 2)),
		fixtures.Col("day", fixtures.Date),
	}
	opts := Options{Mess: Light, Columns: map[string]Rules{
		"id":    {Unique: Sequential, Min: "500"},
		"code":  {Unique: Distinct, Min: "10", Max: "9999"},
		"price": {Min: "2.50", Max: "900", Messes: []Mess{MessCurrency}, MessRate: 1},
		"qty":   {Min: "1", Max: "40"},
		"total": {Derive: "price * qty"},
		"day":   {Min: "2026-03-01", Max: "2026-03-31"},
	}}
	s, err := Generate(schema, 1000, 4, opts)
	require.NoError(t, err)
	// Fails when two bookings of more than 100 in total, priced with a $,
	// are there.
	big100 := big.NewRat(100, 1)
	fails := func(s *Sample) bool {
		j, p := s.colIndex("total"), s.colIndex("price")
		if j < 0 || s.colIndex("id") < 0 || s.colIndex("code") < 0 || s.colIndex("day") < 0 || p < 0 {
			return false
		}
		n := 0
		for i := 0; i < s.NumRows(); i++ {
			if d, ok := s.Cell(i, j).Clean.(fixtures.Decimal); ok && d.Rat().Cmp(big100) > 0 && strings.HasPrefix(s.Cell(i, p).Raw, "$") {
				n++
			}
		}
		return n >= 2
	}
	require.True(t, fails(s))
	got, _ := Shrink(s, fails)
	require.LessOrEqual(t, got.NumRows(), 3)
	clean := got.Clean()
	codes := map[int64]bool{}
	for i := 0; i < clean.NumRows(); i++ {
		require.Equal(t, int64(500+i), clean.Column("id").Int64(i), "the sequence is numbered anew from its start")
		code := clean.Column("code").Int64(i)
		require.False(t, codes[code], "codes stay unique")
		require.True(t, code >= 10 && code <= 9999)
		codes[code] = true
		p, q, tot := clean.Column("price").Decimal(i), clean.Column("qty").Int64(i), clean.Column("total").Decimal(i)
		require.True(t, p.Rat().Cmp(big.NewRat(5, 2)) >= 0, "price %s keeps its bound", p)
		require.True(t, q >= 1)
		require.Zero(t, new(big.Rat).Mul(p.Rat(), big.NewRat(q, 1)).Cmp(tot.Rat()), "total = price × qty after shrinking")
		require.Equal(t, "2026-03-01", clean.Column("day").Format(i), "dates toward the epoch day, within the range")
	}
	// The price keeps its mess, $ and all.
	j := got.colIndex("price")
	for i := 0; i < got.NumRows(); i++ {
		require.True(t, strings.HasPrefix(got.Cell(i, j).Raw, "$"), got.Cell(i, j).Raw)
	}
}

func TestValueCandidatesAreSimpler(t *testing.T) {
	cc := &colConf{maxDec: 2}
	for _, tc := range []struct {
		x    string
		want []string
	}{
		{"-1334500.09", []string{"0", "-1", "1", "-1334500", "-1000000", "-1300000", "-667250"}},
		{"0.5", []string{"0"}},
		{"12", []string{"0", "1", "10", "6"}},
	} {
		x, _ := new(big.Rat).SetString(tc.x)
		var got []string
		for _, c := range numberCandidates(x, cc) {
			if simpler(cleanNumber(c, fixtures.Float64, cc), cleanNumber(x, fixtures.Float64, cc), cc) {
				got = append(got, c.FloatString(decimalsOf(c)))
			}
		}
		require.Equal(t, tc.want, got, tc.x)
	}
}
