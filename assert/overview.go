package assert

import (
	"cmp"
	"math"
	"math/bits"
	"slices"
	"strings"

	"github.com/proofsheet/proofsheet/fixtures"
)

// Overview is the shape of the differences as a few numbers per table and
// column, for pictures (the HTML renderer draws it) and for tools: where
// the differing, missing and extra rows lie, how the differences of each
// number column are spread, and how the levels of each category column
// moved. Compare fills it from the whole tables when they differ; its
// size does not grow with them.
type Overview struct {
	// Strip says where the rows with differences lie along the tables.
	Strip RowStrip
	// Numbers has one entry per compared number column with differing
	// cells, in want's column order.
	Numbers []NumberShape
	// Categories has one entry per category column whose levels or
	// level counts changed, in want's column order.
	Categories []CategoryShape
}

// StripBins is how many stretches a RowStrip cuts the rows into.
const StripBins = 100

// The orders a RowStrip can follow.
const (
	StripByKey = "key" // rows in the order of their keys (rows matched by key)
	StripByRow = "row" // rows in table order (want's; got's for extra rows in any-order matching)
)

// RowStrip cuts the rows into StripBins stretches of about equal size, in
// key order or row order, and counts the differing, missing and extra
// rows in each.
type RowStrip struct {
	// Order is StripByKey or StripByRow.
	Order string
	// Rows is how many rows the strip spans.
	Rows int
	// Bins are the stretches, first to last: StripBins of them, fewer for
	// tables of fewer rows; empty when no row differs.
	Bins []StripBin
}

// StripBin is one stretch of rows.
type StripBin struct {
	// From names where the stretch starts: a key ("(Étang, 2026-04-01)")
	// or a row number ("row 101").
	From string `json:"from"`
	// Differing, Missing and Extra count the rows of the stretch with
	// differing cells, and the missing and extra rows in it.
	Differing int `json:"differing"`
	Missing   int `json:"missing"`
	Extra     int `json:"extra"`
}

// NumberShape is the spread of the differences of one number column: a
// histogram of got − want over its differing cells and a sample of the
// (want, got) pairs, with the column's tolerance.
type NumberShape struct {
	Column string
	// Cells is how many differing cells the shape covers: both values
	// finite numbers, and their difference too. Others counts the
	// differing cells left out (a null, NaN or an infinity on a side).
	Cells, Others int
	// Log says the histogram's bins are decades of |got − want| on each
	// side of zero (the differences span more than two decades); else
	// they are of equal width.
	Log bool
	// Bins is the histogram of got − want, lowest first.
	Bins []DeltaBin
	// Points are up to ScatterPoints (want, got) pairs, every k-th
	// differing cell in row order.
	Points []Point
	// Abs and Rel are the column's tolerance (Tol), 0 when exact or
	// compared in ULPs.
	Abs, Rel float64
}

// maxDecades is the most decades a log histogram spans on each side of
// zero.
const maxDecades = 24

// ScatterPoints is the most (want, got) pairs a NumberShape keeps.
const ScatterPoints = 400

// DeltaBin is one bin of a histogram of differences: the cells with Lo ≤
// got − want < Hi (≤ Hi for the last bin).
type DeltaBin struct {
	Lo, Hi float64
	Count  int
}

// Point is a want value and its got value.
type Point struct{ Want, Got float64 }

// CategoryShape is how the levels of a category column moved — or the
// values of a text column with differing cells and at most 64 distinct
// values on a side: the rows of each level on both sides, for the levels
// added, removed or whose count changed (at most CategoryLevels of them,
// largest change first).
type CategoryShape struct {
	Column string
	Levels []LevelCount
	// More counts the changed levels left out.
	More int
}

// CategoryLevels is the most levels a CategoryShape lists.
const CategoryLevels = 24

// LevelCount is one level of a category column and its rows on each
// side. Added says only got has the level, Removed only want.
type LevelCount struct {
	Level   string `json:"level"`
	Want    int    `json:"want"`
	Got     int    `json:"got"`
	Added   bool   `json:"added"`
	Removed bool   `json:"removed"`
}

