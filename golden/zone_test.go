package golden

import (
	"path/filepath"
	"testing"

	"github.com/proofsheet/proofsheet/fixtures"
	"github.com/stretchr/testify/require"
)

// TestTableSecondOffsetZone: a golden file of timestamps in a zone whose
// offset had seconds, written by an update, passes on the next run (it
// used to store the offset cut to minutes and then fail every time).
//
// Source: IANA tz database, tzdata "europe": Europe/Lisbon kept local mean
// time, −0:36:45, until 1912-01-01; "africa": Africa/Monrovia kept
// −0:44:30 until 1972-01-07.
func TestTableSecondOffsetZone(t *testing.T) {
	quietEnv(t, false)
	s := tempStore(t)
	got := fixtures.MustParse(t, `
		place:string | at:timestamp(s, Europe/Lisbon) | at2:timestamp(ms, Africa/Monrovia)
		quay         | 1900-06-15T12:00:00-00:36:45   | 1960-03-01T08:30:00.250-00:44:30
		market       | 1911-12-31T23:59:59-00:36:45   | 1972-01-06T23:59:59-00:44:30
	`)
	check := func() (bool, *fakeT) {
		ft := newFake(t)
		defer ft.end()
		return s.Table(ft, "zones", got), ft
	}
	*updateFlag = true
	ok, ft := check()
	*updateFlag = false
	require.True(t, ok, ft.failures())
	stored := readFile(t, filepath.Join(s.Root, "zones.gold.tbl"))
	require.Contains(t, stored, "quay | 1900-06-15T12:00:00-00:36:45 | 1960-03-01T08:30:00.25-00:44:30\n")
	ok, ft = check()
	require.True(t, ok, ft.failures())
}
