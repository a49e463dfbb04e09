package pushdown

import (
	"math"
	"strconv"
	"strings"

	"github.com/proofsheet/proofsheet/fixtures"
)

// The queries are built from nested subqueries, never CTEs (ClickHouse
// 18.16 has none), in three layers:
//
//   - base: one side's rows as p (the 0-based row number) and c0…cn (every
//     column in its canonical form; see colType), optionally with o, the
//     row's rank among the rows of its key (when a side repeats keys);
//   - paired: both sides' rows paired by key (and o) or by position, as wp
//     and gp (row numbers), w0…wn and g0…gm (the columns of each side), and
//     the presence flags hw and hg — a FULL JOIN in DuckDB and PostgreSQL,
//     a GROUP BY over a UNION ALL in ClickHouse, whose joins of Distributed
//     tables are only right when both are sharded alike;
//   - the summary and listing queries over paired.
//
// User identifiers are quoted once, in base; every later name is ours.

// read returns the canonical expression of column i of a side, over the
// relation's own column names.
func (p *plan) read(s *side, i int) string {
	return strings.ReplaceAll(s.types[i].read, "%s", p.d.ident(s.names[i]))
}

func cName(i int) string { return "c" + strconv.Itoa(i) }

// orderBy is the order of a side's rows when it has no row number: key
// columns, then every column in the relation's order, nulls first, text
// byte by byte. exprs gives the expression of column i.
func (p *plan) orderBy(s *side, exprs func(i int) string) string {
	var parts []string
	add := func(i int) {
		x := exprs(i)
		switch s.types[i].t.Kind() {
		case fixtures.KindString, fixtures.KindCategory:
			x = p.d.orderText(x)
		case fixtures.KindFloat64:
			// DuckDB 1.5 hands back a sorted DOUBLE column from its sort
			// keys, where −0 became +0: sort by an expression of it instead.
			x = "(" + x + " + " + p.d.float(0) + ")"
		}
		parts = append(parts, x+" NULLS FIRST")
	}
	for _, k := range p.keys {
		add(s.index(k.name))
	}
	for i := range s.names {
		add(i)
	}
	return strings.Join(parts, ", ")
}

// base is a side's rows as p, c0…cn.
func (p *plan) base(s *side) string {
	cols := make([]string, len(s.names))
	for i := range s.names {
		cols[i] = p.read(s, i) + " AS " + cName(i)
	}
	list := strings.Join(cols, ", ")
	switch {
	case s.rownum != "":
		return "SELECT " + p.d.bigint(s.rownum) + " - 1 AS p, " + list + " FROM " + s.from + " AS s"
	case p.isClickHouse():
		// No window functions: number the rows of a sorted subquery. The
		// sort ends in one stream, numbered block after block.
		names := make([]string, len(s.names))
		for i := range names {
			names[i] = cName(i)
		}
		return "SELECT toInt64(rowNumberInAllBlocks()) AS p, " + strings.Join(names, ", ") + " FROM (SELECT " + list + " FROM " + s.from +
			" ORDER BY " + p.orderBy(s, func(i int) string { return cName(i) }) + ")"
	default:
		return "SELECT row_number() OVER (ORDER BY " + p.orderBy(s, func(i int) string { return p.read(s, i) }) + ") - 1 AS p, " + list + " FROM " + s.from + " AS s"
	}
}

func (p *plan) isClickHouse() bool {
	_, ok := p.d.(clickhouseDialect)
	return ok
}

// keyIndexes returns the side's column indexes of the keys.
func (p *plan) keyIndexes(s *side) []int {
	out := make([]int, len(p.keys))
	for j, k := range p.keys {
		out[j] = s.index(k.name)
	}
	return out
}

// ordered is base with o, the rank of each row among the rows of its key
// (1 when the side repeats no key).
func (p *plan) ordered(s *side, repeats bool) string {
	b := p.base(s)
	if !repeats {
		return b
	}
	keys := p.keyIndexes(s)
	names := make([]string, len(s.names))
	for i := range names {
		names[i] = cName(i)
	}
	if p.isClickHouse() {
		var ks, sel []string
		for _, k := range keys {
			ks = append(ks, cName(k))
		}
		sel = append(sel, "tupleElement(t, 1) AS p")
		for i := range names {
			sel = append(sel, "tupleElement(t, "+strconv.Itoa(i+2)+") AS "+names[i])
		}
		return "SELECT " + strings.Join(sel, ", ") + ", toInt64(oi) AS o FROM (SELECT arraySort(x -> tupleElement(x, 1), groupArray(tuple(p, " +
			strings.Join(names, ", ") + "))) AS ts FROM (" + b + ") GROUP BY " + strings.Join(ks, ", ") + ") ARRAY JOIN ts AS t, arrayEnumerate(ts) AS oi"
	}
	var ks []string
	for _, k := range keys {
		ks = append(ks, "b."+cName(k))
	}
	return "SELECT b.*, row_number() OVER (PARTITION BY " + strings.Join(ks, ", ") + " ORDER BY b.p) AS o FROM (" + b + ") AS b"
}

