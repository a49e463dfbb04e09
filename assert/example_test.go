package assert_test

import (
	"fmt"
	"os"

	"github.com/proofsheet/proofsheet/assert"
	"github.com/proofsheet/proofsheet/fixtures"
)

func ExampleCompare() {
	want, _ := fixtures.Parse(`
		house:string | day:date   | tmax:float64 | kept:int64
		Étang        | 2026-04-01 | 21.5         | 140
		"Les Pins"   | 2026-04-01 | 18.25        | 144
	`)
	got, _ := fixtures.Parse(`
		house:string     | day:date   | tmax:float64 | kept:int64
		Étang            | 2026-04-01 | 21.5         | 139
		"Les\u00a0Pins"  | 2026-04-01 | 18.25        | 144
	`)
	d := assert.Compare(want, got)
	fmt.Println(d.Equal())
	fmt.Print(d.Text())
	// Output:
	// false
	// tables differ: 2 differing cells in 2 rows
	// want 2 rows, got 2 rows; rows paired by position
	//
	// differing cells (2)
	//   row  column  want      got              abs. diff  rel. diff
	//     1  kept    140       139                      1    0.00714
	//     2  house   Les Pins  "Les\u00a0Pins"
	//        edit: Les⟦⟨sp⟩→⟨nbsp⟩⟧Pins
	//
	// columns
	//   column  how compared  cells differ  max abs. diff  max rel. diff  where max
	//   house   exact                    1
	//   kept    exact                    1              1        0.00714  row 1
}

// printT is a stand-in for *testing.T that prints what a failing test
// would report.
type printT struct{}

func (printT) Helper()                           {}
func (printT) Errorf(format string, args ...any) { fmt.Printf(format, args...) }

func ExampleTables() {
	want, _ := fixtures.Parse(`
		house:string | readings:int64 | dropped:int64
		Étang        | 140            | 4
		Verger       | 120            | 24
	`)
	got, _ := fixtures.Parse(`
		house:string | readings:int64 | dropped:int64
		Étang        | 140            | 4
	`)
	var t printT // in a test: the *testing.T
	ok := assert.Tables(t, want, got, assert.ByKey("house"))
	fmt.Println(ok)
	// Output:
	// tables differ: 1 missing row
	// want 2 rows, got 1 row; rows matched by key (house)
	//
	// missing rows (1, in want, not in got)
	//   row  house   readings  dropped
	//     2  Verger  120       24
	// false
}

func ExampleByKey() {
	want, _ := fixtures.Parse(`
		house:string | day:date   | tmean:float64 | gdd:float64
		Étang        | 2026-04-01 | 14.2          | 4.2
		Étang        | 2026-04-02 | 15.1          | 9.3
		Verger       | 2026-04-01 | 12.7          | 2.7
	`)
	// The same rows in another order, with float noise in tmean and a
	// real change in one gdd value.
	got, _ := fixtures.Parse(`
		house:string | day:date   | tmean:float64      | gdd:float64
		Verger       | 2026-04-01 | 12.700000000000001 | 2.7
		Étang        | 2026-04-02 | 15.1               | 9.4
		Étang        | 2026-04-01 | 14.2               | 4.2
	`)
	d := assert.Compare(want, got, assert.ByKey("house", "day"), assert.Tol("*", 1e-9, 0))
	fmt.Println(d.CellsDiffering, d.Cells.At(0).Row.Key, d.Cells.At(0).Column, d.Cells.At(0).Want.Text, d.Cells.At(0).Got.Text)
	fmt.Print(d.Text())
	// Output:
	// 1 [Étang 2026-04-02] gdd 9.3 9.4
	// tables differ: 1 differing cell in 1 row
	// want 3 rows, got 3 rows; rows matched by key (house, day)
	//
	// differing cells (1)
	//   house  day         column  want  got  abs. diff  rel. diff
	//   Étang  2026-04-02  gdd     9.3   9.4        0.1     0.0106
	//
	// columns
	//   column  how compared       cells differ  max abs. diff  max rel. diff  where max
	//   tmean   abs. diff ≤ 1e-09             0       1.78e-15        1.4e-16  (Verger, 2026-04-01)
	//   gdd     abs. diff ≤ 1e-09             1            0.1         0.0106  (Étang, 2026-04-02)
}

