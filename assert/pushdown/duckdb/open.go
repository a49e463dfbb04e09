//go:build cgo

package duckdb

import (
	"database/sql"
	"fmt"
	"net/url"
	"strconv"

	duckdbdriver "github.com/duckdb/duckdb-go/v2"
)

// Available reports whether this build holds the DuckDB engine: true when
// it was built with cgo.
const Available = true

// Open opens a new in-memory DuckDB database with the options' limits.
// Close it when done; its spill files go with it.
func Open(o Options) (*sql.DB, error) {
	q := url.Values{}
	if o.MemoryLimit != "" {
		q.Set("memory_limit", o.MemoryLimit)
	}
	if o.TempDir != "" {
		q.Set("temp_directory", o.TempDir)
	}
	if o.Threads > 0 {
		q.Set("threads", strconv.Itoa(o.Threads))
	}
	dsn := ""
	if len(q) > 0 {
		dsn = "?" + q.Encode()
	}
	c, err := duckdbdriver.NewConnector(dsn, nil)
	if err != nil {
		return nil, fmt.Errorf("duckdb: opening an in-memory database: %w", err)
	}
	db := sql.OpenDB(c)
	if err := db.Ping(); err != nil {
		db.Close()
		return nil, fmt.Errorf("duckdb: opening an in-memory database: %w", err)
	}
	return db, nil
}