// paired is both sides' rows paired.
func (p *plan) paired() string {
	ord := p.ordW || p.ordG
	if p.isClickHouse() {
		return p.pairedByGroup(ord)
	}
	var sel []string
	sel = append(sel, "w.p AS wp", "g.p AS gp")
	for i := range p.want.names {
		sel = append(sel, "w."+cName(i)+" AS w"+strconv.Itoa(i))
	}
	for i := range p.got.names {
		sel = append(sel, "g."+cName(i)+" AS g"+strconv.Itoa(i))
	}
	var on []string
	if !p.keyed {
		on = append(on, "w.p = g.p")
	}
	for _, k := range p.keys {
		w, g := "w."+cName(k.wi), "g."+cName(k.gi)
		on = append(on, p.keyEqual(k, w, g)...)
	}
	wo, gon := p.ordered(p.want, p.ordW), p.ordered(p.got, p.ordG)
	if ord {
		if !p.ordW {
			wo = "SELECT b.*, 1 AS o FROM (" + wo + ") AS b"
		}
		if !p.ordG {
			gon = "SELECT b.*, 1 AS o FROM (" + gon + ") AS b"
		}
		on = append(on, "w.o = g.o")
	}
	return "SELECT " + strings.Join(sel, ", ") + " FROM (" + wo + ") AS w FULL JOIN (" + gon + ") AS g ON " + strings.Join(on, " AND ")
}

// keyEqual is the join condition of one key column, null equal to null
// as in assert.Compare, in a form engines can hash.
func (p *plan) keyEqual(k *column, w, g string) []string {
	if k.class == classTime && k.wt.Unit() != k.gt.Unit() {
		ws, wn := p.instant(w, k.wt)
		gs, gn := p.instant(g, k.gt)
		return []string{p.nullSafeEq(ws, gs, "0"), p.nullSafeEq(wn, gn, "0")}
	}
	zero := "0"
	switch k.class {
	case classBool:
		zero = p.d.boolean(false)
	case classText:
		zero = "''"
	}
	return []string{p.nullSafeEq(w, g, zero)}
}

func (p *plan) nullSafeEq(w, g, zero string) string {
	if _, ok := p.d.(duckdbDialect); ok {
		return w + " IS NOT DISTINCT FROM " + g
	}
	// PostgreSQL hashes only plain equality: compare the null flags and
	// the values with nulls replaced.
	return "(" + w + " IS NULL) = (" + g + " IS NULL) AND COALESCE(" + w + ", " + zero + ") = COALESCE(" + g + ", " + zero + ")"
}

