// Package pushdown runs assert's keyed tolerance compare inside a SQL
// engine — embedded DuckDB, PostgreSQL, or ClickHouse as the distributed
// engine — so that tables larger than memory, or tables that live in a
// database, are compared where they are. Only the summary leaves the
// engine: counts, the largest deltas and where they sit, and the listed
// cells and rows. The result is an *assert.Diff equal to the one
// assert.Compare gives for the same tables in memory, which every renderer
// prints the same way; a differential test holds every dialect to that
// against real servers.
//
// Engine.Compare compares two relations of one engine (tables, views or
// queries). CompareAcross compares relations in two engines, or a file
// that DuckDB reads against a server table, by merging the two engines'
// key-ordered streams in bounded memory. Engine.Load puts a fixtures.Table
// into an engine, for a SQL chain under test to read.
//
// # Typical use
//
//	db, err := sql.Open("pgx", os.Getenv("WAREHOUSE_URL"))
//	if err != nil { … }
//	e := &pushdown.Engine{DB: db, Dialect: pushdown.PostgreSQL}
//	d, err := e.Compare(ctx,
//		pushdown.Table("greenhouse", "daily_expected"),
//		pushdown.Query("SELECT house, day, tmax FROM daily_report"),
//		assert.ByKey("house", "day"), assert.Tol("tmax", 0.01, 0))
//	if err != nil { … } // the engine failed, or an option cannot be pushed down
//	if !d.Equal() { fmt.Print(d.Text()) }
//
// # What is pushed down
//
// ByKey, Tol (absolute and relative, PEP 485), TimeTol, IgnoreColumns,
// ListLimit, NaNIsNull, LooseTypes and AnyColumnOrder; rows pair by
// position when both relations have row numbers (Relation.RowNumber).
// AnyRowOrder, ULPs, NormText, a date compared with a timestamp in a zone
// other than UTC, and pairing by position without row numbers are
// refused with an error that says why, never dropped. The hints that need
// every row (rows in another order, keys that differ only in spelling, a
// column off by a factor) are not computed.
//
// # Row numbers and ties
//
// A relation with a row-number column is numbered by it. Without one,
// its rows are numbered in the order of the key columns, then every
// column in the relation's order, nulls first, NaN after +Inf, −0 with
// +0, text byte by byte: the order fixtures.Table.SortBy gives over the
// same columns. Repeated keys pair in that order, as assert.Compare pairs
// them in table order.
//
// # Safety
//
// Every identifier in the generated SQL is quoted for its dialect, and no
// value is spliced into SQL text: numbers are written by the dialect
// (ClickHouse's as bit patterns) and the rest are parameters. A
// relation's Query is the caller's own SQL and is sent as it is.
package pushdown
