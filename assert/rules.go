package assert

import (
	"errors"
	"fmt"
	"math"
	"slices"
	"strconv"
	"strings"
	"time"
	"unicode"
)

// Rules are the comparison rules a list of options sets, as data: how rows
// are matched, the tolerances, the ignored columns, text normalisations and
// the switches. Golden table files store them in their header so a check
// needs no options, and tools show them; Options turns them back into
// options. ListLimit is not a rule: it changes what a Diff lists, never
// whether tables are equal.
type Rules struct {
	// Match is how rows pair: MatchByPosition (also for ""), MatchByKey
	// with Keys, or MatchAsMultiset.
	Match MatchMode
	Keys  []string
	// Tolerances are the float and time tolerances, sorted by column (the
	// AllColumns rule first), a float rule before a time rule.
	Tolerances []Tolerance
	// Ignore are the ignored columns, sorted.
	Ignore []string
	// Text are the text normalisations, sorted by column (AllColumns
	// first).
	Text []TextRule
	// AnyColumnOrder, LooseTypes and NaNIsNull are the options of those
	// names.
	AnyColumnOrder, LooseTypes, NaNIsNull bool
}

// ToleranceKind says which closeness rule a Tolerance is.
type ToleranceKind string

// The kinds of tolerance, named as their spec writes them.
const (
	TolAbsRel ToleranceKind = "abs/rel" // Tol: abs and rel bounds
	TolULPs   ToleranceKind = "ulp"     // ULPs: units in the last place
	TolTime   ToleranceKind = "time"    // TimeTol: a duration between dates and timestamps
)

// Tolerance is one column's tolerance rule: Tol, ULPs or TimeTol.
type Tolerance struct {
	// Column is the column it applies to, or AllColumns.
	Column string
	Kind   ToleranceKind
	// Abs and Rel are the bounds of a TolAbsRel rule.
	Abs, Rel float64
	// ULPs is the bound of a TolULPs rule.
	ULPs uint64
	// Within is the bound of a TolTime rule.
	Within time.Duration
}

// TextRule is one column's text normalisation (NormText).
type TextRule struct {
	Column string
	Norm   TextNorm
}

// RulesOf returns the rules that opts set, as Compare would apply them:
// later options replace earlier ones where Compare lets them. Options with
// bad values (a negative tolerance) set nothing; Compare reports them as
// problems.
func RulesOf(opts ...Option) Rules {
	c := newConfig(opts)
	r := Rules{Match: MatchByPosition, AnyColumnOrder: c.anyColOrder, LooseTypes: c.loose, NaNIsNull: c.nanIsNull}
	switch c.mode {
	case byKey:
		r.Match, r.Keys = MatchByKey, slices.Clone(c.keys)
	case asMultiset:
		r.Match = MatchAsMultiset
	}
	for col, fr := range c.tols {
		t := Tolerance{Column: col, Kind: TolAbsRel, Abs: fr.abs, Rel: fr.rel}
		if fr.hasULP {
			t = Tolerance{Column: col, Kind: TolULPs, ULPs: fr.ulps}
		}
		r.Tolerances = append(r.Tolerances, t)
	}
	for col, d := range c.timeTols {
		r.Tolerances = append(r.Tolerances, Tolerance{Column: col, Kind: TolTime, Within: d})
	}
	slices.SortFunc(r.Tolerances, func(a, b Tolerance) int {
		if n := compareColumns(a.Column, b.Column); n != 0 {
			return n
		}
		return strings.Compare(kindRank(a.Kind), kindRank(b.Kind))
	})
	for col := range c.ignore {
		r.Ignore = append(r.Ignore, col)
	}
	slices.Sort(r.Ignore)
	for col, n := range c.norms {
		r.Text = append(r.Text, TextRule{Column: col, Norm: n})
	}
	slices.SortFunc(r.Text, func(a, b TextRule) int { return compareColumns(a.Column, b.Column) })
	return r
}

