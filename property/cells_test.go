package property

import (
	"fmt"
	"math"
	"math/big"
	"regexp"
	"slices"
	"strconv"
	"strings"
	"testing"
	"time"
	"unicode"
	"unicode/utf8"

	"github.com/stretchr/testify/require"
	"golang.org/x/text/encoding/charmap"
	"golang.org/x/text/language"
	"golang.org/x/text/message"
	xnumber "golang.org/x/text/number"
	"golang.org/x/text/runes"
	"golang.org/x/text/transform"
	"golang.org/x/text/unicode/norm"

	"github.com/proofsheet/proofsheet/fixtures"
)

// The decoders below read a messy spelling back with knowledge written
// independently of the spellers (the layouts documented at each Mess), so
// that a speller that writes the wrong value is caught.

func trimEdge(s string) string {
	return strings.TrimFunc(s, func(r rune) bool { return r == ' ' || r == '\t' || r == '\u00a0' })
}

var currencySyms = regexp.MustCompile(`CHF|kr|[$£€¥￥]`)

// cldrMarks returns the decimal mark, digit group separators and minus sign
// of a locale as golang.org/x/text formats -1234567.5 there, independently
// of the package's own profiles. Source: Unicode CLDR as carried by
// golang.org/x/text/number. CLDR 34 moved the French group separator to
// U+202F, which x/text's CLDR 32 still writes as U+00A0, so both count as
// the French separator.
func cldrMarks(tag string) (decimal string, groups []string, minus string) {
	s := message.NewPrinter(language.MustParse(tag)).Sprint(xnumber.Decimal(-1234567.5))
	rs := []rune(s)
	minus = string(rs[0])
	groups = []string{string(rs[2])}
	decimal = string(rs[len(rs)-2])
	if tag == "fr-FR" {
		groups = append(groups, "\u202f")
	}
	return decimal, groups, minus
}

func decodeNumberIn(raw string, m Mess, tag string) (*big.Rat, error) {
	s := raw
	if m.Has(MessEdgeSpace) {
		s = trimEdge(s)
	}
	if m.Has(MessFullWidth) {
		// Source: Unicode compatibility decomposition (NFKC) of the
		// Halfwidth and Fullwidth Forms block.
		s = norm.NFKC.String(s)
	}
	decimal, groups, minus := cldrMarks(tag)
	neg := false
	if m.Has(MessParentheses) {
		if !strings.HasPrefix(s, "(") || !strings.HasSuffix(s, ")") {
			return nil, fmt.Errorf("no parentheses in %q", s)
		}
		s, neg = s[1:len(s)-1], true
	}
	if m.Has(MessCurrency) {
		sym := currencySyms.FindString(s)
		if sym == "" {
			return nil, fmt.Errorf("no currency symbol in %q", s)
		}
		s = strings.Replace(s, sym, "", 1)
		s = strings.Trim(s, " \u00a0")
	}
	for _, mn := range []string{minus, "-"} {
		if strings.HasPrefix(s, mn) && !m.Has(MessTrailingMinus) && !m.Has(MessUnicodeMinus) {
			s, neg = strings.Trim(s[len(mn):], " \u00a0"), !neg
			break
		}
	}
	switch {
	case m.Has(MessThousandsDot):
		s = strings.ReplaceAll(strings.ReplaceAll(s, ".", ""), ",", ".")
	case m.Has(MessThousandsSpace):
		for _, sp := range []string{" ", "\u00a0", "\u202f"} {
			s = strings.ReplaceAll(s, sp, "")
		}
		s = strings.ReplaceAll(s, ",", ".")
	case m.Has(MessThousandsQuote):
		s = strings.NewReplacer("'", "", "\u2019", "").Replace(s)
	default:
		if m.Has(MessThousands) || m.Has(MessCurrency) || m.Has(MessParentheses) {
			for _, gr := range groups {
				s = strings.ReplaceAll(s, gr, "")
			}
		}
		if m.Has(MessDecimalComma) {
			if decimal != "," {
				return nil, fmt.Errorf("decimal comma in %s, whose mark is %q", tag, decimal)
			}
			s = strings.Replace(s, ",", ".", 1)
		} else if strings.Contains(s, ",") && !m.Has(MessFullWidth) {
			return nil, fmt.Errorf("a comma in %q without decimal-comma", raw)
		}
	}
	if m.Has(MessUnicodeMinus) {
		if !strings.HasPrefix(s, "\u2212") {
			return nil, fmt.Errorf("no U+2212 in %q", s)
		}
		s = "-" + strings.TrimPrefix(s, "\u2212")
	}
	if m.Has(MessTrailingMinus) {
		if !strings.HasSuffix(s, "-") {
			return nil, fmt.Errorf("no trailing minus in %q", s)
		}
		s = "-" + strings.TrimSuffix(s, "-")
	}
	if m.Has(MessPlusSign) {
		if !strings.HasPrefix(s, "+") {
			return nil, fmt.Errorf("no plus sign in %q", s)
		}
		s = s[1:]
	}
	pct := false
	if m.Has(MessPercent) {
		s = strings.TrimSuffix(s, "%")
		s, pct = trimEdge(s), true
	}
	r, ok := new(big.Rat).SetString(s)
	if !ok {
		return nil, fmt.Errorf("%q (from %q) is not a number in %s", s, raw, tag)
	}
	if pct {
		r.Quo(r, big.NewRat(100, 1))
	}
	if neg {
		r.Neg(r)
	}
	return r, nil
}

