package pushdown_test

import (
	"context"
	"strings"
	"testing"
	"time"

	"github.com/stretchr/testify/require"

	"github.com/proofsheet/proofsheet/assert"
	"github.com/proofsheet/proofsheet/assert/pushdown"
	"github.com/proofsheet/proofsheet/fixtures"
)

func readings(t *testing.T) *fixtures.Table {
	return fixtures.MustParse(t, `
		house:string | day:date   | tmax:float64 | at:timestamp(us,UTC) | note:string
		Bellecôte    | 2026-04-01 | 21.5         | 2026-04-01T12:00:00Z | ok
		Kæreby       | 2026-04-01 | 19.5         | 2026-04-01T13:00:00Z | ~
	`)
}

// TestRefused checks that options SQL cannot carry out are refused with a
// message that names them, never dropped.
func TestRefused(t *testing.T) {
	e := duckEngine(t)
	name := tableName("w")
	e.load(t, readings(t), name)
	rel := pushdown.Table(name)
	tests := []struct {
		name string
		opts []assert.Option
		rel  pushdown.Relation
		want string
	}{
		{"multiset", []assert.Option{assert.AnyRowOrder()}, rel, "AnyRowOrder cannot be pushed down"},
		{"ulps", []assert.Option{assert.ByKey("house"), assert.ULPs("tmax", 4)}, rel, `ULPs (column "tmax") cannot be pushed down`},
		{"normtext", []assert.Option{assert.ByKey("house"), assert.NormText("house", assert.NFC)}, rel, `NormText (column "house") cannot be pushed down`},
		{"position without row numbers", nil, rel, "cannot pair by position"},
		{"missing row-number column", []assert.Option{assert.ByKey("house")}, rel.NumberedBy("n"), `has no row-number column "n"`},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			_, err := e.Compare(context.Background(), tt.rel, tt.rel, tt.opts...)
			require.Error(t, err)
			require.Contains(t, err.Error(), tt.want)
		})
	}
}

// TestRefusedZonedMidnight: a date against a timestamp in a zone other
// than UTC needs midnight in that zone, which is refused. Only ClickHouse
// keeps a zone name in a column type.
func TestRefusedZonedMidnight(t *testing.T) {
	e := clickhouseEngine(t)
	w := fixtures.MustParse(t, `
		house:string | at:date
		Kæreby       | 2026-04-01
	`)
	g := fixtures.MustParse(t, `
		house:string | at:timestamp(s,Europe/Paris)
		Kæreby       | 2026-04-01T00:00:00+02:00
	`)
	wn, gn := tableName("w"), tableName("g")
	e.load(t, w, wn)
	e.load(t, g, gn)
	_, err := e.Compare(context.Background(), pushdown.Table(wn), pushdown.Table(gn), assert.ByKey("house"))
	require.ErrorContains(t, err, "midnight in that zone")
}

// TestProblemsAsInMemory: option problems and unusable keys come back in
// the Diff exactly as assert.Compare reports them.
func TestProblemsAsInMemory(t *testing.T) {
	allEngines(t, func(t *testing.T, e *testEngine) {
		w := fixtures.MustParse(t, `
			house:string | day:date   | tmax:float64 | kept:int64
			Bellecôte    | 2026-04-01 | 21.5         | 140
			Kæreby       | 2026-04-01 | 19.5         | 96
		`)
		g := fixtures.MustParse(t, `
			house:string | day:date   | tmax:float64 | kept:float64
			Kæreby       | 2026-04-01 | 19.5         | 96
			Bellecôte    | 2026-04-01 | 21.75        | 140.5
		`)
		wn, gn := tableName("w"), tableName("g")
		e.load(t, w, wn)
		e.load(t, g, gn)
		for name, opts := range map[string][]assert.Option{
			"float key":           {assert.ByKey("tmax")},
			"unknown column":      {assert.ByKey("house"), assert.Tol("tmean", 0.1, 0)},
			"tolerance on text":   {assert.ByKey("house", "day"), assert.Tol("house", 0.1, 0)},
			"key ignored":         {assert.ByKey("house"), assert.IgnoreColumns("house")},
			"time tol on a float": {assert.ByKey("house"), assert.TimeTol("tmax", time.Second)},
			"int and float":       {assert.ByKey("house"), assert.Tol("kept", 0.5, 0)},
		} {
			t.Run(name, func(t *testing.T) {
				keys := assert.KeyColumns(opts...)
				sw, sg := w, g
				if len(keys) > 0 && !strings.Contains(name, "float key") {
					var err error
					sw, err = w.SortBy(append(keys, w.Names()...)...)
					require.NoError(t, err)
					sg, err = g.SortBy(append(keys, g.Names()...)...)
					require.NoError(t, err)
				}
				requireSameDiff(t, e, pushdown.Table(wn), pushdown.Table(gn), sw, sg, opts)
			})
		}
	})
}
