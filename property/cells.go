package property

import (
	"fmt"
	"math"
	"math/big"
	"slices"
	"strconv"
	"strings"
	"time"

	"github.com/proofsheet/proofsheet/fixtures"
)

// Messy is one raw cell as a chain reads it from a file, with the clean
// value it spells.
//
// Raw holds the cell's text as the file holds it once decoded (it may hold
// invalid UTF-8 on purpose). Clean is the value Raw stands for, of the Go
// type fixtures.Builder takes for the column: nil for null, or a bool,
// int64, float64, string (string and category), time.Time (date: midnight
// UTC; timestamp) or fixtures.Decimal. Mess says how Raw departs from the
// plain spelling; MessNone when it does not.
//
// A cell whose Raw is "" and whose Clean is nil is null in a raw table
// and an unquoted empty field in a CSV file; an empty Raw with a non-nil
// Clean (the empty string) is an empty string, quoted "" in CSV.
type Messy struct {
	Raw   string
	Clean any
	Mess  Mess
}

// IsNull reports whether the raw cell is null: an empty Raw with a nil
// Clean.
func (m Messy) IsNull() bool { return m.Raw == "" && m.Clean == nil }

// Spell returns the plain spelling of a clean value for a column of type t:
// the literal table spelling (see fixtures.Parse) without quotes, or
// ok == false for nil (null). Timestamps are written in the column's zone
// with their offset, zone-less ones without.
func Spell(clean any, t fixtures.Type) (s string, ok bool) {
	if clean == nil {
		return "", false
	}
	switch v := clean.(type) {
	case bool:
		return strconv.FormatBool(v), true
	case int64:
		return strconv.FormatInt(v, 10), true
	case int:
		return strconv.Itoa(v), true
	case float64:
		return fixtures.FormatFloat(v), true
	case string:
		return v, true
	case fixtures.Decimal:
		if t.Kind() == fixtures.KindDecimal {
			if d, err := v.Rescale(t.Scale()); err == nil {
				return d.String(), true
			}
		}
		return v.String(), true
	case time.Time:
		if t.Kind() == fixtures.KindDate {
			var buf [10]byte
			return string(appendDate(buf[:0], v)), true
		}
		return formatTimestamp(v, t), true
	}
	return "", false
}

// formatTimestamp writes v as fixtures writes a timestamp of type t:
// 2006-01-02T15:04:05 with the unit's fraction, trailing zeros dropped,
// then nothing (zone-less), Z (UTC) or the offset of v's zone.
func formatTimestamp(v time.Time, t fixtures.Type) string {
	zone := t.Zone()
	if zone == "UTC" || zone == "Z" {
		v = v.UTC()
	}
	var buf [40]byte
	b := appendDate(buf[:0], v)
	hh, mm, ss := v.Clock()
	b = append(b, 'T', byte('0'+hh/10), byte('0'+hh%10), ':', byte('0'+mm/10), byte('0'+mm%10), ':', byte('0'+ss/10), byte('0'+ss%10))
	if digits := int(t.Unit()) * 3; digits > 0 && v.Nanosecond() != 0 {
		ns := v.Nanosecond()
		var frac [9]byte
		for i := 8; i >= 0; i-- {
			frac[i] = byte('0' + ns%10)
			ns /= 10
		}
		f := frac[:digits]
		for len(f) > 0 && f[len(f)-1] == '0' {
			f = f[:len(f)-1]
		}
		if len(f) > 0 {
			b = append(b, '.')
			b = append(b, f...)
		}
	}
	switch zone {
	case "":
	case "UTC", "Z":
		b = append(b, 'Z')
	default:
		_, off := v.Zone()
		sign := byte('+')
		if off < 0 {
			sign, off = '-', -off
		}
		h, m := off/3600, off/60%60
		b = append(b, sign, byte('0'+h/10), byte('0'+h%10), ':', byte('0'+m/10), byte('0'+m%10))
	}
	return string(b)
}

// appendDate appends the calendar day of t as YYYY-MM-DD (years 1 to 9999).
func appendDate(b []byte, t time.Time) []byte {
	y, m, d := t.Date()
	return append(b, byte('0'+y/1000), byte('0'+y/100%10), byte('0'+y/10%10), byte('0'+y%10), '-',
		byte('0'+int(m)/10), byte('0'+int(m)%10), '-', byte('0'+d/10), byte('0'+d%10))
}

