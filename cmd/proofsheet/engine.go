package main

import (
	"context"
	"database/sql"
	"fmt"
	"net/url"
	"os"
	"strings"
	"sync"
	"time"

	_ "github.com/ClickHouse/clickhouse-go/v2" // the "clickhouse" database/sql driver (native protocol)
	_ "github.com/jackc/pgx/v5/stdlib"         // the "pgx" database/sql driver

	"github.com/proofsheet/proofsheet/assert"
	"github.com/proofsheet/proofsheet/assert/pushdown"
	"github.com/proofsheet/proofsheet/assert/pushdown/duckdb"
)

// engineHelp is the part of diff's help about --engine.
const engineHelp = `  --engine ENGINE    compare inside a SQL engine instead of in memory:
                     duckdb (embedded; WANT and GOT are files or quoted
                     globs DuckDB reads where they lie, so files larger
                     than memory compare), postgres://USER@HOST:PORT/DB,
                     or clickhouse://HOST:PORT/DB (native protocol); for
                     a server WANT and GOT are table names (schema.table)
                     or queries written sql:SELECT …
  --memory-limit M   duckdb: cap DuckDB's memory (300MB, 2GB); past it,
                     joins and sorts spill to the temporary directory
  --temp-dir DIR     duckdb: where DuckDB spills (default: a new directory
                     under the system's temporary directory, removed after)
  --want-engine E    WANT lives in engine E (duckdb, postgres://…,
  --got-engine E     clickhouse://…), GOT in another: both stream their
                     rows in key order and proofsheet merges them in
                     bounded memory (default: --engine for both)`

// engineFlags are diff's engine options.
type engineFlags struct {
	engine, memoryLimit, tempDir string
	wantEngine, gotEngine        string
}

// sides returns the engines of WANT and GOT.
func (f engineFlags) sides() (string, string) {
	w, g := f.engine, f.engine
	if f.wantEngine != "" {
		w = f.wantEngine
	}
	if f.gotEngine != "" {
		g = f.gotEngine
	}
	return w, g
}

// used reports whether the comparison runs in an engine.
func (f engineFlags) used() bool { return f.engine != "" || f.wantEngine != "" || f.gotEngine != "" }

// openEngine opens the engine an --engine value names; close releases it.
func openEngine(f engineFlags) (eng *pushdown.Engine, close func(), err error) {
	if f.engine != "duckdb" && (f.memoryLimit != "" || f.tempDir != "") {
		return nil, nil, fmt.Errorf("--memory-limit and --temp-dir are for --engine duckdb")
	}
	switch {
	case f.engine == "duckdb":
		dir := f.tempDir
		cleanup := func() {}
		if dir == "" {
			dir, err = os.MkdirTemp("", "proofsheet-duckdb-")
			if err != nil {
				return nil, nil, fmt.Errorf("--engine duckdb: %w", err)
			}
			cleanup = func() { os.RemoveAll(dir) }
		}
		db, err := duckdb.Open(duckdb.Options{MemoryLimit: f.memoryLimit, TempDir: dir})
		if err != nil {
			cleanup()
			return nil, nil, err
		}
		return &pushdown.Engine{DB: db, Dialect: pushdown.DuckDB}, func() { db.Close(); cleanup() }, nil
	}
	u, err := url.Parse(f.engine)
	if err != nil || u.Host == "" {
		return nil, nil, fmt.Errorf("--engine %q: want duckdb, postgres://USER@HOST:PORT/DB or clickhouse://HOST:PORT/DB", redact(f.engine))
	}
	var driver string
	var dialect pushdown.Dialect
	switch u.Scheme {
	case "postgres", "postgresql":
		driver, dialect = "pgx", pushdown.PostgreSQL
	case "clickhouse":
		driver, dialect = "clickhouse", pushdown.ClickHouse
	default:
		return nil, nil, fmt.Errorf("--engine %s: unknown engine %q (want duckdb, postgres:// or clickhouse://)", redact(f.engine), u.Scheme)
	}
	db, err := sql.Open(driver, f.engine)
	if err != nil {
		return nil, nil, fmt.Errorf("--engine %s: %w", redact(f.engine), err)
	}
	ctx, cancel := context.WithTimeout(context.Background(), 30*time.Second)
	defer cancel()
	if err := db.PingContext(ctx); err != nil {
		db.Close()
		return nil, nil, fmt.Errorf("--engine %s: cannot reach the server: %w", redact(f.engine), err)
	}
	return &pushdown.Engine{DB: db, Dialect: dialect}, func() { db.Close() }, nil
}

// redact hides the password of a URL.
func redact(s string) string {
	u, err := url.Parse(s)
	if err != nil || u.User == nil {
		return s
	}
	if _, ok := u.User.Password(); ok {
		u.User = url.UserPassword(u.User.Username(), "xxxxx")
	}
	return u.String()
}

