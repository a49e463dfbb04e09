package pushdown_test

import (
	"path/filepath"
	"testing"

	"github.com/stretchr/testify/require"

	"github.com/proofsheet/proofsheet/assert"
	"github.com/proofsheet/proofsheet/assert/pushdown"
	"github.com/proofsheet/proofsheet/assert/pushdown/duckdb"
	"github.com/proofsheet/proofsheet/fixtures"
	_ "github.com/proofsheet/proofsheet/fixtures/parquet"
)

// retype rebuilds a table with one column's type changed (values kept).
func retype(t *testing.T, tbl *fixtures.Table, col string, typ fixtures.Type) *fixtures.Table {
	t.Helper()
	schema := tbl.Schema()
	schema[schema.Index(col)].Type = typ
	b := fixtures.NewBuilder(schema)
	for i := 0; i < tbl.NumRows(); i++ {
		b.Row(tbl.Row(i)...)
	}
	out, err := b.Build()
	require.NoError(t, err)
	return out
}

// commonFlavour is what every engine holds: no booleans, timestamps in
// whole seconds from 1970, no NUL bytes in text.
var commonFlavour = flavour{ts: fixtures.TimestampOf(fixtures.Seconds, "UTC"), minDay: 0}

// tsTypeIn is the type a whole-second UTC timestamp reads back as.
func tsTypeIn(d pushdown.Dialect) fixtures.Type {
	if d == pushdown.ClickHouse {
		return fixtures.TimestampOf(fixtures.Seconds, "UTC")
	}
	return fixtures.TimestampOf(fixtures.Micros, "UTC")
}

// TestAcrossTwoPlaces: want in one engine and got in another (or in a
// Parquet file read by DuckDB), both streamed in key order and merged, give
// the in-memory Diff of the same tables.
func TestAcrossTwoPlaces(t *testing.T) {
	pg := postgresEngine(t)
	ch := clickhouseEngine(t)
	dk := duckEngine(t)
	cases := []struct {
		name     string
		w, g     *testEngine
		file     bool // got is a Parquet file DuckDB reads
		wantFile bool // want is a Parquet file DuckDB reads
	}{
		{"postgres-parquet", pg, dk, true, false},
		{"parquet-postgres", dk, pg, false, true},
		{"postgres-clickhouse", pg, ch, false, false},
		{"clickhouse-duckdb", ch, dk, false, false},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			want0, got0 := genTables(21, 400, commonFlavour)
			want := retype(t, want0, "ts", tsTypeIn(tc.w.Dialect))
			got := retype(t, got0, "ts", tsTypeIn(tc.g.Dialect))
			var wsrc pushdown.Source
			if tc.wantFile {
				path := filepath.Join(t.TempDir(), "want.parquet")
				require.NoError(t, fixtures.WriteFile(path, want))
				rel, err := duckdb.Files(path)
				require.NoError(t, err)
				wsrc = pushdown.Source{Engine: tc.w.Engine, Relation: rel}
			} else {
				wn := tableName("aw")
				tc.w.load(t, want, wn)
				wsrc = pushdown.Source{Engine: tc.w.Engine, Relation: pushdown.Table(wn)}
			}
			var gsrc pushdown.Source
			if tc.file {
				path := filepath.Join(t.TempDir(), "got.parquet")
				require.NoError(t, fixtures.WriteFile(path, got))
				rel, err := duckdb.Files(path)
				require.NoError(t, err)
				gsrc = pushdown.Source{Engine: tc.g.Engine, Relation: rel}
			} else {
				gn := tableName("ag")
				tc.g.load(t, got, gn)
				gsrc = pushdown.Source{Engine: tc.g.Engine, Relation: pushdown.Table(gn)}
			}
			for name, opts := range optionSets() {
				t.Run(name, func(t *testing.T) {
					keys := assert.KeyColumns(opts...)
					sw := want // a file keeps its order
					var err error
					if !tc.wantFile {
						sw, err = want.SortBy(append(keys, want.Names()...)...)
						require.NoError(t, err)
					}
					sg := got // a file keeps its order
					if !tc.file {
						sg, err = got.SortBy(append(keys, got.Names()...)...)
						require.NoError(t, err)
					}
					o := append(append([]assert.Option{}, opts...), assert.IgnoreColumns("rn"))
					mem := assert.Compare(sw, sg, o...)
					mem.Hints = nil
					mem.Overview = nil // it needs every row at once (README, Engines)
					mj, err := mem.JSON()
					require.NoError(t, err)
					// One chunk, and chunks of 7 pairs: the largest deltas,
					// listed cells and rows fold across chunk boundaries.
					for _, chunk := range []int{1 << 15, 7} {
						pd, err := pushdown.CompareAcrossChunked(ctx(t), wsrc, gsrc, chunk, o...)
						require.NoError(t, err)
						pd.Hints = nil
						pj, err := pd.JSON()
						require.NoError(t, err)
						if string(mj) != string(pj) {
							t.Fatalf("across %s, chunks of %d: the merged Diff differs from the one in memory:\n%s", tc.name, chunk, lineDiff(string(mj), string(pj)))
						}
					}
				})
			}
		})
	}
}

// TestAcrossOptionsInGo: across two places cells are compared by
// assert.Compare itself, so ULPs and NormText on other columns apply.
func TestAcrossOptionsInGo(t *testing.T) {
	dk := duckEngine(t)
	want := fixtures.MustParse(t, `
		house:string | note:string | tmax:float64
		Bellecôte    | "ok "       | 21.5
		Kæreby       | Fault       | 19.5
	`)
	got := fixtures.MustParse(t, `
		house:string | note:string | tmax:float64
		Kæreby       | fault       | 19.500000000000004
		Bellecôte    | ok          | 21.5
	`)
	wn, gn := tableName("w"), tableName("g")
	dk.load(t, want, wn)
	dk.load(t, got, gn)
	opts := []assert.Option{assert.ByKey("house"), assert.ULPs("tmax", 2), assert.NormText("note", assert.TrimSpace|assert.FoldCase)}
	d, err := pushdown.CompareAcross(ctx(t), pushdown.Source{Engine: dk.Engine, Relation: pushdown.Table(wn)},
		pushdown.Source{Engine: dk.Engine, Relation: pushdown.Table(gn)}, opts...)
	require.NoError(t, err)
	require.True(t, d.Equal(), d.Text())
	_, err = pushdown.CompareAcross(ctx(t), pushdown.Source{Engine: dk.Engine, Relation: pushdown.Table(wn)},
		pushdown.Source{Engine: dk.Engine, Relation: pushdown.Table(gn)}, assert.ByKey("house"), assert.NormText("house", assert.NFC))
	require.ErrorContains(t, err, `NormText on key column "house"`)
}
