package pushdown

import (
	"context"
	"database/sql"
	"errors"
	"fmt"
	"math"
	"reflect"
	"slices"
	"strconv"
	"strings"
	"time"

	"github.com/proofsheet/proofsheet/assert"
	"github.com/proofsheet/proofsheet/fixtures"
)

// Engine is a database that comparisons run in.
type Engine struct {
	// DB is the database. The comparison only reads.
	DB *sql.DB
	// Dialect is the SQL it speaks.
	Dialect Dialect
	// Progress, when set, is called as each step of a comparison starts,
	// with what the engine is doing ("pairing rows and counting
	// differences"), for a progress line on a terminal.
	Progress func(step string)
}

// querier is a database or a transaction.
type querier interface {
	QueryContext(ctx context.Context, query string, args ...any) (*sql.Rows, error)
}

// Compare compares the relation got with the relation want inside the
// engine, under the same options as assert.Compare, and returns the same
// Diff that assert.Compare would return for the two relations loaded into
// tables (rows numbered as Relation.RowNumber says). Only the summary and
// the listed rows leave the engine.
//
// An option that cannot be carried out in SQL (AnyRowOrder, ULPs,
// NormText, pairing by position without row numbers) is refused with an
// error that says so; so is a column whose type has no proofsheet type.
// Problems that assert.Compare reports in the Diff (a key column missing
// on a side, a tolerance on a text column) come back the same way, in the
// Diff. In PostgreSQL the queries share one read-only snapshot.
func (e *Engine) Compare(ctx context.Context, want, got Relation, opts ...assert.Option) (*assert.Diff, error) {
	if e == nil || e.DB == nil {
		return nil, errors.New("pushdown: Compare needs an Engine with a DB")
	}
	d, err := dialectOf(e.Dialect)
	if err != nil {
		return nil, err
	}
	var q querier = e.DB
	if e.Dialect == PostgreSQL {
		tx, err := e.DB.BeginTx(ctx, &sql.TxOptions{Isolation: sql.LevelRepeatableRead, ReadOnly: true})
		if err != nil {
			return nil, fmt.Errorf("pushdown: starting a read-only transaction: %w", err)
		}
		defer tx.Rollback() //nolint:errcheck // read-only: nothing to keep
		q = tx
	}
	r := &run{e: e, q: q}
	if e.Dialect == ClickHouse {
		zone, err := r.scalarString(ctx, "SELECT timezone()")
		if err != nil {
			return nil, err
		}
		d = clickhouseDialect{zone: zone}
	}
	set := assert.SettingsOf(opts...)
	r.step("reading the columns")
	ws, err := r.side(ctx, d, want, "want", set)
	if err != nil {
		return nil, err
	}
	gs, err := r.side(ctx, d, got, "got", set)
	if err != nil {
		return nil, err
	}
	// Compare decides everything that depends only on the schemas: the
	// option problems, schema changes, compared columns and their rules.
	ew, err := fixtures.NewBuilder(ws.schema()).Build()
	if err != nil {
		return nil, fmt.Errorf("pushdown: want (%s): %w", want, err)
	}
	eg, err := fixtures.NewBuilder(gs.schema()).Build()
	if err != nil {
		return nil, fmt.Errorf("pushdown: got (%s): %w", got, err)
	}
	diff := assert.Compare(ew, eg, opts...)
	// The pictures' overview needs every row; an engine returns none
	// (README, Engines).
	diff.Overview = nil
	p, err := newPlan(d, ws, gs, set, diff.Compared)
	if err != nil {
		return nil, err
	}
	r.step("counting rows")
	if diff.WantRows, err = r.count(ctx, p.count(ws)); err != nil {
		return nil, err
	}
	if diff.GotRows, err = r.count(ctx, p.count(gs)); err != nil {
		return nil, err
	}
	if !p.pairable || diff.Columns == nil && len(diff.Compared) > 0 {
		return diff, nil
	}
	if p.keyed {
		r.step("looking for repeated keys")
		if err := r.repeats(ctx, p, diff); err != nil {
			return nil, err
		}
	}
	r.step("pairing rows and counting differences")
	at, err := r.summary(ctx, p, diff)
	if err != nil {
		return nil, err
	}
	if diff.CellsDiffering > 0 || len(at) > 0 {
		r.step("listing differing cells")
		if err := r.pairs(ctx, p, diff, at); err != nil {
			return nil, err
		}
	}
	agreeingTypes(diff)
	if diff.Missing.Count > 0 {
		r.step("listing missing rows")
		rows, err := r.sideRows(ctx, p, true, diff.Limit)
		if err != nil {
			return nil, err
		}
		diff.Missing.Rows = assert.ListOf(rows...)
	}
	if diff.Extra.Count > 0 {
		r.step("listing extra rows")
		rows, err := r.sideRows(ctx, p, false, diff.Limit)
		if err != nil {
			return nil, err
		}
		diff.Extra.Rows = assert.ListOf(rows...)
	}
	return diff, nil
}

