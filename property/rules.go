package property

import (
	"fmt"
	"math"
	"math/big"
	"slices"
	"strconv"
	"strings"
	"time"
	"unicode/utf8"

	"github.com/proofsheet/proofsheet/fixtures"
)

// Uniqueness says whether a column's clean values repeat across records.
type Uniqueness uint8

// The kinds of uniqueness. A unique column is unique among the records of
// a sample (its Clean table); a duplicate row repeats its record's value,
// as a re-uploaded row does, so a chain's de-duplication gets tested.
const (
	// AnyValues lets values repeat (the default).
	AnyValues Uniqueness = iota
	// Distinct makes every record's value different, in no order.
	Distinct
	// Sequential numbers the records one by one from the column's Min
	// (default 1): 1, 2, 3, … (int64 columns).
	Sequential
	// Gapped numbers the records in increasing order from Min (default
	// 1) with gaps now and then: 1, 2, 5, 6, 7, 12, … (int64 columns).
	Gapped
)

var uniquenessNames = [...]string{"", "distinct", "sequential", "gaps"}

// String returns "", distinct, sequential or gaps.
func (u Uniqueness) String() string {
	if int(u) < len(uniquenessNames) {
		return uniquenessNames[u]
	}
	return "Uniqueness(" + strconv.Itoa(int(u)) + ")"
}

// Choice is one allowed value of a column and its weight. Value is spelled
// as a literal table cell spells it (see fixtures.Parse): 12.5, 2026-04-01,
// true, Étang. A Weight of 0 counts as 1.
type Choice struct {
	Value  string
	Weight float64
}

// Rules steer the values and spellings of one column. The zero value
// changes nothing: the column takes the file's options. Bounds are
// spelled as literal table cells of the column's type ("0", "499.99",
// "2026-04-01", "2026-04-01T08:00:00"), so that they are exact for
// decimals.
//
// A unique or derived column gets no nulls, sentinels, currency, percent
// or extreme values unless its Rules ask for them.
type Rules struct {
	// Messes, when not empty, lists the only messes the column takes
	// (null tokens and sentinels too); Avoid lists messes it never takes;
	// Plain makes every cell plain (nulls stay the empty field).
	Messes, Avoid []Mess
	Plain         bool
	// MessRate, NullRate and SentinelRate override the file's shares for
	// this column (0: the file's; negative: none).
	MessRate, NullRate, SentinelRate float64
	// NullTokens and Sentinels override the file's spellings of null and
	// of fault codes for this column.
	NullTokens, Sentinels []string
	// Locale is the tag of the column's locale profile (default: the
	// file's).
	Locale string

	// Min and Max bound numbers, dates and timestamps, both included.
	Min, Max string
	// NonNegative keeps numbers at 0 or above.
	NonNegative bool
	// Integer makes numbers whole (float64 and decimal columns).
	Integer bool
	// Decimals is the most fractional digits of a number (default: the
	// file's for float64, the scale for decimal; negative: none).
	Decimals int
	// Unique makes the values unique among the records.
	Unique Uniqueness
	// Values, when not empty, are the only values the column takes, drawn
	// by weight. For a category column they are its levels.
	Values []Choice
	// MinLen and MaxLen bound the length of strings in characters
	// (default 1 and, with an Alphabet, 12).
	MinLen, MaxLen int
	// Alphabet, when not empty, is the characters strings are made of, or
	// one of the names digits, lower, upper, letters, alnum, hex; without
	// it strings are words.
	Alphabet string
	// Derive computes the column from others: an expression of column
	// names, numbers, + - * / and parentheses, such as "price * qty".
	// It is computed exactly on the clean values and rounded to the
	// column's decimals (half away from zero), so the relation holds on
	// the clean table whenever no rounding is needed; a null or a zero
	// divisor makes the cell null.
	Derive string
}

// Alphabet names.
var alphabets = map[string]string{
	"digits":  "0123456789",
	"lower":   "abcdefghijklmnopqrstuvwxyz",
	"upper":   "ABCDEFGHIJKLMNOPQRSTUVWXYZ",
	"letters": "ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz",
	"alnum":   "0123456789ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz",
	"hex":     "0123456789abcdef",
}

