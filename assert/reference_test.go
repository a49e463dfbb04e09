package assert

import (
	"fmt"
	"math"
	"math/big"
	"strings"
	"time"

	"github.com/proofsheet/proofsheet/fixtures"
)

// The reference comparison: a slow, obviously correct statement of what
// Compare computes, one cell at a time, written from the documented rules
// (the doc comments of Compare, Tol, ULPs, TimeTol, NormText, NaNIsNull,
// LooseTypes, ByKey, AnyRowOrder, Delta and ColumnSummary) over the cells'
// Go values, with no bulk path, no bitmaps and no parallel work. The
// differential test and the fuzz target require Compare to agree with it
// on everything but the wording: counts, listed cells with their texts and
// distances, missing, extra and repeated rows, and every column's largest
// distances and where they sit.
//
// Where the largest distance sits: the first pair, in listing order (by
// want row; for AnyRowOrder by the pairs' want rows), whose distance equals
// the largest one, counting only distances above zero; a column whose
// distances are all zero (or that has none) names no row.

// refSummary is what the reference and a Diff are compared on, as text so
// that floats compare by their bits (NaN equal to NaN, −0 apart from +0).
type refSummary struct {
	Counts  string
	Cells   []string
	Missing []string
	Extra   []string
	Dups    []string
	Columns []string
}

func bitsOf(f float64) string { return fmt.Sprintf("%v(%#x)", f, math.Float64bits(f)) }

func refRow(want, got int, key []string) string {
	return fmt.Sprintf("w%d/g%d%q", want, got, key)
}

func refCellLine(r RowRef, col string, w, g Cell, d Delta) string {
	return fmt.Sprintf("%s %s | %q %v %v | %q %v %v | %v %s %s %v %d", refRow(r.Want, r.Got, r.Key), col,
		w.Text, w.Kind, w.Null, g.Text, g.Kind, g.Null, d.Has, bitsOf(d.Abs), bitsOf(d.Rel), d.HasULPs, d.ULPs)
}

func refColumnLine(name string, differing int, hasDelta bool, maxAbs float64, absAt RowRef, maxRel float64, relAt RowRef) string {
	return fmt.Sprintf("%s: %d %v abs %s at %s rel %s at %s", name, differing, hasDelta,
		bitsOf(maxAbs), refRow(absAt.Want, absAt.Got, absAt.Key), bitsOf(maxRel), refRow(relAt.Want, relAt.Got, relAt.Key))
}

// summarize reads a Diff into a refSummary.
func summarize(d *Diff) refSummary {
	s := refSummary{Counts: fmt.Sprintf("cells %d rows %d missing %d extra %d dups %d/%d", d.CellsDiffering, d.RowsDiffering,
		d.Missing.Count, d.Extra.Count, d.Duplicates.WantKeys, d.Duplicates.GotKeys)}
	for _, c := range d.Cells.All() {
		s.Cells = append(s.Cells, refCellLine(c.Row, c.Column, c.Want, c.Got, c.Delta))
	}
	for _, r := range d.Missing.Rows.All() {
		s.Missing = append(s.Missing, fmt.Sprintf("%s %q", refRow(r.Want, r.Got, r.Key), r.Cells))
	}
	for _, r := range d.Extra.Rows.All() {
		s.Extra = append(s.Extra, fmt.Sprintf("%s %q", refRow(r.Want, r.Got, r.Key), r.Cells))
	}
	for _, k := range d.Duplicates.Keys {
		s.Dups = append(s.Dups, fmt.Sprintf("%s %q %d %v", k.Side, k.Key, k.Count, k.Rows))
	}
	for _, c := range d.Columns {
		s.Columns = append(s.Columns, refColumnLine(c.Name, c.Differing, c.HasDelta, c.MaxAbs, c.MaxAbsAt, c.MaxRel, c.MaxRelAt))
	}
	return s
}

// refCol is a compared column of the reference.
type refCol struct {
	name   string
	wc, gc *fixtures.Column
	rule   floatRule
	tt     time.Duration
	hasTT  bool
	norm   TextNorm
	key    bool
}

