package assert

import (
	"bufio"
	"bytes"
	"fmt"
	"io"
	"math"
	"os"
	"strconv"
	"strings"
	"time"

	"golang.org/x/term"

	"github.com/proofsheet/proofsheet/fixtures"
	"github.com/proofsheet/proofsheet/internal/printable"
	"github.com/proofsheet/proofsheet/internal/textwidth"
)

// TextStyle controls how TextWith writes a Diff.
type TextStyle struct {
	// Color marks headings, want values and got values with ANSI colours.
	// Decide it in the caller: see UseColor.
	Color bool
	// Width is the widest line aimed at, in terminal columns (default 100).
	// Long cells are cut with "…" to fit; the JSON and the Diff's fields
	// keep them whole.
	Width int
	// Flags names the fixes of hints as proofsheet command-line flags
	// (--any-row-order) instead of Go options (AnyRowOrder()).
	Flags bool
}

// ANSI escape sequences of the colour style.
const (
	ansiReset   = "\x1b[0m"
	ansiBold    = "\x1b[1m"
	ansiWant    = "\x1b[35m" // magenta
	ansiGot     = "\x1b[36m" // cyan
	ansiProblem = "\x1b[1;33m"
)

// Text writes the Diff as a plain-text report for a test failure or a
// terminal: a summary line, then problems, schema changes, differing cells
// (keys first, then want, got and their distance, with a character edit
// for text), missing and extra rows, repeated keys and per-column
// summaries. Lines fit in 100 columns. An equal Diff writes one line.
func (d *Diff) Text() string { return d.TextWith(TextStyle{}) }

// TextWith is Text in the given style.
func (d *Diff) TextWith(st TextStyle) string {
	var b strings.Builder
	_ = d.WriteText(&b, st) // a strings.Builder does not fail
	return b.String()
}

// WriteText writes what TextWith returns to w as it goes, so that a
// listing of millions of cells (ListLimit(-1)) needs little memory. A
// listing longer than textBlock rows is laid out in blocks of that many
// rows: the columns of a block are as wide as those of the blocks before,
// or wider when its cells need it. It returns the first error of w.
func (d *Diff) WriteText(w io.Writer, st TextStyle) error {
	if d == nil {
		d = &Diff{}
	}
	if st.Width <= 0 {
		st.Width = 100
	}
	tw := &textWriter{st: st, out: renderBuffer(w)}
	for i, l := range wrap(d.headline(), st.Width, 4) {
		if i == 0 {
			l = tw.bold(l)
		}
		tw.line(l)
	}
	for _, l := range wrap(d.matchLine(), st.Width, 4) {
		tw.line(l)
	}
	if len(d.Problems) > 0 {
		tw.section("problems")
		for _, p := range d.Problems {
			for i, l := range wrap(p, st.Width-4, 0) {
				mark := "    "
				if i == 0 {
					mark = "  " + tw.paint(ansiProblem, "!") + " "
				}
				tw.line(mark + l)
			}
		}
	}
	if len(d.Hints) > 0 {
		tw.hints(d)
	}
	if len(d.Schema) > 0 {
		tw.section(fmt.Sprintf("schema changes (%d)", len(d.Schema)))
		rows := [][]string{{"column", "change", d.wantName(), d.gotName()}}
		for _, s := range d.Schema {
			rows = append(rows, []string{printable.Name(s.Column), d.describeChange(s.Change), s.Want, s.Got})
		}
		tw.table(rows, nil, map[int]string{2: ansiWant, 3: ansiGot})
	}
	if d.CellsDiffering > 0 {
		tw.cells(d)
	}
	tw.rowList(d, "missing rows", "in "+d.wantName()+", not in "+d.gotName(), d.Missing, d.WantColumns, ansiWant)
	tw.rowList(d, "extra rows", "in "+d.gotName()+", not in "+d.wantName(), d.Extra, d.GotColumns, ansiGot)
	if n := d.Duplicates.WantKeys + d.Duplicates.GotKeys; n > 0 {
		tw.section(fmt.Sprintf("repeated keys (%s %d, %s %d)%s", d.wantName(), d.Duplicates.WantKeys, d.gotName(), d.Duplicates.GotKeys, shown(len(d.Duplicates.Keys), n)))
		rows := [][]string{{"side", "key", "rows", "at rows"}}
		for _, k := range d.Duplicates.Keys {
			at := make([]string, len(k.Rows))
			for i, r := range k.Rows {
				at[i] = rowNumber(r)
			}
			more := ""
			if len(k.Rows) < k.Count {
				more = ", …"
			}
			rows = append(rows, []string{d.sideName(k.Side), "(" + strings.Join(k.Key, ", ") + ")", strconv.Itoa(k.Count), strings.Join(at, ", ") + more})
		}
		tw.table(rows, map[int]bool{2: true}, nil, 1)
	}
	if cols := d.notableColumns(); len(cols) > 0 {
		tw.section("columns")
		rows := [][]string{{"column", "how compared", "cells differ", "max abs. diff", "max rel. diff", "where max"}}
		for _, c := range cols {
			row := []string{printable.Name(c.Name), c.Rule, strconv.Itoa(c.Differing), "", "", ""}
			if c.HasDelta && c.MaxAbsAt.Want >= 0 {
				row[3], row[5] = formatAbs(c.MaxAbs, c.WantType.Kind()), d.rowName(c.MaxAbsAt)
				if !isTimeKind(c.WantType.Kind()) && !isTimeKind(c.GotType.Kind()) && c.MaxRelAt.Want >= 0 {
					row[4] = formatRel(c.MaxRel)
					if at := d.rowName(c.MaxRelAt); at != row[5] {
						row[5] = "abs. " + row[5] + ", rel. " + at
					}
				}
			}
			rows = append(rows, row)
		}
		t := tw.newTable(rows[0], map[int]bool{2: true, 3: true, 4: true}, nil)
		t.keepWhole(5)
		t.below = true
		for _, r := range rows[1:] {
			t.add(r, "")
		}
		t.end()
	}
	return tw.out.Flush()
}

