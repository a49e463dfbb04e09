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

func dayFirst(r *rng, t time.Time) string {
	y, m, d, mi, di := ymd(t)
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

func twoDigit(r *rng, t time.Time) (string, Mess, bool) {
	if t.Year() < 1969 || t.Year() > 2068 {
		return "", "", false
	}
	_, m, d, _, _ := ymd(t)
	yy := pad2(t.Year() % 100)
	switch r.intn(3) {
	case 0:
		return d + "/" + m + "/" + yy, MessDayFirst.and(MessTwoDigitYear), true
	case 1:
		return d + "." + m + "." + yy, MessDayFirst.and(MessTwoDigitYear), true
	}
	return m + "/" + d + "/" + yy, MessMonthFirst.and(MessTwoDigitYear), true
}

func monthName(r *rng, t time.Time) string {
	mon := t.Month().String()
	short := mon[:3]
	d := strconv.Itoa(t.Day())
	y := strconv.Itoa(t.Year())
	switch r.intn(4) {
	case 0:
		return d + " " + short + " " + y
	case 1:
		return short + " " + d + ", " + y
	case 2:
		return pad2(t.Day()) + "-" + short + "-" + y
	}
	return mon + " " + d + ", " + y
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

var dateSpellers = []speller{
	{MessDateSlash, func(_ *colGen, r *rng, v *value) (string, Mess, bool) {
		y, m, d, _, _ := ymd(v.t)
		if r.next()&1 == 1 {
			return y + "." + m + "." + d, MessDateSlash, true
		}
		return y + "/" + m + "/" + d, MessDateSlash, true
	}},
	{MessDayFirst, func(_ *colGen, r *rng, v *value) (string, Mess, bool) { return dayFirst(r, v.t), MessDayFirst, true }},
	{MessMonthFirst, func(_ *colGen, r *rng, v *value) (string, Mess, bool) {
		return monthFirst(r, v.t), MessMonthFirst, true
	}},
	{MessTwoDigitYear, func(_ *colGen, r *rng, v *value) (string, Mess, bool) { return twoDigit(r, v.t) }},
	{MessMonthName, func(_ *colGen, r *rng, v *value) (string, Mess, bool) { return monthName(r, v.t), MessMonthName, true }},
	{MessCompactDate, func(_ *colGen, _ *rng, v *value) (string, Mess, bool) {
		y, m, d, _, _ := ymd(v.t)
		return y + m + d, MessCompactDate, true
	}},
	{MessSerialDate, func(_ *colGen, _ *rng, v *value) (string, Mess, bool) {
		s, ok := serialText(v.t, false)
		return s, MessSerialDate, ok
	}},
	{MessEpochSeconds, func(_ *colGen, _ *rng, v *value) (string, Mess, bool) {
		return strconv.FormatInt(v.t.Unix(), 10), MessEpochSeconds, true
	}},
	{MessMidnight, func(_ *colGen, r *rng, v *value) (string, Mess, bool) {
		if r.next()&1 == 1 {
			return v.plain + " 00:00:00", MessMidnight, true
		}
		return v.plain + "T00:00:00", MessMidnight, true
	}},
	{MessEdgeSpace, spellEdgeSpace},
}

// clock writes the time of day as HH:MM:SS with the fraction the value
// has, trailing zeros dropped. Timestamp values hold the wall clock of
// their column's zone (zone-less: as written, in UTC).
func clock(t time.Time) string { return t.Format("15:04:05.999999999") }

func wholeSeconds(t time.Time) bool { return t.Nanosecond() == 0 }

var timestampSpellers = []speller{
	{MessSpaceSeparator, func(g *colGen, _ *rng, v *value) (string, Mess, bool) {
		t := v.t
		return t.Format("2006-01-02") + " " + clock(t), MessSpaceSeparator, true
	}},
	{MessUTCOffset, func(g *colGen, r *rng, v *value) (string, Mess, bool) {
		if g.field.Type.Zone() == "" {
			return "", "", false // a zone-less time has no instant to shift
		}
		off := pick(r, offsets)
		t := v.t.In(time.FixedZone("", off))
		return t.Format("2006-01-02T15:04:05.999999999-07:00"), MessUTCOffset, true
	}},
	{MessDayFirst, func(g *colGen, r *rng, v *value) (string, Mess, bool) {
		t := v.t
		return dayFirst(r, t) + " " + clock(t), MessDayFirst, true
	}},
	{MessMonthFirst, func(g *colGen, r *rng, v *value) (string, Mess, bool) {
		t := v.t
		return monthFirst(r, t) + " " + clock(t), MessMonthFirst, true
	}},
	{MessTwelveHour, func(g *colGen, r *rng, v *value) (string, Mess, bool) {
		t := v.t
		if !wholeSeconds(t) {
			return "", "", false
		}
		return monthFirst(r, t) + " " + t.Format("3:04:05 PM"), MessMonthFirst.and(MessTwelveHour), true
	}},
	{MessTwoDigitYear, func(g *colGen, r *rng, v *value) (string, Mess, bool) {
		t := v.t
		s, m, ok := twoDigit(r, t)
		return s + " " + clock(t), m, ok
	}},
	{MessMonthName, func(g *colGen, r *rng, v *value) (string, Mess, bool) {
		t := v.t
		return monthName(r, t) + " " + clock(t), MessMonthName, true
	}},
	{MessCompactDate, func(g *colGen, _ *rng, v *value) (string, Mess, bool) {
		t := v.t
		return t.Format("20060102T150405"), MessCompactDate, wholeSeconds(t)
	}},
	{MessEpochSeconds, func(g *colGen, _ *rng, v *value) (string, Mess, bool) {
		return strconv.FormatInt(v.t.Unix(), 10), MessEpochSeconds, wholeSeconds(v.t)
	}},
	{MessEpochMillis, func(g *colGen, _ *rng, v *value) (string, Mess, bool) {
		return strconv.FormatInt(v.t.UnixMilli(), 10), MessEpochMillis, v.t.Nanosecond()%1e6 == 0
	}},
	{MessSerialDate, func(g *colGen, _ *rng, v *value) (string, Mess, bool) {
		if g.loc != nil || v.t.Nanosecond()%1e6 != 0 {
			return "", "", false // a serial is a wall clock; only zone-less and UTC columns
		}
		s, ok := serialText(v.t, true)
		return s, MessSerialDate, ok
	}},
	{MessEdgeSpace, spellEdgeSpace},
}

// Fixed UTC offsets in seconds, for the same instant written elsewhere.
var offsets = []int{5*3600 + 1800, -3 * 3600, 9 * 3600, 3600, -8 * 3600, 2 * 3600}
