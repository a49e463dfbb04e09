package greenhouse

import (
	"fmt"
	"math"
	"math/big"
	"sort"
	"strconv"
	"strings"
	"time"

	"github.com/proofsheet/proofsheet/assert"
	"github.com/proofsheet/proofsheet/fixtures"
	"golang.org/x/text/unicode/norm"
)

// Reading statuses set by Clean.
const (
	StatusOK        = "ok"        // a usable reading
	StatusFault     = "fault"     // sensor fault: -999, ERR, empty or unreadable value
	StatusBadTime   = "bad_time"  // the time stamp could not be read
	StatusDuplicate = "duplicate" // a second reading for the same house and time
)

// Sentinel is the value the dataloggers write when a sensor fails, in
// whichever unit the file uses.
const Sentinel = -999

// BaseC is the base temperature of the growing degree days, in °C.
const BaseC = 10.0

// ReadingsSchema is what Clean returns.
var readingsSchema = fixtures.Schema{
	fixtures.Col("house", fixtures.String),
	fixtures.Col("at", fixtures.TimestampOf(fixtures.Seconds, "")),
	fixtures.Col("temp_c", fixtures.Float64),
	fixtures.Col("status", fixtures.Category),
}

// ReportSchema is the daily report's schema.
func ReportSchema() fixtures.Schema {
	return fixtures.Schema{
		fixtures.Col("house", fixtures.String),
		fixtures.Col("day", fixtures.Date),
		fixtures.Col("tmin", fixtures.Float64),
		fixtures.Col("tmax", fixtures.Float64),
		fixtures.Col("tmean", fixtures.Float64),
		fixtures.Col("kept", fixtures.Int64),
		fixtures.Col("dropped", fixtures.Int64),
		fixtures.Col("gdd", fixtures.Float64),
		fixtures.Col("gdd_season", fixtures.Float64),
	}
}

// ReportKeys are the columns that identify a report row.
var reportKeys = []string{"house", "day"}

// ReportKeys returns the key columns of the daily report.
func ReportKeys() []string { return append([]string(nil), reportKeys...) }

// GoldenTolerance is how far a float of the daily report may move before
// its golden check fails: rounding noise only, far below the 0.01 the
// report shows.
const GoldenTolerance = 1e-9

// GoldenOptions are the comparison options of the daily report's golden
// file: rows by house and day, floats within GoldenTolerance.
func GoldenOptions() []assert.Option {
	return []assert.Option{assert.ByKey(reportKeys...), assert.Tol("*", GoldenTolerance, 0)}
}

// FahrenheitToCelsius converts exactly as NIST SP 811 defines it:
// t/°C = (t/°F − 32) × 5/9.
func FahrenheitToCelsius(f float64) float64 { return (f - 32) * 5 / 9 }

// GDD is the growing degree days of one day by the averaging method:
// max(0, (tmax + tmin)/2 − base).
func GDD(tmin, tmax, base float64) float64 {
	return math.Max(0, (tmax+tmin)/2-base)
}

// Options change how the chain rounds; the zero Options is the chain as
// the network runs it.
type Options struct {
	// Decimals is how many decimals the report's temperatures and degree
	// days keep (default 2).
	Decimals int
}

func (o Options) decimals() int {
	if o.Decimals <= 0 {
		return 2
	}
	return o.Decimals
}

// Clean turns one upload, read as text, into typed readings: house, at,
// temp_c (°C; null unless the reading is usable) and status. It accepts
// the uploads' column spellings — logged_at or at, temp_c or temp_f — and
// also its own output, so Clean(Clean(x)) equals Clean(x).
//
// Re-uploaded readings (the same house and time twice) count once: the
// lowest temperature is kept, the others are marked duplicate, so the
// result does not depend on the order of the rows.
func Clean(raw *fixtures.Table) (*fixtures.Table, error) {
	rs, err := readReadings(raw)
	if err != nil {
		return nil, err
	}
	markDuplicates(rs)
	return buildReadings(rs)
}

