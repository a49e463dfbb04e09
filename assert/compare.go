package assert

import (
	"fmt"
	"slices"
	"sort"
	"strconv"
	"strings"

	"github.com/proofsheet/proofsheet/fixtures"
)

// Compare compares the table got with the table want under the options
// and returns what differs. It never panics and never returns nil: nil
// tables, bad options and unusable keys come back as Problems in the Diff,
// which then is not Equal. Compare only reads the tables, so it may run
// concurrently with other readers.
//
// By default rows are paired by position, cells must be equal exactly
// (floats too, with −0 equal to +0 and NaN equal to NaN), null equals only
// null, and the columns must be the same in name, type and order.
func Compare(want, got *fixtures.Table, opts ...Option) *Diff {
	cfg := newConfig(opts)
	d := &Diff{Limit: cfg.limit, Match: MatchByPosition}
	switch cfg.mode {
	case byKey:
		d.Match = MatchByKey
		d.Keys = append([]string(nil), cfg.keys...)
	case asMultiset:
		d.Match = MatchAsMultiset
	}
	d.Problems = append(d.Problems, cfg.problems...)
	if want == nil {
		d.Problems = append(d.Problems, "want is a nil table")
	} else {
		d.WantRows, d.WantColumns = want.NumRows(), want.Names()
	}
	if got == nil {
		d.Problems = append(d.Problems, "got is a nil table")
	} else {
		d.GotRows, d.GotColumns = got.NumRows(), got.Names()
	}
	if want == nil || got == nil {
		return d
	}
	c := &comparison{cfg: cfg, d: d, want: want, got: got}
	c.checkNames()
	c.pairColumns()
	keysOK := c.checkKeys()
	c.checkRules()
	if keysOK {
		c.run()
	}
	c.addHints(keysOK)
	if keysOK && !d.Equal() {
		c.overview()
	}
	return d
}

// comparison is the state of one Compare call.
type comparison struct {
	cfg       *config
	d         *Diff
	want, got *fixtures.Table
	cols      []*colCmp // compared columns, in want's order
	keyCols   []*colCmp // key columns (ByKey), in key order
	pairs     pairing
	reorder   *reorder // keyed pairings of large tables: got rows by want range
	// missing and extra are the listed rows present on one side only
	// (all of them when the listing has no cap); a positional comparison
	// lists a run of rows instead, from tailFrom.
	missing, extra []int32
	tail           bool
	tailFrom       int
	results        []*colResult // per compared column, once run
	diffRows       []uint64     // bitmap of the pair slots with a differing cell
	rowsRan        bool         // rows were paired and cells compared
	// missingRows and extraRows are the missing and extra rows (keyed and
	// multiset pairings), for the hints and the overview.
	missingRows, extraRows []int32
}

// checkNames reports options that name columns neither table has.
func (c *comparison) checkNames() {
	seen := map[namedCol]bool{}
	for _, n := range c.cfg.named {
		if n.column == AllColumns || seen[n] {
			continue
		}
		seen[n] = true
		if c.want.Column(n.column) == nil && c.got.Column(n.column) == nil {
			c.d.Problems = append(c.d.Problems, fmt.Sprintf("%s names column %q, which neither table has (want: %s; got: %s)",
				n.option, n.column, listNames(c.d.WantColumns), listNames(c.d.GotColumns)))
		}
	}
}

func listNames(names []string) string {
	if len(names) == 0 {
		return "no columns"
	}
	return strings.Join(names, ", ")
}

// pairColumns finds the schema changes and builds the comparators of the
// columns both sides have.
func (c *comparison) pairColumns() {
	cfg, d := c.cfg, c.d
	keyed := map[string]bool{}
	for _, k := range cfg.keys {
		keyed[k] = true
	}
	var wShared, gShared []string
	for _, f := range c.want.Schema() {
		if cfg.ignore[f.Name] && !keyed[f.Name] {
			continue
		}
		gc := c.got.Column(f.Name)
		if gc == nil {
			d.Schema = append(d.Schema, SchemaChange{Column: f.Name, Change: ColumnMissing, Want: f.Type.String()})
			continue
		}
		wShared = append(wShared, f.Name)
		wc := c.want.Column(f.Name)
		cc := newColCmp(cfg, wc, gc)
		if !cc.typeOK(cfg.loose) {
			d.Schema = append(d.Schema, SchemaChange{Column: f.Name, Change: TypeChanged, Want: wc.Type().String(), Got: gc.Type().String()})
		}
		if !cfg.loose && wc.Kind() == fixtures.KindCategory && gc.Kind() == fixtures.KindCategory {
			added, removed := levelChanges(wc.Levels(), gc.Levels())
			if len(removed) > 0 {
				d.Schema = append(d.Schema, SchemaChange{Column: f.Name, Change: LevelsRemoved, Want: strings.Join(removed, ", ")})
			}
			if len(added) > 0 {
				d.Schema = append(d.Schema, SchemaChange{Column: f.Name, Change: LevelsAdded, Got: strings.Join(added, ", ")})
			}
		}
		if cc.class == classNone {
			continue // kinds too far apart to compare cells
		}
		c.cols = append(c.cols, cc)
		d.Compared = append(d.Compared, f.Name)
	}
	for _, f := range c.got.Schema() {
		if cfg.ignore[f.Name] && !keyed[f.Name] {
			continue
		}
		if c.want.Column(f.Name) == nil {
			d.Schema = append(d.Schema, SchemaChange{Column: f.Name, Change: ColumnExtra, Got: f.Type.String()})
			continue
		}
		gShared = append(gShared, f.Name)
	}
	if !cfg.anyColOrder {
		c.checkOrder(wShared, gShared)
	}
}

