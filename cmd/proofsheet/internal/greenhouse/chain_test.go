package greenhouse

import (
	"bytes"
	"math/big"
	"os"
	"path/filepath"
	"testing"

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
		disk, err := os.ReadFile(filepath.Join("..", "..", "..", "..", "testdata", "greenhouse", "raw", u.Name))
		require.NoError(t, err)
		require.True(t, bytes.Equal(disk, u.Data), "%s differs from testdata/greenhouse/raw/%s; run go generate ./cmd/proofsheet/internal/greenhouse", u.Name, u.Name)
	}
	entries, err := os.ReadDir(filepath.Join("..", "..", "..", "..", "testdata", "greenhouse", "raw"))
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
	kept, dropped := Readings(report)
	require.Equal(t, total, kept+dropped)

	golden.Table(t, GoldenName, report, GoldenOptions()...)
}

func TestChainProperties(t *testing.T) {
	property.Check(t, UploadSchema(), Clean, LoggerMess(), CleanInvariants()...)
	property.Check(t, UploadSchema(), OneUpload, LoggerMess(), ReportInvariants()...)
}