// value is a clean value being spelled, with the parts the spellers use.
type value struct {
	clean any
	plain string
	mess  Mess   // a mess of the value itself (extreme, long, line endings)
	fixed bool   // the value has its raw spelling already; no further mess
	raw   string // that raw spelling, when fixed

	// numbers: sign, integer digits without leading zeros ("0" for zero)
	// and fractional digits
	neg        bool
	intd, frac string

	// dates and timestamps: the wall clock in the column's zone
	t time.Time

	// text: the clean text
	text string
}

// colGen makes the cells of one column.
type colGen struct {
	field      fixtures.Field
	kind       fixtures.Kind
	cfg        *config
	cc         *colConf
	lc         *Locale // the locale being spelled in (the column's, or another for mixed sources)
	nullTokens []string
	sentinels  []string
	sentNums   []float64 // numeric sentinels a value must not equal
	spellers   []speller
	edge       bool // edge space may be added on top of another mess
	levels     []level
	tz         *time.Location
	maxToken   int   // the longest null token or sentinel, in bytes
	tmp        value // scratch for the value being spelled; a colGen makes one cell at a time

	// uniqueness: values taken so far, and the last of a sequence
	used    map[any]struct{}
	seq     int64
	seqDone bool
}

// speller spells v in one messy way; ok is false when the mess does not
// apply to this value. It may return a compound mess.
type speller struct {
	mess Mess
	fn   func(g *colGen, r *rng, v *value) (raw string, m Mess, ok bool)
}

// newColGen makes the generator of schema column f; cc is its compiled
// rules, or nil for a column outside the schema (an extra column), which
// takes the file's options.
func newColGen(f fixtures.Field, c *config, cc *colConf) *colGen {
	if cc == nil {
		var err error
		cc, err = compileColumn(f, fixtures.Schema{f}, Rules{}, c)
		if err != nil {
			panic(fmt.Sprintf("property: internal error: %v", err)) // a string column without rules always compiles
		}
	}
	g := &colGen{field: f, kind: f.Type.Kind(), cfg: c, cc: cc, lc: cc.lc}
	if z := f.Type.Zone(); z != "" && z != "UTC" && z != "Z" {
		g.tz, _ = time.LoadLocation(z) // the schema was validated
	}
	if cc.unique != AnyValues {
		g.used = map[any]struct{}{}
	}
	if g.kind == fixtures.KindCategory {
		names := c.levels[f.Name]
		if len(cc.choices) > 0 {
			names = nil
			for _, ch := range cc.choices {
				names = append(names, ch.clean.(string))
			}
		}
		if names == nil {
			names = houseNames
		}
		g.levels = makeLevels(names)
	}
	// Null spellings: drop tokens a value could take.
	if cc.allowed[MessNullToken] {
		for _, tok := range cc.nullTokens {
			if tok == "" || g.couldBeValue(tok) {
				continue
			}
			g.nullTokens = append(g.nullTokens, tok)
		}
	}
	if cc.sentinelRate > 0 {
		list := cc.sentinels
		if list == nil {
			switch {
			case g.kind.IsNumeric():
				list = append(append([]string{}, numberSentinels...), textSentinels...)
			case g.kind == fixtures.KindDate || g.kind == fixtures.KindTimestamp:
				list = append(append([]string{}, dateSentinels...), textSentinels...)
			default:
				list = textSentinels
			}
		}
		for _, s := range list {
			if g.kind.IsText() && g.couldBeValue(s) {
				continue
			}
			g.sentinels = append(g.sentinels, s)
			if g.kind.IsNumeric() {
				if f, err := strconv.ParseFloat(strings.TrimSpace(s), 64); err == nil {
					g.sentNums = append(g.sentNums, f)
				}
			}
		}
	}
	for _, t := range append(append([]string{}, g.nullTokens...), g.sentinels...) {
		g.maxToken = max(g.maxToken, len(t))
	}
	g.spellers = spellersOf(g)
	g.edge = cc.allowed[MessEdgeSpace] && c.level == Heavy
	return g
}

