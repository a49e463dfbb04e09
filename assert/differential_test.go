package assert

import (
	"encoding/binary"
	"fmt"
	"math"
	"math/rand/v2"
	"os"
	"slices"
	"strings"
	"testing"
	"time"

	"github.com/stretchr/testify/require"

	"github.com/proofsheet/proofsheet/fixtures"
)

// entropy feeds the table generator: from fuzz bytes (zeros once they run
// out) or from a random source.
type entropy struct {
	b   []byte
	rng *rand.Rand
}

// n returns a number in [0, k).
func (e *entropy) n(k int) int {
	if k <= 1 {
		return 0
	}
	if e.rng != nil {
		return e.rng.IntN(k)
	}
	var x uint16
	if len(e.b) >= 2 {
		x = binary.LittleEndian.Uint16(e.b)
		e.b = e.b[2:]
	} else if len(e.b) == 1 {
		x = uint16(e.b[0])
		e.b = e.b[1:]
	}
	return int(x) % k
}

func (e *entropy) one(in int) bool { return e.n(in) == 0 }

// Float values that rules treat specially. Source: IEEE 754-2019 §3.4 (the
// binary64 encodings: subnormals, the largest finite value, infinities,
// signed zero).
var specialFloats = []float64{
	math.NaN(), math.Inf(1), math.Inf(-1), 0, math.Copysign(0, -1),
	5e-324, -5e-324, 2.2250738585072014e-308, 1e-310, -1e-310,
	math.MaxFloat64, -math.MaxFloat64, 1, -1, 1 + 0x1p-52, 0x1p53, 0x1p53 + 2, 1e15, 1e-15,
}

// genKind is a generated column's kind on each side.
type genKind struct {
	want, got fixtures.Type
}

var (
	tsMs     = fixtures.TimestampOf(fixtures.Millis, "")
	tsS      = fixtures.TimestampOf(fixtures.Seconds, "")
	tsNsUTC  = fixtures.TimestampOf(fixtures.Nanos, "UTC")
	tsUsUTC  = fixtures.TimestampOf(fixtures.Micros, "UTC")
	dec12_2  = fixtures.DecimalOf(12, 2)
	dec14_3  = fixtures.DecimalOf(14, 3)
	sameKind = []genKind{
		{fixtures.Bool, fixtures.Bool}, {fixtures.Int64, fixtures.Int64}, {fixtures.Float64, fixtures.Float64},
		{fixtures.Float64, fixtures.Float64}, {fixtures.Float64, fixtures.Float64}, {fixtures.String, fixtures.String},
		{fixtures.Category, fixtures.Category}, {fixtures.Date, fixtures.Date}, {tsMs, tsMs}, {tsNsUTC, tsNsUTC},
		{dec12_2, dec12_2},
	}
	looseKind = []genKind{
		{fixtures.Int64, fixtures.Float64}, {fixtures.Float64, fixtures.Int64}, {fixtures.String, fixtures.Category},
		{fixtures.Category, fixtures.String}, {fixtures.Date, tsMs}, {tsS, fixtures.Date}, {tsS, tsMs}, {tsUsUTC, tsMs},
		{dec12_2, dec14_3},
	}
)