// compareColumns orders column names with AllColumns first, then by bytes.
func compareColumns(a, b string) int {
	switch {
	case a == b:
		return 0
	case a == AllColumns:
		return -1
	case b == AllColumns:
		return 1
	}
	return strings.Compare(a, b)
}

func kindRank(k ToleranceKind) string {
	if k == TolTime {
		return "1"
	}
	return "0"
}

// Options returns options that set exactly these rules.
func (r Rules) Options() []Option {
	var opts []Option
	switch r.Match {
	case MatchByKey:
		opts = append(opts, ByKey(r.Keys...))
	case MatchAsMultiset:
		opts = append(opts, AnyRowOrder())
	}
	for _, t := range r.Tolerances {
		opts = append(opts, t.Option())
	}
	if len(r.Ignore) > 0 {
		opts = append(opts, IgnoreColumns(r.Ignore...))
	}
	for _, t := range r.Text {
		opts = append(opts, NormText(t.Column, t.Norm))
	}
	if r.AnyColumnOrder {
		opts = append(opts, AnyColumnOrder())
	}
	if r.LooseTypes {
		opts = append(opts, LooseTypes())
	}
	if r.NaNIsNull {
		opts = append(opts, NaNIsNull())
	}
	return opts
}

// IsZero reports whether the rules are Compare's defaults: rows by
// position, every cell exact, no column ignored, no switch on.
func (r Rules) IsZero() bool {
	return (r.Match == "" || r.Match == MatchByPosition) && len(r.Keys) == 0 && len(r.Tolerances) == 0 &&
		len(r.Ignore) == 0 && len(r.Text) == 0 && !r.AnyColumnOrder && !r.LooseTypes && !r.NaNIsNull
}

// Equal reports whether two sets of rules compare tables the same way.
func (r Rules) Equal(o Rules) bool {
	m := func(x MatchMode) MatchMode {
		if x == "" {
			return MatchByPosition
		}
		return x
	}
	return m(r.Match) == m(o.Match) && slices.Equal(r.Keys, o.Keys) && slices.Equal(r.Tolerances, o.Tolerances) &&
		slices.Equal(r.Ignore, o.Ignore) && slices.Equal(r.Text, o.Text) &&
		r.AnyColumnOrder == o.AnyColumnOrder && r.LooseTypes == o.LooseTypes && r.NaNIsNull == o.NaNIsNull
}

// Parts describes the rules one per item, in a fixed order: "rows by key
// house, day" (or "rows by position", "rows in any order"), then each
// tolerance as its spec, "ignore note, logger_id", each text rule as
// "text house=nfc+trim", and "any column order", "loose types", "NaN is
// null".
func (r Rules) Parts() []string {
	var out []string
	switch r.Match {
	case MatchByKey:
		out = append(out, "rows by key "+strings.Join(quoteNames(r.Keys), ", "))
	case MatchAsMultiset:
		out = append(out, "rows in any order")
	default:
		out = append(out, "rows by position")
	}
	for _, t := range r.Tolerances {
		out = append(out, t.String())
	}
	if len(r.Ignore) > 0 {
		out = append(out, "ignore "+strings.Join(quoteNames(r.Ignore), ", "))
	}
	for _, t := range r.Text {
		out = append(out, "text "+t.String())
	}
	if r.AnyColumnOrder {
		out = append(out, "any column order")
	}
	if r.LooseTypes {
		out = append(out, "loose types")
	}
	if r.NaNIsNull {
		out = append(out, "NaN is null")
	}
	return out
}

// String writes Parts joined by "; ".
func (r Rules) String() string { return strings.Join(r.Parts(), "; ") }

// Option returns the option that sets the tolerance.
func (t Tolerance) Option() Option {
	switch t.Kind {
	case TolULPs:
		return ULPs(t.Column, uint(t.ULPs))
	case TolTime:
		return TimeTol(t.Column, t.Within)
	}
	return Tol(t.Column, t.Abs, t.Rel)
}