var dateLayouts = map[Mess][]string{
	MessNone:                             {"2006-01-02"},
	MessDateSlash:                        {"2006/01/02", "2006.01.02"},
	MessDayFirst:                         {"02/01/2006", "02.01.2006", "02-01-2006", "2/1/2006", "2.1.2006"},
	MessMonthFirst:                       {"01/02/2006", "1/2/2006"},
	MessDayFirst.and(MessTwoDigitYear):   {"02/01/06", "02.01.06"},
	MessMonthFirst.and(MessTwoDigitYear): {"01/02/06"},
	MessMonthName:                        {"2 Jan 2006", "Jan 2, 2006", "2 January 2006", "January 2, 2006"},
	MessCompactDate:                      {"20060102"},
	MessMidnight:                         {"2006-01-02 15:04:05", "2006-01-02T15:04:05"},
}

// decodeTime returns the instant a messy date or timestamp spells, read in
// loc. Two-digit years are read by Go's time package, whose century rule
// (69–99 → 19xx) is written independently of TwoDigitYear.
func decodeTime(raw string, m Mess, loc *time.Location, withClock bool) (time.Time, error) {
	s := raw
	var parts []Mess
	for _, p := range m.Parts() {
		if p == MessEdgeSpace {
			s = trimEdge(s)
		} else if p != MessMixedSources {
			parts = append(parts, p)
		}
	}
	base := MessNone
	for _, p := range parts {
		base = base.and(p)
	}
	switch base {
	case MessSerialDate:
		f, err := strconv.ParseFloat(s, 64)
		if err != nil {
			return time.Time{}, err
		}
		t, err := SerialToTime(f)
		return time.Date(t.Year(), t.Month(), t.Day(), t.Hour(), t.Minute(), t.Second(), t.Nanosecond(), loc), err
	case MessEpochSeconds, MessEpochMillis:
		n, err := strconv.ParseInt(s, 10, 64)
		if base == MessEpochMillis {
			return time.UnixMilli(n).In(loc), err
		}
		return time.Unix(n, 0).In(loc), err
	case MessUTCOffset:
		return time.Parse("2006-01-02T15:04:05.999999999-07:00", s)
	}
	var layouts []string
	if !withClock {
		layouts = dateLayouts[base]
	} else {
		switch base {
		case MessNone:
			layouts = []string{"2006-01-02T15:04:05.999999999Z07:00", "2006-01-02T15:04:05.999999999"}
		case MessSpaceSeparator:
			layouts = []string{"2006-01-02 15:04:05.999999999"}
		case MessCompactDate:
			layouts = []string{"20060102T150405"}
		case MessMonthFirst.and(MessTwelveHour):
			layouts = []string{"01/02/2006 3:04:05 PM", "1/2/2006 3:04:05 PM"}
		default:
			for _, l := range dateLayouts[base] {
				layouts = append(layouts, l+" 15:04:05.999999999")
			}
		}
	}
	if len(layouts) == 0 {
		return time.Time{}, fmt.Errorf("no layout for mess %q", m)
	}
	var last error
	for _, l := range layouts {
		t, err := time.ParseInLocation(l, s, loc)
		if err == nil {
			return t, nil
		}
		last = err
	}
	return time.Time{}, last
}