// genValue returns a want value of type t for row i.
func genValue(e *entropy, t fixtures.Type, i int) any {
	base := time.Date(2026, 4, 1, 0, 0, 0, 0, time.UTC)
	switch t.Kind() {
	case fixtures.KindBool:
		return e.one(2)
	case fixtures.KindInt64:
		switch e.n(8) {
		case 0:
			return []int64{math.MaxInt64, math.MinInt64, 1 << 53, 1<<53 + 1, -(1 << 53) - 1, 0}[e.n(6)]
		case 1:
			return int64(e.n(1<<16)) * int64(e.n(1<<16)) * int64(e.n(1<<16))
		}
		return int64(e.n(200) - 100)
	case fixtures.KindFloat64:
		switch e.n(6) {
		case 0:
			return specialFloats[e.n(len(specialFloats))]
		case 1:
			return float64(e.n(1000)) / 8
		}
		return (float64(e.n(1<<16)) - 32768) * math.Pow(2, float64(e.n(40)-20)) / 3
	case fixtures.KindString, fixtures.KindCategory:
		words := []string{"Étang", "étang", "Les Pins", " Les Pins", "Verger", "ok", "", "a|b", "Source\u00a0", "E\u0301tang", "ÉTANG"}
		if t.Kind() == fixtures.KindCategory && e.one(6) {
			return fmt.Sprintf("level-%d", e.n(200)) // wider codes
		}
		return words[e.n(len(words))]
	case fixtures.KindDate:
		return base.AddDate(0, 0, e.n(400)-200)
	case fixtures.KindTimestamp:
		d := time.Duration(e.n(1<<16)) * time.Second * time.Duration(1+e.n(40))
		if t.Unit() != fixtures.Seconds {
			d += time.Duration(e.n(1000)) * time.Millisecond
		}
		if e.one(10) {
			d = time.Duration(e.n(50000)) * 24 * time.Hour // whole days: dates against timestamps
		}
		return base.Add(d)
	case fixtures.KindDecimal:
		return fmt.Sprintf("%d.%02d", e.n(20000)-10000, e.n(100))
	}
	panic("genValue: kind " + t.String())
}

// genGot derives got's value (of type t) from want's value v.
func genGot(e *entropy, t fixtures.Type, v any) any {
	if v == nil {
		if e.one(3) {
			return genValue(e, t, 0)
		}
		return nil
	}
	switch e.n(12) {
	case 0:
		return nil
	case 1:
		return genValue(e, t, 0)
	}
	switch x := v.(type) {
	case float64:
		if t.Kind() == fixtures.KindInt64 {
			if x == math.Trunc(x) && math.Abs(x) < 1<<62 {
				return int64(x) + int64(e.n(3)-1)
			}
			return int64(e.n(100))
		}
		switch e.n(8) {
		case 0:
			return x * (1 + 1e-12)
		case 1:
			return x * (1 + float64(e.n(5)-2)*1e-16)
		case 2:
			y := x
			for range e.n(4) + 1 {
				y = math.Nextafter(y, math.Inf(1-2*e.n(2)))
			}
			return y
		case 3:
			return x + 1e-9*float64(e.n(3)-1)
		case 4:
			return specialFloats[e.n(len(specialFloats))]
		}
		return x
	case int64:
		if t.Kind() == fixtures.KindFloat64 {
			f := float64(x)
			if e.one(3) {
				f *= 1 + 1e-12
			}
			return f
		}
		if e.one(4) {
			return x + int64(e.n(5)-2)
		}
		return x
	case string:
		if t.Kind() == fixtures.KindDecimal {
			if e.one(4) {
				return genValue(e, t, 0)
			}
			if t.Scale() > 2 {
				return x + []string{"", "0", "1"}[e.n(3)]
			}
			return x
		}
		if e.one(4) {
			return []string{strings.ToUpper(x), x + " ", strings.TrimSpace(x), x + "x"}[e.n(4)]
		}
		return x
	case time.Time:
		if t.Kind() == fixtures.KindDate {
			if e.one(4) {
				return x.AddDate(0, 0, e.n(3)-1)
			}
			return x
		}
		if e.one(3) {
			return x.Add(time.Duration(e.n(5)-2) * []time.Duration{time.Millisecond, time.Second, time.Hour}[e.n(3)])
		}
		return x
	}
	return v
}

