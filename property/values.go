package property

import (
	"math/big"
	"slices"
	"strings"
	"time"
	"unicode/utf8"

	"github.com/proofsheet/proofsheet/fixtures"
)

// Value shrinking: once rows, columns and spellings are as small as they
// get, each clean value is offered simpler ones that keep to its column's
// rules — numbers toward 0 (or the bound nearest it), then 1, whole
// numbers and fewer decimals, halfway steps; strings shorter; dates and
// timestamps toward the epoch day 1970-01-01 (or the bound nearest it);
// categories and allowed values toward the first; bools toward false. A
// changed value changes every raw row of its record, keeps the cell's mess
// when the new value can carry it (else it is spelled plainly), and
// recomputes the columns derived from it.

// valueCandidates returns simpler clean values for record k's value in
// schema column f, simplest first; none for a sample built by hand.
func (s *Sample) valueCandidates(k, f int) []any {
	if s.cfg == nil || f >= len(s.cfg.cols) {
		return nil
	}
	cc := s.cfg.cols[f]
	if cc.derive != nil || cc.unique == Sequential || cc.unique == Gapped {
		return nil // derived values follow their inputs; sequences renumber as a whole
	}
	x := s.recs[k][f]
	if x == nil {
		return nil
	}
	t := s.Schema[f].Type
	var out []any
	add := func(v any) {
		if v == nil || !simpler(v, x, cc) || slices.ContainsFunc(out, func(o any) bool { return sameClean(o, v) }) {
			return
		}
		if cc.unique != AnyValues && s.valueTaken(f, k, v) {
			return
		}
		out = append(out, v)
	}
	// Allowed values and levels: the ones listed before x, first first.
	var listed []any
	switch {
	case len(cc.choices) > 0:
		for _, ch := range cc.choices {
			listed = append(listed, ch.clean)
		}
	case t.Kind() == fixtures.KindCategory:
		names := s.cfg.levels[s.Schema[f].Name]
		if names == nil {
			names = houseNames
		}
		for _, n := range names {
			listed = append(listed, n)
		}
	}
	if listed != nil {
		for _, v := range listed {
			if sameClean(v, x) {
				break
			}
			if cc.unique == AnyValues || !s.valueTaken(f, k, v) {
				out = append(out, v)
			}
		}
		return out
	}
	switch t.Kind() {
	case fixtures.KindBool:
		add(false)
	case fixtures.KindInt64, fixtures.KindFloat64, fixtures.KindDecimal:
		r, ok := ratOf(x)
		if !ok {
			return nil
		}
		for _, c := range numberCandidates(r, cc) {
			add(cleanNumber(c, t, cc))
		}
	case fixtures.KindDate, fixtures.KindTimestamp:
		for _, c := range timeCandidates(x.(time.Time), t, cc) {
			add(c)
		}
	case fixtures.KindString:
		g := s.colGen(f)
		for _, c := range stringCandidates(x.(string), cc) {
			if g != nil && g.isToken(c) {
				continue
			}
			add(c)
		}
	}
	return out
}

// valueTaken reports whether another kept record holds v in column f.
func (s *Sample) valueTaken(f, k int, v any) bool {
	for _, r := range s.keptRecords() {
		if r != k && sameClean(s.recs[r][f], v) {
			return true
		}
	}
	return false
}

func sameClean(a, b any) bool {
	switch x := a.(type) {
	case fixtures.Decimal:
		y, ok := b.(fixtures.Decimal)
		return ok && x.Cmp(y) == 0
	case time.Time:
		y, ok := b.(time.Time)
		return ok && x.Equal(y)
	}
	return a == b
}

// target returns the simplest number of a column: 0, or the bound nearest
// to it.
func target(cc *colConf) *big.Rat {
	t := new(big.Rat)
	if cc.bounded {
		if cc.lo.Sign() > 0 {
			t.Set(cc.lo)
		} else if cc.hi.Sign() < 0 {
			t.Set(cc.hi)
		}
	}
	return t
}

