package pushdown

import (
	"context"
	"fmt"
	"strconv"
	"strings"
	"time"

	"github.com/proofsheet/proofsheet/fixtures"
)

// SQLTypes returns the engine's column types for a schema, as Load
// creates them: for tests that create tables of their own (a ClickHouse
// Distributed table, say) and fill them with Insert. A type the engine
// cannot hold is an error that names the column; see the README's Engines
// section for what each engine holds.
func SQLTypes(dialect Dialect, schema fixtures.Schema) ([]string, error) {
	out := make([]string, len(schema))
	for i, f := range schema {
		t, err := sqlTypeOf(dialect, f.Type)
		if err != nil {
			return nil, fmt.Errorf("pushdown: column %q: %w", f.Name, err)
		}
		out[i] = t
	}
	return out, nil
}

func sqlTypeOf(dialect Dialect, t fixtures.Type) (string, error) {
	cannot := func(why string) (string, error) {
		return "", fmt.Errorf("%s cannot hold %s: %s", dialect, t, why)
	}
	switch dialect {
	case DuckDB:
		switch t.Kind() {
		case fixtures.KindBool:
			return "BOOLEAN", nil
		case fixtures.KindInt64:
			return "BIGINT", nil
		case fixtures.KindFloat64:
			return "DOUBLE", nil
		case fixtures.KindString, fixtures.KindCategory:
			return "VARCHAR", nil
		case fixtures.KindDate:
			return "DATE", nil
		case fixtures.KindDecimal:
			return fmt.Sprintf("DECIMAL(%d,%d)", t.Precision(), t.Scale()), nil
		case fixtures.KindTimestamp:
			switch {
			case t.Zone() == "":
				return [...]string{"TIMESTAMP_S", "TIMESTAMP_MS", "TIMESTAMP", "TIMESTAMP_NS"}[t.Unit()], nil
			case t.Zone() == "UTC" && t.Unit() == fixtures.Micros:
				return "TIMESTAMPTZ", nil
			}
			return cannot("its zoned timestamps are microseconds in UTC")
		}
	case PostgreSQL:
		switch t.Kind() {
		case fixtures.KindBool:
			return "BOOLEAN", nil
		case fixtures.KindInt64:
			return "BIGINT", nil
		case fixtures.KindFloat64:
			return "DOUBLE PRECISION", nil
		case fixtures.KindString, fixtures.KindCategory:
			return "TEXT", nil
		case fixtures.KindDate:
			return "DATE", nil
		case fixtures.KindDecimal:
			return fmt.Sprintf("NUMERIC(%d,%d)", t.Precision(), t.Scale()), nil
		case fixtures.KindTimestamp:
			switch {
			case t.Unit() != fixtures.Micros:
				return cannot("its timestamps are microseconds")
			case t.Zone() == "":
				return "TIMESTAMP", nil
			case t.Zone() == "UTC":
				return "TIMESTAMPTZ", nil
			}
			return cannot("timestamptz keeps the instant, not the zone; use UTC")
		}
	case ClickHouse:
		var s string
		switch t.Kind() {
		case fixtures.KindBool:
			return cannot("it has no boolean type (UInt8 reads back as int64)")
		case fixtures.KindInt64:
			s = "Int64"
		case fixtures.KindFloat64:
			s = "Float64"
		case fixtures.KindString, fixtures.KindCategory:
			s = "String"
		case fixtures.KindDate:
			s = "Date"
		case fixtures.KindDecimal:
			s = fmt.Sprintf("Decimal(%d, %d)", t.Precision(), t.Scale())
		case fixtures.KindTimestamp:
			if t.Unit() != fixtures.Seconds {
				return cannot("DateTime holds whole seconds")
			}
			s = "DateTime"
			if t.Zone() != "" {
				s = "DateTime(" + clickhouseDialect{}.str(t.Zone()) + ")"
			}
		default:
			return cannot("no such type")
		}
		return "Nullable(" + s + ")", nil
	default:
		return "", fmt.Errorf("unknown dialect %q", dialect)
	}
	return cannot("no such type")
}

// Load creates the table name (one or more name parts) with the table's
// schema and inserts its rows: to put a fixture where a SQL chain under
// test, or Compare, reads it. ClickHouse tables are MergeTree tables
// without a sorting key. Values go as parameters, never in the SQL text.
func (e *Engine) Load(ctx context.Context, t *fixtures.Table, name ...string) error {
	d, err := dialectOf(e.Dialect)
	if err != nil {
		return err
	}
	types, err := SQLTypes(e.Dialect, t.Schema())
	if err != nil {
		return err
	}
	from, err := Table(name...).from(d)
	if err != nil {
		return err
	}
	cols := make([]string, t.NumCols())
	for i, f := range t.Schema() {
		cols[i] = d.ident(f.Name) + " " + types[i]
	}
	create := "CREATE TABLE " + from + " (" + strings.Join(cols, ", ") + ")"
	if e.Dialect == ClickHouse {
		create += " ENGINE = MergeTree ORDER BY tuple()"
	}
	if _, err := e.DB.ExecContext(ctx, create); err != nil {
		return &QueryError{SQL: create, Err: err}
	}
	return e.Insert(ctx, t, name...)
}