// agreeingTypes corrects the hints that a column's type changed in a way
// LooseTypes accepts: assert.Compare, given the schemas without rows,
// says the values agree, which holds only where no cell differs. The hints that need every row (rows
// in another order, keys that differ only in spelling, a column off by a
// factor) are not computed in the engine.
func agreeingTypes(diff *assert.Diff) {
	for i, h := range diff.Hints {
		if h.Kind != assert.HintLooseTypes {
			continue
		}
		for _, c := range diff.Columns {
			if c.Name == h.Column && c.Differing > 0 {
				diff.Hints[i].Text = strings.TrimSuffix(h.Text, "; the values agree, only the type differs")
			}
		}
	}
}

// run is one Compare call.
type run struct {
	e *Engine
	q querier
}

func (r *run) step(what string) {
	if r.e.Progress != nil {
		r.e.Progress(what)
	}
}

func (r *run) query(ctx context.Context, q string) (*sql.Rows, error) {
	rows, err := r.q.QueryContext(ctx, q)
	if err != nil {
		return nil, &QueryError{SQL: q, Err: err}
	}
	return rows, nil
}

// QueryError is a query the engine refused or failed, with its text.
type QueryError struct {
	SQL string
	Err error
}

func (e *QueryError) Error() string {
	q := e.SQL
	if len(q) > 300 {
		q = q[:300] + " …"
	}
	return fmt.Sprintf("pushdown: the engine failed: %v (query: %s)", e.Err, q)
}

func (e *QueryError) Unwrap() error { return e.Err }

// each runs a query and calls f with the values of each row.
func (r *run) each(ctx context.Context, q string, f func(vals []any) error) error {
	rows, err := r.query(ctx, q)
	if err != nil {
		return err
	}
	defer rows.Close()
	cols, err := rows.Columns()
	if err != nil {
		return &QueryError{SQL: q, Err: err}
	}
	vals := make([]any, len(cols))
	ptrs := make([]any, len(cols))
	for i := range vals {
		ptrs[i] = &vals[i]
	}
	for rows.Next() {
		if err := rows.Scan(ptrs...); err != nil {
			return &QueryError{SQL: q, Err: err}
		}
		for i, v := range vals {
			vals[i] = deref(v)
		}
		if err := f(vals); err != nil {
			return err
		}
	}
	if err := rows.Err(); err != nil {
		return &QueryError{SQL: q, Err: err}
	}
	return nil
}

func (r *run) count(ctx context.Context, q string) (int, error) {
	n := 0
	err := r.each(ctx, q, func(v []any) error {
		x, err := asInt(v[0])
		n = int(x)
		return err
	})
	return n, err
}

func (r *run) scalarString(ctx context.Context, q string) (string, error) {
	s := ""
	err := r.each(ctx, q, func(v []any) error {
		s = asString(v[0])
		return nil
	})
	return s, err
}

