package golden

import (
	"errors"
	"fmt"
	"slices"
	"strings"

	"github.com/proofsheet/proofsheet/assert"
	"github.com/proofsheet/proofsheet/fixtures"
)

// Table checks got against the golden table file of name in testdata/
// (testdata/<name>.gold.tbl). See Store.Table.
func Table(t T, name string, got *fixtures.Table, opts ...assert.Option) bool {
	t.Helper()
	return Store{}.Table(t, name, got, opts...)
}

// Table checks got against the golden table file of name under the
// store's directory (<name>.gold.tbl, in the format EncodeTableRules
// writes). The stored table is want: the two are compared with
// assert.Compare — the same options as assert.Tables, so keys, tolerances
// and the other rules apply — and when they differ the test fails with the
// Diff's text. A missing file fails and prints the command that creates
// it.
//
// The file stores the comparison rules it was written with (keys,
// tolerances, ignored columns, row matching; see assert.Rules). Called
// with no rules in opts (ListLimit is not a rule), the check compares
// under the stored rules. Rules in opts go on top of the stored ones, rule
// by rule (see MergeRules): when that changes the rules, the check says so
// in its log (and in its failure), and an update stores the new rules.
//
// In update mode (-update or PROOFSHEET_UPDATE=1; refused under CI) a
// missing or differing file is written from got and the check passes. A
// file that is equal under the rules, with the same rules stored, is left
// untouched, so values within tolerance cause no churn. Rows are stored
// sorted by the key columns when the rules match rows by key, otherwise in
// got's order. The result reports whether the check passed.
func (s Store) Table(t T, name string, got *fixtures.Table, opts ...assert.Option) bool {
	t.Helper()
	given := assert.RulesOf(opts...)
	used := given // the rules compared under and stored on update
	return s.run(t, name, KindTable, course{
		prepare: func() error {
			if got == nil {
				return errors.New("got is a nil table")
			}
			return nil
		},
		compare: func(file string, stored []byte) result {
			want, info, err := DecodeTable(file, stored)
			if err != nil {
				return result{bad: err}
			}
			var r result
			used, r.note, r.rewrite = chooseRules(info, given)
			d := assert.Compare(want, got, append(used.Options(), opts...)...)
			if d.Equal() {
				r.equal = true
				return r
			}
			r.diff, r.d = d.Text(), d
			if js, err := d.JSON(); err == nil {
				r.diffRec = js
			}
			return r
		},
		encode: func() ([]byte, error) {
			// Options that do not fit got itself (a key column it lacks, a
			// bad tolerance) would fail every later run: refuse to write.
			if p := assert.Compare(got, got, append(used.Options(), opts...)...).Problems; len(p) > 0 {
				return nil, fmt.Errorf("the options do not fit got: %s", strings.Join(p, "; "))
			}
			return EncodeTableRules(got, used)
		},
	})
}

// chooseRules decides the rules a check of a stored table compares under:
// those the file stores (for a version 1 file, its keys), with each rule
// given on top (see MergeRules). note says so when that differs from the
// stored rules, and rewrite that an update should store them even if the
// tables are equal.
func chooseRules(info SheetInfo, given assert.Rules) (used assert.Rules, note string, rewrite bool) {
	used = MergeRules(info.Rules, given)
	if used.Equal(info.Rules) {
		return used, "", false
	}
	if !info.HasRules {
		return used, fmt.Sprintf("the file stores no rules (format v%d); compared under %s; an update stores them", info.Version, used), true
	}
	return used, RulesChange(info.Rules, used) + "; compared under the new rules; an update stores them", true
}

// MergeRules returns the stored rules with the given ones on top, rule by
// rule: given keys or row order replace the stored row matching (given
// rules that match by position leave it as stored); a given tolerance
// replaces the stored one of its column (a time tolerance the stored time
// tolerance), and so does a text rule; ignored columns and switches add
// up. A stored rule is dropped only by giving another in its place (an
// exact Tol(col, 0, 0), say) or by rewriting the file.
func MergeRules(stored, given assert.Rules) assert.Rules {
	out := stored
	if given.Match == assert.MatchByKey || given.Match == assert.MatchAsMultiset {
		out.Match, out.Keys = given.Match, slices.Clone(given.Keys)
	}
	isTime := func(t assert.Tolerance) bool { return t.Kind == assert.TolTime }
	out.Tolerances = slices.DeleteFunc(slices.Clone(stored.Tolerances), func(s assert.Tolerance) bool {
		return slices.ContainsFunc(given.Tolerances, func(g assert.Tolerance) bool { return g.Column == s.Column && isTime(g) == isTime(s) })
	})
	out.Tolerances = append(out.Tolerances, given.Tolerances...)
	out.Text = slices.DeleteFunc(slices.Clone(stored.Text), func(s assert.TextRule) bool {
		return slices.ContainsFunc(given.Text, func(g assert.TextRule) bool { return g.Column == s.Column })
	})
	out.Text = append(out.Text, given.Text...)
	out.Ignore = append(slices.Clone(stored.Ignore), given.Ignore...)
	out.AnyColumnOrder = stored.AnyColumnOrder || given.AnyColumnOrder
	out.LooseTypes = stored.LooseTypes || given.LooseTypes
	out.NaNIsNull = stored.NaNIsNull || given.NaNIsNull
	// The canonical order and no repeats, as RulesOf gives them.
	return assert.RulesOf(out.Options()...)
}

// RulesChange describes how the rules used differ from the stored ones,
// for a person: "rules differ from the stored ones: *=abs:1e-09 →
// *=abs:0.5" (the parts only stored, an arrow, the parts only used; "-"
// for none). It returns "" when they are equal.
func RulesChange(stored, used assert.Rules) string {
	return rulesChange(stored, used, "rules differ from the stored ones")
}

func rulesChange(a, b assert.Rules, head string) string {
	if a.Equal(b) {
		return ""
	}
	pa, pb := a.Parts(), b.Parts()
	only := func(xs, ys []string) string {
		var out []string
		for _, x := range xs {
			if !slices.Contains(ys, x) {
				out = append(out, x)
			}
		}
		if len(out) == 0 {
			return "-"
		}
		return strings.Join(out, "; ")
	}
	return head + ": " + only(pa, pb) + " → " + only(pb, pa)
}
