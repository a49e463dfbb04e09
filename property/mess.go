package property

import (
	"errors"
	"fmt"
	"slices"
	"strings"
	"time"
	"unicode/utf8"

	"github.com/proofsheet/proofsheet/fixtures"
)

// Mess names one way a raw spelling departs from the plain spelling of its
// value. A cell that has several carries them joined with "+", such as
// "currency+edge-space" or "day-first+two-digit-year".
type Mess string

// MessNone is the plain spelling: the literal table spelling of the value
// (see fixtures.Parse), or the unquoted empty field for null.
const MessNone Mess = ""

// Number spellings. The examples spell 1234567.5 or -1234.5. Marks, signs
// and date orders follow the column's locale (see Locale); a spelling the
// locale does not use comes only with mixed sources, marked
// MessMixedSources.
const (
	MessThousands      Mess = "thousands"            // grouped as the locale groups: 1,234,567.5 (en-US), 1.234.567,5 (de-DE)
	MessThousandsDot   Mess = "thousands-dot"        // 1.234.567,5 as another source writes it (mixed sources only)
	MessThousandsSpace Mess = "thousands-space"      // 1 234 567,5 with a space, NBSP or narrow NBSP (mixed sources only)
	MessThousandsQuote Mess = "thousands-apostrophe" // 1'234'567.5 or 1’234’567.5 (mixed sources only)
	MessDecimalComma   Mess = "decimal-comma"        // 1234567,5 where the locale's mark is a comma (else mixed sources)
	MessCurrency       Mess = "currency"             // the locale's sign where it puts it: $1,234.50, 1.234,50 €
	MessPercent        Mess = "percent"              // 12.5% for 0.125 (float64 columns)
	MessParentheses    Mess = "parentheses"          // (1,234.50) for -1234.5, where the locale's accounting format has them
	MessUnicodeMinus   Mess = "unicode-minus"        // −1234.5 with U+2212 MINUS SIGN
	MessTrailingMinus  Mess = "trailing-minus"       // 1234.5-
	MessPlusSign       Mess = "plus-sign"            // +12
	MessFullWidth      Mess = "full-width"           // １２３４．５ (U+FF10–U+FF19), ja-JP
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
	MessDayFirst       Mess = "day-first"       // 31/01/2024, 31.01.2024: locales whose dates run day-month-year
	MessMonthFirst     Mess = "month-first"     // 01/31/2024, 1/31/2024: en-US
	MessTwoDigitYear   Mess = "two-digit-year"  // 31/01/24 (see TwoDigitYear for the century)
	MessMonthName      Mess = "month-name"      // Jan 31, 2024 (en-US), 31 Jan 2024 (en-GB)
	MessCompactDate    Mess = "compact-date"    // 20240131, 20240131T103000
	MessSerialDate     Mess = "serial-date"     // 45322, 45322.4375 (see SerialToTime)
	MessEpochSeconds   Mess = "epoch-seconds"   // 1706697000
	MessEpochMillis    Mess = "epoch-millis"    // 1706697000000
	MessMidnight       Mess = "midnight"        // 2024-01-31 00:00:00 in a date column
	MessSpaceSeparator Mess = "space-separator" // 2024-01-31 10:30:00
	MessUTCOffset      Mess = "utc-offset"      // 2024-01-31T16:00:00+05:30, the same instant
	MessTwelveHour     Mess = "twelve-hour"     // 1/31/2024 10:30:00 AM: en-US
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

// Sources.
const (
	// MessMixedSources marks a cell spelled the way another locale
	// writes it (1.234,5 or € in an en-US file; 01/31/2024 in a de-DE
	// one): rows gathered from sources in several countries. No level
	// has it; ask for it with Options.MixedSources or Also.
	MessMixedSources Mess = "mixed-sources"
)

// Messes of whole uploads rather than of cells. No level has them; ask for
// them with Options.Also (or list them in Spellings). Each keeps the clean
// truth: Sample.Clean holds exactly the records the uploads carry.
const (
	// MessReupload splits the rows into Options.Uploads files (default
	// 3) over overlapping time windows, so the rows of each overlap are
	// uploaded twice; those repeated rows carry the mess.
	MessReupload Mess = "re-upload"
	// MessCutShort ends a file in the middle of its last line; the cut
	// row is not a record (its record is lost unless another row holds
	// it).
	MessCutShort Mess = "cut-short"
	// MessRepeatedHeader repeats the header line in the middle of a
	// file, as concatenated exports do.
	MessRepeatedHeader Mess = "repeated-header"
	// MessTotalRow ends a file with a summary row: "Total" in the first
	// text column, the sums of the file's numbers, other cells empty.
	MessTotalRow Mess = "total-row"
	// MessBlankLines puts blank lines in a file: empty lines (which
	// CSV readers skip, so Raw lacks them) and lines of empty fields
	// (,,,: a row of nulls in Raw).
	MessBlankLines Mess = "blank-lines"
	// MessAddedColumn adds a column that is not in the schema halfway
	// through a series of uploads: the later files have it, the earlier
	// ones do not (in the joined Raw table it is null for their rows).
	MessAddedColumn Mess = "added-column"
)

// UploadMesses lists the messes of whole uploads.
func UploadMesses() []Mess {
	return []Mess{MessReupload, MessCutShort, MessRepeatedHeader, MessTotalRow, MessBlankLines, MessAddedColumn}
}

func isUploadMess(m Mess) bool {
	switch m {
	case MessReupload, MessCutShort, MessRepeatedHeader, MessTotalRow, MessBlankLines, MessAddedColumn:
		return true
	}
	return false
}

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
		MessMixedSources,
		MessReupload, MessCutShort, MessRepeatedHeader, MessTotalRow, MessBlankLines, MessAddedColumn,
	}
}