// relationOf turns a diff argument into a relation: sql:QUERY, else files
// (duckdb) or a table name, its parts separated by dots ("a.b" in double
// quotes is one part).
func relationOf(dialect pushdown.Dialect, arg string) (pushdown.Relation, error) {
	if q, ok := strings.CutPrefix(arg, "sql:"); ok {
		if strings.TrimSpace(q) == "" {
			return pushdown.Relation{}, fmt.Errorf("%q: an empty query", arg)
		}
		return pushdown.Query(q), nil
	}
	if dialect == pushdown.DuckDB {
		return duckdb.Files(arg)
	}
	parts, err := splitName(arg)
	if err != nil {
		return pushdown.Relation{}, err
	}
	return pushdown.Table(parts...), nil
}

// splitName splits schema.table at dots outside double quotes; "" inside
// quotes is a quote.
func splitName(s string) ([]string, error) {
	var parts []string
	var b strings.Builder
	quoted := false
	for i := 0; i < len(s); i++ {
		ch := s[i]
		switch {
		case ch == '"' && quoted && i+1 < len(s) && s[i+1] == '"':
			b.WriteByte('"')
			i++
		case ch == '"':
			quoted = !quoted
		case ch == '.' && !quoted:
			parts = append(parts, b.String())
			b.Reset()
		default:
			b.WriteByte(ch)
		}
	}
	if quoted {
		return nil, fmt.Errorf("table name %s: a double quote is not closed", s)
	}
	parts = append(parts, b.String())
	for _, p := range parts {
		if p == "" {
			return nil, fmt.Errorf("table name %q: an empty part", s)
		}
	}
	return parts, nil
}

// engineDiff compares the two arguments inside the engine, showing what
// the engine does (and for how long) on the progress bar.
func engineDiff(f engineFlags, bar *progress, wantArg, gotArg string, opts []assert.Option) (*assert.Diff, error) {
	we, ge := f.sides()
	if we == "" || ge == "" {
		return nil, fmt.Errorf("--want-engine and --got-engine need each other, or --engine for the other side")
	}
	limits := func(name string) engineFlags {
		if name != "duckdb" {
			return engineFlags{engine: name}
		}
		return engineFlags{engine: name, memoryLimit: f.memoryLimit, tempDir: f.tempDir}
	}
	if f.engine != "duckdb" && we != "duckdb" && ge != "duckdb" && (f.memoryLimit != "" || f.tempDir != "") {
		return nil, fmt.Errorf("--memory-limit and --temp-dir are for --engine duckdb")
	}
	weng, closeW, err := openEngine(limits(we))
	if err != nil {
		return nil, err
	}
	defer closeW()
	want, err := relationOf(weng.Dialect, wantArg)
	if err != nil {
		return nil, err
	}
	if ge == we {
		got, err := relationOf(weng.Dialect, gotArg)
		if err != nil {
			return nil, err
		}
		tick := newEngineTicker(bar, string(weng.Dialect))
		defer tick.stop()
		weng.Progress = tick.step
		return weng.Compare(context.Background(), want, got, opts...)
	}
	geng, closeG, err := openEngine(limits(ge))
	if err != nil {
		return nil, err
	}
	defer closeG()
	got, err := relationOf(geng.Dialect, gotArg)
	if err != nil {
		return nil, err
	}
	tick := newEngineTicker(bar, string(weng.Dialect)+" and "+string(geng.Dialect))
	defer tick.stop()
	tick.step("streaming both sides in key order and merging them")
	return pushdown.CompareAcross(context.Background(), pushdown.Source{Engine: weng, Relation: want}, pushdown.Source{Engine: geng, Relation: got}, opts...)
}

// engineTicker redraws the progress line with the step the engine is on
// and the time it has taken so far, while the engine works.
type engineTicker struct {
	mu     sync.Mutex
	bar    *progress
	engine string
	label  string
	since  time.Time
	done   chan struct{}
}

func newEngineTicker(bar *progress, engine string) *engineTicker {
	t := &engineTicker{bar: bar, engine: engine, since: time.Now(), done: make(chan struct{})}
	if bar == nil {
		return t
	}
	go func() {
		tk := time.NewTicker(500 * time.Millisecond)
		defer tk.Stop()
		for {
			select {
			case <-t.done:
				return
			case <-tk.C:
				t.draw()
			}
		}
	}()
	return t
}

func (t *engineTicker) step(label string) {
	t.mu.Lock()
	t.label = label
	t.mu.Unlock()
	t.draw()
}

func (t *engineTicker) draw() {
	t.mu.Lock()
	defer t.mu.Unlock()
	if t.bar == nil || t.label == "" {
		return
	}
	t.bar.start(fmt.Sprintf("%s: %s … %s", t.engine, t.label, time.Since(t.since).Round(time.Second)), 0)
}

func (t *engineTicker) stop() {
	close(t.done)
	t.mu.Lock()
	defer t.mu.Unlock()
	t.bar.finish()
}