// within reports whether r keeps to the column's bounds and decimals.
func within(r *big.Rat, cc *colConf) bool {
	if cc.bounded && (r.Cmp(cc.lo) < 0 || r.Cmp(cc.hi) > 0) {
		return false
	}
	return decimalsOf(r) <= cc.maxDec
}

// decimalsOf returns the fractional digits r needs: the larger count of
// the factors 2 and 5 in its denominator, or 99 when it has another
// factor (a fraction that never ends).
func decimalsOf(r *big.Rat) int {
	d := new(big.Int).Set(r.Denom())
	count := func(p int64) int {
		n := 0
		m := new(big.Int)
		for {
			q, rem := new(big.Int).QuoRem(d, big.NewInt(p), m)
			if rem.Sign() != 0 {
				return n
			}
			d = q
			n++
		}
	}
	twos, fives := count(2), count(5)
	if d.Cmp(big.NewInt(1)) != 0 {
		return 99
	}
	return max(twos, fives)
}

// numberCandidates lists simpler numbers for x, simplest first.
func numberCandidates(x *big.Rat, cc *colConf) []*big.Rat {
	t := target(cc)
	var out []*big.Rat
	add := func(r *big.Rat) {
		if !within(r, cc) {
			return
		}
		for _, o := range out {
			if o.Cmp(r) == 0 {
				return
			}
		}
		out = append(out, r)
	}
	add(t)
	if x.Sign() < 0 {
		add(big.NewRat(-1, 1))
	}
	add(big.NewRat(1, 1))
	// Whole, then one decimal, cut toward zero.
	for _, d := range []int{0, 1, 2} {
		if decimalsOf(x) > d {
			add(truncRat(x, d))
		}
	}
	// One and two significant digits: 1474 → 1000, 1400.
	for _, n := range []int{1, 2} {
		if c := sigTrunc(x, n); c != nil && c.Cmp(x) != 0 {
			add(c)
		}
	}
	// Halfway to the target, as short as the column allows.
	mid := new(big.Rat).Add(x, t)
	mid.Quo(mid, big.NewRat(2, 1))
	for d := 0; d <= cc.maxDec; d++ {
		if c := truncRat(mid, d); c.Cmp(x) != 0 {
			add(c)
			break
		}
	}
	return out
}

// sigTrunc cuts r to n significant digits toward zero (nil for 0).
func sigTrunc(r *big.Rat, n int) *big.Rat {
	if r.Sign() == 0 {
		return nil
	}
	a := new(big.Rat).Abs(r)
	// The power of ten of the leading digit.
	e := 0
	ten := big.NewRat(10, 1)
	for p := big.NewRat(1, 1); ; e++ {
		if p.Mul(p, ten).Cmp(a) > 0 {
			break
		}
	}
	for p := big.NewRat(1, 1); p.Cmp(a) > 0; e-- {
		p.Quo(p, ten)
	}
	d := n - 1 - e // decimals to keep
	if d < 0 {
		scale := new(big.Rat).SetInt(new(big.Int).Exp(big.NewInt(10), big.NewInt(int64(-d)), nil))
		q := new(big.Rat).Quo(r, scale)
		return q.Mul(truncRat(q, 0), scale)
	}
	return truncRat(r, d)
}

// truncRat cuts r to d decimals toward zero.
func truncRat(r *big.Rat, d int) *big.Rat {
	scale := new(big.Int).Exp(big.NewInt(10), big.NewInt(int64(d)), nil)
	n := new(big.Int).Mul(r.Num(), scale)
	n.Quo(n, r.Denom()) // truncates toward zero
	return new(big.Rat).SetFrac(n, scale)
}