// pairedByGroup pairs rows by grouping the rows of both sides by key (or
// position): the ClickHouse way, right for Distributed tables however they
// are sharded. Each side's cells travel in one-element tuples so that a
// null survives anyIf.
func (p *plan) pairedByGroup(ord bool) string {
	d := p.d
	var keyExprs []func(s *side, i int) string
	var group []string
	if !p.keyed {
		group = append(group, "p")
	}
	for j, k := range p.keys {
		k := k
		common := ""
		if k.class == classDecimal && k.wt != k.gt {
			common = strconv.Itoa(max(k.wt.Scale(), k.gt.Scale()))
		}
		keyExprs = append(keyExprs, func(s *side, i int) string {
			x := cName(i)
			if common != "" {
				x = "toDecimal128(" + x + ", " + common + ")"
			}
			return "toNullable(" + x + ")"
		})
		group = append(group, "k"+strconv.Itoa(j))
	}
	if ord {
		group = append(group, "o")
	}
	branch := func(s *side, n int, repeats bool) string {
		sel := []string{strconv.Itoa(n) + " AS s", "p"}
		if ord {
			if repeats {
				sel = append(sel, "o")
			} else {
				sel = append(sel, "toInt64(1) AS o")
			}
		}
		for j, k := range p.keys {
			sel = append(sel, keyExprs[j](s, s.index(k.name))+" AS k"+strconv.Itoa(j))
		}
		for i, t := range p.want.types {
			v := "CAST(NULL AS Nullable(" + d.sqlType(t.t) + "))"
			if n == 0 {
				v = "toNullable(" + cName(i) + ")"
			}
			sel = append(sel, v+" AS iw"+strconv.Itoa(i))
		}
		for i, t := range p.got.types {
			v := "CAST(NULL AS Nullable(" + d.sqlType(t.t) + "))"
			if n == 1 {
				v = "toNullable(" + cName(i) + ")"
			}
			sel = append(sel, v+" AS ig"+strconv.Itoa(i))
		}
		return "SELECT " + strings.Join(sel, ", ") + " FROM (" + p.ordered(s, repeats) + ")"
	}
	sel := []string{"countIf(s = 0) > 0 AS hw", "countIf(s = 1) > 0 AS hg", "anyIf(p, s = 0) AS wp", "anyIf(p, s = 1) AS gp"}
	for i := range p.want.names {
		sel = append(sel, "tupleElement(anyIf(tuple(iw"+strconv.Itoa(i)+"), s = 0), 1) AS w"+strconv.Itoa(i))
	}
	for i := range p.got.names {
		sel = append(sel, "tupleElement(anyIf(tuple(ig"+strconv.Itoa(i)+"), s = 1), 1) AS g"+strconv.Itoa(i))
	}
	return "SELECT " + strings.Join(sel, ", ") + " FROM (" + branch(p.want, 0, p.ordW) + " UNION ALL " + branch(p.got, 1, p.ordG) +
		") GROUP BY " + strings.Join(group, ", ")
}

// hw and hg say that a paired row has its want row and its got row.
func (p *plan) hw() string {
	if p.isClickHouse() {
		return "hw"
	}
	return "(wp IS NOT NULL)"
}

func (p *plan) hg() string {
	if p.isClickHouse() {
		return "hg"
	}
	return "(gp IS NOT NULL)"
}

func (p *plan) both() string { return p.hw() + " AND " + p.hg() }

func wAlias(c *column) string { return "w" + strconv.Itoa(c.wi) }
func gAlias(c *column) string { return "g" + strconv.Itoa(c.gi) }

// isNull is a cell's null test: null, or NaN where NaN counts as null.
func (p *plan) isNull(x string, t fixtures.Type, nanNull bool) string {
	if nanNull && t.Kind() == fixtures.KindFloat64 {
		return "(" + p.d.isNull(x) + " OR " + p.d.isNaN(x) + ")"
	}
	return p.d.isNull(x)
}

// differs is true when the pair's cells of c differ, as assert decides.
func (p *plan) differs(c *column) string {
	w, g := wAlias(c), gAlias(c)
	wn, gn := p.isNull(w, c.wt, c.nanNull), p.isNull(g, c.gt, c.nanNull)
	f, t := p.d.boolean(false), p.d.boolean(true)
	return "(CASE WHEN " + wn + " AND " + gn + " THEN " + f + " WHEN " + wn + " OR " + gn + " THEN " + t + " ELSE NOT (" + p.equal(c, w, g) + ") END)"
}