// headline is the first line: equal, or how many of what differ.
func (d *Diff) headline() string {
	if d.Equal() {
		return fmt.Sprintf("tables are equal (%s, %s compared)", plural(d.WantRows, "row", "rows"), plural(len(d.Compared), "column", "columns"))
	}
	var parts []string
	add := func(n int, one, many string) {
		if n == 1 {
			parts = append(parts, "1 "+one)
		} else if n > 1 {
			parts = append(parts, strconv.Itoa(n)+" "+many)
		}
	}
	add(len(d.Problems), "problem", "problems")
	add(len(d.Schema), "schema change", "schema changes")
	if d.CellsDiffering > 0 {
		rows := "rows"
		if d.RowsDiffering == 1 {
			rows = "row"
		}
		add(d.CellsDiffering, fmt.Sprintf("differing cell in %d %s", d.RowsDiffering, rows), fmt.Sprintf("differing cells in %d %s", d.RowsDiffering, rows))
	}
	add(d.Missing.Count, "missing row", "missing rows")
	add(d.Extra.Count, "extra row", "extra rows")
	add(d.Duplicates.WantKeys+d.Duplicates.GotKeys, "repeated key", "repeated keys")
	return "tables differ: " + strings.Join(parts, ", ")
}

// matchLine says how big the tables are and how rows were paired.
func (d *Diff) matchLine() string {
	how := "rows paired by position"
	switch d.Match {
	case MatchByKey:
		how = "rows matched by key (" + strings.Join(shownNames(d.Keys), ", ") + ")"
	case MatchAsMultiset:
		how = "rows matched in any order"
	}
	return d.sizeLine() + how
}

// sizeLine is the start of matchLine: "want 3 rows, got 4 rows; ".
func (d *Diff) sizeLine() string {
	return fmt.Sprintf("%s %s, %s %s; ", d.wantName(), plural(d.WantRows, "row", "rows"), d.gotName(), plural(d.GotRows, "row", "rows"))
}

