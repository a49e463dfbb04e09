package greenhouse

import (
	"embed"
	"io/fs"
	"sort"
)

// The demo's uploads, the same bytes as testdata/greenhouse/raw at the
// repository root (a test keeps the two copies equal; gen_raw.go writes
// both).
//
//go:embed raw
var rawFiles embed.FS

// The daily report's golden file, as TestDailyReportGolden keeps it.
//
//go:embed testdata/daily.gold.tbl
var dailyGolden []byte

// GoldenName is the daily report's golden name and GoldenPath its file,
// relative to the repository root.
const (
	GoldenName = "daily"
	GoldenPath = "cmd/proofsheet/internal/greenhouse/testdata/daily.gold.tbl"
)

// DailyGolden returns the bytes of the daily report's golden file.
func DailyGolden() []byte { return append([]byte(nil), dailyGolden...) }

// Upload is one raw datalogger file.
type Upload struct {
	Name string // file name, e.g. "bellecote.csv"
	Data []byte
}

// Uploads returns the demo's raw files in name order.
func Uploads() []Upload {
	entries, _ := fs.ReadDir(rawFiles, "raw")
	out := make([]Upload, 0, len(entries))
	for _, e := range entries {
		data, _ := rawFiles.ReadFile("raw/" + e.Name())
		out = append(out, Upload{Name: e.Name(), Data: data})
	}
	sort.Slice(out, func(i, j int) bool { return out[i].Name < out[j].Name })
	return out
}
