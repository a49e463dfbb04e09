package pushdown_test

import (
	"context"
	"testing"

	"github.com/stretchr/testify/require"

	"github.com/proofsheet/proofsheet/assert"
	"github.com/proofsheet/proofsheet/assert/pushdown"
	"github.com/proofsheet/proofsheet/fixtures"
)

// TestFromSQLRows: a table loaded into each engine and read back with
// fixtures.FromSQLRows is the same table, types included (every kind the
// engine holds, nulls, NaN, ±Inf, ±0, hostile names and text).
func TestFromSQLRows(t *testing.T) {
	allEngines(t, func(t *testing.T, e *testEngine) {
		want, _ := genTables(11, 60, flavourOf(e.Dialect))
		name := tableName("rows")
		e.load(t, want, name)
		q := `SELECT * FROM "` + name + `" ORDER BY rn`
		if e.Dialect == pushdown.ClickHouse {
			q = "SELECT * FROM `" + name + "` ORDER BY rn"
		}
		rows, err := e.DB.QueryContext(context.Background(), q)
		require.NoError(t, err)
		got, err := fixtures.FromSQLRows(rows)
		require.NoError(t, err)
		require.Equal(t, want.Schema(), got.Schema())
		d := assert.Compare(want, got)
		require.True(t, d.Equal(), d.Text())
	})
}