// side reads a relation's columns and their types.
func (r *run) side(ctx context.Context, d sqlDialect, rel Relation, which string, set assert.Settings) (*side, error) {
	from, err := rel.from(d)
	if err != nil {
		return nil, err
	}
	s := &side{rel: rel, from: from}
	rows, err := r.query(ctx, describe(d, from))
	if err != nil {
		return nil, fmt.Errorf("pushdown: %s (%s): %w", which, rel, err)
	}
	cts, err := rows.ColumnTypes()
	rows.Close()
	if err != nil {
		return nil, fmt.Errorf("pushdown: %s (%s): reading its columns: %w", which, rel, err)
	}
	found := false
	for _, ct := range cts {
		name := ct.Name()
		if rel.RowNumber != "" && name == rel.RowNumber {
			found = true
			s.rownum = d.ident(name)
			continue
		}
		p, sc, ok := ct.DecimalSize()
		t, err := d.columnType(ct.DatabaseTypeName(), p, sc, ok)
		if err != nil {
			if slices.Contains(set.Ignore, name) {
				// An ignored column is only listed, as text.
				t = colType{fixtures.String, d.text("%s")}
			} else {
				return nil, fmt.Errorf("pushdown: %s (%s): column %q: %w", which, rel, name, err)
			}
		}
		s.names = append(s.names, name)
		s.types = append(s.types, t)
	}
	if rel.RowNumber != "" && !found {
		return nil, fmt.Errorf("pushdown: %s (%s) has no row-number column %q (columns: %s)", which, rel, rel.RowNumber, strings.Join(s.names, ", "))
	}
	return s, nil
}

// repeats fills the Diff's repeated keys and decides which sides pair
// rows by key and rank.
func (r *run) repeats(ctx context.Context, p *plan, diff *assert.Diff) error {
	for _, sd := range []struct {
		s    *side
		side assert.Side
	}{{p.want, assert.WantSide}, {p.got, assert.GotSide}} {
		n, err := r.count(ctx, p.repeatCount(sd.s))
		if err != nil {
			return err
		}
		if n == 0 {
			continue
		}
		if sd.side == assert.WantSide {
			p.ordW, diff.Duplicates.WantKeys = true, n
		} else {
			p.ordG, diff.Duplicates.GotKeys = true, n
		}
		room := -1
		if diff.Limit >= 0 {
			room = diff.Limit - len(diff.Duplicates.Keys)
			if room <= 0 {
				continue
			}
		}
		keys := p.keyIndexes(sd.s)
		var rows [][]any
		err = r.each(ctx, p.repeats(sd.s, room), func(v []any) error {
			rows = append(rows, slices.Clone(v))
			return nil
		})
		if err != nil {
			return err
		}
		t, err := listingTable(p.keyFields(sd.s), rows, func(row []any, j int) any { return row[j] })
		if err != nil {
			return err
		}
		for i, row := range rows {
			count, err := asInt(row[len(keys)])
			if err != nil {
				return err
			}
			dk := assert.DuplicateKey{Side: sd.side, Key: literalRow(t, i), Count: int(count)}
			for _, f := range strings.Split(asString(row[len(keys)+2]), ",") {
				if diff.Limit >= 0 && len(dk.Rows) >= diff.Limit {
					break
				}
				pos, err := strconv.Atoi(strings.TrimSpace(f))
				if err != nil {
					return fmt.Errorf("pushdown: reading the rows of a repeated key: %w", err)
				}
				dk.Rows = append(dk.Rows, pos)
			}
			diff.Duplicates.Keys = append(diff.Duplicates.Keys, dk)
		}
	}
	return nil
}

// keyFields is the schema of a side's key columns.
func (p *plan) keyFields(s *side) fixtures.Schema {
	var out fixtures.Schema
	for _, i := range p.keyIndexes(s) {
		out = append(out, fixtures.Col(s.names[i], s.types[i].t))
	}
	return out
}

