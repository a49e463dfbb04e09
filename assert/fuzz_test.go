package assert

import (
	"bytes"
	"encoding/json"
	"fmt"
	"strings"
	"testing"
	"unicode/utf8"

	"github.com/proofsheet/proofsheet/fixtures"
	"github.com/stretchr/testify/require"
)

// fuzzDiffSeeds are the JSON of diffs of every shape: keyed and
// positional, schema changes, missing, extra and repeated rows, text
// edits, infinities, an overview and hints.
func fuzzDiffSeeds(tb testing.TB) [][]byte {
	lit := func(s string) *fixtures.Table { return fixtures.MustParse(tb, s) }
	want := lit(`house:string | day:date | tmax:float64 | note:string | n:int64
		Étang | 2026-04-01 | 21.5 | "vent open" | 1
		"Les Pins" | 2026-04-01 | 18.25 | "a note long enough to be cut" | 2
		Verger | 2026-04-02 | 19 | ~ | 3
		Colline | 2026-04-02 | 17.125 | x | 4`)
	got := lit(`house:string | day:date | tmax:float64 | note:string | extra:bool
		Étang | 2026-04-01 | 21.75 | "vent ouvert" | true
		"Les Pins" | 2026-04-01 | +Inf | "a note long enough to be cut!" | false
		Verger | 2026-04-03 | 19 | ~ | ~
		Colline | 2026-04-02 | 17.125 | x | true
		Colline | 2026-04-02 | 17.5 | y | true`)
	var seeds [][]byte
	for _, d := range []*Diff{
		Compare(want, got, ByKey("house", "day"), Tol("tmax", 0.1, 0)),
		Compare(want, got),
		Compare(want, got, AnyRowOrder(), ULPs("*", 2)),
		Compare(nil, want),
		Compare(want, want),
	} {
		b, err := d.JSON()
		if err != nil {
			tb.Fatal(err)
		}
		// Compact: the fewer bytes, the sooner the fuzzer's minimizer
		// is done with an input derived from it.
		var c bytes.Buffer
		if err := json.Compact(&c, b); err != nil {
			tb.Fatal(err)
		}
		seeds = append(seeds, c.Bytes())
	}
	return seeds
}

// FuzzDiffJSON reads any bytes as a Diff's JSON and, when they read,
// renders the Diff in every format. It checks that no input panics; that
// the JSON written reads back to the same JSON; that each streaming
// renderer writes what its string form returns; that text and Markdown
// carry no raw control character (a hostile name or cell cannot drive a
// terminal); and that the HTML fragment's tags are the renderer's own,
// balanced, with one HTMLChangedCell element per listed cell (a hostile
// name or cell cannot add markup).
func FuzzDiffJSON(f *testing.F) {
	for _, s := range fuzzDiffSeeds(f) {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, data []byte) {
		d, err := DiffFromJSON(data)
		if err != nil {
			return
		}
		checkRenderers(t, d)
	})
}

// checkRenderers holds the properties FuzzDiffJSON checks of one Diff.
func checkRenderers(t *testing.T, d *Diff) {
	t.Helper()
	js, err := d.JSON()
	require.NoError(t, err)
	back, err := DiffFromJSON(js)
	require.NoError(t, err, "the JSON written does not read back:\n%s", js)
	again, err := back.JSON()
	require.NoError(t, err)
	require.Equal(t, string(js), string(again), "JSON is not stable through DiffFromJSON")
	require.Equal(t, d.Equal(), back.Equal())

	var buf bytes.Buffer
	require.NoError(t, d.WriteJSON(&buf))
	require.Equal(t, string(js), buf.String(), "WriteJSON and JSON differ")

	for _, st := range []TextStyle{{}, {Color: true, Flags: true, Width: 60}} {
		text := d.TextWith(st)
		buf.Reset()
		require.NoError(t, d.WriteText(&buf, st))
		require.Equal(t, text, buf.String(), "WriteText and TextWith differ (%+v)", st)
		requireNoControls(t, "text", text, st.Color)
	}
	md := d.Markdown()
	buf.Reset()
	require.NoError(t, d.WriteMarkdown(&buf))
	require.Equal(t, md, buf.String(), "WriteMarkdown and Markdown differ")
	requireNoControls(t, "Markdown", md, false)

	page := d.HTML()
	buf.Reset()
	require.NoError(t, d.WriteHTML(&buf))
	require.Equal(t, page, buf.String(), "WriteHTML and HTML differ")
	changed, err := checkHTMLTags(page)
	require.NoError(t, err, "%s", page)
	if !d.Equal() {
		require.Equal(t, d.Cells.Len(), changed, "elements of class %s", HTMLChangedCell)
	}
}

