package assert

import (
	"encoding/xml"
	"errors"
	"fmt"
	"io"
	"strconv"
	"strings"
	"testing"

	"github.com/stretchr/testify/require"

	"github.com/proofsheet/proofsheet/fixtures"
)

// htmlNode is an element of a parsed fragment: its name, class and text.
type htmlNode struct {
	name, class, text string
	attrs             map[string]string
}

// parseFragment reads an HTML fragment strictly as XML, which it must be
// (every tag closed, every text escaped), and returns its elements in
// document order with the text each holds.
func parseFragment(t *testing.T, frag string) []*htmlNode {
	t.Helper()
	dec := xml.NewDecoder(strings.NewReader("<root>" + frag + "</root>"))
	dec.Strict = true
	var all, stack []*htmlNode
	for {
		tok, err := dec.Token()
		if errors.Is(err, io.EOF) {
			break
		}
		require.NoError(t, err, frag)
		switch x := tok.(type) {
		case xml.StartElement:
			n := &htmlNode{name: x.Name.Local, attrs: map[string]string{}}
			for _, a := range x.Attr {
				n.attrs[a.Name.Local] = a.Value
				if a.Name.Local == "class" {
					n.class = a.Value
				}
			}
			all = append(all, n)
			stack = append(stack, n)
		case xml.EndElement:
			stack = stack[:len(stack)-1]
		case xml.CharData:
			for _, n := range stack {
				n.text += string(x)
			}
		}
	}
	return all[1:] // without the root
}

func byClass(nodes []*htmlNode, class string) []*htmlNode {
	var out []*htmlNode
	for _, n := range nodes {
		for _, c := range strings.Fields(n.class) {
			if c == class {
				out = append(out, n)
			}
		}
	}
	return out
}

func TestHTMLMarksEveryDifferingCell(t *testing.T) {
	keyed, positional := differingTables(t)
	for name, d := range map[string]*Diff{"keyed": keyed, "positional": positional} {
		t.Run(name, func(t *testing.T) {
			nodes := parseFragment(t, d.HTML())
			changed := byClass(nodes, HTMLChangedCell)
			require.Len(t, changed, d.Cells.Len())
			require.Equal(t, d.CellsDiffering, d.Cells.Len(), "the fixture lists every cell")
			for i, c := range d.Cells.All() {
				n := changed[i]
				require.Equal(t, "td", n.name)
				require.Equal(t, c.Column, n.attrs["data-column"])
				require.True(t, strings.HasPrefix(n.text, c.Want.Text+c.Got.Text), "cell %d text %q", i, n.text)
			}
			require.Len(t, byClass(nodes, "ps-missing"), min(1, d.Missing.Count))
			require.Len(t, byClass(nodes, "ps-extra"), min(1, d.Extra.Count))
		})
	}
	// The keyed grid names rows by their keys, one row per changed row.
	nodes := parseFragment(t, keyed.HTML())
	grid := byClass(nodes, "ps-grid")
	require.Len(t, grid, 1)
	require.Contains(t, grid[0].text, "Les Pins2026-04-01")
	require.Contains(t, grid[0].text, "abs. diff 0.05")
	require.Contains(t, grid[0].text, "vent⟦⟨sp⟩→⟨nbsp⟩⟧open", "text cells carry the character edit")
	require.Len(t, byClass(nodes, "ps-verdict"), 1)
	require.Equal(t, "Tables differ: 1 schema change, 3 differing cells in 2 rows, 1 missing row, 1 extra row", byClass(nodes, "ps-verdict")[0].text)
}

