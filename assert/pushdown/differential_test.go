package pushdown_test

import (
	"fmt"
	"math"
	"math/rand/v2"
	"slices"
	"strconv"
	"strings"
	"testing"
	"time"

	"github.com/stretchr/testify/require"

	"github.com/proofsheet/proofsheet/assert"
	"github.com/proofsheet/proofsheet/assert/pushdown"
	"github.com/proofsheet/proofsheet/fixtures"
)

// hostile is a column name that needs every kind of quoting.
const hostile = "we\"ird`c\\ol 'x'; --"

// flavour is what an engine can hold; the generator keeps to it. Each
// limit is listed in the README's Engines section.
type flavour struct {
	bools    bool          // a boolean type (not ClickHouse 18.16)
	ts       fixtures.Type // its finest timestamp
	nulBytes bool          // NUL bytes in text (not PostgreSQL)
	minDay   int32         // earliest date (ClickHouse: 1970-01-01)
}

func flavourOf(d pushdown.Dialect) flavour {
	switch d {
	case pushdown.PostgreSQL:
		// PostgreSQL: microseconds, zones only as UTC instants, no NUL in text.
		return flavour{bools: true, ts: fixtures.TimestampOf(fixtures.Micros, "UTC"), minDay: -40000}
	case pushdown.ClickHouse:
		// ClickHouse 18.16: no boolean, DateTime in whole seconds from 1970.
		return flavour{ts: fixtures.TimestampOf(fixtures.Seconds, "UTC"), nulBytes: true, minDay: 0}
	}
	// DuckDB: zone-less nanoseconds (its zoned timestamps are microseconds).
	return flavour{bools: true, ts: fixtures.TimestampOf(fixtures.Nanos, ""), nulBytes: true, minDay: -40000}
}

// Values chosen to hit the edges: IEEE 754 specials and extremes, and
// integers at the ends of int64.
// Source: IEEE 754-2019 §3.4 (±0, ±∞, NaN, subnormals, the largest finite).
var specialFloats = []float64{0, math.Copysign(0, -1), math.NaN(), math.Inf(1), math.Inf(-1), math.MaxFloat64, -math.MaxFloat64,
	math.SmallestNonzeroFloat64, -math.SmallestNonzeroFloat64, 2.2250738585072014e-308, 1e308, -1e308, 1.5, 0.1, 9007199254740993}

var specialInts = []int64{math.MinInt64, math.MaxInt64, 0, -1, 1 << 53, -(1 << 53) - 1}

var texts = []string{"Bellecôte", "Kæreby", "Les Pins", "", " ", "O'Hara", `back\slash`, `"quoted"`, "'); DROP TABLE x; --", "x\ny", "Étang", "日本", "~", "a|b"}