// requireNoControls fails when out holds a control character other than
// a line feed (and, with colour, the escape starting an SGR sequence).
func requireNoControls(t *testing.T, what, out string, color bool) {
	t.Helper()
	require.True(t, utf8.ValidString(out), "%s output is not UTF-8", what)
	for i, r := range out {
		if r == '\n' || r >= 0x20 && r != 0x7f && (r < 0x80 || r > 0x9f) {
			continue
		}
		if color && r == 0x1b && sgrAt(out[i:]) {
			continue
		}
		t.Fatalf("%s output holds the raw control character %U at byte %d:\n%s", what, r, i, out)
	}
}

// sgrAt reports whether s starts with an SGR escape (ESC [ digits and
// semicolons m), the only escape the coloured text writes.
func sgrAt(s string) bool {
	if !strings.HasPrefix(s, "\x1b[") {
		return false
	}
	for i := 2; i < len(s); i++ {
		switch c := s[i]; {
		case c == 'm':
			return true
		case c == ';' || c >= '0' && c <= '9':
		default:
			return false
		}
	}
	return false
}

// htmlTags are the elements the HTML renderer writes, with whether they
// may be written self-closed (<line … />).
var htmlTags = map[string]bool{
	"circle": true, "code": false, "del": false, "desc": false, "div": false,
	"figcaption": false, "figure": false, "h4": false, "ins": false, "li": false,
	"line": true, "p": false, "polygon": true, "rect": true, "small": false,
	"span": false, "svg": false, "table": false, "tbody": false, "td": false,
	"text": false, "th": false, "thead": false, "title": false, "tr": false, "ul": false,
}

// checkHTMLTags reads an HTML fragment's tags: each must be one the
// renderer writes, every element must be closed in order, and no
// attribute value may hold a raw quote or angle bracket. It returns how
// many elements carry the class HTMLChangedCell.
func checkHTMLTags(page string) (changed int, err error) {
	var open []string
	s := page
	for {
		i := strings.IndexByte(s, '<')
		if i < 0 {
			break
		}
		if strings.ContainsAny(s[:i], ">") {
			return 0, fmt.Errorf("a raw > in text before %.40q", s[i:])
		}
		end := strings.IndexByte(s[i:], '>')
		if end < 0 {
			return 0, fmt.Errorf("a tag is not closed: %.40q", s[i:])
		}
		tag := s[i+1 : i+end]
		s = s[i+end+1:]
		closing := strings.HasPrefix(tag, "/")
		tag = strings.TrimPrefix(tag, "/")
		selfClosed := strings.HasSuffix(tag, "/")
		tag = strings.TrimSuffix(tag, "/")
		name, attrs, _ := strings.Cut(tag, " ")
		self, known := htmlTags[name]
		if !known {
			return 0, fmt.Errorf("element <%s> is not one the renderer writes", name)
		}
		if err := checkAttrs(attrs); err != nil {
			return 0, fmt.Errorf("<%s>: %w", name, err)
		}
		if strings.Contains(" "+attrs, ` class="`+HTMLChangedCell+`"`) {
			changed++
		}
		switch {
		case closing:
			if len(open) == 0 || open[len(open)-1] != name {
				return 0, fmt.Errorf("</%s> closes nothing open (open: %v)", name, open)
			}
			open = open[:len(open)-1]
		case selfClosed:
			if !self {
				return 0, fmt.Errorf("<%s/> is self-closed", name)
			}
		default:
			open = append(open, name)
		}
	}
	if strings.ContainsAny(s, ">") {
		return 0, fmt.Errorf("a raw > after the last tag")
	}
	if len(open) > 0 {
		return 0, fmt.Errorf("elements left open: %v", open)
	}
	return changed, nil
}

// checkAttrs checks a tag's attributes are name="value" pairs whose
// values hold no raw quote or angle bracket.
func checkAttrs(attrs string) error {
	s := strings.TrimSpace(attrs)
	for s != "" {
		eq := strings.IndexByte(s, '=')
		if eq < 0 {
			return fmt.Errorf("attribute %q has no value", s)
		}
		name := s[:eq]
		if strings.ContainsAny(name, `"'<> `) {
			return fmt.Errorf("attribute name %q", name)
		}
		if !strings.HasPrefix(s[eq+1:], `"`) {
			return fmt.Errorf("attribute %s is not quoted", name)
		}
		rest := s[eq+2:]
		q := strings.IndexByte(rest, '"')
		if q < 0 {
			return fmt.Errorf("attribute %s is not closed", name)
		}
		if strings.ContainsAny(rest[:q], "<>") {
			return fmt.Errorf("attribute %s holds a raw angle bracket", name)
		}
		s = strings.TrimSpace(rest[q+1:])
	}
	return nil
}

// TestDiffJSONSeedsRender runs FuzzDiffJSON's checks on its seeds, so
// that a plain go test holds the renderers to them.
func TestDiffJSONSeedsRender(t *testing.T) {
	for _, s := range fuzzDiffSeeds(t) {
		d, err := DiffFromJSON(s)
		require.NoError(t, err)
		checkRenderers(t, d)
	}
}