// ColumnError is an option or rule that does not fit one column: a bound
// outside its type, a mess its locale never writes, a unique column with
// too few values. ParseGenSpec reports it at the column's line.
type ColumnError struct {
	Column string
	Err    error
}

func (e *ColumnError) Error() string { return fmt.Sprintf("property: column %q: %v", e.Column, e.Err) }

// Unwrap returns the reason.
func (e *ColumnError) Unwrap() error { return e.Err }

// colConf is a column's rules compiled against its type and the file's
// options.
type colConf struct {
	rules   Rules
	lc      *Locale
	mixed   bool
	allowed map[Mess]bool
	// avoidComma: no decimal comma even where the locale writes one;
	// commaPlain: the locale's decimal comma even in otherwise plain cells
	avoidComma, commaPlain bool

	nullRate, messRate, sentinelRate, extremeRate float64
	nullTokens, sentinels                         []string

	// numbers: bounds as exact rationals; maxDec the most decimals; exact
	// that every value has exactly maxDec decimals (decimal columns)
	lo, hi         *big.Rat
	unitLo, unitHi [16]int64 // the bounds in units of 10^-d, for d up to maxDec
	maxInt         int       // most integer digits when unbounded
	maxDec         int
	exact          bool
	neg            bool // values may be negative
	bounded        bool // Min, Max, NonNegative or Integer given: draw in [lo, hi]

	unique Uniqueness
	start  int64 // first value of a sequence

	choices []choiceConf
	total   float64

	minLen, maxLen int
	alphabet       []rune

	derive *expr

	from, to int64 // unix seconds of dates and timestamps
}

type choiceConf struct {
	clean any
	plain string
	cum   float64 // cumulative weight up to and including this one
}

// isZero reports whether the rules change nothing.
func (r *Rules) isZero() bool {
	return len(r.Messes) == 0 && len(r.Avoid) == 0 && !r.Plain && r.MessRate == 0 && r.NullRate == 0 &&
		r.SentinelRate == 0 && r.NullTokens == nil && r.Sentinels == nil && r.Locale == "" && r.Min == "" &&
		r.Max == "" && !r.NonNegative && !r.Integer && r.Decimals == 0 && r.Unique == AnyValues &&
		len(r.Values) == 0 && r.MinLen == 0 && r.MaxLen == 0 && r.Alphabet == "" && r.Derive == ""
}

// valueRuled reports whether the rules constrain the column's values, so
// that extreme values would break them.
func (r *Rules) valueRuled() bool {
	return r.Min != "" || r.Max != "" || r.NonNegative || r.Integer || r.Unique != AnyValues || len(r.Values) > 0 || r.Derive != ""
}

