package main

import (
	"flag"
	"fmt"
	"math"
	"strconv"
	"strings"
	"time"

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

// parseTol reads one --tol spec: COLUMN=RULE[,RULE], each rule abs:X,
// rel:X, ulp:N or time:D. abs and rel may go together; ulp and time stand
// alone. COLUMN may be * for every column the rule fits.
func parseTol(spec string) (assert.Option, error) {
	bad := func(format string, args ...any) (assert.Option, error) {
		return assert.Option{}, fmt.Errorf("--tol %q: %s", spec, fmt.Sprintf(format, args...))
	}
	eq := strings.LastIndexByte(spec, '=')
	if eq < 0 {
		return bad("want COLUMN=RULE, such as tmax=abs:0.01, *=rel:1e-9, gdd=ulp:4 or at=time:1s")
	}
	col, rules := tolColumn(spec), strings.TrimSpace(spec[eq+1:])
	if col == "" {
		return bad("no column before =; use * for every column")
	}
	if rules == "" {
		return bad("no rule after =; want abs:X, rel:X, ulp:N or time:D")
	}
	var abs, rel float64
	var hasAbs, hasRel bool
	var ulp *uint64
	var within *time.Duration
	for _, r := range strings.Split(rules, ",") {
		kind, val, ok := strings.Cut(strings.TrimSpace(r), ":")
		if !ok {
			return bad("rule %q: want KIND:VALUE with KIND abs, rel, ulp or time", r)
		}
		kind, val = strings.ToLower(strings.TrimSpace(kind)), strings.TrimSpace(val)
		switch kind {
		case "abs", "rel":
			x, err := strconv.ParseFloat(val, 64)
			if err != nil || math.IsNaN(x) || math.IsInf(x, 0) || x < 0 {
				return bad("%s:%s: want a finite number ≥ 0", kind, val)
			}
			if kind == "abs" {
				if hasAbs {
					return bad("abs given twice")
				}
				abs, hasAbs = x, true
			} else {
				if hasRel {
					return bad("rel given twice")
				}
				rel, hasRel = x, true
			}
		case "ulp", "ulps":
			n, err := strconv.ParseUint(val, 10, 32)
			if err != nil {
				return bad("ulp:%s: want a whole number of units in the last place", val)
			}
			if ulp != nil {
				return bad("ulp given twice")
			}
			u := n
			ulp = &u
		case "time":
			d, err := time.ParseDuration(val)
			if err != nil || d < 0 {
				return bad("time:%s: want a duration ≥ 0 such as 500ms, 1s, 5m or 24h", val)
			}
			if within != nil {
				return bad("time given twice")
			}
			within = &d
		default:
			return bad("unknown rule kind %q (want abs, rel, ulp or time)", kind)
		}
	}
	switch {
	case ulp != nil && (hasAbs || hasRel || within != nil):
		return bad("ulp stands alone; it cannot go with abs, rel or time")
	case within != nil && (hasAbs || hasRel):
		return bad("time stands alone; it cannot go with abs or rel")
	case ulp != nil:
		return assert.ULPs(col, uint(*ulp)), nil
	case within != nil:
		return assert.TimeTol(col, *within), nil
	}
	return assert.Tol(col, abs, rel), nil
}

// tolColumn returns the column a --tol spec names.
func tolColumn(spec string) string {
	eq := strings.LastIndexByte(spec, '=')
	if eq < 0 {
		return ""
	}
	return strings.TrimSpace(spec[:eq])
}

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