// overview fills the Diff's Overview from the whole tables.
func (c *comparison) overview() {
	d := c.d
	d.Overview = &Overview{}
	c.strip(&d.Overview.Strip)
	for j, cc := range c.cols {
		if j >= len(c.results) || cc.skip {
			continue
		}
		number := cc.class == classFloat || cc.class == classIntFloat || cc.class == classDecimal ||
			cc.class == classInt && cc.wc.Kind() == fixtures.KindInt64 // not times of day or durations
		if r := c.results[j]; r.differing > 0 && number {
			d.Overview.Numbers = append(d.Overview.Numbers, c.numberShape(cc, r))
		}
	}
	for j, cc := range c.cols {
		if cc.class != classText || cc.skip {
			continue
		}
		// Category columns always; text columns with differing cells
		// when they hold few distinct values, as a category would.
		cats := cc.wc.Kind() == fixtures.KindCategory && cc.gc.Kind() == fixtures.KindCategory
		if !cats && (j >= len(c.results) || c.results[j].differing == 0) {
			continue
		}
		if s, ok := categoryShape(cc); ok {
			d.Overview.Categories = append(d.Overview.Categories, s)
		}
	}
}

// strip places the differing, missing and extra rows along the tables.
func (c *comparison) strip(s *RowStrip) {
	d := c.d
	if d.RowsDiffering+d.Missing.Count+d.Extra.Count == 0 {
		return
	}
	if c.cfg.mode == byKey && len(c.keyCols) > 0 {
		c.keyStrip(s)
		return
	}
	s.Order = StripByRow
	nw, ng := c.want.NumRows(), c.got.NumRows()
	s.Rows = max(nw, ng, 1)
	nb := min(StripBins, s.Rows)
	s.Bins = make([]StripBin, nb)
	bin := func(i, n int) int { return min(nb-1, i*nb/max(n, 1)) }
	c.eachDiffering(func(wi int) { s.Bins[bin(wi, s.Rows)].Differing++ })
	if c.tail {
		for i := c.tailFrom; i < nw; i++ {
			s.Bins[bin(i, s.Rows)].Missing++
		}
		for i := c.tailFrom; i < ng; i++ {
			s.Bins[bin(i, s.Rows)].Extra++
		}
	} else {
		for _, wi := range c.missingRows {
			s.Bins[bin(int(wi), nw)].Missing++
		}
		for _, gi := range c.extraRows {
			s.Bins[bin(int(gi), ng)].Extra++
		}
	}
	for b := range s.Bins {
		s.Bins[b].From = "row " + rowNumber(b*s.Rows/nb)
	}
}

// eachDiffering calls f with the want row of every pair with a differing
// cell, in pair order.
func (c *comparison) eachDiffering(f func(wi int)) {
	for k, word := range c.diffRows {
		for word != 0 {
			slot := k*64 + bits.TrailingZeros64(word)
			word &= word - 1
			wi, _ := c.pairs.at(slot)
			f(wi)
		}
	}
}

// stripSample is how many keys of each side the key strip sorts to find
// the stretch boundaries.
const stripSample = 2048

// keyStrip cuts the keys of both tables into stretches of about equal
// size (boundaries from a sorted, evenly spaced sample of the keys) and
// places each marked row by its key.
func (c *comparison) keyStrip(s *RowStrip) {
	s.Order = StripByKey
	nw, ng := c.want.NumRows(), c.got.NumRows()
	s.Rows = ng + c.d.Missing.Count // the keys of both tables, near enough
	type ref struct {
		side Side
		row  int
	}
	var sample []ref
	for _, side := range []struct {
		s Side
		n int
	}{{WantSide, nw}, {GotSide, ng}} {
		step := max(1, side.n/stripSample)
		for i := 0; i < side.n; i += step {
			sample = append(sample, ref{side.s, i})
		}
	}
	slices.SortStableFunc(sample, func(a, b ref) int { return c.keyCompare(a.side, a.row, b.side, b.row) })
	var bounds []ref // bounds[b]: the first key of stretch b, each key once
	for b := range StripBins {
		x := sample[b*len(sample)/StripBins]
		if len(bounds) == 0 || c.keyCompare(bounds[len(bounds)-1].side, bounds[len(bounds)-1].row, x.side, x.row) < 0 {
			bounds = append(bounds, x)
		}
	}
	s.Bins = make([]StripBin, len(bounds))
	locate := func(side Side, row int) int {
		// The last stretch whose first key is ≤ the row's key.
		i, _ := slices.BinarySearchFunc(bounds[1:], ref{side, row}, func(bd, x ref) int {
			if c.keyCompare(bd.side, bd.row, x.side, x.row) <= 0 {
				return -1
			}
			return 1
		})
		return i
	}
	c.eachDiffering(func(wi int) { s.Bins[locate(WantSide, wi)].Differing++ })
	for _, wi := range c.missingRows {
		s.Bins[locate(WantSide, int(wi))].Missing++
	}
	for _, gi := range c.extraRows {
		s.Bins[locate(GotSide, int(gi))].Extra++
	}
	for b, bd := range bounds {
		s.Bins[b].From = "(" + strings.Join(c.keyText(bd.side, bd.row), ", ") + ")"
	}
}

