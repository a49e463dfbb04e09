package pushdown

import (
	"context"
	"database/sql"
	"fmt"
	"math/big"
	"slices"
	"sort"
	"strconv"
	"strings"

	"github.com/proofsheet/proofsheet/assert"
	"github.com/proofsheet/proofsheet/fixtures"
)

// Source is one side of a comparison across two places: a relation in an
// engine.
type Source struct {
	Engine   *Engine
	Relation Relation
}

// acrossChunk is how many pairs of rows are compared at a time.
const acrossChunk = 1 << 15

// CompareAcross compares got with want when they live in different places
// (want in PostgreSQL and got in ClickHouse, or one side a Parquet file
// read by DuckDB): each engine streams its rows ordered by the key
// columns, text byte by byte, and the two streams are merged in bounded
// memory — a chunk of pairs at a time, compared by assert.Compare itself,
// plus the listed rows. The Diff is the one assert.Compare gives for the
// two relations in memory, rows numbered as Engine.Compare numbers them.
//
// Rows pair by key (ByKey), or by position when both relations have row
// numbers. AnyRowOrder is refused, and so is NormText on a key column
// (the engines could not order the keys as normalised); the other options
// apply as in memory, ULPs and NormText included. A stream whose keys come
// out of order (an engine sorting text by a collation) stops the
// comparison with an error rather than a wrong Diff.
func CompareAcross(ctx context.Context, want, got Source, opts ...assert.Option) (*assert.Diff, error) {
	return compareAcross(ctx, want, got, acrossChunk, acrossPage, opts)
}

func compareAcross(ctx context.Context, want, got Source, chunk, page int, opts []assert.Option) (*assert.Diff, error) {
	set := assert.SettingsOf(opts...)
	if set.Match == assert.MatchAsMultiset {
		return nil, refusal{"AnyRowOrder cannot be done across two places: rows are merged by key; give the key columns (ByKey)"}
	}
	for _, k := range set.Keys {
		if set.NormFor(k) != 0 {
			return nil, refusal{fmt.Sprintf("NormText on key column %q cannot be done across two places: the engines order the keys as they are", k)}
		}
	}
	a := &across{set: set, chunk: chunk, page: page}
	var err error
	if a.w, err = a.open(ctx, want, "want"); err != nil {
		return nil, err
	}
	if a.g, err = a.open(ctx, got, "got"); err != nil {
		return nil, err
	}
	if set.Match != assert.MatchByKey && (a.w.side.rownum == "" || a.g.side.rownum == "") {
		return nil, refusal{"the rows of a SQL relation have no order, so they cannot pair by position: give the key columns (ByKey), or a row-number column on both sides (Relation.RowNumber)"}
	}
	ew, err := fixtures.NewBuilder(a.w.side.schema()).Build()
	if err != nil {
		return nil, fmt.Errorf("pushdown: want (%s): %w", want.Relation, err)
	}
	eg, err := fixtures.NewBuilder(a.g.side.schema()).Build()
	if err != nil {
		return nil, fmt.Errorf("pushdown: got (%s): %w", got.Relation, err)
	}
	diff := assert.Compare(ew, eg, opts...)
	a.diff = diff
	if diff.Columns == nil && len(diff.Compared) > 0 {
		// The keys cannot pair rows: count them, as assert.Compare does.
		for _, s := range []*stream{a.w, a.g} {
			r := &run{e: s.src.Engine, q: s.src.Engine.DB}
			n, err := r.count(ctx, s.plan.count(s.side))
			if err != nil {
				return nil, err
			}
			if s == a.w {
				diff.WantRows = n
			} else {
				diff.GotRows = n
			}
		}
		return diff, nil
	}
	if err := a.merge(ctx); err != nil {
		return nil, err
	}
	agreeingTypes(diff)
	return diff, nil
}

// stream is one side's rows, in key order.
type stream struct {
	src   Source
	side  *side
	plan  *plan // the side's dialect and keys
	keys  []int // the side's key column indexes
	rows  interface{ Next() bool }
	scan  func() ([]any, error)
	close func()
	buf   []any // the row read ahead, nil at the end
	n     int   // rows read
}