// refComparable reports whether cells of the two kinds are compared at
// all (the same kind; text with text; int64 with float64; date with
// timestamp) and whether they have distances.
func refComparable(w, g fixtures.Kind) (ok, deltas bool) {
	num := func(k fixtures.Kind) bool { return k == fixtures.KindInt64 || k == fixtures.KindFloat64 }
	tm := func(k fixtures.Kind) bool { return k == fixtures.KindDate || k == fixtures.KindTimestamp }
	switch {
	case w == g:
		return true, w != fixtures.KindBool && !w.IsText()
	case w.IsText() && g.IsText():
		return true, false
	case num(w) && num(g), tm(w) && tm(g):
		return true, true
	}
	return false, false
}

// reference compares want and got the slow way. ok is false when the
// comparison has problems (then only Compare's Problems matter) or uses
// AnyRowOrder with tolerant columns, whose pairing is a search the
// reference does not repeat.
func reference(want, got *fixtures.Table, opts ...Option) (s refSummary, ok bool) {
	cfg := newConfig(opts)
	limit := cfg.limit
	listFull := func(n int) bool { return limit >= 0 && n >= limit }
	isKey := map[string]bool{}
	for _, k := range cfg.keys {
		isKey[k] = true
	}
	var cols []*refCol
	for _, f := range want.Schema() {
		gc := got.Column(f.Name)
		if gc == nil || (cfg.ignore[f.Name] && !isKey[f.Name]) {
			continue
		}
		wc := want.Column(f.Name)
		if ok, _ := refComparable(wc.Kind(), gc.Kind()); !ok {
			continue
		}
		c := &refCol{name: f.Name, wc: wc, gc: gc, rule: cfg.floatRuleFor(f.Name), norm: cfg.normFor(f.Name), key: isKey[f.Name]}
		c.tt, c.hasTT = cfg.timeTolFor(f.Name)
		cols = append(cols, c)
	}
	tolerant := func(c *refCol) bool {
		k := c.wc.Kind()
		if k == fixtures.KindFloat64 || c.gc.Kind() == fixtures.KindFloat64 {
			return c.rule.hasTol || c.rule.hasULP
		}
		if k == fixtures.KindDate || k == fixtures.KindTimestamp {
			return c.hasTT || c.wc.Kind() != c.gc.Kind()
		}
		return false
	}

	// Pair the rows: slots of (want row, got row), in listing order.
	type pair struct{ w, g int }
	var pairs []pair
	var missing, extra []int
	var dups []string
	var dupWant, dupGot int
	nw, ng := want.NumRows(), got.NumRows()
	var keyCols []*refCol
	switch cfg.mode {
	case byPosition:
		for i := range min(nw, ng) {
			pairs = append(pairs, pair{i, i})
		}
		for i := ng; i < nw; i++ {
			missing = append(missing, i)
		}
		for i := nw; i < ng; i++ {
			extra = append(extra, i)
		}
	case byKey, asMultiset:
		var match []*refCol
		if cfg.mode == byKey {
			for _, k := range cfg.keys {
				i := -1
				for j, c := range cols {
					if c.name == k {
						i = j
					}
				}
				if i < 0 {
					return s, false
				}
				match = append(match, cols[i])
			}
			keyCols = match
		} else {
			for _, c := range cols {
				if tolerant(c) {
					return s, false
				}
				match = append(match, c)
			}
		}
		canon := func(side Side, row int) string {
			var b strings.Builder
			for _, c := range match {
				col := c.wc
				if side == GotSide {
					col = c.gc
				}
				b.WriteString(refCanon(col, row, c.norm, cfg.nanIsNull))
				b.WriteString("\x00")
			}
			return b.String()
		}
		type group struct {
			first    int
			want     []int
			got      []int
			wantSeen bool
		}
		groups := map[string]*group{}
		var order []string // keys by first want appearance
		var gotOrder []string
		for i := range nw {
			k := canon(WantSide, i)
			g := groups[k]
			if g == nil {
				g = &group{first: i}
				groups[k] = g
				order = append(order, k)
			}
			g.want = append(g.want, i)
		}
		for j := range ng {
			k := canon(GotSide, j)
			g := groups[k]
			if g == nil {
				g = &group{first: -1}
				groups[k] = g
			}
			if len(g.got) == 0 {
				gotOrder = append(gotOrder, k)
			}
			g.got = append(g.got, j)
		}
		partner := make([]int, nw)
		gotPaired := make([]bool, ng)
		for i := range partner {
			partner[i] = -1
		}
		for _, g := range groups {
			for t := 0; t < len(g.want) && t < len(g.got); t++ {
				partner[g.want[t]] = g.got[t]
				gotPaired[g.got[t]] = true
			}
		}
		for i, j := range partner {
			if j < 0 {
				missing = append(missing, i)
			} else {
				pairs = append(pairs, pair{i, j})
			}
		}
		for j, ok := range gotPaired {
			if !ok {
				extra = append(extra, j)
			}
		}
		if cfg.mode == byKey {
			keyText := func(side Side, row int) []string {
				var out []string
				for _, c := range keyCols {
					out = append(out, fixtures.LiteralCell(pick(side == WantSide, c.wc, c.gc), row))
				}
				return out
			}
			dup := func(side Side, rows []int) {
				if !listFull(len(dups)) {
					shown := rows
					if limit >= 0 && len(shown) > limit {
						shown = shown[:limit]
					}
					dups = append(dups, fmt.Sprintf("%s %q %d %v", side, keyText(side, rows[0]), len(rows), shown))
				}
			}
			for _, k := range order {
				if g := groups[k]; len(g.want) > 1 {
					dupWant++
					dup(WantSide, g.want)
				}
			}
			for _, k := range gotOrder {
				if g := groups[k]; len(g.got) > 1 {
					dupGot++
					dup(GotSide, g.got)
				}
			}
		}
	}

	rowOf := func(p pair) RowRef {
		r := RowRef{Want: p.w, Got: p.g}
		for _, c := range keyCols {
			r.Key = append(r.Key, fixtures.LiteralCell(c.wc, p.w))
		}
		return r
	}
	differing := 0
	rowsDiffering := 0
	type colState struct {
		differing      int
		maxAbs, maxRel float64
		absAt, relAt   RowRef
	}
	states := make([]colState, len(cols))
	for j := range states {
		states[j].absAt, states[j].relAt = RowRef{Want: -1, Got: -1}, RowRef{Want: -1, Got: -1}
	}
	for _, p := range pairs {
		rowDiffers := false
		for j, c := range cols {
			if c.key || cfg.mode == asMultiset {
				continue
			}
			eq, d := refCell(c, p.w, p.g, cfg.nanIsNull)
			st := &states[j]
			if !eq {
				differing++
				st.differing++
				rowDiffers = true
				if !listFull(len(s.Cells)) {
					w, g := cellOf(c.wc, p.w), cellOf(c.gc, p.g)
					s.Cells = append(s.Cells, refCellLine(rowOf(p), c.name, w, g, d))
				}
			}
			if d.Has && d.Abs > st.maxAbs {
				st.maxAbs, st.absAt = d.Abs, rowOf(p)
			}
			if d.Has && d.Rel > st.maxRel {
				st.maxRel, st.relAt = d.Rel, rowOf(p)
			}
		}
		if rowDiffers {
			rowsDiffering++
		}
	}
	rowLine := func(side Side, row int) string {
		tb := pick(side == WantSide, want, got)
		var key, cells []string
		for _, c := range keyCols {
			key = append(key, fixtures.LiteralCell(pick(side == WantSide, c.wc, c.gc), row))
		}
		for j := range tb.NumCols() {
			cells = append(cells, fixtures.LiteralCell(tb.ColumnAt(j), row))
		}
		if side == WantSide {
			return fmt.Sprintf("%s %q", refRow(row, -1, key), cells)
		}
		return fmt.Sprintf("%s %q", refRow(-1, row, key), cells)
	}
	for _, i := range missing {
		if !listFull(len(s.Missing)) {
			s.Missing = append(s.Missing, rowLine(WantSide, i))
		}
	}
	for _, j := range extra {
		if !listFull(len(s.Extra)) {
			s.Extra = append(s.Extra, rowLine(GotSide, j))
		}
	}
	s.Dups = dups
	s.Counts = fmt.Sprintf("cells %d rows %d missing %d extra %d dups %d/%d", differing, rowsDiffering, len(missing), len(extra), dupWant, dupGot)
	for j, c := range cols {
		_, deltas := refComparable(c.wc.Kind(), c.gc.Kind())
		st := states[j]
		s.Columns = append(s.Columns, refColumnLine(c.name, st.differing, deltas, st.maxAbs, st.absAt, st.maxRel, st.relAt))
	}
	return s, true
}

