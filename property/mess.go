package property

import (
	"fmt"
	"slices"
	"strings"
	"time"

	"github.com/proofsheet/proofsheet/fixtures"
)

// Mess names one way a raw spelling departs from the plain spelling of its
// value. A cell that has several carries them joined with "+", such as
// "currency+edge-space" or "day-first+two-digit-year".
type Mess string

// MessNone is the plain spelling: the literal table spelling of the value
// (see fixtures.Parse), or the unquoted empty field for null.
const MessNone Mess = ""

// Number spellings. The examples spell 1234567.5 or -1234.5.
const (
	MessThousands      Mess = "thousands"            // 1,234,567.5
	MessThousandsDot   Mess = "thousands-dot"        // 1.234.567,5
	MessThousandsSpace Mess = "thousands-space"      // 1 234 567,5 with a space, NBSP or narrow NBSP
	MessThousandsQuote Mess = "thousands-apostrophe" // 1'234'567.5 or 1’234’567.5
	MessDecimalComma   Mess = "decimal-comma"        // 1234567,5
	MessCurrency       Mess = "currency"             // $1,234.50  1.234,50 €  CHF 1'234.50
	MessPercent        Mess = "percent"              // 12.5% for 0.125 (float64 columns)
	MessParentheses    Mess = "parentheses"          // (1,234.50) for -1234.5
	MessUnicodeMinus   Mess = "unicode-minus"        // −1234.5 with U+2212 MINUS SIGN
	MessTrailingMinus  Mess = "trailing-minus"       // 1234.5-
	MessPlusSign       Mess = "plus-sign"            // +12
	MessFullWidth      Mess = "full-width"           // １２３４．５ (U+FF10–U+FF19)
	MessExponent       Mess = "exponent"             // 1.2345e3, 1.2345E+03
	MessLeadingZeros   Mess = "leading-zeros"        // 0012
	MessTrailingZeros  Mess = "trailing-zeros"       // 12.50, 12.0
	MessExtreme        Mess = "extreme"              // the value itself: ±Inf, NaN, -0, subnormal, ±MaxFloat64, min/max int64
)

// Spellings of null and of "no reading".
const (
	MessNullToken Mess = "null-token" // NA, n/a, NULL, None, -, ?, …: the cell is null
	MessSentinel  Mess = "sentinel"   // -999, 9999, ERR, 1900-01-01: a fault code meaning null
)

// Bool spellings.
const (
	MessBoolWord Mess = "bool-word" // yes/no, Y/N, 1/0, T/F, on/off
)

// Date and timestamp spellings. The examples spell 2024-01-31 (10:30).
const (
	MessDateSlash      Mess = "date-slash"      // 2024/01/31, 2024.01.31
	MessDayFirst       Mess = "day-first"       // 31/01/2024, 31.01.2024, 31-01-2024
	MessMonthFirst     Mess = "month-first"     // 01/31/2024, 1/31/2024
	MessTwoDigitYear   Mess = "two-digit-year"  // 31/01/24 (see TwoDigitYear for the century)
	MessMonthName      Mess = "month-name"      // 31 Jan 2024, Jan 31, 2024
	MessCompactDate    Mess = "compact-date"    // 20240131, 20240131T103000
	MessSerialDate     Mess = "serial-date"     // 45322, 45322.4375 (see SerialToTime)
	MessEpochSeconds   Mess = "epoch-seconds"   // 1706697000
	MessEpochMillis    Mess = "epoch-millis"    // 1706697000000
	MessMidnight       Mess = "midnight"        // 2024-01-31 00:00:00 in a date column
	MessSpaceSeparator Mess = "space-separator" // 2024-01-31 10:30:00
	MessUTCOffset      Mess = "utc-offset"      // 2024-01-31T16:00:00+05:30, the same instant
	MessTwelveHour     Mess = "twelve-hour"     // 1/31/2024 10:30:00 AM
)

// Text spellings. Category cells stand for one of their levels; string
// cells for their clean text.
const (
	MessEdgeSpace   Mess = "edge-space"         // "  Étang", "12\t", NBSP at an edge (any kind)
	MessCase        Mess = "case"               // ÉTANG, étang, TRUE (category and bool)
	MessInnerSpace  Mess = "inner-space"        // "Les  Pins" (category)
	MessAccent      Mess = "accent"             // Etang for Étang (category)
	MessDecomposed  Mess = "decomposed"         // É as E + U+0301 COMBINING ACUTE ACCENT
	MessMojibake    Mess = "mojibake"           // Ã‰tang: UTF-8 bytes read as Windows-1252 (see Mojibake)
	MessWindows1252 Mess = "windows-1252-bytes" // É as the single byte C9 in a UTF-8 file
	MessInvalidUTF8 Mess = "invalid-utf8"       // an ill-formed byte sequence inserted (the clean text lacks it)
	MessStrayBOM    Mess = "stray-bom"          // U+FEFF before the text
	MessNBSP        Mess = "nbsp"               // a space written as U+00A0 NO-BREAK SPACE
	MessZeroWidth   Mess = "zero-width"         // U+200B, U+200C, U+200D or U+2060 inside the text
	MessLineEndings Mess = "line-endings"       // a multi-line value with CRLF, CR and LF mixed (clean: LF)
	MessLong        Mess = "long"               // the value itself is very long (string)
)