// compileColumn compiles the rules of field f (fields of the schema for
// Derive) against the file's config c.
func compileColumn(f fixtures.Field, schema fixtures.Schema, r Rules, c *config) (*colConf, error) {
	k := f.Type.Kind()
	cc := &colConf{rules: r, lc: c.locale}
	fail := func(format string, args ...any) error {
		return &ColumnError{Column: f.Name, Err: fmt.Errorf(format, args...)}
	}
	if r.Locale != "" {
		l, err := LocaleByTag(r.Locale)
		if err != nil {
			return nil, fail("%v", err)
		}
		cc.lc = l
	}
	// Messes.
	known := AllMesses()
	for _, list := range [][]Mess{r.Messes, r.Avoid} {
		for _, m := range list {
			if !slices.Contains(known, m) {
				return nil, fail("unknown mess %q", m)
			}
			if isUploadMess(m) {
				return nil, fail("%s is a mess of whole files, not of a column; give it in Options.Also", m)
			}
		}
	}
	cc.allowed = map[Mess]bool{}
	switch {
	case r.Plain:
	case len(r.Messes) > 0:
		for _, m := range r.Messes {
			cc.allowed[m] = true
		}
	default:
		for m, ok := range c.allowed {
			if ok && !isUploadMess(m) {
				cc.allowed[m] = true
			}
		}
		if r.Unique != AnyValues || r.Derive != "" {
			for _, m := range []Mess{MessCurrency, MessPercent, MessNullToken, MessSentinel} {
				delete(cc.allowed, m)
			}
		}
	}
	for _, m := range r.Avoid {
		delete(cc.allowed, m)
	}
	cc.mixed = cc.allowed[MessMixedSources]
	cc.avoidComma = slices.Contains(r.Avoid, MessDecimalComma) || slices.Contains(c.avoid, MessDecimalComma)
	cc.commaPlain = cc.lc.commaDecimal() && !cc.avoidComma && len(cc.allowed) > 0

	// Shares.
	special := r.Unique != AnyValues || r.Derive != ""
	def := func(own, file float64) float64 {
		if special && own == 0 {
			return 0
		}
		return rate(own, file)
	}
	cc.nullRate = def(r.NullRate, c.nullRate)
	cc.messRate = rate(r.MessRate, c.messRate)
	if len(r.Messes) > 0 && cc.messRate == 0 && r.MessRate >= 0 {
		cc.messRate = 0.5
	}
	cc.sentinelRate = def(r.SentinelRate, c.sentinelRate)
	if len(r.Messes) > 0 && slices.Contains(r.Messes, MessSentinel) && r.SentinelRate == 0 && cc.sentinelRate == 0 {
		cc.sentinelRate = 0.03
	}
	if !cc.allowed[MessSentinel] {
		cc.sentinelRate = 0
	}
	cc.extremeRate = c.extremeRate
	if len(r.Messes) > 0 && slices.Contains(r.Messes, MessExtreme) && cc.extremeRate == 0 {
		cc.extremeRate = 0.02
	}
	if !cc.allowed[MessExtreme] || r.valueRuled() {
		cc.extremeRate = 0
	}
	cc.nullTokens = c.nullTokens
	if r.NullTokens != nil {
		cc.nullTokens = r.NullTokens
	}
	if cc.nullTokens == nil {
		cc.nullTokens = defaultNullTokens(c.level, cc.lc)
	}
	cc.sentinels = c.sentinels
	if r.Sentinels != nil {
		cc.sentinels = r.Sentinels
	}

	// Values.
	num := k.IsNumeric()
	temporal := k == fixtures.KindDate || k == fixtures.KindTimestamp
	if (r.NonNegative || r.Integer || r.Decimals != 0) && !num {
		return nil, fail("non-negative, integer and decimals are for numbers; the column is %s", f.Type)
	}
	if (r.Min != "" || r.Max != "") && !num && !temporal {
		return nil, fail("min and max are for numbers, dates and timestamps; the column is %s", f.Type)
	}
	if (r.MinLen != 0 || r.MaxLen != 0 || r.Alphabet != "") && k != fixtures.KindString {
		return nil, fail("length and alphabet are for string columns; the column is %s", f.Type)
	}
	switch r.Unique {
	case AnyValues, Distinct:
	case Sequential, Gapped:
		if k != fixtures.KindInt64 {
			return nil, fail("unique=%s numbers int64 columns; the column is %s", r.Unique, f.Type)
		}
	default:
		return nil, fail("unknown uniqueness %d", r.Unique)
	}
	if r.Unique != AnyValues && k == fixtures.KindBool {
		return nil, fail("a bool column cannot be unique beyond two rows")
	}
	if r.Derive != "" && (r.Unique != AnyValues || len(r.Values) > 0) {
		return nil, fail("a derived column takes no unique and no values")
	}
	if r.Unique != AnyValues && len(r.Values) > 0 {
		return nil, fail("unique and values together are not supported; list the values as a category's levels")
	}
	if num {
		if err := cc.compileNumber(f, r, c); err != nil {
			return nil, fail("%v", err)
		}
	}
	if temporal {
		cc.from, cc.to = c.dateFrom, c.dateTo
		if r.Min != "" {
			v, err := parseValue(f.Type, r.Min)
			if err != nil {
				return nil, fail("min: %v", err)
			}
			cc.from = v.(time.Time).Unix()
		}
		if r.Max != "" {
			v, err := parseValue(f.Type, r.Max)
			if err != nil {
				return nil, fail("max: %v", err)
			}
			t := v.(time.Time)
			if k == fixtures.KindDate {
				t = t.Add(24*time.Hour - time.Second)
			}
			cc.to = t.Unix()
		}
		if cc.to < cc.from {
			return nil, fail("max %s is before min %s", r.Max, r.Min)
		}
		if f.Type.Kind() == fixtures.KindTimestamp && f.Type.Unit() == fixtures.Nanos &&
			(time.Unix(cc.from, 0).Year() < 1678 || time.Unix(cc.to, 0).Year() > 2261) {
			return nil, fail("counts nanoseconds in an int64, which holds years 1678 to 2261 only; set DateFrom and DateTo (or min and max) inside them")
		}
	}
	if k == fixtures.KindString {
		cc.minLen, cc.maxLen = r.MinLen, r.MaxLen
		if r.Alphabet != "" {
			a := r.Alphabet
			if named, ok := alphabets[a]; ok {
				a = named
			}
			if !utf8.ValidString(a) {
				return nil, fail("the alphabet is not valid UTF-8")
			}
			seen := map[rune]bool{}
			for _, ch := range a {
				if !seen[ch] {
					seen[ch] = true
					cc.alphabet = append(cc.alphabet, ch)
				}
			}
			if cc.maxLen == 0 {
				cc.maxLen = max(12, cc.minLen)
			}
		}
		if cc.minLen < 0 || cc.maxLen < 0 || (cc.maxLen > 0 && cc.maxLen < cc.minLen) {
			return nil, fail("length %d to %d is not a range", r.MinLen, r.MaxLen)
		}
		if cc.minLen == 0 && (r.MaxLen > 0 || len(cc.alphabet) > 0) {
			cc.minLen = 1
		}
	}
	if len(r.Values) > 0 {
		for _, ch := range r.Values {
			v, err := parseValue(f.Type, ch.Value)
			if err != nil {
				return nil, fail("value %q: %v", ch.Value, err)
			}
			w := ch.Weight
			if w < 0 || math.IsNaN(w) || math.IsInf(w, 0) {
				return nil, fail("value %q has weight %v; want 0 or more", ch.Value, ch.Weight)
			}
			if w == 0 {
				w = 1
			}
			plain, _ := Spell(v, f.Type)
			cc.total += w
			cc.choices = append(cc.choices, choiceConf{clean: v, plain: plain, cum: cc.total})
		}
	}
	cc.unique = r.Unique
	if r.Unique == Sequential || r.Unique == Gapped {
		cc.start = 1
		if cc.lo != nil {
			s, _ := new(big.Float).SetRat(cc.lo).Int64()
			cc.start = s
		}
	}
	if r.Derive != "" {
		if !num {
			return nil, fail("derive is for number columns; the column is %s", f.Type)
		}
		e, err := parseExpr(r.Derive)
		if err != nil {
			return nil, fail("derive %q: %v", r.Derive, err)
		}
		for _, name := range e.columns() {
			i := schema.Index(name)
			if i < 0 {
				return nil, fail("derive %q: no column %q", r.Derive, name)
			}
			if !schema[i].Type.Kind().IsNumeric() {
				return nil, fail("derive %q: column %q is %s, not a number", r.Derive, name, schema[i].Type)
			}
		}
		e.bind(schema)
		cc.derive = e
	}
	return cc, nil
}