// cellMesses lists the messes of cells within one locale: every mess but
// mixed sources and the upload messes.
func cellMesses() []Mess {
	var out []Mess
	for _, m := range AllMesses() {
		if m != MessMixedSources && !isUploadMess(m) {
			out = append(out, m)
		}
	}
	return out
}

// lightMesses are the messes of the light level: the habits of one
// locale's export tools. Each occurs only where the column's locale has
// it (day-first in en-GB and de-DE, month-first and twelve-hour in en-US,
// a decimal comma where the locale's decimal mark is a comma).
var lightMesses = []Mess{
	MessThousands, MessDecimalComma, MessCurrency, MessPlusSign, MessTrailingZeros, MessEdgeSpace,
	MessNullToken, MessBoolWord, MessCase, MessInnerSpace,
	MessDateSlash, MessDayFirst, MessMonthFirst, MessSpaceSeparator, MessTwelveHour,
}

// LevelMesses returns the messes a level uses when Options.Spellings is
// empty: none for None, the light list for Light, every cell mess for
// Heavy. No level has MessMixedSources or the upload messes.
func LevelMesses(level MessLevel) []Mess {
	switch level {
	case None:
		return nil
	case Heavy:
		return cellMesses()
	}
	return slices.Clone(lightMesses)
}

// MessLevel sets how much mess generated tables carry.
type MessLevel string

