//go:build ignore

// gen_raw writes the invented datalogger uploads of the greenhouse demo:
// three houses, five spring days of hourly readings, each file messy in its
// own way. Run it with `go generate ./cmd/proofsheet/internal/greenhouse`; the output is
// deterministic, so running it again changes nothing.
package main

import (
	"bytes"
	"fmt"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"time"

	"golang.org/x/text/encoding/charmap"
	"golang.org/x/text/encoding/unicode"
)

type reading struct {
	at   time.Time
	temp float64 // °C
}

// series makes hourly readings: a daily sine wave between a night low and
// an afternoon high, with a little noise, all from a fixed seed.
func series(seed uint64, low, high float64) []reading {
	r := rand.New(rand.NewPCG(seed, 2026))
	start := time.Date(2026, 4, 1, 0, 0, 0, 0, time.UTC)
	var out []reading
	for h := 0; h < 5*24; h++ {
		at := start.Add(time.Duration(h) * time.Hour)
		day := h / 24
		// warmer each day, peak at 14:00
		phase := (float64(at.Hour()) - 14) / 24 * 2 * math.Pi
		mid := (low+high)/2 + float64(day)*0.6
		amp := (high - low) / 2
		t := mid + amp*math.Cos(phase) + (r.Float64()-0.5)*0.8
		out = append(out, reading{at, math.Round(t*10) / 10})
	}
	return out
}

func main() {
	dir := filepath.Join("..", "..", "..", "..", "testdata", "greenhouse", "raw")
	must(os.MkdirAll(dir, 0o755))

	// Bellecôte: Windows-1252 (the ô), CRLF, ISO timestamps with a space,
	// sensor faults as -999 and ERR and one empty cell.
	var b bytes.Buffer
	b.WriteString("house,logged_at,temp_c\r\n")
	for i, r := range series(1, 7.5, 24.0) {
		v := fmt.Sprintf("%.1f", r.temp)
		switch i {
		case 9, 10, 57:
			v = "-999"
		case 30, 31, 32, 100:
			v = "ERR"
		case 77:
			v = ""
		}
		fmt.Fprintf(&b, "Bellecôte,%s,%s\r\n", r.at.Format("2006-01-02 15:04"), v)
	}
	enc, err := charmap.Windows1252.NewEncoder().Bytes(b.Bytes())
	must(err)
	write(filepath.Join(dir, "bellecote.csv"), enc)

	// Kæreby: UTF-8 with a BOM, semicolons, temperatures in °F, ISO
	// timestamps with a T and seconds, one -999.
	b.Reset()
	b.WriteString("\uFEFFhouse;logged_at;temp_f\n")
	for i, r := range series(2, 9.0, 27.5) {
		f := r.temp*9/5 + 32
		v := fmt.Sprintf("%.1f", f)
		if i == 64 {
			v = "-999"
		}
		fmt.Fprintf(&b, "Kæreby;%s;%s\n", r.at.Format("2006-01-02T15:04:05"), v)
	}
	write(filepath.Join(dir, "kaereby.csv"), b.Bytes())

	// Piñonal: UTF-8, day-first timestamps, and a block of six hours
	// uploaded twice (the logger re-sent them after a dropout), plus ERR.
	b.Reset()
	b.WriteString("house,logged_at,temp_c\n")
	rs := series(3, 6.0, 22.5)
	for i, r := range rs {
		v := fmt.Sprintf("%.1f", r.temp)
		if i == 20 {
			v = "ERR"
		}
		fmt.Fprintf(&b, "Piñonal,%s,%s\n", r.at.Format("02/01/2006 15:04"), v)
		if i == 59 {
			for _, d := range rs[54:60] {
				fmt.Fprintf(&b, "Piñonal,%s,%.1f\n", d.at.Format("02/01/2006 15:04"), d.temp)
			}
		}
	}
	write(filepath.Join(dir, "pinonal.csv"), b.Bytes())

	// Ørnely: exported from a spreadsheet as "Unicode text": UTF-16LE with
	// a BOM, tab-separated, CRLF, one reading missing.
	b.Reset()
	b.WriteString("house\tlogged_at\ttemp_c\r\n")
	for i, r := range series(4, 8.0, 25.0) {
		v := fmt.Sprintf("%.1f", r.temp)
		if i == 88 {
			v = ""
		}
		fmt.Fprintf(&b, "Ørnely\t%s\t%s\r\n", r.at.Format("2006-01-02 15:04"), v)
	}
	u16, err := unicode.UTF16(unicode.LittleEndian, unicode.UseBOM).NewEncoder().Bytes(b.Bytes())
	must(err)
	write(filepath.Join(dir, "ornely.tsv"), u16)
}

func write(path string, data []byte) {
	must(os.WriteFile(path, data, 0o644))
	// The demo command embeds a copy kept next to the package.
	local := filepath.Join("raw", filepath.Base(path))
	must(os.MkdirAll("raw", 0o755))
	must(os.WriteFile(local, data, 0o644))
}

func must(err error) {
	if err != nil {
		fmt.Fprintln(os.Stderr, err)
		os.Exit(1)
	}
}