// summary fills the counts and largest deltas, and returns the want rows
// where the largest deltas sit.
func (r *run) summary(ctx context.Context, p *plan, diff *assert.Diff) ([]int64, error) {
	q, meta := p.summary()
	var at []int64
	err := r.each(ctx, q, func(v []any) error {
		ints := func(i int) (int, error) {
			x, err := asInt(v[i])
			return int(x), err
		}
		var err error
		if diff.Missing.Count, err = ints(0); err != nil {
			return err
		}
		if diff.Extra.Count, err = ints(1); err != nil {
			return err
		}
		if diff.RowsDiffering, err = ints(2); err != nil {
			return err
		}
		tracked := false
		for i, m := range meta {
			x := v[3+i]
			cs := &diff.Columns[slices.IndexFunc(diff.Columns, func(s assert.ColumnSummary) bool { return s.Name == m.c.name })]
			switch m.what {
			case "differing":
				if cs.Differing, err = ints(3 + i); err != nil {
					return err
				}
				diff.CellsDiffering += cs.Differing
			case "tracked":
				n, err := ints(3 + i)
				if err != nil {
					return err
				}
				tracked = n > 0
			case "maxabs", "maxrel":
				if !tracked {
					continue
				}
				f, err := asFloat(x)
				if err != nil {
					return err
				}
				if m.what == "maxabs" {
					cs.MaxAbs = f
				} else {
					cs.MaxRel = f
				}
			case "absat", "relat":
				// A largest distance of 0 sits nowhere (assert.ColumnSummary).
				if !tracked || (m.what == "absat" && cs.MaxAbs == 0) || (m.what == "relat" && cs.MaxRel == 0) {
					continue
				}
				pos, err := asInt(x)
				if err != nil {
					return err
				}
				ref := assert.RowRef{Want: int(pos), Got: -1}
				if m.what == "absat" {
					cs.MaxAbsAt = ref
				} else {
					cs.MaxRelAt = ref
				}
				if !slices.Contains(at, pos) {
					at = append(at, pos)
				}
			}
		}
		return nil
	})
	slices.Sort(at)
	return at, err
}

// pairs lists the differing cells and completes the rows where the
// largest deltas sit.
func (r *run) pairs(ctx context.Context, p *plan, diff *assert.Diff, at []int64) error {
	cols := p.compared()
	type pair struct {
		wp, gp int
		vals   []any
	}
	var got []pair
	err := r.each(ctx, p.pairRows(at, diff.Limit), func(v []any) error {
		wp, err := asInt(v[0])
		if err != nil {
			return err
		}
		gp, err := asInt(v[1])
		if err != nil {
			return err
		}
		got = append(got, pair{int(wp), int(gp), slices.Clone(v[2:])})
		return nil
	})
	if err != nil {
		return err
	}
	// Where each compared column's values sit in a row of pairRows.
	nk := len(p.keys)
	offs := make([]int, len(cols))
	o := nk
	for j, c := range cols {
		offs[j] = o
		o += 3
		if c.hasDelta() {
			o += 2
		}
	}
	// Cells as tables of want's and got's types, for their spelling.
	var wf, gf fixtures.Schema
	wf = append(wf, p.keyFields(p.want)...)
	for _, c := range cols {
		wf = append(wf, fixtures.Col(c.name, c.wt))
		gf = append(gf, fixtures.Col(c.name, c.gt))
	}
	rows := make([][]any, len(got))
	for i, pr := range got {
		rows[i] = pr.vals
	}
	wt, err := listingTable(wf, rows, func(row []any, j int) any {
		if j < nk {
			return row[j]
		}
		return row[offs[j-nk]]
	})
	if err != nil {
		return err
	}
	gt, err := listingTable(gf, rows, func(row []any, j int) any { return row[offs[j]+1] })
	if err != nil {
		return err
	}
	refs := make(map[int]assert.RowRef, len(got))
	var listed []pair
	var order []int
	for i, pr := range got {
		ref := assert.RowRef{Want: pr.wp, Got: pr.gp}
		if p.keyed {
			ref.Key = literalRow(wt, i)[:nk]
		}
		refs[pr.wp] = ref
		listed = append(listed, pr)
		order = append(order, i)
	}
	// Rows in want's order; the first Limit differing cells, row by row,
	// column by column.
	slices.SortFunc(order, func(a, b int) int { return listed[a].wp - listed[b].wp })
	var cells []assert.CellDiff
	for _, i := range order {
		pr := listed[i]
		for j, c := range cols {
			off := offs[j]
			dif, err := asBool(pr.vals[off+2])
			if err != nil {
				return err
			}
			if !dif {
				continue
			}
			if diff.Limit >= 0 && len(cells) >= diff.Limit {
				break
			}
			cd := assert.CellDiff{Row: refs[pr.wp], Column: c.name, Want: cellAt(wt, nk+j, i), Got: cellAt(gt, j, i)}
			if c.hasDelta() && pr.vals[off+3] != nil {
				cd.Delta.Has = true
				if cd.Delta.Abs, err = asFloat(pr.vals[off+3]); err != nil {
					return err
				}
				if cd.Delta.Rel, err = asFloat(pr.vals[off+4]); err != nil {
					return err
				}
			}
			cells = append(cells, cd)
		}
	}
	diff.Cells = assert.ListOf(cells...)
	for i := range diff.Columns {
		cs := &diff.Columns[i]
		if cs.MaxAbsAt.Want >= 0 {
			cs.MaxAbsAt = refs[cs.MaxAbsAt.Want]
		}
		if cs.MaxRelAt.Want >= 0 {
			cs.MaxRelAt = refs[cs.MaxRelAt.Want]
		}
	}
	return nil
}