// couldBeValue reports whether a token could be the spelling of a value of
// the column, so that it must not mean null there.
func (g *colGen) couldBeValue(tok string) bool {
	switch g.kind {
	case fixtures.KindFloat64:
		_, err := strconv.ParseFloat(strings.TrimSpace(tok), 64)
		return err == nil
	case fixtures.KindCategory:
		for _, l := range g.levels {
			if strings.EqualFold(l.name, strings.TrimSpace(tok)) {
				return true
			}
		}
	case fixtures.KindString:
		for _, ch := range g.cc.choices {
			if strings.EqualFold(ch.plain, strings.TrimSpace(tok)) {
				return true
			}
		}
	}
	// Generated strings are redrawn when they equal a token (see
	// stringValue), so tokens stay null in string columns.
	return false
}

// allowedMess reports whether a speller's spelling m (with primary mess
// primary) keeps to the column's messes: every part is allowed or comes
// with the primary one. A two-digit year comes with its date order, a
// twelve-hour clock with month-first dates, and in a locale whose decimal mark is a comma any number mess with
// decimal-comma, unless the column avoids it.
func (g *colGen) allowedMess(primary, m Mess) bool {
	if m == primary {
		return true // spellers are chosen among the column's messes
	}
	for _, p := range m.Parts() {
		if g.cc.allowed[p] || p == primary {
			continue
		}
		switch {
		case primary == MessTwoDigitYear && (p == MessDayFirst || p == MessMonthFirst),
			primary == MessTwelveHour && p == MessMonthFirst,
			p == MessDecimalComma && g.kind.IsNumeric() && !g.cc.avoidComma:
			continue
		}
		return false
	}
	return true
}

// next makes one cell.
func (g *colGen) next(r *rng) Messy {
	cc := g.cc
	if r.chance(cc.nullRate) {
		return g.null(r)
	}
	if len(g.sentinels) > 0 && r.chance(cc.sentinelRate) {
		if s := pick(r, g.sentinels); g.cfg.fits == nil || g.cfg.fits(s) {
			return Messy{Raw: s, Mess: MessSentinel}
		}
	}
	v := &g.tmp
	*v = value{}
	g.value(r, v)
	return g.spell(r, v)
}

// null makes a null cell: the empty field or one of the null tokens.
func (g *colGen) null(r *rng) Messy {
	if len(g.nullTokens) > 0 && r.chance(g.cc.messRate) {
		tok := pick(r, g.nullTokens)
		if g.cfg.fits == nil || g.cfg.fits(tok) {
			return Messy{Raw: tok, Mess: MessNullToken}
		}
	}
	return Messy{}
}

// spell spells a value, messily with probability MessRate. In a locale
// whose decimal mark is a comma, a number with a fraction is never written
// with a point (which would read as a digit group there).
func (g *colGen) spell(r *rng, v *value) Messy {
	m := Messy{Raw: v.plain, Clean: v.clean, Mess: v.mess}
	if v.fixed {
		m.Raw = v.raw
		return m
	}
	if len(g.spellers) > 0 && r.chance(g.cc.messRate) {
		for try := 0; try < 4; try++ {
			sp := g.spellers[r.intn(len(g.spellers))]
			raw, mess, ok := sp.fn(g, r, v)
			g.lc = g.cc.lc
			if !ok || raw == v.plain || !g.allowedMess(sp.mess, mess) || (g.cfg.fits != nil && !g.cfg.fits(raw)) {
				continue
			}
			m.Raw, m.Mess = raw, m.Mess.and(mess)
			break
		}
	}
	if m.Mess == MessNone && v.frac != "" && g.kind.IsNumeric() && g.lc.commaDecimal() && g.cc.commaPlain {
		m.Raw, m.Mess = numberText(v.neg, v.intd, v.frac, ","), MessDecimalComma
	}
	if g.edge && m.Mess != MessNone && !m.Mess.Has(MessEdgeSpace) && r.chance(0.2) {
		if raw := edgeSpace(r, m.Raw); g.cfg.fits == nil || g.cfg.fits(raw) {
			m.Raw, m.Mess = raw, m.Mess.and(MessEdgeSpace)
		}
	}
	return m
}

// respell spells a cell's clean value anew (for a re-exported duplicate).
func (g *colGen) respell(r *rng, m Messy) Messy {
	if m.Clean == nil {
		if m.Mess == MessSentinel {
			return m
		}
		return g.null(r)
	}
	return g.spellClean(r, m)
}