// stripMarks removes accents with x/text's runes filter, written apart
// from the package's own stripAccents.
var stripMarks = transform.Chain(norm.NFD, runes.Remove(runes.In(unicode.Mn)), norm.NFC)

// decodeText reports whether raw is a messy spelling of clean under m.
func decodeText(raw, clean string, m Mess) error {
	s := raw
	if m.Has(MessEdgeSpace) {
		s = trimEdge(s)
	}
	ok := true
	switch {
	case m.Has(MessNBSP):
		r := strings.ReplaceAll(s, "\u00a0", " ")
		ok = r == clean || strings.TrimSpace(r) == clean
	case m.Has(MessZeroWidth):
		ok = strings.NewReplacer("\u200b", "", "\u200c", "", "\u200d", "", "\u2060", "").Replace(s) == clean
	case m.Has(MessStrayBOM):
		ok = strings.HasPrefix(s, "\ufeff") && s[3:] == clean
	case m.Has(MessMojibake):
		// Source: x/text charmap.Windows1252, the WHATWG windows-1252
		// index: writing each character back as its byte restores the
		// UTF-8 bytes.
		b, err := charmap.Windows1252.NewEncoder().String(s)
		ok = err == nil && b == clean
	case m.Has(MessWindows1252):
		d, err := charmap.Windows1252.NewDecoder().String(s)
		ok = err == nil && d == clean && !utf8.ValidString(s)
	case m.Has(MessInvalidUTF8):
		ok = !utf8.ValidString(s) && strings.ToValidUTF8(s, "") == clean
	case m.Has(MessDecomposed):
		ok = s != clean && norm.NFC.String(s) == clean
	case m.Has(MessAccent):
		st, _, err := transform.String(stripMarks, clean)
		ok = err == nil && st == s
	case m.Has(MessCase):
		ok = strings.EqualFold(s, clean)
	case m.Has(MessInnerSpace):
		ok = strings.Join(strings.Fields(s), " ") == clean
	case m.Has(MessLineEndings):
		ok = strings.ReplaceAll(strings.ReplaceAll(s, "\r\n", "\n"), "\r", "\n") == clean && s != clean
	case m.Has(MessLong), m == MessNone, m == MessEdgeSpace:
		ok = s == clean
	default:
		return fmt.Errorf("no text decoder for %q", m)
	}
	if !ok {
		return fmt.Errorf("%q does not spell %q under %q", raw, clean, m)
	}
	return nil
}

// Yes and no words by language. Common practice, no published source.
var boolWordsByLanguage = map[string][2][]string{
	"en": {{"true", "yes", "y", "1"}, {"false", "no", "n", "0"}},
	"de": {{"true", "ja", "j", "wahr", "1"}, {"false", "nein", "n", "falsch", "0"}},
	"fr": {{"true", "oui", "o", "vrai", "1"}, {"false", "non", "n", "faux", "0"}},
	"sv": {{"true", "ja", "j", "sant", "1"}, {"false", "nej", "n", "falskt", "0"}},
	"ja": {{"true", "はい", "有", "○", "1"}, {"false", "いいえ", "無", "×", "0"}},
}

func decodeBool(raw string, m Mess, tag string) (bool, error) {
	s := raw
	if m.Has(MessEdgeSpace) {
		s = trimEdge(s)
	}
	langs := []string{tag[:2]}
	if m.Has(MessMixedSources) {
		langs = []string{"en", "de", "fr", "sv", "ja"}
	}
	for _, lang := range langs {
		w := boolWordsByLanguage[lang]
		if slices.Contains(w[0], strings.ToLower(s)) {
			return true, nil
		}
		if slices.Contains(w[1], strings.ToLower(s)) {
			return false, nil
		}
	}
	return false, fmt.Errorf("%q is not a bool word in %s", raw, tag)
}

