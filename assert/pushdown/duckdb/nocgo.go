//go:build !cgo

package duckdb

import "database/sql"

// Available reports whether this build holds the DuckDB engine: false,
// since it was built without cgo.
const Available = false

// Open fails: this build has no DuckDB engine.
func Open(o Options) (*sql.DB, error) { return nil, ErrNotBuilt }
