package greenhouse

import (
	"bytes"
	"fmt"
	"math"
	"math/big"
	"os"
	"path/filepath"
	"sort"
	"testing"
	"time"

	"github.com/proofsheet/proofsheet/assert"
	"github.com/proofsheet/proofsheet/fixtures"
	"github.com/proofsheet/proofsheet/golden"
	"github.com/proofsheet/proofsheet/property"
	"github.com/stretchr/testify/require"
)

func TestFahrenheitToCelsius(t *testing.T) {
	// Source: NIST SP 811 (2008), §B.8 and Appendix B.9: t/°C = (t/°F − 32)/1.8,
	// so the fixed points 32 °F = 0 °C and 212 °F = 100 °C, and −40 is the
	// same in both scales.
	cases := []struct{ f, c float64 }{{32, 0}, {212, 100}, {-40, -40}, {50, 10}}
	for _, k := range cases {
		require.InDelta(t, k.c, FahrenheitToCelsius(k.f), 1e-12, "%v °F", k.f)
	}
	// 98.6 °F is 37 °C up to the rounding of 98.6 in binary.
	require.InDelta(t, 37.0, FahrenheitToCelsius(98.6), 1e-12)
}

func TestGDDAveragingMethod(t *testing.T) {
	// Source: McMaster & Wilhelm (1997), "Growing degree-days: one equation,
	// two interpretations", Agricultural and Forest Meteorology 87:291–300 —
	// the averaging method (their Method 1): GDD = (Tmax + Tmin)/2 − Tbase,
	// set to 0 when negative; Tmin is not raised to the base first.
	cases := []struct {
		tmin, tmax, want float64
		note             string
	}{
		{12, 24, 8, "both above the base"},
		{4, 20, 2, "Tmin below the base is used as is (Method 2 would give 5)"},
		{2, 8, 0, "a cold day counts 0, never negative"},
		{10, 10, 0, "at the base"},
	}
	for _, c := range cases {
		require.Equal(t, c.want, GDD(c.tmin, c.tmax, BaseC), c.note)
	}
}

func TestRoundRat(t *testing.T) {
	// Round half away from zero on the exact value (hand-worked).
	cases := []struct {
		num, den int64
		d        int
		want     float64
	}{
		{17975, 1000, 2, 17.98}, {-17475, 1000, 2, -17.48}, {125, 1000, 2, 0.13},
		{5, 2, 0, 3}, {-5, 2, 0, -3}, {17974999, 1000000, 2, 17.97}, {1, 3, 2, 0.33}, {0, 1, 2, 0},
	}
	for _, c := range cases {
		require.Equal(t, c.want, RoundRat(big.NewRat(c.num, c.den), c.d), "%d/%d", c.num, c.den)
	}
	// 52.8 in binary is a hair below 52.8; the reading as written is 52.8.
	// Source: IEEE 754 binary64 — 52.8 has no exact binary form.
	require.Equal(t, 0, DecimalOf(52.8).Cmp(big.NewRat(528, 10)))
	sum := new(big.Rat)
	for _, v := range []float64{8, 52.8, 5.1, 6} {
		sum.Add(sum, DecimalOf(v))
	}
	require.Equal(t, 17.98, RoundRat(sum.Quo(sum, big.NewRat(4, 1)), 2), "71.9 / 4 = 17.975 rounds up")
}

