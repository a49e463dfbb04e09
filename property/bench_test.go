package property

import (
	"bytes"
	"encoding/csv"
	"runtime"
	"strconv"
	"strings"
	"testing"
	"time"

	"github.com/leanovate/gopter"
	"github.com/leanovate/gopter/gen"
	"github.com/leanovate/gopter/prop"

	"github.com/proofsheet/proofsheet/fixtures"
)

// The speed targets of the package: at least a million messy cells a
// second, a 10 000-row messy CSV in well under 100 ms, a 1000-row table
// with one bad cell shrunk to at most 3 rows in at most 2 s. Each
// benchmark runs gopter's own generators or shrinkers, or encoding/csv, as
// the peer in the same run and reports the ratio.

// peerRows generates rows of raw strings for the greenhouse schema with
// gopter's own generators, the way a test would without this package
// (plain spellings only).
func peerRowGen() gopter.Gen {
	day := gen.TimeRange(time.Date(1995, 1, 1, 0, 0, 0, 0, time.UTC), 40*365*24*time.Hour)
	return gopter.CombineGens(
		gen.OneConstOf("Étang", "Les Pins", "Mühlbach", "Søndergård", "Quinta do Açude"),
		day.Map(func(t time.Time) string { return t.Format("2006-01-02") }),
		day.Map(func(t time.Time) string { return t.Format(time.RFC3339) }),
		gen.Float64Range(-1e6, 1e6).Map(func(f float64) string { return strconv.FormatFloat(f, 'f', 2, 64) }),
		gen.Int64Range(-1e6, 1e6).Map(func(i int64) string { return strconv.FormatInt(i, 10) }),
		gen.Float64Range(-1e6, 1e6).Map(func(f float64) string { return strconv.FormatFloat(f, 'f', 2, 64) }),
		gen.Bool().Map(strconv.FormatBool),
		gen.AlphaString(),
	)
}

func BenchmarkMessyCells(b *testing.B) {
	const rows = 10000
	cells := rows * len(greenhouse)
	opts := Options{Mess: Heavy}
	var ours, peer, oursCPU time.Duration
	for i := 0; i < b.N; i++ {
		b.StopTimer()
		runtime.GC() // the peer's garbage is not ours to collect
		b.StartTimer()
		start, startCPU := time.Now(), cpuTime()
		s, err := Generate(greenhouse, rows, int64(i), opts)
		if err != nil || s.NumRows() != rows {
			b.Fatal(err)
		}
		ours += time.Since(start)
		oursCPU += cpuTime() - startCPU

		b.StopTimer()
		runtime.GC()
		g := peerRowGen()
		p := params(int64(i))
		start = time.Now()
		for r := 0; r < rows; r++ {
			if _, ok := g(p).Retrieve(); !ok {
				b.Fatal("peer draw failed")
			}
		}
		peer += time.Since(start)
		b.StartTimer()
	}
	b.ReportMetric(float64(cells*b.N)/ours.Seconds(), "cells/s")
	if oursCPU > 0 {
		b.ReportMetric(float64(cells*b.N)/oursCPU.Seconds(), "cells/cpu-s")
	}
	b.ReportMetric(float64(cells*b.N)/peer.Seconds(), "gopter-cells/s")
	b.ReportMetric(peer.Seconds()/ours.Seconds(), "x-vs-gopter")
}

// BenchmarkCellGen measures the gopter.Gen of single cells, one draw per
// cell, as a user's own gopter property would call it.
func BenchmarkCellGen(b *testing.B) {
	g := Cells(fixtures.Col("temp_c", fixtures.Float64), Options{Mess: Heavy})
	peer := gen.Float64Range(-1e6, 1e6).Map(func(f float64) string { return strconv.FormatFloat(f, 'f', 2, 64) })
	const n = 100000
	var ours, theirs time.Duration
	for i := 0; i < b.N; i++ {
		p := params(int64(i))
		start := time.Now()
		for k := 0; k < n; k++ {
			g(p)
		}
		ours += time.Since(start)
		b.StopTimer()
		start = time.Now()
		for k := 0; k < n; k++ {
			peer(p)
		}
		theirs += time.Since(start)
		b.StartTimer()
	}
	b.ReportMetric(float64(n*b.N)/ours.Seconds(), "cells/s")
	b.ReportMetric(theirs.Seconds()/ours.Seconds(), "x-vs-gopter")
}

