package property

import (
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/stretchr/testify/require"
)

func fuzzBytes(seed int64, n int) []byte {
	r := newRng(seed)
	b := make([]byte, n)
	for i := range b {
		b[i] = byte(r.next())
	}
	return b
}

func TestFromBytesReplaysTheSameTable(t *testing.T) {
	opts := Options{Mess: Heavy, MaxRows: 40}
	for seed := int64(1); seed <= 20; seed++ {
		data := fuzzBytes(seed, 2000)
		a, err := FromBytes(greenhouse, opts, data)
		require.NoError(t, err)
		b, err := FromBytes(greenhouse, opts, append([]byte(nil), data...))
		require.NoError(t, err)
		requireSame(t, a.Raw(), b.Raw())
		requireSame(t, a.Clean(), b.Clean())
		require.Equal(t, a.Seed, b.Seed)
		fa, err := FileFromBytes(greenhouse, opts, data)
		require.NoError(t, err)
		fb, err := FileFromBytes(greenhouse, opts, data)
		require.NoError(t, err)
		require.Equal(t, fa.Data, fb.Data)
		// Every cell still spells its clean value.
		for i := 0; i < a.NumRows(); i++ {
			for j := 0; j < a.NumCols(); j++ {
				if f := a.Field(j); f >= 0 {
					require.NoError(t, checkCell(a.Schema[f], a.Cell(i, j)))
				}
			}
		}
	}
	// Other bytes, another table.
	a, _ := FromBytes(greenhouse, opts, fuzzBytes(1, 2000))
	b, _ := FromBytes(greenhouse, opts, fuzzBytes(2, 2000))
	require.NotEqual(t, a.Raw().Literal(), b.Raw().Literal())
	// No bytes: no rows. Bytes that run out: plain spellings, no nulls.
	empty, err := FromBytes(greenhouse, opts, nil)
	require.NoError(t, err)
	require.Zero(t, empty.NumRows())
	short, err := FromBytes(greenhouse, Options{Mess: Heavy, MinRows: 5, MaxRows: 5}, []byte{1, 2, 3})
	require.NoError(t, err)
	require.Equal(t, 5, short.NumRows())
	require.Empty(t, short.MessCounts(), "zero bits say no to every mess")
	for _, c := range short.Clean().Columns() {
		require.Zero(t, c.NullCount())
	}
	// The rules hold on fuzzed samples too.
	rules := Options{Mess: Heavy, MaxRows: 50, Columns: map[string]Rules{"kept": {Unique: Sequential}, "temp_c": {NonNegative: true, Max: "60"}}}
	for seed := int64(1); seed <= 20; seed++ {
		s, err := FromBytes(greenhouse, rules, fuzzBytes(seed, 3000))
		require.NoError(t, err)
		clean := s.Clean()
		for i := 0; i < clean.NumRows(); i++ {
			require.Equal(t, int64(i+1), clean.Column("kept").Int64(i))
			if c := clean.Column("temp_c"); !c.IsNull(i) {
				require.True(t, c.Float64(i) >= 0 && c.Float64(i) <= 60)
			}
		}
	}
}

func TestFuzzVerdictShrinksAndListsEveryBrokenInvariant(t *testing.T) {
	opts := Options{Mess: Heavy, Spellings: []Mess{MessUnicodeMinus}, MessRate: 0.5, MaxRows: 60}
	var data []byte
	var s *Sample
	for seed := int64(1); ; seed++ {
		data = fuzzBytes(seed, 4000)
		var err error
		s, err = FromBytes(readings, opts, data)
		require.NoError(t, err)
		if chokes(s) && s.NumRows() > 10 {
			break
		}
	}
	msg := fuzzVerdict(choke, s, []Invariant{NoPanic(), Idempotent()})
	require.Contains(t, msg, `property: invariants broken by this fuzz input: "no panic", "idempotent"`)
	require.Contains(t, msg, "no panic: the function panicked: strconv.ParseFloat: \u2212")
	require.Equal(t, 1, strings.Count(msg, "paste it into a test"))
	tb := snippet(t, msg)
	require.Equal(t, 1, tb.NumRows())
	require.Equal(t, []string{"temp_c"}, tb.Names())
	// The input replays as the same table, and fails the same way.
	again, err := FromBytes(readings, opts, data)
	require.NoError(t, err)
	requireSame(t, s.Raw(), again.Raw())
	requireSame(t, tb, snippet(t, fuzzVerdict(choke, again, []Invariant{NoPanic(), Idempotent()})))
	require.Equal(t, "\u22121", tb.Column("temp_c").Str(0), "shrunk to a short value, its mess kept")
	require.Empty(t, fuzzVerdict(cleanTemps, again, []Invariant{NoPanic()}))
}

// FuzzCleanTemps is the bridge at work: Go's fuzzer feeds bytes, each
// becomes a sample of readings in German exports, and cleanTemps must
// keep its invariants. go test runs the seeds and the saved corpus under
// testdata/fuzz/FuzzCleanTemps; go test -fuzz FuzzCleanTemps explores.
func FuzzCleanTemps(f *testing.F) {
	Fuzz(f, readings, cleanTemps, Options{Locale: "de-DE", Mess: Heavy, MaxRows: 30,
		Spellings: []Mess{MessDecimalComma, MessEdgeSpace, MessNullToken}, NullTokens: []string{"NA", "N/A", "null"}},
		NoPanic(), Idempotent(), OrderFree(), NoNulls("temp_c"))
}

// The saved corpus file replays: it is Go's "go test fuzz v1" encoding of
// the bytes, and FromBytes makes the same table from it every time.
func TestSavedFuzzInputReplays(t *testing.T) {
	data, err := os.ReadFile(filepath.Join("testdata", "fuzz", "FuzzCleanTemps", "de-readings"))
	require.NoError(t, err)
	text := string(data)
	require.True(t, strings.HasPrefix(text, "go test fuzz v1\n[]byte("))
	var raw string
	_, err = fmt.Sscanf(strings.TrimPrefix(text, "go test fuzz v1\n[]byte("), "%q", &raw)
	require.NoError(t, err)
	opts := Options{Locale: "de-DE", Mess: Heavy, MaxRows: 30,
		Spellings: []Mess{MessDecimalComma, MessEdgeSpace, MessNullToken}, NullTokens: []string{"NA", "N/A", "null"}}
	a, err := FromBytes(readings, opts, []byte(raw))
	require.NoError(t, err)
	b, err := FromBytes(readings, opts, []byte(raw))
	require.NoError(t, err)
	require.Positive(t, a.NumRows())
	requireSame(t, a.Raw(), b.Raw())
}