func TestCleanHandWorked(t *testing.T) {
	// A hand-worked example, invented numbers: one house, two spellings of
	// the time, a sentinel, an ERR, an empty reading and a re-upload.
	raw := fixtures.MustParse(t, `
		house:string   | logged_at:string | temp_c:string
		" Bellecôte"   | 2026-04-01 06:00 | 8.4
		Bellecôte      | 01/04/2026 07:00 | -999
		Bellecôte      | 2026-04-01T08:00 | ERR
		Bellecôte      | 2026-04-01 09:00 | ""
		Bellecôte      | 2026-04-01 14:00 | 22.6
		Bellecôte      | 2026-04-01 14:00 | 22.6
		Bellecôte      | 31/31/2026 14:00 | 20
		Bellecôte      | 2026-04-02 06:00 | 9.5
	`)
	got, err := Clean(raw)
	require.NoError(t, err)
	want := fixtures.MustParse(t, `
		house:string | at:timestamp(s)     | temp_c:float64 | status:category[ok,fault,bad_time,duplicate]
		Bellecôte    | 2026-04-01T06:00:00 | 8.4            | ok
		Bellecôte    | 2026-04-01T07:00:00 | ~              | fault
		Bellecôte    | 2026-04-01T08:00:00 | ~              | fault
		Bellecôte    | 2026-04-01T09:00:00 | ~              | fault
		Bellecôte    | 2026-04-01T14:00:00 | 22.6           | ok
		Bellecôte    | 2026-04-01T14:00:00 | 22.6           | duplicate
		Bellecôte    | ~                   | ~              | bad_time
		Bellecôte    | 2026-04-02T06:00:00 | 9.5            | ok
	`)
	assert.Tables(t, want, got)

	daily, err := Daily(got, Options{})
	require.NoError(t, err)
	// By hand: 1 April kept 8.4 and 22.6 → mean 15.5, GDD (22.6+8.4)/2 − 10
	// = 5.5; dropped the -999, ERR, empty and the duplicate = 4. 2 April
	// kept 9.5 → GDD max(0, 9.5 − 10) = 0, season 5.5. The unreadable time
	// goes to the undated row.
	wantDaily := fixtures.MustParse(t, `
		house:string | day:date   | tmin:float64 | tmax:float64 | tmean:float64 | kept:int64 | dropped:int64 | gdd:float64 | gdd_season:float64
		Bellecôte    | ~          | ~            | ~            | ~             | 0          | 1             | ~           | ~
		Bellecôte    | 2026-04-01 | 8.4          | 22.6         | 15.5          | 2          | 4             | 5.5         | 5.5
		Bellecôte    | 2026-04-02 | 9.5          | 9.5          | 9.5           | 1          | 0             | 0           | 5.5
	`)
	assert.Tables(t, wantDaily, daily, assert.ByKey("house", "day"), assert.Tol("*", 1e-9, 0))
}

func TestCleanFahrenheitUpload(t *testing.T) {
	raw := fixtures.MustParse(t, `
		house:string | logged_at:string    | temp_f:string
		Kæreby       | 2026-04-01T06:00:00 | 50
		Kæreby       | 2026-04-01T07:00:00 | -999
		Kæreby       | 2026-04-01T08:00:00 | 212
	`)
	got, err := Clean(raw)
	require.NoError(t, err)
	want := fixtures.MustParse(t, `
		house:string | at:timestamp(s)     | temp_c:float64 | status:category[ok,fault,bad_time,duplicate]
		Kæreby       | 2026-04-01T06:00:00 | 10             | ok
		Kæreby       | 2026-04-01T07:00:00 | ~              | fault
		Kæreby       | 2026-04-01T08:00:00 | 100            | ok
	`)
	// Source: NIST SP 811 — 50 °F is 10 °C and 212 °F is 100 °C; the sentinel
	// -999 is checked before conversion, in the file's own unit.
	assert.Tables(t, want, got, assert.Tol("temp_c", 1e-12, 0))
}

func TestCleanRejectsWrongShape(t *testing.T) {
	_, err := Clean(nil)
	require.Error(t, err)
	_, err = Clean(fixtures.MustParse(t, "house:string | temp_c:string\nx | 1\n"))
	require.ErrorContains(t, err, `"logged_at"`)
	_, err = Clean(fixtures.MustParse(t, "house:string | logged_at:string\nx | 1\n"))
	require.ErrorContains(t, err, `"temp_c" or "temp_f"`)
	_, err = Daily(fixtures.MustParse(t, "house:string\nx\n"), Options{})
	require.ErrorContains(t, err, "Clean's output")
	_, err = Report(nil, Options{})
	require.Error(t, err)
}

// loadUploads reads the demo's raw files as the demo does.
func loadUploads(t *testing.T) ([]*fixtures.Table, []*fixtures.LoadReport) {
	t.Helper()
	var tables []*fixtures.Table
	var reports []*fixtures.LoadReport
	for _, u := range Uploads() {
		tb, rep, err := Load(u.Name, u.Data)
		require.NoError(t, err, u.Name)
		tables = append(tables, tb)
		reports = append(reports, rep)
	}
	return tables, reports
}