func BenchmarkMessyCSV10k(b *testing.B) {
	for _, st := range []CSVStyle{
		{},
		{Delimiter: ';', Quoting: QuoteMixed, Encoding: fixtures.EncodingWindows1252, LineEnding: MixedEndings},
		{Delimiter: '\t', Quoting: QuoteAll, Encoding: fixtures.EncodingUTF16LE, LineEnding: CRLF},
	} {
		b.Run(string(st.Encoding)+"/"+st.Quoting.String(), func(b *testing.B) {
			var ours, peer time.Duration
			size := 0
			for i := 0; i < b.N; i++ {
				b.StopTimer()
				runtime.GC()
				b.StartTimer()
				start := time.Now()
				data, err := MessyCSV(greenhouse, 10000, int64(i), Options{Mess: Heavy}, st)
				if err != nil {
					b.Fatal(err)
				}
				ours += time.Since(start)
				size += len(data)

				// Peer: encoding/csv writing the same raw cells, already made.
				b.StopTimer()
				s, _ := Generate(greenhouse, 10000, int64(i), Options{Mess: Heavy})
				records := make([][]string, s.NumRows())
				for r := range records {
					rec := make([]string, s.NumCols())
					for j := range rec {
						rec[j] = s.Cell(r, j).Raw
					}
					records[r] = rec
				}
				var buf bytes.Buffer
				start = time.Now()
				w := csv.NewWriter(&buf)
				w.Comma = st.Delimiter
				if w.Comma == 0 {
					w.Comma = ','
				}
				if err := w.WriteAll(records); err != nil {
					b.Fatal(err)
				}
				peer += time.Since(start)
				b.StartTimer()
			}
			b.ReportMetric(float64(ours.Milliseconds())/float64(b.N), "ms/file")
			b.ReportMetric(float64(size)/float64(b.N)/1e6, "MB/file")
			b.ReportMetric(ours.Seconds()/peer.Seconds(), "x-of-encoding/csv-write-only")
		})
	}
}

func BenchmarkShrink1000(b *testing.B) {
	var ours, theirs time.Duration
	var left, peerLeft int
	for i := 0; i < b.N; i++ {
		s, bad := planted(b, 1000, 637)
		g := func(*gopter.GenParameters) *gopter.GenResult { return gopter.NewGenResult(s, SampleShrinker) }
		start := time.Now()
		res := Prop(choke, g, NoPanic()).Check(gopter.DefaultTestParametersWithSeed(1))
		ours += time.Since(start)
		got := res.Args[0].Arg.(*Sample)
		if got.NumRows() > 3 || !strings.Contains(got.Raw().Literal(), bad.Raw) {
			b.Fatalf("shrunk to %d rows:\n%s", got.NumRows(), got.Raw())
		}
		left += got.NumRows()

		// Peer: gopter's own slice shrinker on the same rows as strings.
		b.StopTimer()
		j := s.colIndex("temp_c")
		rows := make([][]string, s.NumRows())
		for r := range rows {
			row := make([]string, s.NumCols())
			for k := range row {
				row[k] = s.Cell(r, k).Raw
			}
			rows[r] = row
		}
		pg := func(*gopter.GenParameters) *gopter.GenResult {
			return gopter.NewGenResult(rows, gen.SliceShrinker(gopter.NoShrinker))
		}
		peerProp := prop.ForAll(func(rs [][]string) bool {
			for _, r := range rs {
				if strings.Contains(r[j], "\u2212") {
					return false
				}
			}
			return true
		}, pg)
		start = time.Now()
		pres := peerProp.Check(gopter.DefaultTestParametersWithSeed(1))
		theirs += time.Since(start)
		peerLeft += len(pres.Args[0].Arg.([][]string))
		b.StartTimer()
	}
	b.ReportMetric(float64(left)/float64(b.N), "rows-left")
	b.ReportMetric(float64(ours.Milliseconds())/float64(b.N), "ms")
	b.ReportMetric(float64(peerLeft)/float64(b.N), "gopter-slice-rows-left")
	b.ReportMetric(ours.Seconds()/theirs.Seconds(), "x-of-gopter-slice-time")
}

func BenchmarkShrinkStandalone1000(b *testing.B) {
	var took time.Duration
	left := 0
	for i := 0; i < b.N; i++ {
		s, _ := planted(b, 1000, 637)
		start := time.Now()
		got, _ := Shrink(s, chokes)
		took += time.Since(start)
		left += got.NumRows()
	}
	b.ReportMetric(float64(left)/float64(b.N), "rows-left")
	b.ReportMetric(float64(took.Microseconds())/1000/float64(b.N), "ms")
}

