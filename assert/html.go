package assert

import (
	"fmt"
	"html"
	"io"
	"strconv"
	"strings"
)

// HTMLChangedCell is the class HTML gives every element that shows one
// differing cell, and no other element: a page can style them, and a test
// can count them (one per entry of Diff.Cells).
const HTMLChangedCell = "ps-changed"

// HTML writes the Diff as an HTML fragment for a review page: a <div
// class="ps-diff"> holding the verdict, the row counts, then problems,
// schema changes, a grid of the rows with differing cells (one column per
// column that differs, each differing cell a <td class="ps-changed">
// showing want in <del> and got in <ins> with the distance), missing and
// extra rows, repeated keys and the column summaries. Every piece of text
// from the tables — cells, column names, keys — is HTML-escaped, so no
// cell can add markup or script to the page. The fragment carries no
// style and no script; its classes all start with "ps-". The output is the
// same for the same Diff.
func (d *Diff) HTML() string {
	var b strings.Builder
	_ = d.WriteHTML(&b) // a strings.Builder does not fail
	return b.String()
}

// WriteHTML writes what HTML returns to w as it goes, so that a listing of
// millions of cells needs little memory. It returns the first error of w.
func (d *Diff) WriteHTML(w io.Writer) error {
	if d == nil {
		d = &Diff{}
	}
	bw := renderBuffer(w)
	h := &htmlWriter{b: bw}
	h.open("div", "ps-diff", "data-equal", strconv.FormatBool(d.Equal()), "data-cells", strconv.Itoa(d.Cells.Len()))
	h.elem("p", "ps-verdict", capitalise(d.headline()))
	h.elem("p", "ps-match", d.matchLine())
	if d.Equal() {
		h.close("div")
		return bw.Flush()
	}
	if len(d.Problems) > 0 {
		h.heading("Problems")
		h.open("ul", "ps-problems")
		for _, p := range d.Problems {
			h.elem("li", "", p)
		}
		h.close("ul")
	}
	if len(d.Hints) > 0 {
		d.htmlHints(h)
	}
	d.htmlPictures(h)
	if len(d.Schema) > 0 {
		h.heading(fmt.Sprintf("Schema changes (%d)", len(d.Schema)))
		h.table("ps-schema", []string{"column", "change", d.wantName(), d.gotName()})
		for _, s := range d.Schema {
			h.raw("<tr>")
			h.elem("td", "ps-name", s.Column)
			h.elem("td", "", d.describeChange(s.Change))
			h.elem("td", "ps-want", s.Want)
			h.elem("td", "ps-got", s.Got)
			h.raw("</tr>\n")
		}
		h.endTable()
	}
	if d.Cells.Len() > 0 {
		h.heading(fmt.Sprintf("Differing cells (%d%s)", d.CellsDiffering, shown(d.Cells.Len(), d.CellsDiffering)))
		d.htmlGrid(h)
	} else if d.CellsDiffering > 0 {
		h.heading(fmt.Sprintf("Differing cells (%d, none listed)", d.CellsDiffering))
	}
	d.htmlRows(h, "Missing rows: in "+d.wantName()+", not in "+d.gotName(), "ps-missing", d.Missing, d.WantColumns)
	d.htmlRows(h, "Extra rows: in "+d.gotName()+", not in "+d.wantName(), "ps-extra", d.Extra, d.GotColumns)
	if n := d.Duplicates.WantKeys + d.Duplicates.GotKeys; n > 0 {
		h.heading(fmt.Sprintf("Repeated keys (%s %d, %s %d%s)", d.wantName(), d.Duplicates.WantKeys, d.gotName(), d.Duplicates.GotKeys, shown(len(d.Duplicates.Keys), n)))
		h.table("ps-dups", []string{"side", "key", "rows", "at rows"})
		for _, k := range d.Duplicates.Keys {
			at := make([]string, len(k.Rows))
			for i, r := range k.Rows {
				at[i] = rowNumber(r)
			}
			if len(k.Rows) < k.Count {
				at = append(at, "…")
			}
			h.raw("<tr>")
			h.elem("td", "", d.sideName(k.Side))
			h.elem("td", "ps-key", "("+strings.Join(k.Key, ", ")+")")
			h.elem("td", "ps-num", strconv.Itoa(k.Count))
			h.elem("td", "", strings.Join(at, ", "))
			h.raw("</tr>\n")
		}
		h.endTable()
	}
	if cols := d.notableColumns(); len(cols) > 0 {
		h.heading("Columns")
		h.table("ps-columns", []string{"column", "how compared", "cells differ", "max abs. diff", "at", "max rel. diff", "at"})
		for _, c := range cols {
			row := []string{"", "", "", ""}
			if c.HasDelta && c.MaxAbsAt.Want >= 0 {
				row[0], row[1] = formatAbs(c.MaxAbs, c.WantType.Kind()), d.rowName(c.MaxAbsAt)
				if !isTimeKind(c.WantType.Kind()) && !isTimeKind(c.GotType.Kind()) && c.MaxRelAt.Want >= 0 {
					row[2], row[3] = formatRel(c.MaxRel), d.rowName(c.MaxRelAt)
				}
			}
			h.raw("<tr>")
			h.elem("td", "ps-name", c.Name)
			h.elem("td", "", c.Rule)
			h.elem("td", "ps-num", strconv.Itoa(c.Differing))
			h.elem("td", "ps-num", row[0])
			h.elem("td", "", row[1])
			h.elem("td", "ps-num", row[2])
			h.elem("td", "", row[3])
			h.raw("</tr>\n")
		}
		h.endTable()
	}
	h.close("div")
	return bw.Flush()
}