// genTables makes a want and a got table over the same entities: some
// only in want (missing), some only in got (extra), some repeated on a
// side, cells changed within and beyond the tolerances of standardOpts,
// and nulls, NaN, ±Inf and ±0 everywhere a kind allows them. Column rn
// numbers each table's rows 1 to n in table order; got's rows are
// shuffled.
func genTables(seed uint64, entities int, fl flavour) (want, got *fixtures.Table) {
	rng := rand.New(rand.NewPCG(seed, seed^0x9e3779b97f4a7c15))
	ts := fl.ts
	shared := fixtures.Schema{
		fixtures.Col("rn", fixtures.Int64), fixtures.Col("k1", fixtures.Int64), fixtures.Col("k2", fixtures.String),
		fixtures.Col("tag", fixtures.String),
	}
	if fl.bools {
		shared = append(shared, fixtures.Col("b", fixtures.Bool))
	}
	shared = append(shared, fixtures.Col("i", fixtures.Int64), fixtures.Col("f", fixtures.Float64), fixtures.Col("f2", fixtures.Float64))
	tail := fixtures.Schema{fixtures.Col("s", fixtures.String), fixtures.Col("d", fixtures.Date), fixtures.Col("ts", ts),
		fixtures.Col("dec", fixtures.DecimalOf(12, 3)), fixtures.Col("ign", fixtures.String), fixtures.Col(hostile, fixtures.Float64)}
	ws := append(append(append(fixtures.Schema{}, shared...), fixtures.Col("n", fixtures.Int64)), tail...)
	ws = append(ws, fixtures.Col("wonly", fixtures.Int64))
	gs := append(append(append(fixtures.Schema{}, shared...), fixtures.Col("n", fixtures.Float64)), tail...)
	gs = append(gs, fixtures.Col("gonly", fixtures.String))

	chance := func(p float64) bool { return rng.Float64() < p }
	pick := func(n int) int { return rng.IntN(n) }
	text := func() any {
		if chance(0.08) {
			return nil
		}
		s := texts[pick(len(texts))]
		if fl.nulBytes && chance(0.05) {
			s += "\x00z"
		}
		return s
	}
	float := func() any {
		switch {
		case chance(0.07):
			return nil
		case chance(0.3):
			return specialFloats[pick(len(specialFloats))]
		}
		return math.Round(rng.NormFloat64()*1e6) / 1e3
	}
	day0 := int32(19000)
	type row map[string]any
	base := func(e int) row {
		r := row{"k1": int64(e * 7 % (entities * 3)), "tag": "e" + strconv.Itoa(e)}
		if chance(0.05) {
			r["k1"] = nil
		}
		r["k2"] = texts[pick(4)]
		if chance(0.05) {
			r["k2"] = nil
		}
		if fl.bools {
			r["b"] = []any{true, false, nil}[pick(3)]
		}
		r["i"] = any(int64(rng.IntN(2000) - 1000))
		if chance(0.15) {
			r["i"] = specialInts[pick(len(specialInts))]
		}
		if chance(0.05) {
			r["i"] = nil
		}
		r["f"], r["f2"], r[hostile] = float(), float(), float()
		n := int64(rng.IntN(1000))
		if chance(0.1) {
			n = specialInts[pick(len(specialInts))]
		}
		r["n"] = n
		r["s"], r["ign"] = text(), text()
		day := fl.minDay + int32(rng.IntN(int(day0)))
		r["d"] = time.Unix(int64(day)*86400, 0).UTC()
		sec := int64(fl.minDay)*86400 + rng.Int64N(int64(day0)*86400)
		nanos := int64(0)
		switch ts.Unit() {
		case fixtures.Micros:
			nanos = rng.Int64N(1e6) * 1e3
		case fixtures.Nanos:
			nanos = rng.Int64N(1e9)
		}
		r["ts"] = time.Unix(sec, nanos).UTC()
		r["dec"] = fixtures.NewDecimal(rng.Int64N(2e9)-1e9, 3)
		for _, k := range []string{"d", "ts", "dec"} {
			if chance(0.05) {
				r[k] = nil
			}
		}
		r["wonly"] = int64(e)
		r["gonly"] = "g" + strconv.Itoa(e)
		return r
	}
	// change returns got's version of a want row.
	change := func(w row) row {
		g := row{}
		for k, v := range w {
			g[k] = v
		}
		bump := func(k string, f func(v any) any) {
			if chance(0.2) {
				g[k] = f(g[k])
			}
		}
		noise := func(v any) any {
			x, ok := v.(float64)
			switch {
			case !ok || chance(0.1):
				return float()
			case chance(0.5):
				return x * (1 + 1e-12) // within Tol(f, 1e-6, 1e-9)
			case chance(0.5):
				return x + 5e-7 // within the absolute tolerance
			}
			return x + 1e-3
		}
		bump("f", noise)
		bump("f2", noise)
		bump(hostile, noise)
		bump("i", func(v any) any {
			if x, ok := v.(int64); ok && chance(0.7) {
				return x + 1
			}
			return []any{nil, specialInts[pick(len(specialInts))]}[pick(2)]
		})
		n, _ := w["n"].(int64)
		g["n"] = float64(n)
		bump("n", func(v any) any {
			return []any{float64(n) + 0.5, float64(n) * (1 + 1e-13), math.NaN(), nil, math.Inf(1), 9.3e18}[pick(6)]
		})
		bump("s", func(any) any { return text() })
		if fl.bools {
			bump("b", func(any) any { return []any{true, false, nil}[pick(3)] })
		}
		bump("d", func(v any) any {
			if t, ok := v.(time.Time); ok {
				return t.AddDate(0, 0, []int{1, -1, 3}[pick(3)])
			}
			return nil
		})
		bump("ts", func(v any) any {
			if t, ok := v.(time.Time); ok {
				step := []time.Duration{time.Second, -time.Second, 5 * time.Second}[pick(3)]
				if ts.Unit() != fixtures.Seconds && chance(0.5) {
					step = 500 * time.Millisecond
				}
				return t.Add(step)
			}
			return nil
		})
		bump("dec", func(v any) any {
			if d, ok := v.(fixtures.Decimal); ok {
				return fixtures.NewDecimal(d.Unscaled().Int64()+int64(pick(3)-1), 3)
			}
			return fixtures.NewDecimal(0, 3)
		})
		bump("ign", func(any) any { return text() })
		return g
	}
	var wrows, grows []row
	for e := range entities {
		w := base(e)
		inW, inG := !chance(0.08), !chance(0.08)
		if inW {
			wrows = append(wrows, w)
			if chance(0.04) {
				d := change(w)
				d["tag"], d["n"] = w["tag"].(string)+".1", w["n"]
				wrows = append(wrows, d)
			}
		}
		if inG {
			g := change(w)
			grows = append(grows, g)
			if chance(0.04) {
				d := change(w)
				d["tag"] = w["tag"].(string) + ".1"
				grows = append(grows, d)
			}
		}
	}
	rng.Shuffle(len(grows), func(i, j int) { grows[i], grows[j] = grows[j], grows[i] })
	build := func(schema fixtures.Schema, rows []row) *fixtures.Table {
		b := fixtures.NewBuilder(schema)
		for i, r := range rows {
			vals := make([]any, len(schema))
			for j, f := range schema {
				vals[j] = r[f.Name]
			}
			vals[0] = int64(i + 1)
			b.Row(vals...)
		}
		t, err := b.Build()
		if err != nil {
			panic(err)
		}
		return t
	}
	return build(ws, wrows), build(gs, grows)
}