// refCanon spells a cell so that cells ByKey and AnyRowOrder count as the
// same spell alike: text after its normalisation, numbers and times by
// value, null as itself (a null equals a null).
func refCanon(col *fixtures.Column, row int, norm TextNorm, nanIsNull bool) string {
	v := col.Value(row)
	if f, ok := v.(float64); ok && f != f && nanIsNull {
		v = nil
	}
	switch x := v.(type) {
	case nil:
		return "null"
	case string:
		if norm != 0 {
			x = normalize(x, norm)
		}
		return "s" + x
	case float64:
		switch {
		case x != x:
			return "nan"
		case x == 0:
			return "n0"
		case x == math.Trunc(x) && !math.IsInf(x, 0):
			// Every integral float spells its exact integer, as an int64
			// does: −2⁶³ is MinInt64 (a bound on |x| missed it).
			return "n" + new(big.Float).SetFloat64(x).Text('f', 0)
		}
		return "f" + new(big.Float).SetFloat64(x).Text('g', -1)
	case int64:
		return fmt.Sprintf("n%d", x)
	case time.Time:
		return fmt.Sprintf("t%d.%09d", x.Unix(), x.Nanosecond())
	case fixtures.Decimal:
		return "d" + x.Rat().RatString()
	}
	return fmt.Sprintf("%T%v", v, v)
}

