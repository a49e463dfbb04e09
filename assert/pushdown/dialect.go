package pushdown

import (
	"fmt"
	"math"
	"strconv"
	"strings"

	"github.com/proofsheet/proofsheet/fixtures"
)

// Dialect names the SQL an engine speaks. The comparison is the same in
// every dialect; the SQL text that carries it out differs.
type Dialect string

// The dialects, each tested against a real server (see DEVELOPERS.md).
const (
	// DuckDB is the embedded engine (version 1.5). Open it with the
	// pushdown/duckdb package, which also reads files.
	DuckDB Dialect = "duckdb"
	// PostgreSQL is PostgreSQL 15 or later, through any database/sql driver
	// (the tests use pgx).
	PostgreSQL Dialect = "postgres"
	// ClickHouse is ClickHouse 18.16 or later over its native protocol
	// (clickhouse-go), Distributed tables included.
	ClickHouse Dialect = "clickhouse"
)

// sqlDialect is what the query builder asks of a dialect.
type sqlDialect interface {
	// ident quotes an identifier; str quotes a string literal; float writes
	// a float64 literal that the engine reads back bit for bit.
	ident(name string) string
	str(s string) string
	float(f float64) string
	boolean(b bool) string
	// double, bigint and text cast an expression.
	double(x string) string
	bigint(x string) string
	text(x string) string
	isNull(x string) string
	isNaN(x string) string
	isInf(x string) string
	countIf(pred string) string
	maxIf(x, pred string) string
	// firstMax returns the largest x over the rows where pred holds and the
	// smallest pos among the rows where x takes it (pos ≤ 2^53).
	firstMax(x, pos, pred string) (maxExpr, posExpr string)
	// positions lists comma-separated integers in ascending order.
	positions(pos string) string
	// orderText makes a text expression sort byte by byte.
	orderText(x string) string
	// sqlType is the engine's type of a canonical value (ClickHouse only,
	// for typed NULLs in UNION ALL).
	sqlType(t fixtures.Type) string
	// strictFloats says float arithmetic raises errors on overflow and
	// underflow instead of giving ±Inf and 0, so the builder guards it.
	strictFloats() bool
	// columnType maps an engine's column type (as database/sql reports it)
	// to a table type and the expression that reads a column of it in the
	// canonical form (see canonical).
	columnType(dbType string, precision, scale int64, hasSize bool) (colType, error)
	// absInt is float64(|a − b|) for int64 a and b, rounded once.
	absInt(a, b string) string
	// decimalDouble is a decimal expression of the given precision as the
	// nearest float64.
	decimalDouble(x string, precision int) string
	// intDiv divides integers exactly divisible, truncating.
	intDiv(a, b string) string
	// mod is the remainder of integer division truncated toward zero.
	mod(a, b string) string
	// statement ends a SELECT (ClickHouse adds its settings).
	statement(sql string) string
}

// colType is an engine column as proofsheet sees it.
type colType struct {
	t fixtures.Type
	// read turns the quoted column into its canonical form: bool, int64,
	// float64 and text as themselves, dates as days since 1970-01-01,
	// timestamps as ticks of t's unit since the epoch, decimals as the
	// engine's exact decimal. %s stands for the quoted column.
	read string
}

func dialectOf(d Dialect) (sqlDialect, error) {
	switch d {
	case DuckDB:
		return duckdbDialect{}, nil
	case PostgreSQL:
		return postgresDialect{}, nil
	case ClickHouse:
		return clickhouseDialect{}, nil
	}
	return nil, fmt.Errorf("pushdown: unknown dialect %q (want %q, %q or %q)", d, DuckDB, PostgreSQL, ClickHouse)
}

// quoteDoubled quotes s between q characters, doubling any q inside, as
// standard SQL quotes identifiers ("…") and strings ('…').
func quoteDoubled(s string, q byte) string {
	var b strings.Builder
	b.Grow(len(s) + 2)
	b.WriteByte(q)
	for i := 0; i < len(s); i++ {
		if s[i] == q {
			b.WriteByte(q)
		}
		b.WriteByte(s[i])
	}
	b.WriteByte(q)
	return b.String()
}

// shortest spells a float in the shortest form that reads back as the same
// float, with the spellings of infinities and NaN given.
func shortest(f float64, inf, nan string) string {
	switch {
	case math.IsNaN(f):
		return nan
	case math.IsInf(f, 1):
		return inf
	case math.IsInf(f, -1):
		return "-" + inf
	}
	return strconv.FormatFloat(f, 'g', -1, 64)
}

// boolType is a boolean column, read as it is.
var boolType = colType{fixtures.Bool, "%s"}

// unsupported is the error for a column type that cannot be compared.
func unsupported(dbType string) error {
	return fmt.Errorf("type %s has no proofsheet column type; convert it in a query (sql:…) to an integer, float, text, date, timestamp or decimal", dbType)
}

// parseDecimalType reads the precision and scale from DECIMAL(p,s) or
// Decimal(p, s).
func parseDecimalType(s string) (p, sc int, ok bool) {
	i, j := strings.IndexByte(s, '('), strings.LastIndexByte(s, ')')
	if i < 0 || j < i {
		return 0, 0, false
	}
	parts := strings.Split(s[i+1:j], ",")
	if len(parts) != 2 {
		return 0, 0, false
	}
	var err1, err2 error
	p, err1 = strconv.Atoi(strings.TrimSpace(parts[0]))
	sc, err2 = strconv.Atoi(strings.TrimSpace(parts[1]))
	return p, sc, err1 == nil && err2 == nil
}

// decimalType checks that a decimal fits proofsheet's decimals.
func decimalType(dbType string, p, s int, read string) (colType, error) {
	if p < 1 || p > 38 || s < 0 || s > p {
		return colType{}, fmt.Errorf("type %s: proofsheet's decimals hold 1 to 38 digits; convert it in a query (sql:…)", dbType)
	}
	return colType{fixtures.DecimalOf(p, s), read}, nil
}