func TestUploadsAsTheLoaderSeesThem(t *testing.T) {
	_, reports := loadUploads(t)
	got := map[string]fixtures.Encoding{}
	rows := map[string]int{}
	for _, r := range reports {
		got[r.Path] = r.Encoding
		rows[r.Path] = r.Rows
	}
	require.Equal(t, map[string]fixtures.Encoding{
		"bellecote.csv": fixtures.EncodingWindows1252,
		"kaereby.csv":   fixtures.EncodingUTF8BOM,
		"ornely.tsv":    fixtures.EncodingUTF16LE,
		"pinonal.csv":   fixtures.EncodingUTF8,
	}, got)
	require.Equal(t, map[string]int{"bellecote.csv": 120, "kaereby.csv": 120, "ornely.tsv": 120, "pinonal.csv": 126}, rows)
}

func TestEmbeddedUploadsMatchTestdata(t *testing.T) {
	// The demo embeds a copy of testdata/greenhouse/raw; gen_raw.go writes
	// both, and this keeps them from drifting apart.
	for _, u := range Uploads() {
		disk, err := os.ReadFile(filepath.Join("..", "..", "testdata", "greenhouse", "raw", u.Name))
		require.NoError(t, err)
		require.True(t, bytes.Equal(disk, u.Data), "%s differs from testdata/greenhouse/raw/%s; run go generate ./internal/greenhouse", u.Name, u.Name)
	}
	entries, err := os.ReadDir(filepath.Join("..", "..", "testdata", "greenhouse", "raw"))
	require.NoError(t, err)
	require.Len(t, Uploads(), len(entries))
}

func TestDailyReportGolden(t *testing.T) {
	uploads, _ := loadUploads(t)
	report, err := Report(uploads, Options{})
	require.NoError(t, err)

	// Every raw reading is either kept or dropped.
	total := 0
	for _, u := range uploads {
		total += u.NumRows()
	}
	require.Equal(t, total, sumInt(report, "kept")+sumInt(report, "dropped"))

	golden.Table(t, "daily", report, GoldenOptions()...)
}

func sumInt(t *fixtures.Table, col string) int {
	c := t.Column(col)
	n := 0
	for i := 0; i < c.Len(); i++ {
		n += int(c.Int64(i))
	}
	return n
}

// readingsSchema of the generated uploads: what a logger's file holds.
func uploadSchema() fixtures.Schema {
	return fixtures.Schema{
		fixtures.Col("house", fixtures.Category),
		fixtures.Col("logged_at", fixtures.TimestampOf(fixtures.Seconds, "")),
		fixtures.Col("temp_c", fixtures.Float64),
	}
}

// loggerMess is the mess the network's loggers really write and the chain
// is meant to undo. Thousands separators, currency signs and the like never
// occur in a temperature column, and the chain reads them as faults.
func loggerMess() property.Options {
	return property.Options{
		Mess:     property.Light,
		MaxRows:  60,
		Runs:     60,
		MessRate: 0.3,
		Spellings: []property.Mess{
			property.MessEdgeSpace, property.MessSpaceSeparator, property.MessTrailingZeros,
			property.MessLeadingZeros, property.MessPlusSign, property.MessExponent,
			property.MessNullToken, property.MessSentinel,
		},
		Sentinels:     []string{"-999", "ERR"},
		NullTokens:    MissingWords(),
		NullRate:      0.05,
		SentinelRate:  0.05,
		DuplicateRate: 0.1,
		Levels:        map[string][]string{"house": {"Bellecôte", "Kæreby", "Piñonal", "Ørnely"}},
		DateFrom:      time.Date(2026, 4, 1, 0, 0, 0, 0, time.UTC),
		DateTo:        time.Date(2026, 4, 3, 0, 0, 0, 0, time.UTC),
		Decimals:      1,
		MaxDigits:     2,
	}
}

func chain(raw *fixtures.Table) (*fixtures.Table, error) {
	return Report([]*fixtures.Table{raw}, Options{})
}

