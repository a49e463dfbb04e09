package pushdown

import (
	"fmt"
	"slices"
	"strings"
	"time"

	"github.com/proofsheet/proofsheet/assert"
	"github.com/proofsheet/proofsheet/fixtures"
)

// side is one relation after its columns were read from the engine.
type side struct {
	rel    Relation
	from   string
	names  []string  // its columns, RowNumber left out
	types  []colType // their types and canonical read expressions
	rownum string    // the quoted RowNumber column, "" for none
}

func (s *side) index(name string) int { return slices.Index(s.names, name) }

func (s *side) schema() fixtures.Schema {
	out := make(fixtures.Schema, len(s.names))
	for i, n := range s.names {
		out[i] = fixtures.Col(n, s.types[i].t)
	}
	return out
}

// class is how the cells of a compared column pair are compared, as in
// assert.Compare.
type class uint8

const (
	classNone     class = iota // not compared
	classBool                  // bool with bool
	classInt                   // int64 with int64
	classFloat                 // float64 with float64
	classIntFloat              // int64 with float64, by value
	classDecimal               // decimal with decimal, by value
	classText                  // text with text
	classDate                  // date with date
	classTime                  // timestamp with timestamp, as instants
	classDateTime              // date with timestamp: midnight
)

// column is one compared column.
type column struct {
	name      string
	wi, gi    int // its index on each side
	wt, gt    fixtures.Type
	class     class
	key       bool // a key column: never differs within a pair
	intOnWant bool // classIntFloat: the int64 is want's; classDateTime: the date is want's
	rule      assert.FloatRule
	tt        time.Duration
	hasTT     bool
	nanNull   bool
}

// tolerant reports whether equal cells can have a non-zero distance.
func (c *column) tolerant() bool {
	switch c.class {
	case classFloat, classIntFloat:
		return c.rule.ByTol || c.rule.ByULPs
	case classDate, classTime, classDateTime:
		return c.hasTT
	}
	return false
}

// hasDelta reports whether the column's cells have distances.
func (c *column) hasDelta() bool {
	switch c.class {
	case classInt, classFloat, classIntFloat, classDecimal, classDate, classTime, classDateTime:
		return true
	}
	return false
}

// keyable reports whether the column can be a key (as assert decides).
func (c *column) keyable() bool {
	switch c.class {
	case classBool, classInt, classDecimal, classText, classDate, classTime:
		return !c.hasTT
	}
	return false
}

func classOf(wk, gk fixtures.Kind) (class, bool) {
	switch {
	case wk == gk:
		switch wk {
		case fixtures.KindBool:
			return classBool, false
		case fixtures.KindInt64:
			return classInt, false
		case fixtures.KindFloat64:
			return classFloat, false
		case fixtures.KindDecimal:
			return classDecimal, false
		case fixtures.KindString, fixtures.KindCategory:
			return classText, false
		case fixtures.KindDate:
			return classDate, false
		case fixtures.KindTimestamp:
			return classTime, false
		}
	case wk.IsText() && gk.IsText():
		return classText, false
	case wk == fixtures.KindInt64 && gk == fixtures.KindFloat64, wk == fixtures.KindFloat64 && gk == fixtures.KindInt64:
		return classIntFloat, wk == fixtures.KindInt64
	case wk == fixtures.KindDate && gk == fixtures.KindTimestamp, wk == fixtures.KindTimestamp && gk == fixtures.KindDate:
		return classDateTime, wk == fixtures.KindDate
	}
	return classNone, false
}

// plan is a comparison ready to be written as SQL.
type plan struct {
	d          sqlDialect
	want, got  *side
	set        assert.Settings
	keyed      bool
	cols       []*column // the compared columns, in want's order (the Diff's Compared)
	keys       []*column // the key columns, in key order
	pairable   bool      // rows can be paired (keys usable)
	ordW, ordG bool      // the side repeats keys: rows pair by key and ordinal
}

// refusal is an option that cannot be carried out in SQL.
type refusal struct{ what string }

func (r refusal) Error() string { return "pushdown: " + r.what }

// newPlan checks the options against what SQL can do and classifies the
// compared columns (named in the order Compare reported them).
func newPlan(d sqlDialect, want, got *side, set assert.Settings, compared []string) (*plan, error) {
	p := &plan{d: d, want: want, got: got, set: set}
	switch set.Match {
	case assert.MatchAsMultiset:
		return nil, refusal{"AnyRowOrder cannot be pushed down: pairing rows as a multiset under tolerances needs a matching that SQL cannot express; give the key columns (ByKey) instead"}
	case assert.MatchByKey:
		p.keyed = true
	default:
		if want.rownum == "" || got.rownum == "" {
			return nil, refusal{"the rows of a SQL relation have no order, so they cannot pair by position: give the key columns (ByKey), or a row-number column on both sides (Relation.RowNumber)"}
		}
	}
	var ulps, norms []string
	for col, r := range set.Tols {
		if r.ByULPs {
			ulps = append(ulps, col)
		}
	}
	for col := range set.Norms {
		norms = append(norms, col)
	}
	slices.Sort(ulps)
	slices.Sort(norms)
	if len(ulps) > 0 {
		return nil, refusal{fmt.Sprintf("ULPs (column %s) cannot be pushed down: SQL engines do not expose a float's bits alike; use Tol with an absolute or relative tolerance", quoteList(ulps))}
	}
	if len(norms) > 0 {
		return nil, refusal{fmt.Sprintf("NormText (column %s) cannot be pushed down: SQL engines do not implement Unicode NFC, White_Space trimming and full case folding alike; normalise the text in the query (sql:…) or compare in memory", quoteList(norms))}
	}
	for _, name := range compared {
		wi, gi := want.index(name), got.index(name)
		c := &column{name: name, wi: wi, gi: gi, wt: want.types[wi].t, gt: got.types[gi].t}
		c.class, c.intOnWant = classOf(c.wt.Kind(), c.gt.Kind())
		switch c.class {
		case classFloat, classIntFloat:
			c.rule = set.FloatRuleFor(name)
			c.nanNull = set.NaNIsNull
		case classDate, classTime, classDateTime:
			c.tt, c.hasTT = set.TimeTolFor(name)
		}
		if c.class == classDateTime {
			ts := c.gt
			if !c.intOnWant {
				ts = c.wt
			}
			if z := ts.Zone(); z != "" && z != "UTC" {
				return nil, refusal{fmt.Sprintf("column %q compares a date with a timestamp in zone %s: midnight in that zone cannot be computed alike in every engine; convert the timestamp to UTC or the date to a timestamp in the query", name, z)}
			}
		}
		p.cols = append(p.cols, c)
	}
	p.pairable = true
	if p.keyed {
		ignored := map[string]bool{}
		for _, n := range set.Ignore {
			ignored[n] = true
		}
		for _, k := range set.Keys {
			i := slices.IndexFunc(p.cols, func(c *column) bool { return c.name == k })
			wi, gi := want.index(k), got.index(k)
			switch {
			case wi < 0 || gi < 0 || ignored[k] || i < 0:
				p.pairable = false
				continue
			}
			if want.types[wi].t.Kind() == fixtures.KindFloat64 || got.types[gi].t.Kind() == fixtures.KindFloat64 || !p.cols[i].keyable() {
				p.pairable = false
				continue
			}
			p.cols[i].key = true
			p.keys = append(p.keys, p.cols[i])
		}
	}
	return p, nil
}

func quoteList(names []string) string {
	q := make([]string, len(names))
	for i, n := range names {
		q[i] = fmt.Sprintf("%q", n)
	}
	return strings.Join(q, ", ")
}