// equal is the equality of two non-null cells.
func (p *plan) equal(c *column, w, g string) string {
	d := p.d
	switch c.class {
	case classFloat:
		return p.floatEqual(w, g, c)
	case classIntFloat:
		iv, fv := g, w
		if c.intOnWant {
			iv, fv = w, g
		}
		// The same value exactly, or (under a tolerance) within it: under
		// the exact rule float64(iv) must not stand for iv, which it may
		// round to fv (assert.Compare compares by value).
		lo, hi := d.float(-math.Pow(2, 63)), d.float(math.Pow(2, 63))
		slack := d.boolean(false)
		if c.rule.ByTol || c.rule.ByULPs {
			slack = p.floatEqual(d.double(iv), fv, c)
		}
		return "(CASE WHEN " + d.isNaN(fv) + " THEN " + d.boolean(false) +
			" WHEN " + fv + " = trunc(" + fv + ") AND " + fv + " >= " + lo + " AND " + fv + " < " + hi +
			" THEN (" + d.bigint(fv) + " = " + iv + " OR " + slack + ")" +
			" ELSE " + slack + " END)"
	case classDate:
		if c.hasTT {
			// |Δ| ≤ tt exactly: whole days against the days tt holds.
			return "(" + w + " = " + g + " OR " + d.absInt(w, g) + " <= " + d.float(float64(uint64(c.tt)/uint64(86400e9))) + ")"
		}
		return "(" + w + " = " + g + ")"
	case classTime, classDateTime:
		if c.class == classTime && c.wt.Unit() == c.gt.Unit() {
			if !c.hasTT {
				return "(" + w + " = " + g + ")"
			}
			// |Δ| ≤ tt in whole ticks (exact while tt is under 2^53 ticks).
			return "(" + w + " = " + g + " OR " + d.absInt(w, g) + " <= " + d.float(float64(uint64(c.tt)/uint64(c.wt.Unit().Duration()))) + ")"
		}
		ws, wns, gs, gns := p.instants(c, w, g)
		eq := "(" + ws + " = " + gs + " AND " + wns + " = " + gns + ")"
		if c.hasTT {
			eq = "(" + eq + " OR " + p.absSeconds(ws, wns, gs, gns) + " <= " + d.float(c.tt.Seconds()) + ")"
		}
		return eq
	}
	return "(" + w + " = " + g + ")"
}

// instants returns a time pair's cells as whole seconds and nanoseconds.
func (p *plan) instants(c *column, w, g string) (ws, wns, gs, gns string) {
	if c.class == classDateTime {
		if c.intOnWant {
			ws, wns = "("+w+" * 86400)", "0"
			gs, gns = p.instant(g, c.gt)
		} else {
			ws, wns = p.instant(w, c.wt)
			gs, gns = "("+g+" * 86400)", "0"
		}
		return
	}
	ws, wns = p.instant(w, c.wt)
	gs, gns = p.instant(g, c.gt)
	return
}

// instant splits ticks of a unit into whole seconds since the epoch
// (rounded down, as time.Time.Unix) and nanoseconds 0 to 999999999.
func (p *plan) instant(t string, typ fixtures.Type) (sec, nanos string) {
	per := int64(typ.Unit().Duration() / 1e0)
	perSec := int64(1e9) / per
	if perSec == 1 {
		return t, "0"
	}
	ps := strconv.FormatInt(perSec, 10)
	m := p.d.mod("("+p.d.mod(t, ps)+" + "+ps+")", ps)
	sec = p.d.intDiv("("+t+" - "+m+")", ps)
	nanos = "(" + m + " * " + strconv.FormatInt(per, 10) + ")"
	return sec, nanos
}

func (p *plan) absSeconds(ws, wns, gs, gns string) string {
	d := p.d
	return "abs(" + d.double("("+ws+" - "+gs+")") + " + " + d.double("("+wns+" - "+gns+")") + " / " + d.float(1e9) + ")"
}

// floatEqual is assert's float equality of non-null w and g: NaN equals
// only NaN, == values are equal, an infinity equals only itself, then the
// tolerance decides.
func (p *plan) floatEqual(w, g string, c *column) string {
	d := p.d
	f, t := d.boolean(false), d.boolean(true)
	tol := f
	if c.rule.ByTol {
		tol = "(" + p.absDiff(w, g) + " <= " + d.float(c.rule.Abs) + " OR " + p.relTest(w, g, c.rule.Rel) + ")"
	}
	return "(CASE WHEN " + d.isNaN(w) + " OR " + d.isNaN(g) + " THEN " + d.isNaN(w) + " AND " + d.isNaN(g) +
		" WHEN " + w + " = " + g + " THEN " + t +
		" WHEN " + d.isInf(w) + " OR " + d.isInf(g) + " THEN " + f +
		" ELSE " + tol + " END)"
}

// absDiff is fl(|w − g|) for finite w ≠ g, +Inf when it overflows. Engines
// with strict floats raise an error on overflow, so there the difference
// of values with opposite signs is taken on halves (exact: halving a
// float of magnitude ≥ 2^-1021 is exact, and a smaller one cannot change
// the rounded difference of a value ≥ 2^1022) and doubled back.
func (p *plan) absDiff(w, g string) string {
	d := p.d
	if !d.strictFloats() {
		return "abs(" + w + " - " + g + ")"
	}
	h := d.float(math.Pow(2, 1022))
	half := func(x string) string {
		return "(CASE WHEN abs(" + x + ") < " + d.float(math.Pow(2, -1021)) + " THEN " + d.float(0) + " ELSE " + x + " * " + d.float(0.5) + " END)"
	}
	hd := "abs(" + half(w) + " - " + half(g) + ")"
	return "(CASE WHEN (" + w + " >= 0) = (" + g + " >= 0) OR (abs(" + w + ") <= " + h + " AND abs(" + g + ") <= " + h + ") THEN abs(" + w + " - " + g + ")" +
		" WHEN " + hd + " >= " + d.float(math.Pow(2, 1023)) + " THEN " + d.float(math.Inf(1)) +
		" ELSE " + hd + " * " + d.float(2) + " END)"
}

