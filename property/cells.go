package property

import (
	"math"
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
	nullTokens []string
	sentinels  []string
	sentNums   []float64 // numeric sentinels a value must not equal
	spellers   []speller
	edge       bool // edge space may be added on top of another mess
	levels     []level
	loc        *time.Location
	maxToken   int   // the longest null token or sentinel, in bytes
	tmp        value // scratch for the value being spelled; a colGen makes one cell at a time
}

// speller spells v in one messy way; ok is false when the mess does not
// apply to this value. It may return a compound mess.
type speller struct {
	mess Mess
	fn   func(g *colGen, r *rng, v *value) (raw string, m Mess, ok bool)
}

func newColGen(f fixtures.Field, c *config) *colGen {
	g := &colGen{field: f, kind: f.Type.Kind(), cfg: c}
	if z := f.Type.Zone(); z != "" && z != "UTC" && z != "Z" {
		g.loc, _ = time.LoadLocation(z) // the schema was validated
	}
	if g.kind == fixtures.KindCategory {
		names := c.levels[f.Name]
		if names == nil {
			names = houseNames
		}
		g.levels = makeLevels(names)
	}
	// Null spellings: drop tokens a value could take.
	if c.allowed[MessNullToken] {
		for _, tok := range c.nullTokens {
			if tok == "" || g.couldBeValue(tok) {
				continue
			}
			g.nullTokens = append(g.nullTokens, tok)
		}
	}
	if c.sentinelRate > 0 {
		list := c.sentinels
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
	for _, sp := range spellersFor(g) {
		if c.allowed[sp.mess] {
			g.spellers = append(g.spellers, sp)
		}
	}
	g.edge = c.allowed[MessEdgeSpace] && c.level == Heavy
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
	}
	// Generated strings are redrawn when they equal a token (see
	// stringValue), so tokens stay null in string columns.
	return false
}

// next makes one cell.
func (g *colGen) next(r *rng) Messy {
	c := g.cfg
	if r.chance(c.nullRate) {
		return g.null(r)
	}
	if len(g.sentinels) > 0 && r.chance(c.sentinelRate) {
		if s := pick(r, g.sentinels); c.fits == nil || c.fits(s) {
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
	if len(g.nullTokens) > 0 && r.chance(g.cfg.messRate) {
		tok := pick(r, g.nullTokens)
		if g.cfg.fits == nil || g.cfg.fits(tok) {
			return Messy{Raw: tok, Mess: MessNullToken}
		}
	}
	return Messy{}
}

// spell spells a value, messily with probability MessRate.
func (g *colGen) spell(r *rng, v *value) Messy {
	m := Messy{Raw: v.plain, Clean: v.clean, Mess: v.mess}
	if v.fixed {
		m.Raw = v.raw
		return m
	}
	if len(g.spellers) == 0 || !r.chance(g.cfg.messRate) {
		return m
	}
	for try := 0; try < 4; try++ {
		sp := g.spellers[r.intn(len(g.spellers))]
		raw, mess, ok := sp.fn(g, r, v)
		if !ok || raw == v.plain || (g.cfg.fits != nil && !g.cfg.fits(raw)) {
			continue
		}
		m.Raw, m.Mess = raw, m.Mess.and(mess)
		break
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
	v, ok := g.valueOf(m)
	if !ok {
		return m
	}
	g.tmp = v
	return g.spell(r, &g.tmp)
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
		if g.loc != nil {
			v.t = v.t.In(g.loc)
		}
	case fixtures.KindString, fixtures.KindCategory:
		v.text = m.Clean.(string)
	}
	return v, true
}

// value draws a clean value.
func (g *colGen) value(r *rng, v *value) {
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
		l := &g.levels[r.intn(len(g.levels))]
		v.clean, v.plain, v.text = l.name, l.name, l.name
	}
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
	v.neg = r.intn(10) < 3 && !(len(intd) == 1 && intd[0] == '0' && len(frac) == 0)
	s := string(b[:split+len(frac)])
	v.intd, v.frac = s[:split], s[split:]
}

// numberText writes sign, integer digits and fraction as a plain number.
func numberText(neg bool, intd, frac string) string {
	b := make([]byte, 0, len(intd)+len(frac)+2)
	if neg {
		b = append(b, '-')
	}
	b = append(b, intd...)
	if frac != "" {
		b = append(b, '.')
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

func (g *colGen) intValue(r *rng, v *value) {
	if g.cfg.extremeRate > 0 && r.chance(g.cfg.extremeRate) {
		x := int64(math.MaxInt64)
		if r.next()&1 == 1 {
			x = math.MinInt64
		}
		v.clean, v.plain, v.mess, v.fixed = x, strconv.FormatInt(x, 10), MessExtreme, true
		v.raw = v.plain
		return
	}
	for try := 0; ; try++ {
		g.drawNumber(r, v, g.cfg.maxDigits, 0, true)
		x, _ := strconv.ParseInt(v.intd, 10, 64)
		if v.neg {
			x = -x
		}
		if len(g.sentNums) > 0 && g.isSentinel(float64(x)) && try < 8 {
			continue
		}
		v.clean, v.plain = x, strconv.FormatInt(x, 10)
		return
	}
}

func (g *colGen) floatValue(r *rng, v *value) {
	if g.cfg.extremeRate > 0 && r.chance(g.cfg.extremeRate) {
		e := extremeFloats[r.intn(len(extremeFloats))]
		v.clean, v.plain, v.mess, v.fixed = e.v, fixtures.FormatFloat(e.v), MessExtreme, true
		v.raw = pick(r, e.spellings)
		return
	}
	maxInt := g.cfg.maxDigits
	for try := 0; ; try++ {
		g.drawNumber(r, v, maxInt, min(g.cfg.decimals, max(0, 15-maxInt)), false)
		x, _ := strconv.ParseFloat(numberText(v.neg, v.intd, v.frac), 64)
		if len(g.sentNums) > 0 && g.isSentinel(x) && try < 8 {
			continue
		}
		v.clean, v.plain = x, fixtures.FormatFloat(x)
		return
	}
}

func (g *colGen) decimalValue(r *rng, v *value) {
	t := g.field.Type
	maxInt := min(t.Precision()-t.Scale(), g.cfg.maxDigits)
	for try := 0; ; try++ {
		g.drawNumber(r, v, maxInt, t.Scale(), true)
		plain := numberText(v.neg, v.intd, v.frac)
		if len(g.sentNums) > 0 && try < 8 {
			if f, err := strconv.ParseFloat(plain, 64); err == nil && g.isSentinel(f) {
				continue
			}
		}
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
	c := g.cfg
	for try := 0; ; try++ {
		day := floorDiv(r.between(c.dateFrom, c.dateTo), 86400)
		t := time.Unix(day*86400, 0).UTC()
		var buf [10]byte
		plain := string(appendDate(buf[:0], t))
		if try < 8 && containsStr(g.sentinels, plain) {
			continue
		}
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
	c := g.cfg
	t := g.field.Type
	for try := 0; ; try++ {
		sec := r.between(c.dateFrom, c.dateTo)
		var ns int64
		if t.Unit() != fixtures.Seconds && r.next()&1 == 1 {
			step := int64(t.Unit().Duration())
			ns = r.between(0, int64(time.Second)/step-1) * step
		}
		tm := time.Unix(sec, ns).UTC()
		if g.loc != nil {
			tm = tm.In(g.loc)
		}
		plain := formatTimestamp(tm, t)
		if try < 8 && containsStr(g.sentinels, plain) {
			continue
		}
		v.clean, v.plain, v.t = tm, plain, tm
		return
	}
}