func TestHTMLEscapesHostileText(t *testing.T) {
	hostile := []string{
		`<script>window.__pwned=1</script>`,
		`<img src=x onerror="window.__pwned=2">`,
		`"><svg onload=alert(1)>`,
		`a & b ' c`,
	}
	want := lit(t, `id:int64 | note:string
		1 | a
		2 | b
		3 | c
		4 | d`)
	b := strings.Builder{}
	b.WriteString("id:int64 | note:string\n")
	for i, h := range hostile {
		b.WriteString(strings.Repeat(" ", 2))
		b.WriteString(string(rune('1'+i)) + " | " + quoteLit(h) + "\n")
	}
	got := lit(t, b.String())
	d := Compare(want, got, ByKey("id"))
	require.Equal(t, 4, d.CellsDiffering)
	out := d.HTML()
	// Source: HTML Living Standard §13.1.2 (elements start with "<" and a
	// tag name) — escaped text cannot open an element.
	for _, tag := range []string{"<script", "<img"} {
		require.NotContains(t, out, tag)
	}
	// The only <svg> elements are the renderer's own pictures.
	require.Equal(t, strings.Count(out, "<svg"), strings.Count(out, `<svg class="`+HTMLPicture+`"`))
	nodes := parseFragment(t, out)
	for _, n := range nodes {
		require.NotContains(t, []string{"script", "img", "style", "iframe"}, n.name)
		if n.name == "svg" {
			require.Equal(t, HTMLPicture, n.attrs["class"])
		}
		for a := range n.attrs {
			require.False(t, strings.HasPrefix(a, "on"), "event handler attribute %q", a)
		}
	}
	changed := byClass(nodes, HTMLChangedCell)
	require.Len(t, changed, 4)
	for i, h := range hostile {
		require.Equal(t, h, d.Cells.At(i).Got.Value)
		require.Contains(t, changed[i].text, d.Cells.At(i).Got.Text, "the text reads back as it was")
	}
}

// quoteLit writes s as a quoted literal table cell.
func quoteLit(s string) string {
	r := strings.NewReplacer(`\`, `\\`, `"`, `\"`)
	return `"` + r.Replace(s) + `"`
}

func TestHTMLOfEqualAndEmptyDiffs(t *testing.T) {
	tb := lit(t, `a:int64
		1`)
	nodes := parseFragment(t, Compare(tb, tb).HTML())
	require.Equal(t, "div", nodes[0].name)
	require.Equal(t, "true", nodes[0].attrs["data-equal"])
	require.Empty(t, byClass(nodes, HTMLChangedCell))
	var d *Diff
	require.NotPanics(t, func() { _ = d.HTML() })
	nodes = parseFragment(t, Compare(nil, tb).HTML())
	require.Len(t, byClass(nodes, "ps-problems"), 1)
}

func TestHTMLListingCap(t *testing.T) {
	var w, g strings.Builder
	w.WriteString("i:int64 | v:float64\n")
	g.WriteString("i:int64 | v:float64\n")
	for i := 0; i < 30; i++ {
		w.WriteString("  " + strconv.Itoa(i) + " | 1\n")
		g.WriteString("  " + strconv.Itoa(i) + " | 2\n")
	}
	d := Compare(lit(t, w.String()), lit(t, g.String()), ListLimit(7))
	nodes := parseFragment(t, d.HTML())
	require.Len(t, byClass(nodes, HTMLChangedCell), 7)
	require.Contains(t, d.HTML(), "Differing cells (30, first 7 shown)")
}

func ExampleDiff_HTML() {
	want, _ := fixtures.Parse(`house:string | tmax:float64
		Étang | 21.5`)
	got, _ := fixtures.Parse(`house:string | tmax:float64
		Étang | 22`)
	d := Compare(want, got, ByKey("house"))
	page := d.HTML()
	fmt.Println(strings.Count(page, `class="`+HTMLChangedCell+`"`), "marked cell")
	start := strings.Index(page, `<td class="ps-changed"`)
	fmt.Println(page[start : strings.Index(page[start:], "</td>")+start+5])
	// Output:
	// 1 marked cell
	// <td class="ps-changed" data-column="tmax"><del>21.5</del><ins>22</ins><small class="ps-note">abs. diff 0.5, rel. diff 0.0227</small></td>
}