// Has reports whether m includes the single mess one.
func (m Mess) Has(one Mess) bool {
	s := string(m)
	for s != "" {
		part, rest, _ := strings.Cut(s, "+")
		if part == string(one) {
			return one != ""
		}
		s = rest
	}
	return false
}

// Parts splits a compound mess into its single messes; MessNone has none.
func (m Mess) Parts() []Mess {
	if m == MessNone {
		return nil
	}
	ss := strings.Split(string(m), "+")
	out := make([]Mess, len(ss))
	for i, s := range ss {
		out[i] = Mess(s)
	}
	return out
}

func (m Mess) and(o Mess) Mess {
	switch {
	case m == MessNone:
		return o
	case o == MessNone:
		return m
	}
	return m + "+" + o
}

// AllMesses lists every single mess, in the order of their declaration.
func AllMesses() []Mess {
	return []Mess{
		MessThousands, MessThousandsDot, MessThousandsSpace, MessThousandsQuote, MessDecimalComma,
		MessCurrency, MessPercent, MessParentheses, MessUnicodeMinus, MessTrailingMinus, MessPlusSign,
		MessFullWidth, MessExponent, MessLeadingZeros, MessTrailingZeros, MessExtreme,
		MessNullToken, MessSentinel, MessBoolWord,
		MessDateSlash, MessDayFirst, MessMonthFirst, MessTwoDigitYear, MessMonthName, MessCompactDate,
		MessSerialDate, MessEpochSeconds, MessEpochMillis, MessMidnight, MessSpaceSeparator, MessUTCOffset,
		MessTwelveHour,
		MessEdgeSpace, MessCase, MessInnerSpace, MessAccent, MessDecomposed, MessMojibake, MessWindows1252,
		MessInvalidUTF8, MessStrayBOM, MessNBSP, MessZeroWidth, MessLineEndings, MessLong,
	}
}

// lightMesses are the messes of the light level: the ones any export tool
// of one locale produces.
var lightMesses = []Mess{
	MessThousands, MessCurrency, MessPlusSign, MessTrailingZeros, MessEdgeSpace,
	MessNullToken, MessBoolWord, MessCase, MessInnerSpace, MessDateSlash, MessSpaceSeparator,
}

// MessLevel sets how much mess generated tables carry.
type MessLevel string

// The mess levels. The zero MessLevel means Light.
const (
	None  MessLevel = "none"  // plain spellings, no duplicates, no extra columns; nulls still occur
	Light MessLevel = "light" // one locale's export habits: thousands commas, $, edge spaces, a few null words
	Heavy MessLevel = "heavy" // every mess this package knows, more often, with duplicates and extra columns
)

// ParseMessLevel reads none, light or heavy.
func ParseMessLevel(s string) (MessLevel, error) {
	switch MessLevel(strings.ToLower(strings.TrimSpace(s))) {
	case None:
		return None, nil
	case Light, "":
		return Light, nil
	case Heavy:
		return Heavy, nil
	}
	return "", fmt.Errorf("property: unknown mess level %q (want none, light or heavy)", s)
}