func (d *Diff) describeChange(c ChangeKind) string {
	switch c {
	case ColumnMissing:
		return "missing from " + d.gotName()
	case ColumnExtra:
		return "extra in " + d.gotName()
	case TypeChanged:
		return "type changed"
	case LevelsAdded:
		return "levels added"
	case LevelsRemoved:
		return "levels removed"
	case ColumnMoved:
		return "moved"
	}
	return string(c)
}

// shown says how much of a listing is shown, when it is cut.
func shown(listed, total int) string {
	if listed < total {
		return fmt.Sprintf(", first %d shown", listed)
	}
	return ""
}

// rowNumber writes a 0-based row index as the row number every report
// shows: rows count from 1, the first data row under the header, as the
// LoadReport and the literal table's line numbers do.
func rowNumber(i int) string { return strconv.Itoa(i + 1) }

// rowName names a row for a reader: its key cells, or its index.
func (d *Diff) rowName(r RowRef) string {
	if len(r.Key) > 0 {
		return "(" + strings.Join(r.Key, ", ") + ")"
	}
	if r.Want >= 0 && r.Got >= 0 && r.Want != r.Got {
		return "row " + rowNumber(r.Want) + "→" + rowNumber(r.Got)
	}
	if r.Want >= 0 {
		return "row " + rowNumber(r.Want)
	}
	return "row " + rowNumber(r.Got)
}

// notableColumns are the summaries worth a line: columns with differing
// cells, or compared under a tolerance and off by something.
func (d *Diff) notableColumns() []ColumnSummary {
	var out []ColumnSummary
	for _, c := range d.Columns {
		if c.Differing > 0 || (c.HasDelta && c.MaxAbs > 0 && c.Rule != "exact") {
			out = append(out, c)
		}
	}
	return out
}

func isTimeKind(k fixtures.Kind) bool { return k == fixtures.KindDate || k == fixtures.KindTimestamp }

// formatAbs writes an absolute delta: a duration for times, else three
// significant digits.
func formatAbs(v float64, k fixtures.Kind) string {
	if isTimeKind(k) && v < 9e9 {
		return time.Duration(math.Round(v * 1e9)).String()
	}
	return formatSig(v)
}

func formatRel(v float64) string { return formatSig(v) }

func formatSig(v float64) string {
	switch {
	case math.IsInf(v, 1):
		return "+Inf"
	case math.IsNaN(v):
		return "NaN"
	case v == 0:
		return "0"
	}
	return strconv.FormatFloat(v, 'g', 3, 64)
}

// cells writes the listing of differing cells.
func (w *textWriter) cells(d *Diff) {
	w.section(fmt.Sprintf("differing cells (%d)%s", d.CellsDiffering, shown(d.Cells.Len(), d.CellsDiffering)))
	head := []string{}
	keyed := d.Match == MatchByKey && len(d.Keys) > 0
	if keyed {
		for _, k := range d.Keys {
			head = append(head, printable.Name(k))
		}
	} else {
		head = append(head, "row")
	}
	nk := len(head)
	head = append(head, "column", d.wantName(), d.gotName(), "abs. diff", "rel. diff")
	right := map[int]bool{nk + 3: true, nk + 4: true}
	if !keyed {
		right[0] = true
	}
	t := w.newTable(head, right, map[int]string{nk + 1: ansiWant, nk + 2: ansiGot})
	if keyed {
		for j := range nk {
			t.keepWhole(j)
		}
	}
	st := editStyle{}
	if w.st.Color {
		st = editStyle{want: ansiWant, got: ansiGot, reset: ansiReset}
	}
	eachCell(d.Cells, func(_ int, c *CellDiff) bool {
		row := make([]string, 0, nk+5)
		if keyed {
			row = append(row, c.Row.Key...)
		} else {
			row = append(row, d.rowIndex(c.Row))
		}
		abs, rel := "", ""
		if c.Delta.Has {
			abs = formatAbs(c.Delta.Abs, c.Want.Kind)
			if c.Delta.HasULPs {
				abs += " (" + strconv.FormatUint(c.Delta.ULPs, 10) + " ulp)"
			}
			if !isTimeKind(c.Want.Kind) && !isTimeKind(c.Got.Kind) {
				rel = formatRel(c.Delta.Rel)
			}
		}
		row = append(row, printable.Name(c.Column), c.Want.Text, c.Got.Text, abs, rel)
		edit := ""
		if ws, gs, ok := textPair(c); ok {
			if e, ok := textEdit(ws, gs, st); ok {
				edit = "edit: " + e
			}
		}
		t.add(row, edit)
		return true
	})
	t.end()
}