type across struct {
	set   assert.Settings
	chunk int // pairs compared at a time
	page  int // rows a DuckDB stream fetches at a time
	w, g  *stream
	diff  *assert.Diff
	keys  []string // the key columns (ByKey), else none: rows pair by position

	chunkW, chunkG [][]any // canonical cells of the pairs of the chunk
	chunkWP        []int   // their row numbers
	chunkGP        []int
	cells          []listedCell
	maxAbs, maxRel map[string]*maxAt
	missing, extra []listedRow
	dupW, dupG     []listedDup
}

type listedCell struct {
	wp, col int
	cd      assert.CellDiff
}

type maxAt struct {
	v   float64
	ref assert.RowRef
	set bool
}

type listedRow struct {
	pos  int
	vals []any
}

type listedDup struct {
	first int
	key   []any
	rows  []int
	count int
}

// open describes a side and starts its stream.
func (a *across) open(ctx context.Context, src Source, which string) (*stream, error) {
	if src.Engine == nil || src.Engine.DB == nil {
		return nil, fmt.Errorf("pushdown: %s needs an Engine with a DB", which)
	}
	d, err := dialectOf(src.Engine.Dialect)
	if err != nil {
		return nil, err
	}
	r := &run{e: src.Engine, q: src.Engine.DB}
	if src.Engine.Dialect == ClickHouse {
		zone, err := r.scalarString(ctx, "SELECT timezone()")
		if err != nil {
			return nil, err
		}
		d = clickhouseDialect{zone: zone}
	}
	s, err := r.side(ctx, d, src.Relation, which, a.set)
	if err != nil {
		return nil, err
	}
	st := &stream{src: src, side: s, plan: &plan{d: d, keyed: a.set.Match == assert.MatchByKey}}
	for _, k := range a.set.Keys {
		if i := s.index(k); i >= 0 {
			st.keys = append(st.keys, i)
			st.plan.keys = append(st.plan.keys, &column{name: k})
		}
	}
	return st, nil
}

// start runs the side's query: every row with its number, ordered by the
// keys (or the number).
func (s *stream) start(ctx context.Context, page int) error {
	d := s.plan.d
	order := []string{}
	for _, k := range s.keys {
		x := cName(k)
		if s.side.types[k].t.Kind().IsText() {
			x = d.orderText(x)
		}
		order = append(order, x+" NULLS FIRST")
	}
	order = append(order, "p")
	names := []string{"p"}
	for i := range s.side.names {
		names = append(names, p2fetch(s.plan, cName(i), s.side.types[i].t))
	}
	if s.src.Engine.Dialect == DuckDB {
		return s.startPaged(ctx, names, order, page)
	}
	q := d.statement("SELECT " + strings.Join(names, ", ") + " FROM (" + s.plan.base(s.side) + ") AS b ORDER BY " + strings.Join(order, ", "))
	rows, err := s.src.Engine.DB.QueryContext(ctx, q)
	if err != nil {
		return &QueryError{SQL: q, Err: err}
	}
	s.read(rows, q, len(names))
	s.close = func() { rows.Close() }
	return s.advance()
}

// read sets the stream's rows and its scan of n columns.
func (s *stream) read(rows interface {
	Next() bool
	Scan(dest ...any) error
}, q string, n int) {
	vals := make([]any, n)
	ptrs := make([]any, n)
	for i := range vals {
		ptrs[i] = &vals[i]
	}
	s.rows = rows
	s.scan = func() ([]any, error) {
		if err := rows.Scan(ptrs...); err != nil {
			return nil, &QueryError{SQL: q, Err: err}
		}
		out := make([]any, n)
		for i, v := range vals {
			out[i] = deref(v)
		}
		return out, nil
	}
}

// acrossPage is how many sorted rows a DuckDB stream fetches at a time.
const acrossPage = 1 << 16