// genCase builds two tables and options from the entropy.
func genCase(e *entropy, rows int) (want, got *fixtures.Table, opts []Option) {
	ncol := 1 + e.n(6)
	var ws, gs fixtures.Schema
	kinds := make([]genKind, ncol)
	loose := e.one(3)
	for j := range kinds {
		k := sameKind[e.n(len(sameKind))]
		if loose && e.one(3) {
			k = looseKind[e.n(len(looseKind))]
		}
		kinds[j] = k
		ws = append(ws, fixtures.Col(fmt.Sprintf("c%d", j), k.want))
		gs = append(gs, fixtures.Col(fmt.Sprintf("c%d", j), k.got))
	}
	// A key column: an int64 or string id, unique or repeated.
	keyed := e.n(3)
	idKind := []fixtures.Type{fixtures.Int64, fixtures.String, fixtures.Date}[e.n(3)]
	if keyed == 0 {
		ws = append(ws, fixtures.Col("id", idKind))
		gs = append(gs, fixtures.Col("id", idKind))
	}
	off := e.n(70)
	n := rows + off
	wb, gb := fixtures.NewBuilder(ws), fixtures.NewBuilder(gs)
	spread := 1 + e.n(3)*e.n(1000)
	repeat := 1 + e.n(2)*e.n(4)
	nullRate := []int{0, 0, 3, 20}[e.n(4)]
	ids := make([]int, n)
	for i := range ids {
		ids[i] = (i / repeat) * spread
	}
	gotIDs := append([]int(nil), ids...)
	if keyed == 0 && e.one(2) {
		for i := len(gotIDs) - 1; i > 0; i-- { // shuffled
			j := e.n(i + 1)
			gotIDs[i], gotIDs[j] = gotIDs[j], gotIDs[i]
		}
	}
	idValue := func(id int) any {
		switch idKind.Kind() {
		case fixtures.KindString:
			return fmt.Sprintf("h%05d", id)
		case fixtures.KindDate:
			return time.Date(2000, 1, 1, 0, 0, 0, 0, time.UTC).AddDate(0, 0, id%20000)
		}
		return id
	}
	wantRows := make([][]any, n)
	for i := range n {
		row := make([]any, 0, len(ws))
		for j := range kinds {
			var v any
			if nullRate == 0 || !e.one(nullRate) {
				v = genValue(e, kinds[j].want, i)
			}
			row = append(row, v)
		}
		if keyed == 0 {
			row = append(row, idValue(ids[i]))
		}
		wantRows[i] = row
	}
	// got row i is want row perm(i) with its cells perturbed.
	byID := map[int][]int{}
	for i, id := range ids {
		byID[id] = append(byID[id], i)
	}
	for i := range n {
		src := i
		if keyed == 0 {
			rs := byID[gotIDs[i]]
			src, byID[gotIDs[i]] = rs[0], rs[1:]
		}
		row := make([]any, 0, len(gs))
		for j := range kinds {
			v := wantRows[src][j]
			v = toKind(v, kinds[j].got)
			if e.n(4) != 0 {
				v = toKind(genGot(e, kinds[j].got, v), kinds[j].got)
			}
			row = append(row, v)
		}
		if keyed == 0 {
			id := gotIDs[i]
			if e.one(30) {
				id += 7 // a key want lacks
			}
			row = append(row, idValue(id))
		}
		gb.Row(row...)
	}
	for _, r := range wantRows {
		wb.Row(r...)
	}
	wt, err := wb.Build()
	if err != nil {
		panic(err)
	}
	gt, err := gb.Build()
	if err != nil {
		panic(err)
	}
	gOff := off
	if e.one(4) {
		gOff = e.n(off + 1)
	}
	want, got = wt.Slice(off, n), gt.Slice(gOff, gOff+max(rows-e.n(3), 0))
	if e.one(5) {
		want = wt.Slice(off, max(n-e.n(4), off))
	}

	if loose {
		opts = append(opts, LooseTypes())
	}
	switch keyed {
	case 0:
		opts = append(opts, ByKey("id"))
	case 1:
		if e.one(3) {
			opts = append(opts, AnyRowOrder())
		}
	}
	switch e.n(5) {
	case 0:
		abs := []float64{0, 1e-12, 1e-9, 0.5, 1e300, 5e-324}[e.n(6)]
		rel := []float64{0, 1e-15, 1e-9, 0.01, 1}[e.n(5)]
		opts = append(opts, Tol(AllColumns, abs, rel))
	case 1:
		opts = append(opts, ULPs(AllColumns, uint(e.n(6))))
	case 2:
		opts = append(opts, Tol("c0", 1e-9, 0), ULPs("c1", 2))
	}
	if e.one(3) {
		opts = append(opts, TimeTol(AllColumns, []time.Duration{0, time.Millisecond, 1500 * time.Millisecond, time.Hour, 36 * time.Hour}[e.n(5)]))
	}
	if e.one(3) {
		opts = append(opts, NormText(AllColumns, TextNorm(1+e.n(7))))
	}
	if e.one(4) {
		opts = append(opts, NaNIsNull())
	}
	if e.one(6) {
		opts = append(opts, IgnoreColumns("c1"))
	}
	opts = append(opts, ListLimit([]int{-1, -1, 0, 3, DefaultListLimit}[e.n(5)]))
	if e.one(2) {
		opts = append(opts, holdUpTo(0))
	}
	return want, got, opts
}

