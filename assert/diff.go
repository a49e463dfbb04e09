package assert

import (
	"github.com/proofsheet/proofsheet/fixtures"
	"github.com/proofsheet/proofsheet/internal/printable"
)

// Diff is the outcome of Compare: everything that differs between a wanted
// table and a got table, as data. Renderers (Text, Markdown, JSON, and any
// of your own) read its exported fields; none of them is needed to decide
// equality, which Equal does.
//
// Counts (CellsDiffering, Missing.Count, Column.Differing, …) are exact.
// Listings (Cells, Missing.Rows, …) hold at most Limit entries each, in a
// fixed order, so a Diff of the same tables is always the same. A long
// listing is kept as row and column numbers into the compared tables and
// its entries are built as they are read (see Listing); the renderers
// (WriteText, WriteMarkdown, WriteJSON, WriteHTML) write such listings as
// they go, so even a Diff that lists every cell of two large tables
// renders in little memory.
//
// Code that computes a Diff elsewhere (in a SQL engine, say) fills the
// fields directly; listings are built with ListOf.
type Diff struct {
	// WantRows and GotRows are the row counts of the two tables (0 for a
	// nil table).
	WantRows, GotRows int

	// Match says how rows were paired; Keys are the key columns (ByKey).
	Match MatchMode
	Keys  []string

	// WantColumns and GotColumns are the column names of each table, in
	// order. Missing rows' Cells follow WantColumns, extra rows' Cells
	// GotColumns.
	WantColumns, GotColumns []string

	// Compared are the columns whose cells were compared, in want's order.
	Compared []string

	// Problems are reasons the comparison could not be made as asked: a
	// nil table, a key column missing on a side, a float key, an option
	// naming a column neither table has, a bad tolerance. Any problem makes
	// the tables unequal.
	Problems []string

	// Schema lists the differences of the tables' columns, in want's
	// column order, then got's extra columns.
	Schema []SchemaChange

	// Missing are rows of want that got lacks; Extra are rows of got that
	// want lacks.
	Missing, Extra RowList

	// Duplicates are keys that occur more than once on a side (ByKey).
	Duplicates DuplicateList

	// CellsDiffering counts the differing cells of paired rows;
	// RowsDiffering counts the paired rows with at least one of them.
	CellsDiffering, RowsDiffering int

	// Cells lists the first Limit differing cells, by row (in want's
	// order; for rows matched as a multiset, in the order of the pairs)
	// and then by column (in want's order).
	Cells Listing[CellDiff]

	// Columns summarises every compared column, in want's order: how its
	// cells were compared, how many differ and the largest deltas.
	Columns []ColumnSummary

	// Hints are likely causes of the differences, each with the option
	// or flag that would fix it: rows in another order, a kind change
	// that LooseTypes accepts, a misspelt column name, keys that differ
	// only in spelling, a column off by one factor. They never change
	// Equal.
	Hints []Hint

	// Overview is the shape of the differences (where the rows lie, how
	// each number column's differences spread, how category levels
	// moved), measured from the whole tables; nil when they are equal.
	// The HTML renderer draws it.
	Overview *Overview

	// Limit is the listing cap in force (negative: no cap).
	Limit int

	// WantName and GotName label the two sides in the renderers; "" means
	// "want" and "got". A review of a changed golden file, say, names
	// them "before" and "after". The JSON keeps its field names.
	WantName, GotName string
}

// wantName is how renderers label want.
func (d *Diff) wantName() string {
	if d.WantName == "" {
		return string(WantSide)
	}
	return printable.Name(d.WantName)
}

// gotName is how renderers label got.
func (d *Diff) gotName() string {
	if d.GotName == "" {
		return string(GotSide)
	}
	return printable.Name(d.GotName)
}

// sideName labels a side as the renderers do.
func (d *Diff) sideName(s Side) string {
	switch s {
	case WantSide:
		return d.wantName()
	case GotSide:
		return d.gotName()
	}
	return string(s)
}

// MatchMode is how Compare pairs rows of want with rows of got.
type MatchMode string

// The ways of pairing rows.
const (
	MatchByPosition MatchMode = "position" // row i with row i (the default)
	MatchByKey      MatchMode = "key"      // rows with equal key cells (ByKey)
	MatchAsMultiset MatchMode = "multiset" // equal rows in any order (AnyRowOrder)
)

// ChangeKind names a kind of schema change.
type ChangeKind string

// The schema changes.
const (
	ColumnMissing ChangeKind = "missing"        // want has the column, got does not
	ColumnExtra   ChangeKind = "extra"          // got has the column, want does not
	TypeChanged   ChangeKind = "type"           // the column's type differs (kind, unit, zone, precision or scale)
	LevelsAdded   ChangeKind = "levels_added"   // got's category has levels want's lacks
	LevelsRemoved ChangeKind = "levels_removed" // want's category has levels got's lacks
	ColumnMoved   ChangeKind = "position"       // the column stands elsewhere among the shared columns
)

