package property

import (
	"bytes"
	"math/big"
	"strings"
	"testing"

	"github.com/stretchr/testify/require"

	"github.com/proofsheet/proofsheet/assert"
	"github.com/proofsheet/proofsheet/fixtures"
)

var logs = fixtures.Schema{
	fixtures.Col("house", fixtures.Category),
	fixtures.Col("day", fixtures.Date),
	fixtures.Col("kept", fixtures.Int64),
	fixtures.Col("cost", fixtures.DecimalOf(10, 2)),
}

func TestReuploadSeries(t *testing.T) {
	opts := Options{Mess: None, NullRate: -1, Also: []Mess{MessReupload, MessAddedColumn}, Uploads: 4, Overlap: 0.3}
	for seed := int64(1); seed <= 20; seed++ {
		s, err := Generate(logs, 200, seed, opts)
		require.NoError(t, err)
		require.Equal(t, 4, s.NumUploads())
		ups := s.Uploads()
		require.Len(t, ups, 4)
		// Every record is in Clean once; the series repeats some rows.
		require.Equal(t, 200, s.Clean().NumRows())
		require.Equal(t, s.NumRows(), 200+s.MessCounts()[MessReupload])
		require.InDelta(t, 0.3*50*3, s.MessCounts()[MessReupload], 3)
		prevLast := ""
		total := 0
		for u, up := range ups {
			raw := up.Raw()
			total += raw.NumRows()
			day := raw.Column("day")
			// A file's rows in time order; its fresh rows come after the
			// previous file's window.
			first := ""
			for i := 0; i < raw.NumRows(); i++ {
				if i > 0 {
					require.LessOrEqual(t, day.Str(i-1), day.Str(i))
				}
				if up.rows[i].mess != MessReupload && first == "" {
					first = day.Str(i)
				}
			}
			require.LessOrEqual(t, prevLast, first, "upload %d starts after the window before", u+1)
			prevLast = day.Str(raw.NumRows() - 1)
			// The column added halfway: files 3 and 4 have it.
			_, has := indexOfName(raw.Names(), "uploaded_by")
			require.Equal(t, u >= 2, has, "upload %d: %v", u+1, raw.Names())
		}
		require.Equal(t, s.NumRows(), total)
		// In the joined table the added column is null for the early rows.
		joined := s.Raw().Column("uploaded_by")
		require.NotNil(t, joined)
		for i := 0; i < s.NumRows(); i++ {
			require.Equal(t, s.rows[i].upload < 2, joined.IsNull(i))
		}
	}
}

func indexOfName(names []string, n string) (int, bool) {
	for i, x := range names {
		if x == n {
			return i, true
		}
	}
	return -1, false
}

func TestUploadMessesInEveryFile(t *testing.T) {
	opts := Options{Mess: Light, Also: []Mess{MessRepeatedHeader, MessTotalRow, MessBlankLines, MessCutShort}, UploadRate: 1, Uploads: 2}
	for seed := int64(1); seed <= 20; seed++ {
		s, err := Generate(logs, 60, seed, opts)
		require.NoError(t, err)
		counts := s.MessCounts()
		require.Equal(t, 2, counts[MessRepeatedHeader], "one repeated header per file")
		require.Equal(t, 2, counts[MessCutShort], "each file ends cut short")
		require.GreaterOrEqual(t, counts[MessBlankLines], 2)
		// The lines cut are total rows (they end each file), so every
		// record is still there: Clean is that of the plain series.
		base, err := Generate(logs, 60, seed, Options{Mess: Light, Uploads: 2, Also: []Mess{MessAddedColumn}})
		require.NoError(t, err)
		requireSame(t, base.Clean(), s.Clean())
		for _, up := range s.Uploads() {
			rows := up.rows
			last := rows[len(rows)-1]
			require.Equal(t, MessCutShort, last.mess, "the last line is cut")
			require.Equal(t, -1, last.rec)
			// The total row comes before the cut one, cut or whole.
			var hdr int
			for _, r := range rows {
				if r.mess == MessRepeatedHeader {
					hdr++
					require.Equal(t, up.Names(), rawTexts(r.cells))
				}
			}
			require.Equal(t, 1, hdr)
			data, err := up.CSV(CSVStyle{})
			require.NoError(t, err)
			require.False(t, bytes.HasSuffix(data, []byte("\n")), "the file ends inside its last line")
			require.True(t, strings.Contains(string(data), "\n\n") || strings.Contains(string(data), "\n,,,\n"), "a blank line")
			// Source: RFC 4180 §2 rule 4, each line has the same number of
			// fields; a reader that holds to it refuses a file cut before
			// its last field.
			_, _, err = fixtures.ReadBytes("upload.csv", data, fixtures.AllText())
			if last.cut < up.NumCols() {
				require.ErrorContains(t, err, "fields, want")
			}
		}
	}
}