// reading is one row of an upload, typed.
type reading struct {
	house  string
	at     int64 // Unix seconds of the logger's wall clock
	atOK   bool
	temp   float64 // °C
	status string
}

// readReadings types the rows of one upload (or of Clean's output) and
// marks times and temperatures that cannot be read.
func readReadings(raw *fixtures.Table) ([]reading, error) {
	if raw == nil {
		return nil, fmt.Errorf("greenhouse: nil table")
	}
	house := raw.Column("house")
	if house == nil || !house.Kind().IsText() {
		return nil, fmt.Errorf("greenhouse: want a text column \"house\" (columns: %s)", strings.Join(raw.Names(), ", "))
	}
	atCol := firstColumn(raw, "logged_at", "at")
	if atCol == nil {
		return nil, fmt.Errorf("greenhouse: want a column \"logged_at\" (columns: %s)", strings.Join(raw.Names(), ", "))
	}
	tempCol, fahrenheit := raw.Column("temp_c"), false
	if tempCol == nil {
		tempCol, fahrenheit = raw.Column("temp_f"), true
	}
	if tempCol == nil {
		return nil, fmt.Errorf("greenhouse: want a column \"temp_c\" or \"temp_f\" (columns: %s)", strings.Join(raw.Names(), ", "))
	}
	rs := make([]reading, raw.NumRows())
	for i := range rs {
		r := &rs[i]
		if !house.IsNull(i) {
			r.house = cleanName(house.Str(i))
		}
		r.at, r.atOK = readTime(atCol, i)
		t, ok := readTemp(tempCol, i)
		if ok && fahrenheit {
			t = FahrenheitToCelsius(t)
		}
		switch {
		case !r.atOK:
			r.status = StatusBadTime
		case !ok:
			r.status = StatusFault
		default:
			r.temp, r.status = t, StatusOK
		}
	}
	return rs, nil
}

// markDuplicates keeps, among the usable readings of the same house and
// time, the lowest, and marks the others duplicate; readings already
// marked duplicate compete again, so a second pass changes nothing.
func markDuplicates(rs []reading) {
	type stamp struct {
		house string
		at    int64
	}
	best := map[stamp]int{}
	for i := range rs {
		if rs[i].status == StatusDuplicate {
			rs[i].status = StatusOK
		}
		if rs[i].status != StatusOK {
			continue
		}
		k := stamp{rs[i].house, rs[i].at}
		j, seen := best[k]
		switch {
		case !seen:
			best[k] = i
		case rs[i].temp < rs[j].temp:
			rs[j].status = StatusDuplicate
			best[k] = i
		default:
			rs[i].status = StatusDuplicate
		}
	}
}

// buildReadings makes Clean's table from typed readings.
func buildReadings(rs []reading) (*fixtures.Table, error) {
	b := fixtures.NewBuilder(readingsSchema).Levels("status", StatusOK, StatusFault, StatusBadTime, StatusDuplicate)
	for _, r := range rs {
		var at, temp any
		if r.atOK {
			at = time.Unix(r.at, 0).UTC()
		}
		if r.status == StatusOK || r.status == StatusDuplicate {
			temp = r.temp
		}
		b.Row(r.house, at, temp, r.status)
	}
	return b.Build()
}

func firstColumn(t *fixtures.Table, names ...string) *fixtures.Column {
	for _, n := range names {
		if c := t.Column(n); c != nil {
			return c
		}
	}
	return nil
}

// MissingWords are the ways the network's loggers and spreadsheets write
// "no value"; with the sentinels -999 and ERR they never name a house.
func MissingWords() []string {
	return []string{"NA", "N/A", "n/a", "-", "?", "null", "NULL"}
}