// checkCell reports whether a cell's Raw spells its Clean in the default
// locale.
func checkCell(f fixtures.Field, c Messy) error { return checkCellIn(f, c, DefaultLocale) }

// checkCellIn reports whether a cell's Raw spells its Clean in locale tag.
func checkCellIn(f fixtures.Field, c Messy, tag string) error {
	if c.Clean == nil {
		switch {
		case c.Mess == MessNone && c.Raw == "":
			return nil
		case c.Mess == MessNullToken || c.Mess == MessSentinel:
			return nil
		}
		return fmt.Errorf("null cell %q with mess %q", c.Raw, c.Mess)
	}
	if c.Mess == MessNone {
		p, _ := Spell(c.Clean, f.Type)
		if p != c.Raw {
			return fmt.Errorf("plain cell %q, want %q", c.Raw, p)
		}
		return nil
	}
	switch f.Type.Kind() {
	case fixtures.KindInt64, fixtures.KindFloat64, fixtures.KindDecimal:
		if c.Mess.Has(MessExtreme) {
			v, err := strconv.ParseFloat(strings.Replace(c.Raw, ",", ".", 1), 64)
			if err != nil {
				return err
			}
			if w := number(c.Clean); v != w && !(math.IsNaN(v) && math.IsNaN(w)) || math.Signbit(v) != math.Signbit(w) {
				return fmt.Errorf("%q is %v, want %v", c.Raw, v, w)
			}
			return nil
		}
		tags := []string{tag}
		if c.Mess.Has(MessMixedSources) {
			// Another source's spelling may read differently in each
			// locale: one of them must give the value.
			tags = tags[:0]
			for _, l := range Locales() {
				tags = append(tags, l.Tag)
			}
		}
		var firstErr error
		for _, tg := range tags {
			err := numberIs(c, tg)
			if err == nil {
				return nil
			}
			if firstErr == nil {
				firstErr = err
			}
		}
		return firstErr
	case fixtures.KindDate, fixtures.KindTimestamp:
		loc := time.UTC
		if z := f.Type.Zone(); z != "" {
			loc, _ = time.LoadLocation(z)
		}
		got, err := decodeTime(c.Raw, c.Mess, loc, f.Type.Kind() == fixtures.KindTimestamp)
		if err != nil {
			return fmt.Errorf("%q: %w", c.Raw, err)
		}
		if want := c.Clean.(time.Time); !got.Equal(want) {
			return fmt.Errorf("%q is %s, want %s", c.Raw, got, want)
		}
	case fixtures.KindBool:
		b, err := decodeBool(c.Raw, c.Mess, tag)
		if err != nil || b != c.Clean.(bool) {
			return fmt.Errorf("%q does not spell %v (%v)", c.Raw, c.Clean, err)
		}
	case fixtures.KindString, fixtures.KindCategory:
		return decodeText(c.Raw, c.Clean.(string), c.Mess)
	}
	return nil
}

// numberIs reports whether a number cell reads as its clean value in locale
// tag.
func numberIs(c Messy, tag string) error {
	r, err := decodeNumberIn(c.Raw, c.Mess, tag)
	if err != nil {
		return err
	}
	switch w := c.Clean.(type) {
	case int64:
		if r.Cmp(new(big.Rat).SetInt64(w)) != 0 {
			return fmt.Errorf("%q is %s in %s, want %d", c.Raw, r.RatString(), tag, w)
		}
	case float64:
		if g, _ := r.Float64(); g != w {
			return fmt.Errorf("%q is %v in %s, want %v", c.Raw, g, tag, w)
		}
	case fixtures.Decimal:
		if r.Cmp(w.Rat()) != 0 {
			return fmt.Errorf("%q is %s in %s, want %s", c.Raw, r.RatString(), tag, w)
		}
	}
	return nil
}

