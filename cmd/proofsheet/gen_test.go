package main

import (
	"bytes"
	"os"
	"path/filepath"
	"strconv"
	"testing"

	"github.com/stretchr/testify/require"

	"github.com/proofsheet/proofsheet/fixtures"
)

const houseSchema = `# greenhouse datalogger uploads
@dates 2026-03-01 2026-06-30
house   category      levels="Étang|Les Pins|Mühlbach"
at      timestamp(s)
temp_c  float64
kept    int64
`

func TestGenSameSeedSameBytes(t *testing.T) {
	dir := writeFiles(t, map[string]string{"houses.schema": houseSchema})
	schema := filepath.Join(dir, "houses.schema")
	a, b, c := filepath.Join(dir, "a.csv"), filepath.Join(dir, "b.csv"), filepath.Join(dir, "c.csv")
	for _, out := range []string{a, b} {
		r := runBin(t, "", nil, "gen", "--schema", schema, "--rows", "300", "--seed", "42", "--mess", "heavy", "--out", out)
		require.Equal(t, exitSame, r.code, r.stderr)
		require.Empty(t, r.stdout)
	}
	r := runBin(t, "", nil, "gen", "--schema", schema, "--rows", "300", "--seed", "43", "--mess", "heavy", "--out", c)
	require.Equal(t, exitSame, r.code, r.stderr)
	da, err := os.ReadFile(a)
	require.NoError(t, err)
	db, err := os.ReadFile(b)
	require.NoError(t, err)
	dc, err := os.ReadFile(c)
	require.NoError(t, err)
	require.Equal(t, da, db, "same seed, same bytes")
	require.NotEqual(t, da, dc, "another seed, other bytes")

	// Without --out the bytes go to stdout, the same bytes.
	r = runBin(t, "", nil, "gen", "--schema", schema, "--rows", "300", "--seed", "42", "--mess", "heavy")
	require.Equal(t, exitSame, r.code, r.stderr)
	require.Equal(t, string(da), r.stdout)

	// The file loads, and the profile finds the columns of the schema.
	tb, _, err := fixtures.ReadFile(a, fixtures.AllText())
	require.NoError(t, err)
	require.GreaterOrEqual(t, tb.NumRows(), 300)
	require.Subset(t, lowerAll(tb.Names()), []string{"house", "at", "temp_c", "kept"})
}

func lowerAll(names []string) []string {
	out := make([]string, len(names))
	for i, n := range names {
		out[i] = string(bytes.ToLower([]byte(n)))
	}
	return out
}

func TestGenEncodingsAndMess(t *testing.T) {
	dir := writeFiles(t, map[string]string{"houses.schema": houseSchema})
	schema := filepath.Join(dir, "houses.schema")
	cases := []struct {
		encoding string
		prefix   []byte
		enc      fixtures.Encoding
	}{
		// Source: Unicode Standard 15.0 §23.8 — the byte order mark U+FEFF
		// is EF BB BF in UTF-8 and FF FE in UTF-16LE.
		{"utf-8-bom", []byte{0xEF, 0xBB, 0xBF}, fixtures.EncodingUTF8BOM},
		{"utf-16le", []byte{0xFF, 0xFE}, fixtures.EncodingUTF16LE},
		{"windows-1252", nil, fixtures.EncodingWindows1252},
		{"utf-8", nil, fixtures.EncodingUTF8},
	}
	for _, c := range cases {
		t.Run(c.encoding, func(t *testing.T) {
			out := filepath.Join(dir, c.encoding+".csv")
			r := runBin(t, "", nil, "gen", "--schema", schema, "--rows", "50", "--mess", "none", "--encoding", c.encoding, "--out", out)
			require.Equal(t, exitSame, r.code, r.stderr)
			data, err := os.ReadFile(out)
			require.NoError(t, err)
			require.True(t, bytes.HasPrefix(data, c.prefix))
			_, rep, err := fixtures.ReadFile(out)
			require.NoError(t, err)
			require.Equal(t, c.enc, rep.Encoding)
			if c.enc == fixtures.EncodingWindows1252 {
				// Source: WHATWG Encoding Standard, index-windows-1252 — É is C9.
				require.Contains(t, string(data), "\xc9tang")
			}
		})
	}
	// --mess none writes plain cells: the float column reads as float64.
	out := filepath.Join(dir, "plain.csv")
	r := runBin(t, "", nil, "gen", "--schema", schema, "--rows", "80", "--mess", "none", "--out", out)
	require.Equal(t, exitSame, r.code, r.stderr)
	tb, _, err := fixtures.ReadFile(out)
	require.NoError(t, err)
	require.Equal(t, fixtures.KindFloat64, tb.Column("temp_c").Kind())
	require.Equal(t, 80, tb.NumRows(), "no duplicates at mess none")
}

