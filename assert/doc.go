// Package assert decides whether the table a transformation produced is the
// table that was wanted, and when it is not, says exactly how.
//
// Compare pairs the rows of a wanted and a got *fixtures.Table — by
// position, by key (ByKey) or as a multiset (AnyRowOrder) — compares their
// cells under per-column rules and returns a *Diff: schema changes, missing
// and extra rows, repeated keys, differing cells with their distances, and
// per-column summaries. Tables and MustMatch wrap it for tests. A Diff
// renders as plain text for test failures and terminals (Text, TextWith),
// as Markdown for reviewers (Markdown), as JSON for tools (JSON) and as an
// HTML fragment for a review page (HTML), with every table text escaped
// and each differing cell marked with the class HTMLChangedCell; its
// exported fields serve any other renderer.
//
// # Typical use
//
//	func TestDailySummary(t *testing.T) {
//		raw := fixtures.MustParse(t, `
//			house:string | at:timestamp(s)      | temp_c:float64
//			Étang        | 2026-04-01T06:00:00  | 8.5
//			Étang        | 2026-04-01T14:00:00  | 21.5
//		`)
//		want := fixtures.MustParse(t, `
//			house:string | day:date   | tmin:float64 | tmax:float64
//			Étang        | 2026-04-01 | 8.5          | 21.5
//		`)
//		got := DailySummary(raw)
//		assert.Tables(t, want, got,
//			assert.ByKey("house", "day"),
//			assert.Tol("*", 1e-9, 0))
//	}
//
// # Listings and large diffs
//
// Counts in a Diff are always exact; its listings (Cells, Missing.Rows,
// Extra.Rows) hold at most ListLimit entries each. A Listing reads like a
// slice (Len, At, All). A long listing — ListLimit(-1) on large tables —
// is kept as row and column numbers into the tables and each entry is
// built when it is read; WriteText, WriteMarkdown, WriteJSON and WriteHTML
// write a report to an io.Writer as they read it, so listing every one of
// millions of differing cells takes little memory. Code that computes a
// Diff elsewhere builds its listings with ListOf.
//
// # Matching rows
//
// By default row i of want pairs with row i of got, and a longer table's
// tail is missing or extra. ByKey pairs rows with equal key cells in any
// order and reports keys that repeat on a side. AnyRowOrder pairs equal
// rows in any order, as a multiset. Differing cells are counted and listed
// only for paired rows.
//
// # Defaults
//
// Cells must be equal exactly: floats too, where −0 equals +0 and NaN
// equals NaN; null equals null and nothing else (NaN is not null unless
// NaNIsNull). Columns must agree in name, type and order. Decimal columns
// always compare exactly, by value (1.5 equals 1.50).
//
// # Tolerances
//
// Tol(col, abs, rel) makes float cells w and g equal when
//
//	|w − g| ≤ max(abs, rel × max(|w|, |g|))
//
// which is symmetric in w and g and is the rule Python's math.isclose
// specifies (PEP 485). With rel only, nothing but 0 is close to 0. An
// infinity equals only the same infinity. ULPs(col, n) instead allows n
// units in the last place, counted on the IEEE 754 bit patterns mapped to
// ordered integers, so −0 and +0 are 0 apart and adjacent floats 1 apart.
// TimeTol(col, d) allows |w − g| ≤ d between dates and timestamps.
//
// Warning: a tolerance can hide a real difference. Give each column only
// the slack its computation's rounding needs, and never put money in a
// float column under a tolerance: keep it in a decimal column, which
// compares exactly, or compare it exactly.
//
// # Bad input
//
// Compare never panics on its input. Nil tables, a key column missing on
// a side, a float key, an option naming a column neither table has, or a
// negative tolerance become Problems in the Diff, so the test fails with
// the reason.
//
// # Speed
//
// Cells are compared over the tables' Arrow buffers without copying them,
// in bulk where the raw bytes (and validity bits) agree, with columns (and
// ranges of rows) on all processors. ByKey joins a single int64 key with
// dense values (ids, row numbers) through a bitmap of want's values, and
// other keys by hashing the key columns and joining rows in cache-sized
// partitions; got's cells are then brought into want's order range by
// range, through buffers that stay in cache. The benchmarks in
// bench_test.go measure this against Arrow's array.ApproxEqual and testify
// in the same run.
package assert