// spelledCases lists the mess every column kind takes.
var spelledCases = map[fixtures.Kind][]Mess{
	fixtures.KindInt64: {MessThousands, MessThousandsDot, MessThousandsSpace, MessThousandsQuote, MessCurrency,
		MessParentheses, MessUnicodeMinus, MessTrailingMinus, MessPlusSign, MessFullWidth, MessExponent,
		MessLeadingZeros, MessTrailingZeros, MessEdgeSpace, MessExtreme, MessNullToken, MessSentinel},
	fixtures.KindFloat64: {MessThousands, MessThousandsDot, MessThousandsSpace, MessThousandsQuote, MessDecimalComma,
		MessCurrency, MessPercent, MessParentheses, MessUnicodeMinus, MessTrailingMinus, MessPlusSign, MessFullWidth,
		MessExponent, MessLeadingZeros, MessTrailingZeros, MessEdgeSpace, MessExtreme, MessNullToken, MessSentinel},
	fixtures.KindDecimal: {MessThousands, MessThousandsDot, MessThousandsSpace, MessThousandsQuote, MessDecimalComma,
		MessCurrency, MessParentheses, MessUnicodeMinus, MessTrailingMinus, MessPlusSign, MessFullWidth,
		MessExponent, MessLeadingZeros, MessTrailingZeros, MessEdgeSpace, MessNullToken, MessSentinel},
	fixtures.KindBool: {MessCase, MessBoolWord, MessEdgeSpace, MessNullToken, MessSentinel},
	fixtures.KindDate: {MessDateSlash, MessDayFirst, MessMonthFirst, MessTwoDigitYear, MessMonthName,
		MessCompactDate, MessSerialDate, MessEpochSeconds, MessMidnight, MessEdgeSpace, MessNullToken, MessSentinel},
	fixtures.KindTimestamp: {MessSpaceSeparator, MessUTCOffset, MessDayFirst, MessMonthFirst, MessTwelveHour,
		MessTwoDigitYear, MessMonthName, MessCompactDate, MessEpochSeconds, MessEpochMillis, MessSerialDate,
		MessEdgeSpace, MessNullToken, MessSentinel},
	fixtures.KindString: {MessEdgeSpace, MessNBSP, MessZeroWidth, MessStrayBOM, MessMojibake, MessWindows1252,
		MessInvalidUTF8, MessDecomposed, MessLineEndings, MessLong, MessNullToken, MessSentinel},
	fixtures.KindCategory: {MessCase, MessEdgeSpace, MessInnerSpace, MessAccent, MessDecomposed, MessMojibake,
		MessWindows1252, MessInvalidUTF8, MessStrayBOM, MessNBSP, MessZeroWidth, MessNullToken, MessSentinel},
}

var kindFields = map[fixtures.Kind]fixtures.Field{
	fixtures.KindInt64:     fixtures.Col("kept", fixtures.Int64),
	fixtures.KindFloat64:   fixtures.Col("temp_c", fixtures.Float64),
	fixtures.KindDecimal:   fixtures.Col("cost", fixtures.DecimalOf(12, 3)),
	fixtures.KindBool:      fixtures.Col("heater_on", fixtures.Bool),
	fixtures.KindDate:      fixtures.Col("day", fixtures.Date),
	fixtures.KindTimestamp: fixtures.Col("at", fixtures.TimestampOf(fixtures.Millis, "UTC")),
	fixtures.KindString:    fixtures.Col("note", fixtures.String),
	fixtures.KindCategory:  fixtures.Col("house", fixtures.Category),
}

func TestSpelledCellsSpellTheirCleanValue(t *testing.T) {
	for kind, messes := range spelledCases {
		f := kindFields[kind]
		for _, m := range messes {
			t.Run(kind.String()+"/"+string(m), func(t *testing.T) {
				cells := draw[Messy](t, Spelled(f, m, Options{Mess: Heavy}), 200, 7)
				require.NotEmpty(t, cells, "no cell of kind %s takes mess %s", kind, m)
				for _, c := range cells {
					require.True(t, c.Mess.Has(m), "cell %q has mess %q, want %q", c.Raw, c.Mess, m)
					require.NoError(t, checkCell(f, c), "mess %q", c.Mess)
				}
			})
		}
	}
}

