package pushdown

import (
	"fmt"
	"math"
	"strconv"
	"strings"

	"github.com/proofsheet/proofsheet/fixtures"
)

// duckdbDialect is DuckDB 1.5: standard SQL, FILTER clauses, lists, and
// IEEE 754 arithmetic that gives ±Inf instead of errors.
type duckdbDialect struct{}

func (duckdbDialect) ident(n string) string { return quoteDoubled(n, '"') }
func (duckdbDialect) str(s string) string   { return quoteDoubled(s, '\'') }
func (duckdbDialect) float(f float64) string {
	return "CAST('" + shortest(f, "inf", "nan") + "' AS DOUBLE)"
}
func (duckdbDialect) boolean(b bool) string   { return strings.ToUpper(strconv.FormatBool(b)) }
func (duckdbDialect) double(x string) string  { return "CAST(" + x + " AS DOUBLE)" }
func (duckdbDialect) bigint(x string) string  { return "CAST(" + x + " AS BIGINT)" }
func (duckdbDialect) text(x string) string    { return "CAST(" + x + " AS VARCHAR)" }
func (duckdbDialect) isNull(x string) string  { return "(" + x + " IS NULL)" }
func (duckdbDialect) isNaN(x string) string   { return "isnan(" + x + ")" }
func (duckdbDialect) isInf(x string) string   { return "isinf(" + x + ")" }
func (duckdbDialect) countIf(p string) string { return "count(*) FILTER (WHERE " + p + ")" }
func (duckdbDialect) maxIf(x, p string) string {
	return "max(" + x + ") FILTER (WHERE " + p + ")"
}
func (duckdbDialect) firstMax(x, pos, p string) (string, string) {
	agg := "(max([" + x + ", -CAST(" + pos + " AS DOUBLE)]) FILTER (WHERE " + p + "))"
	return agg + "[1]", "CAST(-" + agg + "[2] AS BIGINT)"
}
func (duckdbDialect) positions(pos string) string {
	return "string_agg(CAST(" + pos + " AS VARCHAR), ',' ORDER BY " + pos + ")"
}
func (duckdbDialect) strictFloats() bool        { return false }
func (duckdbDialect) orderText(x string) string { return x }
func (duckdbDialect) mod(a, b string) string    { return "(" + a + " % " + b + ")" }
func (duckdbDialect) statement(s string) string { return s }
func (duckdbDialect) absInt(a, b string) string {
	return "CAST(CAST(abs(CAST(" + a + " AS HUGEINT) - CAST(" + b + " AS HUGEINT)) AS UBIGINT) AS DOUBLE)"
}

// decimalDouble goes through text: DuckDB's direct cast divides a double
// by a power of ten, which can round twice.
func (duckdbDialect) decimalDouble(x string, precision int) string {
	return "CAST(CAST(" + x + " AS VARCHAR) AS DOUBLE)"
}

func (duckdbDialect) columnType(db string, p, s int64, hasSize bool) (colType, error) {
	u := strings.ToUpper(db)
	switch u {
	case "BOOLEAN":
		return boolType, nil
	case "TINYINT", "SMALLINT", "INTEGER", "BIGINT", "UTINYINT", "USMALLINT", "UINTEGER":
		return colType{fixtures.Int64, "CAST(%s AS BIGINT)"}, nil
	case "FLOAT", "DOUBLE":
		return colType{fixtures.Float64, "CAST(%s AS DOUBLE)"}, nil
	case "VARCHAR", "ENUM":
		return colType{fixtures.String, "CAST(%s AS VARCHAR)"}, nil
	case "DATE":
		return colType{fixtures.Date, "CAST(%s - DATE '1970-01-01' AS BIGINT)"}, nil
	case "TIMESTAMP_S":
		return colType{fixtures.TimestampOf(fixtures.Seconds, ""), "(epoch_us(%s) // 1000000)"}, nil
	case "TIMESTAMP_MS":
		return colType{fixtures.TimestampOf(fixtures.Millis, ""), "epoch_ms(%s)"}, nil
	case "TIMESTAMP":
		return colType{fixtures.TimestampOf(fixtures.Micros, ""), "epoch_us(%s)"}, nil
	case "TIMESTAMP_NS":
		return colType{fixtures.TimestampOf(fixtures.Nanos, ""), "epoch_ns(%s)"}, nil
	case "TIMESTAMPTZ", "TIMESTAMP WITH TIME ZONE":
		return colType{fixtures.TimestampOf(fixtures.Micros, "UTC"), "epoch_us(%s)"}, nil
	}
	if strings.HasPrefix(u, "DECIMAL") {
		pp, ss, ok := parseDecimalType(u)
		if !ok && hasSize {
			pp, ss, ok = int(p), int(s), true
		}
		if ok {
			return decimalType(db, pp, ss, "%s")
		}
	}
	return colType{}, unsupported(db)
}