// cleanNumber turns r into a clean value of type t; nil when it does not
// fit.
func cleanNumber(r *big.Rat, t fixtures.Type, cc *colConf) any {
	switch t.Kind() {
	case fixtures.KindInt64:
		if !r.IsInt() || !r.Num().IsInt64() {
			return nil
		}
		return r.Num().Int64()
	case fixtures.KindFloat64:
		f, _ := r.Float64()
		return f
	case fixtures.KindDecimal:
		u := roundRat(r, t.Scale())
		if !u.IsInt64() {
			return nil
		}
		return fixtures.NewDecimal(u.Int64(), t.Scale())
	}
	return nil
}

// simpler reports whether clean value v is simpler than x in a column:
// closer to the column's simplest value, or as close with fewer
// characters in its plain spelling.
func simpler(v, x any, cc *colConf) bool {
	if sameClean(v, x) {
		return false
	}
	if rv, ok := ratOf(v); ok {
		rx, ok := ratOf(x)
		if !ok {
			return false
		}
		t := target(cc)
		dv := new(big.Rat).Abs(new(big.Rat).Sub(rv, t))
		dx := new(big.Rat).Abs(new(big.Rat).Sub(rx, t))
		if c := dv.Cmp(dx); c != 0 {
			return c < 0
		}
		return len(rv.FloatString(decimalsOf(rv))) < len(rx.FloatString(decimalsOf(rx)))
	}
	switch a := v.(type) {
	case bool:
		return !a && x.(bool)
	case string:
		return utf8.RuneCountInString(a) < utf8.RuneCountInString(x.(string))
	case time.Time:
		b := x.(time.Time)
		e := epochTarget(cc)
		dv, dx := absDur(a.Unix()-e), absDur(b.Unix()-e)
		if dv != dx {
			return dv < dx
		}
		return a.Nanosecond() == 0 && b.Nanosecond() != 0
	}
	return false
}

func absDur(s int64) int64 {
	if s < 0 {
		return -s
	}
	return s
}

// epochTarget returns the simplest instant of a date or timestamp column:
// the start of 1970-01-01, or the bound nearest it.
func epochTarget(cc *colConf) int64 {
	switch {
	case cc.from > 0:
		return floorDiv(cc.from+86399, 86400) * 86400
	case cc.to < 0:
		return floorDiv(cc.to, 86400) * 86400
	}
	return 0
}

// timeCandidates lists simpler dates or timestamps for x.
func timeCandidates(x time.Time, t fixtures.Type, cc *colConf) []any {
	loc := x.Location()
	e := epochTarget(cc)
	var out []any
	add := func(sec, ns int64) {
		if sec < cc.from || sec > cc.to {
			return
		}
		v := time.Unix(sec, ns).In(loc)
		if t.Kind() == fixtures.KindDate {
			v = time.Unix(floorDiv(sec, 86400)*86400, 0).UTC()
		}
		out = append(out, v)
	}
	add(e, 0)
	sec := x.Unix()
	if t.Kind() == fixtures.KindTimestamp {
		if x.Nanosecond() != 0 {
			add(sec, 0)
		}
		add(floorDiv(sec, 86400)*86400, 0)
	}
	mid := sec + (e-sec)/2
	if t.Kind() == fixtures.KindDate {
		mid = floorDiv(mid, 86400) * 86400
	}
	add(mid, 0)
	return out
}

// stringCandidates lists shorter strings made from x: its first word, its
// start at the shortest allowed length, its first half.
func stringCandidates(x string, cc *colConf) []string {
	rs := []rune(x)
	lo := max(cc.minLen, 1)
	var out []string
	add := func(s string) {
		s = strings.TrimSpace(s)
		if n := utf8.RuneCountInString(s); n >= lo && n < len(rs) {
			out = append(out, s)
		}
	}
	if len(rs) > lo {
		add(string(rs[:lo]))
	}
	if w, _, ok := strings.Cut(x, " "); ok {
		add(w)
	}
	add(string(rs[:len(rs)/2]))
	return out
}

