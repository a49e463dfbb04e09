package assert

import (
	"math"
	"math/big"
	"strings"
	"time"
	"unicode"

	"golang.org/x/text/cases"
	"golang.org/x/text/unicode/norm"

	"github.com/proofsheet/proofsheet/fixtures"
)

// class is how the cells of a pair of columns are compared.
type class uint8

const (
	classNone     class = iota // kinds too far apart: cells not compared
	classBool                  // bool with bool
	classInt                   // int64 with int64
	classFloat                 // float64 with float64
	classIntFloat              // int64 with float64, by value
	classDecimal               // decimal with decimal, by value
	classText                  // string or category with string or category
	classDate                  // date with date
	classTime                  // timestamp with timestamp, as instants
	classDateTime              // date with timestamp: midnight of the day
)

// colCmp compares one column of want with the same-named column of got.
type colCmp struct {
	name   string
	wc, gc *fixtures.Column
	class  class
	rule   floatRule     // float classes
	tt     time.Duration // time classes, when hasTT
	hasTT  bool
	// ttUnits is tt in whole units of a date or same-unit timestamp
	// column: |Δ| ≤ tt exactly when the difference in units is ≤ ttUnits.
	ttUnits uint64
	norm    TextNorm // text class
	nanNul  bool     // NaN equals null (float classes)
	// intOnWant says which side holds the int64 in classIntFloat, and the
	// date in classDateTime.
	intOnWant bool
	// skip leaves the column out of the cell comparison: a key column,
	// whose cells are equal in every pair by construction.
	skip bool
}

func newColCmp(cfg *config, wc, gc *fixtures.Column) *colCmp {
	cc := &colCmp{name: wc.Name(), wc: wc, gc: gc}
	wk, gk := wc.Kind(), gc.Kind()
	switch {
	case wk == gk:
		switch wk {
		case fixtures.KindBool:
			cc.class = classBool
		case fixtures.KindInt64:
			cc.class = classInt
		case fixtures.KindFloat64:
			cc.class = classFloat
		case fixtures.KindDecimal:
			cc.class = classDecimal
		case fixtures.KindString, fixtures.KindCategory:
			cc.class = classText
		case fixtures.KindDate:
			cc.class = classDate
		case fixtures.KindTimestamp:
			cc.class = classTime
		case fixtures.KindTime, fixtures.KindDuration:
			// Ticks of one unit compare exactly as integers; other units
			// are a type change and their cells are not compared.
			if wc.Type() == gc.Type() {
				cc.class = classInt
			}
		}
	case wk.IsText() && gk.IsText():
		cc.class = classText
	case wk == fixtures.KindInt64 && gk == fixtures.KindFloat64, wk == fixtures.KindFloat64 && gk == fixtures.KindInt64:
		cc.class, cc.intOnWant = classIntFloat, wk == fixtures.KindInt64
	case wk == fixtures.KindDate && gk == fixtures.KindTimestamp, wk == fixtures.KindTimestamp && gk == fixtures.KindDate:
		cc.class, cc.intOnWant = classDateTime, wk == fixtures.KindDate
	}
	switch cc.class {
	case classFloat, classIntFloat:
		cc.rule = cfg.floatRuleFor(cc.name)
		cc.nanNul = cfg.nanIsNull
	case classDate, classTime, classDateTime:
		cc.tt, cc.hasTT = cfg.timeTolFor(cc.name)
		if cc.hasTT && (cc.class == classDate || cc.sameUnit()) {
			cc.ttUnits = uint64(cc.tt) / uint64(unitNanos(wc))
		}
	case classText:
		cc.norm = cfg.normFor(cc.name)
	}
	return cc
}

// typeOK reports whether the column's types count as the same.
func (cc *colCmp) typeOK(loose bool) bool {
	if cc.wc.Type() == cc.gc.Type() {
		return true
	}
	if !loose {
		return false
	}
	switch cc.class {
	case classIntFloat, classText, classDateTime, classTime, classDecimal:
		return true
	}
	return false
}

// keyable reports whether the column can serve as a key: exact comparison
// with a hash that agrees with it.
func (cc *colCmp) keyable() bool {
	switch cc.class {
	case classBool, classInt, classDecimal, classText, classDate, classTime:
		return !cc.hasTT
	}
	return false
}

// tolerant reports whether equal cells can still have a non-zero distance.
func (cc *colCmp) tolerant() bool {
	switch cc.class {
	case classFloat, classIntFloat:
		return cc.rule.hasTol || cc.rule.hasULP
	case classDate, classTime, classDateTime:
		return cc.hasTT
	}
	return false
}

// hasDelta reports whether the column's cells have distances.
func (cc *colCmp) hasDelta() bool {
	switch cc.class {
	case classInt, classFloat, classIntFloat, classDecimal, classDate, classTime, classDateTime:
		return true
	}
	return false
}