// textPair returns the texts of a pair of non-null text cells.
func textPair(c *CellDiff) (want, got string, ok bool) {
	want, okW := rawText(c.Want)
	got, okG := rawText(c.Got)
	return want, got, okW && okG
}

// rawText returns the text of a non-null string or category cell: its
// Value, or else its literal spelling unquoted.
func rawText(c Cell) (string, bool) {
	if !c.Kind.IsText() || c.Null {
		return "", false
	}
	if s, ok := c.Value.(string); ok {
		return s, true
	}
	if strings.HasPrefix(c.Text, `"`) {
		if s, err := strconv.Unquote(c.Text); err == nil {
			return s, true
		}
	}
	return c.Text, true
}

func (d *Diff) rowIndex(r RowRef) string {
	if r.Want != r.Got && r.Got >= 0 {
		return rowNumber(r.Want) + "→" + rowNumber(r.Got)
	}
	return rowNumber(r.Want)
}

// hints writes the hints, each with its fix, and near matches side by
// side.
func (w *textWriter) hints(d *Diff) {
	w.section(plural(len(d.Hints), "hint", "hints"))
	for _, h := range d.Hints {
		for i, l := range wrap(h.Text, w.st.Width-4, 0) {
			mark := "    "
			if i == 0 {
				mark = "  → "
			}
			w.line(mark + l)
		}
		fix := h.Option
		if w.st.Flags {
			fix = h.Flag
		}
		if fix != "" {
			for _, l := range wrap("fix: "+fix, w.st.Width-4, 5) {
				w.line("    " + l)
			}
		}
		// Each pair side by side on one line, or, when the keys are too
		// long for that, one above the other; never cut.
		for _, p := range h.Pairs {
			mk, ek, why := d.rowName(p.Missing), d.rowName(p.Extra), "differs by "+strings.Join(p.Why, ", ")
			line := "    " + w.paint(ansiWant, mk) + "  ⇄  " + w.paint(ansiGot, ek) + "  " + why
			if textwidth.Width(mk)+textwidth.Width(ek)+textwidth.Width(why)+13 <= w.st.Width {
				w.line(line)
				continue
			}
			wn, gn := d.wantName()+":", d.gotName()+":"
			pad := max(textwidth.Width(wn), textwidth.Width(gn))
			w.line("    " + textwidth.PadRight(wn, pad) + " " + w.paint(ansiWant, mk))
			w.line("    " + textwidth.PadRight(gn, pad) + " " + w.paint(ansiGot, ek) + "  " + why)
		}
		if h.Count > len(h.Pairs) {
			w.line(fmt.Sprintf("    … %d more", h.Count-len(h.Pairs)))
		}
	}
}

// rowList writes missing or extra rows as a small table of their cells.
// With keys, the key columns come first and are never cut.
func (w *textWriter) rowList(d *Diff, title, note string, l RowList, cols []string, colour string) {
	if l.Count == 0 {
		return
	}
	w.section(fmt.Sprintf("%s (%d, %s)%s", title, l.Count, note, shown(l.Rows.Len(), l.Count)))
	order := keysFirst(d, cols)
	head := []string{"row"}
	paint := map[int]string{}
	for k, j := range order {
		head = append(head, printable.Name(cols[j]))
		paint[k+1] = colour
	}
	t := w.newTable(head, map[int]bool{0: true}, paint)
	if d.Match == MatchByKey {
		for k := range d.Keys {
			t.keepWhole(k + 1)
		}
	}
	for _, r := range l.Rows.All() {
		idx := r.Want
		if idx < 0 {
			idx = r.Got
		}
		row := []string{rowNumber(idx)}
		for _, j := range order {
			if j < len(r.Cells) {
				row = append(row, r.Cells[j])
			} else {
				row = append(row, "")
			}
		}
		t.add(row, "")
	}
	t.end()
}