// sideRows lists missing (want) or extra rows.
func (r *run) sideRows(ctx context.Context, p *plan, want bool, limit int) ([]assert.RowRef, error) {
	s := p.got
	if want {
		s = p.want
	}
	var rows [][]any
	var pos []int
	err := r.each(ctx, p.sideRows(want, limit), func(v []any) error {
		n, err := asInt(v[0])
		pos = append(pos, int(n))
		rows = append(rows, slices.Clone(v[1:]))
		return err
	})
	if err != nil {
		return nil, err
	}
	t, err := listingTable(s.schema(), rows, func(row []any, j int) any { return row[j] })
	if err != nil {
		return nil, err
	}
	keys := p.keyIndexes(s)
	out := make([]assert.RowRef, len(rows))
	for i := range rows {
		cells := literalRow(t, i)
		ref := assert.RowRef{Want: -1, Got: -1, Cells: cells}
		if want {
			ref.Want = pos[i]
		} else {
			ref.Got = pos[i]
		}
		if p.keyed {
			for _, k := range keys {
				ref.Key = append(ref.Key, cells[k])
			}
		}
		out[i] = ref
	}
	return out, nil
}

// listingTable builds a table of the given schema from fetched canonical
// values (value(row, j) is column j's value in a row), so that cells are
// spelled exactly as assert spells cells of tables.
func listingTable(schema fixtures.Schema, rows [][]any, value func(row []any, j int) any) (*fixtures.Table, error) {
	b := fixtures.NewBuilder(schema)
	vals := make([]any, len(schema))
	for _, row := range rows {
		for j, f := range schema {
			v, err := goValue(value(row, j), f.Type)
			if err != nil {
				return nil, fmt.Errorf("pushdown: column %q: %w", f.Name, err)
			}
			vals[j] = v
		}
		b.Row(vals...)
	}
	t, err := b.Build()
	if err != nil {
		return nil, fmt.Errorf("pushdown: building the listed rows: %w", err)
	}
	return t, nil
}

func literalRow(t *fixtures.Table, i int) []string {
	out := make([]string, t.NumCols())
	for j := range out {
		out[j] = fixtures.LiteralCell(t.ColumnAt(j), i)
	}
	return out
}