// bookings is the schema of the rules benchmark: the bench-booking export
// of testdata/greenhouse/bookings.schema, with a derived total.
var bookings = fixtures.Schema{
	fixtures.Col("booking_id", fixtures.Int64),
	fixtures.Col("member", fixtures.String),
	fixtures.Col("house", fixtures.Category),
	fixtures.Col("minutes", fixtures.Int64),
	fixtures.Col("price", fixtures.DecimalOf(10, 2)),
	fixtures.Col("booked_on", fixtures.Date),
	fixtures.Col("total", fixtures.DecimalOf(14, 2)),
	fixtures.Col("note", fixtures.String),
}

var bookingRules = Options{Mess: Light, Locale: "en-US", Columns: map[string]Rules{
	"booking_id": {Unique: Sequential, Min: "10001", Plain: true},
	"member":     {Values: []Choice{{"Zoë Ørsted", 3}, {"Amélie Brûlé", 2}, {"Jürgen Weiß", 1}, {"Søren Kærgaard", 1}}, Plain: true},
	"house":      {Values: []Choice{{"Bellecôte", 4}, {"Kæreby", 3}, {"Piñonal", 2}, {"Ørnely", 1}}},
	"minutes":    {NonNegative: true, Max: "480", Plain: true},
	"price":      {Min: "0", Max: "12000", Messes: []Mess{MessCurrency, MessThousands}, MessRate: 0.7},
	"booked_on":  {Min: "2026-03-01", Max: "2026-06-30", Messes: []Mess{MessMonthFirst}, MessRate: 0.5},
	"total":      {Derive: "price * minutes / 60"},
	"note":       {MinLen: 3, MaxLen: 30, NullRate: 0.3},
}}

// peerBookingGen draws the same rows with gopter's own generators: a
// counter for the id, weighted constants, ranges, the $ and the commas
// by hand, no derived column check beyond the product.
func peerBookingGen() gopter.Gen {
	id := int64(10000)
	day := gen.TimeRange(time.Date(2026, 3, 1, 0, 0, 0, 0, time.UTC), 121*24*time.Hour)
	return gopter.CombineGens(
		gen.Const(0).Map(func(int) string { id++; return strconv.FormatInt(id, 10) }),
		gen.Weighted([]gen.WeightedGen{{Weight: 3, Gen: gen.Const("Zoë Ørsted")}, {Weight: 2, Gen: gen.Const("Amélie Brûlé")}, {Weight: 1, Gen: gen.Const("Jürgen Weiß")}, {Weight: 1, Gen: gen.Const("Søren Kærgaard")}}),
		gen.Weighted([]gen.WeightedGen{{Weight: 4, Gen: gen.Const("Bellecôte")}, {Weight: 3, Gen: gen.Const("Kæreby")}, {Weight: 2, Gen: gen.Const("Piñonal")}, {Weight: 1, Gen: gen.Const("Ørnely")}}),
		gen.Int64Range(0, 480),
		gen.Int64Range(0, 1200000),
		gen.Bool(),
		day,
		gen.Bool(),
		gen.AlphaString(),
	).Map(func(v []any) []string {
		minutes, cents := v[3].(int64), v[4].(int64)
		price := strconv.FormatFloat(float64(cents)/100, 'f', 2, 64)
		if v[5].(bool) {
			price = "$" + price
		}
		d := v[6].(time.Time)
		booked := d.Format("2006-01-02")
		if v[7].(bool) {
			booked = d.Format("1/2/2006")
		}
		total := strconv.FormatFloat(float64(cents*minutes)/6000, 'f', 2, 64)
		return []string{v[0].(string), v[1].(string), v[2].(string), strconv.FormatInt(minutes, 10), price, booked, total, v[8].(string)}
	})
}