// SchemaChange is one difference between the columns of the two tables.
// Want and Got describe the column on each side as text: a type
// ("float64"), a comma-separated list of levels, or a 1-based position;
// empty where the side has no such thing.
type SchemaChange struct {
	Column string
	Change ChangeKind
	Want   string
	Got    string
}

// RowList is a set of rows present on one side only.
type RowList struct {
	// Count is the exact number of such rows.
	Count int
	// Rows lists the first Limit of them in their table's order.
	Rows Listing[RowRef]
}

// RowRef names a row: by its 0-based index in each table (-1 on the side
// where it is absent) and, when rows are matched by key, by the text of its
// key cells. The reports (text, Markdown, HTML, JSON, the command line)
// show row numbers instead, counting from 1 for the first data row under
// the header, as the LoadReport does. Cells, filled only for missing and extra rows, holds the row's
// cells in the literal table spelling (fixtures.LiteralCell), in its own
// table's column order.
type RowRef struct {
	Want  int
	Got   int
	Key   []string
	Cells []string
}

// DuplicateList holds the keys that occur more than once.
type DuplicateList struct {
	// WantKeys and GotKeys count the distinct repeated keys on each side.
	WantKeys, GotKeys int
	// Keys lists the first Limit of them: want's in order of first
	// appearance, then got's.
	Keys []DuplicateKey
}

// DuplicateKey is one key that occurs on several rows of a side.
type DuplicateKey struct {
	Side Side
	Key  []string
	// Rows are the 0-based indexes of the rows with the key (at most Limit
	// of them); Count is how many rows have it.
	Rows  []int
	Count int
}

// Side names one of the two tables.
type Side string

// The two sides of a comparison.
const (
	WantSide Side = "want"
	GotSide  Side = "got"
)

// Cell is one cell as the diff shows it.
type Cell struct {
	// Text is the cell in the literal table spelling: "~" for null, text
	// quoted as a Go string literal when it needs it, floats in shortest
	// round-trip form.
	Text string
	// Kind is the kind of the cell's column; Null says the cell is null.
	Kind fixtures.Kind
	Null bool
	// Value is the cell as a Go value (see fixtures.Column.Value): nil for
	// null, else bool, int64, float64, string, time.Time or
	// fixtures.Decimal.
	Value any
}

// CellDiff is one differing cell of a pair of rows.
type CellDiff struct {
	Row    RowRef
	Column string
	Want   Cell
	Got    Cell
	// Delta holds the differences of numeric and time cells when both are
	// non-null: Abs = |want − got| and Rel = Abs / max(|want|, |got|) for
	// numbers (computed in float64; int64 and decimal differences exactly
	// first, then rounded). For dates and timestamps Abs is in seconds —
	// the exact difference counted in the finer unit of the two columns
	// (days for two date columns), as a float64, divided by that unit's
	// count per second (86400 a day's) — and Rel is 0.
	Delta Delta
}

// Delta is the distance between two cells.
type Delta struct {
	// Has says the cells have a distance at all (both non-null numbers or
	// times).
	Has bool
	Abs float64
	Rel float64
	// ULPs is the distance in units in the last place, set for float
	// columns compared under ULPs; HasULPs says it is set.
	ULPs    uint64
	HasULPs bool
}

// ColumnSummary describes how one compared column came out.
type ColumnSummary struct {
	Name string
	// WantType and GotType are the column's types on each side.
	WantType, GotType fixtures.Type
	// Rule says how cells were compared, in words a reader needs no manual
	// for: "exact", "abs. diff ≤ 0.01 or rel. diff ≤ 1e-09", "at most 4
	// ULPs apart", "within 1s", "exact after NFC+trim", "int64 vs float64
	// by value, exact", ….
	Rule string
	// Differing is the exact number of differing cells.
	Differing int
	// MaxAbs and MaxRel are the largest deltas over all paired cells, equal
	// or not, so they show how close a tolerance is to biting. HasDelta says
	// the column has deltas at all (numbers and times). The At fields name
	// where each maximum sits: the first pair, in the order of the listing
	// (by want's rows; for AnyRowOrder by the pairs' want rows), whose
	// delta equals it. A maximum of 0 sits nowhere (Want and Got -1), so a
	// column whose cells are all identical names no row.
	HasDelta bool
	MaxAbs   float64
	MaxAbsAt RowRef
	MaxRel   float64
	MaxRelAt RowRef
}

// Equal reports whether the tables are equal under the options: no
// problems, no schema changes, the same rows, no duplicate keys and no
// differing cells. A nil Diff is equal.
func (d *Diff) Equal() bool {
	if d == nil {
		return true
	}
	return len(d.Problems) == 0 && len(d.Schema) == 0 && d.Missing.Count == 0 && d.Extra.Count == 0 &&
		d.Duplicates.WantKeys == 0 && d.Duplicates.GotKeys == 0 && d.CellsDiffering == 0
}

// listFull reports whether a listing already holding n entries is full.
func (d *Diff) listFull(n int) bool {
	return d.Limit >= 0 && n >= d.Limit
}