// spellClean spells the clean value of m (a value this column could
// hold) anew; m comes back unchanged when its value has a fixed spelling.
func (g *colGen) spellClean(r *rng, m Messy) Messy {
	v, ok := g.valueOf(m)
	if !ok {
		return m
	}
	g.tmp = v
	return g.spell(r, &g.tmp)
}

// derived makes the cell of a derived column from the clean values of its
// record (rec, in schema order, holding every column it reads); fast holds
// the same values as small fractions where known (see fastderive.go).
func (g *colGen) derived(r *rng, rec []any, fast []frac) Messy {
	if r.chance(g.cc.nullRate) {
		return g.null(r)
	}
	if fast != nil {
		if f := g.cc.derive.evalFast(fast); f.ok {
			v := &g.tmp
			*v = value{}
			if g.derivedFast(f, v) {
				return g.spell(r, v)
			}
		}
	}
	val, ok := g.cc.derive.eval(rec)
	if !ok {
		return g.null(r)
	}
	clean, ok := g.fromRat(val)
	if !ok {
		return g.null(r)
	}
	plain, _ := Spell(clean, g.field.Type)
	return g.spellClean(r, Messy{Raw: plain, Clean: clean})
}

// fromRat turns an exact number into a clean value of the column, rounded
// to its decimals half away from zero; ok is false when it does not fit.
func (g *colGen) fromRat(x *big.Rat) (any, bool) {
	units := roundRat(x, g.cc.maxDec)
	switch g.kind {
	case fixtures.KindInt64:
		if !units.IsInt64() {
			return nil, false
		}
		return units.Int64(), true
	case fixtures.KindFloat64:
		f, _ := new(big.Rat).SetFrac(units, new(big.Int).Exp(big.NewInt(10), big.NewInt(int64(g.cc.maxDec)), nil)).Float64()
		if math.IsInf(f, 0) {
			return nil, false
		}
		return f, true
	case fixtures.KindDecimal:
		t := g.field.Type
		units.Mul(units, new(big.Int).Exp(big.NewInt(10), big.NewInt(int64(t.Scale()-g.cc.maxDec)), nil))
		if !units.IsInt64() {
			return nil, false
		}
		d := fixtures.NewDecimal(units.Int64(), t.Scale())
		if d.Digits() > t.Precision() {
			return nil, false
		}
		return d, true
	}
	return nil, false
}

// valueOf rebuilds the spelling parts of a cell's clean value.
func (g *colGen) valueOf(m Messy) (value, bool) {
	plain, ok := Spell(m.Clean, g.field.Type)
	if !ok {
		return value{}, false
	}
	v := value{clean: m.Clean, plain: plain}
	if m.Mess.Has(MessExtreme) || m.Mess.Has(MessLong) || m.Mess.Has(MessLineEndings) {
		return value{}, false
	}
	switch g.kind {
	case fixtures.KindInt64, fixtures.KindFloat64, fixtures.KindDecimal:
		s := plain
		if strings.ContainsAny(s, "eEIN") { // exponent or non-finite: no digit parts
			return value{}, false
		}
		v.neg = strings.HasPrefix(s, "-")
		s = strings.TrimPrefix(s, "-")
		v.intd, v.frac, _ = strings.Cut(s, ".")
	case fixtures.KindDate, fixtures.KindTimestamp:
		v.t = m.Clean.(time.Time)
		if g.tz != nil {
			v.t = v.t.In(g.tz)
		}
	case fixtures.KindString, fixtures.KindCategory:
		v.text = m.Clean.(string)
	}
	return v, true
}

// value draws a clean value.
func (g *colGen) value(r *rng, v *value) {
	if len(g.cc.choices) > 0 && g.kind != fixtures.KindCategory {
		g.choiceValue(r, v)
		return
	}
	switch g.kind {
	case fixtures.KindBool:
		b := r.next()&1 == 1
		v.clean, v.plain = b, strconv.FormatBool(b)
	case fixtures.KindInt64:
		g.intValue(r, v)
	case fixtures.KindFloat64:
		g.floatValue(r, v)
	case fixtures.KindDecimal:
		g.decimalValue(r, v)
	case fixtures.KindDate:
		g.dateValue(r, v)
	case fixtures.KindTimestamp:
		g.timestampValue(r, v)
	case fixtures.KindString:
		g.stringValue(r, v)
	case fixtures.KindCategory:
		g.categoryValue(r, v)
	}
}

