package assert

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"math/rand/v2"
	"strings"
	"testing"

	"github.com/stretchr/testify/require"

	"github.com/proofsheet/proofsheet/fixtures"
	"github.com/proofsheet/proofsheet/internal/textwidth"
)

// holdUpTo sets the longest listing Compare builds at once, so that tests
// get listings built on demand from small tables (0) or held ones.
func holdUpTo(n int) Option { return Option{func(c *config) { c.holdUpTo = n }} }

// sweepFrom sets how many ranges a keyed comparison has before its
// columns are swept (see reorder), so that tests take that way on tables
// of a few ranges.
func sweepFrom(n int) Option { return Option{func(c *config) { c.sweepFrom = n }} }

func TestListOf(t *testing.T) {
	var empty Listing[int]
	require.Equal(t, 0, empty.Len())
	require.Nil(t, empty.Slice())
	for range empty.All() {
		t.Fatal("the zero Listing is empty")
	}
	l := ListOf(3, 1, 2)
	require.Equal(t, 3, l.Len())
	require.Equal(t, 1, l.At(1))
	require.Equal(t, []int{3, 1, 2}, l.Slice())
	var seen []int
	for i, x := range l.All() {
		seen = append(seen, i, x)
		if i == 1 {
			break
		}
	}
	require.Equal(t, []int{0, 3, 1, 1}, seen, "All stops when the loop breaks")
	require.Panics(t, func() { l.At(3) })

	b, err := json.Marshal(l)
	require.NoError(t, err)
	require.Equal(t, "[3,1,2]", string(b))
	b, err = json.Marshal(empty)
	require.NoError(t, err)
	require.Equal(t, "[]", string(b), "an empty listing is an empty array, never null")
	var back Listing[int]
	require.NoError(t, json.Unmarshal([]byte("[4,5]"), &back))
	require.Equal(t, []int{4, 5}, back.Slice())
	require.Error(t, json.Unmarshal([]byte(`{"a":1}`), &back))
}

// TestListingsBuiltOnDemandAgreeWithHeldOnes compares the same tables with
// every listing built at once and with every listing built on demand:
// entries, random access and every renderer must agree.
func TestListingsBuiltOnDemandAgreeWithHeldOnes(t *testing.T) {
	rng := rand.New(rand.NewPCG(5, 6))
	for _, n := range []int{1, 40, 700} {
		w, g := nullTablePair(t, rng, n)
		short := g.Slice(0, g.NumRows()*2/3)
		for _, c := range []struct {
			name      string
			want, got *fixtures.Table
			opts      []Option
		}{
			{"position", w, g, nil},
			{"position, got short", w, short, []Option{Tol("*", 1e-3, 0)}},
			{"want short", short, w, nil},
			{"key", w, short, []Option{ByKey("s", "d"), NormText("*", FoldCase)}},
			{"multiset", w, short, []Option{AnyRowOrder()}},
		} {
			for _, limit := range []int{-1, 0, 7} {
				opts := append(append([]Option(nil), c.opts...), ListLimit(limit))
				held := Compare(c.want, c.got, append(opts, holdUpTo(1<<30))...)
				lazy := Compare(c.want, c.got, append(opts, holdUpTo(0))...)
				require.Nil(t, held.Cells.src)
				if lazy.Cells.Len() > 0 {
					require.NotNil(t, lazy.Cells.src, "the listing is built on demand")
				}
				sameEntries(t, held.Cells, lazy.Cells, "%s n=%d limit=%d", c.name, n, limit)
				sameEntries(t, held.Missing.Rows, lazy.Missing.Rows, "%s n=%d limit=%d", c.name, n, limit)
				sameEntries(t, held.Extra.Rows, lazy.Extra.Rows, "%s n=%d limit=%d", c.name, n, limit)
				if limit >= 0 {
					require.LessOrEqual(t, lazy.Cells.Len(), limit)
					require.LessOrEqual(t, lazy.Missing.Rows.Len(), limit)
				}
				for range 5 {
					if k := lazy.Cells.Len(); k > 0 {
						i := rng.IntN(k)
						require.Equal(t, fmt.Sprintf("%+v", held.Cells.At(i)), fmt.Sprintf("%+v", lazy.Cells.At(i)), "random access to cell %d", i)
					}
					if k := lazy.Missing.Rows.Len(); k > 0 {
						i := rng.IntN(k)
						require.Equal(t, held.Missing.Rows.At(i), lazy.Missing.Rows.At(i))
					}
				}
				require.Equal(t, held.Text(), lazy.Text())
				require.Equal(t, held.TextWith(TextStyle{Color: true, Width: 60}), lazy.TextWith(TextStyle{Color: true, Width: 60}))
				require.Equal(t, held.Markdown(), lazy.Markdown())
				require.Equal(t, held.HTML(), lazy.HTML())
				hj, err := held.JSON()
				require.NoError(t, err)
				lj, err := lazy.JSON()
				require.NoError(t, err)
				require.Equal(t, string(hj), string(lj))
			}
		}
	}
}

