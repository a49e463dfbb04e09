package main

import (
	"flag"
	"fmt"
	"strings"

	"github.com/proofsheet/proofsheet/assert"
)

// tolHelp documents the --tol syntax in the usage texts.
const tolHelp = `  --tol SPEC         let a column's cells differ a little (repeatable):
                       COL=abs:X        |want − got| ≤ X
                       COL=rel:X        |want − got| ≤ X·max(|want|, |got|)
                       COL=abs:X,rel:Y  within either bound
                       COL=ulp:N        at most N units in the last place
                       COL=time:D       dates, timestamps within D (1s, 24h)
                     COL * means every float64 column (every date and
                     timestamp column for time:); a named column's rule wins`

// tolFlags collects repeated --tol specs.
type tolFlags []string

func (t *tolFlags) String() string     { return strings.Join(*t, " ") }
func (t *tolFlags) Set(s string) error { *t = append(*t, s); return nil }

var _ flag.Value = (*tolFlags)(nil)

// parseTol reads one --tol spec (see assert.ParseTolerance): COLUMN=RULE
// [,RULE], each rule abs:X, rel:X, ulp:N or time:D.
func parseTol(spec string) (assert.Option, error) {
	t, err := assert.ParseTolerance(spec)
	if err != nil {
		return assert.Option{}, fmt.Errorf("--tol %q: %w", spec, err)
	}
	return t.Option(), nil
}

// tolColumn returns the column a --tol spec names.
func tolColumn(spec string) string { return assert.SpecColumnOf(spec) }

// tolOptions turns every --tol spec into an option.
func tolOptions(specs []string) ([]assert.Option, error) {
	var opts []assert.Option
	for _, s := range specs {
		o, err := parseTol(s)
		if err != nil {
			return nil, err
		}
		opts = append(opts, o)
	}
	return opts, nil
}