func TestCellsAtEveryLevelSpellTheirCleanValue(t *testing.T) {
	zoned := []fixtures.Field{
		fixtures.Col("at_lisbon", fixtures.TimestampOf(fixtures.Seconds, "Europe/Lisbon")),
		fixtures.Col("at_wall", fixtures.TimestampOf(fixtures.Nanos, "")),
	}
	fields := zoned
	for _, f := range kindFields {
		fields = append(fields, f)
	}
	for _, level := range []MessLevel{None, Light, Heavy} {
		for _, f := range fields {
			t.Run(string(level)+"/"+f.Name, func(t *testing.T) {
				cells := draw[Messy](t, Cells(f, Options{Mess: level}), 500, 11)
				require.Len(t, cells, 500)
				for _, c := range cells {
					require.NoError(t, checkCell(f, c), "mess %q", c.Mess)
					if level == None {
						require.Equal(t, MessNone, c.Mess)
					}
					if level == Light {
						for _, p := range c.Mess.Parts() {
							require.Contains(t, lightMesses, p)
						}
					}
				}
			})
		}
	}
}

func TestCellsAreDeterministic(t *testing.T) {
	f := kindFields[fixtures.KindFloat64]
	a := draw[Messy](t, Cells(f, Options{Mess: Heavy}), 300, 99)
	b := draw[Messy](t, Cells(f, Options{Mess: Heavy}), 300, 99)
	c := draw[Messy](t, Cells(f, Options{Mess: Heavy}), 300, 100)
	require.Equal(t, fmt.Sprint(a), fmt.Sprint(b))
	require.NotEqual(t, fmt.Sprint(a), fmt.Sprint(c))
}

func TestCellShrinksToPlainSpelling(t *testing.T) {
	g := Spelled(kindFields[fixtures.KindFloat64], MessThousandsDot, Options{})
	res := g(params(3))
	v, ok := res.Retrieve()
	require.True(t, ok)
	c := v.(Messy)
	shrunk := res.Shrinker(c).All()
	require.Len(t, shrunk, 1)
	p := shrunk[0].(Messy)
	require.Equal(t, MessNone, p.Mess)
	require.Equal(t, c.Clean, p.Clean)
	require.Empty(t, res.Shrinker(p).All(), "a plain cell does not shrink")
}

func TestNullTokensAndSentinels(t *testing.T) {
	for _, c := range draw[Messy](t, NullTokens(Options{}), 200, 1) {
		require.Nil(t, c.Clean)
		require.Contains(t, defaultNullTokens(Heavy, LocaleEnUS), c.Raw)
	}
	custom := draw[Messy](t, NullTokens(Options{NullTokens: []string{"<none>", "s/o"}}), 50, 1)
	for _, c := range custom {
		require.Contains(t, []string{"<none>", "s/o"}, c.Raw)
	}
	for _, c := range draw[Messy](t, Sentinels(fixtures.Float64, Options{}), 200, 1) {
		require.Nil(t, c.Clean)
		require.Contains(t, append(append([]string{}, numberSentinels...), textSentinels...), c.Raw)
	}
	// A value never equals a sentinel: -999 is never a reading.
	for _, c := range draw[Messy](t, Cells(fixtures.Col("t", fixtures.Int64), Options{Mess: Heavy, MaxDigits: 3}), 5000, 2) {
		if c.Clean != nil {
			require.NotEqual(t, int64(-999), c.Clean)
		}
	}
	// NaN stays a value in float columns: "nan" is not a null token there.
	for _, c := range draw[Messy](t, Spelled(fixtures.Col("t", fixtures.Float64), MessNullToken, Options{Mess: Heavy}), 500, 3) {
		require.NotEqual(t, "nan", c.Raw)
	}
	// A category level is never taken for null.
	lv := Options{Mess: Heavy, Levels: map[string][]string{"region": {"NA", "EU"}}}
	for _, c := range draw[Messy](t, Spelled(fixtures.Col("region", fixtures.Category), MessNullToken, lv), 500, 4) {
		require.NotEqual(t, "NA", c.Raw)
		require.NotEqual(t, "na", c.Raw)
	}
}