// sameEntries requires two listings to have the same entries; entries
// are compared as printed, so that NaN equals NaN.
func sameEntries[T any](t *testing.T, want, got Listing[T], msg string, args ...any) {
	t.Helper()
	where := fmt.Sprintf(msg, args...)
	require.Equal(t, want.Len(), got.Len(), where)
	for i, x := range got.All() {
		require.Equal(t, fmt.Sprintf("%+v", want.At(i)), fmt.Sprintf("%+v", x), "%s, entry %d", where, i)
	}
}

// TestJSONStreamsLikeMarshalIndent checks the streamed JSON against
// encoding/json writing the whole object at once.
func TestJSONStreamsLikeMarshalIndent(t *testing.T) {
	keyed, positional := differingTables(t)
	for _, d := range []*Diff{keyed, positional, {}} {
		got, err := d.JSON()
		require.NoError(t, err)
		var generic any
		require.NoError(t, json.Unmarshal(got, &generic))
		var j jsonDiff
		require.NoError(t, json.Unmarshal(got, &j))
		want, err := json.MarshalIndent(j, "", "  ")
		require.NoError(t, err)
		require.Equal(t, string(want), string(got))
	}
}

// failAfter is a writer that fails once n bytes are written.
type failAfter struct{ n int }

var errFull = errors.New("disk full")

func (f *failAfter) Write(p []byte) (int, error) {
	if len(p) > f.n {
		k := f.n
		f.n = 0
		return k, errFull
	}
	f.n -= len(p)
	return len(p), nil
}

func TestWritersReportWriteErrors(t *testing.T) {
	rng := rand.New(rand.NewPCG(7, 8))
	w, g := nullTablePair(t, rng, 3000)
	d := Compare(w, g, ListLimit(-1), holdUpTo(0))
	require.Greater(t, d.Cells.Len(), 1000)
	for name, write := range map[string]func(io.Writer) error{
		"text":     func(w io.Writer) error { return d.WriteText(w, TextStyle{}) },
		"markdown": d.WriteMarkdown,
		"json":     d.WriteJSON,
		"html":     d.WriteHTML,
	} {
		require.ErrorIs(t, write(&failAfter{n: 100_000}), errFull, name)
		var b bytes.Buffer
		require.NoError(t, write(&b), name)
	}
}

func TestLongTextListingsAreLaidOutInBlocks(t *testing.T) {
	rng := rand.New(rand.NewPCG(9, 10))
	w, g := nullTablePair(t, rng, 9000)
	d := Compare(w, g, ListLimit(-1), Tol("*", 1e-9, 0))
	require.Greater(t, d.Cells.Len(), 2*textBlock, "the listing spans several blocks")
	text := d.Text()
	lines := strings.Split(text, "\n")
	start := -1
	for i, l := range lines {
		require.LessOrEqual(t, textwidth.Width(l), 100, l)
		if strings.HasPrefix(l, "differing cells") {
			start = i + 1
		}
	}
	require.Positive(t, start)
	// Every listed cell is one line (or two, with a text edit) below the
	// header, and the column of "column" names never moves left.
	colAt := strings.Index(lines[start], "column")
	listed := 0
	for _, l := range lines[start+1:] {
		if l == "" {
			break
		}
		if strings.HasPrefix(strings.TrimSpace(l), "edit: ") {
			continue
		}
		listed++
		name := strings.Fields(l)[1]
		at := strings.Index(l, "  "+name+"  ") + 2
		require.GreaterOrEqual(t, at, colAt, l)
	}
	require.Equal(t, d.Cells.Len(), listed)
}