// pickChoice draws the index of an allowed value by weight.
func (cc *colConf) pickChoice(r *rng) int {
	x := r.float() * cc.total
	i, _ := slices.BinarySearchFunc(cc.choices, x, func(c choiceConf, x float64) int {
		if c.cum <= x {
			return -1
		}
		return 1
	})
	return min(i, len(cc.choices)-1)
}

// choiceValue draws one of the column's allowed values.
func (g *colGen) choiceValue(r *rng, v *value) {
	ch := g.cc.choices[g.cc.pickChoice(r)]
	if mv, ok := g.valueOf(Messy{Raw: ch.plain, Clean: ch.clean}); ok {
		*v = mv
		return
	}
	// A value with no digit parts (Inf, NaN): spelled as it is.
	v.clean, v.plain, v.raw, v.fixed = ch.clean, ch.plain, ch.plain, true
}

func (g *colGen) categoryValue(r *rng, v *value) {
	var i int
	switch {
	case g.used != nil:
		i = r.intn(len(g.levels))
		for try := 0; ; try++ {
			if _, taken := g.used[g.levels[i].name]; !taken {
				break
			}
			if try < 16 {
				i = r.intn(len(g.levels))
			} else {
				i = (i + 1) % len(g.levels)
			}
			if try > 16+len(g.levels) {
				break // every level taken: the capacity check should have refused
			}
		}
		g.used[g.levels[i].name] = struct{}{}
	case len(g.cc.choices) > 0:
		i = g.cc.pickChoice(r)
	default:
		i = r.intn(len(g.levels))
	}
	l := &g.levels[i]
	v.clean, v.plain, v.text = l.name, l.name, l.name
}

// digits appends n random decimal digits, the first not 0 when lead.
func digits(b []byte, r *rng, n int, lead bool) []byte {
	for i := 0; i < n; i++ {
		d := byte(r.intn(10))
		if i == 0 && lead && n > 1 {
			d = byte(1 + r.intn(9))
		}
		b = append(b, '0'+d)
	}
	return b
}

// drawNumber draws sign, integer digits (at most maxInt) and fractional
// digits (at most maxFrac, exactly maxFrac when exact).
func (g *colGen) drawNumber(r *rng, v *value, maxInt, maxFrac int, exact bool) {
	var buf [40]byte
	b := buf[:0]
	n := 0
	if maxInt > 0 && r.intn(4) != 0 {
		n = 1 + r.intn(maxInt)
	}
	if n == 0 {
		b = append(b, '0')
	} else {
		b = digits(b, r, n, true)
	}
	split := len(b)
	f := maxFrac
	if !exact && maxFrac > 0 {
		f = r.intn(maxFrac + 1)
	}
	b = digits(b, r, f, false)
	intd, frac := b[:split], b[split:]
	if !exact {
		for len(frac) > 0 && frac[len(frac)-1] == '0' {
			frac = frac[:len(frac)-1]
		}
	}
	v.neg = r.intn(10) < 3 && !(len(intd) == 1 && intd[0] == '0' && strings.Trim(string(frac), "0") == "")
	s := string(b[:split+len(frac)])
	v.intd, v.frac = s[:split], s[split:]
}

// pow10s are the powers of ten an int64 holds.
var pow10s = func() [19]int64 {
	var p [19]int64
	p[0] = 1
	for i := 1; i < len(p); i++ {
		p[i] = p[i-1] * 10
	}
	return p
}()

func abs64(x int64) int64 {
	if x < 0 {
		return -x
	}
	return x
}

