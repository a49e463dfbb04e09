package assert

import (
	"fmt"
	"io"
	"strings"

	"github.com/proofsheet/proofsheet/internal/printable"
)

// Markdown writes the Diff for a reviewer, for example as a pull-request
// comment: a verdict line, a table of row counts, then tables of problems,
// schema changes, differing cells (with character edits for text),
// missing and extra rows, repeated keys and the columns that differ. Cell
// text is shown in code spans with pipes escaped, so any value is safe in
// a table.
func (d *Diff) Markdown() string {
	var b strings.Builder
	_ = d.WriteMarkdown(&b) // a strings.Builder does not fail
	return b.String()
}

// WriteMarkdown writes what Markdown returns to w as it goes, so that a
// listing of millions of cells needs little memory (the text edits below
// the table of cells are found in a second pass over the listing). It
// returns the first error of w.
func (d *Diff) WriteMarkdown(w io.Writer) error {
	if d == nil {
		d = &Diff{}
	}
	b := renderBuffer(w)
	p := func(format string, args ...any) { fmt.Fprintf(b, format, args...) }
	if d.Equal() {
		p("**Tables are equal** — %s, %s compared; %s.\n", plural(d.WantRows, "row", "rows"), plural(len(d.Compared), "column", "columns"), strings.TrimPrefix(d.matchLine(), d.sizeLine()))
		return b.Flush()
	}
	p("**%s**\n\n", capitalise(d.headline()))
	p("| | %s | %s |\n|---|--:|--:|\n| rows | %d | %d |\n| columns | %d | %d |\n\n", d.wantName(), d.gotName(), d.WantRows, d.GotRows, len(d.WantColumns), len(d.GotColumns))
	p("%s.\n", capitalise(strings.TrimPrefix(d.matchLine(), d.sizeLine())))
	if len(d.Problems) > 0 {
		p("\n#### Problems\n\n")
		for _, pr := range d.Problems {
			p("- %s\n", mdEscape(pr))
		}
	}
	if len(d.Hints) > 0 {
		p("\n#### %s\n\n", capitalise(plural(len(d.Hints), "hint", "hints")))
		for _, h := range d.Hints {
			p("- %s%s\n", mdEscape(h.Text), mdFix(h))
			if len(h.Pairs) > 0 {
				p("\n  | missing row (want) | extra row (got) | differs by |\n  |---|---|---|\n")
				for _, pr := range h.Pairs {
					p("  | %s | %s | %s |\n", mdCode(d.rowName(pr.Missing)), mdCode(d.rowName(pr.Extra)), mdEscape(strings.Join(pr.Why, ", ")))
				}
				if h.Count > len(h.Pairs) {
					p("  | … %d more | | |\n", h.Count-len(h.Pairs))
				}
				p("\n")
			}
		}
	}
	if len(d.Schema) > 0 {
		p("\n#### Schema changes\n\n| column | change | %s | %s |\n|---|---|---|---|\n", d.wantName(), d.gotName())
		for _, s := range d.Schema {
			p("| %s | %s | %s | %s |\n", mdCode(printable.Name(s.Column)), d.describeChange(s.Change), mdCode(s.Want), mdCode(s.Got))
		}
	}
	if d.CellsDiffering > 0 {
		p("\n#### Differing cells (%d%s)\n\n", d.CellsDiffering, mdShown(d.Cells.Len(), d.CellsDiffering))
		keyed := d.Match == MatchByKey && len(d.Keys) > 0
		head := []string{"row"}
		if keyed {
			head = nil
			for _, k := range d.Keys {
				head = append(head, mdCode(printable.Name(k)))
			}
		}
		head = append(head, "column", d.wantName(), d.gotName(), "abs. diff", "rel. diff")
		p("| %s |\n|%s\n", strings.Join(head, " | "), strings.Repeat("---|", len(head)))
		edits := false
		eachCell(d.Cells, func(_ int, c *CellDiff) bool {
			b.WriteString("|")
			cell := func(x string) {
				b.WriteByte(' ')
				b.WriteString(x)
				b.WriteString(" |")
			}
			if keyed {
				for _, k := range c.Row.Key {
					cell(mdCode(k))
				}
			} else {
				cell(d.rowIndex(c.Row))
			}
			abs, rel := "", ""
			if c.Delta.Has {
				abs = formatAbs(c.Delta.Abs, c.Want.Kind)
				if !isTimeKind(c.Want.Kind) && !isTimeKind(c.Got.Kind) {
					rel = formatRel(c.Delta.Rel)
				}
			}
			for _, x := range [...]string{mdCode(printable.Name(c.Column)), mdCode(c.Want.Text), mdCode(c.Got.Text), abs, rel} {
				cell(x)
			}
			b.WriteString("\n")
			if !edits {
				if ws, gs, ok := textPair(c); ok {
					_, edits = textEdit(ws, gs, editStyle{})
				}
			}
			return true
		})
		if edits {
			p("\nText edits (⟦%s→%s⟧):\n\n", d.wantName(), d.gotName())
			eachCell(d.Cells, func(_ int, c *CellDiff) bool {
				if ws, gs, ok := textPair(c); ok {
					if e, ok := textEdit(ws, gs, editStyle{}); ok {
						p("- %s, %s: %s\n", d.rowName(c.Row), mdCode(printable.Name(c.Column)), mdCode(e))
					}
				}
				return true
			})
		}
	}
	mdRows := func(title string, l RowList, cols []string) {
		if l.Count == 0 {
			return
		}
		p("\n#### %s (%d%s)\n\n| row | %s |\n|--:|%s\n", title, l.Count, mdShown(l.Rows.Len(), l.Count), mdJoin(shownNames(cols)), strings.Repeat("---|", len(cols)))
		for _, r := range l.Rows.All() {
			idx := r.Want
			if idx < 0 {
				idx = r.Got
			}
			p("| %s | %s |\n", rowNumber(idx), mdJoin(r.Cells))
		}
	}
	mdRows("Missing rows: in "+d.wantName()+", not in "+d.gotName(), d.Missing, d.WantColumns)
	mdRows("Extra rows: in "+d.gotName()+", not in "+d.wantName(), d.Extra, d.GotColumns)
	if n := d.Duplicates.WantKeys + d.Duplicates.GotKeys; n > 0 {
		p("\n#### Repeated keys (%s %d, %s %d%s)\n\n| side | key | rows | at rows |\n|---|---|--:|---|\n", d.wantName(), d.Duplicates.WantKeys, d.gotName(), d.Duplicates.GotKeys, mdShown(len(d.Duplicates.Keys), n))
		for _, k := range d.Duplicates.Keys {
			at := make([]string, len(k.Rows))
			for i, r := range k.Rows {
				at[i] = rowNumber(r)
			}
			p("| %s | %s | %d | %s |\n", d.sideName(k.Side), mdCode("("+strings.Join(k.Key, ", ")+")"), k.Count, strings.Join(at, ", "))
		}
	}
	if cols := d.notableColumns(); len(cols) > 0 {
		p("\n#### Columns\n\n| column | how compared | cells differ | max abs. diff | max rel. diff |\n|---|---|--:|--:|--:|\n")
		for _, c := range cols {
			abs, rel := "", ""
			if c.HasDelta && c.MaxAbsAt.Want >= 0 {
				abs = formatAbs(c.MaxAbs, c.WantType.Kind()) + " at " + mdEscape(d.rowName(c.MaxAbsAt))
				if !isTimeKind(c.WantType.Kind()) && !isTimeKind(c.GotType.Kind()) && c.MaxRelAt.Want >= 0 {
					rel = formatRel(c.MaxRel) + " at " + mdEscape(d.rowName(c.MaxRelAt))
				}
			}
			p("| %s | %s | %d | %s | %s |\n", mdCode(printable.Name(c.Name)), mdEscape(c.Rule), c.Differing, abs, rel)
		}
	}
	return b.Flush()
}