// toKind converts a want value to a value got's type accepts, by value.
func toKind(v any, t fixtures.Type) any {
	switch x := v.(type) {
	case int:
		if t.Kind() == fixtures.KindFloat64 {
			return float64(x)
		}
	case int64:
		if t.Kind() == fixtures.KindFloat64 {
			return float64(x)
		}
	case float64:
		if t.Kind() == fixtures.KindInt64 {
			if x == math.Trunc(x) && math.Abs(x) < 1<<62 {
				return int64(x)
			}
			return int64(7)
		}
	case string:
		if t.Kind() == fixtures.KindDecimal {
			return x
		}
	case time.Time:
		if t.Kind() == fixtures.KindTimestamp && t.Unit() == fixtures.Seconds {
			return x.Truncate(time.Second)
		}
	}
	return v
}

// checkAgainstReference compares with Compare and with the reference and
// requires the same answers.
func checkAgainstReference(t *testing.T, want, got *fixtures.Table, opts []Option, what string) {
	t.Helper()
	d := Compare(want, got, opts...)
	if len(d.Problems) > 0 {
		return
	}
	ref, ok := reference(want, got, opts...)
	if !ok {
		return
	}
	s := summarize(d)
	require.Equal(t, ref.Counts, s.Counts, what)
	require.Equal(t, ref.Columns, s.Columns, what)
	require.Equal(t, ref.Cells, s.Cells, what)
	require.Equal(t, ref.Missing, s.Missing, what)
	require.Equal(t, ref.Extra, s.Extra, what)
	require.Equal(t, ref.Dups, s.Dups, what)
}

// TestCompareAgreesWithReference is the differential test of every fast
// path against the reference: random tables of every kind with nulls,
// special floats and noise, under random options, by position, by key and
// as multisets, at sizes around the kernels' block and word boundaries.
func TestCompareAgreesWithReference(t *testing.T) {
	rng := rand.New(rand.NewPCG(12, 34))
	sizes := []int{0, 1, 2, 63, 64, 65, 127, 200, 511, 512, 513, 1000}
	rounds := 25
	switch {
	case testing.Short():
		rounds = 8
	case os.Getenv("PROOFSHEET_LONG_TESTS") != "":
		rounds = 400
	}
	for round := range rounds {
		for _, n := range sizes {
			seed := rng.Uint64()
			e := &entropy{rng: rand.New(rand.NewPCG(seed, 1))}
			want, got, opts := genCase(e, n)
			checkAgainstReference(t, want, got, opts, fmt.Sprintf("round %d, %d rows, seed %d", round, n, seed))
		}
	}
}

// TestCompareAgreesWithReferenceInParallel runs tables large enough for
// the columns to be compared in several tasks on several goroutines.
func TestCompareAgreesWithReferenceInParallel(t *testing.T) {
	if testing.Short() {
		t.Skip("large tables")
	}
	rounds := 1
	if os.Getenv("PROOFSHEET_LONG_TESTS") != "" {
		rounds = 6
	}
	rng := rand.New(rand.NewPCG(56, 78))
	for round := range rounds {
		seed := rng.Uint64()
		e := &entropy{rng: rand.New(rand.NewPCG(seed, 1))}
		want, got, opts := genCase(e, taskSlots+taskSlots/3)
		if round%2 == 0 {
			opts = append(opts, sweepFrom(0)) // keyed columns swept, too
		}
		checkAgainstReference(t, want, got, opts, fmt.Sprintf("round %d, seed %d", round, seed))
	}
}

