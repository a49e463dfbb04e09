package assert

import (
	"fmt"
	"math"
	"strings"
	"testing"

	"github.com/stretchr/testify/require"

	"github.com/proofsheet/proofsheet/fixtures"
	"github.com/proofsheet/proofsheet/internal/textwidth"
)

// seriesTables builds want and got with n rows keyed by id 0..n-1, a float
// column v (want i, got from gotV) and a category column status.
func seriesTables(t *testing.T, n int, gotV func(i int) float64, wantStatus, gotStatus func(i int) string) (*fixtures.Table, *fixtures.Table) {
	t.Helper()
	schema := fixtures.Schema{fixtures.Col("id", fixtures.Int64), fixtures.Col("v", fixtures.Float64), fixtures.Col("status", fixtures.Category)}
	wb, gb := fixtures.NewBuilder(schema), fixtures.NewBuilder(schema)
	for i := range n {
		wb.Row(int64(i), float64(i), wantStatus(i))
		gb.Row(int64(i), gotV(i), gotStatus(i))
	}
	w, err := wb.Build()
	require.NoError(t, err)
	g, err := gb.Build()
	require.NoError(t, err)
	return w, g
}

func TestOverviewStrip(t *testing.T) {
	ok := func(int) string { return "ok" }
	// Rows 900..999 of 1000 differ: the last tenth of the row order.
	w, g := seriesTables(t, 1000, func(i int) float64 {
		if i >= 900 {
			return float64(i) + 1
		}
		return float64(i)
	}, ok, ok)
	d := Compare(w, g)
	s := d.Overview.Strip
	require.Equal(t, StripByRow, s.Order)
	require.Equal(t, 1000, s.Rows)
	require.Len(t, s.Bins, StripBins)
	total := 0
	for b, bin := range s.Bins {
		total += bin.Differing
		if b < 90 {
			require.Zero(t, bin.Differing, "bin %d", b)
		} else {
			require.Equal(t, 10, bin.Differing, "bin %d", b)
		}
	}
	require.Equal(t, d.RowsDiffering, total)
	require.Equal(t, "row 1", s.Bins[0].From)
	require.Equal(t, "row 901", s.Bins[90].From)

	// By key, with the rows shuffled: the differing keys are still the
	// last tenth of the key order, and the missing and extra keys lie
	// where their keys sort.
	perm := make([]int, 1000)
	for i := range perm {
		perm[i] = (i * 7919) % 1000 // 7919 is prime, so this is a permutation
	}
	shuffled, err := g.Take(perm)
	require.NoError(t, err)
	d = Compare(w, shuffled, ByKey("id"))
	s = d.Overview.Strip
	require.Equal(t, StripByKey, s.Order)
	late, early := 0, 0
	for _, bin := range s.Bins {
		if bin.Differing > 0 && !strings.HasPrefix(bin.From, "(8") && !strings.HasPrefix(bin.From, "(9") {
			early += bin.Differing
		}
		late += bin.Differing
	}
	require.Equal(t, 100, late)
	require.Zero(t, early, "every differing key is 8xx or 9xx: %+v", s.Bins)

	// Keys 100..199 missing from got, keys 2000..2009 extra in got.
	var keep []int
	for i := range 1000 {
		if i < 100 || i >= 200 {
			keep = append(keep, i)
		}
	}
	kept, err := w.Take(keep)
	require.NoError(t, err)
	_, extra := seriesTables(t, 2010, func(i int) float64 { return float64(i) }, ok, ok)
	tail, err := extra.Take([]int{2000, 2001, 2002, 2003, 2004, 2005, 2006, 2007, 2008, 2009})
	require.NoError(t, err)
	got2, err := fixtures.Concat(kept, tail)
	require.NoError(t, err)
	d = Compare(w, got2, ByKey("id"))
	require.Equal(t, 100, d.Missing.Count)
	require.Equal(t, 10, d.Extra.Count)
	s = d.Overview.Strip
	key := func(from string) int {
		var k int
		_, err := fmt.Sscanf(from, "(%d)", &k)
		require.NoError(t, err, from)
		return k
	}
	missingSum, extraSum := 0, 0
	for b, bin := range s.Bins {
		missingSum += bin.Missing
		extraSum += bin.Extra
		end := math.MaxInt
		if b+1 < len(s.Bins) {
			end = key(s.Bins[b+1].From)
		}
		if bin.Missing > 0 {
			require.True(t, key(bin.From) < 200 && end > 100, "missing keys in the stretch %d..%d", key(bin.From), end)
		}
		if bin.Extra > 0 {
			require.True(t, end > 2000, "extra keys in the stretch from %d", key(bin.From))
		}
	}
	require.Equal(t, 100, missingSum)
	require.Equal(t, 10, extraSum)

	// Equal tables have no overview.
	require.Nil(t, Compare(w, w).Overview)
}