// htmlHints writes the hints as a list, each with its fixes, and near
// matches side by side.
func (d *Diff) htmlHints(h *htmlWriter) {
	h.heading(capitalise(plural(len(d.Hints), "hint", "hints")))
	h.open("ul", "ps-hints")
	for _, hint := range d.Hints {
		h.open("li", "ps-hint", "data-hint", string(hint.Kind))
		h.elem("span", "", hint.Text)
		if hint.Option != "" || hint.Flag != "" {
			h.raw(" — fix with ")
			if hint.Option != "" {
				h.raw("Go ")
				h.elem("code", "", hint.Option)
			}
			if hint.Option != "" && hint.Flag != "" {
				h.raw("; ")
			}
			if hint.Flag != "" {
				h.raw("command line ")
				h.elem("code", "", hint.Flag)
			}
		}
		if len(hint.Pairs) > 0 {
			h.table("ps-near", []string{"missing row (want)", "extra row (got)", "differs by"})
			for _, p := range hint.Pairs {
				h.raw("<tr>")
				h.elem("td", "ps-key ps-want", d.rowName(p.Missing))
				h.elem("td", "ps-key ps-got", d.rowName(p.Extra))
				h.elem("td", "", strings.Join(p.Why, ", "))
				h.raw("</tr>\n")
			}
			if hint.Count > len(hint.Pairs) {
				h.raw("<tr>")
				h.elem("td", "", fmt.Sprintf("… %d more", hint.Count-len(hint.Pairs)))
				h.raw("<td></td><td></td></tr>\n")
			}
			h.endTable()
		}
		h.close("li")
	}
	h.close("ul")
}

// htmlGrid writes the listed differing cells as a grid: one line per row
// (keys or row index first), one column per column with a listed
// difference, in want's column order. The cells of a row follow each
// other in the listing, so the grid is written as the listing is read.
func (d *Diff) htmlGrid(h *htmlWriter) {
	cols := listedColumns(d.Cells, d.Compared)
	pos := make(map[string]int, len(cols))
	for j, name := range cols {
		pos[name] = j
	}
	keyed := d.Match == MatchByKey && len(d.Keys) > 0
	head := []string{"row"}
	if keyed {
		head = append([]string(nil), d.Keys...)
	}
	h.table("ps-grid", append(head, cols...))
	// One row of the grid: its cells by column, written when the next row
	// starts. A column listed twice for one row keeps its first cell.
	row := make([]string, len(cols))
	have := make([]bool, len(cols))
	var ref RowRef
	open := false
	var cell strings.Builder
	flush := func() {
		if !open {
			return
		}
		h.raw("<tr>")
		if keyed {
			for _, k := range ref.Key {
				h.elem("th", "ps-key", k)
			}
		} else {
			h.elem("th", "ps-key", d.rowIndex(ref))
		}
		for j := range cols {
			if !have[j] {
				h.raw(`<td class="ps-same"></td>`)
				continue
			}
			h.raw(row[j])
			have[j] = false
		}
		h.raw("</tr>\n")
	}
	eachCell(d.Cells, func(_ int, c *CellDiff) bool {
		if !open || c.Row.Want != ref.Want || c.Row.Got != ref.Got {
			flush()
			ref, open = RowRef{Want: c.Row.Want, Got: c.Row.Got, Key: c.Row.Key}, true
		}
		if j := pos[c.Column]; !have[j] {
			cell.Reset()
			d.htmlCell(&htmlWriter{b: &cell}, *c)
			row[j], have[j] = cell.String(), true
		}
		return true
	})
	flush()
	h.endTable()
}

