package property

import (
	"encoding/xml"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/stretchr/testify/require"
	"golang.org/x/text/currency"
	"golang.org/x/text/language"
	"golang.org/x/text/message"
	xnumber "golang.org/x/text/number"
)

// The profiles' number marks, percent spacing and currency against the
// Unicode CLDR data golang.org/x/text carries.
func TestLocalesAgreeWithCLDRInXText(t *testing.T) {
	for _, l := range Locales() {
		t.Run(l.Tag, func(t *testing.T) {
			tag := language.MustParse(l.Tag)
			p := message.NewPrinter(tag)
			// Source: Unicode CLDR (version 32) via golang.org/x/text/number:
			// the decimal, group and minus symbols of the locale.
			dec, groups, minus := cldrMarks(l.Tag)
			require.Equal(t, dec, l.Decimal, "decimal mark")
			require.Contains(t, groups, l.Group, "group separator")
			require.Equal(t, minus, l.Minus, "minus sign")
			// Source: CLDR percent pattern via x/text: "12%" or "12 %".
			require.Equal(t, "12"+l.PercentGap+"%", p.Sprint(xnumber.Percent(0.12)), "percent")
			// Source: CLDR currency data via golang.org/x/text/currency: the
			// locale's currency, its symbol there and its minor digits
			// (x/text writes the symbol first and a space whatever the
			// locale's pattern; the pattern is checked against CLDR 41 below).
			cu, conf := currency.FromTag(tag)
			require.Equal(t, language.Exact, conf)
			got := p.Sprint(currency.Symbol(cu.Amount(1234.5)))
			sym, num, ok := strings.Cut(got, " ")
			require.True(t, ok, got)
			require.Equal(t, l.Currency, sym, "currency symbol")
			if l.CurrencyDigits == 0 {
				require.NotContains(t, num, l.Decimal, "no minor unit: %s", got)
			} else {
				require.True(t, strings.HasSuffix(num, l.Decimal+"50"), "two minor digits: %s", got)
			}
		})
	}
}

// Facts of CLDR 41 (common/main/*.xml) that x/text does not carry: the
// currency pattern (sign before or after, the gap, where a negative's
// minus goes, accounting parentheses), the short date pattern and the
// 12-hour clock. Source: Unicode CLDR 41, common/main/en.xml, en_GB.xml,
// de.xml, de_CH.xml, fr.xml, sv.xml, ja.xml (currencyFormats standard and
// accounting; dateFormatLength short; timeFormatLength medium), read from
// Debian's unicode-cldr-core 41 package.
var cldr41 = map[string]struct {
	currencyStandard, currencyAccounting string
	shortDate, mediumDate, mediumTime    string
}{
	"en-US": {"¤#,##0.00", "¤#,##0.00;(¤#,##0.00)", "M/d/yy", "MMM d, y", "h:mm:ss a"},
	"en-GB": {"¤#,##0.00", "¤#,##0.00;(¤#,##0.00)", "dd/MM/y", "d MMM y", "HH:mm:ss"},
	"de-DE": {"#,##0.00\u00a0¤", "#,##0.00\u00a0¤", "dd.MM.yy", "dd.MM.y", "HH:mm:ss"},
	"de-CH": {"¤\u00a0#,##0.00;¤-#,##0.00", "#,##0.00\u00a0¤", "dd.MM.yy", "dd.MM.y", "HH:mm:ss"},
	"fr-FR": {"#,##0.00\u00a0¤", "#,##0.00\u00a0¤;(#,##0.00\u00a0¤)", "dd/MM/y", "d MMM y", "HH:mm:ss"},
	"sv-SE": {"#,##0.00\u00a0¤", "#,##0.00\u00a0¤", "y-MM-dd", "d MMM y", "HH:mm:ss"},
	"ja-JP": {"¤#,##0.00", "¤#,##0.00;(¤#,##0.00)", "y/MM/dd", "y/MM/dd", "H:mm:ss"},
}

func TestLocalesFollowCLDRPatterns(t *testing.T) {
	for _, l := range Locales() {
		c, ok := cldr41[l.Tag]
		require.True(t, ok, l.Tag)
		t.Run(l.Tag, func(t *testing.T) {
			checkProfileAgainstPatterns(t, l, c.currencyStandard, c.currencyAccounting, c.shortDate, c.mediumDate, c.mediumTime)
		})
	}
}