// relTest is |w − g| ≤ rel × max(|w|, |g|) for finite w ≠ g, with the
// product's overflow (to +Inf: always true) and underflow (to 0: never
// true, as |w − g| > 0) decided beforehand, from the largest magnitudes
// for which they happen; strict engines would raise errors.
func (p *plan) relTest(w, g string, rel float64) string {
	d := p.d
	switch {
	case rel == 0:
		return d.boolean(false)
	case rel >= 2:
		// |w − g| ≤ |w| + |g| ≤ 2 max(|w|, |g|) ≤ rel max(|w|, |g|), and
		// rounding keeps the order.
		return d.boolean(true)
	}
	m := "greatest(abs(" + w + "), abs(" + g + "))"
	finite := lastFloat(func(x float64) bool { return !math.IsInf(rel*x, 0) })
	zero := lastFloat(func(x float64) bool { return rel*x == 0 })
	return "(CASE WHEN " + m + " > " + d.float(finite) + " THEN " + d.boolean(true) +
		" WHEN " + m + " <= " + d.float(zero) + " THEN " + d.boolean(false) +
		" ELSE " + p.absDiff(w, g) + " <= " + d.float(rel) + " * " + m + " END)"
}

// lastFloat returns the largest non-negative finite float x for which ok
// holds, given that ok holds for 0 and, as x grows, holds and then fails.
func lastFloat(ok func(x float64) bool) float64 {
	lo, hi := uint64(0), math.Float64bits(math.MaxFloat64)
	if ok(math.MaxFloat64) {
		return math.MaxFloat64
	}
	for lo+1 < hi { // ok(lo) && !ok(hi)
		mid := lo + (hi-lo)/2
		if ok(math.Float64frombits(mid)) {
			lo = mid
		} else {
			hi = mid
		}
	}
	return math.Float64frombits(lo)
}

// absDelta and relDelta are the distances of two cells of a pair, NULL
// when a cell is null (or NaN): assert's Delta.
func (p *plan) absDelta(c *column) string {
	w, g := wAlias(c), gAlias(c)
	d := p.d
	guard := func(x string) string {
		if c.nanNull {
			return "CASE WHEN " + p.isNull(w, c.wt, true) + " OR " + p.isNull(g, c.gt, true) + " THEN NULL ELSE " + x + " END"
		}
		return x
	}
	switch c.class {
	case classInt:
		return d.absInt(w, g)
	case classFloat:
		return guard(p.floatDelta(w, g, false))
	case classIntFloat:
		iv, fv := g, w
		if c.intOnWant {
			iv, fv = w, g
		}
		return guard(p.floatDelta(d.double(iv), fv, false))
	case classDecimal:
		return d.decimalDouble("abs("+w+" - "+g+")", max(c.wt.Precision(), c.gt.Precision())+1)
	case classDate:
		return "(abs(" + d.double(w) + " - " + d.double(g) + ") * " + d.float(86400) + ")"
	case classTime, classDateTime:
		if c.class == classTime && c.wt.Unit() == c.gt.Unit() {
			// assert's Delta: |Δ| in the unit, rounded once, over the
			// unit's count per second.
			return "(" + d.absInt(w, g) + " / " + d.float(float64(1e9/int64(c.wt.Unit().Duration()))) + ")"
		}
		// Mixed units and dates against timestamps (LooseTypes): float
		// seconds, which can differ from assert's exact count in the
		// last bit.
		ws, wns, gs, gns := p.instants(c, w, g)
		return p.absSeconds(ws, wns, gs, gns)
	}
	return "NULL"
}