// compileNumber works out a number column's bounds and decimals.
func (cc *colConf) compileNumber(f fixtures.Field, r Rules, c *config) error {
	k := f.Type.Kind()
	switch k {
	case fixtures.KindInt64:
		cc.maxDec = 0
		cc.maxInt = c.maxDigits
	case fixtures.KindFloat64:
		cc.maxDec = c.decimals
		cc.maxInt = c.maxDigits
	case fixtures.KindDecimal:
		cc.maxDec = f.Type.Scale()
		cc.exact = true
		cc.maxInt = min(f.Type.Precision()-f.Type.Scale(), c.maxDigits)
		if f.Type.Precision()-f.Type.Scale() == 0 {
			cc.maxInt = 0
		}
	}
	if r.Decimals != 0 {
		d := max(r.Decimals, 0)
		if k == fixtures.KindDecimal && d > f.Type.Scale() {
			return fmt.Errorf("decimals=%d is more than the scale %d", d, f.Type.Scale())
		}
		if d > 15 {
			return fmt.Errorf("decimals=%d: at most 15", d)
		}
		cc.maxDec = d
	}
	if r.Integer {
		cc.maxDec = 0
	}
	cc.neg = true
	if r.Min == "" && r.Max == "" && !r.NonNegative && !r.Integer && r.Decimals == 0 {
		return nil
	}
	cc.bounded = true
	// Unbounded sides default to the largest numbers of maxInt digits,
	// with the decimals (and, for decimal columns, the precision) kept.
	span := new(big.Rat).SetFrac(new(big.Int).Exp(big.NewInt(10), big.NewInt(int64(max(cc.maxInt, 1))), nil), big.NewInt(1))
	span.Sub(span, new(big.Rat).SetFrac(big.NewInt(1), new(big.Int).Exp(big.NewInt(10), big.NewInt(int64(cc.maxDec)), nil)))
	cc.lo, cc.hi = new(big.Rat).Neg(span), new(big.Rat).Set(span)
	parse := func(s, what string) (*big.Rat, error) {
		v, ok := new(big.Rat).SetString(strings.TrimSpace(s))
		if !ok {
			return nil, fmt.Errorf("%s %q is not a number", what, s)
		}
		return v, nil
	}
	if r.Min != "" {
		v, err := parse(r.Min, "min")
		if err != nil {
			return err
		}
		cc.lo = v
	}
	if r.Max != "" {
		v, err := parse(r.Max, "max")
		if err != nil {
			return err
		}
		cc.hi = v
	}
	if r.NonNegative && cc.lo.Sign() < 0 {
		if r.Min != "" {
			return fmt.Errorf("min %s is negative, yet the column is non-negative", r.Min)
		}
		cc.lo = new(big.Rat)
	}
	if r.Max == "" && cc.hi.Cmp(cc.lo) < 0 {
		cc.hi = new(big.Rat).Add(cc.lo, span)
	}
	if r.Min == "" && cc.hi.Cmp(cc.lo) < 0 {
		cc.lo = new(big.Rat).Sub(cc.hi, span)
	}
	limit := new(big.Rat).SetInt64(1e15)
	if new(big.Rat).Abs(cc.lo).Cmp(limit) > 0 || new(big.Rat).Abs(cc.hi).Cmp(limit) > 0 {
		return fmt.Errorf("bounds beyond ±10^15 are not supported")
	}
	for d := 0; d <= cc.maxDec; d++ {
		top := new(big.Rat).Mul(new(big.Rat).Abs(cc.lo), new(big.Rat).SetInt(new(big.Int).Exp(big.NewInt(10), big.NewInt(int64(d)), nil)))
		top2 := new(big.Rat).Mul(new(big.Rat).Abs(cc.hi), new(big.Rat).SetInt(new(big.Int).Exp(big.NewInt(10), big.NewInt(int64(d)), nil)))
		if top.Cmp(new(big.Rat).SetInt64(1e18)) > 0 || top2.Cmp(new(big.Rat).SetInt64(1e18)) > 0 {
			return fmt.Errorf("bounds %s to %s with %d decimals need more than 18 digits", ratText(cc.lo), ratText(cc.hi), d)
		}
		cc.unitLo[d], cc.unitHi[d] = cc.unitBounds(d)
	}
	if cc.unitLo[cc.maxDec] > cc.unitHi[cc.maxDec] {
		return fmt.Errorf("no value with %d decimals lies in %s to %s", cc.maxDec, ratText(cc.lo), ratText(cc.hi))
	}
	if k == fixtures.KindDecimal {
		top := new(big.Rat).SetFrac(new(big.Int).Exp(big.NewInt(10), big.NewInt(int64(f.Type.Precision()-f.Type.Scale())), nil), big.NewInt(1))
		if new(big.Rat).Abs(cc.lo).Cmp(top) >= 0 || new(big.Rat).Abs(cc.hi).Cmp(top) >= 0 {
			return fmt.Errorf("bounds %s to %s do not fit %s", ratText(cc.lo), ratText(cc.hi), f.Type)
		}
	}
	cc.neg = cc.lo.Sign() < 0
	return nil
}