// ruleText describes how cells are compared, for the summaries.
func (cc *colCmp) ruleText() string {
	var s string
	switch cc.class {
	case classFloat, classIntFloat:
		switch r := cc.rule; {
		case r.hasULP:
			s = "at most " + formatUint(r.ulps) + " ULPs apart"
		case r.hasTol && r.rel == 0:
			s = "abs. diff ≤ " + fixtures.FormatFloat(r.abs)
		case r.hasTol && r.abs == 0:
			s = "rel. diff ≤ " + fixtures.FormatFloat(r.rel)
		case r.hasTol:
			s = "abs. diff ≤ " + fixtures.FormatFloat(r.abs) + " or rel. diff ≤ " + fixtures.FormatFloat(r.rel)
		default:
			s = "exact"
		}
		if cc.class == classIntFloat {
			s = "int64 vs float64 by value, " + s
		}
		if cc.nanNul {
			s += ", NaN = null"
		}
	case classDecimal:
		s = "exact, by value (1.5 = 1.50)"
	case classText:
		s = "exact"
		if cc.norm != 0 {
			s = "exact after " + cc.norm.String()
		}
		if cc.wc.Kind() != cc.gc.Kind() {
			s = "category vs string by text, " + s
		}
	case classDate, classTime, classDateTime:
		s = "exact"
		if cc.hasTT {
			s = "within " + cc.tt.String()
		}
		if cc.class == classDateTime {
			s = "date as midnight timestamp, " + s
		}
	default:
		s = "exact"
	}
	return s
}

func formatUint(u uint64) string {
	return big.NewInt(0).SetUint64(u).String()
}

// isNull reports whether a cell counts as null: a null, or a NaN when NaN
// equals null.
func (cc *colCmp) isNull(col *fixtures.Column, i int) bool {
	if col.IsNull(i) {
		return true
	}
	return cc.nanNul && col.Kind() == fixtures.KindFloat64 && math.IsNaN(col.Float64(i))
}

// eq reports whether cell wi of want equals cell gi of got.
func (cc *colCmp) eq(wi, gi int) bool {
	wn, gn := cc.isNull(cc.wc, wi), cc.isNull(cc.gc, gi)
	if wn || gn {
		return wn && gn
	}
	w, g := cc.wc, cc.gc
	switch cc.class {
	case classBool:
		return w.Bool(wi) == g.Bool(gi)
	case classInt:
		return w.Int64(wi) == g.Int64(gi)
	case classFloat:
		return floatEqual(w.Float64(wi), g.Float64(gi), cc.rule)
	case classIntFloat:
		iv, fv := cc.intFloat(wi, gi)
		if fv == math.Trunc(fv) && fv >= -(1<<63) && fv < 1<<63 && int64(fv) == iv {
			return true // the same value exactly
		}
		if math.IsNaN(fv) || !(cc.rule.hasTol || cc.rule.hasULP) {
			return false // exact by value; float64(iv) may round to fv
		}
		if cc.intOnWant {
			return floatEqual(float64(iv), fv, cc.rule)
		}
		return floatEqual(fv, float64(iv), cc.rule)
	case classDecimal:
		return w.Decimal(wi).Cmp(g.Decimal(gi)) == 0
	case classText:
		a, b := w.Str(wi), g.Str(gi)
		return a == b || (cc.norm != 0 && normalize(a, cc.norm) == normalize(b, cc.norm))
	case classDate:
		a, b := w.Days(wi), g.Days(gi)
		return a == b || (cc.hasTT && absDiff(int64(a), int64(b)) <= cc.ttUnits)
	case classTime:
		if cc.sameUnit() {
			a, b := w.Ticks(wi), g.Ticks(gi)
			return a == b || (cc.hasTT && absDiff(a, b) <= cc.ttUnits)
		}
		return cc.timesEqual(w.Time(wi), g.Time(gi))
	case classDateTime:
		return cc.timesEqual(cc.dateTime(wi, gi))
	}
	return false
}

// sameUnit reports whether the timestamps of a classTime pair count in
// the same unit, so that their ticks compare directly.
func (cc *colCmp) sameUnit() bool { return cc.wc.Type().Unit() == cc.gc.Type().Unit() }

// timesEqual compares two instants: the same, or within TimeTol exactly.
func (cc *colCmp) timesEqual(a, b time.Time) bool {
	if a.Equal(b) {
		return true
	}
	return cc.hasTT && instantDiff(a, b).Cmp(big.NewInt(int64(cc.tt))) <= 0
}

// absDiff returns |a − b| exactly, as a uint64.
func absDiff(a, b int64) uint64 {
	if a >= b {
		return uint64(a) - uint64(b)
	}
	return uint64(b) - uint64(a)
}

// instantDiff returns |a − b| in nanoseconds, exactly.
func instantDiff(a, b time.Time) *big.Int {
	s := new(big.Int).Sub(big.NewInt(a.Unix()), big.NewInt(b.Unix()))
	s.Mul(s, big.NewInt(1e9))
	s.Add(s, big.NewInt(int64(a.Nanosecond()-b.Nanosecond())))
	return s.Abs(s)
}