// drawUnits draws a number of units of 10^-d between the column's bounds:
// half the time uniformly, half the time with a uniformly drawn number of
// digits, so that small and large magnitudes both occur.
func (g *colGen) drawUnits(r *rng, d int) int64 {
	lo, hi := g.cc.unitLo[d], g.cc.unitHi[d]
	if r.next()&1 == 0 {
		return r.between(lo, hi)
	}
	top := max(abs64(lo), abs64(hi))
	nd := 1
	for nd < 18 && pow10s[nd] <= top {
		nd++
	}
	k := 1 + r.intn(nd)
	var x int64
	if k == 1 {
		x = r.between(0, 9)
	} else {
		x = r.between(pow10s[k-1], pow10s[k]-1)
	}
	if lo < 0 && (hi <= 0 || r.intn(10) < 3) {
		x = -x
	}
	if x < lo || x > hi {
		return r.between(lo, hi)
	}
	return x
}

// setUnits sets v's digit parts to u units of 10^-d; the fraction keeps d
// digits when exact, else loses its trailing zeros.
func setUnits(v *value, u int64, d int, exact bool) {
	v.neg = u < 0
	var buf [24]byte
	b := strconv.AppendInt(buf[:0], abs64(u), 10)
	for len(b) < d+1 {
		b = append([]byte{'0'}, b...)
	}
	intd, frac := b[:len(b)-d], b[len(b)-d:]
	if !exact {
		for len(frac) > 0 && frac[len(frac)-1] == '0' {
			frac = frac[:len(frac)-1]
		}
	}
	s := string(b[:len(intd)+len(frac)])
	v.intd, v.frac = s[:len(intd)], s[len(intd):]
	if v.intd == "0" && strings.Trim(v.frac, "0") == "" {
		v.neg = false
	}
}

// numberText writes sign, integer digits and fraction as a number with the
// given decimal mark.
func numberText(neg bool, intd, frac, mark string) string {
	b := make([]byte, 0, len(intd)+len(frac)+4)
	if neg {
		b = append(b, '-')
	}
	b = append(b, intd...)
	if frac != "" {
		b = append(b, mark...)
		b = append(b, frac...)
	}
	return string(b)
}

func (g *colGen) isSentinel(f float64) bool {
	for _, s := range g.sentNums {
		if s == f {
			return true
		}
	}
	return false
}

// taken reports whether a unique column already has the value key, and
// takes it when not.
func (g *colGen) taken(key any) bool {
	if g.used == nil {
		return false
	}
	if _, ok := g.used[key]; ok {
		return true
	}
	g.used[key] = struct{}{}
	return false
}

// nextInSequence returns the next value of a sequential or gapped column.
func (g *colGen) nextInSequence(r *rng) int64 {
	if !g.seqDone {
		g.seq, g.seqDone = g.cc.start, true
		return g.seq
	}
	step := int64(1)
	if g.cc.unique == Gapped && r.chance(0.2) {
		step += 1 + int64(r.intn(9))
	}
	g.seq += step
	return g.seq
}

// numberTries bounds the draws of a value that must avoid sentinels or
// values already taken before the generator steps to a free value.
const numberTries = 16

func (g *colGen) intValue(r *rng, v *value) {
	cc := g.cc
	if cc.extremeRate > 0 && r.chance(cc.extremeRate) {
		x := int64(math.MaxInt64)
		if r.next()&1 == 1 {
			x = math.MinInt64
		}
		v.clean, v.plain, v.mess, v.fixed = x, strconv.FormatInt(x, 10), MessExtreme, true
		v.raw = v.plain
		return
	}
	if cc.unique == Sequential || cc.unique == Gapped {
		x := g.nextInSequence(r)
		setUnits(v, x, 0, true)
		v.clean, v.plain = x, strconv.FormatInt(x, 10)
		return
	}
	var x int64
	for try := 0; ; try++ {
		if cc.bounded {
			x = g.drawUnits(r, 0)
		} else {
			g.drawNumber(r, v, cc.maxInt, 0, true)
			x, _ = strconv.ParseInt(v.intd, 10, 64)
			if v.neg {
				x = -x
			}
		}
		if try >= numberTries && g.used != nil {
			x = g.freeUnits(x, 0)
		}
		if (len(g.sentNums) > 0 && g.isSentinel(float64(x)) || g.used != nil && g.isUsed(x)) && try < numberTries {
			continue
		}
		g.taken(x)
		break
	}
	setUnits(v, x, 0, true)
	v.clean, v.plain = x, strconv.FormatInt(x, 10)
}

func (g *colGen) isUsed(key any) bool {
	_, ok := g.used[key]
	return ok
}