// unitBounds returns the bounds in units of 10^-d, rounded inward.
func (cc *colConf) unitBounds(d int) (int64, int64) {
	scale := new(big.Int).Exp(big.NewInt(10), big.NewInt(int64(d)), nil)
	lo := new(big.Rat).Mul(cc.lo, new(big.Rat).SetFrac(scale, big.NewInt(1)))
	hi := new(big.Rat).Mul(cc.hi, new(big.Rat).SetFrac(scale, big.NewInt(1)))
	return ceilRat(lo), floorRat(hi)
}

func floorRat(r *big.Rat) int64 {
	q := new(big.Int)
	m := new(big.Int)
	q.DivMod(r.Num(), r.Denom(), m) // Euclidean: m ≥ 0, so q is the floor for a positive denominator
	return q.Int64()
}

func ceilRat(r *big.Rat) int64 {
	return -floorRat(new(big.Rat).Neg(r))
}

func ratText(r *big.Rat) string {
	if r.IsInt() {
		return r.Num().String()
	}
	return strings.TrimRight(strings.TrimRight(r.FloatString(15), "0"), ".")
}

// capacity returns how many distinct values a unique column can take,
// capped at limit.
func (cc *colConf) capacity(f fixtures.Field, c *config, limit int) int {
	k := f.Type.Kind()
	switch {
	case k.IsNumeric():
		if !cc.bounded {
			return limit
		}
		lo, hi := cc.unitLo[cc.maxDec], cc.unitHi[cc.maxDec]
		if cc.unique == Sequential || cc.unique == Gapped {
			lo = cc.start
		}
		if hi-lo+1 < int64(limit) {
			return int(max(hi-lo+1, 0))
		}
	case k == fixtures.KindDate:
		n := floorDiv(cc.to, 86400) - floorDiv(cc.from, 86400) + 1
		if n < int64(limit) {
			return int(n)
		}
	case k == fixtures.KindTimestamp:
		if n := cc.to - cc.from + 1; n < int64(limit) {
			return int(n)
		}
	case k == fixtures.KindCategory:
		names := c.levels[f.Name]
		if names == nil {
			names = houseNames
		}
		if len(cc.choices) > 0 {
			return min(len(cc.choices), limit)
		}
		return min(len(names), limit)
	case k == fixtures.KindString && len(cc.alphabet) > 0:
		n := 0.0
		for l := cc.minLen; l <= cc.maxLen; l++ {
			n += math.Pow(float64(len(cc.alphabet)), float64(l))
		}
		if n < float64(limit) {
			return int(n)
		}
	}
	return limit
}