// FuzzCompareAgreesWithReference feeds Compare and the reference tables
// built from the fuzz input and requires the same answers.
//
//	go test ./assert -run '^$' -fuzz FuzzCompareAgreesWithReference -fuzztime 5m
func FuzzCompareAgreesWithReference(f *testing.F) {
	f.Add([]byte{})
	f.Add([]byte("\x05\x00\x03\x00\x01\x00proofsheet greenhouse noise"))
	rng := rand.New(rand.NewPCG(9, 9))
	for range 8 {
		b := make([]byte, 256)
		for i := range b {
			b[i] = byte(rng.IntN(256))
		}
		f.Add(b)
	}
	f.Fuzz(func(t *testing.T, data []byte) {
		e := &entropy{b: data}
		rows := e.n(300)
		want, got, opts := genCase(e, rows)
		checkAgainstReference(t, want, got, opts, fmt.Sprintf("%d rows", rows))
	})
}

// TestSweptKeyedColumnsAgree compares a keyed comparison of shuffled
// tables of several ranges with its columns swept (the way of tables of
// millions of rows) and read range by range: the Diffs must be the same.
func TestSweptKeyedColumnsAgree(t *testing.T) {
	if testing.Short() {
		t.Skip("large tables")
	}
	n := 2*taskSlots + 1000
	w := noiseWant(n, 1_000_003, 1<<40, 0.05, 51)
	perm := rand.New(rand.NewPCG(52, 53)).Perm(n)
	g := w.noisy(0.01, perm, 54)
	g.ids[7] += 3 // a row each side lacks
	want, got := w.table(), g.table()
	for _, opts := range [][]Option{{Tol(AllColumns, 1e-9, 0)}, {ULPs("tmin", 2)}, nil} {
		opts = append(opts, ByKey("id"), ListLimit(200))
		read := Compare(want, got, opts...)
		swept := Compare(want, got, append(opts, sweepFrom(0))...)
		require.Equal(t, summarize(read), summarize(swept))
		require.Positive(t, read.CellsDiffering)
	}
}

// TestRepeatedKeysAgreeWithReference holds the grouping of repeated keys
// (chains built during the hash join, on several goroutines and in many
// partitions) to the reference: keys repeated 1, 3, 10 and 1000 times,
// got holding the groups shuffled, some rows dropped and some added, got
// repeating keys want lacks; by key and as a multiset. 10 rows per key
// unless PROOFSHEET_LONG_TESTS is set.
func TestRepeatedKeysAgreeWithReference(t *testing.T) {
	if testing.Short() {
		t.Skip("large tables")
	}
	n := parallelCells + 5000 // the join runs on every processor
	pers := []int{10}
	if os.Getenv("PROOFSHEET_LONG_TESTS") != "" {
		pers = []int{1, 3, 10, 1000}
	}
	for _, per := range pers {
		rng := rand.New(rand.NewPCG(uint64(per), 61))
		w := noiseWant(n, 1, 0, 0.02, uint64(per))
		for i := range w.ids {
			w.ids[i] = int64(i/per)*1_000_003 + 1<<40 // spread: the hash join
		}
		groups := rng.Perm((n + per - 1) / per)
		var perm []int
		for _, gr := range groups {
			for i := gr * per; i < min((gr+1)*per, n); i++ {
				if rng.IntN(50) != 0 { // about 2 % of want's rows missing
					perm = append(perm, i)
				}
			}
		}
		g := w.noisy(0.01, perm, uint64(per)+1)
		for range 300 { // rows want lacks, some of them repeated
			id := int64(rng.IntN(n))*1_000_003 + 1<<41
			for range 1 + rng.IntN(3) {
				at := rng.IntN(len(g.ids) + 1)
				g.ids = slices.Insert(g.ids, at, id)
				g.valid = slices.Insert(g.valid, at, true)
				for j := range g.floats {
					g.floats[j] = slices.Insert(g.floats[j], at, float64(id%97))
				}
			}
		}
		want, got := w.table(), g.table()
		d := Compare(want, got, ByKey("id"))
		require.Equal(t, per > 1, d.Duplicates.WantKeys > 0, "want's repeated keys")
		require.Positive(t, d.Duplicates.GotKeys, "got's repeated keys")
		for _, opts := range [][]Option{
			{ByKey("id"), Tol(AllColumns, 1e-9, 0), ListLimit(50)},
			{ByKey("id"), ListLimit(-1)},
			{AnyRowOrder(), ListLimit(100)},
		} {
			checkAgainstReference(t, want, got, opts, fmt.Sprintf("%d rows per key, options %d", per, len(opts)))
		}
	}
}