// mdFix writes the fix of a hint: the Go option and the flag.
func mdFix(h Hint) string {
	var fixes []string
	if h.Option != "" {
		fixes = append(fixes, "Go: "+mdCode(h.Option))
	}
	if h.Flag != "" {
		fixes = append(fixes, "command line: "+mdCode(h.Flag))
	}
	if len(fixes) == 0 {
		return ""
	}
	return " — fix with " + strings.Join(fixes, "; ")
}

func capitalise(s string) string {
	if s == "" {
		return s
	}
	return strings.ToUpper(s[:1]) + s[1:]
}

func mdShown(listed, total int) string {
	if listed < total {
		return fmt.Sprintf(", first %d shown", listed)
	}
	return ""
}

// mdCode writes s as a code span safe inside a table cell: pipes escaped,
// newlines as markers, and a fence longer than any backquote run in s.
func mdCode(s string) string {
	if s == "" {
		return ""
	}
	s = strings.ReplaceAll(s, "|", `\|`)
	s = strings.ReplaceAll(s, "\n", "⟨lf⟩")
	s = strings.ReplaceAll(s, "\r", "⟨cr⟩")
	fence := "`"
	for strings.Contains(s, fence) {
		fence += "`"
	}
	pad := ""
	if strings.HasPrefix(s, "`") || strings.HasSuffix(s, "`") {
		pad = " "
	}
	return fence + pad + s + pad + fence
}

// mdEscaper escapes the characters Markdown would read as markup. A
// Replacer is safe for concurrent use, and building one costs more than
// most of the texts it escapes.
var mdEscaper = strings.NewReplacer("|", `\|`, "*", `\*`, "_", `\_`, "`", "\\`", "<", "&lt;", ">", "&gt;", "[", `\[`, "]", `\]`, "\n", " ")

// mdEscape escapes text that is not in a code span.
func mdEscape(s string) string {
	return mdEscaper.Replace(s)
}

// shownNames is printable.Name of each name.
func shownNames(names []string) []string {
	out := make([]string, len(names))
	for i, n := range names {
		out[i] = printable.Name(n)
	}
	return out
}

func mdJoin(cells []string) string {
	out := make([]string, len(cells))
	for i, c := range cells {
		out[i] = mdCode(c)
	}
	return strings.Join(out, " | ")
}
