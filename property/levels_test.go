package property

import (
	"slices"
	"strings"
	"testing"

	"github.com/stretchr/testify/require"
)

// What each level makes in each locale, as the documentation of the
// levels (MessLevel, LevelMesses, README "Mess levels and locales") says:
// light is the locale's export habits, heavy every cell mess the locale
// has; neither spells as another locale does.
var (
	lightEverywhere = []Mess{MessThousands, MessCurrency, MessPlusSign, MessTrailingZeros, MessEdgeSpace,
		MessNullToken, MessBoolWord, MessCase, MessInnerSpace, MessDateSlash, MessSpaceSeparator}
	heavyEverywhere = []Mess{MessThousands, MessCurrency, MessPercent, MessUnicodeMinus, MessTrailingMinus,
		MessPlusSign, MessExponent, MessLeadingZeros, MessTrailingZeros, MessExtreme, MessNullToken, MessSentinel,
		MessBoolWord, MessDateSlash, MessCompactDate, MessSerialDate, MessEpochSeconds, MessEpochMillis,
		MessMidnight, MessSpaceSeparator, MessUTCOffset, MessEdgeSpace, MessCase, MessInnerSpace, MessAccent,
		MessDecomposed, MessMojibake, MessWindows1252, MessInvalidUTF8, MessStrayBOM, MessNBSP, MessZeroWidth,
		MessLineEndings, MessLong}
	// What a locale adds to those.
	localeLight = map[string][]Mess{
		"en-US": {MessMonthFirst, MessTwelveHour},
		"en-GB": {MessDayFirst},
		"de-DE": {MessDayFirst, MessDecimalComma},
		"de-CH": {MessDayFirst},
		"fr-FR": {MessDayFirst, MessDecimalComma},
		"sv-SE": {MessDecimalComma},
		"ja-JP": {},
	}
	localeHeavy = map[string][]Mess{
		"en-US": {MessMonthFirst, MessTwelveHour, MessTwoDigitYear, MessMonthName, MessParentheses},
		"en-GB": {MessDayFirst, MessTwoDigitYear, MessMonthName, MessParentheses},
		"de-DE": {MessDayFirst, MessTwoDigitYear, MessDecimalComma},
		"de-CH": {MessDayFirst, MessTwoDigitYear},
		"fr-FR": {MessDayFirst, MessTwoDigitYear, MessDecimalComma, MessParentheses},
		"sv-SE": {MessDecimalComma},
		"ja-JP": {MessFullWidth, MessParentheses},
	}
	// Currency signs of the shipped locales; a file of one locale holds
	// only its own.
	allSigns = []string{"$", "£", "€", "CHF", "kr", "￥", "¥"}
)

type levelCount struct {
	messes                         map[Mess]int
	cells, nulls, sentinels, messy int
	plain, rows, dups              int
}

func countLevel(t *testing.T, level MessLevel, tag string, mixed bool, samples int) levelCount {
	t.Helper()
	lc := levelCount{messes: map[Mess]int{}}
	for seed := int64(1); seed <= int64(samples); seed++ {
		s, err := Generate(greenhouse, 400, seed, Options{Mess: level, Locale: tag, MixedSources: mixed, ExtraColumns: -1})
		require.NoError(t, err)
		for k, v := range s.MessCounts() {
			lc.messes[k] += v
		}
		lc.rows += s.NumRows()
		lc.dups += s.Duplicates()
		for i := 0; i < s.NumRows(); i++ {
			for j := 0; j < s.NumCols(); j++ {
				c := s.Cell(i, j)
				f := s.Schema[s.Field(j)]
				lc.cells++
				switch {
				case c.Mess == MessSentinel:
					lc.sentinels++
				case c.Clean == nil:
					lc.nulls++
				case c.Mess == MessNone || c.Mess == MessDecimalComma:
					lc.plain++
				default:
					lc.messy++
				}
				// Every cell reads back to its value with the locale's own
				// marks (taken from CLDR via x/text, see cldrMarks).
				require.NoError(t, checkCellIn(f, c, tag), "%s %s: column %s, %q (%s)", level, tag, f.Name, c.Raw, c.Mess)
				if !mixed && f.Type.Kind().IsNumeric() {
					for _, sign := range allSigns {
						if strings.Contains(c.Raw, sign) {
							own := mustLocale(t, tag).Currency
							require.True(t, sign == own || strings.Contains(own, sign), "%s %s: %q holds %s", level, tag, c.Raw, sign)
						}
					}
				}
			}
		}
	}
	return lc
}

func mustLocale(t *testing.T, tag string) *Locale {
	l, err := LocaleByTag(tag)
	require.NoError(t, err)
	return l
}

func messSet(m map[Mess]int) []Mess {
	var out []Mess
	for k, v := range m {
		if v > 0 {
			out = append(out, k)
		}
	}
	slices.Sort(out)
	return out
}

func sorted(ms ...[]Mess) []Mess {
	var out []Mess
	for _, l := range ms {
		out = append(out, l...)
	}
	slices.Sort(out)
	return slices.Compact(out)
}

func TestLevelsAreWhatTheirDocumentationSays(t *testing.T) {
	for _, l := range Locales() {
		t.Run(l.Tag, func(t *testing.T) {
			none := countLevel(t, None, l.Tag, false, 5)
			require.Empty(t, messSet(none.messes), "none: plain spellings only")
			require.Zero(t, none.dups)
			require.InDelta(t, 0.05, float64(none.nulls)/float64(none.cells), 0.01, "none: 5 %% nulls")

			light := countLevel(t, Light, l.Tag, false, 20)
			require.Equal(t, sorted(lightEverywhere, localeLight[l.Tag]), messSet(light.messes), "light in %s", l.Tag)
			require.InDelta(t, 0.05, float64(light.nulls)/float64(light.cells), 0.01, "light: 5 %% nulls")
			require.Zero(t, light.sentinels)
			require.InDelta(t, 0.15, float64(light.messy)/float64(light.messy+light.plain), 0.015, "light: 15 %% messy")
			require.InDelta(t, 0.02, float64(light.dups)/float64(light.rows), 0.006, "light: 2 %% duplicates")

			heavy := countLevel(t, Heavy, l.Tag, false, 20)
			require.Equal(t, sorted(heavyEverywhere, localeHeavy[l.Tag]), messSet(heavy.messes), "heavy in %s", l.Tag)
			require.InDelta(t, 0.10, float64(heavy.nulls)/float64(heavy.cells), 0.01, "heavy: 10 %% nulls")
			require.InDelta(t, 0.03, float64(heavy.sentinels)/float64(heavy.cells-heavy.nulls), 0.006, "heavy: 3 %% sentinels")
			require.InDelta(t, 0.50, float64(heavy.messy)/float64(heavy.messy+heavy.plain), 0.03, "heavy: 50 %% messy")
			require.InDelta(t, 0.08, float64(heavy.dups)/float64(heavy.rows), 0.01, "heavy: 8 %% duplicates")
		})
	}
	// Mixed sources bring the other locales' spellings, and only then.
	mixed := countLevel(t, Heavy, "en-US", true, 5)
	for _, m := range []Mess{MessMixedSources, MessDayFirst, MessThousandsDot, MessThousandsSpace, MessThousandsQuote, MessDecimalComma} {
		require.Positive(t, mixed.messes[m], "mixed sources make %s in en-US", m)
	}
}
