package pushdown

import (
	"fmt"
	"strings"
)

// Relation is one side of a comparison: a table (or view) or a query, as
// the engine sees it.
type Relation struct {
	// Name is a table or view name, qualified or not: {"daily"} or
	// {"greenhouse", "daily"}. Each part is quoted as an identifier, so it
	// may hold any character.
	Name []string
	// Query is a SELECT statement whose result is compared. It is used
	// when Name is empty and is sent to the engine as it is: it is the
	// caller's SQL.
	Query string
	// RowNumber names a column that holds each row's number, 1 to n
	// without gaps or repeats (DuckDB's WITH ORDINALITY gives one). The
	// Diff's row indexes are then RowNumber − 1, rows pair by position
	// when no key is given, and the column is not compared. Without it,
	// rows are numbered in key order (see the package doc).
	RowNumber string
}

// Table returns the relation of a table or view, qualified by schema (or
// database) when given several parts: Table("greenhouse", "daily").
func Table(name ...string) Relation {
	return Relation{Name: append([]string(nil), name...)}
}

// Query returns the relation of a SELECT statement.
func Query(sql string) Relation {
	return Relation{Query: sql}
}

// NumberedBy returns r with RowNumber set to col.
func (r Relation) NumberedBy(col string) Relation {
	r.RowNumber = col
	return r
}

// String describes the relation for messages.
func (r Relation) String() string {
	if len(r.Name) > 0 {
		return "table " + strings.Join(r.Name, ".")
	}
	q := strings.Join(strings.Fields(r.Query), " ")
	if len(q) > 60 {
		q = q[:57] + "…"
	}
	return "query " + q
}

// from returns the relation as an item of a FROM clause.
func (r Relation) from(d sqlDialect) (string, error) {
	if len(r.Name) > 0 {
		parts := make([]string, len(r.Name))
		for i, p := range r.Name {
			if p == "" {
				return "", fmt.Errorf("pushdown: %s: empty name part", r)
			}
			parts[i] = d.ident(p)
		}
		return strings.Join(parts, "."), nil
	}
	q := strings.TrimSpace(r.Query)
	q = strings.TrimSpace(strings.TrimSuffix(q, ";"))
	if q == "" {
		return "", fmt.Errorf("pushdown: a relation needs a table name or a query")
	}
	return "(" + q + ")", nil
}