func (duckdbDialect) sqlType(t fixtures.Type) string { return "" }
func (duckdbDialect) intDiv(a, b string) string      { return "(" + a + " // " + b + ")" }

// postgresDialect is PostgreSQL 15. Its float arithmetic raises errors on
// overflow and underflow, so the builder guards it; text sorts by the
// database's collation unless told COLLATE "C".
type postgresDialect struct{}

func (postgresDialect) ident(n string) string { return quoteDoubled(n, '"') }

// str writes an escape string (E'…'), whose meaning does not depend on
// standard_conforming_strings.
func (postgresDialect) str(s string) string {
	r := strings.NewReplacer(`\`, `\\`, `'`, `\'`)
	return "E'" + r.Replace(s) + "'"
}
func (postgresDialect) float(f float64) string {
	return "CAST('" + shortest(f, "Infinity", "NaN") + "' AS DOUBLE PRECISION)"
}
func (postgresDialect) boolean(b bool) string  { return strings.ToUpper(strconv.FormatBool(b)) }
func (postgresDialect) double(x string) string { return "CAST(" + x + " AS DOUBLE PRECISION)" }
func (postgresDialect) bigint(x string) string { return "CAST(" + x + " AS BIGINT)" }
func (postgresDialect) text(x string) string   { return "CAST(" + x + " AS TEXT)" }
func (postgresDialect) isNull(x string) string { return "(" + x + " IS NULL)" }
func (postgresDialect) isNaN(x string) string {
	return "(" + x + " = CAST('NaN' AS DOUBLE PRECISION))"
}
func (postgresDialect) isInf(x string) string {
	return "(abs(" + x + ") = CAST('Infinity' AS DOUBLE PRECISION))"
}
func (postgresDialect) countIf(p string) string { return "count(*) FILTER (WHERE " + p + ")" }
func (postgresDialect) maxIf(x, p string) string {
	return "max(" + x + ") FILTER (WHERE " + p + ")"
}
func (postgresDialect) firstMax(x, pos, p string) (string, string) {
	agg := "(max(ARRAY[" + x + ", -CAST(" + pos + " AS DOUBLE PRECISION)]) FILTER (WHERE " + p + "))"
	return agg + "[1]", "CAST(-" + agg + "[2] AS BIGINT)"
}
func (postgresDialect) positions(pos string) string {
	return "string_agg(CAST(" + pos + " AS TEXT), ',' ORDER BY " + pos + ")"
}
func (postgresDialect) sqlType(t fixtures.Type) string { return "" }
func (postgresDialect) intDiv(a, b string) string      { return "(" + a + " / " + b + ")" }
func (postgresDialect) strictFloats() bool             { return true }
func (postgresDialect) orderText(x string) string      { return x + ` COLLATE "C"` }
func (postgresDialect) mod(a, b string) string         { return "(" + a + " % " + b + ")" }
func (postgresDialect) statement(s string) string      { return s }
func (postgresDialect) absInt(a, b string) string {
	return "CAST(abs(CAST(" + a + " AS NUMERIC) - CAST(" + b + " AS NUMERIC)) AS DOUBLE PRECISION)"
}

// decimalDouble: numeric to double precision goes through the decimal
// text and strtod, rounded once.
func (postgresDialect) decimalDouble(x string, precision int) string {
	return "CAST(" + x + " AS DOUBLE PRECISION)"
}

func (postgresDialect) columnType(db string, p, s int64, hasSize bool) (colType, error) {
	switch strings.ToUpper(db) {
	case "BOOL":
		return boolType, nil
	case "INT2", "INT4", "INT8":
		return colType{fixtures.Int64, "CAST(%s AS BIGINT)"}, nil
	case "FLOAT4", "FLOAT8":
		return colType{fixtures.Float64, "CAST(%s AS DOUBLE PRECISION)"}, nil
	case "TEXT", "VARCHAR", "BPCHAR", "NAME":
		return colType{fixtures.String, "CAST(%s AS TEXT)"}, nil
	case "DATE":
		return colType{fixtures.Date, "CAST(%s - DATE '1970-01-01' AS BIGINT)"}, nil
	case "TIMESTAMP":
		return colType{fixtures.TimestampOf(fixtures.Micros, ""), "CAST(EXTRACT(EPOCH FROM %s) * 1000000 AS BIGINT)"}, nil
	case "TIMESTAMPTZ":
		return colType{fixtures.TimestampOf(fixtures.Micros, "UTC"), "CAST(EXTRACT(EPOCH FROM %s) * 1000000 AS BIGINT)"}, nil
	case "NUMERIC":
		if !hasSize {
			return colType{}, fmt.Errorf("type numeric has no precision and scale, and proofsheet's decimals need them; cast it in a query (sql:…), e.g. CAST(x AS numeric(18,4))")
		}
		return decimalType("numeric("+strconv.FormatInt(p, 10)+","+strconv.FormatInt(s, 10)+")", int(p), int(s), "%s")
	}
	return colType{}, unsupported(strings.ToLower(db))
}

// clickhouseDialect is ClickHouse 18.16 and later: no boolean type (UInt8),
// -If aggregate combinators instead of FILTER, no window functions, float
// literals that its parser may round wrongly (so they are written as bit
// patterns), and backquoted identifiers with backslash escapes.
type clickhouseDialect struct {
	zone string // the server's time zone, for DateTime without one
}

func (clickhouseDialect) ident(n string) string {
	return "`" + strings.NewReplacer(`\`, `\\`, "`", "\\`").Replace(n) + "`"
}
func (clickhouseDialect) str(s string) string {
	return "'" + strings.NewReplacer(`\`, `\\`, `'`, `\'`).Replace(s) + "'"
}

// float writes the float's bit pattern, which the server reinterprets:
// exact whatever its float parser does.
func (clickhouseDialect) float(f float64) string {
	return "reinterpretAsFloat64(reinterpretAsString(toUInt64(" + strconv.FormatUint(math.Float64bits(f), 10) + ")))"
}
func (clickhouseDialect) boolean(b bool) string {
	if b {
		return "1"
	}
	return "0"
}
func (clickhouseDialect) double(x string) string  { return "toFloat64(" + x + ")" }
func (clickhouseDialect) bigint(x string) string  { return "toInt64(" + x + ")" }
func (clickhouseDialect) text(x string) string    { return "toString(" + x + ")" }
func (clickhouseDialect) isNull(x string) string  { return "isNull(" + x + ")" }
func (clickhouseDialect) isNaN(x string) string   { return "isNaN(" + x + ")" }
func (clickhouseDialect) isInf(x string) string   { return "isInfinite(" + x + ")" }
func (clickhouseDialect) countIf(p string) string { return "countIf(" + p + ")" }
func (clickhouseDialect) maxIf(x, p string) string {
	return "maxIf(" + x + ", " + p + ")"
}
func (clickhouseDialect) firstMax(x, pos, p string) (string, string) {
	return "maxIf(" + x + ", " + p + ")", "argMaxIf(" + pos + ", tuple(" + x + ", -toFloat64(" + pos + ")), " + p + ")"
}
func (clickhouseDialect) positions(pos string) string {
	return "arrayStringConcat(arrayMap(x -> toString(x), arraySort(groupArray(" + pos + "))), ',')"
}
func (clickhouseDialect) intDiv(a, b string) string { return "intDiv(" + a + ", " + b + ")" }
func (clickhouseDialect) strictFloats() bool        { return false }
func (clickhouseDialect) orderText(x string) string { return x }
func (clickhouseDialect) mod(a, b string) string    { return "modulo(" + a + ", " + b + ")" }
func (clickhouseDialect) statement(s string) string { return s }

// absInt subtracts in UInt64, which wraps around to |a − b| exactly.
func (clickhouseDialect) absInt(a, b string) string {
	return "toFloat64(if(" + a + " >= " + b + ", toUInt64(toUInt64(" + a + ") - toUInt64(" + b + ")), toUInt64(toUInt64(" + b + ") - toUInt64(" + a + "))))"
}

// decimalDouble: up to 15 digits the unscaled integer and the power of ten
// are exact doubles and their quotient is rounded once; beyond, the text
// goes through ClickHouse's float parser (see README, Engines).
func (clickhouseDialect) decimalDouble(x string, precision int) string {
	if precision <= 15 {
		return "toFloat64(" + x + ")"
	}
	return "toFloat64(toString(" + x + "))"
}

func (c clickhouseDialect) columnType(db string, p, s int64, hasSize bool) (colType, error) {
	t := db
	for _, wrap := range []string{"Nullable(", "LowCardinality("} {
		if strings.HasPrefix(t, wrap) && strings.HasSuffix(t, ")") {
			t = t[len(wrap) : len(t)-1]
		}
	}
	switch t {
	case "Int8", "Int16", "Int32", "Int64", "UInt8", "UInt16", "UInt32":
		return colType{fixtures.Int64, "toInt64(%s)"}, nil
	case "Float32", "Float64":
		return colType{fixtures.Float64, "toFloat64(%s)"}, nil
	case "String":
		return colType{fixtures.String, "%s"}, nil
	case "Date":
		return colType{fixtures.Date, "toInt64(%s)"}, nil
	case "DateTime":
		return colType{fixtures.TimestampOf(fixtures.Seconds, c.zone), "toInt64(toUInt32(%s))"}, nil
	}
	switch {
	case strings.HasPrefix(t, "Enum8(") || strings.HasPrefix(t, "Enum16("):
		return colType{fixtures.String, "toString(%s)"}, nil
	case strings.HasPrefix(t, "DateTime('") && strings.HasSuffix(t, "')"):
		return colType{fixtures.TimestampOf(fixtures.Seconds, t[len("DateTime('"):len(t)-2]), "toInt64(toUInt32(%s))"}, nil
	case strings.HasPrefix(t, "Decimal("):
		if pp, ss, ok := parseDecimalType(t); ok {
			return decimalType(db, pp, ss, "%s")
		}
	}
	return colType{}, unsupported(db)
}

// sqlType is the ClickHouse type of a canonical value, for typed NULLs.
func (clickhouseDialect) sqlType(t fixtures.Type) string {
	switch t.Kind() {
	case fixtures.KindFloat64:
		return "Float64"
	case fixtures.KindString, fixtures.KindCategory:
		return "String"
	case fixtures.KindDecimal:
		return fmt.Sprintf("Decimal(%d, %d)", t.Precision(), t.Scale())
	case fixtures.KindBool:
		return "UInt8"
	}
	return "Int64"
}