// String writes the tolerance as a spec that ParseTolerance reads back:
// "tmax=abs:0.01", "*=rel:1e-09", "tmean=abs:1e-09,rel:1e-12",
// "gdd=ulp:4", "at=time:1s". Numbers are in shortest round-trip form; a
// column name that could not be read back is a quoted Go string.
func (t Tolerance) String() string {
	col := SpecColumn(t.Column)
	switch t.Kind {
	case TolULPs:
		return col + "=ulp:" + strconv.FormatUint(t.ULPs, 10)
	case TolTime:
		return col + "=time:" + t.Within.String()
	}
	var rules []string
	if t.Abs != 0 || t.Rel == 0 {
		rules = append(rules, "abs:"+strconv.FormatFloat(t.Abs, 'g', -1, 64))
	}
	if t.Rel != 0 {
		rules = append(rules, "rel:"+strconv.FormatFloat(t.Rel, 'g', -1, 64))
	}
	return col + "=" + strings.Join(rules, ",")
}

// String writes the rule as "house=nfc+trim+fold", which ParseTextRule
// reads back.
func (t TextRule) String() string {
	var parts []string
	if t.Norm&NFC != 0 {
		parts = append(parts, "nfc")
	}
	if t.Norm&TrimSpace != 0 {
		parts = append(parts, "trim")
	}
	if t.Norm&FoldCase != 0 {
		parts = append(parts, "fold")
	}
	if len(parts) == 0 {
		parts = append(parts, "none")
	}
	return SpecColumn(t.Column) + "=" + strings.Join(parts, "+")
}

// SpecColumn writes a column name for a spec COLUMN=RULE: as it is, or as
// a quoted Go string when it is empty, starts with a double quote, has
// blanks at an edge or holds characters that do not print.
func SpecColumn(col string) string {
	if col == "" || col[0] == '"' || strings.TrimSpace(col) != col || strings.IndexFunc(col, func(r rune) bool { return !unicode.IsPrint(r) }) >= 0 {
		return strconv.Quote(col)
	}
	return col
}

func quoteNames(cols []string) []string {
	out := make([]string, len(cols))
	for i, c := range cols {
		out[i] = SpecColumn(c)
	}
	return out
}

// splitSpec splits COLUMN=RULE: the column is a quoted Go string when it
// starts with a double quote, else everything before the last "=" (so a
// name may hold "="), blanks trimmed.
func splitSpec(spec string) (col, rule string, err error) {
	s := strings.TrimSpace(spec)
	if strings.HasPrefix(s, `"`) {
		q, qerr := strconv.QuotedPrefix(s)
		if qerr != nil {
			return "", "", errors.New("the quoted column name has no closing quote")
		}
		col, _ = strconv.Unquote(q)
		rest := strings.TrimSpace(s[len(q):])
		if !strings.HasPrefix(rest, "=") {
			return "", "", errors.New("want = after the quoted column name")
		}
		return col, strings.TrimSpace(rest[1:]), nil
	}
	eq := strings.LastIndexByte(s, '=')
	if eq < 0 {
		return "", "", errors.New("want COLUMN=RULE, such as tmax=abs:0.01, *=rel:1e-9, gdd=ulp:4 or at=time:1s")
	}
	col = strings.TrimSpace(s[:eq])
	if col == "" {
		return "", "", errors.New("no column before =; use * for every column")
	}
	return col, strings.TrimSpace(s[eq+1:]), nil
}

// SpecColumnOf returns the column a COLUMN=RULE spec names, or "" when it
// names none.
func SpecColumnOf(spec string) string {
	col, _, err := splitSpec(spec)
	if err != nil {
		return ""
	}
	return col
}

