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
// under the stored rules. Rules in opts that differ from the stored ones
// are used, and the check says so in its log (and in its failure); an
// update then stores them.
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
			r.diff = d.Text()
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
// the given ones when there are any, else those the file stores (for a
// version 1 file, its keys). note says so when the given rules differ from
// the stored ones, and rewrite that an update should store them even if
// the tables are equal.
func chooseRules(info SheetInfo, given assert.Rules) (used assert.Rules, note string, rewrite bool) {
	if given.IsZero() || given.Equal(info.Rules) {
		return info.Rules, "", false
	}
	if !info.HasRules {
		return given, fmt.Sprintf("the file stores no rules (format v%d); compared under the given rules (%s); an update stores them", info.Version, given), true
	}
	return given, RulesChange(info.Rules, given) + "; compared under the given rules; an update stores them", true
}

// RulesChange describes how two sets of rules differ, for a person:
// "rules differ from the stored ones: only stored: tmax=abs:0.01; only
// given: tmax=abs:0.1". It returns "" when they are equal.
func RulesChange(stored, given assert.Rules) string {
	return rulesChange(stored, given, "stored", "given", "rules differ from the stored ones")
}

func rulesChange(a, b assert.Rules, aName, bName, head string) string {
	if a.Equal(b) {
		return ""
	}
	pa, pb := a.Parts(), b.Parts()
	var onlyA, onlyB []string
	for _, p := range pa {
		if !slices.Contains(pb, p) {
			onlyA = append(onlyA, p)
		}
	}
	for _, p := range pb {
		if !slices.Contains(pa, p) {
			onlyB = append(onlyB, p)
		}
	}
	s := head
	if len(onlyA) > 0 {
		s += ": only " + aName + ": " + strings.Join(onlyA, "; ")
	}
	if len(onlyB) > 0 {
		sep := ": "
		if len(onlyA) > 0 {
			sep = " — "
		}
		s += sep + "only " + bName + ": " + strings.Join(onlyB, "; ")
	}
	return s
}
