package property

import (
	"slices"
	"strconv"
	"strings"

	"github.com/proofsheet/proofsheet/fixtures"
)

// localeSpeller is a speller with the locales it belongs to. in == nil
// marks a spelling every locale may use (an edge blank, a plus sign);
// otherwise in reports whether locale l writes this way, and differs
// whether locale b's spelling would read differently from a's, so that it
// stands for another source in a file of a.
type localeSpeller struct {
	mess    Mess
	fn      func(g *colGen, r *rng, v *value) (string, Mess, bool)
	in      func(l *Locale) bool
	differs func(a, b *Locale) bool
}

// spellersOf lists the spellers of a column: for each mess it allows, the
// one of the column's locale when the locale writes that way, and with
// mixed sources one that writes as the other shipped locales do.
func spellersOf(g *colGen) []speller {
	var out []speller
	own := g.cc.lc
	for _, sp := range kindSpellers(g.kind) {
		if !g.cc.allowed[sp.mess] {
			continue
		}
		if sp.in == nil || sp.in(own) {
			out = append(out, speller{sp.mess, sp.fn})
		}
		if !g.cc.mixed || sp.in == nil {
			continue
		}
		var others []*Locale
		for _, l := range Locales() {
			if l != own && sp.in(l) && (sp.differs == nil || sp.differs(own, l)) {
				others = append(others, l)
			}
		}
		if len(others) == 0 {
			continue
		}
		fn := sp.fn
		out = append(out, speller{sp.mess, func(g *colGen, r *rng, v *value) (string, Mess, bool) {
			g.lc = pick(r, others) // spell restores the column's locale
			raw, m, ok := fn(g, r, v)
			return raw, m.and(MessMixedSources), ok
		}})
	}
	if g.cc.mixed && g.kind.IsNumeric() {
		for _, sp := range foreignGroupings {
			if g.cc.allowed[sp.mess] && sp.in(own) {
				out = append(out, speller{sp.mess, sp.fn})
			}
		}
	}
	return out
}

// kindSpellers lists the spellers of a column kind.
func kindSpellers(k fixtures.Kind) []localeSpeller {
	switch k {
	case fixtures.KindInt64:
		return intSpellers
	case fixtures.KindFloat64:
		return floatSpellers
	case fixtures.KindDecimal:
		return decimalSpellers
	case fixtures.KindBool:
		return boolSpellers
	case fixtures.KindDate:
		return dateSpellers
	case fixtures.KindTimestamp:
		return timestampSpellers
	case fixtures.KindString:
		return stringSpellers
	case fixtures.KindCategory:
		return categorySpellers
	}
	return nil
}

func marksDiffer(a, b *Locale) bool { return a.Group != b.Group || a.Decimal != b.Decimal }

// numberSpellers are the spellers of every number kind.
var numberSpellers = []localeSpeller{
	{mess: MessThousands, fn: spellThousands, in: func(*Locale) bool { return true }, differs: marksDiffer},
	{mess: MessCurrency, fn: spellCurrency, in: func(*Locale) bool { return true }, differs: func(a, b *Locale) bool {
		return a.Currency != b.Currency || a.CurrencyFirst != b.CurrencyFirst || marksDiffer(a, b)
	}},
	{mess: MessParentheses, fn: spellParentheses, in: func(l *Locale) bool { return l.Accounting }, differs: func(a, b *Locale) bool {
		return !a.Accounting || a.Currency != b.Currency || marksDiffer(a, b)
	}},
	{mess: MessFullWidth, fn: spellFullWidth, in: func(l *Locale) bool { return l.FullWidth }},
	{mess: MessUnicodeMinus, fn: spellUnicodeMinus},
	{mess: MessTrailingMinus, fn: spellTrailingMinus},
	{mess: MessPlusSign, fn: spellPlusSign},
	{mess: MessExponent, fn: spellExponent},
	{mess: MessLeadingZeros, fn: spellLeadingZeros},
	{mess: MessTrailingZeros, fn: spellTrailingZeros},
	{mess: MessEdgeSpace, fn: spellEdgeSpace},
}

