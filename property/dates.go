package property

import (
	"errors"
	"fmt"
	"math"
	"strconv"
	"strings"
	"time"
)

// The 1900 date system of spreadsheets counts days from serial 1 =
// 1900-01-01 and, for compatibility with an early program, has a serial
// 60 for the day 1900-02-29 that never was; from serial 61 = 1900-03-01 on
// a serial is days since 1899-12-30. (From memory: serial 45292 is
// 2024-01-01 and serial 60 the non-existent 1900-02-29; no document was
// consulted.)
var (
	serialEpoch     = time.Date(1899, 12, 30, 0, 0, 0, 0, time.UTC) // serial 0 for serials ≥ 61
	serialEarly     = time.Date(1899, 12, 31, 0, 0, 0, 0, time.UTC) // serial 0 for serials < 60
	serialFirstReal = time.Date(1900, 3, 1, 0, 0, 0, 0, time.UTC)   // serial 61
	serialLast      = time.Date(9999, 12, 31, 0, 0, 0, 0, time.UTC) // the last day the system counts
)

// ErrSerial60 is returned for serial 60, the day 1900-02-29 that the 1900
// date system counts but the calendar does not have.
var ErrSerial60 = errors.New("serial 60 is 1900-02-29, a day the calendar does not have")

// SerialToTime converts a spreadsheet serial number of the 1900 date system
// to the wall-clock time it stands for, in UTC: the integer part is the day
// (1 is 1900-01-01), the fraction the time of day, rounded to the
// millisecond. Serials below 1, serial 60 (ErrSerial60) and serials after
// 9999-12-31 are errors.
func SerialToTime(serial float64) (time.Time, error) {
	if math.IsNaN(serial) || serial < 1 || serial >= 2958466 {
		return time.Time{}, fmt.Errorf("serial %v is outside the 1900 date system (1 to 2958465)", serial)
	}
	day := math.Floor(serial)
	if day == 60 {
		return time.Time{}, ErrSerial60
	}
	ms := math.Round((serial - day) * 86400000)
	base := serialEpoch
	if day < 60 {
		base = serialEarly
	}
	return base.AddDate(0, 0, int(day)).Add(time.Duration(ms) * time.Millisecond), nil
}

// TimeToSerial converts a wall-clock time (its own calendar day and clock
// reading) to a spreadsheet serial number of the 1900 date system: days
// plus the fraction of the day. Times before 1900-01-01 or after
// 9999-12-31 are errors.
func TimeToSerial(t time.Time) (float64, error) {
	w := time.Date(t.Year(), t.Month(), t.Day(), t.Hour(), t.Minute(), t.Second(), t.Nanosecond(), time.UTC)
	if w.Year() < 1900 || w.After(serialLast.Add(24*time.Hour-1)) {
		return 0, fmt.Errorf("%s is outside the 1900 date system (1900-01-01 to 9999-12-31)", w.Format(time.RFC3339))
	}
	base := serialEpoch
	if w.Before(serialFirstReal) {
		base = serialEarly
	}
	secs := w.Unix() - base.Unix() // whole seconds: a Duration overflows past 292 years
	days := floorDiv(secs, 86400)
	rest := float64(secs-days*86400) + float64(w.Nanosecond())/1e9
	return float64(days) + rest/86400, nil
}

// TwoDigitYear gives the century to a two-digit year as POSIX strptime's
// %y does: 69 to 99 are 1969 to 1999, 00 to 68 are 2000 to 2068 (Source:
// POSIX.1-2017 strptime, %y; from memory). It returns -1 for yy outside
// 0..99.
func TwoDigitYear(yy int) int {
	switch {
	case yy < 0 || yy > 99:
		return -1
	case yy >= 69:
		return 1900 + yy
	}
	return 2000 + yy
}

func pad2(n int) string {
	if n < 10 {
		return "0" + strconv.Itoa(n)
	}
	return strconv.Itoa(n)
}

func pad4(n int) string {
	s := strconv.Itoa(n)
	for len(s) < 4 {
		s = "0" + s
	}
	return s
}

// ymd is a date's parts as text.
func ymd(t time.Time) (y, m, d string, mi, di int) {
	return pad4(t.Year()), pad2(int(t.Month())), pad2(t.Day()), int(t.Month()), t.Day()
}

// dayFirst writes a date day first: in the locale's own way (its date
// separator, padded or not) or, for another source, in one of the common
// layouts.
func dayFirst(g *colGen, r *rng, t time.Time) string {
	y, m, d, mi, di := ymd(t)
	if g.lc.Order == DayMonthYear {
		sep := g.lc.DateSep
		if r.next()&1 == 1 {
			return d + sep + m + sep + y
		}
		return strconv.Itoa(di) + sep + strconv.Itoa(mi) + sep + y
	}
	switch r.intn(4) {
	case 0:
		return d + "/" + m + "/" + y
	case 1:
		return d + "." + m + "." + y
	case 2:
		return d + "-" + m + "-" + y
	}
	return strconv.Itoa(di) + "/" + strconv.Itoa(mi) + "/" + y
}