// Insert appends the table's rows to the existing table name, matching
// columns by name.
func (e *Engine) Insert(ctx context.Context, t *fixtures.Table, name ...string) error {
	d, err := dialectOf(e.Dialect)
	if err != nil {
		return err
	}
	types, err := SQLTypes(e.Dialect, t.Schema())
	if err != nil {
		return err
	}
	from, err := Table(name...).from(d)
	if err != nil {
		return err
	}
	names := make([]string, t.NumCols())
	for i, f := range t.Schema() {
		names[i] = d.ident(f.Name)
	}
	head := "INSERT INTO " + from + " (" + strings.Join(names, ", ") + ")"
	if e.Dialect == ClickHouse {
		return e.insertClickHouse(ctx, d, t, from, names, types)
	}
	const perStatement = 200
	for lo := 0; lo < t.NumRows(); lo += perStatement {
		hi := min(lo+perStatement, t.NumRows())
		var rows []string
		var args []any
		for r := lo; r < hi; r++ {
			ph := make([]string, t.NumCols())
			for j := range ph {
				n := len(args) + 1
				mark := "?"
				if e.Dialect == PostgreSQL {
					mark = "$" + strconv.Itoa(n)
				}
				ph[j] = "CAST(" + mark + " AS " + types[j] + ")"
				args = append(args, textArg(t.ColumnAt(j), r))
			}
			rows = append(rows, "("+strings.Join(ph, ", ")+")")
		}
		q := head + " VALUES " + strings.Join(rows, ", ")
		if _, err := e.DB.ExecContext(ctx, q, args...); err != nil {
			return fmt.Errorf("pushdown: insert into %s, rows %d to %d: %w", from, lo, hi-1, err)
		}
	}
	return nil
}

// insertClickHouse inserts through clickhouse-go's batches, which send a
// prepared INSERT's rows as one block when the transaction commits. The
// driver parses the column list itself and strips quotes from names, so
// names other than letters, digits and underscores go through a staging
// table with plain names, copied over on the server.
func (e *Engine) insertClickHouse(ctx context.Context, d sqlDialect, t *fixtures.Table, from string, names, types []string) error {
	target := from
	if !plainNames(t.Names()) {
		stage := "proofsheet_stage_" + strconv.FormatInt(time.Now().UnixNano(), 36)
		cols := make([]string, len(types))
		plain := make([]string, len(types))
		for i, ty := range types {
			plain[i] = "c" + strconv.Itoa(i)
			cols[i] = plain[i] + " " + ty
		}
		create := "CREATE TABLE " + stage + " (" + strings.Join(cols, ", ") + ") ENGINE = Memory"
		if _, err := e.DB.ExecContext(ctx, create); err != nil {
			return &QueryError{SQL: create, Err: err}
		}
		defer e.DB.ExecContext(context.Background(), "DROP TABLE IF EXISTS "+stage) //nolint:errcheck // best effort
		if err := e.batchClickHouse(ctx, t, stage, plain); err != nil {
			return err
		}
		copyRows := "INSERT INTO " + target + " (" + strings.Join(names, ", ") + ") SELECT " + strings.Join(plain, ", ") + " FROM " + stage
		if _, err := e.DB.ExecContext(ctx, copyRows); err != nil {
			return &QueryError{SQL: copyRows, Err: err}
		}
		return nil
	}
	return e.batchClickHouse(ctx, t, target, names)
}

func (e *Engine) batchClickHouse(ctx context.Context, t *fixtures.Table, into string, names []string) error {
	head := "INSERT INTO " + into + " (" + strings.Join(names, ", ") + ")"
	tx, err := e.DB.BeginTx(ctx, nil)
	if err != nil {
		return fmt.Errorf("pushdown: insert into %s: %w", into, err)
	}
	defer tx.Rollback() //nolint:errcheck // after Commit, a no-op
	st, err := tx.PrepareContext(ctx, head)
	if err != nil {
		return &QueryError{SQL: head, Err: err}
	}
	for r := 0; r < t.NumRows(); r++ {
		args := make([]any, t.NumCols())
		for j := range args {
			args[j] = clickhouseArg(t.ColumnAt(j), r)
		}
		if _, err := st.ExecContext(ctx, args...); err != nil {
			return fmt.Errorf("pushdown: insert into %s, row %d: %w", into, r, err)
		}
	}
	if err := tx.Commit(); err != nil {
		return fmt.Errorf("pushdown: insert into %s: %w", into, err)
	}
	return nil
}

// plainNames reports whether names are letters, digits and underscores.
func plainNames(names []string) bool {
	for _, n := range names {
		for _, r := range n {
			if !(r == '_' || r >= 'a' && r <= 'z' || r >= 'A' && r <= 'Z' || r >= '0' && r <= '9') {
				return false
			}
		}
	}
	return true
}

// textArg is a cell as a parameter: floats, integers and booleans as
// themselves, the rest as text the engine casts exactly.
func textArg(c *fixtures.Column, r int) any {
	if c.IsNull(r) {
		return nil
	}
	switch c.Kind() {
	case fixtures.KindBool:
		return c.Bool(r)
	case fixtures.KindInt64:
		return c.Int64(r)
	case fixtures.KindFloat64:
		return c.Float64(r)
	case fixtures.KindTimestamp:
		tm := c.Time(r).UTC()
		s := tm.Format("2006-01-02 15:04:05.999999999")
		if c.Type().Zone() != "" {
			s += "+00"
		}
		return s
	case fixtures.KindDate:
		return c.Date(r).Format("2006-01-02")
	case fixtures.KindDecimal:
		return c.Decimal(r).String()
	}
	return c.Str(r)
}

// clickhouseArg is a cell as clickhouse-go takes it for a Nullable column.
func clickhouseArg(c *fixtures.Column, r int) any {
	if c.IsNull(r) {
		return nil
	}
	switch c.Kind() {
	case fixtures.KindInt64:
		return c.Int64(r)
	case fixtures.KindFloat64:
		return c.Float64(r)
	case fixtures.KindDate:
		return c.Date(r)
	case fixtures.KindTimestamp:
		return c.Time(r)
	case fixtures.KindDecimal:
		return c.Decimal(r).String()
	}
	return c.Str(r)
}