// startPaged streams a DuckDB side in key order in bounded memory. The
// DuckDB driver holds a query's whole result in memory before the first
// row comes back, so one ORDER BY query over a large file costs memory in
// proportion to its rows. Instead the sorted rows go into a temporary
// table (DuckDB sorts and stores it within its memory_limit, spilling to
// its temp_directory) and come back a page at a time by row id, in the
// order they were stored. The table lives on one connection of its own and
// is dropped when the stream closes.
func (s *stream) startPaged(ctx context.Context, names, order []string, page int) error {
	conn, err := s.src.Engine.DB.Conn(ctx)
	if err != nil {
		return fmt.Errorf("pushdown: reading %s: %w", s.side.rel, err)
	}
	aliased := make([]string, len(names))
	for i, x := range names {
		aliased[i] = x + " AS q" + strconv.Itoa(i)
	}
	const tbl = "proofsheet_across_sorted"
	q := "CREATE TEMP TABLE " + tbl + " AS SELECT " + strings.Join(aliased, ", ") + " FROM (" + s.plan.base(s.side) + ") AS b ORDER BY " + strings.Join(order, ", ")
	if _, err := conn.ExecContext(ctx, q); err != nil {
		conn.Close()
		return &QueryError{SQL: q, Err: err}
	}
	p := &pagedRows{ctx: ctx, conn: conn, page: int64(page), q: "SELECT * FROM " + tbl + " WHERE rowid >= ? AND rowid < ? ORDER BY rowid"}
	s.read(p, p.q, len(names))
	s.rows = p
	s.close = func() {
		if p.rows != nil {
			p.rows.Close()
		}
		// A fresh context: the table must go even when ctx was cancelled.
		conn.ExecContext(context.Background(), "DROP TABLE IF EXISTS "+tbl)
		conn.Close()
	}
	if err := s.advance(); err != nil {
		s.close()
		return err
	}
	return nil
}

// pagedRows reads a stored table page by page, in row id order, as one
// stream of rows.
type pagedRows struct {
	ctx  context.Context
	conn *sql.Conn
	q    string
	page int64 // rows per page
	lo   int64 // the first row id of the current page
	rows *sql.Rows
	got  int // rows read from the current page
	err  error
}

func (p *pagedRows) Next() bool {
	for p.err == nil {
		if p.rows == nil {
			p.rows, p.err = p.conn.QueryContext(p.ctx, p.q, p.lo, p.lo+p.page)
			p.got = 0
			if p.err != nil {
				p.err = &QueryError{SQL: p.q, Err: p.err}
				return false
			}
		}
		if p.rows.Next() {
			p.got++
			return true
		}
		p.err = p.rows.Err()
		p.rows.Close()
		p.rows = nil
		if int64(p.got) < p.page {
			return false // a short page is the last
		}
		p.lo += p.page
	}
	return false
}

func (p *pagedRows) Scan(dest ...any) error { return p.rows.Scan(dest...) }

func (p *pagedRows) Err() error { return p.err }

func p2fetch(p *plan, x string, t fixtures.Type) string { return p.fetch(x, t) }

// advance reads the next row into buf.
func (s *stream) advance() error {
	if !s.rows.Next() {
		s.buf = nil
		if r, ok := s.rows.(interface{ Err() error }); ok && r.Err() != nil {
			return fmt.Errorf("pushdown: reading %s: %w", s.side.rel, r.Err())
		}
		return nil
	}
	v, err := s.scan()
	if err != nil {
		return err
	}
	s.buf = v
	s.n++
	return nil
}

// group reads the rows that share the next key (one row when rows pair
// by position).
func (a *across) group(s *stream, byKey bool) ([][]any, error) {
	if s.buf == nil {
		return nil, nil
	}
	first := s.buf
	out := [][]any{first}
	if err := s.advance(); err != nil {
		return nil, err
	}
	for byKey && s.buf != nil {
		c, err := a.cmpKeys(s, s.buf, s, first)
		if err != nil {
			return nil, err
		}
		if c < 0 {
			return nil, fmt.Errorf("pushdown: %s (%s) sent its rows out of key order; its ORDER BY does not sort the keys byte by byte", s.src.Engine.Dialect, s.side.rel)
		}
		if c > 0 {
			break
		}
		out = append(out, s.buf)
		if err := s.advance(); err != nil {
			return nil, err
		}
	}
	return out, nil
}

// cmpKeys orders two rows (of either side) by their keys: nulls first,
// then values as assert compares keys (text by bytes, decimals and times
// by value).
func (a *across) cmpKeys(s *stream, x []any, t *stream, y []any) (int, error) {
	for j := range s.keys {
		xi, yi := s.keys[j], t.keys[j]
		c, err := cmpCanonical(x[1+xi], s.side.types[xi].t, y[1+yi], t.side.types[yi].t)
		if err != nil || c != 0 {
			return c, err
		}
	}
	return 0, nil
}