var (
	intSpellers     = numberSpellers
	decimalSpellers = append(slices.Clone(numberSpellers), decimalCommaSpeller)
	floatSpellers   = append(slices.Clone(decimalSpellers), localeSpeller{mess: MessPercent, fn: spellPercent,
		in: func(*Locale) bool { return true }, differs: func(a, b *Locale) bool { return a.PercentGap != b.PercentGap || a.Decimal != b.Decimal }})
	decimalCommaSpeller = localeSpeller{mess: MessDecimalComma, fn: spellDecimalComma,
		in: (*Locale).commaDecimal, differs: func(a, b *Locale) bool { return a.Decimal != b.Decimal }}
)

// foreignGroupings are the digit groupings of other sources, named by
// their separator; in reports whether the separator is foreign to the
// column's locale.
var foreignGroupings = []localeSpeller{
	{mess: MessThousandsDot, fn: spellThousandsDot, in: func(l *Locale) bool { return l.Group != "." }},
	{mess: MessThousandsSpace, fn: spellThousandsSpace, in: func(l *Locale) bool { return !slices.Contains(spaceSeparators, l.Group) }},
	{mess: MessThousandsQuote, fn: spellThousandsQuote, in: func(l *Locale) bool { return l.Group != "'" && l.Group != "\u2019" }},
}

// markMess returns m with the decimal-comma mess added when the locale
// being spelled in writes a fraction with a comma.
func (g *colGen) markMess(m Mess, frac string) Mess {
	if frac != "" && g.lc.commaDecimal() {
		return m.and(MessDecimalComma)
	}
	return m
}

// appendGrouped appends integer digits with sep between groups of three.
func appendGrouped(b []byte, intd, sep string) []byte {
	first := len(intd) % 3
	if first == 0 {
		first = 3
	}
	b = append(b, intd[:first]...)
	for i := first; i < len(intd); i += 3 {
		b = append(b, sep...)
		b = append(b, intd[i:i+3]...)
	}
	return b
}

// grouped writes a number with the given group separator and decimal mark.
func grouped(neg bool, intd, frac, sep, mark string) string {
	b := make([]byte, 0, len(intd)*2+len(frac)+4)
	if neg {
		b = append(b, '-')
	}
	b = appendGrouped(b, intd, sep)
	if frac != "" {
		b = append(b, mark...)
		b = append(b, frac...)
	}
	return string(b)
}

func spellThousands(g *colGen, _ *rng, v *value) (string, Mess, bool) {
	if len(v.intd) <= 3 {
		return "", "", false
	}
	s := grouped(false, v.intd, v.frac, g.lc.Group, g.lc.Decimal)
	if v.neg {
		s = g.lc.Minus + s
	}
	return s, g.markMess(MessThousands, v.frac), true
}

func spellThousandsDot(_ *colGen, _ *rng, v *value) (string, Mess, bool) {
	return grouped(v.neg, v.intd, v.frac, ".", ","), MessThousandsDot.and(MessMixedSources), len(v.intd) > 3
}

// Group separators of locales that group with a space: U+0020, U+00A0
// NO-BREAK SPACE (Source: CLDR sv via golang.org/x/text) and U+202F
// NARROW NO-BREAK SPACE (Source: CLDR 41 fr.xml).
var spaceSeparators = []string{" ", "\u00a0", "\u202f"}

func spellThousandsSpace(_ *colGen, r *rng, v *value) (string, Mess, bool) {
	mark := ","
	if r.next()&1 == 1 {
		mark = "."
	}
	return grouped(v.neg, v.intd, v.frac, pick(r, spaceSeparators), mark), MessThousandsSpace.and(MessMixedSources), len(v.intd) > 3
}

func spellThousandsQuote(_ *colGen, r *rng, v *value) (string, Mess, bool) {
	sep := "'"
	if r.next()&1 == 1 {
		sep = "\u2019"
	}
	return grouped(v.neg, v.intd, v.frac, sep, "."), MessThousandsQuote.and(MessMixedSources), len(v.intd) > 3
}