func TestChainProperties(t *testing.T) {
	opts := loggerMess()
	report := []assert.Option{assert.ByKey("house", "day"), assert.Tol("*", 1e-9, 0)}
	property.Check(t, uploadSchema(), Clean, opts,
		property.NoPanic(),
		property.Idempotent(),
		property.NoNulls("house", "status"))
	property.Check(t, uploadSchema(), chain, opts,
		property.NoPanic(),
		property.OrderFree(report...),
		property.SameOnPlain(report...),
		property.Holds("kept + dropped = readings in", func(s *property.Sample, out *fixtures.Table) error {
			in := s.Raw().NumRows()
			if got := sumInt(out, "kept") + sumInt(out, "dropped"); got != in {
				return fmt.Errorf("kept + dropped = %d, want %d readings in", got, in)
			}
			return nil
		}),
		// The duplicates the raw file repeats are dropped, so "dropped" is
		// the one column the clean table cannot predict.
		property.MatchesClean(reference, append(report, assert.IgnoreColumns("dropped"))...))
}

// reference computes the daily report from a clean, typed table in the
// plainest way, independently of Clean and Daily: it is what the chain
// must agree with.
func reference(clean *fixtures.Table) (*fixtures.Table, error) {
	type key struct {
		house string
		day   string
	}
	type stamp struct {
		house string
		at    int64
	}
	house, at, temp := clean.Column("house"), clean.Column("logged_at"), clean.Column("temp_c")
	// The same house and second twice: the lowest temperature counts.
	lowest := map[stamp]float64{}
	undated := map[string]int{}
	faults := map[key]int{}
	for i := 0; i < clean.NumRows(); i++ {
		h := ""
		if !house.IsNull(i) {
			h = house.Str(i)
		}
		if at.IsNull(i) {
			undated[h]++
			continue
		}
		day := at.Time(i).Format("2006-01-02")
		v := temp.Float64(i)
		if temp.IsNull(i) || math.IsNaN(v) || math.IsInf(v, 0) || v == Sentinel {
			faults[key{h, day}]++
			continue
		}
		s := stamp{h, at.Time(i).Unix()}
		if old, ok := lowest[s]; !ok || v < old {
			lowest[s] = v
		}
	}
	days := map[key][]float64{}
	for s, v := range lowest {
		k := key{s.house, time.Unix(s.at, 0).UTC().Format("2006-01-02")}
		days[k] = append(days[k], v)
	}
	for k := range faults {
		if _, ok := days[k]; !ok {
			days[k] = nil
		}
	}
	keys := make([]key, 0, len(days))
	for k := range days {
		keys = append(keys, k)
	}
	sort.Slice(keys, func(i, j int) bool {
		if keys[i].house != keys[j].house {
			return keys[i].house < keys[j].house
		}
		return keys[i].day < keys[j].day
	})
	r2 := func(v float64) float64 { return RoundRat(DecimalOf(v), 2) }
	// The mean of the readings as written, exactly, then rounded: the
	// definition, whatever order the readings come in.
	mean := func(ts []float64) float64 {
		var sum big.Rat
		for _, v := range ts {
			sum.Add(&sum, DecimalOf(v))
		}
		return RoundRat(sum.Quo(&sum, new(big.Rat).SetInt64(int64(len(ts)))), 2)
	}
	b := fixtures.NewBuilder(ReportSchema())
	for h, n := range undated {
		b.Row(h, nil, nil, nil, nil, 0, n, nil, nil)
	}
	season := map[string]float64{}
	for _, k := range keys {
		ts := days[k]
		if len(ts) == 0 {
			b.Row(k.house, k.day, nil, nil, nil, 0, 0, nil, r2(season[k.house]))
			continue
		}
		lo, hi := ts[0], ts[0]
		for _, v := range ts {
			lo, hi = math.Min(lo, v), math.Max(hi, v)
		}
		g := math.Max(0, (lo+hi)/2-10)
		season[k.house] += g
		b.Row(k.house, k.day, r2(lo), r2(hi), mean(ts), len(ts), 0, r2(g), r2(season[k.house]))
	}
	return b.Build()
}

// GoldenOptions are the comparison options of the daily report's golden
// file: rows by house and day, floats within 1e-9 (rounding noise only).
func GoldenOptions() []assert.Option {
	return []assert.Option{assert.ByKey(reportKeys...), assert.Tol("*", 1e-9, 0)}
}
