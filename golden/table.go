package golden

import (
	"errors"
	"fmt"
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
// store's directory (<name>.gold.tbl, in the format EncodeTable writes).
// The stored table is want: the two are compared with assert.Compare under
// opts — the same options as assert.Tables, so keys, tolerances and the
// other rules apply — and when they differ the test fails with the Diff's
// text. A missing file fails and prints the command that creates it.
//
// In update mode (-update or PROOFSHEET_UPDATE=1; refused under CI) a
// missing or differing file is written from got and the check passes. A
// file that is equal under opts is left untouched, so values within
// tolerance cause no churn. Rows are stored sorted by the key columns when
// opts match rows by key (assert.ByKey), otherwise in got's order. The
// result reports whether the check passed.
func (s Store) Table(t T, name string, got *fixtures.Table, opts ...assert.Option) bool {
	t.Helper()
	return s.run(t, name, KindTable, course{
		prepare: func() error {
			if got == nil {
				return errors.New("got is a nil table")
			}
			return nil
		},
		compare: func(file string, stored []byte) result {
			want, _, err := DecodeTable(file, stored)
			if err != nil {
				return result{bad: err}
			}
			d := assert.Compare(want, got, opts...)
			if d.Equal() {
				return result{equal: true}
			}
			r := result{diff: d.Text()}
			if js, err := d.JSON(); err == nil {
				r.diffRec = js
			}
			return r
		},
		encode: func() ([]byte, error) {
			// Options that do not fit got itself (a key column it lacks, a
			// bad tolerance) would fail every later run: refuse to write.
			if p := assert.Compare(got, got, opts...).Problems; len(p) > 0 {
				return nil, fmt.Errorf("the options do not fit got: %s", strings.Join(p, "; "))
			}
			return EncodeTable(got, assert.KeyColumns(opts...))
		},
	})
}
