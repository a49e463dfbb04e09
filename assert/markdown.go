package assert

import (
	"fmt"
	"strconv"
	"strings"
)

// Markdown writes the Diff for a reviewer, for example as a pull-request
// comment: a verdict line, a table of row counts, then tables of problems,
// schema changes, differing cells (with character edits for text),
// missing and extra rows, repeated keys and the columns that differ. Cell
// text is shown in code spans with pipes escaped, so any value is safe in
// a table.
func (d *Diff) Markdown() string {
	if d == nil {
		d = &Diff{}
	}
	var b strings.Builder
	p := func(format string, args ...any) { fmt.Fprintf(&b, format, args...) }
	if d.Equal() {
		p("**Tables are equal** — %d rows, %d columns compared; %s.\n", d.WantRows, len(d.Compared), strings.TrimPrefix(d.matchLine(), d.sizeLine()))
		return b.String()
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
	if len(d.Schema) > 0 {
		p("\n#### Schema changes\n\n| column | change | %s | %s |\n|---|---|---|---|\n", d.wantName(), d.gotName())
		for _, s := range d.Schema {
			p("| %s | %s | %s | %s |\n", mdCode(s.Column), d.describeChange(s.Change), mdCode(s.Want), mdCode(s.Got))
		}
	}
	if d.CellsDiffering > 0 {
		p("\n#### Differing cells (%d%s)\n\n", d.CellsDiffering, mdShown(len(d.Cells), d.CellsDiffering))
		keyed := d.Match == MatchByKey && len(d.Keys) > 0
		head := []string{"row"}
		if keyed {
			head = nil
			for _, k := range d.Keys {
				head = append(head, mdCode(k))
			}
		}
		head = append(head, "column", d.wantName(), d.gotName(), "Δabs", "Δrel")
		p("| %s |\n|%s\n", strings.Join(head, " | "), strings.Repeat("---|", len(head)))
		var edits []string
		for _, c := range d.Cells {
			var cells []string
			if keyed {
				for _, k := range c.Row.Key {
					cells = append(cells, mdCode(k))
				}
			} else {
				cells = append(cells, d.rowIndex(c.Row))
			}
			abs, rel := "", ""
			if c.Delta.Has {
				abs = formatAbs(c.Delta.Abs, c.Want.Kind)
				if !isTimeKind(c.Want.Kind) && !isTimeKind(c.Got.Kind) {
					rel = formatRel(c.Delta.Rel)
				}
			}
			cells = append(cells, mdCode(c.Column), mdCode(c.Want.Text), mdCode(c.Got.Text), abs, rel)
			p("| %s |\n", strings.Join(cells, " | "))
			if c.Want.Kind.IsText() && c.Got.Kind.IsText() && !c.Want.Null && !c.Got.Null {
				ws, _ := c.Want.Value.(string)
				gs, _ := c.Got.Value.(string)
				if e, ok := textEdit(ws, gs, editStyle{}); ok {
					edits = append(edits, fmt.Sprintf("- %s, %s: %s", d.rowName(c.Row), mdCode(c.Column), mdCode(e)))
				}
			}
		}
		if len(edits) > 0 {
			p("\nText edits (⟦%s→%s⟧):\n\n%s\n", d.wantName(), d.gotName(), strings.Join(edits, "\n"))
		}
	}
	mdRows := func(title string, l RowList, cols []string) {
		if l.Count == 0 {
			return
		}
		p("\n#### %s (%d%s)\n\n| row | %s |\n|--:|%s\n", title, l.Count, mdShown(len(l.Rows), l.Count), mdJoin(cols), strings.Repeat("---|", len(cols)))
		for _, r := range l.Rows {
			idx := r.Want
			if idx < 0 {
				idx = r.Got
			}
			p("| %d | %s |\n", idx, mdJoin(r.Cells))
		}
	}
	mdRows("Missing rows: in "+d.wantName()+", not in "+d.gotName(), d.Missing, d.WantColumns)
	mdRows("Extra rows: in "+d.gotName()+", not in "+d.wantName(), d.Extra, d.GotColumns)
	if n := d.Duplicates.WantKeys + d.Duplicates.GotKeys; n > 0 {
		p("\n#### Repeated keys (%s %d, %s %d%s)\n\n| side | key | rows | at rows |\n|---|---|--:|---|\n", d.wantName(), d.Duplicates.WantKeys, d.gotName(), d.Duplicates.GotKeys, mdShown(len(d.Duplicates.Keys), n))
		for _, k := range d.Duplicates.Keys {
			at := make([]string, len(k.Rows))
			for i, r := range k.Rows {
				at[i] = strconv.Itoa(r)
			}
			p("| %s | %s | %d | %s |\n", d.sideName(k.Side), mdCode("("+strings.Join(k.Key, ", ")+")"), k.Count, strings.Join(at, ", "))
		}
	}
	if cols := d.notableColumns(); len(cols) > 0 {
		p("\n#### Columns\n\n| column | compared | differing | max Δabs | max Δrel |\n|---|---|--:|--:|--:|\n")
		for _, c := range cols {
			abs, rel := "", ""
			if c.HasDelta && c.MaxAbsAt.Want >= 0 {
				abs = formatAbs(c.MaxAbs, c.WantType.Kind()) + " at " + mdEscape(d.rowName(c.MaxAbsAt))
				if !isTimeKind(c.WantType.Kind()) && !isTimeKind(c.GotType.Kind()) && c.MaxRelAt.Want >= 0 {
					rel = formatRel(c.MaxRel) + " at " + mdEscape(d.rowName(c.MaxRelAt))
				}
			}
			p("| %s | %s | %d | %s | %s |\n", mdCode(c.Name), mdEscape(c.Rule), c.Differing, abs, rel)
		}
	}
	return b.String()
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

// mdEscape escapes text that is not in a code span.
func mdEscape(s string) string {
	r := strings.NewReplacer("|", `\|`, "*", `\*`, "_", `\_`, "`", "\\`", "<", "&lt;", ">", "&gt;", "[", `\[`, "]", `\]`, "\n", " ")
	return r.Replace(s)
}

func mdJoin(cells []string) string {
	out := make([]string, len(cells))
	for i, c := range cells {
		out[i] = mdCode(c)
	}
	return strings.Join(out, " | ")
}