// The mess levels. The zero MessLevel means Light. Every level keeps to
// the columns' locale (Options.Locale, default en-US): a number, a date or
// a null word is spelled only as that locale's exports spell it, unless
// MixedSources is on.
const (
	// None: plain spellings (the literal table spelling of each value);
	// nulls are the empty field; no duplicates, no extra columns.
	None MessLevel = "none"
	// Light: one locale's export habits (see LevelMesses): digits grouped
	// and fractions written the locale's way, its currency sign where it
	// puts it, its short numeric dates, a plus sign, trailing zeros, edge
	// blanks, its null words, its yes/no words, case and doubled spaces in
	// categories, year-first dates with slashes, timestamps with a space.
	// 5 % nulls, 15 % of the other cells messy, 2 % duplicate rows.
	Light MessLevel = "light"
	// Heavy: every cell mess of the locale, with 10 % nulls, 50 % messy
	// cells, 3 % sentinels, 2 % extreme numbers, 8 % duplicate rows (half
	// of them spelled anew) and up to one extra column.
	Heavy MessLevel = "heavy"
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
	// light 0.15, heavy 0.5; none 0). Where the column's locale writes
	// fractions with a decimal comma, every fraction gets it besides
	// (mess decimal-comma), unless the column is plain or avoids it.
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

	// Locale is the tag of the columns' locale profile (default en-US;
	// see Locales): how numbers, money, percents, dates, null and yes/no
	// are spelled. A column's Rules may name another.
	Locale string
	// MixedSources lets cells be spelled the way other locales would
	// (MessMixedSources), as rows gathered from several countries are.
	MixedSources bool
	// Also adds messes to the level's (or to Spellings): the upload
	// messes and MessMixedSources, which no level has, or any other.
	Also []Mess
	// Columns steers single columns by name: their values (ranges,
	// uniqueness, allowed values, lengths, derived columns) and their
	// spellings (messes, locale, null rate and tokens).
	Columns map[string]Rules

	// Uploads is the number of files a re-upload series splits the rows
	// into (MessReupload; default 3). Overlap is the share of each
	// file's time window that the next file covers again (default 0.25).
	Uploads int
	Overlap float64
	// UploadRate is the chance that each file of a sample gets each of
	// the upload messes asked for: cut-short, repeated-header,
	// total-row, blank-lines (default 0.5).
	UploadRate float64
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
	locale                                  *Locale
	cols                                    []*colConf // per schema column
	order                                   []int      // schema columns in the order values are made (derived last)
	uploads                                 int        // files in a re-upload series (1: none)
	avoid                                   []Mess     // Options.Avoid
	overlap, uploadRate                     float64
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
	for _, f := range schema {
		if msg := nameProblem(f.Name); msg != "" {
			return nil, &ColumnError{Column: f.Name, Err: errors.New(msg)}
		}
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
		levelMesses = LevelMesses(Light)
		c.nullRate, c.messRate = rate(o.NullRate, 0.05), rate(o.MessRate, 0.15)
		c.sentinelRate, c.extremeRate, c.dupRate = rate(o.SentinelRate, -1), rate(o.ExtremeRate, -1), rate(o.DuplicateRate, 0.02)
		c.extra = count(o.ExtraColumns, -1)
	case Heavy:
		levelMesses = LevelMesses(Heavy)
		c.nullRate, c.messRate = rate(o.NullRate, 0.1), rate(o.MessRate, 0.5)
		c.sentinelRate, c.extremeRate, c.dupRate = rate(o.SentinelRate, 0.03), rate(o.ExtremeRate, 0.02), rate(o.DuplicateRate, 0.08)
		c.extra = count(o.ExtraColumns, 1)
		c.respell = true
	default:
		return nil, fmt.Errorf("property: unknown mess level %q (want none, light or heavy)", level)
	}
	c.missing = count(o.MissingColumns, -1)
	c.avoid = o.Avoid
	known := AllMesses()
	for _, list := range [][]Mess{o.Spellings, o.Avoid, o.Also} {
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
	levelMesses = append(slices.Clip(levelMesses), o.Also...)
	if o.MixedSources {
		levelMesses = append(levelMesses, MessMixedSources)
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
	loc := o.Locale
	if loc == "" {
		loc = DefaultLocale
	}
	lc, err := LocaleByTag(loc)
	if err != nil {
		return nil, fmt.Errorf("property: %w", err)
	}
	c.locale = lc
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
	c.dateFrom, c.dateTo = from.Unix(), to.Unix()
	c.maxDigits = min(count(o.MaxDigits, 7), 15)
	if c.maxDigits == 0 {
		c.maxDigits = 1
	}
	c.decimals = min(count(o.Decimals, 3), 6)
	c.maxWords = max(count(o.MaxWords, 3), 1)
	c.longText = max(count(o.LongText, 4096), 1)
	if err := c.compileUploads(o); err != nil {
		return nil, err
	}
	for name := range o.Columns {
		if schema.Index(name) < 0 {
			return nil, fmt.Errorf("property: rules for unknown column %q", name)
		}
	}
	c.cols = make([]*colConf, len(schema))
	for j, f := range schema {
		cc, err := compileColumn(f, schema, o.Columns[f.Name], c)
		if err != nil {
			return nil, err
		}
		c.cols[j] = cc
	}
	if err := c.checkCapacity(schema, c.maxRows, "MaxRows"); err != nil {
		return nil, err
	}
	if err := c.checkProducible(schema, o); err != nil {
		return nil, err
	}
	order, err := deriveOrder(schema, c.cols)
	if err != nil {
		return nil, err
	}
	c.order = order
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

// Null spellings of any locale's software: spreadsheet errors, database
// and programming words, punctuation. Common practice, no published
// source. Heavy mess adds them to the locale's null words.
var anyLocaleNullTokens = []string{" ", "#N/A", "None", "nil", "nan", "NaN", "--", "—", "?", "."}

// defaultNullTokens returns the null spellings of a level in a locale: its
// null words, and at Heavy those of any locale's software too.
func defaultNullTokens(level MessLevel, lc *Locale) []string {
	out := slices.Clone(lc.NullWords)
	if level == Heavy {
		for _, t := range anyLocaleNullTokens {
			if !slices.Contains(out, t) {
				out = append(out, t)
			}
		}
	}
	return out
}

// nameProblem says why a column name cannot be written into a generated
// file so that fixtures reads it back as written, or "": a NUL byte (no
// text table file holds one), bytes that are not UTF-8 (the file would be
// read as Windows-1252, or as UTF-16 when it starts FF FE), or a byte
// order mark at the start (a reader takes it for the file's own).
func nameProblem(name string) string {
	switch {
	case strings.IndexByte(name, 0) >= 0:
		return "the name holds a NUL byte, which no text table file can hold"
	case !utf8.ValidString(name):
		return "the name is not valid UTF-8"
	case strings.HasPrefix(name, "\ufeff"):
		return "the name starts with U+FEFF, which a reader takes for a byte order mark"
	}
	return ""
}

// deriveOrder returns the schema columns in the order a record's values
// are made: plain columns first, then derived ones after the columns they
// read. A cycle is an error.
func deriveOrder(schema fixtures.Schema, cols []*colConf) ([]int, error) {
	order := make([]int, 0, len(schema))
	state := make([]uint8, len(schema)) // 0 new, 1 visiting, 2 done
	var visit func(j int, path []string) error
	visit = func(j int, path []string) error {
		switch state[j] {
		case 2:
			return nil
		case 1:
			circle := append(path, schema[j].Name)
			return &ColumnError{Column: schema[j].Name, Err: fmt.Errorf("derived columns depend on each other in a circle: %s", strings.Join(circle[slices.Index(circle, schema[j].Name):], " → "))}
		}
		state[j] = 1
		if e := cols[j].derive; e != nil {
			for _, name := range e.columns() {
				if err := visit(schema.Index(name), append(path, schema[j].Name)); err != nil {
					return err
				}
			}
		}
		state[j] = 2
		order = append(order, j)
		return nil
	}
	for j := range schema {
		if cols[j].derive == nil {
			if err := visit(j, nil); err != nil {
				return nil, err
			}
		}
	}
	for j := range schema {
		if err := visit(j, nil); err != nil {
			return nil, err
		}
	}
	return order, nil
}

// compileUploads checks the options of upload messes.
func (c *config) compileUploads(o Options) error {
	c.uploads = 1
	if c.allowed[MessReupload] || c.allowed[MessAddedColumn] {
		c.uploads = 3
	}
	if o.Uploads != 0 {
		if o.Uploads < 1 || o.Uploads > 1000 {
			return fmt.Errorf("property: Uploads %d: want 1 to 1000", o.Uploads)
		}
		c.uploads = o.Uploads
	}
	if c.allowed[MessAddedColumn] && c.uploads < 2 {
		return fmt.Errorf("property: added-column needs a series of 2 uploads or more; Uploads is %d", c.uploads)
	}
	c.overlap = 0
	if c.allowed[MessReupload] {
		c.overlap = rate(o.Overlap, 0.25)
	}
	if c.overlap >= 1 {
		return fmt.Errorf("property: Overlap %v: want a share below 1", o.Overlap)
	}
	c.uploadRate = rate(o.UploadRate, 0.5)
	return nil
}

// Default sentinels by column kind. Common practice of datalogger and
// spreadsheet exports; no published source.
var (
	numberSentinels = []string{"-999", "-9999", "9999", "99999"}
	dateSentinels   = []string{"1900-01-01", "9999-12-31"}
	textSentinels   = []string{"ERR", "ERROR", "#VALUE!"}
)

// errNotProducible is returned for a mess asked for by name that no column
// can take in its locale.
type errNotProducible struct{ err error }

func (e *errNotProducible) Error() string { return e.err.Error() }
func (e *errNotProducible) Unwrap() error { return e.err }

// checkProducible refuses messes asked for by name (Spellings, a column's
// Messes) that no column, or not the column, can take: a spelling its
// locale does not use, or one for another kind of value.
func (c *config) checkProducible(schema fixtures.Schema, o Options) error {
	gens := make([]*colGen, len(schema))
	for j, f := range schema {
		gens[j] = newColGen(f, c, c.cols[j])
	}
	for j, f := range schema {
		for _, m := range c.cols[j].rules.Messes {
			if !gens[j].canMake(m) {
				return &errNotProducible{&ColumnError{Column: f.Name, Err: errors.New(cannotMake(m, f, gens[j]))}}
			}
		}
	}
	for _, m := range o.Spellings {
		if isUploadMess(m) {
			continue
		}
		ok := false
		for _, g := range gens {
			if g.canMake(m) {
				ok = true
				break
			}
		}
		if !ok && len(schema) > 0 {
			if len(schema) == 1 {
				return &errNotProducible{&ColumnError{Column: schema[0].Name, Err: errors.New(cannotMake(m, schema[0], gens[0]))}}
			}
			return &errNotProducible{fmt.Errorf("property: no column can take mess %s in its locale and kind; name another locale, or turn on mixed sources", m)}
		}
	}
	return nil
}

func cannotMake(m Mess, f fixtures.Field, g *colGen) string {
	return fmt.Sprintf("a %s column in %s never takes mess %s (ask for mixed sources to spell as other locales do)", f.Type, g.cc.lc.Tag, m)
}

// canMake reports whether the column can produce a cell with mess m.
func (g *colGen) canMake(m Mess) bool {
	switch m {
	case MessNullToken:
		return len(g.nullTokens) > 0
	case MessSentinel:
		return len(g.sentinels) > 0 || g.cc.sentinelRate > 0
	case MessExtreme:
		return g.kind == fixtures.KindFloat64 || g.kind == fixtures.KindInt64
	case MessLong, MessLineEndings:
		return g.kind == fixtures.KindString
	case MessDecimalComma:
		if g.cc.commaPlain && (g.kind == fixtures.KindFloat64 || g.kind == fixtures.KindDecimal) {
			return true
		}
	case MessMixedSources:
		return g.cc.mixed && len(g.spellers) > 0
	case MessDayFirst, MessMonthFirst:
		for _, sp := range g.spellers {
			if sp.mess == MessTwoDigitYear && g.cc.allowed[MessTwoDigitYear] {
				return true
			}
		}
	}
	for _, sp := range g.spellers {
		if sp.mess == m {
			return true
		}
	}
	return false
}

// checkCapacity refuses unique columns whose rules leave fewer distinct
// values than rows.
func (c *config) checkCapacity(schema fixtures.Schema, rows int, what string) error {
	for j, f := range schema {
		cc := c.cols[j]
		if cc.unique == AnyValues {
			continue
		}
		if n := cc.capacity(f, c, rows); n < rows {
			return &ColumnError{Column: f.Name, Err: fmt.Errorf("only %d distinct values fit its rules, fewer than %s %d", n, what, rows)}
		}
	}
	return nil
}