// unitNanos is how many nanoseconds a unit of a date or timestamp column
// is: a day, or the timestamp's unit.
func unitNanos(col *fixtures.Column) int64 {
	if col.Kind() == fixtures.KindDate {
		return 86400e9
	}
	return int64(col.Type().Unit().Duration())
}

// timeDelta is the distance of two times in seconds: |a − b| counted in
// the finer unit of the two columns, as a float64, divided by that unit's
// count per second (a day counts as 86400 s).
func (cc *colCmp) timeDelta(a, b time.Time) Delta {
	u := min(unitNanos(cc.wc), unitNanos(cc.gc))
	units, _ := new(big.Float).SetInt(new(big.Int).Quo(instantDiff(a, b), big.NewInt(u))).Float64()
	if u == 86400e9 {
		return Delta{Has: true, Abs: units * 86400}
	}
	return Delta{Has: true, Abs: units / float64(1e9/u)}
}

// intFloat returns the int64 and float64 cells of a classIntFloat pair.
func (cc *colCmp) intFloat(wi, gi int) (int64, float64) {
	if cc.intOnWant {
		return cc.wc.Int64(wi), cc.gc.Float64(gi)
	}
	return cc.gc.Int64(gi), cc.wc.Float64(wi)
}

// dateTime returns the want and got cells of a classDateTime pair as
// instants, the date as midnight in the timestamp's zone.
func (cc *colCmp) dateTime(wi, gi int) (time.Time, time.Time) {
	if cc.intOnWant {
		ts := cc.gc.Time(gi)
		return midnight(cc.wc.Date(wi), ts.Location()), ts
	}
	ts := cc.wc.Time(wi)
	return ts, midnight(cc.gc.Date(gi), ts.Location())
}

func midnight(day time.Time, loc *time.Location) time.Time {
	return time.Date(day.Year(), day.Month(), day.Day(), 0, 0, 0, 0, loc)
}

// delta returns the distance of cell wi of want and cell gi of got.
func (cc *colCmp) delta(wi, gi int) Delta {
	if cc.isNull(cc.wc, wi) || cc.isNull(cc.gc, gi) {
		return Delta{}
	}
	w, g := cc.wc, cc.gc
	switch cc.class {
	case classInt:
		a, b := w.Int64(wi), g.Int64(gi)
		var u uint64
		if a >= b {
			u = uint64(a) - uint64(b)
		} else {
			u = uint64(b) - uint64(a)
		}
		abs := float64(u)
		if abs == 0 {
			return Delta{Has: true}
		}
		return Delta{Has: true, Abs: abs, Rel: abs / math.Max(math.Abs(float64(a)), math.Abs(float64(b)))}
	case classFloat:
		a, b := w.Float64(wi), g.Float64(gi)
		return cc.withULPs(floatDelta(a, b), a, b)
	case classIntFloat:
		iv, fv := cc.intFloat(wi, gi)
		return cc.withULPs(floatDelta(float64(iv), fv), float64(iv), fv)
	case classDecimal:
		a, b := w.Decimal(wi), g.Decimal(gi)
		diff := new(big.Rat).Sub(a.Rat(), b.Rat())
		abs, _ := diff.Abs(diff).Float64()
		if abs == 0 {
			return Delta{Has: true}
		}
		return Delta{Has: true, Abs: abs, Rel: abs / math.Max(math.Abs(a.Float64()), math.Abs(b.Float64()))}
	case classDate:
		return Delta{Has: true, Abs: float64(absDiff(int64(w.Days(wi)), int64(g.Days(gi)))) * 86400}
	case classTime:
		if cc.sameUnit() {
			return Delta{Has: true, Abs: float64(absDiff(w.Ticks(wi), g.Ticks(gi))) / float64(1e9/unitNanos(w))}
		}
		return cc.timeDelta(w.Time(wi), g.Time(gi))
	case classDateTime:
		return cc.timeDelta(cc.dateTime(wi, gi))
	}
	return Delta{}
}

func (cc *colCmp) withULPs(d Delta, a, b float64) Delta {
	if cc.rule.hasULP && d.Has && !math.IsNaN(a) && !math.IsNaN(b) {
		d.ULPs, d.HasULPs = ulpDistance(a, b), true
	}
	return d
}

// folder is Unicode full case folding; a Fold Caser is stateless and safe
// for concurrent use, so one serves every comparison.
var folder = cases.Fold()

// normalize applies the text normalisations of how to s: NFC, then
// trimming of Unicode white space, then case folding (followed by NFC again,
// since folding can undo composition).
func normalize(s string, how TextNorm) string {
	if how&NFC != 0 {
		s = norm.NFC.String(s)
	}
	if how&TrimSpace != 0 {
		s = strings.TrimFunc(s, unicode.IsSpace)
	}
	if how&FoldCase != 0 {
		s = folder.String(s)
		if how&NFC != 0 {
			s = norm.NFC.String(s)
		}
	}
	return s
}