// refCell compares cell wi of c's want column with cell gi of its got
// column: equal or not, and their distance.
func refCell(c *refCol, wi, gi int, nanIsNull bool) (bool, Delta) {
	wv, gv := c.wc.Value(wi), c.gc.Value(gi)
	if nanIsNull {
		if f, ok := wv.(float64); ok && f != f {
			wv = nil
		}
		if f, ok := gv.(float64); ok && f != f {
			gv = nil
		}
	}
	if wv == nil || gv == nil {
		return wv == nil && gv == nil, Delta{}
	}
	switch w := wv.(type) {
	case bool:
		return w == gv.(bool), Delta{}
	case string:
		g := gv.(string)
		return w == g || (c.norm != 0 && normalize(w, c.norm) == normalize(g, c.norm)), Delta{}
	case fixtures.Decimal:
		g := gv.(fixtures.Decimal)
		diff := new(big.Rat).Sub(w.Rat(), g.Rat())
		abs, _ := diff.Abs(diff).Float64()
		d := Delta{Has: true, Abs: abs}
		if abs != 0 {
			d.Rel = abs / math.Max(math.Abs(w.Float64()), math.Abs(g.Float64()))
		}
		return w.Rat().Cmp(g.Rat()) == 0, d
	case int64:
		if g, ok := gv.(int64); ok {
			diff := new(big.Int).Sub(big.NewInt(w), big.NewInt(g))
			abs, _ := new(big.Float).SetInt(diff.Abs(diff)).Float64()
			d := Delta{Has: true, Abs: abs}
			if abs != 0 {
				d.Rel = abs / math.Max(math.Abs(float64(w)), math.Abs(float64(g)))
			}
			return w == g, d
		}
		return refIntFloat(c, w, gv.(float64))
	case float64:
		if g, ok := gv.(int64); ok {
			return refIntFloat(c, g, w)
		}
		g := gv.(float64)
		return refFloatEqual(w, g, c.rule), refFloatDelta(w, g, c.rule)
	case time.Time:
		return refTimes(c, wi, gi, w, gv.(time.Time))
	}
	panic(fmt.Sprintf("reference: cell of type %T", wv))
}

// refIntFloat compares an int64 cell with a float64 cell by value: exact
// unless a rule allows slack, then the rule over the int as a float64.
func refIntFloat(c *refCol, iv int64, fv float64) (bool, Delta) {
	if fv != fv {
		return false, Delta{}
	}
	d := refFloatDelta(float64(iv), fv, c.rule)
	exact := !math.IsInf(fv, 0) && new(big.Float).SetInt64(iv).Cmp(new(big.Float).SetFloat64(fv)) == 0
	if exact {
		return true, d
	}
	if !c.rule.hasTol && !c.rule.hasULP {
		return false, d
	}
	return refFloatEqual(float64(iv), fv, c.rule), d
}