// keysFirst returns the order in which to show the columns cols: the key
// columns first (rows matched by key), then the others in their order.
func keysFirst(d *Diff, cols []string) []int {
	var order []int
	isKey := map[int]bool{}
	if d.Match == MatchByKey {
		for _, k := range d.Keys {
			for j, c := range cols {
				if c == k && !isKey[j] {
					order = append(order, j)
					isKey[j] = true
					break
				}
			}
		}
	}
	for j := range cols {
		if !isKey[j] {
			order = append(order, j)
		}
	}
	return order
}

// textWriter writes the text report. Empty lines are held back until a
// line with text follows, so the report never ends with one.
type textWriter struct {
	st    TextStyle
	out   *bufio.Writer
	blank int
}

func (w *textWriter) line(s string) {
	if s == "" {
		w.blank++
		return
	}
	for ; w.blank > 0; w.blank-- {
		w.out.WriteByte('\n')
	}
	w.out.WriteString(s)
	w.out.WriteByte('\n')
}

// lineBytes writes prefix and then b as one line, as line does.
func (w *textWriter) lineBytes(prefix string, b []byte) {
	if prefix == "" && len(b) == 0 {
		w.blank++
		return
	}
	for ; w.blank > 0; w.blank-- {
		w.out.WriteByte('\n')
	}
	w.out.WriteString(prefix)
	w.out.Write(b)
	w.out.WriteByte('\n')
}

func (w *textWriter) section(title string) {
	w.line("")
	w.line(w.bold(title))
}

func (w *textWriter) bold(s string) string { return w.paint(ansiBold, s) }

func (w *textWriter) paint(code, s string) string {
	if !w.st.Color || s == "" {
		return s
	}
	return code + s + ansiReset
}

// table writes rows (the first is the header) as one aligned table;
// whole names columns whose cells are never cut (keys).
func (w *textWriter) table(rows [][]string, right map[int]bool, paint map[int]string, whole ...int) {
	if len(rows) == 0 {
		return
	}
	t := w.newTable(rows[0], right, paint)
	t.keepWhole(whole...)
	for _, r := range rows[1:] {
		t.add(r, "")
	}
	t.end()
}

// textBlock is how many rows of a table are laid out together.
const textBlock = 4096

// textTable writes rows as aligned columns two spaces apart, indented by
// two, cutting the widest columns until the lines fit the width. Columns
// named by keepWhole (keys) are never cut: when they do not fit beside
// the others at their full width, they leave the table and each of their
// cells is written on a line of its own under its row. Rows are laid out
// in blocks of textBlock: the first block (with the header) decides which
// columns are shown; later blocks keep the columns at least as wide as
// before.
type textTable struct {
	w       *textWriter
	head    []string
	right   map[int]bool
	paint   map[int]string
	whole   map[int]bool
	label   map[int]string // names of moved-out columns, when not their header
	below   bool           // moved-out cells go below their row, one a line (else above it, on one line)
	rows    [][]string
	after   []string
	ncol    int
	vis     []int // the columns in the table, in order; nil until the first block is written
	widths  []int // the width of each of vis, then of the "…+N" column when columns are left out
	moved   []int // whole columns written on lines of their own
	more    string
	leftOut bool
	// Per column of vis: right-aligned, colour, never cut; and the
	// buffer lines are made in.
	kRight []bool
	kPaint []string
	kWhole []bool
	buf    []byte
}

func (w *textWriter) newTable(head []string, right map[int]bool, paint map[int]string) *textTable {
	return &textTable{w: w, head: head, right: right, paint: paint, whole: map[int]bool{}}
}

// keepWhole names columns whose cells are never cut.
func (t *textTable) keepWhole(cols ...int) {
	for _, j := range cols {
		t.whole[j] = true
	}
}

