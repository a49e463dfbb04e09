package property

import (
	"os"
	"regexp"
	"strconv"
	"strings"
	"testing"
	"time"
	"unicode/utf8"

	"github.com/stretchr/testify/require"
	"golang.org/x/text/encoding/charmap"

	"github.com/proofsheet/proofsheet/fixtures"
)

// The bench-booking export of the demo network (testdata/greenhouse/
// bookings.schema) says what each column may be. Generated over many
// samples, every cell is one of the spellings the file describes, each
// described spelling occurs, and nothing else does.
func TestBookingsAreExactlyAsDescribed(t *testing.T) {
	text, err := os.ReadFile("../testdata/greenhouse/bookings.schema")
	require.NoError(t, err)
	spec, err := ParseGenSpec("bookings.schema", text)
	require.NoError(t, err)

	var (
		// Plain decimal(10,2): two decimals always.
		plainPrice = regexp.MustCompile(`^(0|[1-9][0-9]*)\.[0-9]{2}$`)
		// Thousands commas, no sign: the clean values are 0 to 12000.
		groupedPrice = regexp.MustCompile(`^[1-9][0-9]{0,2}(,[0-9]{3})+\.[0-9]{2}$`)
		// $ before the amount, commas when it has more than three digits.
		dollarPrice = regexp.MustCompile(`^\$(0|[1-9][0-9]{0,2}(,[0-9]{3})*)\.[0-9]{2}$`)
		isoDay      = regexp.MustCompile(`^2026-0[3-6]-[0-3][0-9]$`)
		usDay       = regexp.MustCompile(`^0?[3-6]/[0-3]?[0-9]/2026$`)
		digits      = regexp.MustCompile(`^(0|[1-9][0-9]*)$`)
	)
	names := []string{"Zoë Ørsted", "Amélie Brûlé", "Jürgen Weiß", "Søren Kærgaard", "Inês Conceição", "Björn Åström"}
	houses := []string{"Bellecôte", "Kæreby", "Piñonal", "Ørnely"}
	counts := map[string]int{}
	houseCount := map[string]int{}
	rows, dups := 0, 0
	for seed := int64(1); seed <= 40; seed++ {
		data, err := spec.CSV(250, seed)
		require.NoError(t, err)
		// Windows-1252 bytes: not UTF-8, and x/text's decoder (the WHATWG
		// windows-1252 index) reads them back to the names.
		require.False(t, utf8.Valid(data), "the file is Windows-1252, not UTF-8")
		decoded, err := charmap.Windows1252.NewDecoder().Bytes(data)
		require.NoError(t, err)
		raw, _, err := fixtures.ReadBytes("bookings.csv", data, fixtures.AllText())
		require.NoError(t, err)
		require.Equal(t, []string{"booking_id", "member", "house", "minutes", "price", "booked_on"}, raw.Names())
		require.Equal(t, 250, raw.NumRows())
		require.True(t, strings.HasPrefix(string(decoded), "booking_id,member,house,minutes,price,booked_on\n"))

		seen := map[int64]string{}
		lastID := int64(10000)
		for i := 0; i < raw.NumRows(); i++ {
			rows++
			cell := func(name string) string {
				c := raw.Column(name)
				require.False(t, c.IsNull(i), "no nulls: %s row %d", name, i+1)
				return c.Str(i)
			}
			row := strings.Join([]string{cell("member"), cell("house"), cell("minutes"), cell("price"), cell("booked_on")}, "|")
			id, err := strconv.ParseInt(cell("booking_id"), 10, 64)
			require.NoError(t, err)
			require.True(t, digits.MatchString(cell("booking_id")))
			if prev, ok := seen[id]; ok {
				// A duplicate row repeats its booking whole.
				require.Equal(t, prev, row)
				dups++
			} else {
				require.Equal(t, lastID+1, id, "ids run 10001, 10002, … (seed %d)", seed)
				lastID = id
				seen[id] = row
			}
			require.Contains(t, names, cell("member"))
			require.Contains(t, houses, cell("house"))
			houseCount[cell("house")]++
			minutes, err := strconv.Atoi(cell("minutes"))
			require.NoError(t, err)
			require.True(t, digits.MatchString(cell("minutes")) && minutes >= 0 && minutes <= 480, "minutes %q", cell("minutes"))
			switch p := cell("price"); {
			case dollarPrice.MatchString(p):
				counts["$"]++
				if strings.Contains(p, ",") {
					counts["$,"]++
				}
			case groupedPrice.MatchString(p):
				counts["1,234.50"]++
			case plainPrice.MatchString(p):
				counts["plain price"]++
			default:
				t.Fatalf("price %q is none of the described spellings", p)
			}
			switch d := cell("booked_on"); {
			case isoDay.MatchString(d):
				counts["iso day"]++
			case usDay.MatchString(d):
				counts["us day"]++
				_, err := time.Parse("1/2/2006", d)
				require.NoError(t, err, d)
			default:
				t.Fatalf("booked_on %q is neither 2026-03-14 nor 3/14/2026", d)
			}
		}
	}
	// Each described spelling occurs, in the shares the file asks for.
	for _, k := range []string{"$", "$,", "1,234.50", "plain price", "iso day", "us day"} {
		require.Positive(t, counts[k], "%s never occurs: %v", k, counts)
	}
	require.Positive(t, dups)
	require.InDelta(t, 0.5, float64(counts["us day"])/float64(rows), 0.03, "mess-rate 0.5 on booked_on")
	messy := counts["$"] + counts["1,234.50"]
	require.InDelta(t, 0.7, float64(messy)/float64(rows), 0.04, "mess-rate 0.7 on price (a price below 1000 has no commas to add)")
	// Weights 4:3:2:1 on the houses.
	require.InDelta(t, 0.4, float64(houseCount["Bellecôte"])/float64(rows), 0.03)
	require.InDelta(t, 0.1, float64(houseCount["Ørnely"])/float64(rows), 0.02)
}