// optionSets are the comparisons the differential test runs.
func optionSets() map[string][]assert.Option {
	std := []assert.Option{assert.ByKey("k1", "k2"), assert.Tol("f", 1e-6, 1e-9), assert.Tol("n", 0, 1e-12),
		assert.TimeTol("ts", time.Second), assert.TimeTol("d", 24*time.Hour), assert.IgnoreColumns("ign"), assert.ListLimit(7)}
	return map[string][]assert.Option{
		"tolerances":       std,
		"nan-is-null-all":  append(append([]assert.Option{}, std...), assert.NaNIsNull(), assert.Tol(assert.AllColumns, 0, 1e-3), assert.ListLimit(-1)),
		"one-key-exact":    {assert.ByKey("k1"), assert.ListLimit(3), assert.AnyColumnOrder(), assert.LooseTypes()},
		"abs-only-limit-0": {assert.ByKey("k2", "k1"), assert.Tol(hostile, 2, 0), assert.Tol("f", 1e-3, 0), assert.ListLimit(0)},
	}
}

// TestSameDiffAsInMemory is the differential test: the same generated
// tables, loaded into each engine, give the same Diff JSON pushed down as
// assert.Compare gives in memory — counts, listed cells and rows and their
// order, largest deltas and where they sit.
//
// Tie-breaking: without a row-number column a relation's rows are numbered
// in the order of the key columns, then every column in the relation's
// order, nulls first, NaN after +Inf, −0 with +0, text byte by byte — the
// order of fixtures.Table.SortBy over the same columns, which the
// reference uses. With one (rn here), rows keep the table's order.
func TestSameDiffAsInMemory(t *testing.T) {
	allEngines(t, func(t *testing.T, e *testEngine) {
		seeds := []uint64{1, 2, 3}
		if testing.Short() {
			seeds = seeds[:1]
		}
		for _, seed := range seeds {
			want, got := genTables(seed, 120, flavourOf(e.Dialect))
			wn, gn := tableName("want"), tableName("got")
			e.load(t, want, wn)
			e.load(t, got, gn)
			for name, opts := range optionSets() {
				t.Run(name+"/seed="+strconv.FormatUint(seed, 10), func(t *testing.T) {
					keys := assert.KeyColumns(opts...)
					// Numbered by key order.
					sortedW, err := want.SortBy(append(keys, want.Names()...)...)
					require.NoError(t, err)
					sortedG, err := got.SortBy(append(keys, got.Names()...)...)
					require.NoError(t, err)
					o := append(append([]assert.Option{}, opts...), assert.IgnoreColumns("rn"))
					requireSameDiff(t, e, pushdown.Table(wn), pushdown.Table(gn), sortedW, sortedG, o)
					// Numbered by a row-number column.
					w2, err := want.Drop("rn")
					require.NoError(t, err)
					g2, err := got.Drop("rn")
					require.NoError(t, err)
					requireSameDiff(t, e, pushdown.Table(wn).NumberedBy("rn"), pushdown.Table(gn).NumberedBy("rn"), w2, g2, opts)
				})
			}
		}
	})
}