func TestOverviewNumbers(t *testing.T) {
	ok := func(int) string { return "ok" }
	// got − want is i/100 for odd i: from 0.01 to 0.99, linear.
	w, g := seriesTables(t, 100, func(i int) float64 {
		if i%2 == 1 {
			return float64(i) + float64(i)/100
		}
		return float64(i)
	}, ok, ok)
	d := Compare(w, g, ByKey("id"), Tol("v", 0.005, 0))
	require.Len(t, d.Overview.Numbers, 1)
	n := d.Overview.Numbers[0]
	require.Equal(t, "v", n.Column)
	require.Equal(t, 50, n.Cells)
	require.False(t, n.Log, "two decades or less: equal-width bins")
	require.Equal(t, 0.005, n.Abs)
	sum := 0
	for _, b := range n.Bins {
		sum += b.Count
		require.Less(t, b.Lo, b.Hi)
	}
	require.Equal(t, 50, sum)
	require.InDelta(t, 0.01, n.Bins[0].Lo, 1e-9)
	require.InDelta(t, 0.99, n.Bins[len(n.Bins)-1].Hi, 1e-9)
	require.Len(t, n.Points, 50)

	// Differences from 1e-6 to 1e3, of both signs: decades.
	w, g = seriesTables(t, 20, func(i int) float64 {
		m := math.Pow(10, float64(i%10)-6)
		if i >= 10 {
			m = -m
		}
		return float64(i) + m
	}, ok, ok)
	d = Compare(w, g, ByKey("id"))
	n = d.Overview.Numbers[0]
	require.True(t, n.Log)
	sum, sawPositive := 0, false
	for _, b := range n.Bins {
		sum += b.Count
		if b.Lo > 0 {
			sawPositive = true
		} else {
			require.False(t, sawPositive, "the bins below zero come first")
			require.Less(t, b.Hi, 0.0)
		}
		wide, narrow := math.Max(math.Abs(b.Lo), math.Abs(b.Hi)), math.Min(math.Abs(b.Lo), math.Abs(b.Hi))
		require.InDelta(t, 10, wide/narrow, 1e-9, "a decade: %v", b)
	}
	require.Equal(t, 20, sum)

	// More differing cells than ScatterPoints: every k-th is kept.
	w, g = seriesTables(t, 2000, func(i int) float64 { return float64(i) * 1.5 }, ok, ok)
	d = Compare(w, g, ByKey("id"))
	n = d.Overview.Numbers[0]
	require.Equal(t, 1999, n.Cells, "row 0 is 0 on both sides")
	require.LessOrEqual(t, len(n.Points), ScatterPoints)
	require.Greater(t, len(n.Points), ScatterPoints/2)
	for _, p := range n.Points {
		require.Equal(t, p.Want*1.5, p.Got)
	}
}

func TestOverviewCategories(t *testing.T) {
	levels := []string{"ok", "fault", "gap"}
	w, g := seriesTables(t, 30, func(i int) float64 { return float64(i) },
		func(i int) string { return levels[i%3] },
		func(i int) string {
			if i%3 == 2 {
				return "sensor-gap" // gap renamed
			}
			if i < 6 && i%3 == 0 {
				return "fault"
			}
			return levels[i%3]
		})
	d := Compare(w, g, ByKey("id"))
	require.Len(t, d.Overview.Categories, 1)
	c := d.Overview.Categories[0]
	require.Equal(t, "status", c.Column)
	byLevel := map[string]LevelCount{}
	for _, l := range c.Levels {
		byLevel[l.Level] = l
	}
	require.Equal(t, LevelCount{Level: "gap", Want: 10, Got: 0, Removed: true}, byLevel["gap"])
	require.Equal(t, LevelCount{Level: "sensor-gap", Want: 0, Got: 10, Added: true}, byLevel["sensor-gap"])
	require.Equal(t, LevelCount{Level: "ok", Want: 10, Got: 8}, byLevel["ok"])
	require.Equal(t, LevelCount{Level: "fault", Want: 10, Got: 12}, byLevel["fault"])
	require.Equal(t, "gap", c.Levels[0].Level, "largest change first, ties in want's level order")
}

