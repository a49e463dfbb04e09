// Package duckdb opens the embedded DuckDB engine for pushdown comparisons
// and names files for it to read where they lie, so that tables larger
// than memory are compared with bounded memory: DuckDB spills its joins
// and sorts to a temporary directory past a memory limit.
//
// DuckDB is a C++ library: this package needs cgo. A build without cgo
// (CGO_ENABLED=0) still compiles it, and Open then returns ErrNotBuilt,
// which says so; Available tells which build this is.
//
// # Typical use
//
//	db, err := duckdb.Open(duckdb.Options{MemoryLimit: "300MB", TempDir: os.TempDir()})
//	if err != nil { … }
//	defer db.Close()
//	want, _ := duckdb.Files("want/readings-*.parquet")
//	got, _ := duckdb.Files("got/readings.csv")
//	e := &pushdown.Engine{DB: db, Dialect: pushdown.DuckDB}
//	d, err := e.Compare(ctx, want, got, assert.ByKey("house", "at"), assert.Tol("temp_c", 1e-9, 0))
package duckdb