// checkProfileAgainstPatterns reads the CLDR patterns and compares what
// they say with the profile.
func checkProfileAgainstPatterns(t *testing.T, l *Locale, std, acct, short, medium, tm string) {
	t.Helper()
	pos, _, _ := strings.Cut(std, ";")
	first := strings.HasPrefix(pos, "¤")
	require.Equal(t, first, l.CurrencyFirst, "currency sign first in %q", std)
	gap := ""
	if strings.Contains(pos, "\u00a0") {
		gap = "\u00a0"
	}
	require.Equal(t, gap, l.CurrencyGap, "gap in %q", std)
	_, negPat, hasNeg := strings.Cut(std, ";")
	require.Equal(t, hasNeg && strings.HasPrefix(negPat, "¤-"), l.NegativeAfterSign, "negative pattern of %q", std)
	_, acctNeg, _ := strings.Cut(acct, ";")
	require.Equal(t, strings.HasPrefix(acctNeg, "("), l.Accounting, "accounting pattern %q", acct)
	// The order of the short date's fields and its separator.
	order := YearMonthDay
	switch {
	case strings.HasPrefix(short, "d"):
		order = DayMonthYear
	case strings.HasPrefix(short, "M"):
		order = MonthDayYear
	}
	require.Equal(t, order, l.Order, "order of %q", short)
	sep := strings.Trim(short, "dMy")
	require.Equal(t, l.DateSep, sep[:1], "separator of %q", short)
	require.Equal(t, strings.HasSuffix(short, "yy") || strings.HasPrefix(short, "yy"), l.ShortYear, "two-digit year in %q", short)
	require.Equal(t, strings.HasSuffix(tm, " a"), l.TwelveHour, "12-hour clock in %q", tm)
	if l.HasMonthNames() {
		require.Contains(t, medium, "MMM")
		require.Equal(t, strings.HasPrefix(medium, "MMM"), l.MonthFirst, "month first in %q", medium)
	}
}

// When the CLDR XML itself is installed (Debian's unicode-cldr-core, which
// .ci/run installs), the figures above are read from it rather than
// trusted.
func TestCLDRFiguresMatchTheInstalledXML(t *testing.T) {
	const dir = "/usr/share/unicode/cldr/common/main"
	if _, err := os.Stat(dir); err != nil {
		if os.Getenv("CI") != "" {
			t.Fatalf("CLDR XML not installed at %s (apt-get install unicode-cldr-core)", dir)
		}
		t.Skipf("CLDR XML not installed at %s (apt-get install unicode-cldr-core)", dir)
	}
	files := map[string][]string{ // locale → files, most specific first (CLDR inheritance)
		"en-US": {"en"}, "en-GB": {"en_GB", "en_001", "en"}, "de-DE": {"de"}, "de-CH": {"de_CH", "de"},
		"fr-FR": {"fr"}, "sv-SE": {"sv"}, "ja-JP": {"ja"},
	}
	for tag, chain := range files {
		var got struct{ std, acct, short, medium, tm string }
		for _, f := range chain {
			x := readCLDR(t, filepath.Join(dir, f+".xml"))
			fill := func(dst *string, v string) {
				if *dst == "" && v != "" {
					*dst = v
				}
			}
			fill(&got.std, x.currency["standard"])
			fill(&got.acct, x.currency["accounting"])
			fill(&got.short, x.date["short"])
			fill(&got.medium, x.date["medium"])
			fill(&got.tm, x.time["medium"])
		}
		want := cldr41[tag]
		require.Equal(t, want.currencyStandard, got.std, "%s standard currency", tag)
		require.Equal(t, want.currencyAccounting, got.acct, "%s accounting currency", tag)
		require.Equal(t, want.shortDate, got.short, "%s short date", tag)
		require.Equal(t, want.mediumDate, got.medium, "%s medium date", tag)
		require.Equal(t, want.mediumTime, got.tm, "%s medium time", tag)
	}
}

type cldrFacts struct {
	currency, date, time map[string]string
}

// readCLDR reads the Gregorian date and time patterns and the Latin-digit
// currency patterns of one CLDR locale file.
func readCLDR(t *testing.T, path string) cldrFacts {
	t.Helper()
	data, err := os.ReadFile(path)
	require.NoError(t, err)
	type pattern struct {
		Alt  string `xml:"alt,attr"`
		Text string `xml:",chardata"`
	}
	var doc struct {
		Calendars []struct {
			Type  string `xml:"type,attr"`
			Dates []struct {
				Type     string    `xml:"type,attr"`
				Patterns []pattern `xml:"dateFormat>pattern"`
			} `xml:"dateFormats>dateFormatLength"`
			Times []struct {
				Type     string    `xml:"type,attr"`
				Patterns []pattern `xml:"timeFormat>pattern"`
			} `xml:"timeFormats>timeFormatLength"`
		} `xml:"dates>calendars>calendar"`
		Currencies []struct {
			NumberSystem string `xml:"numberSystem,attr"`
			Lengths      []struct {
				Type    string `xml:"type,attr"`
				Formats []struct {
					Type     string    `xml:"type,attr"`
					Patterns []pattern `xml:"pattern"`
				} `xml:"currencyFormat"`
			} `xml:"currencyFormatLength"`
		} `xml:"numbers>currencyFormats"`
	}
	require.NoError(t, xml.Unmarshal(data, &doc), path)
	f := cldrFacts{currency: map[string]string{}, date: map[string]string{}, time: map[string]string{}}
	first := func(ps []pattern) string {
		for _, p := range ps {
			if p.Alt == "" {
				return p.Text
			}
		}
		return ""
	}
	for _, c := range doc.Calendars {
		if c.Type != "gregorian" {
			continue
		}
		for _, d := range c.Dates {
			f.date[d.Type] = first(d.Patterns)
		}
		for _, tm := range c.Times {
			f.time[tm.Type] = first(tm.Patterns)
		}
	}
	for _, c := range doc.Currencies {
		if c.NumberSystem != "" && c.NumberSystem != "latn" {
			continue
		}
		for _, l := range c.Lengths {
			if l.Type != "" {
				continue
			}
			for _, cf := range l.Formats {
				f.currency[cf.Type] = first(cf.Patterns)
			}
		}
	}
	return f
}