func (p *plan) relDelta(c *column) string {
	w, g := wAlias(c), gAlias(c)
	d := p.d
	guard := func(x string) string {
		if c.nanNull {
			return "CASE WHEN " + p.isNull(w, c.wt, true) + " OR " + p.isNull(g, c.gt, true) + " THEN NULL ELSE " + x + " END"
		}
		return x
	}
	switch c.class {
	case classInt:
		return "(CASE WHEN " + w + " = " + g + " THEN " + d.float(0) + " ELSE " + d.absInt(w, g) + " / greatest(abs(" + d.double(w) + "), abs(" + d.double(g) + ")) END)"
	case classFloat:
		return guard(p.floatDelta(w, g, true))
	case classIntFloat:
		iv, fv := g, w
		if c.intOnWant {
			iv, fv = w, g
		}
		return guard(p.floatDelta(d.double(iv), fv, true))
	case classDecimal:
		abs := d.decimalDouble("abs("+w+" - "+g+")", max(c.wt.Precision(), c.gt.Precision())+1)
		return "(CASE WHEN " + w + " = " + g + " THEN " + d.float(0) + " ELSE " + abs + " / greatest(abs(" +
			d.decimalDouble(w, c.wt.Precision()) + "), abs(" + d.decimalDouble(g, c.gt.Precision()) + ")) END)"
	case classDate, classTime, classDateTime:
		// Times have no relative distance; 0 marks the cell as having one.
		return "(CASE WHEN " + d.isNull(w) + " OR " + d.isNull(g) + " THEN NULL ELSE " + d.float(0) + " END)"
	}
	return "NULL"
}

// floatDelta is assert's floatDelta of non-null w and g: NULL with a NaN,
// 0 when ==, +Inf with an infinity, else |w − g| (or that over
// max(|w|, |g|)).
func (p *plan) floatDelta(w, g string, rel bool) string {
	d := p.d
	x := p.absDiff(w, g)
	if rel {
		x = x + " / greatest(abs(" + w + "), abs(" + g + "))"
	}
	return "(CASE WHEN " + d.isNaN(w) + " OR " + d.isNaN(g) + " THEN NULL WHEN " + w + " = " + g + " THEN " + d.float(0) +
		" WHEN " + d.isInf(w) + " OR " + d.isInf(g) + " THEN " + d.float(math.Inf(1)) + " ELSE " + x + " END)"
}

// tracked is true for the paired cells whose distance assert.Compare
// weighs for the largest deltas: cells with a distance that differ, and
// in tolerant columns also those that are equal (float columns skip
// cells that are ==, as its kernels do).
func (p *plan) tracked(c *column) string {
	has := "NOT " + p.d.isNull(p.absDelta(c))
	switch {
	case c.class == classFloat:
		return "(" + has + " AND " + wAlias(c) + " <> " + gAlias(c) + ")"
	case c.tolerant():
		return "(" + has + ")"
	}
	return "(" + has + " AND " + p.differs(c) + ")"
}

// compared returns the compared columns that are not keys.
func (p *plan) compared() []*column {
	var out []*column
	for _, c := range p.cols {
		if !c.key {
			out = append(out, c)
		}
	}
	return out
}

// anyDiffers is true for a pair with a differing cell.
func (p *plan) anyDiffers() string {
	var parts []string
	for _, c := range p.compared() {
		parts = append(parts, p.differs(c))
	}
	if len(parts) == 0 {
		return p.d.boolean(false)
	}
	return "(" + strings.Join(parts, " OR ") + ")"
}

// fetch is the expression that brings a canonical value to Go: decimals
// as text, the rest as they are.
func (p *plan) fetch(x string, t fixtures.Type) string {
	if t.Kind() == fixtures.KindDecimal {
		return p.d.text(x)
	}
	return x
}

// summary is the query of the counts and largest deltas; summaryColumns
// says what its columns are.
func (p *plan) summary() (string, []summaryColumn) {
	d := p.d
	both := p.both()
	sel := []string{d.countIf(p.hw() + " AND NOT " + p.hg()), d.countIf(p.hg() + " AND NOT " + p.hw()), d.countIf(both + " AND " + p.anyDiffers())}
	var meta []summaryColumn
	for _, c := range p.compared() {
		sel = append(sel, d.countIf(both+" AND "+p.differs(c)))
		meta = append(meta, summaryColumn{c: c, what: "differing"})
		if !c.hasDelta() {
			continue
		}
		tr := both + " AND " + p.tracked(c)
		am, ap := d.firstMax(p.absDelta(c), "wp", tr)
		rm, rp := d.firstMax(p.relDelta(c), "wp", tr)
		sel = append(sel, d.countIf(tr), am, ap, rm, rp)
		meta = append(meta, summaryColumn{c: c, what: "tracked"}, summaryColumn{c: c, what: "maxabs"}, summaryColumn{c: c, what: "absat"},
			summaryColumn{c: c, what: "maxrel"}, summaryColumn{c: c, what: "relat"})
	}
	return d.statement("SELECT " + strings.Join(sel, ", ") + " FROM (" + p.paired() + ") AS pr"), meta
}