// freeUnits steps from x (units of 10^-d) to the nearest free value of a
// unique number column, upward and wrapping at the upper bound.
func (g *colGen) freeUnits(x int64, d int) int64 {
	lo, hi := int64(math.MinInt64/4), int64(math.MaxInt64/4)
	if g.cc.bounded {
		lo, hi = g.cc.unitLo[d], g.cc.unitHi[d]
	}
	key := func(u int64) any {
		switch g.kind {
		case fixtures.KindFloat64:
			f, _ := strconv.ParseFloat(unitsText(u, d), 64)
			return f
		case fixtures.KindDecimal:
			var v value
			setUnits(&v, u, d, true)
			for len(v.frac) < g.field.Type.Scale() {
				v.frac += "0"
			}
			return numberText(v.neg, v.intd, v.frac, ".")
		}
		return u
	}
	for n := int64(0); n <= hi-lo; n++ {
		u := x + n
		if u > hi {
			u = lo + (u - hi - 1)
		}
		if !g.isUsed(key(u)) {
			return u
		}
	}
	return x
}

// unitsText writes u units of 10^-d as a plain number.
func unitsText(u int64, d int) string {
	var v value
	setUnits(&v, u, d, true)
	return numberText(v.neg, v.intd, v.frac, ".")
}

func (g *colGen) floatValue(r *rng, v *value) {
	cc := g.cc
	if cc.extremeRate > 0 && r.chance(cc.extremeRate) {
		if g.extremeValue(r, v) {
			return
		}
	}
	for try := 0; ; try++ {
		if cc.bounded {
			d := cc.maxDec
			if d > 0 {
				d = r.intn(d + 1)
			}
			if cc.unitLo[d] > cc.unitHi[d] { // no value with so few decimals in range
				d = cc.maxDec
			}
			u := g.drawUnits(r, d)
			if try >= numberTries && g.used != nil {
				d = cc.maxDec
				u = g.freeUnits(g.drawUnits(r, d), d)
			}
			setUnits(v, u, d, false)
		} else {
			g.drawNumber(r, v, cc.maxInt, min(cc.maxDec, max(0, 15-cc.maxInt)), false)
		}
		x, _ := strconv.ParseFloat(numberText(v.neg, v.intd, v.frac, "."), 64)
		if (len(g.sentNums) > 0 && g.isSentinel(x) || g.used != nil && g.isUsed(x)) && try < numberTries+1 {
			continue
		}
		g.taken(x)
		v.clean, v.plain = x, fixtures.FormatFloat(x)
		return
	}
}

// extremeValue draws an extreme float64 with a spelling the column's
// locale can carry; false when it has none.
func (g *colGen) extremeValue(r *rng, v *value) bool {
	e := extremeFloats[r.intn(len(extremeFloats))]
	sp := pick(r, e.spellings)
	mess := MessExtreme
	if g.lc.commaDecimal() && strings.Contains(sp, ".") {
		if !g.cc.allowed[MessDecimalComma] {
			return false
		}
		sp = strings.Replace(sp, ".", ",", 1)
		mess = mess.and(MessDecimalComma)
	}
	v.clean, v.plain, v.mess, v.fixed = e.v, fixtures.FormatFloat(e.v), mess, true
	v.raw = sp
	return true
}

func (g *colGen) decimalValue(r *rng, v *value) {
	cc := g.cc
	t := g.field.Type
	for try := 0; ; try++ {
		if cc.bounded {
			u := g.drawUnits(r, cc.maxDec)
			if try >= numberTries && g.used != nil {
				u = g.freeUnits(u, cc.maxDec)
			}
			setUnits(v, u, cc.maxDec, true)
			for len(v.frac) < t.Scale() {
				v.frac += "0"
			}
		} else {
			g.drawNumber(r, v, cc.maxInt, cc.maxDec, true)
			for len(v.frac) < t.Scale() {
				v.frac += "0"
			}
		}
		plain := numberText(v.neg, v.intd, v.frac, ".")
		if len(g.sentNums) > 0 && try < numberTries {
			if f, err := strconv.ParseFloat(plain, 64); err == nil && g.isSentinel(f) {
				continue
			}
		}
		if g.used != nil && g.isUsed(plain) && try < numberTries+1 {
			continue
		}
		g.taken(plain)
		var d fixtures.Decimal
		if u, err := strconv.ParseInt(v.intd+v.frac, 10, 64); err == nil {
			if v.neg {
				u = -u
			}
			d = fixtures.NewDecimal(u, t.Scale()) // up to 18 digits: no big numbers
		} else if d, err = fixtures.ParseDecimal(plain); err != nil {
			d = fixtures.NewDecimal(0, t.Scale()) // cannot happen: plain is digits
		}
		v.clean, v.plain = d, plain
		return
	}
}