func monthFirst(r *rng, t time.Time) string {
	y, m, d, mi, di := ymd(t)
	if r.next()&1 == 1 {
		return m + "/" + d + "/" + y
	}
	return strconv.Itoa(mi) + "/" + strconv.Itoa(di) + "/" + y
}

// twoDigit writes a date with a two-digit year in the locale's order.
func twoDigit(g *colGen, r *rng, t time.Time) (string, Mess, bool) {
	if t.Year() < 1969 || t.Year() > 2068 {
		return "", "", false
	}
	_, m, d, _, _ := ymd(t)
	yy := pad2(t.Year() % 100)
	if g.lc.Order == MonthDayYear {
		return m + "/" + d + "/" + yy, MessMonthFirst.and(MessTwoDigitYear), true
	}
	sep := g.lc.DateSep
	if g.lc.Order != DayMonthYear { // another source's layout
		sep = pick(r, []string{"/", "."})
	}
	return d + sep + m + sep + yy, MessDayFirst.and(MessTwoDigitYear), true
}

// monthName writes a date with the locale's month names: month first
// (Jan 31, 2024) or day first (31 Jan 2024), abbreviated or in full.
func monthName(g *colGen, r *rng, t time.Time) string {
	names := g.lc.MonthNames
	full := r.next()&1 == 1
	mon := names[0][t.Month()-1]
	if full {
		mon = names[1][t.Month()-1]
	}
	d, y := strconv.Itoa(t.Day()), strconv.Itoa(t.Year())
	if g.lc.MonthFirst {
		return mon + " " + d + ", " + y
	}
	return d + " " + mon + " " + y
}

func serialText(t time.Time, frac bool) (string, bool) {
	if t.Before(serialFirstReal) || t.After(serialLast) {
		return "", false
	}
	s, err := TimeToSerial(t)
	if err != nil {
		return "", false
	}
	if !frac {
		return strconv.FormatFloat(math.Floor(s), 'f', -1, 64), true
	}
	text := strings.TrimRight(strconv.FormatFloat(s, 'f', 9, 64), "0")
	return strings.TrimSuffix(text, "."), true
}

func hasOrder(o DateOrder) func(*Locale) bool {
	return func(l *Locale) bool { return l.Order == o }
}

func ordersDiffer(a, b *Locale) bool { return a.Order != b.Order }

func hasShortYear(l *Locale) bool { return l.Order != YearMonthDay }

func namesDiffer(a, b *Locale) bool {
	return a.MonthNames != b.MonthNames || a.MonthFirst != b.MonthFirst
}

var dateSpellers = []localeSpeller{
	{mess: MessDateSlash, fn: func(_ *colGen, r *rng, v *value) (string, Mess, bool) {
		y, m, d, _, _ := ymd(v.t)
		if r.next()&1 == 1 {
			return y + "." + m + "." + d, MessDateSlash, true
		}
		return y + "/" + m + "/" + d, MessDateSlash, true
	}},
	{mess: MessDayFirst, fn: func(g *colGen, r *rng, v *value) (string, Mess, bool) { return dayFirst(g, r, v.t), MessDayFirst, true },
		in: hasOrder(DayMonthYear), differs: ordersDiffer},
	{mess: MessMonthFirst, fn: func(_ *colGen, r *rng, v *value) (string, Mess, bool) {
		return monthFirst(r, v.t), MessMonthFirst, true
	}, in: hasOrder(MonthDayYear), differs: ordersDiffer},
	{mess: MessTwoDigitYear, fn: func(g *colGen, r *rng, v *value) (string, Mess, bool) { return twoDigit(g, r, v.t) },
		in: hasShortYear, differs: ordersDiffer},
	{mess: MessMonthName, fn: func(g *colGen, r *rng, v *value) (string, Mess, bool) {
		return monthName(g, r, v.t), MessMonthName, true
	}, in: (*Locale).HasMonthNames, differs: namesDiffer},
	{mess: MessCompactDate, fn: func(_ *colGen, _ *rng, v *value) (string, Mess, bool) {
		y, m, d, _, _ := ymd(v.t)
		return y + m + d, MessCompactDate, true
	}},
	{mess: MessSerialDate, fn: func(_ *colGen, _ *rng, v *value) (string, Mess, bool) {
		s, ok := serialText(v.t, false)
		return s, MessSerialDate, ok
	}},
	{mess: MessEpochSeconds, fn: func(_ *colGen, _ *rng, v *value) (string, Mess, bool) {
		return strconv.FormatInt(v.t.Unix(), 10), MessEpochSeconds, true
	}},
	{mess: MessMidnight, fn: func(_ *colGen, r *rng, v *value) (string, Mess, bool) {
		if r.next()&1 == 1 {
			return v.plain + " 00:00:00", MessMidnight, true
		}
		return v.plain + "T00:00:00", MessMidnight, true
	}},
	{mess: MessEdgeSpace, fn: spellEdgeSpace},
}