func cellAt(t *fixtures.Table, j, i int) assert.Cell {
	c := t.ColumnAt(j)
	return assert.Cell{Text: fixtures.LiteralCell(c, i), Kind: c.Kind(), Null: c.IsNull(i), Value: c.Value(i)}
}

// goValue turns a canonical value into what fixtures.Builder takes for
// the type.
func goValue(v any, t fixtures.Type) (any, error) {
	if v == nil {
		return nil, nil
	}
	switch t.Kind() {
	case fixtures.KindBool:
		return asBool(v)
	case fixtures.KindInt64:
		return asInt(v)
	case fixtures.KindFloat64:
		return asFloat(v)
	case fixtures.KindString, fixtures.KindCategory, fixtures.KindDecimal:
		return asString(v), nil
	case fixtures.KindDate:
		days, err := asInt(v)
		return time.Unix(days*86400, 0).UTC(), err
	case fixtures.KindTimestamp:
		ticks, err := asInt(v)
		if err != nil {
			return nil, err
		}
		switch t.Unit() {
		case fixtures.Seconds:
			return time.Unix(ticks, 0).UTC(), nil
		case fixtures.Millis:
			return time.UnixMilli(ticks).UTC(), nil
		case fixtures.Micros:
			return time.UnixMicro(ticks).UTC(), nil
		}
		return time.Unix(0, ticks).UTC(), nil
	}
	return nil, fmt.Errorf("no value for type %s", t)
}

// deref follows the pointers some drivers return for nullable values.
func deref(v any) any {
	for v != nil {
		rv := reflect.ValueOf(v)
		if rv.Kind() != reflect.Pointer {
			return v
		}
		if rv.IsNil() {
			return nil
		}
		v = rv.Elem().Interface()
	}
	return v
}

func asInt(v any) (int64, error) {
	rv := reflect.ValueOf(v)
	switch rv.Kind() {
	case reflect.Int, reflect.Int8, reflect.Int16, reflect.Int32, reflect.Int64:
		return rv.Int(), nil
	case reflect.Uint, reflect.Uint8, reflect.Uint16, reflect.Uint32, reflect.Uint64:
		if rv.Uint() > math.MaxInt64 {
			return 0, fmt.Errorf("pushdown: %d is out of the int64 range", rv.Uint())
		}
		return int64(rv.Uint()), nil
	case reflect.Float32, reflect.Float64:
		f := rv.Float()
		if f != math.Trunc(f) || f < -(1<<63) || f >= 1<<63 {
			return 0, fmt.Errorf("pushdown: %v is not an integer", f)
		}
		return int64(f), nil
	case reflect.String:
		return strconv.ParseInt(rv.String(), 10, 64)
	case reflect.Slice:
		if b, ok := v.([]byte); ok {
			return strconv.ParseInt(string(b), 10, 64)
		}
	}
	return 0, fmt.Errorf("pushdown: got %T %v from the engine, want an integer", v, v)
}

func asFloat(v any) (float64, error) {
	rv := reflect.ValueOf(v)
	switch rv.Kind() {
	case reflect.Float32, reflect.Float64:
		return rv.Float(), nil
	case reflect.Int, reflect.Int8, reflect.Int16, reflect.Int32, reflect.Int64:
		return float64(rv.Int()), nil
	case reflect.String:
		return strconv.ParseFloat(rv.String(), 64)
	}
	return 0, fmt.Errorf("pushdown: got %T %v from the engine, want a float", v, v)
}

func asBool(v any) (bool, error) {
	switch x := v.(type) {
	case bool:
		return x, nil
	case nil:
		return false, nil
	}
	n, err := asInt(v)
	if err != nil {
		return false, fmt.Errorf("pushdown: got %T %v from the engine, want a bool", v, v)
	}
	return n != 0, nil
}

func asString(v any) string {
	switch x := v.(type) {
	case string:
		return x
	case []byte:
		return string(x)
	case nil:
		return ""
	}
	return fmt.Sprint(v)
}