// cleanName trims a house name and puts it in Unicode NFC, so "Bellecôte"
// typed with a combining circumflex and with a precomposed ô is one house.
// A missing word or a sentinel is no house: "".
func cleanName(s string) string {
	s = norm.NFC.String(strings.TrimSpace(s))
	if s == "ERR" || s == strconv.Itoa(Sentinel) {
		return ""
	}
	for _, w := range MissingWords() {
		if s == w {
			return ""
		}
	}
	return s
}

// timeLayouts are the spellings the network's loggers use. Slashed dates
// are day-first on every logger of the network.
var timeLayouts = []string{
	"2006-01-02 15:04",
	"2006-01-02 15:04:05",
	"2006-01-02T15:04",
	"2006-01-02T15:04:05",
	"02/01/2006 15:04",
	"02/01/2006 15:04:05",
}

// readTime reads cell i of a timestamp or text column as Unix seconds of
// the logger's wall clock.
func readTime(c *fixtures.Column, i int) (int64, bool) {
	if c.IsNull(i) {
		return 0, false
	}
	switch c.Kind() {
	case fixtures.KindTimestamp:
		return c.Time(i).Unix(), true
	case fixtures.KindString, fixtures.KindCategory:
		s := strings.TrimSpace(c.Str(i))
		for _, l := range timeLayouts {
			if t, err := time.Parse(l, s); err == nil {
				return t.Unix(), true
			}
		}
	}
	return 0, false
}

// readTemp reads cell i as a temperature; sensor faults give ok=false.
func readTemp(c *fixtures.Column, i int) (float64, bool) {
	if c.IsNull(i) {
		return 0, false
	}
	var v float64
	switch c.Kind() {
	case fixtures.KindFloat64:
		v = c.Float64(i)
	case fixtures.KindInt64:
		v = float64(c.Int64(i))
	case fixtures.KindString, fixtures.KindCategory:
		f, err := strconv.ParseFloat(strings.TrimSpace(c.Str(i)), 64)
		if err != nil {
			return 0, false // ERR, empty, anything unreadable
		}
		v = f
	default:
		return 0, false
	}
	if math.IsNaN(v) || math.IsInf(v, 0) || v == Sentinel {
		return 0, false
	}
	return v, true
}

// Daily groups cleaned readings into the daily report: per house and day,
// the minimum, maximum and mean of the usable readings, how many were kept
// and dropped, the day's growing degree days and the season-to-date sum.
// Readings whose time could not be read are counted in a row of their
// house with a null day, so kept + dropped always equals the readings in.
func Daily(readings *fixtures.Table, opt Options) (*fixtures.Table, error) {
	for _, f := range readingsSchema {
		c := readings.Column(f.Name)
		if c == nil || c.Type() != f.Type {
			return nil, fmt.Errorf("greenhouse: Daily wants Clean's output (%s)", fixtures.Schema(readingsSchema))
		}
	}
	type key struct {
		house string
		day   int64 // Unix day; math.MinInt64 for undated
	}
	type acc struct {
		min, max      float64
		sum           big.Rat // exact, so the mean does not depend on row order
		kept, dropped int64
	}
	groups := map[key]*acc{}
	house, at, temp, status := readings.Column("house"), readings.Column("at"), readings.Column("temp_c"), readings.Column("status")
	for i := 0; i < readings.NumRows(); i++ {
		k := key{house: house.Str(i), day: math.MinInt64}
		if !at.IsNull(i) {
			k.day = floorDiv(at.Ticks(i), 86400)
		}
		a := groups[k]
		if a == nil {
			a = &acc{min: math.Inf(1), max: math.Inf(-1)}
			groups[k] = a
		}
		if status.Str(i) != StatusOK {
			a.dropped++
			continue
		}
		t := temp.Float64(i)
		a.kept++
		a.sum.Add(&a.sum, DecimalOf(t))
		a.min = math.Min(a.min, t)
		a.max = math.Max(a.max, t)
	}
	keys := make([]key, 0, len(groups))
	for k := range groups {
		keys = append(keys, k)
	}
	sort.Slice(keys, func(i, j int) bool {
		if keys[i].house != keys[j].house {
			return keys[i].house < keys[j].house
		}
		return keys[i].day < keys[j].day
	})
	round := roundTo(opt.decimals())
	b := fixtures.NewBuilder(ReportSchema())
	season := map[string]float64{}
	for _, k := range keys {
		a := groups[k]
		var day, tmin, tmax, tmean, gdd, gddSeason any
		if k.day != math.MinInt64 {
			day = time.Unix(k.day*86400, 0).UTC()
			if a.kept > 0 {
				g := GDD(a.min, a.max, BaseC)
				season[k.house] += g
				mean := new(big.Rat).Quo(&a.sum, new(big.Rat).SetInt64(a.kept))
				tmin, tmax, tmean, gdd = round(a.min), round(a.max), RoundRat(mean, opt.decimals()), round(g)
			}
			gddSeason = round(season[k.house])
		}
		b.Row(k.house, day, tmin, tmax, tmean, a.kept, a.dropped, gdd, gddSeason)
	}
	return b.Build()
}