// clock writes the time of day as HH:MM:SS with the fraction the value
// has, trailing zeros dropped. Timestamp values hold the wall clock of
// their column's zone (zone-less: as written, in UTC).
func clock(t time.Time) string { return t.Format("15:04:05.999999999") }

func wholeSeconds(t time.Time) bool { return t.Nanosecond() == 0 }

var timestampSpellers = []localeSpeller{
	{mess: MessSpaceSeparator, fn: func(g *colGen, _ *rng, v *value) (string, Mess, bool) {
		t := v.t
		return t.Format("2006-01-02") + " " + clock(t), MessSpaceSeparator, true
	}},
	{mess: MessUTCOffset, fn: func(g *colGen, r *rng, v *value) (string, Mess, bool) {
		if g.field.Type.Zone() == "" {
			return "", "", false // a zone-less time has no instant to shift
		}
		off := pick(r, offsets)
		t := v.t.In(time.FixedZone("", off))
		return t.Format("2006-01-02T15:04:05.999999999-07:00"), MessUTCOffset, true
	}},
	{mess: MessDayFirst, fn: func(g *colGen, r *rng, v *value) (string, Mess, bool) {
		t := v.t
		return dayFirst(g, r, t) + " " + clock(t), MessDayFirst, true
	}, in: hasOrder(DayMonthYear), differs: ordersDiffer},
	{mess: MessMonthFirst, fn: func(g *colGen, r *rng, v *value) (string, Mess, bool) {
		t := v.t
		return monthFirst(r, t) + " " + clock(t), MessMonthFirst, true
	}, in: hasOrder(MonthDayYear), differs: ordersDiffer},
	{mess: MessTwelveHour, fn: func(g *colGen, r *rng, v *value) (string, Mess, bool) {
		t := v.t
		if !wholeSeconds(t) {
			return "", "", false
		}
		return monthFirst(r, t) + " " + t.Format("3:04:05 PM"), MessMonthFirst.and(MessTwelveHour), true
	}, in: func(l *Locale) bool { return l.TwelveHour }, differs: func(a, b *Locale) bool { return !a.TwelveHour }},
	{mess: MessTwoDigitYear, fn: func(g *colGen, r *rng, v *value) (string, Mess, bool) {
		t := v.t
		s, m, ok := twoDigit(g, r, t)
		return s + " " + clock(t), m, ok
	}, in: hasShortYear, differs: ordersDiffer},
	{mess: MessMonthName, fn: func(g *colGen, r *rng, v *value) (string, Mess, bool) {
		t := v.t
		return monthName(g, r, t) + " " + clock(t), MessMonthName, true
	}, in: (*Locale).HasMonthNames, differs: namesDiffer},
	{mess: MessCompactDate, fn: func(g *colGen, _ *rng, v *value) (string, Mess, bool) {
		t := v.t
		return t.Format("20060102T150405"), MessCompactDate, wholeSeconds(t)
	}},
	{mess: MessEpochSeconds, fn: func(g *colGen, _ *rng, v *value) (string, Mess, bool) {
		return strconv.FormatInt(v.t.Unix(), 10), MessEpochSeconds, wholeSeconds(v.t)
	}},
	{mess: MessEpochMillis, fn: func(g *colGen, _ *rng, v *value) (string, Mess, bool) {
		return strconv.FormatInt(v.t.UnixMilli(), 10), MessEpochMillis, v.t.Nanosecond()%1e6 == 0
	}},
	{mess: MessSerialDate, fn: func(g *colGen, _ *rng, v *value) (string, Mess, bool) {
		if g.tz != nil || v.t.Nanosecond()%1e6 != 0 {
			return "", "", false // a serial is a wall clock; only zone-less and UTC columns
		}
		s, ok := serialText(v.t, true)
		return s, MessSerialDate, ok
	}},
	{mess: MessEdgeSpace, fn: spellEdgeSpace},
}

// Fixed UTC offsets in seconds, for the same instant written elsewhere.
var offsets = []int{5*3600 + 1800, -3 * 3600, 9 * 3600, 3600, -8 * 3600, 2 * 3600}