// extremeFloat is one extreme float64 and ways files spell it.
type extremeFloat struct {
	v         float64
	spellings []string
}

// The extreme float64 values: IEEE 754 binary64 infinities, NaN, negative
// zero, the smallest subnormal, the largest subnormal, the smallest normal
// and the largest finite value (Source: IEEE 754-2019 §3.4; the decimal
// spellings are those of Go's strconv shortest round trip).
var extremeFloats = []extremeFloat{
	{math.Inf(1), []string{"+Inf", "Inf", "inf", "INF", "Infinity", "+infinity"}},
	{math.Inf(-1), []string{"-Inf", "-inf", "-INF", "-Infinity"}},
	{math.NaN(), []string{"NaN", "NAN"}},
	{math.Copysign(0, -1), []string{"-0", "-0.0", "-0.00"}},
	{math.SmallestNonzeroFloat64, []string{"5e-324", "4.9406564584124654e-324", "4.9e-324"}},
	{math.Float64frombits(0x000fffffffffffff), []string{"2.225073858507201e-308", "2.2250738585072009e-308"}},
	{0x1p-1022, []string{"2.2250738585072014e-308"}},
	{math.MaxFloat64, []string{"1.7976931348623157e+308", "1.7976931348623157e308", "1.7976931348623157E+308"}},
	{-math.MaxFloat64, []string{"-1.7976931348623157e+308", "-1.7976931348623157E308"}},
}

func (g *colGen) dateValue(r *rng, v *value) {
	cc := g.cc
	first, last := floorDiv(cc.from, 86400), floorDiv(cc.to, 86400)
	for try := 0; ; try++ {
		day := floorDiv(r.between(cc.from, cc.to), 86400)
		if try >= numberTries && g.used != nil {
			for n := int64(0); n <= last-first; n++ {
				d := day + n
				if d > last {
					d = first + (d - last - 1)
				}
				if !g.isUsed(d) {
					day = d
					break
				}
			}
		}
		t := time.Unix(day*86400, 0).UTC()
		var buf [10]byte
		plain := string(appendDate(buf[:0], t))
		if try < numberTries && (containsStr(g.sentinels, plain) || g.used != nil && g.isUsed(day)) {
			continue
		}
		g.taken(day)
		v.clean, v.plain, v.t = t, plain, t
		return
	}
}

func floorDiv(a, b int64) int64 {
	q := a / b
	if a%b != 0 && (a < 0) != (b < 0) {
		q--
	}
	return q
}

func containsStr(xs []string, s string) bool {
	for _, x := range xs {
		if x == s {
			return true
		}
	}
	return false
}

func (g *colGen) timestampValue(r *rng, v *value) {
	cc := g.cc
	t := g.field.Type
	for try := 0; ; try++ {
		sec := r.between(cc.from, cc.to)
		if try >= numberTries && g.used != nil {
			for n := int64(0); n <= cc.to-cc.from; n++ {
				s := sec + n
				if s > cc.to {
					s = cc.from + (s - cc.to - 1)
				}
				if !g.isUsed(s) {
					sec = s
					break
				}
			}
		}
		var ns int64
		if t.Unit() != fixtures.Seconds && r.next()&1 == 1 && g.used == nil {
			step := int64(t.Unit().Duration())
			ns = r.between(0, int64(time.Second)/step-1) * step
		}
		tm := time.Unix(sec, ns).UTC()
		if g.tz != nil {
			tm = tm.In(g.tz)
		}
		plain := formatTimestamp(tm, t)
		if try < numberTries && (containsStr(g.sentinels, plain) || g.used != nil && g.isUsed(tm.Unix())) {
			continue
		}
		g.taken(tm.Unix())
		v.clean, v.plain, v.t = tm, plain, tm
		return
	}
}
