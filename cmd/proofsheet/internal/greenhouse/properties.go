package greenhouse

import (
	"fmt"
	"math"
	"math/big"
	"sort"
	"time"

	"github.com/proofsheet/proofsheet/assert"
	"github.com/proofsheet/proofsheet/fixtures"
	"github.com/proofsheet/proofsheet/property"
)

// UploadSchema is what a logger's file holds, as the property generators
// make uploads of it.
func UploadSchema() fixtures.Schema {
	return fixtures.Schema{
		fixtures.Col("house", fixtures.Category),
		fixtures.Col("logged_at", fixtures.TimestampOf(fixtures.Seconds, "")),
		fixtures.Col("temp_c", fixtures.Float64),
	}
}

// LoggerMess is the mess the network's loggers really write and the chain
// is meant to undo. Thousands separators, currency signs and the like never
// occur in a temperature column, and the chain reads them as faults.
func LoggerMess() property.Options {
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

// OneUpload is the whole chain on a single upload.
func OneUpload(raw *fixtures.Table) (*fixtures.Table, error) {
	return Report([]*fixtures.Table{raw}, Options{})
}

// CleanInvariants are what Clean must keep on any upload.
func CleanInvariants() []property.Invariant {
	return []property.Invariant{
		property.NoPanic(),
		property.Idempotent(),
		property.NoNulls("house", "status"),
	}
}

// ReportInvariants are what the whole chain must keep on any upload: no
// panic, the same report whatever the row order and whatever the spelling,
// every reading kept or dropped, and agreement with Reference on the clean
// data. The duplicates a raw file repeats are dropped, so "dropped" is the
// one column the clean table cannot predict.
func ReportInvariants() []property.Invariant {
	return []property.Invariant{
		property.NoPanic(),
		property.OrderFree(GoldenOptions()...),
		property.SameOnPlain(GoldenOptions()...),
		property.Holds("kept + dropped = readings in", func(s *property.Sample, out *fixtures.Table) error {
			in := s.Raw().NumRows()
			if kept, dropped := Readings(out); kept+dropped != in {
				return fmt.Errorf("kept + dropped = %d, want %d readings in", kept+dropped, in)
			}
			return nil
		}),
		property.MatchesClean(Reference, append(GoldenOptions(), assert.IgnoreColumns("dropped"))...),
	}
}

// Readings returns the readings a daily report accounts for: how many
// were kept and how many dropped, over all its rows.
func Readings(report *fixtures.Table) (kept, dropped int) {
	k, d := report.Column("kept"), report.Column("dropped")
	for i := 0; i < report.NumRows(); i++ {
		kept += int(k.Int64(i))
		dropped += int(d.Int64(i))
	}
	return kept, dropped
}

// Reference computes the daily report from a clean, typed table in the
// plainest way, independently of Clean and Daily: it is what the chain
// must agree with.
func Reference(clean *fixtures.Table) (*fixtures.Table, error) {
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
