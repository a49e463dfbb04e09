package pushdown_test

import (
	"context"
	"database/sql"
	"fmt"
	"os"
	"sync/atomic"
	"testing"
	"time"

	_ "github.com/ClickHouse/clickhouse-go/v2"
	_ "github.com/jackc/pgx/v5/stdlib"
	"github.com/stretchr/testify/require"

	"github.com/proofsheet/proofsheet/assert/pushdown"
	"github.com/proofsheet/proofsheet/assert/pushdown/duckdb"
	"github.com/proofsheet/proofsheet/fixtures"
)

// The engine tests run against real servers that .ci/servers starts (see
// DEVELOPERS.md). Outside CI a missing server skips its tests with a
// message; under CI=true it fails them.

// testEngine is an engine the tests load tables into.
type testEngine struct {
	name string
	*pushdown.Engine
}

// needServer skips (or, under CI, fails) a test whose server is not given.
func needServer(t *testing.T, env, what string) string {
	t.Helper()
	v := os.Getenv(env)
	if v == "" {
		if os.Getenv("CI") == "true" {
			t.Fatalf("%s is not set: CI must run the %s tests (.ci/run starts the servers)", env, what)
		}
		t.Skipf("%s is not set: skipping the %s tests; start the servers with .ci/servers (see DEVELOPERS.md)", env, what)
	}
	return v
}

func duckEngine(t *testing.T) *testEngine {
	t.Helper()
	db, err := duckdb.Open(duckdb.Options{MemoryLimit: "1GB", TempDir: t.TempDir()})
	if err == duckdb.ErrNotBuilt {
		if os.Getenv("CI") == "true" {
			t.Fatal(err)
		}
		t.Skip(err)
	}
	require.NoError(t, err)
	t.Cleanup(func() { db.Close() })
	return &testEngine{"duckdb", &pushdown.Engine{DB: db, Dialect: pushdown.DuckDB}}
}

func postgresEngine(t *testing.T) *testEngine {
	t.Helper()
	url := needServer(t, "PROOFSHEET_POSTGRES_URL", "PostgreSQL")
	db, err := sql.Open("pgx", url)
	require.NoError(t, err)
	t.Cleanup(func() { db.Close() })
	require.NoError(t, db.Ping(), "PostgreSQL at %s", url)
	return &testEngine{"postgres", &pushdown.Engine{DB: db, Dialect: pushdown.PostgreSQL}}
}

func clickhouseEngine(t *testing.T) *testEngine {
	t.Helper()
	url := needServer(t, "PROOFSHEET_CLICKHOUSE_URL", "ClickHouse")
	return &testEngine{"clickhouse", &pushdown.Engine{DB: openClickHouse(t, url), Dialect: pushdown.ClickHouse}}
}

func openClickHouse(t *testing.T, url string) *sql.DB {
	t.Helper()
	db, err := sql.Open("clickhouse", url)
	require.NoError(t, err)
	t.Cleanup(func() { db.Close() })
	require.NoError(t, db.Ping(), "ClickHouse at %s", url)
	return db
}

// allEngines runs f on each engine as a subtest.
func allEngines(t *testing.T, f func(t *testing.T, e *testEngine)) {
	for _, mk := range []struct {
		name string
		open func(*testing.T) *testEngine
	}{{"duckdb", duckEngine}, {"postgres", postgresEngine}, {"clickhouse", clickhouseEngine}} {
		t.Run(mk.name, func(t *testing.T) { f(t, mk.open(t)) })
	}
}

var tableSeq atomic.Int64

// tableName returns a fresh table name for this test run.
func tableName(prefix string) string {
	return fmt.Sprintf("%s_%d_%d", prefix, time.Now().UnixNano()%1_000_000_000, tableSeq.Add(1))
}

// load creates a table from tbl and drops it when the test ends.
func (e *testEngine) load(t *testing.T, tbl *fixtures.Table, name string) {
	t.Helper()
	require.NoError(t, e.Load(context.Background(), tbl, name), "loading %s into %s", name, e.name)
	t.Cleanup(func() { e.drop(name) })
}

func (e *testEngine) drop(name string) {
	q := `DROP TABLE IF EXISTS "` + name + `"`
	if e.Dialect == pushdown.ClickHouse {
		q = "DROP TABLE IF EXISTS `" + name + "`"
	}
	e.DB.ExecContext(context.Background(), q) //nolint:errcheck // best effort at cleanup
}

func ctx(t *testing.T) context.Context {
	c, cancel := context.WithTimeout(context.Background(), 5*time.Minute)
	t.Cleanup(cancel)
	return c
}