// htmlCell writes one differing cell: want struck out, got inserted, the
// distance or the character edit below.
func (d *Diff) htmlCell(h *htmlWriter, c CellDiff) {
	note := ""
	if c.Delta.Has {
		note = "abs. diff " + formatAbs(c.Delta.Abs, c.Want.Kind)
		if c.Delta.HasULPs {
			note += " (" + strconv.FormatUint(c.Delta.ULPs, 10) + " ulp)"
		}
		if !isTimeKind(c.Want.Kind) && !isTimeKind(c.Got.Kind) && c.Delta.Rel != 0 {
			note += ", rel. diff " + formatRel(c.Delta.Rel)
		}
	} else if ws, gs, ok := textPair(&c); ok {
		if e, ok := textEdit(ws, gs, editStyle{}); ok {
			note = e
		}
	}
	h.open("td", HTMLChangedCell, "data-column", c.Column)
	h.elem("del", cellClass(c.Want), c.Want.Text)
	h.elem("ins", cellClass(c.Got), c.Got.Text)
	if note != "" {
		h.elem("small", "ps-note", note)
	}
	h.raw("</td>")
}

func cellClass(c Cell) string {
	if c.Null {
		return "ps-null"
	}
	return ""
}

// htmlRows writes missing or extra rows as a table of their cells.
func (d *Diff) htmlRows(h *htmlWriter, title, class string, l RowList, cols []string) {
	if l.Count == 0 {
		return
	}
	h.heading(fmt.Sprintf("%s (%d%s)", title, l.Count, shown(l.Rows.Len(), l.Count)))
	h.table("ps-rows "+class, append([]string{"row"}, cols...))
	for _, r := range l.Rows.All() {
		idx := r.Want
		if idx < 0 {
			idx = r.Got
		}
		h.raw("<tr>")
		h.elem("th", "ps-key", rowNumber(idx))
		for _, c := range r.Cells {
			h.elem("td", "", c)
		}
		h.raw("</tr>\n")
	}
	h.endTable()
}

// htmlWriter builds escaped HTML. Only its own literal markup is written
// raw; every text and attribute value goes through html.EscapeString.
type htmlWriter struct {
	b interface {
		io.Writer
		io.StringWriter
	}
}

func (h *htmlWriter) raw(s string) { h.b.WriteString(s) }

// open writes a start tag with a class (when not empty) and attribute
// name/value pairs.
func (h *htmlWriter) open(tag, class string, attrs ...string) {
	h.b.WriteString("<" + tag)
	if class != "" {
		h.b.WriteString(` class="` + html.EscapeString(class) + `"`)
	}
	for i := 0; i+1 < len(attrs); i += 2 {
		h.b.WriteString(" " + attrs[i] + `="` + html.EscapeString(attrs[i+1]) + `"`)
	}
	h.b.WriteString(">")
}

func (h *htmlWriter) close(tag string) { h.b.WriteString("</" + tag + ">\n") }

// elem writes <tag class=…>text</tag> with the text escaped.
func (h *htmlWriter) elem(tag, class, text string) {
	h.open(tag, class)
	h.b.WriteString(html.EscapeString(text))
	h.b.WriteString("</" + tag + ">")
}

func (h *htmlWriter) heading(title string) {
	h.elem("h4", "ps-heading", title)
	h.raw("\n")
}

// table opens a scrollable table with a header row.
func (h *htmlWriter) table(class string, head []string) {
	h.raw(`<div class="ps-scroll">`)
	h.open("table", class)
	h.raw("<thead><tr>")
	for _, c := range head {
		h.elem("th", "", c)
	}
	h.raw("</tr></thead>\n<tbody>\n")
}

func (h *htmlWriter) endTable() { h.raw("</tbody></table></div>\n") }