func ExampleDiff_JSON() {
	want, _ := fixtures.Parse(`
		house:string | tmin:float64
		Étang        | 8.5
	`)
	got, _ := fixtures.Parse(`
		house:string | tmin:int64
		Étang        | 8
	`)
	b, _ := assert.Compare(want, got, assert.ListLimit(0)).JSON()
	fmt.Println(string(b))
	// Output:
	// {
	//   "equal": false,
	//   "match": "position",
	//   "keys": [],
	//   "want_columns": [
	//     "house",
	//     "tmin"
	//   ],
	//   "got_columns": [
	//     "house",
	//     "tmin"
	//   ],
	//   "compared": [
	//     "house",
	//     "tmin"
	//   ],
	//   "want_rows": 1,
	//   "got_rows": 1,
	//   "missing_rows": 0,
	//   "extra_rows": 0,
	//   "cells_differing": 1,
	//   "rows_differing": 1,
	//   "duplicate_keys": {
	//     "want": 0,
	//     "got": 0
	//   },
	//   "problems": [],
	//   "schema": [
	//     {
	//       "column": "tmin",
	//       "change": "type",
	//       "want": "float64",
	//       "got": "int64"
	//     }
	//   ],
	//   "columns": [
	//     {
	//       "name": "house",
	//       "want_type": "string",
	//       "got_type": "string",
	//       "rule": "exact",
	//       "differing": 0,
	//       "max_abs_delta": null,
	//       "max_rel_delta": null,
	//       "max_abs_at": null,
	//       "max_rel_at": null
	//     },
	//     {
	//       "name": "tmin",
	//       "want_type": "float64",
	//       "got_type": "int64",
	//       "rule": "int64 vs float64 by value, exact",
	//       "differing": 1,
	//       "max_abs_delta": 0.5,
	//       "max_rel_delta": 0.058823529411764705,
	//       "max_abs_at": {
	//         "want": 1,
	//         "got": 1
	//       },
	//       "max_rel_at": {
	//         "want": 1,
	//         "got": 1
	//       }
	//     }
	//   ],
	//   "cells": [],
	//   "missing": [],
	//   "extra": [],
	//   "duplicates": [],
	//   "hints": [
	//     {
	//       "kind": "loose_types",
	//       "column": "tmin",
	//       "text": "column \"tmin\" is float64 in want and int64 in got: with loose types numbers compare by value (3 equals 3.0)",
	//       "option": "LooseTypes()",
	//       "flag": "--loose-types",
	//       "pairs": []
	//     }
	//   ],
	//   "overview": {
	//     "strip": {
	//       "order": "row",
	//       "rows": 1,
	//       "bins": [
	//         {
	//           "from": "row 1",
	//           "differing": 1,
	//           "missing": 0,
	//           "extra": 0
	//         }
	//       ]
	//     },
	//     "numbers": [
	//       {
	//         "column": "tmin",
	//         "cells": 1,
	//         "others": 0,
	//         "log": false,
	//         "bins": [
	//           {
	//             "lo": -0.5,
	//             "hi": -0.5,
	//             "count": 1
	//           }
	//         ],
	//         "points": [
	//           [
	//             8.5,
	//             8
	//           ]
	//         ],
	//         "abs": 0,
	//         "rel": 0
	//       }
	//     ],
	//     "categories": []
	//   },
	//   "limit": 0
	// }
}

// A Diff that lists every differing cell of large tables is written as it
// is read: WriteText (and WriteMarkdown, WriteJSON, WriteHTML) build one
// cell at a time, so the listing never has to fit in memory.
func ExampleDiff_WriteText() {
	want, _ := fixtures.Parse(`
		house:string | tmax:float64
		Étang        | 21.5
		Verger       | 19.25
		Source       | 17
	`)
	got, _ := fixtures.Parse(`
		house:string | tmax:float64
		Étang        | 21.75
		Verger       | 19.25
		Source       | 17.5
	`)
	d := assert.Compare(want, got, assert.ByKey("house"), assert.ListLimit(-1))
	for _, c := range d.Cells.All() {
		fmt.Println(c.Row.Key, c.Column, c.Want.Text, "→", c.Got.Text)
	}
	if err := d.WriteText(os.Stdout, assert.TextStyle{}); err != nil {
		fmt.Println(err)
	}
	// Output:
	// [Étang] tmax 21.5 → 21.75
	// [Source] tmax 17 → 17.5
	// tables differ: 2 differing cells in 2 rows
	// want 3 rows, got 3 rows; rows matched by key (house)
	//
	// differing cells (2)
	//   house   column  want  got    abs. diff  rel. diff
	//   Étang   tmax    21.5  21.75       0.25     0.0115
	//   Source  tmax    17    17.5         0.5     0.0286
	//
	// columns
	//   column  how compared  cells differ  max abs. diff  max rel. diff  where max
	//   tmax    exact                    2            0.5         0.0286  (Source)
}

// Code that computes a Diff elsewhere — in a SQL engine, say — fills its
// fields and builds its listings with ListOf; the renderers read it like a
// Diff from Compare.
func ExampleListOf() {
	d := &assert.Diff{
		WantRows: 2, GotRows: 2, Match: assert.MatchByKey, Keys: []string{"house"},
		WantColumns: []string{"house", "kept"}, GotColumns: []string{"house", "kept"}, Compared: []string{"house", "kept"},
		CellsDiffering: 1, RowsDiffering: 1, Limit: assert.DefaultListLimit,
	}
	d.Cells = assert.ListOf(assert.CellDiff{
		Row:    assert.RowRef{Want: 1, Got: 0, Key: []string{"Verger"}},
		Column: "kept",
		Want:   assert.Cell{Text: "140", Kind: fixtures.KindInt64},
		Got:    assert.Cell{Text: "139", Kind: fixtures.KindInt64},
		Delta:  assert.Delta{Has: true, Abs: 1, Rel: 1.0 / 140},
	})
	fmt.Print(d.Markdown())
	// Output:
	// **Tables differ: 1 differing cell in 1 row**
	//
	// | | want | got |
	// |---|--:|--:|
	// | rows | 2 | 2 |
	// | columns | 2 | 2 |
	//
	// Rows matched by key (house).
	//
	// #### Differing cells (1)
	//
	// | `house` | column | want | got | abs. diff | rel. diff |
	// |---|---|---|---|---|---|
	// | `Verger` | `kept` | `140` | `139` | 1 | 0.00714 |
}