func TestOverviewSurvivesJSON(t *testing.T) {
	w, g := seriesTables(t, 50, func(i int) float64 { return float64(i) * 1.01 },
		func(int) string { return "ok" }, func(i int) string { return pick(i < 5, "fault", "ok") })
	d := Compare(w, g, ByKey("id"), Tol("v", 0.1, 0.001))
	js, err := d.JSON()
	require.NoError(t, err)
	back, err := DiffFromJSON(js)
	require.NoError(t, err)
	require.Equal(t, d.Overview, back.Overview)
	require.Equal(t, d.HTML(), back.HTML(), "the pictures of a stored diff are the same")
}

func TestPicturesInHTML(t *testing.T) {
	w, g := seriesTables(t, 40, func(i int) float64 { return float64(i) + float64(i%4)/10 },
		func(i int) string { return "ok" }, func(i int) string { return pick(i%5 == 0, "fault", "ok") })
	d := Compare(w, g, ByKey("id"), Tol("v", 0.15, 0))
	out := d.HTML()
	nodes := parseFragment(t, out)
	figs := byClass(nodes, "ps-figure")
	kinds := map[string]int{}
	for _, f := range figs {
		kinds[f.attrs["data-picture"]]++
	}
	require.Equal(t, map[string]int{"strip": 1, "histogram": 1, "scatter": 1, "levels": 1}, kinds)
	svgs := 0
	for _, n := range nodes {
		if n.name == "svg" {
			svgs++
			require.Equal(t, HTMLPicture, n.attrs["class"])
			require.Equal(t, "img", n.attrs["role"])
			require.NotEmpty(t, n.attrs["aria-label"])
		}
	}
	require.Equal(t, 4, svgs)
	require.Len(t, byClass(nodes, "ps-caption"), 4, "each picture says in words what it shows")
	// Drawn elements: bars, points, the diagonal, the band, strip marks,
	// level bars.
	require.NotEmpty(t, byClass(nodes, "ps-bar"))
	require.Len(t, byClass(nodes, "ps-pt"), 20, "rows with i%4 = 2 or 3 differ by 0.2 or 0.3, beyond 0.15")
	require.Len(t, byClass(nodes, "ps-diag"), 1)
	require.Len(t, byClass(nodes, "ps-band"), 1)
	require.NotEmpty(t, byClass(nodes, "ps-mark"))
	require.Len(t, byClass(nodes, "ps-level"), 4, "ok and fault, want and got")
	require.Contains(t, out, "<title>")
	require.Contains(t, out, "<desc>")
}

func TestOverviewOfExtremeFloats(t *testing.T) {
	want := fixtures.MustParse(t, "x:float64\n1e308\n-1e308\n0\nNaN\n+Inf\n5e-324\n1")
	got := fixtures.MustParse(t, "x:float64\n-1e308\n1e308\n5e-324\n1\n-Inf\n0\n~")
	d := Compare(want, got)
	require.NotPanics(t, func() { _ = d.HTML() })
	n := d.Overview.Numbers[0]
	require.Equal(t, 7, n.Cells+n.Others)
	require.Equal(t, 2, n.Cells, "the two subnormal steps; overflowing differences and non-numbers are left out")
	for _, b := range n.Bins {
		require.False(t, math.IsInf(b.Lo, 0) || math.IsNaN(b.Lo) || math.IsInf(b.Hi, 0) || math.IsNaN(b.Hi), "%v", b)
	}
}

// TestPictureWords checks the words the pictures draw: a long level name
// is shortened beside its bars and kept whole in its title and the
// caption; a log-scale bin names its smaller magnitude first on either
// side of zero; zero divides the decades below from those above.
func TestPictureWords(t *testing.T) {
	long := "sensor fault reported by the datalogger of the north bay"
	w, g := seriesTables(t, 20, func(i int) float64 {
		m := math.Pow(10, float64(i%5)-3)
		if i%2 == 0 {
			m = -m
		}
		return float64(i) + m
	}, func(int) string { return "ok" }, func(i int) string { return pick(i < 4, long, "ok") })
	d := Compare(w, g, ByKey("id"))
	out := d.HTML()
	label := textwidth.Truncate(long, levelLabelCols-len(" (added)")) + " (added)"
	require.Contains(t, label, "…")
	require.Contains(t, out, "<title>"+long+" (added)</title>"+label+"</text>")
	require.Contains(t, out, long+" (added) 0 → 4", "the caption names the level whole")

	n := d.Overview.Numbers[0]
	require.True(t, n.Log)
	for _, b := range n.Bins {
		text := binText(b, true, "want", "got")
		a, z := math.Abs(b.Lo), math.Abs(b.Hi)
		require.Contains(t, text, "from "+fmtNum(min(a, z))+" to "+fmtNum(max(a, z)), text)
	}
	require.Len(t, byClass(parseFragment(t, out), "ps-zero"), 1, "zero between the two sides")
}
