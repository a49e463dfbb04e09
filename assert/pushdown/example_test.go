//go:build cgo

package pushdown_test

import (
	"context"
	"fmt"

	"github.com/proofsheet/proofsheet/assert"
	"github.com/proofsheet/proofsheet/assert/pushdown"
	"github.com/proofsheet/proofsheet/assert/pushdown/duckdb"
	"github.com/proofsheet/proofsheet/fixtures"
)

// Compare two tables inside embedded DuckDB: the Diff is the one
// assert.Compare gives in memory.
func ExampleEngine_Compare() {
	db, err := duckdb.Open(duckdb.Options{MemoryLimit: "256MB"})
	if err != nil {
		fmt.Println(err)
		return
	}
	defer db.Close()
	e := &pushdown.Engine{DB: db, Dialect: pushdown.DuckDB}
	ctx := context.Background()
	want, _ := fixtures.Parse(`
		house:string | day:date   | tmax:float64
		Bellecôte    | 2026-04-01 | 21.5
		Kæreby       | 2026-04-01 | 19.5
	`)
	got, _ := fixtures.Parse(`
		house:string | day:date   | tmax:float64
		Kæreby       | 2026-04-01 | 19.5000001
		Bellecôte    | 2026-04-01 | 21.75
	`)
	if err := e.Load(ctx, want, "daily_want"); err != nil {
		fmt.Println(err)
		return
	}
	if err := e.Load(ctx, got, "daily_got"); err != nil {
		fmt.Println(err)
		return
	}
	d, err := e.Compare(ctx, pushdown.Table("daily_want"), pushdown.Query("SELECT * FROM daily_got"),
		assert.ByKey("house", "day"), assert.Tol("tmax", 0.001, 0))
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println(d.Equal(), d.CellsDiffering, d.Cells.At(0).Row.Key, d.Cells.At(0).Want.Text, d.Cells.At(0).Got.Text)
	// Output:
	// false 1 [Bellecôte 2026-04-01] 21.5 21.75
}