// keyCompare orders two rows by their key cells: nulls first, then by
// value (text by bytes, categories by their text, numbers, dates and
// instants by value).
func (c *comparison) keyCompare(as Side, ai int, bs Side, bi int) int {
	for _, k := range c.keyCols {
		a, b := pick(as == WantSide, k.wc, k.gc), pick(bs == WantSide, k.wc, k.gc)
		an, bn := a.IsNull(ai), b.IsNull(bi)
		switch {
		case an && bn:
			continue
		case an:
			return -1
		case bn:
			return 1
		}
		var r int
		switch a.Kind() {
		case fixtures.KindBool:
			r = cmp.Compare(boolInt(a.Bool(ai)), boolInt(b.Bool(bi)))
		case fixtures.KindInt64:
			r = cmp.Compare(a.Int64(ai), b.Int64(bi))
		case fixtures.KindDate:
			r = cmp.Compare(a.Days(ai), b.Days(bi))
		case fixtures.KindTimestamp:
			r = a.Time(ai).Compare(b.Time(bi))
		case fixtures.KindTime, fixtures.KindDuration:
			r = cmp.Compare(a.Ticks(ai), b.Ticks(bi))
		case fixtures.KindDecimal:
			r = a.Decimal(ai).Cmp(b.Decimal(bi))
		default:
			r = strings.Compare(a.Str(ai), b.Str(bi))
		}
		if r != 0 {
			return r
		}
	}
	return 0
}

func boolInt(b bool) int {
	if b {
		return 1
	}
	return 0
}

// keptPairs bounds how many differing cells' values numberShape keeps
// between its passes (16 bytes each).
const keptPairs = 1 << 20

// numberShape measures the differing cells of a number column.
func (c *comparison) numberShape(cc *colCmp, r *colResult) NumberShape {
	s := NumberShape{Column: cc.name}
	if cc.rule.hasTol {
		s.Abs, s.Rel = cc.rule.abs, cc.rule.rel
	}
	value := func(col *fixtures.Column, i int) (float64, bool) {
		if col.IsNull(i) {
			return 0, false
		}
		switch col.Kind() {
		case fixtures.KindInt64:
			return float64(col.Int64(i)), true
		case fixtures.KindDecimal:
			return col.Decimal(i).Float64(), true
		}
		f := col.Float64(i)
		return f, !math.IsNaN(f) && !math.IsInf(f, 0)
	}
	// Every differing cell, in slot order: the column's own bitmap. The
	// cells lie at random places of both tables, so the first pass keeps
	// their values (up to keptPairs of them) and the later passes read
	// those instead of the tables again.
	var kept []float64 // w, g of each usable cell, in order
	keeping, fromKept := r.differing <= keptPairs, false
	each := func(f func(w, g float64)) {
		if fromKept {
			for t := 0; t+1 < len(kept); t += 2 {
				f(kept[t], kept[t+1])
			}
			return
		}
		for k, word := range r.rows {
			for word != 0 {
				slot := r.rowsBase + k*64 + bits.TrailingZeros64(word)
				word &= word - 1
				wi, gi := c.pairs.at(slot)
				w, wok := value(cc.wc, wi)
				g, gok := value(cc.gc, gi)
				if dv := g - w; wok && gok && !math.IsInf(dv, 0) {
					if keeping {
						kept = append(kept, w, g)
					}
					f(w, g)
				}
			}
		}
		fromKept, keeping = keeping, false
	}
	lo, hi := math.Inf(1), math.Inf(-1)
	minAbs := math.Inf(1)
	each(func(w, g float64) {
		dv := g - w
		s.Cells++
		lo, hi = min(lo, dv), max(hi, dv)
		if dv != 0 {
			minAbs = min(minAbs, math.Abs(dv))
		}
	})
	s.Others = r.differing - s.Cells
	if s.Cells == 0 {
		return s
	}
	// Decades when the differences span more than two of them.
	maxAbs := max(math.Abs(lo), math.Abs(hi))
	s.Log = !math.IsInf(minAbs, 1) && maxAbs/minAbs > 100
	if s.Log {
		eLo, eHi := math.Floor(math.Log10(minAbs)), math.Floor(math.Log10(maxAbs))
		eLo = max(eLo, eHi-maxDecades+1) // smaller differences join the lowest bin
		var negs, pos []DeltaBin
		for e := eLo; e <= eHi; e++ {
			a, b := math.Pow(10, e), math.Pow(10, e+1)
			if lo < 0 {
				negs = append(negs, DeltaBin{Lo: -b, Hi: -a})
			}
			if hi > 0 {
				pos = append(pos, DeltaBin{Lo: a, Hi: b})
			}
		}
		slices.Reverse(negs)
		s.Bins = append(negs, pos...)
		each(func(w, g float64) {
			dv := g - w
			if dv == 0 {
				return
			}
			e := math.Floor(math.Log10(math.Abs(dv)))
			k := int(min(max(e, eLo), eHi) - eLo)
			if dv < 0 {
				s.Bins[len(negs)-1-k].Count++
			} else {
				s.Bins[len(negs)+k].Count++
			}
		})
	} else {
		const n = 24
		width := (hi - lo) / n
		if width == 0 || math.IsInf(width, 0) {
			width = 0
			s.Bins = []DeltaBin{{Lo: lo, Hi: hi}}
		} else {
			for b := 0; b < n; b++ {
				s.Bins = append(s.Bins, DeltaBin{Lo: lo + float64(b)*width, Hi: lo + float64(b+1)*width})
			}
			s.Bins[n-1].Hi = hi
		}
		each(func(w, g float64) {
			b := 0
			if x := (g - w - lo) / width; width > 0 && x >= 0 { // NaN fails x ≥ 0
				b = min(len(s.Bins)-1, int(x))
			}
			s.Bins[b].Count++
		})
	}
	step := max(1, (s.Cells+ScatterPoints-1)/ScatterPoints)
	i := 0
	each(func(w, g float64) {
		if i%step == 0 && len(s.Points) < ScatterPoints {
			s.Points = append(s.Points, Point{w, g})
		}
		i++
	})
	return s
}