// refFloatEqual is the float rule, leaving nulls aside. Source: IEEE
// 754-2019 §5.11 for −0 = +0; the tolerance is PEP 485's math.isclose.
func refFloatEqual(w, g float64, r floatRule) bool {
	switch {
	case w != w || g != g:
		return w != w && g != g
	case w == g:
		return true
	case math.IsInf(w, 0) || math.IsInf(g, 0):
		return false
	case r.hasULP:
		return refULPs(w, g) <= r.ulps
	case r.hasTol:
		diff := math.Abs(w - g)
		return diff <= math.Max(r.abs, r.rel*math.Max(math.Abs(w), math.Abs(g)))
	}
	return false
}

// refULPs counts the float64 values from the smaller of a and b up to the
// larger, walking through zero (where −0 and +0 are one point): along one
// sign the count is the difference of the magnitudes' bit patterns (IEEE
// 754 orders the encodings of same-signed values like the values).
func refULPs(a, b float64) uint64 {
	ma, mb := math.Float64bits(math.Abs(a)), math.Float64bits(math.Abs(b))
	if math.Signbit(a) == math.Signbit(b) || ma == 0 || mb == 0 {
		if math.Signbit(a) != math.Signbit(b) { // one of them is ±0
			return ma + mb
		}
		if ma > mb {
			return ma - mb
		}
		return mb - ma
	}
	return ma + mb
}

func refFloatDelta(w, g float64, r floatRule) Delta {
	if w != w || g != g {
		return Delta{}
	}
	d := Delta{Has: true}
	switch {
	case w == g:
	case math.IsInf(w, 0) || math.IsInf(g, 0):
		d.Abs, d.Rel = math.Inf(1), math.Inf(1)
	default:
		d.Abs = math.Abs(w - g)
		d.Rel = d.Abs / math.Max(math.Abs(w), math.Abs(g))
	}
	if r.hasULP {
		d.ULPs, d.HasULPs = refULPs(w, g), true
	}
	return d
}

// refTimes compares dates and timestamps as instants (a date is midnight
// in the timestamp's zone, UTC against a date): equal when the same
// instant or, under TimeTol(d), when |w − g| ≤ d exactly. The distance is
// |w − g| counted in the finer unit of the two columns (days count as
// 86400 s), as a float64, divided by that unit's count per second.
func refTimes(c *refCol, wi, gi int, w, g time.Time) (bool, Delta) {
	unit := func(col *fixtures.Column) int64 { // nanoseconds
		if col.Kind() == fixtures.KindDate {
			return 86400e9
		}
		return int64(col.Type().Unit().Duration())
	}
	if c.wc.Kind() == fixtures.KindDate && c.gc.Kind() == fixtures.KindTimestamp {
		w = time.Date(w.Year(), w.Month(), w.Day(), 0, 0, 0, 0, g.Location())
	}
	if c.gc.Kind() == fixtures.KindDate && c.wc.Kind() == fixtures.KindTimestamp {
		g = time.Date(g.Year(), g.Month(), g.Day(), 0, 0, 0, 0, w.Location())
	}
	ns := func(t time.Time) *big.Int {
		x := new(big.Int).Mul(big.NewInt(t.Unix()), big.NewInt(1e9))
		return x.Add(x, big.NewInt(int64(t.Nanosecond())))
	}
	diff := new(big.Int).Sub(ns(w), ns(g))
	diff.Abs(diff)
	eq := diff.Sign() == 0 || (c.hasTT && diff.Cmp(big.NewInt(int64(c.tt))) <= 0)
	u := min(unit(c.wc), unit(c.gc))
	perSecond := float64(1e9 / u)
	if u == 86400e9 {
		days, _ := new(big.Float).SetInt(new(big.Int).Quo(diff, big.NewInt(u))).Float64()
		return eq, Delta{Has: true, Abs: days * 86400}
	}
	units, _ := new(big.Float).SetInt(new(big.Int).Quo(diff, big.NewInt(u))).Float64()
	return eq, Delta{Has: true, Abs: units / perSecond}
}
