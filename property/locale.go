package property

import (
	"fmt"
	"strings"
)

// DateOrder is the order of day, month and year in a locale's numeric
// dates.
type DateOrder uint8

// The date orders.
const (
	YearMonthDay DateOrder = iota // 2024-01-31, 2024/01/31
	DayMonthYear                  // 31/01/2024, 31.01.2024
	MonthDayYear                  // 1/31/2024
)

var dateOrderNames = [...]string{"year-month-day", "day-month-year", "month-day-year"}

// String returns year-month-day, day-month-year or month-day-year.
func (o DateOrder) String() string {
	if int(o) < len(dateOrderNames) {
		return dateOrderNames[o]
	}
	return fmt.Sprintf("DateOrder(%d)", int(o))
}

// Locale is how the exports of one locale write numbers, money, percents,
// dates, null and yes/no: a profile that keeps a file's mess readable by a
// parser of that locale. A column has one locale (the file's, unless its
// Rules name another); its messy spellings follow it, and only the
// mixed-sources mess (MessMixedSources) spells a cell the way another
// locale would.
//
// The shipped profiles (Locales) take their marks and patterns from the
// Unicode Common Locale Data Repository: decimal, group, minus and percent
// from the CLDR data golang.org/x/text carries (CLDR 32), currency and
// date patterns from the CLDR 41 charts (common/main/*.xml); the tests
// check each against its source. Null words and yes/no words are common
// practice of each language's exports; CLDR has none.
type Locale struct {
	// Tag is the BCP 47 tag: en-US, de-DE.
	Tag string
	// Decimal and Group are the decimal mark and the digit group
	// separator; Minus is the minus sign of locale-formatted numbers.
	Decimal, Group, Minus string
	// Currency is the sign of the locale's currency; CurrencyFirst puts
	// it before the amount; CurrencyGap goes between sign and amount;
	// CurrencyDigits is its minor digits (2; 0 for yen). A negative
	// amount puts Minus where NegativeAfterSign says: after the sign
	// (CHF-1’234.50) or before everything (-$1,234.50, -1.234,50 €).
	Currency          string
	CurrencyFirst     bool
	CurrencyGap       string
	CurrencyDigits    int
	NegativeAfterSign bool
	// Accounting reports that the locale's accounting format writes a
	// negative amount in parentheses: ($1,234.50).
	Accounting bool
	// PercentGap goes between the number and the % sign.
	PercentGap string
	// Order, DateSep and ShortYear describe the locale's short numeric
	// date: 1/31/24 (month-day-year, "/", two-digit year) or 31.01.24.
	// Dates with the year first need no order mess: they are spelled
	// year-first, as the plain spelling is.
	Order     DateOrder
	DateSep   string
	ShortYear bool
	// MonthNames are the abbreviated and full month names of the
	// locale's medium and long dates, January first; empty when the
	// profile ships none. MonthFirst writes "Jan 31, 2024", else
	// "31 Jan 2024".
	MonthNames [2][12]string
	MonthFirst bool
	// TwelveHour reports that the locale's times run on a 12-hour clock
	// with AM and PM.
	TwelveHour bool
	// FullWidth reports that the locale's input methods write full-width
	// digits (１２３).
	FullWidth bool
	// NullWords are what the locale's exports write for a missing value.
	NullWords []string
	// BoolWords are its (true, false) word pairs.
	BoolWords [][2]string
}

// HasMonthNames reports whether the profile ships month names.
func (l *Locale) HasMonthNames() bool { return l.MonthNames[0][0] != "" }

// String returns the tag.
func (l *Locale) String() string { return l.Tag }

var englishMonths = [2][12]string{
	{"Jan", "Feb", "Mar", "Apr", "May", "Jun", "Jul", "Aug", "Sep", "Oct", "Nov", "Dec"},
	{"January", "February", "March", "April", "May", "June", "July", "August", "September", "October", "November", "December"},
}