func requireSameDiff(t *testing.T, e *testEngine, wr, gr pushdown.Relation, want, got *fixtures.Table, opts []assert.Option) {
	t.Helper()
	mem := assert.Compare(want, got, opts...)
	// Hints that need every row are not computed in the engine (README,
	// Engines).
	mem.Hints = slices.DeleteFunc(mem.Hints, func(h assert.Hint) bool {
		return h.Kind == assert.HintRowOrder || h.Kind == assert.HintNearMatch || h.Kind == assert.HintScale
	})
	mem.Overview = nil // it needs every row, too
	pd, err := e.Compare(ctx(t), wr, gr, opts...)
	require.NoError(t, err)
	mj, err := mem.JSON()
	require.NoError(t, err)
	pj, err := pd.JSON()
	require.NoError(t, err)
	if string(mj) != string(pj) {
		t.Fatalf("the Diff pushed down into %s differs from the one in memory:\n%s", e.name, lineDiff(string(mj), string(pj)))
	}
	require.Equal(t, mem.Text(), pd.Text())
}

// lineDiff shows the lines where two texts differ, with their paths in
// the JSON (the last keys above them), want first.
func lineDiff(a, b string) string {
	al, bl := strings.Split(a, "\n"), strings.Split(b, "\n")
	var out []string
	for i := 0; i < max(len(al), len(bl)) && len(out) < 60; i++ {
		x, y := "", ""
		if i < len(al) {
			x = al[i]
		}
		if i < len(bl) {
			y = bl[i]
		}
		if x != y {
			ctx := ""
			for j := min(i, len(al)) - 1; j >= 0 && j > i-12; j-- {
				if strings.Contains(al[j], "\"name\"") || strings.Contains(al[j], "\"column\"") || strings.Contains(al[j], "\"want\": ") && j == i-1 {
					ctx = strings.TrimSpace(al[j])
					break
				}
			}
			out = append(out, fmt.Sprintf("line %d (%s):\n  in memory: %s\n  pushed:    %s", i+1, ctx, strings.TrimSpace(x), strings.TrimSpace(y)))
		}
	}
	return strings.Join(out, "\n")
}