// cmpCanonical orders two canonical values of possibly different types of
// one class.
func cmpCanonical(x any, xt fixtures.Type, y any, yt fixtures.Type) (int, error) {
	switch {
	case x == nil && y == nil:
		return 0, nil
	case x == nil:
		return -1, nil
	case y == nil:
		return 1, nil
	}
	switch xt.Kind() {
	case fixtures.KindBool:
		a, err1 := asBool(x)
		b, err2 := asBool(y)
		if err := firstErr(err1, err2); err != nil {
			return 0, err
		}
		switch {
		case a == b:
			return 0, nil
		case !a:
			return -1, nil
		}
		return 1, nil
	case fixtures.KindString, fixtures.KindCategory:
		return strings.Compare(asString(x), asString(y)), nil
	case fixtures.KindDecimal:
		a, ok1 := new(big.Rat).SetString(asString(x))
		b, ok2 := new(big.Rat).SetString(asString(y))
		if !ok1 || !ok2 {
			return 0, fmt.Errorf("pushdown: bad decimals %v, %v from an engine", x, y)
		}
		return a.Cmp(b), nil
	case fixtures.KindTimestamp:
		a, err1 := asInt(x)
		b, err2 := asInt(y)
		if err := firstErr(err1, err2); err != nil {
			return 0, err
		}
		ra := new(big.Int).Mul(big.NewInt(a), big.NewInt(int64(xt.Unit().Duration())))
		rb := new(big.Int).Mul(big.NewInt(b), big.NewInt(int64(yt.Unit().Duration())))
		return ra.Cmp(rb), nil
	}
	a, err1 := asInt(x)
	b, err2 := asInt(y)
	if err := firstErr(err1, err2); err != nil {
		return 0, err
	}
	switch {
	case a < b:
		return -1, nil
	case a > b:
		return 1, nil
	}
	return 0, nil
}

func firstErr(errs ...error) error {
	for _, e := range errs {
		if e != nil {
			return e
		}
	}
	return nil
}

func pos(row []any) int {
	n, _ := asInt(row[0])
	return int(n)
}

// merge reads both streams and fills the Diff.
func (a *across) merge(ctx context.Context) error {
	byKey := a.set.Match == assert.MatchByKey
	for _, s := range []*stream{a.w, a.g} {
		if err := s.start(ctx, a.page); err != nil {
			return err
		}
		defer s.close()
	}
	a.maxAbs, a.maxRel = map[string]*maxAt{}, map[string]*maxAt{}
	var gw, gg [][]any
	var err error
	if gw, err = a.group(a.w, byKey); err != nil {
		return err
	}
	if gg, err = a.group(a.g, byKey); err != nil {
		return err
	}
	for gw != nil || gg != nil {
		c := 0
		switch {
		case gw == nil:
			c = 1
		case gg == nil:
			c = -1
		case byKey:
			if c, err = a.cmpKeys(a.w, gw[0], a.g, gg[0]); err != nil {
				return err
			}
		default:
			c = pos(gw[0]) - pos(gg[0])
		}
		var ws, gs [][]any
		switch {
		case c < 0:
			ws = gw
		case c > 0:
			gs = gg
		default:
			ws, gs = gw, gg
		}
		a.pairGroup(ws, gs)
		if c <= 0 {
			if gw, err = a.group(a.w, byKey); err != nil {
				return err
			}
		}
		if c >= 0 {
			if gg, err = a.group(a.g, byKey); err != nil {
				return err
			}
		}
		if len(a.chunkW) >= a.chunk {
			if err := a.flush(); err != nil {
				return err
			}
		}
	}
	if err := a.flush(); err != nil {
		return err
	}
	return a.finish()
}

// pairGroup pairs the rows of one key in row order and keeps the missing,
// extra and repeated ones.
func (a *across) pairGroup(ws, gs [][]any) {
	for i := 0; i < max(len(ws), len(gs)); i++ {
		switch {
		case i < len(ws) && i < len(gs):
			a.chunkW = append(a.chunkW, ws[i][1:])
			a.chunkG = append(a.chunkG, gs[i][1:])
			a.chunkWP = append(a.chunkWP, pos(ws[i]))
			a.chunkGP = append(a.chunkGP, pos(gs[i]))
		case i < len(ws):
			a.diff.Missing.Count++
			a.missing = keepFirst(a.missing, listedRow{pos(ws[i]), ws[i][1:]}, a.diff.Limit, func(r listedRow) int { return r.pos })
		default:
			a.diff.Extra.Count++
			a.extra = keepFirst(a.extra, listedRow{pos(gs[i]), gs[i][1:]}, a.diff.Limit, func(r listedRow) int { return r.pos })
		}
	}
	for _, g := range []struct {
		rows [][]any
		s    *stream
		list *[]listedDup
		n    *int
	}{{ws, a.w, &a.dupW, &a.diff.Duplicates.WantKeys}, {gs, a.g, &a.dupG, &a.diff.Duplicates.GotKeys}} {
		if len(g.rows) < 2 {
			continue
		}
		*g.n++
		d := listedDup{first: pos(g.rows[0]), count: len(g.rows), key: g.rows[0][1:]}
		for _, r := range g.rows {
			if a.diff.Limit >= 0 && len(d.rows) >= a.diff.Limit {
				break
			}
			d.rows = append(d.rows, pos(r))
		}
		*g.list = keepFirst(*g.list, d, a.diff.Limit, func(d listedDup) int { return d.first })
	}
}