// The shipped profiles. Sources (checked in locale_test.go):
//   - Decimal, Group, Minus, PercentGap, Currency, CurrencyDigits: Unicode
//     CLDR as carried by golang.org/x/text (number and currency packages).
//     fr-FR groups with U+202F NARROW NO-BREAK SPACE as CLDR has since
//     version 34; x/text's CLDR 32 still has U+00A0.
//   - CurrencyFirst, CurrencyGap, NegativeAfterSign, Accounting: the
//     standard and accounting currency patterns of CLDR 41
//     common/main/{en,de,de_CH,fr,sv,ja}.xml.
//   - Order, DateSep, ShortYear, MonthFirst: the short and medium date
//     patterns of CLDR 41 (en M/d/yy and MMM d, y; en_GB dd/MM/y and d
//     MMM y; de dd.MM.yy; fr dd/MM/y; sv y-MM-dd; ja y/MM/dd).
//   - TwelveHour: CLDR 41 medium time patterns (en h:mm:ss a, the others
//     24-hour).
//   - NullWords, BoolWords: common practice, no published source.
var (
	LocaleEnUS = &Locale{
		Tag: "en-US", Decimal: ".", Group: ",", Minus: "-",
		Currency: "$", CurrencyFirst: true, CurrencyDigits: 2, Accounting: true,
		Order: MonthDayYear, DateSep: "/", ShortYear: true,
		MonthNames: englishMonths, MonthFirst: true, TwelveHour: true,
		NullWords: []string{"NA", "N/A", "n/a", "null", "NULL", "-"},
		BoolWords: [][2]string{{"yes", "no"}, {"Yes", "No"}, {"Y", "N"}, {"TRUE", "FALSE"}, {"1", "0"}},
	}
	LocaleEnGB = &Locale{
		Tag: "en-GB", Decimal: ".", Group: ",", Minus: "-",
		Currency: "£", CurrencyFirst: true, CurrencyDigits: 2, Accounting: true,
		Order: DayMonthYear, DateSep: "/",
		MonthNames: englishMonths,
		NullWords:  []string{"NA", "N/A", "n/a", "null", "NULL", "-"},
		BoolWords:  [][2]string{{"yes", "no"}, {"Yes", "No"}, {"Y", "N"}, {"TRUE", "FALSE"}, {"1", "0"}},
	}
	LocaleDeDE = &Locale{
		Tag: "de-DE", Decimal: ",", Group: ".", Minus: "-",
		Currency: "€", CurrencyGap: "\u00a0", CurrencyDigits: 2,
		PercentGap: "\u00a0",
		Order:      DayMonthYear, DateSep: ".", ShortYear: true,
		NullWords: []string{"k.A.", "n.v.", "-", "NULL"},
		BoolWords: [][2]string{{"ja", "nein"}, {"Ja", "Nein"}, {"J", "N"}, {"WAHR", "FALSCH"}, {"1", "0"}},
	}
	LocaleDeCH = &Locale{
		Tag: "de-CH", Decimal: ".", Group: "\u2019", Minus: "-",
		Currency: "CHF", CurrencyFirst: true, CurrencyGap: "\u00a0", CurrencyDigits: 2, NegativeAfterSign: true,
		Order: DayMonthYear, DateSep: ".", ShortYear: true,
		NullWords: []string{"k.A.", "-", "NULL"},
		BoolWords: [][2]string{{"ja", "nein"}, {"Ja", "Nein"}, {"J", "N"}, {"1", "0"}},
	}
	LocaleFrFR = &Locale{
		Tag: "fr-FR", Decimal: ",", Group: "\u202f", Minus: "-",
		Currency: "€", CurrencyGap: "\u00a0", CurrencyDigits: 2, Accounting: true,
		PercentGap: "\u00a0",
		Order:      DayMonthYear, DateSep: "/",
		NullWords: []string{"N/D", "n.d.", "ND", "-", "NULL"},
		BoolWords: [][2]string{{"oui", "non"}, {"Oui", "Non"}, {"O", "N"}, {"VRAI", "FAUX"}, {"1", "0"}},
	}
	LocaleSvSE = &Locale{
		Tag: "sv-SE", Decimal: ",", Group: "\u00a0", Minus: "\u2212",
		Currency: "kr", CurrencyGap: "\u00a0", CurrencyDigits: 2,
		PercentGap: "\u00a0",
		Order:      YearMonthDay, DateSep: "-",
		NullWords: []string{"saknas", "uppgift saknas", "-", "NULL"},
		BoolWords: [][2]string{{"ja", "nej"}, {"Ja", "Nej"}, {"J", "N"}, {"SANT", "FALSKT"}, {"1", "0"}},
	}
	LocaleJaJP = &Locale{
		Tag: "ja-JP", Decimal: ".", Group: ",", Minus: "-",
		Currency: "￥", CurrencyFirst: true, CurrencyDigits: 0, Accounting: true,
		Order: YearMonthDay, DateSep: "/",
		FullWidth: true,
		NullWords: []string{"なし", "不明", "－", "-", "NULL"},
		BoolWords: [][2]string{{"はい", "いいえ"}, {"有", "無"}, {"○", "×"}, {"1", "0"}},
	}
)

// Locales returns the shipped locale profiles: en-US, en-GB, de-DE,
// de-CH, fr-FR, sv-SE and ja-JP.
func Locales() []*Locale {
	return []*Locale{LocaleEnUS, LocaleEnGB, LocaleDeDE, LocaleDeCH, LocaleFrFR, LocaleSvSE, LocaleJaJP}
}

// DefaultLocale is the profile of columns whose Options and Rules name
// none: en-US.
const DefaultLocale = "en-US"

// LocaleByTag returns the shipped profile of a BCP 47 tag (any case; _ for
// -), or an error naming the shipped ones.
func LocaleByTag(tag string) (*Locale, error) {
	want := strings.ToLower(strings.ReplaceAll(strings.TrimSpace(tag), "_", "-"))
	var tags []string
	for _, l := range Locales() {
		if strings.ToLower(l.Tag) == want {
			return l, nil
		}
		tags = append(tags, l.Tag)
	}
	return nil, fmt.Errorf("unknown locale %q (want %s)", tag, strings.Join(tags, ", "))
}

// commaDecimal reports whether the locale's decimal mark is a comma, so
// that a fraction written with a point would read as a digit group.
func (l *Locale) commaDecimal() bool { return l.Decimal == "," }