// checkOrder reports shared columns that stand at another position among
// the shared columns.
func (c *comparison) checkOrder(wShared, gShared []string) {
	gPos := make(map[string]int, len(gShared))
	for i, n := range gShared {
		gPos[n] = i
	}
	for i, n := range wShared {
		if gPos[n] != i {
			c.d.Schema = append(c.d.Schema, SchemaChange{Column: n, Change: ColumnMoved,
				Want: strconv.Itoa(c.want.Schema().Index(n) + 1), Got: strconv.Itoa(c.got.Schema().Index(n) + 1)})
		}
	}
}

// levelChanges returns the levels only got has and those only want has,
// each in its side's level order.
func levelChanges(w, g []string) (added, removed []string) {
	ws := make(map[string]bool, len(w))
	for _, l := range w {
		ws[l] = true
	}
	gs := make(map[string]bool, len(g))
	for _, l := range g {
		gs[l] = true
		if !ws[l] {
			added = append(added, quoteLevel(l))
		}
	}
	for _, l := range w {
		if !gs[l] {
			removed = append(removed, quoteLevel(l))
		}
	}
	return added, removed
}

func quoteLevel(l string) string {
	if l == "" || strings.ContainsAny(l, ", \"") || !strconv.CanBackquote(l) {
		return fixtures.QuoteText(l)
	}
	return l
}

// checkKeys validates the key columns; false means rows cannot be paired.
func (c *comparison) checkKeys() bool {
	if c.cfg.mode != byKey {
		return true
	}
	ok := true
	bad := func(format string, args ...any) {
		c.d.Problems = append(c.d.Problems, fmt.Sprintf(format, args...))
		ok = false
	}
	for _, k := range c.cfg.keys {
		wc, gc := c.want.Column(k), c.got.Column(k)
		switch {
		case wc == nil && gc == nil:
			ok = false // already reported by checkNames
			continue
		case wc == nil:
			bad("key column %q is missing from want (want: %s)", k, listNames(c.d.WantColumns))
			continue
		case gc == nil:
			bad("key column %q is missing from got (got: %s)", k, listNames(c.d.GotColumns))
			continue
		}
		if c.cfg.ignore[k] {
			bad("key column %q is also named by IgnoreColumns; a key cannot be ignored", k)
		}
		if wc.Kind() == fixtures.KindFloat64 || gc.Kind() == fixtures.KindFloat64 {
			bad("key column %q is float64, which cannot be a key: floats that print alike can differ in their last bits and NaN is not equal to itself under ==; key by an int64, decimal, string or date column, or round it into one", k)
			continue
		}
		i := slices.IndexFunc(c.cols, func(cc *colCmp) bool { return cc.name == k })
		if i < 0 || !c.cols[i].keyable() {
			bad("key column %q is %s in want but %s in got; key columns must compare exactly", k, wc.Type(), gc.Type())
			continue
		}
		c.cols[i].skip = true
		c.keyCols = append(c.keyCols, c.cols[i])
	}
	return ok
}

// checkRules reports rules that name columns they cannot apply to.
func (c *comparison) checkRules() {
	names := make([]string, 0, len(c.cfg.tols))
	for n := range c.cfg.tols {
		names = append(names, n)
	}
	sort.Strings(names)
	for _, n := range names {
		if n == AllColumns {
			continue
		}
		wk, gk := kindOf(c.want.Column(n)), kindOf(c.got.Column(n))
		if wk == fixtures.KindInvalid && gk == fixtures.KindInvalid {
			continue // reported by checkNames
		}
		switch {
		case wk == fixtures.KindFloat64 || gk == fixtures.KindFloat64:
		case wk == fixtures.KindDecimal || gk == fixtures.KindDecimal:
			c.d.Problems = append(c.d.Problems, fmt.Sprintf("%s names column %q, which is decimal: decimals always compare exactly, by value", ruleName(c.cfg.tols[n]), n))
		default:
			c.d.Problems = append(c.d.Problems, fmt.Sprintf("%s names column %q, which is %s; tolerances apply to float64 columns", ruleName(c.cfg.tols[n]), n, pick(wk != fixtures.KindInvalid, wk, gk)))
		}
	}
	for n := range c.cfg.timeTols {
		if n == AllColumns {
			continue
		}
		for _, col := range []*fixtures.Column{c.want.Column(n), c.got.Column(n)} {
			if col != nil && col.Kind() != fixtures.KindDate && col.Kind() != fixtures.KindTimestamp {
				c.d.Problems = append(c.d.Problems, fmt.Sprintf("TimeTol names column %q, which is %s; it applies to date and timestamp columns", n, col.Type()))
				break
			}
		}
	}
	for n := range c.cfg.norms {
		if n == AllColumns {
			continue
		}
		for _, col := range []*fixtures.Column{c.want.Column(n), c.got.Column(n)} {
			if col != nil && !col.Kind().IsText() {
				c.d.Problems = append(c.d.Problems, fmt.Sprintf("NormText names column %q, which is %s; it applies to string and category columns", n, col.Type()))
				break
			}
		}
	}
	slices.Sort(c.d.Problems[len(c.cfg.problems):])
}