// add adds a body row; after, when not empty, is a line written below it,
// indented to the second column.
func (t *textTable) add(row []string, after string) {
	t.rows = append(t.rows, row)
	t.after = append(t.after, after)
	if len(t.rows) == textBlock {
		t.flush()
	}
}

// end writes the rows not yet written (and the header of an empty table).
func (t *textTable) end() {
	if len(t.rows) > 0 || t.vis == nil {
		t.flush()
	}
}

func (t *textTable) flush() {
	w := t.w
	total := w.st.Width - 2
	first := t.vis == nil
	if first {
		t.ncol = len(t.head)
		for _, r := range t.rows {
			t.ncol = max(t.ncol, len(r))
		}
		natural := naturalWidths(t.ncol, t.head, t.rows)
		all := make([]int, t.ncol)
		for j := range all {
			all[j] = j
		}
		t.vis = all
		t.widths = pickWidths(natural, t.vis)
		if !fitWidths(t.widths, total, t.wholeOf(t.vis)) && len(t.whole) > 0 {
			// The keys do not fit whole beside the other columns: give
			// them lines of their own.
			t.vis = nil
			for _, j := range all {
				if t.whole[j] {
					t.moved = append(t.moved, j)
				} else {
					t.vis = append(t.vis, j)
				}
			}
			t.widths = pickWidths(natural, t.vis)
			if !t.below {
				total -= 2 // the rows stand indented under their keys
			}
		}
		if len(t.vis) > 0 && !fitWidths(t.widths, total, t.wholeOf(t.vis)) {
			// Too many columns even when narrowed: keep those that fit at
			// their own width (at most 24) and end each row with a column
			// saying how many are left out.
			for k, j := range t.vis {
				t.widths[k] = min(natural[j], 24)
			}
			keep, used := 0, 0
			for keep < len(t.vis) && used+t.widths[keep]+2+len("…+999") <= total {
				used += t.widths[keep] + 2
				keep++
			}
			keep = max(keep, 1)
			t.more = fmt.Sprintf("…+%d", len(t.vis)-keep)
			t.vis, t.widths, t.leftOut = t.vis[:keep], append(t.widths[:keep], textwidth.Width(t.more)), true
		}
	} else if !t.leftOut {
		if len(t.moved) > 0 && !t.below {
			total -= 2
		}
		natural := naturalWidths(t.ncol, nil, t.rows)
		for k, j := range t.vis {
			t.widths[k] = max(t.widths[k], natural[j])
		}
		fitWidths(t.widths, total, t.wholeOf(t.vis))
	}
	if first {
		t.writeRow(t.head, true)
	}
	for i, r := range t.rows {
		t.writeRow(r, false)
		if after := t.after[i]; after != "" {
			line := strings.Repeat(" ", 2+t.widths[0]+2) + after
			if !w.st.Color {
				line = textwidth.Truncate(line, w.st.Width)
			}
			w.line(line)
		}
	}
	t.rows, t.after = t.rows[:0], t.after[:0]
}

// wholeOf marks which of the columns cols are never cut.
func (t *textTable) wholeOf(cols []int) []bool {
	out := make([]bool, len(cols))
	for k, j := range cols {
		out[k] = t.whole[j]
	}
	return out
}

func pickWidths(natural, cols []int) []int {
	out := make([]int, len(cols))
	for k, j := range cols {
		out[k] = natural[j]
	}
	return out
}

// naturalWidths returns the widest cell of each of n columns.
func naturalWidths(n int, head []string, rows [][]string) []int {
	widths := make([]int, n)
	for j, s := range head {
		widths[j] = textwidth.Width(s)
	}
	for _, r := range rows {
		for j, s := range r {
			widths[j] = max(widths[j], textwidth.Width(s))
		}
	}
	return widths
}