// Options configure the generators. The zero value is usable: light mess,
// up to 100 rows. Rates and counts left at zero take the level's default;
// a negative rate or count turns the thing off.
type Options struct {
	// Mess is the mess level (default Light).
	Mess MessLevel

	// MinRows and MaxRows bound the rows of a generated table (default 0
	// and 100). Within them gopter's size parameter sets the row count,
	// so tables grow as a check goes on.
	MinRows, MaxRows int
	// Runs is how many tables Check tries per invariant (default 100).
	Runs int
	// Seed, when not zero, fixes Check's seed. The PROOFSHEET_SEED
	// environment variable overrides it.
	Seed int64

	// NullRate is the share of cells that are null (default 0.05; heavy 0.1).
	NullRate float64
	// MessRate is the share of non-null cells spelled messily (default
	// light 0.15, heavy 0.5; none 0).
	MessRate float64
	// SentinelRate is the share of cells holding a sentinel instead of a
	// value (default heavy 0.03, else 0).
	SentinelRate float64
	// ExtremeRate is the share of number cells holding an extreme value
	// such as +Inf, NaN, -0 or the largest float64 (default heavy 0.02).
	ExtremeRate float64
	// DuplicateRate is the share of rows that repeat an earlier row
	// (default light 0.02, heavy 0.08). At heavy, half the repeats are
	// spelled anew.
	DuplicateRate float64
	// ExtraColumns is the most columns not in the schema a table gets
	// (default heavy 1, else 0), holding text. MissingColumns is the most
	// schema columns a table leaves out (default 0); one always stays.
	ExtraColumns, MissingColumns int
	// Shuffle puts the raw rows in random order; ShuffleColumns does the
	// same for the columns. HeaderMess spells header names with case and
	// space variants.
	Shuffle, ShuffleColumns, HeaderMess bool

	// Spellings, when not empty, lists the only messes used (null tokens
	// and sentinels too). Avoid lists messes never used.
	Spellings, Avoid []Mess
	// NullTokens replaces the spellings of null (the empty field is
	// always one).
	NullTokens []string
	// Sentinels replaces the fault codes used for every column; by
	// default numbers get -999, -9999, 9999 and 99999, dates 1900-01-01
	// and 9999-12-31, and every column ERR, ERROR and #VALUE!.
	Sentinels []string
	// Levels gives the levels of category columns by column name.
	// Columns without an entry use five invented greenhouse names.
	Levels map[string][]string
	// DateFrom and DateTo bound dates and timestamps (default 1995-01-01
	// to 2035-12-31).
	DateFrom, DateTo time.Time
	// MaxDigits is the most integer digits of a generated number (default
	// 7, at most 15); Decimals the most fractional digits of a float
	// (default 3, at most 6).
	MaxDigits, Decimals int
	// MaxWords is the most words of a generated string (default 3).
	// LongText is the length in bytes of very long strings (default 4096).
	MaxWords, LongText int
}

// config is Options with the defaults filled in and the mess lists
// resolved.
type config struct {
	level                                   MessLevel
	minRows, maxRows, runs                  int
	nullRate, messRate, sentinelRate        float64
	extremeRate, dupRate                    float64
	extra, missing                          int
	shuffle, shuffleCols, headerMess        bool
	respell                                 bool // duplicates may be spelled anew
	allowed                                 map[Mess]bool
	nullTokens, sentinels                   []string
	levels                                  map[string][]string
	dateFrom, dateTo                        int64 // unix seconds
	maxDigits, decimals, maxWords, longText int
	fits                                    func(string) bool // the target encoding can carry the text
	force                                   Mess              // a value mess every value takes (Spelled)
}

func rate(v, def float64) float64 {
	switch {
	case v < 0:
		return 0
	case v == 0:
		return def
	}
	return min(v, 1)
}

func count(v, def int) int {
	switch {
	case v < 0:
		return 0
	case v == 0:
		return def
	}
	return v
}

// Validate reports options that cannot be met for the schema: an invalid
// schema, a mess level or mess name this package does not know, rows or
// dates out of order, category levels for a missing or non-category
// column.
func (o Options) Validate(schema fixtures.Schema) error {
	_, err := o.compile(schema)
	return err
}