// BenchmarkGenerateWithRules measures generation under per-column rules
// (a sequence, weighted values, ranges, one locale's money and dates, a
// derived column, string lengths); target ≥ 1M cells/s, with gopter's own
// generators drawing comparable rows as the peer.
func BenchmarkGenerateWithRules(b *testing.B) {
	const rows = 10000
	cells := rows * len(bookings)
	var ours, peer, oursCPU time.Duration
	for i := 0; i < b.N; i++ {
		b.StopTimer()
		runtime.GC()
		b.StartTimer()
		start, startCPU := time.Now(), cpuTime()
		s, err := Generate(bookings, rows, int64(i), bookingRules)
		if err != nil || s.NumRows() != rows {
			b.Fatal(err)
		}
		ours += time.Since(start)
		oursCPU += cpuTime() - startCPU

		b.StopTimer()
		runtime.GC()
		g := peerBookingGen()
		p := params(int64(i))
		start = time.Now()
		for r := 0; r < rows; r++ {
			if _, ok := g(p).Retrieve(); !ok {
				b.Fatal("peer draw failed")
			}
		}
		peer += time.Since(start)
		b.StartTimer()
	}
	b.ReportMetric(float64(cells*b.N)/ours.Seconds(), "cells/s")
	if oursCPU > 0 {
		// Per CPU second of the process (garbage collection included):
		// what an idle machine gives, when the machine is busy.
		b.ReportMetric(float64(cells*b.N)/oursCPU.Seconds(), "cells/cpu-s")
	}
	b.ReportMetric(float64(cells*b.N)/peer.Seconds(), "gopter-cells/s")
	b.ReportMetric(peer.Seconds()/ours.Seconds(), "x-vs-gopter")
}

// BenchmarkShrinkValues1000 shrinks a 1000-row heavy table whose failure
// needs a value below -100 °C: rows, columns and spellings, then the
// value itself; target ≤ 3 rows in ≤ 2 s. The peer is gopter's slice
// shrinker with its own float64 shrinker on the same readings.
func BenchmarkShrinkValues1000(b *testing.B) {
	var ours, theirs, oursCPU time.Duration
	var left, peerLeft, chars int
	for i := 0; i < b.N; i++ {
		s, err := Generate(greenhouse, 1000, 21, Options{Mess: Heavy, ExtremeRate: -1})
		if err != nil {
			b.Fatal(err)
		}
		cold := func(s *Sample) bool {
			j := s.colIndex("temp_c")
			if j < 0 {
				return false
			}
			for r := 0; r < s.NumRows(); r++ {
				if v, ok := s.Cell(r, j).Clean.(float64); ok && v < -100 {
					return true
				}
			}
			return false
		}
		g := func(*gopter.GenParameters) *gopter.GenResult { return gopter.NewGenResult(s, SampleShrinker) }
		start, startCPU := time.Now(), cpuTime()
		res := prop.ForAll(func(s *Sample) bool { return !cold(s) }, g).Check(gopter.DefaultTestParametersWithSeed(1))
		ours += time.Since(start)
		oursCPU += cpuTime() - startCPU
		got := res.Args[0].Arg.(*Sample)
		if got.NumRows() > 3 {
			b.Fatalf("shrunk to %d rows", got.NumRows())
		}
		left += got.NumRows()
		chars += len(got.Cell(0, 0).Raw)

		// Peer: gopter's slice shrinker and float shrinker on the readings.
		b.StopTimer()
		j := s.colIndex("temp_c")
		temps := make([]float64, 0, s.NumRows())
		for r := 0; r < s.NumRows(); r++ {
			v, _ := s.Cell(r, j).Clean.(float64)
			temps = append(temps, v)
		}
		pg := func(*gopter.GenParameters) *gopter.GenResult {
			return gopter.NewGenResult(temps, gen.SliceShrinker(gen.Float64Shrinker))
		}
		peerProp := prop.ForAll(func(ts []float64) bool {
			for _, v := range ts {
				if v < -100 {
					return false
				}
			}
			return true
		}, pg)
		start = time.Now()
		pres := peerProp.Check(gopter.DefaultTestParametersWithSeed(1))
		theirs += time.Since(start)
		peerLeft += len(pres.Args[0].Arg.([]float64))
		b.StartTimer()
	}
	b.ReportMetric(float64(left)/float64(b.N), "rows-left")
	b.ReportMetric(float64(chars)/float64(b.N), "chars-left")
	b.ReportMetric(float64(ours.Milliseconds())/float64(b.N), "ms")
	b.ReportMetric(float64(oursCPU.Milliseconds())/float64(b.N), "cpu-ms")
	b.ReportMetric(float64(peerLeft)/float64(b.N), "gopter-rows-left")
	b.ReportMetric(ours.Seconds()/theirs.Seconds(), "x-of-gopter-time")
}