func TestExtremeFloats(t *testing.T) {
	seen := map[string]bool{}
	for _, c := range draw[Messy](t, ExtremeFloats(), 400, 5) {
		v := c.Clean.(float64)
		p, err := strconv.ParseFloat(c.Raw, 64)
		require.NoError(t, err)
		require.True(t, p == v && math.Signbit(p) == math.Signbit(v) || math.IsNaN(p) && math.IsNaN(v), "%q", c.Raw)
		switch {
		case math.IsNaN(v):
			seen["NaN"] = true
		case math.IsInf(v, 0):
			seen["Inf"] = true
		case v == 0:
			seen["-0"] = math.Signbit(v)
		case math.Abs(v) < 0x1p-1022:
			seen["subnormal"] = true
		case math.Abs(v) == math.MaxFloat64:
			seen["max"] = true
		}
	}
	// Source: IEEE 754-2019 §3.4 binary64: the smallest subnormal is
	// 2^-1074 and the largest finite value (2−2^-52)×2^1023.
	require.Equal(t, math.Float64frombits(1), math.SmallestNonzeroFloat64)
	require.Equal(t, map[string]bool{"NaN": true, "Inf": true, "-0": true, "subnormal": true, "max": true}, seen)
}

func TestLongTexts(t *testing.T) {
	for _, c := range draw[Messy](t, LongTexts(10000), 5, 1) {
		require.Equal(t, 10000, len(c.Raw))
		require.True(t, utf8.ValidString(c.Raw))
		require.Equal(t, c.Raw, c.Clean)
	}
}

func TestSpellIsTheLiteralSpelling(t *testing.T) {
	lisbon := fixtures.TimestampOf(fixtures.Seconds, "Europe/Lisbon")
	loc, err := time.LoadLocation("Europe/Lisbon")
	require.NoError(t, err)
	d, err := fixtures.ParseDecimal("12.5")
	require.NoError(t, err)
	for _, tc := range []struct {
		v    any
		t    fixtures.Type
		want string
	}{
		{int64(-12), fixtures.Int64, "-12"},
		{0.1, fixtures.Float64, "0.1"},
		{math.Inf(-1), fixtures.Float64, "-Inf"},
		{math.Copysign(0, -1), fixtures.Float64, "-0"},
		{d, fixtures.DecimalOf(6, 2), "12.50"},
		{true, fixtures.Bool, "true"},
		{time.Date(2026, 4, 1, 0, 0, 0, 0, time.UTC), fixtures.Date, "2026-04-01"},
		{time.Date(2026, 4, 1, 6, 0, 0, 0, time.UTC), fixtures.TimestampOf(fixtures.Millis, "UTC"), "2026-04-01T06:00:00Z"},
		{time.Date(2026, 7, 1, 6, 0, 0, 0, loc), lisbon, "2026-07-01T06:00:00+01:00"},
		{time.Date(2026, 4, 1, 6, 0, 0, 5e8, time.UTC), fixtures.TimestampOf(fixtures.Millis, ""), "2026-04-01T06:00:00.5"},
	} {
		got, ok := Spell(tc.v, tc.t)
		require.True(t, ok)
		require.Equal(t, tc.want, got)
		// The spelling is what a literal table reads back to the value.
		tb, err := fixtures.Parse("v:" + tc.t.String() + "\n" + got + "\n")
		require.NoError(t, err)
		require.Equal(t, got, tb.ColumnAt(0).Format(0))
	}
	_, ok := Spell(nil, fixtures.Int64)
	require.False(t, ok)
}

func TestMessParts(t *testing.T) {
	m := MessCurrency.and(MessEdgeSpace)
	require.Equal(t, Mess("currency+edge-space"), m)
	require.Equal(t, []Mess{MessCurrency, MessEdgeSpace}, m.Parts())
	require.True(t, m.Has(MessEdgeSpace))
	require.False(t, m.Has(MessThousands))
	require.Empty(t, MessNone.Parts())
	seen := map[Mess]bool{}
	for _, x := range AllMesses() {
		require.False(t, seen[x], "%q listed twice", x)
		seen[x] = true
	}
	for kind, ms := range spelledCases {
		for _, x := range ms {
			require.True(t, seen[x], "%s: %q not in AllMesses", kind, x)
		}
	}
}

func TestParseMessLevel(t *testing.T) {
	for in, want := range map[string]MessLevel{"none": None, "Light": Light, "": Light, " heavy ": Heavy} {
		got, err := ParseMessLevel(in)
		require.NoError(t, err)
		require.Equal(t, want, got)
	}
	_, err := ParseMessLevel("extreme")
	require.ErrorContains(t, err, `"extreme"`)
}