func (o Options) compile(schema fixtures.Schema) (*config, error) {
	if err := schema.Validate(); err != nil {
		return nil, fmt.Errorf("property: %w", err)
	}
	level := o.Mess
	if level == "" {
		level = Light
	}
	c := &config{level: level, levels: o.Levels, shuffle: o.Shuffle, shuffleCols: o.ShuffleColumns, headerMess: o.HeaderMess}
	var levelMesses []Mess
	switch level {
	case None:
		c.nullRate, c.messRate = rate(o.NullRate, 0.05), rate(o.MessRate, -1)
		c.sentinelRate, c.extremeRate, c.dupRate = rate(o.SentinelRate, -1), rate(o.ExtremeRate, -1), rate(o.DuplicateRate, -1)
		c.extra = count(o.ExtraColumns, -1)
	case Light:
		levelMesses = lightMesses
		c.nullRate, c.messRate = rate(o.NullRate, 0.05), rate(o.MessRate, 0.15)
		c.sentinelRate, c.extremeRate, c.dupRate = rate(o.SentinelRate, -1), rate(o.ExtremeRate, -1), rate(o.DuplicateRate, 0.02)
		c.extra = count(o.ExtraColumns, -1)
	case Heavy:
		levelMesses = AllMesses()
		c.nullRate, c.messRate = rate(o.NullRate, 0.1), rate(o.MessRate, 0.5)
		c.sentinelRate, c.extremeRate, c.dupRate = rate(o.SentinelRate, 0.03), rate(o.ExtremeRate, 0.02), rate(o.DuplicateRate, 0.08)
		c.extra = count(o.ExtraColumns, 1)
		c.respell = true
	default:
		return nil, fmt.Errorf("property: unknown mess level %q (want none, light or heavy)", level)
	}
	c.missing = count(o.MissingColumns, -1)
	known := AllMesses()
	for _, list := range [][]Mess{o.Spellings, o.Avoid} {
		for _, m := range list {
			if !slices.Contains(known, m) {
				return nil, fmt.Errorf("property: unknown mess %q", m)
			}
		}
	}
	c.allowed = map[Mess]bool{}
	if len(o.Spellings) > 0 {
		// An explicit list works at every level, even None.
		levelMesses = o.Spellings
		if c.messRate == 0 && o.MessRate >= 0 {
			c.messRate = rate(o.MessRate, 0.5)
		}
	}
	for _, m := range levelMesses {
		if !slices.Contains(o.Avoid, m) {
			c.allowed[m] = true
		}
	}
	if len(o.Spellings) > 0 {
		if c.allowed[MessSentinel] && o.SentinelRate == 0 {
			c.sentinelRate = 0.03
		}
		if c.allowed[MessExtreme] && o.ExtremeRate == 0 {
			c.extremeRate = 0.02
		}
	}
	if !c.allowed[MessSentinel] {
		c.sentinelRate = 0
	}
	if !c.allowed[MessExtreme] {
		c.extremeRate = 0
	}
	c.minRows = max(o.MinRows, 0)
	c.maxRows = o.MaxRows
	if c.maxRows == 0 {
		c.maxRows = max(100, c.minRows)
	}
	if c.maxRows < c.minRows {
		return nil, fmt.Errorf("property: MaxRows %d is below MinRows %d", c.maxRows, c.minRows)
	}
	c.runs = o.Runs
	if c.runs <= 0 {
		c.runs = 100
	}
	c.nullTokens = o.NullTokens
	if c.nullTokens == nil {
		if level == Heavy {
			c.nullTokens = heavyNullTokens
		} else {
			c.nullTokens = lightNullTokens
		}
	}
	c.sentinels = o.Sentinels
	from, to := o.DateFrom, o.DateTo
	if from.IsZero() {
		from = time.Date(1995, 1, 1, 0, 0, 0, 0, time.UTC)
	}
	if to.IsZero() {
		to = time.Date(2035, 12, 31, 23, 59, 59, 0, time.UTC)
	}
	if to.Before(from) {
		return nil, fmt.Errorf("property: DateTo %s is before DateFrom %s", to.Format(time.RFC3339), from.Format(time.RFC3339))
	}
	if from.Year() < 1 || to.Year() > 9999 {
		return nil, fmt.Errorf("property: dates must lie in years 1 to 9999")
	}
	for _, f := range schema {
		if f.Type.Kind() == fixtures.KindTimestamp && f.Type.Unit() == fixtures.Nanos &&
			(from.Year() < 1678 || to.Year() > 2261) {
			return nil, fmt.Errorf("property: column %q counts nanoseconds in an int64, which holds years 1678 to 2261 only; set DateFrom and DateTo inside them", f.Name)
		}
	}
	c.dateFrom, c.dateTo = from.Unix(), to.Unix()
	c.maxDigits = min(count(o.MaxDigits, 7), 15)
	if c.maxDigits == 0 {
		c.maxDigits = 1
	}
	c.decimals = min(count(o.Decimals, 3), 6)
	c.maxWords = max(count(o.MaxWords, 3), 1)
	c.longText = max(count(o.LongText, 4096), 1)
	for name, lv := range o.Levels {
		i := schema.Index(name)
		if i < 0 {
			return nil, fmt.Errorf("property: levels for unknown column %q", name)
		}
		if schema[i].Type.Kind() != fixtures.KindCategory {
			return nil, fmt.Errorf("property: levels for column %q, which is %s, not category", name, schema[i].Type)
		}
		if len(lv) == 0 {
			return nil, fmt.Errorf("property: no levels for category column %q", name)
		}
	}
	return c, nil
}

// Null spellings. Common practice of spreadsheet, database and statistics
// exports; no published source.
var (
	lightNullTokens = []string{"NA", "N/A", "null"}
	heavyNullTokens = []string{" ", "NA", "na", "N/A", "n/a", "#N/A", "NULL", "null", "Null", "None", "none", "nil", "nan", "-", "--", "—", "?", "."}
)

// Default sentinels by column kind. Common practice of datalogger and
// spreadsheet exports; no published source.
var (
	numberSentinels = []string{"-999", "-9999", "9999", "99999"}
	dateSentinels   = []string{"1900-01-01", "9999-12-31"}
	textSentinels   = []string{"ERR", "ERROR", "#VALUE!"}
)