// parseValue reads a literal table cell of type t.
func parseValue(t fixtures.Type, s string) (any, error) {
	switch t.Kind() {
	case fixtures.KindBool:
		return fixtures.ParseBool(s)
	case fixtures.KindInt64:
		return strconv.ParseInt(strings.TrimSpace(s), 10, 64)
	case fixtures.KindFloat64:
		v, err := strconv.ParseFloat(strings.TrimSpace(s), 64)
		if err != nil {
			return nil, fmt.Errorf("%q is not a float64", s)
		}
		return v, nil
	case fixtures.KindDecimal:
		d, err := fixtures.ParseDecimal(strings.TrimSpace(s))
		if err != nil {
			return nil, err
		}
		return d.Rescale(t.Scale())
	case fixtures.KindDate:
		days, err := fixtures.ParseDate(strings.TrimSpace(s))
		if err != nil {
			return nil, err
		}
		return time.Unix(int64(days)*86400, 0).UTC(), nil
	case fixtures.KindTimestamp:
		n, err := fixtures.ParseTimestamp(strings.TrimSpace(s), t)
		if err != nil {
			return nil, err
		}
		var tm time.Time
		switch t.Unit() {
		case fixtures.Seconds:
			tm = time.Unix(n, 0)
		case fixtures.Millis:
			tm = time.UnixMilli(n)
		case fixtures.Micros:
			tm = time.UnixMicro(n)
		default:
			tm = time.Unix(0, n)
		}
		tm = tm.UTC()
		if z := t.Zone(); z != "" && z != "UTC" && z != "Z" {
			if loc, err := time.LoadLocation(z); err == nil {
				tm = tm.In(loc)
			}
		}
		return tm, nil
	}
	return s, nil
}