func rawTexts(cells []Messy) []string {
	out := make([]string, len(cells))
	for i, c := range cells {
		out[i] = c.Raw
	}
	return out
}

func TestTotalRowSumsTheFile(t *testing.T) {
	opts := Options{Mess: None, NullRate: 0.1, Also: []Mess{MessTotalRow}, UploadRate: 1, Locale: "de-DE"}
	for seed := int64(1); seed <= 20; seed++ {
		s, err := Generate(logs, 80, seed, opts)
		require.NoError(t, err)
		last := s.rows[len(s.rows)-1]
		require.Equal(t, MessTotalRow, last.mess)
		require.Equal(t, "Summe", last.cells[0].Raw, "the total word of the house column's locale")
		want := new(big.Rat)
		for _, r := range s.rows[:len(s.rows)-1] {
			if v, ok := ratOf(r.cells[3].Clean); ok {
				want.Add(want, v)
			}
		}
		got, ok := new(big.Rat).SetString(last.cells[3].Raw)
		require.True(t, ok, last.cells[3].Raw)
		require.Zero(t, want.Cmp(got), "the cost total")
		require.True(t, last.cells[1].IsNull(), "no total of dates")
		// The loader reads the total row as a row; Raw holds it too.
		data, err := s.CSV(CSVStyle{})
		require.NoError(t, err)
		back, _, err := fixtures.ReadBytes("s.csv", data, fixtures.AllText())
		require.NoError(t, err)
		requireSame(t, s.Raw(), back)
	}
}

// A chain that knows the upload messes: it drops header lines, total rows,
// blank rows and repeated rows. MatchesClean holds for it on every sample;
// a chain that only types the columns fails.
func TestMatchesCleanHoldsOverUploadMesses(t *testing.T) {
	opts := Options{Mess: None, NullRate: -1, Also: []Mess{MessReupload, MessRepeatedHeader, MessTotalRow, MessBlankLines},
		Uploads: 3, Seed: 4, Runs: 40, MinRows: 5}
	tidy := func(in *fixtures.Table) (*fixtures.Table, error) {
		b := fixtures.NewBuilder(fixtures.Schema{fixtures.Col("house", fixtures.String), fixtures.Col("day", fixtures.String)})
		seen := map[string]bool{}
		h, d := in.Column("house"), in.Column("day")
		for i := 0; i < in.NumRows(); i++ {
			if h.IsNull(i) || d.IsNull(i) || h.Str(i) == "house" || h.Str(i) == "Total" {
				continue
			}
			key := h.Str(i) + "|" + d.Str(i) + "|" + in.Column("kept").Str(i)
			if seen[key] {
				continue
			}
			seen[key] = true
			b.Row(h.Str(i), d.Str(i))
		}
		return b.Build()
	}
	ref := func(clean *fixtures.Table) (*fixtures.Table, error) {
		b := fixtures.NewBuilder(fixtures.Schema{fixtures.Col("house", fixtures.String), fixtures.Col("day", fixtures.String)})
		for i := 0; i < clean.NumRows(); i++ {
			b.Row(clean.Column("house").Str(i), clean.Column("day").Format(i))
		}
		return b.Build()
	}
	ft := &fakeT{name: "TestTidy"}
	require.True(t, Check(ft, logs, tidy, opts, MatchesClean(ref, assert.AnyRowOrder())), ft.text())
	naive := func(in *fixtures.Table) (*fixtures.Table, error) {
		return in.Select("house", "day")
	}
	ft = &fakeT{name: "TestNaive"}
	require.False(t, Check(ft, logs, naive, opts, MatchesClean(ref, assert.AnyRowOrder())))
	require.True(t, strings.Contains(ft.text(), "paste it into a test"))
}

// The CSV of a series with every upload mess but a cut line reads back as
// the Raw table: headers and totals are rows, empty lines are skipped,
// lines of empty fields are rows of nulls.
func TestUploadMessesRoundTripThroughTheLoader(t *testing.T) {
	// As in TestCSVRoundTripsThroughTheLoader, no stray Windows-1252 or
	// invalid bytes in UTF-8 files, which the loader decodes per line.
	opts := Options{Mess: Heavy, Avoid: []Mess{MessInvalidUTF8, MessWindows1252, MessLineEndings},
		Also: []Mess{MessReupload, MessAddedColumn, MessRepeatedHeader, MessTotalRow, MessBlankLines}, UploadRate: 0.7}
	for seed := int64(1); seed <= 3; seed++ {
		for _, st := range allStyles() {
			f, err := GenerateFile(logs, 50, seed, opts, st)
			require.NoError(t, err)
			back, _, err := fixtures.ReadBytes(f.Name(), f.Data, fixtures.AllText())
			require.NoError(t, err, "seed %d, %s", seed, st)
			requireSame(t, f.Sample.Raw(), back)
		}
	}
}