// levelsMax is the most distinct values a text column may hold on a side
// to be drawn as levels.
const levelsMax = 64

// categoryShape counts the rows of each level (distinct value) of a text
// column on both sides and keeps the levels that were added, removed or
// changed. A category column's levels are those it declares; a string
// column's are its values, and it has no shape when it holds more than
// levelsMax of them.
func categoryShape(cc *colCmp) (CategoryShape, bool) {
	count := func(col *fixtures.Column) (map[string]int, []string, bool) {
		if col.Kind() == fixtures.KindCategory {
			perCode := make([]int, col.NumLevels())
			for i := range col.Len() {
				if !col.IsNull(i) {
					perCode[col.Code(i)]++
				}
			}
			out := make(map[string]int, len(perCode))
			for code, n := range perCode {
				out[col.Level(code)] += n
			}
			return out, col.Levels(), true
		}
		out := map[string]int{}
		var order []string
		for i := range col.Len() {
			if col.IsNull(i) {
				continue
			}
			s := col.Str(i)
			if _, ok := out[s]; !ok {
				if len(order) == levelsMax {
					return nil, nil, false
				}
				order = append(order, s)
			}
			out[s]++
		}
		return out, order, true
	}
	wn, wLevels, ok1 := count(cc.wc)
	gn, gLevels, ok2 := count(cc.gc)
	if !ok1 || !ok2 {
		return CategoryShape{}, false
	}
	wl, gl := map[string]bool{}, map[string]bool{}
	for _, l := range wLevels {
		wl[l] = true
	}
	for _, l := range gLevels {
		gl[l] = true
	}
	var levels []LevelCount
	seen := map[string]bool{}
	add := func(l string) {
		if seen[l] {
			return
		}
		seen[l] = true
		lc := LevelCount{Level: l, Want: wn[l], Got: gn[l], Added: !wl[l], Removed: !gl[l]}
		if lc.Want != lc.Got || lc.Added || lc.Removed {
			levels = append(levels, lc)
		}
	}
	for _, l := range wLevels {
		add(l)
	}
	for _, l := range gLevels {
		add(l)
	}
	if len(levels) == 0 {
		return CategoryShape{}, false
	}
	slices.SortStableFunc(levels, func(a, b LevelCount) int {
		return cmp.Compare(absInt(b.Got-b.Want), absInt(a.Got-a.Want))
	})
	s := CategoryShape{Column: cc.name}
	if len(levels) > CategoryLevels {
		s.More = len(levels) - CategoryLevels
		levels = levels[:CategoryLevels]
	}
	s.Levels = levels
	return s, true
}

func absInt(x int) int {
	if x < 0 {
		return -x
	}
	return x
}