// keepFirst adds e to the list and keeps the limit entries with the
// smallest order (all for a negative limit).
func keepFirst[T any](list []T, e T, limit int, order func(T) int) []T {
	if limit == 0 {
		return list
	}
	i := sort.Search(len(list), func(i int) bool { return order(list[i]) > order(e) })
	if limit > 0 && len(list) >= limit && i >= limit {
		return list
	}
	list = slices.Insert(list, i, e)
	if limit > 0 && len(list) > limit {
		list = list[:limit]
	}
	return list
}

// chunkOptions are the options without the key: the chunk's pairs are
// compared by position.
func (a *across) chunkOptions() []assert.Option {
	s := a.set
	var out []assert.Option
	for col, r := range s.Tols {
		if r.ByULPs {
			out = append(out, assert.ULPs(col, uint(r.ULPs)))
		} else if r.ByTol {
			out = append(out, assert.Tol(col, r.Abs, r.Rel))
		}
	}
	for col, d := range s.TimeTols {
		out = append(out, assert.TimeTol(col, d))
	}
	for col, n := range s.Norms {
		out = append(out, assert.NormText(col, n))
	}
	if len(s.Ignore) > 0 {
		out = append(out, assert.IgnoreColumns(s.Ignore...))
	}
	if s.LooseTypes {
		out = append(out, assert.LooseTypes())
	}
	if s.AnyColumnOrder {
		out = append(out, assert.AnyColumnOrder())
	}
	if s.NaNIsNull {
		out = append(out, assert.NaNIsNull())
	}
	return append(out, assert.ListLimit(s.Limit))
}

// flush compares the chunk's pairs, in want's row order, with
// assert.Compare and folds the result into the Diff.
func (a *across) flush() error {
	if len(a.chunkW) == 0 {
		return nil
	}
	order := make([]int, len(a.chunkW))
	for i := range order {
		order[i] = i
	}
	sort.Slice(order, func(x, y int) bool { return a.chunkWP[order[x]] < a.chunkWP[order[y]] })
	wrows, grows := make([][]any, len(order)), make([][]any, len(order))
	wp, gp := make([]int, len(order)), make([]int, len(order))
	for k, i := range order {
		wrows[k], grows[k], wp[k], gp[k] = a.chunkW[i], a.chunkG[i], a.chunkWP[i], a.chunkGP[i]
	}
	a.chunkW, a.chunkG, a.chunkWP, a.chunkGP = a.chunkW[:0], a.chunkG[:0], a.chunkWP[:0], a.chunkGP[:0]
	cw, err := listingTable(a.w.side.schema(), wrows, func(row []any, j int) any { return row[j] })
	if err != nil {
		return err
	}
	cg, err := listingTable(a.g.side.schema(), grows, func(row []any, j int) any { return row[j] })
	if err != nil {
		return err
	}
	d := assert.Compare(cw, cg, a.chunkOptions()...)
	ref := func(slot int) assert.RowRef {
		r := assert.RowRef{Want: wp[slot], Got: gp[slot]}
		if a.set.Match == assert.MatchByKey {
			for _, k := range a.w.keys {
				r.Key = append(r.Key, fixtures.LiteralCell(cw.ColumnAt(k), slot))
			}
		}
		return r
	}
	a.diff.RowsDiffering += d.RowsDiffering
	colIndex := map[string]int{}
	for i, c := range a.diff.Columns {
		colIndex[c.Name] = i
	}
	keyed := map[string]bool{}
	for _, k := range a.keysOf() {
		keyed[k] = true
	}
	for _, c := range d.Columns {
		i, ok := colIndex[c.Name]
		if !ok || keyed[c.Name] {
			continue
		}
		cs := &a.diff.Columns[i]
		cs.Differing += c.Differing
		a.diff.CellsDiffering += c.Differing
		if !c.HasDelta {
			continue
		}
		fold := func(m map[string]*maxAt, v float64, at assert.RowRef) {
			if at.Want < 0 {
				return
			}
			cur := m[c.Name]
			r := ref(at.Want)
			if cur == nil || v > cur.v || (v == cur.v && r.Want < cur.ref.Want) {
				m[c.Name] = &maxAt{v: v, ref: r, set: true}
			}
		}
		fold(a.maxAbs, c.MaxAbs, c.MaxAbsAt)
		fold(a.maxRel, c.MaxRel, c.MaxRelAt)
	}
	for _, cd := range d.Cells.Slice() {
		if keyed[cd.Column] {
			continue
		}
		slot := cd.Row.Want
		cd.Row = ref(slot)
		lc := listedCell{wp: wp[slot], col: colIndex[cd.Column], cd: cd}
		a.cells = keepFirst(a.cells, lc, a.diff.Limit, func(c listedCell) int { return c.wp*(len(a.diff.Columns)+1) + c.col })
	}
	return nil
}