// ParseTolerance reads a tolerance spec COLUMN=RULE[,RULE], each rule
// abs:X, rel:X, ulp:N or time:D (a Go duration such as 500ms, 1s or 24h).
// abs and rel may go together; ulp and time stand alone. COLUMN may be
// AllColumns ("*"), or a quoted Go string; without quotes it is
// everything before the last "=". Tolerance.String writes what it reads.
func ParseTolerance(spec string) (Tolerance, error) {
	col, rules, err := splitSpec(spec)
	if err != nil {
		return Tolerance{}, err
	}
	if rules == "" {
		return Tolerance{}, errors.New("no rule after =; want abs:X, rel:X, ulp:N or time:D")
	}
	t := Tolerance{Column: col, Kind: TolAbsRel}
	var hasAbs, hasRel, hasULP, hasTime bool
	for _, r := range strings.Split(rules, ",") {
		kind, val, ok := strings.Cut(strings.TrimSpace(r), ":")
		if !ok {
			return Tolerance{}, fmt.Errorf("rule %q: want KIND:VALUE with KIND abs, rel, ulp or time", r)
		}
		kind, val = strings.ToLower(strings.TrimSpace(kind)), strings.TrimSpace(val)
		switch kind {
		case "abs", "rel":
			x, err := strconv.ParseFloat(val, 64)
			if err != nil || math.IsNaN(x) || math.IsInf(x, 0) || x < 0 {
				return Tolerance{}, fmt.Errorf("%s:%s: want a finite number ≥ 0", kind, val)
			}
			if kind == "abs" {
				if hasAbs {
					return Tolerance{}, errors.New("abs given twice")
				}
				t.Abs, hasAbs = x, true
			} else {
				if hasRel {
					return Tolerance{}, errors.New("rel given twice")
				}
				t.Rel, hasRel = x, true
			}
		case "ulp", "ulps":
			n, err := strconv.ParseUint(val, 10, 32)
			if err != nil {
				return Tolerance{}, fmt.Errorf("ulp:%s: want a whole number of units in the last place", val)
			}
			if hasULP {
				return Tolerance{}, errors.New("ulp given twice")
			}
			t.ULPs, hasULP = n, true
		case "time":
			d, err := time.ParseDuration(val)
			if err != nil || d < 0 {
				return Tolerance{}, fmt.Errorf("time:%s: want a duration ≥ 0 such as 500ms, 1s, 5m or 24h", val)
			}
			if hasTime {
				return Tolerance{}, errors.New("time given twice")
			}
			t.Within, hasTime = d, true
		default:
			return Tolerance{}, fmt.Errorf("unknown rule kind %q (want abs, rel, ulp or time)", kind)
		}
	}
	switch {
	case hasULP && (hasAbs || hasRel || hasTime):
		return Tolerance{}, errors.New("ulp stands alone; it cannot go with abs, rel or time")
	case hasTime && (hasAbs || hasRel):
		return Tolerance{}, errors.New("time stands alone; it cannot go with abs or rel")
	case hasULP:
		return Tolerance{Column: col, Kind: TolULPs, ULPs: t.ULPs}, nil
	case hasTime:
		return Tolerance{Column: col, Kind: TolTime, Within: t.Within}, nil
	}
	return t, nil
}

// ParseTextRule reads a text rule COLUMN=NORM[+NORM], each NORM nfc, trim
// or fold (any case), or none; COLUMN as in ParseTolerance.
func ParseTextRule(spec string) (TextRule, error) {
	col, rule, err := splitSpec(spec)
	if err != nil {
		return TextRule{}, err
	}
	if rule == "" {
		return TextRule{}, errors.New("no normalisation after =; want nfc, trim or fold, joined by +")
	}
	t := TextRule{Column: col}
	for _, p := range strings.Split(rule, "+") {
		switch strings.ToLower(strings.TrimSpace(p)) {
		case "nfc":
			t.Norm |= NFC
		case "trim":
			t.Norm |= TrimSpace
		case "fold":
			t.Norm |= FoldCase
		case "none":
		default:
			return TextRule{}, fmt.Errorf("unknown normalisation %q (want nfc, trim or fold, joined by +)", strings.TrimSpace(p))
		}
	}
	return t, nil
}