func TestGenBadInput(t *testing.T) {
	dir := writeFiles(t, map[string]string{
		"ok.schema":  houseSchema,
		"bad.schema": "house category\nat  timestump(s)\n",
		"keep.csv":   "earlier\n",
	})
	f := func(name string) string { return filepath.Join(dir, name) }
	keep := f("keep.csv")
	cases := []struct {
		name string
		args []string
		msg  string
	}{
		{"no schema", nil, "no --schema FILE given"},
		{"missing schema", []string{"--schema", f("absent.schema")}, "absent.schema"},
		{"bad schema", []string{"--schema", f("bad.schema")}, "bad.schema:2:5: unknown column type \"timestump(s)\""},
		{"bad mess", []string{"--schema", f("ok.schema"), "--mess", "chaos"}, `--mess "chaos"`},
		{"bad encoding", []string{"--schema", f("ok.schema"), "--encoding", "latin-9"}, `unknown encoding "latin-9"`},
		{"negative rows", []string{"--schema", f("ok.schema"), "--rows", "-1"}, "--rows -1"},
		{"too many rows", []string{"--schema", f("ok.schema"), "--rows", "100000000000"}, "--rows"},
		{"bad seed", []string{"--schema", f("ok.schema"), "--seed", "x"}, "invalid value"},
		{"stray argument", []string{"--schema", f("ok.schema"), "extra"}, `unexpected argument "extra"`},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			r := runBin(t, "", nil, append([]string{"gen", "--out", keep}, c.args...)...)
			require.Equal(t, exitTrouble, r.code, "stdout: %s", r.stdout)
			require.Contains(t, r.stderr, c.msg)
			require.NotContains(t, r.stderr, "panic")
			data, err := os.ReadFile(keep)
			require.NoError(t, err)
			require.Equal(t, "earlier\n", string(data), "--out is untouched on failure")
		})
	}
}

// The bench-booking schema of the demo network, column by column: what
// gen writes keeps to every column's rules (the property package counts
// the same file over many samples in TestBookingsAreExactlyAsDescribed).
func TestGenFollowsColumnRules(t *testing.T) {
	r := runBin(t, "", nil, "gen", "--schema", repoFile("testdata/greenhouse/bookings.schema"), "--rows", "200", "--seed", "5")
	require.Equal(t, exitSame, r.code, r.stderr)
	tb, rep, err := fixtures.ReadBytes("b.csv", []byte(r.stdout), fixtures.AllText())
	require.NoError(t, err)
	require.Equal(t, fixtures.EncodingWindows1252, rep.Encoding)
	id, minutes, price, day := tb.Column("booking_id"), tb.Column("minutes"), tb.Column("price"), tb.Column("booked_on")
	last := 10000
	for i := 0; i < tb.NumRows(); i++ {
		n, err := strconv.Atoi(id.Str(i))
		require.NoError(t, err)
		// A new booking takes the next id; a duplicate row repeats one.
		require.True(t, n == last+1 || n <= last && n > 10000, "ids in sequence: %d after %d", n, last)
		last = max(last, n)
		m, err := strconv.Atoi(minutes.Str(i))
		require.NoError(t, err)
		require.True(t, m >= 0 && m <= 480)
		require.Regexp(t, `^\$?[0-9]{1,3}(,[0-9]{3})*\.[0-9]{2}$|^[0-9]+\.[0-9]{2}$`, price.Str(i))
		require.Regexp(t, `^2026-0[3-6]-[0-9]{2}$|^0?[3-6]/[0-9]{1,2}/2026$`, day.Str(i))
	}

	// A rule that cannot hold is refused with where and why.
	dir := writeFiles(t, map[string]string{"bad.schema": "id int64 unique min=1 max=5\n@null-rate 0\n"})
	r = runBin(t, "", nil, "gen", "--schema", filepath.Join(dir, "bad.schema"), "--rows", "10")
	require.Equal(t, exitTrouble, r.code)
	require.Contains(t, r.stderr, `column "id": only 5 distinct values fit its rules`)
	dir = writeFiles(t, map[string]string{"bad.schema": "day date mess=day-first\n"})
	r = runBin(t, "", nil, "gen", "--schema", filepath.Join(dir, "bad.schema"))
	require.Equal(t, exitTrouble, r.code)
	require.Contains(t, r.stderr, "never takes mess day-first")
}