type summaryColumn struct {
	c    *column
	what string
}

// limitClause is " LIMIT n", or nothing for a negative n.
func limitClause(n int) string {
	if n < 0 {
		return ""
	}
	return " LIMIT " + strconv.Itoa(n)
}

// sideRows lists the rows of one side that the other lacks: p and every
// column of the side, in row order.
func (p *plan) sideRows(want bool, limit int) string {
	s, pos, prefix, cond := p.want, "wp", "w", p.hw()+" AND NOT "+p.hg()
	if !want {
		s, pos, prefix, cond = p.got, "gp", "g", p.hg()+" AND NOT "+p.hw()
	}
	sel := []string{pos}
	for i, t := range s.types {
		sel = append(sel, p.fetch(prefix+strconv.Itoa(i), t.t))
	}
	return p.d.statement("SELECT " + strings.Join(sel, ", ") + " FROM (" + p.paired() + ") AS pr WHERE " + cond + " ORDER BY " + pos + limitClause(limit))
}

// pairRows lists the pairs with a differing cell, and the pairs at the
// want rows at (where the largest deltas sit) first: wp, gp, want's key
// cells, then per compared column want's and got's cell, whether they
// differ and their distances.
func (p *plan) pairRows(at []int64, limit int) string {
	d := p.d
	sel := []string{"wp", "gp"}
	for _, k := range p.keys {
		sel = append(sel, p.fetch(wAlias(k), k.wt))
	}
	for _, c := range p.compared() {
		sel = append(sel, p.fetch(wAlias(c), c.wt), p.fetch(gAlias(c), c.gt), p.differs(c))
		if c.hasDelta() {
			sel = append(sel, p.absDelta(c), p.relDelta(c))
		}
	}
	cond, order := p.anyDiffers(), "wp"
	if len(at) > 0 {
		list := make([]string, len(at))
		for i, a := range at {
			list[i] = strconv.FormatInt(a, 10)
		}
		in := "wp IN (" + strings.Join(list, ", ") + ")"
		cond = "(" + cond + " OR " + in + ")"
		order = "CASE WHEN " + in + " THEN 0 ELSE 1 END, wp"
		if limit >= 0 {
			limit += len(at)
		}
	}
	return d.statement("SELECT " + strings.Join(sel, ", ") + " FROM (" + p.paired() + ") AS pr WHERE " + p.both() + " AND " + cond +
		" ORDER BY " + order + limitClause(limit))
}

// repeatCount counts the keys that a side repeats.
func (p *plan) repeatCount(s *side) string {
	var ks []string
	for _, i := range p.keyIndexes(s) {
		ks = append(ks, p.read(s, i))
	}
	return p.d.statement("SELECT count(*) FROM (SELECT count(*) AS n FROM " + s.from + " AS s GROUP BY " + strings.Join(ks, ", ") + " HAVING count(*) > 1) AS t")
}

// repeats lists the keys a side repeats, in order of first appearance:
// the key cells, how many rows, and their row numbers.
func (p *plan) repeats(s *side, limit int) string {
	var ks, sel []string
	for _, i := range p.keyIndexes(s) {
		ks = append(ks, cName(i))
		sel = append(sel, p.fetch(cName(i), s.types[i].t))
	}
	sel = append(sel, "count(*) AS n", "min(p) AS f", p.d.positions("p"))
	return p.d.statement("SELECT " + strings.Join(sel, ", ") + " FROM (" + p.base(s) + ") AS b GROUP BY " + strings.Join(ks, ", ") +
		" HAVING count(*) > 1 ORDER BY f" + limitClause(limit))
}

func (p *plan) count(s *side) string {
	return p.d.statement("SELECT count(*) FROM " + s.from + " AS s")
}

// describe reads a relation's columns without rows.
func describe(d sqlDialect, from string) string {
	return d.statement("SELECT * FROM " + from + " AS s LIMIT 0")
}