func kindOf(col *fixtures.Column) fixtures.Kind {
	if col == nil {
		return fixtures.KindInvalid
	}
	return col.Kind()
}

func pick[T any](cond bool, a, b T) T {
	if cond {
		return a
	}
	return b
}

func ruleName(r floatRule) string {
	if r.hasULP {
		return "ULPs"
	}
	return "Tol"
}

// run pairs the rows, compares the cells and fills the Diff.
func (c *comparison) run() {
	switch c.cfg.mode {
	case byKey:
		c.matchByKey()
	case asMultiset:
		c.matchAsMultiset()
	default:
		c.matchByPosition()
	}
	results := c.compareColumns()
	c.collect(results)
	c.results, c.rowsRan = results, true
}

// matchByPosition pairs row i with row i; the longer table's tail is
// missing or extra.
func (c *comparison) matchByPosition() {
	nw, ng := c.want.NumRows(), c.got.NumRows()
	c.pairs = pairing{n: min(nw, ng)}
	c.d.Missing.Count, c.d.Extra.Count = max(nw-ng, 0), max(ng-nw, 0)
	c.tail, c.tailFrom = true, min(nw, ng)
}

func (c *comparison) addMissing(wi int) {
	c.missingRows = append(c.missingRows, int32(wi))
	c.d.Missing.Count++
	if !c.d.listFull(len(c.missing)) {
		c.missing = append(c.missing, int32(wi))
	}
}

func (c *comparison) addExtra(gi int) {
	c.extraRows = append(c.extraRows, int32(gi))
	c.d.Extra.Count++
	if !c.d.listFull(len(c.extra)) {
		c.extra = append(c.extra, int32(gi))
	}
}

// keyText returns the literal spelling of a row's key cells, nil when rows
// are not keyed.
func (c *comparison) keyText(side Side, row int) []string {
	return (&tablesRef{keyCols: c.keyCols}).keyText(side, row)
}

func rowCells(t *fixtures.Table, row int) []string {
	out := make([]string, t.NumCols())
	for j := range out {
		out[j] = fixtures.LiteralCell(t.ColumnAt(j), row)
	}
	return out
}

// collect turns the column results into the Diff's cells, rows and
// summaries.
func (c *comparison) collect(results []*colResult) {
	d := c.d
	ref := &tablesRef{want: c.want, got: c.got, cols: c.cols, keyCols: c.keyCols, pairs: c.pairs}
	cells := &cellSource{t: ref, bits: make([][]uint64, len(results))}
	var rows []uint64
	for j, r := range results {
		cc := c.cols[j]
		d.CellsDiffering += r.differing
		cells.bits[j] = r.rows
		if r.rows != nil {
			if rows == nil {
				rows = make([]uint64, len(r.rows))
			}
			for k, w := range r.rows {
				rows[k] |= w
			}
		}
		s := ColumnSummary{Name: cc.name, WantType: cc.wc.Type(), GotType: cc.gc.Type(), Rule: cc.ruleText(), Differing: r.differing,
			HasDelta: cc.hasDelta(), MaxAbs: r.maxAbs, MaxRel: r.maxRel, MaxAbsAt: ref.rowRef(r.absAt), MaxRelAt: ref.rowRef(r.relAt)}
		d.Columns = append(d.Columns, s)
	}
	for _, w := range rows {
		d.RowsDiffering += popcount(w)
	}
	c.diffRows = rows
	cells.n = d.CellsDiffering
	if d.Limit >= 0 {
		cells.n = min(cells.n, d.Limit)
	}
	hold := c.cfg.holdUpTo
	d.Cells = listing[CellDiff](cells, hold)
	listed := func(count int) int {
		if d.Limit >= 0 {
			return min(count, d.Limit)
		}
		return count
	}
	if c.tail {
		d.Missing.Rows = listing[RowRef](&rowSource{t: ref, side: WantSide, first: c.tailFrom, n: listed(d.Missing.Count)}, hold)
		d.Extra.Rows = listing[RowRef](&rowSource{t: ref, side: GotSide, first: c.tailFrom, n: listed(d.Extra.Count)}, hold)
	} else {
		d.Missing.Rows = listing[RowRef](&rowSource{t: ref, side: WantSide, rows: c.missing, n: len(c.missing)}, hold)
		d.Extra.Rows = listing[RowRef](&rowSource{t: ref, side: GotSide, rows: c.extra, n: len(c.extra)}, hold)
	}
}