// writeRow writes one line of the table, then the row's moved-out cells
// (keys) on lines of their own, whole. The line is put together in a
// buffer the table reuses, so a long listing costs no allocation a row.
func (t *textTable) writeRow(r []string, head bool) {
	w := t.w
	cell := func(j int) string {
		if j < len(r) {
			return r[j]
		}
		return ""
	}
	if len(t.kRight) != len(t.vis) {
		t.kRight, t.kPaint, t.kWhole = make([]bool, len(t.vis)), make([]string, len(t.vis)), make([]bool, len(t.vis))
		for k, j := range t.vis {
			t.kRight[k], t.kPaint[k], t.kWhole[k] = t.right[j], t.paint[j], t.whole[j]
		}
	}
	n := len(t.widths)
	b := append(t.buf[:0], "  "...)
	for k := 0; k < n; k++ {
		var s string
		right, paint := false, ""
		switch {
		case k < len(t.vis):
			s, right, paint = cell(t.vis[k]), t.kRight[k], t.kPaint[k]
			if !t.kWhole[k] {
				s = textwidth.Truncate(s, t.widths[k])
			}
		case head:
			s = t.more
		default:
			s = "…"
		}
		pad := max(t.widths[k]-textwidth.Width(s), 0)
		if k == n-1 && !right {
			pad = 0
		}
		code := ""
		switch {
		case !w.st.Color || (s == "" && pad == 0):
		case head:
			code = ansiBold
		default:
			code = paint
		}
		b = append(b, code...)
		if right {
			b = appendSpaces(b, pad)
		}
		b = append(b, s...)
		if !right {
			b = appendSpaces(b, pad)
		}
		if code != "" {
			b = append(b, ansiReset...)
		}
		if k < n-1 {
			b = append(b, "  "...)
		}
	}
	t.buf = b
	var moved []string
	if !head {
		for _, j := range t.moved {
			s := cell(j)
			if s == "" {
				continue
			}
			name := t.head[j]
			if l, ok := t.label[j]; ok {
				name = l
			}
			moved = append(moved, name+": "+w.paint(t.paint[j], s))
		}
	}
	// A moved cell is written on one line however long: a key is never
	// cut, nor broken.
	if !t.below && len(moved) > 0 {
		w.line("  " + strings.Join(moved, "  "))
	}
	if n > 0 {
		prefix := ""
		if !t.below && len(t.moved) > 0 && !head {
			prefix = "  " // the row's cells stand under its key
		}
		w.lineBytes(prefix, bytes.TrimRight(b, " "))
	}
	if t.below {
		for _, m := range moved {
			w.line("    " + m)
		}
	}
}

const spaces = "                                                                "

// appendSpaces appends n spaces to b.
func appendSpaces(b []byte, n int) []byte {
	for n > len(spaces) {
		b = append(b, spaces...)
		n -= len(spaces)
	}
	return append(b, spaces[:n]...)
}

// fitWidths narrows the widest columns that may be cut (whole[k] false)
// until the columns, two spaces apart, fit in total; no column goes below
// 6 unless it already was. It reports whether they fit.
func fitWidths(widths []int, total int, whole []bool) bool {
	sum := func() int {
		n := 0
		for _, x := range widths {
			n += x
		}
		return n + 2*(len(widths)-1)
	}
	for sum() > total {
		wi := -1
		for k, x := range widths {
			if (whole == nil || k >= len(whole) || !whole[k]) && (wi < 0 || x > widths[wi]) {
				wi = k
			}
		}
		if wi < 0 || widths[wi] <= 6 {
			return false
		}
		widths[wi]--
	}
	return true
}

// UseColor reports whether text written to f should be coloured: f is a
// terminal (golang.org/x/term; a character device such as /dev/null is
// not) and the NO_COLOR environment variable is unset or empty (the
// convention of no-color.org). Pass the answer as TextStyle.Color.
func UseColor(f *os.File) bool {
	if f == nil || os.Getenv("NO_COLOR") != "" {
		return false
	}
	return term.IsTerminal(int(f.Fd()))
}

// wrap breaks s at spaces into lines of at most width columns; lines after
// the first are indented. A word longer than a line stays whole.
func wrap(s string, width, indent int) []string { return textwidth.Wrap(s, width, indent) }
