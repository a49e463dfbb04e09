package property

import (
	"strconv"
	"strings"

	"github.com/proofsheet/proofsheet/fixtures"
)

// spellersFor lists the spellers that apply to a column's kind.
func spellersFor(g *colGen) []speller {
	switch g.kind {
	case fixtures.KindInt64:
		return []speller{
			{MessThousands, spellThousands}, {MessThousandsDot, spellThousandsDot},
			{MessThousandsSpace, spellThousandsSpace}, {MessThousandsQuote, spellThousandsQuote},
			{MessCurrency, spellCurrency}, {MessParentheses, spellParentheses},
			{MessUnicodeMinus, spellUnicodeMinus}, {MessTrailingMinus, spellTrailingMinus},
			{MessPlusSign, spellPlusSign}, {MessFullWidth, spellFullWidth}, {MessExponent, spellExponent},
			{MessLeadingZeros, spellLeadingZeros}, {MessTrailingZeros, spellTrailingZeros},
			{MessEdgeSpace, spellEdgeSpace},
		}
	case fixtures.KindFloat64, fixtures.KindDecimal:
		sp := []speller{
			{MessThousands, spellThousands}, {MessThousandsDot, spellThousandsDot},
			{MessThousandsSpace, spellThousandsSpace}, {MessThousandsQuote, spellThousandsQuote},
			{MessDecimalComma, spellDecimalComma}, {MessCurrency, spellCurrency},
			{MessParentheses, spellParentheses}, {MessUnicodeMinus, spellUnicodeMinus},
			{MessTrailingMinus, spellTrailingMinus}, {MessPlusSign, spellPlusSign},
			{MessFullWidth, spellFullWidth}, {MessExponent, spellExponent},
			{MessLeadingZeros, spellLeadingZeros}, {MessTrailingZeros, spellTrailingZeros},
			{MessEdgeSpace, spellEdgeSpace},
		}
		if g.kind == fixtures.KindFloat64 {
			sp = append(sp, speller{MessPercent, spellPercent})
		}
		return sp
	case fixtures.KindBool:
		return []speller{{MessCase, spellBoolCase}, {MessBoolWord, spellBoolWord}, {MessEdgeSpace, spellEdgeSpace}}
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

func spellThousands(_ *colGen, _ *rng, v *value) (string, Mess, bool) {
	return grouped(v.neg, v.intd, v.frac, ",", "."), MessThousands, len(v.intd) > 3
}

func spellThousandsDot(_ *colGen, _ *rng, v *value) (string, Mess, bool) {
	return grouped(v.neg, v.intd, v.frac, ".", ","), MessThousandsDot, len(v.intd) > 3
}

// Group separators of locales that group with a space: U+0020, U+00A0
// NO-BREAK SPACE and U+202F NARROW NO-BREAK SPACE (Source: Unicode CLDR
// number symbols, from memory).
var spaceSeparators = []string{" ", "\u00a0", "\u202f"}

func spellThousandsSpace(_ *colGen, r *rng, v *value) (string, Mess, bool) {
	mark := ","
	if r.next()&1 == 1 {
		mark = "."
	}
	return grouped(v.neg, v.intd, v.frac, pick(r, spaceSeparators), mark), MessThousandsSpace, len(v.intd) > 3
}

func spellThousandsQuote(_ *colGen, r *rng, v *value) (string, Mess, bool) {
	sep := "'"
	if r.next()&1 == 1 {
		sep = "\u2019"
	}
	return grouped(v.neg, v.intd, v.frac, sep, "."), MessThousandsQuote, len(v.intd) > 3
}

func spellDecimalComma(_ *colGen, _ *rng, v *value) (string, Mess, bool) {
	return grouped(v.neg, v.intd, v.frac, "", ","), MessDecimalComma, v.frac != ""
}

// currencyStyle is one way a currency amount is written.
type currencyStyle struct {
	sym         string
	prefix      bool // symbol before the number
	space       bool // a space between symbol and number
	group, mark string
	whole       bool // the currency has no minor unit here
}

// Currency layouts seen in exports; common practice, no published source.
var currencyStyles = []currencyStyle{
	{sym: "$", prefix: true, group: ",", mark: "."},
	{sym: "£", prefix: true, group: ",", mark: "."},
	{sym: "€", prefix: true, group: ",", mark: "."},
	{sym: "€", space: true, group: ".", mark: ","},
	{sym: "CHF", prefix: true, space: true, group: "'", mark: "."},
	{sym: "kr", space: true, group: "\u00a0", mark: ","},
	{sym: "USD", space: true, group: ",", mark: "."},
	{sym: "¥", prefix: true, group: ",", mark: ".", whole: true},
}

// money returns the amount's fraction padded to two digits.
func money(frac string) string {
	for len(frac) < 2 {
		frac += "0"
	}
	return frac
}

func (cs currencyStyle) write(neg bool, intd, frac string, r *rng) string {
	num := string(appendGrouped(nil, intd, cs.group))
	if frac != "" {
		num += cs.mark + frac
	}
	gap := ""
	if cs.space {
		gap = " "
	}
	if cs.prefix {
		if neg {
			if r.next()&1 == 1 {
				return cs.sym + gap + "-" + num
			}
			return "-" + cs.sym + gap + num
		}
		return cs.sym + gap + num
	}
	if neg {
		num = "-" + num
	}
	return num + gap + cs.sym
}

func spellCurrency(g *colGen, r *rng, v *value) (string, Mess, bool) {
	cs := pick(r, currencyStyles)
	frac := v.frac
	if cs.whole {
		if frac != "" {
			return "", "", false
		}
	} else if len(frac) < 2 && (frac != "" || g.kind != fixtures.KindInt64 || r.next()&1 == 1) {
		frac = money(frac)
	}
	return cs.write(v.neg, v.intd, frac, r), MessCurrency, true
}

func spellParentheses(g *colGen, r *rng, v *value) (string, Mess, bool) {
	if !v.neg {
		return "", "", false
	}
	if r.next()&1 == 1 {
		cs := currencyStyles[r.intn(3)] // a prefix symbol
		return "(" + cs.write(false, v.intd, money(v.frac), r) + ")", MessParentheses.and(MessCurrency), true
	}
	return "(" + grouped(false, v.intd, v.frac, ",", ".") + ")", MessParentheses, true
}

func spellUnicodeMinus(_ *colGen, _ *rng, v *value) (string, Mess, bool) {
	return "\u2212" + numberText(false, v.intd, v.frac), MessUnicodeMinus, v.neg
}

func spellTrailingMinus(_ *colGen, _ *rng, v *value) (string, Mess, bool) {
	return numberText(false, v.intd, v.frac) + "-", MessTrailingMinus, v.neg
}

func spellPlusSign(_ *colGen, _ *rng, v *value) (string, Mess, bool) {
	return "+" + numberText(false, v.intd, v.frac), MessPlusSign, !v.neg
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

func spellFullWidth(_ *colGen, _ *rng, v *value) (string, Mess, bool) {
	return fullWidth(numberText(v.neg, v.intd, v.frac)), MessFullWidth, true
}

func spellExponent(_ *colGen, r *rng, v *value) (string, Mess, bool) {
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
	if rest := strings.TrimRight(all[1:], "0"); rest != "" {
		mant += "." + rest
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
	return mant + exp, MessExponent, true
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

func spellLeadingZeros(_ *colGen, r *rng, v *value) (string, Mess, bool) {
	return numberText(v.neg, strings.Repeat("0", 1+r.intn(3))+v.intd, v.frac), MessLeadingZeros, true
}

func spellTrailingZeros(g *colGen, r *rng, v *value) (string, Mess, bool) {
	zeros := strings.Repeat("0", 1+r.intn(2))
	return numberText(v.neg, v.intd, v.frac+zeros), MessTrailingZeros, true
}

func spellPercent(_ *colGen, r *rng, v *value) (string, Mess, bool) {
	frac := v.frac
	for len(frac) < 2 {
		frac += "0"
	}
	intd := strings.TrimLeft(v.intd+frac[:2], "0")
	if intd == "" {
		intd = "0"
	}
	frac = strings.TrimRight(frac[2:], "0")
	return numberText(v.neg, intd, frac) + pick(r, percentSigns), MessPercent, true
}

var percentSigns = []string{"%", " %", "\u00a0%"}

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

// Bool word pairs (true, false) of spreadsheet and form exports; common
// practice, no published source.
var boolWords = [][2]string{{"yes", "no"}, {"Yes", "No"}, {"Y", "N"}, {"y", "n"}, {"1", "0"}, {"T", "F"}, {"on", "off"}}

func spellBoolWord(_ *colGen, r *rng, v *value) (string, Mess, bool) {
	w := pick(r, boolWords)
	if v.clean.(bool) {
		return w[0], MessBoolWord, true
	}
	return w[1], MessBoolWord, true
}