func (a *across) keysOf() []string {
	if a.set.Match != assert.MatchByKey {
		return nil
	}
	return a.set.Keys
}

// finish writes the listings and totals into the Diff.
func (a *across) finish() error {
	d := a.diff
	d.WantRows, d.GotRows = a.w.n, a.g.n
	// The pictures' overview needs every row of both tables at once; the
	// chunks cannot build it, so a Diff across two places has none, as a
	// Diff pushed into an engine has none (README, Engines).
	d.Overview = nil
	for i := range d.Columns {
		c := &d.Columns[i]
		if m := a.maxAbs[c.Name]; m != nil {
			c.MaxAbs, c.MaxAbsAt = m.v, m.ref
		}
		if m := a.maxRel[c.Name]; m != nil {
			c.MaxRel, c.MaxRelAt = m.v, m.ref
		}
	}
	cells := make([]assert.CellDiff, len(a.cells))
	for i, c := range a.cells {
		cells[i] = c.cd
	}
	d.Cells = assert.ListOf(cells...)
	rows := func(s *stream, list []listedRow, want bool) (assert.Listing[assert.RowRef], error) {
		vals := make([][]any, len(list))
		for i, r := range list {
			vals[i] = r.vals
		}
		t, err := listingTable(s.side.schema(), vals, func(row []any, j int) any { return row[j] })
		if err != nil {
			return assert.Listing[assert.RowRef]{}, err
		}
		out := make([]assert.RowRef, len(list))
		for i, r := range list {
			cells := literalRow(t, i)
			ref := assert.RowRef{Want: -1, Got: -1, Cells: cells}
			if want {
				ref.Want = r.pos
			} else {
				ref.Got = r.pos
			}
			for _, k := range s.keys {
				if a.set.Match == assert.MatchByKey {
					ref.Key = append(ref.Key, cells[k])
				}
			}
			out[i] = ref
		}
		return assert.ListOf(out...), nil
	}
	var err error
	if d.Missing.Rows, err = rows(a.w, a.missing, true); err != nil {
		return err
	}
	if d.Extra.Rows, err = rows(a.g, a.extra, false); err != nil {
		return err
	}
	var dups []assert.DuplicateKey
	for _, g := range []struct {
		s    *stream
		list []listedDup
		side assert.Side
	}{{a.w, a.dupW, assert.WantSide}, {a.g, a.dupG, assert.GotSide}} {
		vals := make([][]any, len(g.list))
		for i, x := range g.list {
			vals[i] = x.key
		}
		t, err := listingTable(g.s.side.schema(), vals, func(row []any, j int) any { return row[j] })
		if err != nil {
			return err
		}
		for i, x := range g.list {
			if d.Limit >= 0 && len(dups) >= d.Limit {
				break
			}
			dk := assert.DuplicateKey{Side: g.side, Count: x.count, Rows: x.rows}
			for _, k := range g.s.keys {
				dk.Key = append(dk.Key, fixtures.LiteralCell(t.ColumnAt(k), i))
			}
			dups = append(dups, dk)
		}
	}
	d.Duplicates.Keys = dups
	return nil
}