func spellDecimalComma(g *colGen, _ *rng, v *value) (string, Mess, bool) {
	return numberText(v.neg, v.intd, v.frac, ","), MessDecimalComma, v.frac != "" && g.lc.commaDecimal()
}

// money returns the amount's fraction padded to n digits.
func money(frac string, n int) string {
	for len(frac) < n {
		frac += "0"
	}
	return frac
}

// amount writes a non-negative amount in the locale's currency format.
func amount(l *Locale, intd, frac string) string {
	num := string(appendGrouped(nil, intd, l.Group))
	if frac != "" {
		num += l.Decimal + frac
	}
	if l.CurrencyFirst {
		return l.Currency + l.CurrencyGap + num
	}
	return num + l.CurrencyGap + l.Currency
}

func spellCurrency(g *colGen, r *rng, v *value) (string, Mess, bool) {
	l := g.lc
	frac := v.frac
	if l.CurrencyDigits == 0 {
		if strings.Trim(frac, "0") != "" {
			return "", "", false // yen have no minor unit
		}
		frac = ""
	} else if len(frac) < l.CurrencyDigits && (frac != "" || g.kind != fixtures.KindInt64 || r.next()&1 == 1) {
		frac = money(frac, l.CurrencyDigits)
	}
	s := amount(l, v.intd, frac)
	if v.neg {
		if l.NegativeAfterSign && l.CurrencyFirst {
			s = l.Currency + l.Minus + strings.TrimPrefix(s[len(l.Currency):], l.CurrencyGap)
		} else {
			s = l.Minus + s
		}
	}
	return s, g.markMess(MessCurrency, frac), true
}

func spellParentheses(g *colGen, r *rng, v *value) (string, Mess, bool) {
	if !v.neg {
		return "", "", false
	}
	l := g.lc
	if r.next()&1 == 1 && (l.CurrencyDigits > 0 || strings.Trim(v.frac, "0") == "") {
		frac := ""
		if l.CurrencyDigits > 0 {
			frac = money(v.frac, l.CurrencyDigits)
		}
		return "(" + amount(l, v.intd, frac) + ")", g.markMess(MessParentheses.and(MessCurrency), frac), true
	}
	return "(" + grouped(false, v.intd, v.frac, l.Group, l.Decimal) + ")", g.markMess(MessParentheses, v.frac), true
}

func spellUnicodeMinus(g *colGen, _ *rng, v *value) (string, Mess, bool) {
	return "\u2212" + numberText(false, v.intd, v.frac, g.lc.Decimal), g.markMess(MessUnicodeMinus, v.frac), v.neg
}

func spellTrailingMinus(g *colGen, _ *rng, v *value) (string, Mess, bool) {
	return numberText(false, v.intd, v.frac, g.lc.Decimal) + "-", g.markMess(MessTrailingMinus, v.frac), v.neg
}

func spellPlusSign(g *colGen, _ *rng, v *value) (string, Mess, bool) {
	return "+" + numberText(false, v.intd, v.frac, g.lc.Decimal), g.markMess(MessPlusSign, v.frac), !v.neg
}

// fullWidth maps ASCII digits, sign and point to their full-width forms
// U+FF10–U+FF19, U+FF0B, U+FF0D, U+FF0E and U+FF0C (Source: Unicode
// Standard, Halfwidth and Fullwidth Forms block FF00–FFEF).
func fullWidth(s string) string {
	var b strings.Builder
	b.Grow(len(s) * 3)
	for _, c := range s {
		switch {
		case c >= '0' && c <= '9', c == '+', c == '-', c == '.', c == ',':
			b.WriteRune(c - 0x21 + 0xFF01)
		default:
			b.WriteRune(c)
		}
	}
	return b.String()
}

func spellFullWidth(g *colGen, _ *rng, v *value) (string, Mess, bool) {
	return fullWidth(numberText(v.neg, v.intd, v.frac, g.lc.Decimal)), g.markMess(MessFullWidth, v.frac), true
}

