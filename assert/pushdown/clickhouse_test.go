package pushdown_test

import (
	"context"
	"hash/fnv"
	"strings"
	"testing"

	"github.com/stretchr/testify/require"

	"github.com/proofsheet/proofsheet/assert"
	"github.com/proofsheet/proofsheet/assert/pushdown"
	"github.com/proofsheet/proofsheet/fixtures"
)

// TestClickHouseDistributed compares Distributed tables over the two
// shards of the test cluster with the in-memory Diff: sharded alike by
// the key, and sharded by different columns, where rows of one key sit
// on different shards. A FULL JOIN of two Distributed tables counts such
// rows wrongly in ClickHouse; the pushed-down compare pairs rows by
// grouping instead, which is right however the tables are sharded.
func TestClickHouseDistributed(t *testing.T) {
	url := needServer(t, "PROOFSHEET_CLICKHOUSE_URL", "ClickHouse")
	shards := strings.Split(needServer(t, "PROOFSHEET_CLICKHOUSE_SHARDS", "ClickHouse"), ",")
	cluster := needServer(t, "PROOFSHEET_CLICKHOUSE_CLUSTER", "ClickHouse")
	require.Len(t, shards, 2, "PROOFSHEET_CLICKHOUSE_SHARDS")
	var engines []*pushdown.Engine
	for _, s := range shards {
		engines = append(engines, &pushdown.Engine{DB: openClickHouse(t, "clickhouse://"+s+"/default"), Dialect: pushdown.ClickHouse})
	}
	// Small blocks: rows are numbered block after block, and each shard
	// sends many of them.
	front := &testEngine{"clickhouse", &pushdown.Engine{DB: openClickHouse(t, url+"?max_block_size=7"), Dialect: pushdown.ClickHouse}}
	want, got := genTables(7, 150, flavourOf(pushdown.ClickHouse))

	// distribute loads t's rows into a local table on each shard, split
	// by shardOf, and creates a Distributed table over them.
	distribute := func(t *testing.T, tbl *fixtures.Table, shardOf func(row int) int) string {
		local, dist := tableName("local"), tableName("dist")
		parts := make([][]int, len(engines))
		for r := 0; r < tbl.NumRows(); r++ {
			s := shardOf(r)
			parts[s] = append(parts[s], r)
		}
		for i, e := range engines {
			part, err := tbl.Take(parts[i])
			require.NoError(t, err)
			require.NoError(t, e.Load(context.Background(), part, local), "shard %d", i+1)
			t.Cleanup(func() { (&testEngine{"clickhouse", e}).drop(local) })
			require.NotZero(t, part.NumRows(), "shard %d got no rows", i+1)
		}
		ddl := "CREATE TABLE `" + dist + "` AS `" + local + "` ENGINE = Distributed(`" + cluster + "`, default, `" + local + "`, rand())"
		_, err := front.DB.ExecContext(context.Background(), ddl)
		require.NoError(t, err)
		t.Cleanup(func() { front.drop(dist) })
		return dist
	}
	byColumn := func(tbl *fixtures.Table, col string) func(int) int {
		c := tbl.Column(col)
		return func(r int) int {
			h := fnv.New32a()
			h.Write([]byte(fixtures.LiteralCell(c, r)))
			return int(h.Sum32() % 2)
		}
	}
	cases := []struct {
		name          string
		wantBy, gotBy string
	}{
		{"same-sharding-key", "k1", "k1"},
		{"different-sharding-keys", "k1", "tag"},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			wd := distribute(t, want, byColumn(want, tc.wantBy))
			gd := distribute(t, got, byColumn(got, tc.gotBy))
			for name, opts := range optionSets() {
				t.Run(name, func(t *testing.T) {
					keys := assert.KeyColumns(opts...)
					sw, err := want.SortBy(append(keys, want.Names()...)...)
					require.NoError(t, err)
					sg, err := got.SortBy(append(keys, got.Names()...)...)
					require.NoError(t, err)
					o := append(append([]assert.Option{}, opts...), assert.IgnoreColumns("rn"))
					requireSameDiff(t, front, pushdown.Table(wd), pushdown.Table(gd), sw, sg, o)
					w2, err := want.Drop("rn")
					require.NoError(t, err)
					g2, err := got.Drop("rn")
					require.NoError(t, err)
					requireSameDiff(t, front, pushdown.Table(wd).NumberedBy("rn"), pushdown.Table(gd).NumberedBy("rn"), w2, g2, opts)
				})
			}
		})
	}
}