// colGen returns a generator for schema column f, to respell changed
// values; nil for a sample built by hand.
func (s *Sample) colGen(f int) *colGen {
	if s.cfg == nil || f >= len(s.cfg.cols) {
		return nil
	}
	return newColGen(s.Schema[f], s.cfg, s.cfg.cols[f])
}

// withValue returns s with record k's value in column f set to v (nil:
// null), every raw cell of the record in that column respelled, and the
// columns derived from it recomputed.
func (s *Sample) withValue(k, f int, v any) *Sample {
	recs := slices.Clone(s.recs)
	rec := slices.Clone(recs[k])
	rec[f] = v
	changed := map[int]bool{f: true}
	if s.cfg != nil {
		for _, j := range s.cfg.order {
			cc := s.cfg.cols[j]
			if cc.derive == nil {
				continue
			}
			dep := false
			for _, name := range cc.derive.columns() {
				if changed[s.Schema.Index(name)] {
					dep = true
				}
			}
			if !dep {
				continue
			}
			var nv any
			if val, ok := cc.derive.eval(rec); ok {
				g := s.colGen(j)
				if c, ok := g.fromRat(val); ok {
					nv = c
				}
			}
			rec[j] = nv
			changed[j] = true
		}
	}
	recs[k] = rec
	rows := slices.Clone(s.rows)
	gens := map[int]*colGen{}
	for i, r := range rows {
		if r.rec != k {
			continue
		}
		cells := slices.Clone(r.cells)
		for j, c := range s.cols {
			if c.field < 0 || !changed[c.field] {
				continue
			}
			g := gens[c.field]
			if g == nil {
				g = s.colGen(c.field)
				gens[c.field] = g
			}
			cells[j] = respellAs(g, cells[j], rec[c.field], s.Schema[c.field].Type, int64(i*len(s.cols)+j))
		}
		rows[i].cells = cells
	}
	out := s.derive(s.cols, rows)
	out.recs = recs
	return out
}

// respellAs spells clean value v the way cell old is spelled: with old's
// mess when v can carry it, else plainly.
func respellAs(g *colGen, old Messy, v any, t fixtures.Type, seed int64) Messy {
	plain, ok := Spell(v, t)
	if !ok {
		return Messy{}
	}
	out := Messy{Raw: plain, Clean: v}
	if g == nil || old.Mess == MessNone || old.Clean == nil {
		return out
	}
	parts := old.Mess.Parts()
	primary := parts[0]
	val, ok := g.valueOf(out)
	if !ok {
		return out
	}
	r := newRng(seed)
	for try := 0; try < 8; try++ {
		for _, sp := range g.spellers {
			if sp.mess != primary && !old.Mess.Has(sp.mess) {
				continue
			}
			g.tmp = val
			raw, m, ok := sp.fn(g, r, &g.tmp)
			g.lc = g.cc.lc
			if ok && m == old.Mess && (g.cfg.fits == nil || g.cfg.fits(raw)) {
				return Messy{Raw: raw, Clean: v, Mess: m}
			}
		}
	}
	if g.lc.commaDecimal() && g.cc.commaPlain && val.frac != "" && g.kind.IsNumeric() {
		return Messy{Raw: numberText(val.neg, val.intd, val.frac, ","), Clean: v, Mess: MessDecimalComma}
	}
	return out
}

// renumbered returns s with a sequential or gapped column numbered anew
// from its start over the kept records, or nil when it already is.
func (s *Sample) renumbered(f int) *Sample {
	if s.cfg == nil {
		return nil
	}
	cc := s.cfg.cols[f]
	if cc.unique != Sequential && cc.unique != Gapped {
		return nil
	}
	out := s
	next := cc.start
	for _, k := range s.keptRecords() {
		if x, ok := out.recs[k][f].(int64); ok && x != next {
			out = out.withValue(k, f, next)
		}
		next++
	}
	if out == s {
		return nil
	}
	return out
}