func floorDiv(a, b int64) int64 {
	q := a / b
	if a%b != 0 && (a < 0) != (b < 0) {
		q--
	}
	return q
}

// roundTo rounds half away from zero to d decimals (exactly: see RoundRat).
func roundTo(d int) func(float64) float64 {
	return func(v float64) float64 { return RoundRat(DecimalOf(v), d) }
}

// DecimalOf returns the decimal a reading stands for: the shortest decimal
// that reads back as the same float64 (what the logger wrote, 52.8, not the
// binary value just below it). Summing these exactly gives the mean a
// person computes by hand.
func DecimalOf(v float64) *big.Rat {
	r, _ := new(big.Rat).SetString(strconv.FormatFloat(v, 'g', -1, 64))
	return r
}

// RoundRat rounds an exact number half away from zero to d decimals and
// returns the float64 nearest that decimal. Working exactly matters: a mean
// of readings summed in float64 can land a hair either side of a half
// (-17.475) depending on the order of the rows, and round differently.
func RoundRat(r *big.Rat, d int) float64 {
	scale := new(big.Int).Exp(big.NewInt(10), big.NewInt(int64(d)), nil)
	x := new(big.Rat).Mul(r, new(big.Rat).SetInt(scale))
	num, den := new(big.Int).Abs(x.Num()), x.Denom()
	// q = floor(|x| + 1/2) = (2·num + den) div (2·den)
	q := new(big.Int).Add(new(big.Int).Lsh(num, 1), den)
	q.Quo(q, new(big.Int).Lsh(den, 1))
	if x.Sign() < 0 {
		q.Neg(q)
	}
	f, _ := new(big.Rat).SetFrac(q, scale).Float64()
	return f
}

// Report is the whole chain: it types the readings of every upload, marks
// re-uploads among them all, and returns the daily report.
func Report(uploads []*fixtures.Table, opt Options) (*fixtures.Table, error) {
	if len(uploads) == 0 {
		return nil, fmt.Errorf("greenhouse: no uploads")
	}
	var all []reading
	for i, u := range uploads {
		rs, err := readReadings(u)
		if err != nil {
			return nil, fmt.Errorf("upload %d: %w", i+1, err)
		}
		all = append(all, rs...)
	}
	// Duplicates can also span uploads (a logger re-sending yesterday's
	// file), so they are found over all the readings at once.
	markDuplicates(all)
	readings, err := buildReadings(all)
	if err != nil {
		return nil, err
	}
	return Daily(readings, opt)
}

// Load reads one upload as text, the way the chain wants it: the loader
// finds the encoding and delimiter; the chain fixes the types itself.
func Load(name string, data []byte) (*fixtures.Table, *fixtures.LoadReport, error) {
	return fixtures.ReadBytes(name, data, fixtures.AllText())
}