func spellExponent(g *colGen, r *rng, v *value) (string, Mess, bool) {
	all := strings.TrimLeft(v.intd+v.frac, "0")
	if all == "" || len(all) > 15 {
		return "", "", false
	}
	var e int
	if v.intd != "0" {
		e = len(v.intd) - 1
	} else {
		e = -(len(v.frac) - len(strings.TrimLeft(v.frac, "0")) + 1)
	}
	mant := all[:1]
	rest := strings.TrimRight(all[1:], "0")
	if rest != "" {
		mant += g.lc.Decimal + rest
	}
	var exp string
	switch r.intn(3) {
	case 0:
		exp = "e" + strconv.Itoa(e)
	case 1:
		exp = "E" + signed(e, 2)
	default:
		exp = "e" + signed(e, 1)
	}
	if v.neg {
		mant = "-" + mant
	}
	return mant + exp, g.markMess(MessExponent, rest), true
}

// signed writes e with a sign and at least width digits: +03, -1.
func signed(e, width int) string {
	s := "+"
	if e < 0 {
		s, e = "-", -e
	}
	d := strconv.Itoa(e)
	for len(d) < width {
		d = "0" + d
	}
	return s + d
}

func spellLeadingZeros(g *colGen, r *rng, v *value) (string, Mess, bool) {
	return numberText(v.neg, strings.Repeat("0", 1+r.intn(3))+v.intd, v.frac, g.lc.Decimal), g.markMess(MessLeadingZeros, v.frac), true
}

func spellTrailingZeros(g *colGen, r *rng, v *value) (string, Mess, bool) {
	zeros := strings.Repeat("0", 1+r.intn(2))
	return numberText(v.neg, v.intd, v.frac+zeros, g.lc.Decimal), g.markMess(MessTrailingZeros, "0"), true
}

func spellPercent(g *colGen, _ *rng, v *value) (string, Mess, bool) {
	frac := v.frac
	for len(frac) < 2 {
		frac += "0"
	}
	intd := strings.TrimLeft(v.intd+frac[:2], "0")
	if intd == "" {
		intd = "0"
	}
	frac = strings.TrimRight(frac[2:], "0")
	s := numberText(false, intd, frac, g.lc.Decimal) + g.lc.PercentGap + "%"
	if v.neg {
		s = g.lc.Minus + s
	}
	return s, g.markMess(MessPercent, frac), true
}

// Edge white space: blanks, tabs and NBSP before or after a value.
var edgeBlanks = []string{" ", "  ", "\t", "\u00a0"}

func edgeSpace(r *rng, s string) string {
	switch r.intn(3) {
	case 0:
		return pick(r, edgeBlanks) + s
	case 1:
		return s + pick(r, edgeBlanks)
	}
	return pick(r, edgeBlanks) + s + pick(r, edgeBlanks)
}

func spellEdgeSpace(_ *colGen, r *rng, v *value) (string, Mess, bool) {
	return edgeSpace(r, v.plain), MessEdgeSpace, true
}

func spellBoolCase(_ *colGen, r *rng, v *value) (string, Mess, bool) {
	if r.next()&1 == 1 {
		return strings.ToUpper(v.plain), MessCase, true
	}
	return strings.ToUpper(v.plain[:1]) + v.plain[1:], MessCase, true
}

var boolSpellers = []localeSpeller{
	{mess: MessCase, fn: spellBoolCase},
	{mess: MessBoolWord, fn: spellBoolWord, in: func(l *Locale) bool { return len(l.BoolWords) > 0 }, differs: func(a, b *Locale) bool {
		return a.BoolWords[0] != b.BoolWords[0]
	}},
	{mess: MessEdgeSpace, fn: spellEdgeSpace},
}

func spellBoolWord(g *colGen, r *rng, v *value) (string, Mess, bool) {
	w := pick(r, g.lc.BoolWords)
	if v.clean.(bool) {
		return w[0], MessBoolWord, true
	}
	return w[1], MessBoolWord, true
}
