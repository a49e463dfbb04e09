package golden

import (
	"bufio"
	"crypto/sha256"
	"encoding/base64"
	"encoding/json"
	"fmt"
	"html"
	"io"
	"math"
	"slices"
	"strconv"
	"strings"

	"github.com/proofsheet/proofsheet/assert"
	"github.com/proofsheet/proofsheet/internal/printable"
	"github.com/proofsheet/proofsheet/internal/textwidth"
)

// defaultReviewTitle heads a Review without a Title.
const defaultReviewTitle = "Golden file review"

func (r *Review) title() string {
	if r.Title != "" {
		return r.Title
	}
	return defaultReviewTitle
}

// Summary says in a few words what changed in the file: "3 differing
// cells in 2 rows, 1 extra row; max abs. diff 0.5 (tmax)", "+2 −1 lines",
// "new table, 120 rows × 5 columns".
func (f FileReview) Summary() string {
	if len(f.Problems) > 0 {
		return "cannot be read: " + textwidth.Truncate(firstLine(f.Problems[0]), 90)
	}
	what := map[FileKind]string{KindTable: "table", KindText: "text file", KindJSON: "JSON file"}[f.Kind]
	switch f.Status {
	case ReviewNew, ReviewRemoved:
		n := max(f.NewRows, f.OldRows)
		switch {
		case f.Kind == KindTable && n >= 0:
			return fmt.Sprintf("%s %s, %s × %s", f.Status, what, plural(n, "row", "rows"), plural(len(f.Columns), "column", "columns"))
		case n >= 0:
			return fmt.Sprintf("%s %s, %s", f.Status, what, plural(n, "line", "lines"))
		case f.Detail != "":
			return fmt.Sprintf("%s %s (not written: %s)", f.Status, what, textwidth.Truncate(firstLine(f.Detail), 60))
		}
		return string(f.Status) + " " + what
	}
	switch f.Kind {
	case KindTable:
		return tableSummary(&f)
	case KindJSON:
		if f.Status == ReviewUnchanged {
			return "the same JSON, spaced or ordered differently"
		}
		if f.PathCount == 0 && f.Detail != "" {
			return "differs: " + textwidth.Truncate(firstLine(f.Detail), 80)
		}
		return plural(f.PathCount, "JSON path differs", "JSON paths differ")
	}
	if f.Status == ReviewUnchanged {
		return "the same text"
	}
	if f.Added+f.Removed == 0 && f.Detail != "" {
		return "differs: " + textwidth.Truncate(firstLine(f.Detail), 80)
	}
	return fmt.Sprintf("+%d −%d lines", f.Added, f.Removed)
}

func tableSummary(f *FileReview) string {
	d := f.Diff
	if d == nil {
		if f.Detail != "" {
			return "differs: " + textwidth.Truncate(firstLine(f.Detail), 80)
		}
		return "rewritten"
	}
	var parts []string
	add := func(n int, one, many string) {
		if n > 0 {
			parts = append(parts, plural(n, one, many))
		}
	}
	add(len(d.Problems), "problem", "problems")
	add(len(d.Schema), "schema change", "schema changes")
	if d.CellsDiffering > 0 {
		parts = append(parts, plural(d.CellsDiffering, "differing cell", "differing cells")+" in "+plural(d.RowsDiffering, "row", "rows"))
	}
	add(d.Missing.Count, "missing row", "missing rows")
	add(d.Extra.Count, "extra row", "extra rows")
	add(d.Duplicates.WantKeys+d.Duplicates.GotKeys, "repeated key", "repeated keys")
	if !slices.Equal(f.OldKeys, f.NewKeys) && f.OldRows >= 0 && f.NewRows >= 0 {
		parts = append(parts, "keys "+keyList(f.OldKeys)+" → "+keyList(f.NewKeys))
	}
	if f.RulesChange != "" {
		parts = append(parts, "stored rules changed")
	}
	s := strings.Join(parts, ", ")
	if f.Status == ReviewUnchanged {
		s = "equal within tolerance"
	}
	if c, ok := largestDelta(d); ok {
		s += fmt.Sprintf("; max abs. diff %s (%s)", formatDelta(c.MaxAbs), printable.Name(c.Name))
	}
	return s
}

// largestDelta returns the column summary with the largest absolute delta
// of a number column, when any is above zero.
func largestDelta(d *assert.Diff) (assert.ColumnSummary, bool) {
	var best assert.ColumnSummary
	found := false
	for _, c := range d.Columns {
		if !c.HasDelta || !c.WantType.Kind().IsNumeric() || !(c.MaxAbs > 0) {
			continue
		}
		if !found || c.MaxAbs > best.MaxAbs {
			best, found = c, true
		}
	}
	return best, found
}

func formatDelta(v float64) string {
	if math.IsInf(v, 0) {
		return "+Inf"
	}
	return strconv.FormatFloat(v, 'g', 3, 64)
}

func keyList(keys []string) string {
	if len(keys) == 0 {
		return "none"
	}
	out := make([]string, len(keys))
	for i, k := range keys {
		out[i] = printable.Name(k)
	}
	return strings.Join(out, ", ")
}

func plural(n int, one, many string) string {
	if n == 1 {
		return "1 " + one
	}
	return strconv.Itoa(n) + " " + many
}

func firstLine(s string) string {
	s, _, _ = strings.Cut(strings.TrimSpace(s), "\n")
	return s
}

// Rows writes the row (or line) counts of the two versions: "120 → 121",
// "— → 120" for a new file, "120" when they agree.
func (f FileReview) Rows() string {
	n := func(v int) string {
		if v < 0 {
			return "—"
		}
		return strconv.Itoa(v)
	}
	if f.OldRows == f.NewRows && f.OldRows >= 0 {
		return n(f.OldRows)
	}
	return n(f.OldRows) + " → " + n(f.NewRows)
}

// markdownBudget is the size a Markdown review aims to stay under, so it
// fits a pull-request comment (common limits are 64 KiB).
const markdownBudget = 60000

// Markdown writes the review for a pull-request comment or a CI job
// summary: a heading, the headline, a table of the files (status, kind,
// rows, what changed), then a section per changed file with its table
// diff (assert's Markdown), line diff or JSON paths. It stays under about
// 60 000 bytes: sections that do not fit are left out and counted.
func (r *Review) Markdown() string {
	var b strings.Builder
	p := func(format string, args ...any) { fmt.Fprintf(&b, format, args...) }
	p("## %s\n\n**%s**", mdText(r.title()), mdText(capitalise(r.Headline())))
	if r.Against != "" {
		p(" — against %s", mdSpan(r.Against))
	}
	p("\n")
	if len(r.Files) == 0 {
		return b.String()
	}
	p("\n| file | status | kind | rows | what changed |\n|---|---|---|--:|---|\n")
	for i, f := range r.Files {
		if i == 200 {
			p("| … %d more files | | | | |\n", len(r.Files)-i)
			break
		}
		status := f.Status.Label()
		if f.Status != ReviewUnchanged {
			status = "**" + status + "**"
		}
		p("| %s | %s | %s | %s | %s |\n", mdSpan(printable.Name(f.Path)), status, f.Kind, f.Rows(), mdText(f.Summary()))
	}
	left := 0
	for _, f := range r.Files {
		sec := mdSection(&f)
		if sec == "" {
			continue
		}
		if b.Len()+len(sec) > markdownBudget {
			left++
			continue
		}
		b.WriteString(sec)
	}
	if left > 0 {
		p("\n_%s left out to keep this summary short; see the HTML or JSON report._\n", plural(left, "file section", "file sections"))
	}
	return b.String()
}

// mdSection writes the Markdown section of one file, "" when there is
// nothing more to say than the table line.
func mdSection(f *FileReview) string {
	var b strings.Builder
	p := func(format string, args ...any) { fmt.Fprintf(&b, format, args...) }
	body := false
	p("\n### %s — %s\n\n", mdSpan(printable.Name(f.Path)), f.Status.Label())
	if f.Test != "" {
		p("Checked by %s.\n\n", mdSpan(f.Test))
	}
	for _, pr := range f.Problems {
		p("- %s\n", mdText(pr))
		body = true
	}
	if len(f.Problems) > 0 {
		p("\n")
	}
	switch {
	case f.Diff != nil && f.Status == ReviewChanged:
		if !slices.Equal(f.OldKeys, f.NewKeys) && f.OldRows >= 0 && f.NewRows >= 0 {
			p("Key columns changed: %s → %s.\n\n", mdText(keyList(f.OldKeys)), mdText(keyList(f.NewKeys)))
		}
		if f.RulesChange != "" {
			p("%s.\n\n", mdText(capitalise(f.RulesChange)))
		}
		p("Compared under: %s.\n\n", mdText(f.Rules.String()))
		p("%s", f.Diff.Markdown())
		body = true
	case len(f.Lines) > 0:
		p("%s", mdFence(reviewLinesText(f.Lines)))
		body = true
	case len(f.Paths) > 0:
		lines := strings.Join(f.Paths, "\n")
		if f.PathCount > len(f.Paths) {
			lines += fmt.Sprintf("\n… %d more", f.PathCount-len(f.Paths))
		}
		p("%s", mdFence(lines))
		body = true
	case len(f.Preview) > 0:
		if len(f.Columns) > 0 {
			p("| %s |\n|%s\n", mdJoin(f.Columns), strings.Repeat("---|", len(f.Columns)))
			for _, row := range f.Preview {
				p("| %s |\n", mdJoin(row))
			}
			if f.NewRows+f.OldRows+1 > len(f.Preview) {
				p("\n_First %s shown._\n", plural(len(f.Preview), "row", "rows"))
			}
		} else {
			var lines []string
			for _, row := range f.Preview {
				lines = append(lines, row[0])
			}
			p("%s", mdFence(strings.Join(lines, "\n")))
		}
		body = true
	}
	if f.Detail != "" && f.Diff == nil && len(f.Lines) == 0 && len(f.Paths) == 0 {
		p("%s", mdFence(textwidth.Truncate(f.Detail, 4000)))
		body = true
	}
	if !body {
		return ""
	}
	return b.String()
}

// reviewLinesText writes a line diff as plain lines: the two line numbers,
// the mark and the text.
func reviewLinesText(lines []ReviewLine) string {
	wa, wb := 1, 1
	for _, l := range lines {
		wa, wb = max(wa, len(strconv.Itoa(l.Old))), max(wb, len(strconv.Itoa(l.New)))
	}
	var b strings.Builder
	for _, l := range lines {
		if l.Mark == '…' {
			fmt.Fprintf(&b, "%*s %*s …  %s\n", wa, "", wb, "", l.Text)
			continue
		}
		fmt.Fprintf(&b, "%*s %*s %c  %s\n", wa, lineNo(l.Old), wb, lineNo(l.New), l.Mark, l.Text)
	}
	return strings.TrimRight(b.String(), "\n")
}

// mdFence writes text as a fenced code block, the fence longer than any
// run of backquotes in it.
func mdFence(text string) string {
	fence := "```"
	for strings.Contains(text, fence) {
		fence += "`"
	}
	return fence + "text\n" + text + "\n" + fence + "\n"
}

// mdSpan writes s as an inline code span that is safe in a table cell.
func mdSpan(s string) string {
	s = strings.NewReplacer("|", `\|`, "\n", " ", "\r", " ").Replace(s)
	tick := "`"
	for strings.Contains(s, tick) {
		tick += "`"
	}
	if strings.HasPrefix(s, "`") || strings.HasSuffix(s, "`") {
		s = " " + s + " "
	}
	return tick + s + tick
}

// mdText escapes the characters that Markdown or HTML would read as markup.
func mdText(s string) string {
	return strings.NewReplacer(`\`, `\\`, "|", `\|`, "*", `\*`, "_", `\_`, "`", "\\`", "<", "&lt;", ">", "&gt;", "[", `\[`, "]", `\]`, "#", `\#`, "\n", " ").Replace(s)
}

func mdJoin(cells []string) string {
	out := make([]string, len(cells))
	for i, c := range cells {
		out[i] = mdSpan(c)
	}
	return strings.Join(out, " | ")
}

func capitalise(s string) string {
	if s == "" {
		return s
	}
	return strings.ToUpper(s[:1]) + s[1:]
}

// Text writes the review as plain text for a terminal. See TextWith.
func (r *Review) Text() string { return r.TextWith(assert.TextStyle{}) }

// TextWith writes the review as text in the given style (colour, width):
// the headline, a table of the files, then per changed file its table
// diff (assert's Text), line diff or JSON paths, indented.
func (r *Review) TextWith(st assert.TextStyle) string {
	if st.Width <= 0 {
		st.Width = 100
	}
	bold := func(s string) string {
		if st.Color {
			return "\x1b[1m" + s + "\x1b[0m"
		}
		return s
	}
	var b strings.Builder
	head := r.title()
	if r.Against != "" {
		head += " against " + r.Against
	}
	b.WriteString(bold(head) + "\n" + capitalise(r.Headline()) + "\n")
	if len(r.Files) == 0 {
		return b.String()
	}
	rows := [][]string{{"status", "kind", "rows", "file"}}
	for _, f := range r.Files {
		rows = append(rows, []string{f.Status.Label(), string(f.Kind), f.Rows(), printable.Name(f.Path)})
	}
	widths := make([]int, 4)
	for _, row := range rows {
		for j, c := range row {
			widths[j] = max(widths[j], textwidth.Width(c))
		}
	}
	b.WriteString("\n")
	for i, row := range rows {
		line := "  " + textwidth.PadRight(row[0], widths[0]) + "  " + textwidth.PadRight(row[1], widths[1]) + "  " + textwidth.PadLeft(row[2], widths[2]) + "  " + row[3]
		// The path ends the line and is never cut: a long one makes its
		// line longer.
		if i == 0 {
			line = bold(line)
		}
		b.WriteString(line + "\n")
	}
	for _, f := range r.Files {
		// Paths, rules and summaries are never cut: they name files, key
		// columns and tolerances. The rules and summary are wrapped.
		b.WriteString("\n" + bold("== "+printable.Name(f.Path)+" ("+f.Status.Label()+")") + "\n")
		b.WriteString(indent(strings.Join(textwidth.Wrap(f.Summary(), st.Width-2, 2), "\n")) + "\n")
		if f.Test != "" {
			b.WriteString("  checked by " + f.Test + "\n")
		}
		if f.Kind == KindTable && f.Diff != nil && f.Status == ReviewChanged && f.Test == "" {
			if f.RulesChange != "" {
				b.WriteString(indent(strings.Join(textwidth.Wrap(f.RulesChange, st.Width-2, 2), "\n")) + "\n")
			}
			b.WriteString(indent(strings.Join(textwidth.Wrap("compared under: "+f.Rules.String(), st.Width-2, 2), "\n")) + "\n")
		}
		var body string
		fitted := false
		switch {
		case len(f.Problems) > 0:
			body = strings.Join(f.Problems, "\n")
		case f.Diff != nil && f.Status == ReviewChanged:
			sub := st
			sub.Width = st.Width - 2
			body = f.Diff.TextWith(sub)
			fitted = true // already fits, and its keys must not be cut
		case len(f.Lines) > 0:
			body = reviewLinesText(f.Lines)
		case len(f.Paths) > 0:
			body = strings.Join(f.Paths, "\n")
			if f.PathCount > len(f.Paths) {
				body += fmt.Sprintf("\n… %d more", f.PathCount-len(f.Paths))
			}
		case len(f.Preview) > 0:
			var rows []string
			if len(f.Columns) > 0 {
				rows = append(rows, strings.Join(f.Columns, " | "))
			}
			for _, row := range f.Preview {
				rows = append(rows, strings.Join(row, " | "))
			}
			body = strings.Join(rows, "\n")
		case f.Detail != "":
			body = f.Detail
		}
		if body != "" {
			var lines []string
			for _, l := range strings.Split(strings.TrimRight(body, "\n"), "\n") {
				if !st.Color && !fitted {
					l = textwidth.Truncate(l, st.Width-2)
				}
				lines = append(lines, l)
			}
			b.WriteString(indent(strings.Join(lines, "\n")) + "\n")
		}
	}
	return b.String()
}

// indent indents every line that is not empty by two spaces.
func indent(s string) string {
	lines := strings.Split(s, "\n")
	for i, l := range lines {
		if l != "" {
			lines[i] = "  " + l
		}
	}
	return strings.Join(lines, "\n")
}

// JSON writes the review as an indented JSON object for tools: title,
// against, headline, changed, counts {changed, new, removed, unchanged,
// equal} and files[], each with path, kind, status, summary, row counts,
// keys, and by kind the table diff (as assert's Diff.JSON writes it), the
// line diff or the JSON paths. Lists are never null.
func (r *Review) JSON() ([]byte, error) {
	type jLine struct {
		Mark string `json:"mark"`
		Old  int    `json:"old"`
		New  int    `json:"new"`
		Text string `json:"text"`
	}
	type jFile struct {
		Path      string          `json:"path"`
		Kind      FileKind        `json:"kind"`
		Status    ReviewStatus    `json:"status"`
		Summary   string          `json:"summary"`
		Test      string          `json:"test,omitempty"`
		OldRows   *int            `json:"old_rows"`
		NewRows   *int            `json:"new_rows"`
		OldKeys   []string        `json:"old_keys"`
		NewKeys   []string        `json:"new_keys"`
		Rules     []string        `json:"rules"`
		RulesChg  string          `json:"rules_change,omitempty"`
		Columns   []string        `json:"columns"`
		Problems  []string        `json:"problems"`
		Diff      json.RawMessage `json:"diff"`
		Lines     []jLine         `json:"lines"`
		Added     int             `json:"lines_added"`
		Removed   int             `json:"lines_removed"`
		Paths     []string        `json:"paths"`
		PathCount int             `json:"path_count"`
		Detail    string          `json:"detail,omitempty"`
	}
	out := struct {
		Title    string         `json:"title"`
		Against  string         `json:"against"`
		Headline string         `json:"headline"`
		Changed  bool           `json:"changed"`
		Counts   map[string]int `json:"counts"`
		Files    []jFile        `json:"files"`
	}{Title: r.title(), Against: r.Against, Headline: r.Headline(), Changed: r.Changed(), Counts: map[string]int{"equal": r.Equal}, Files: []jFile{}}
	for _, s := range statusOrder {
		out.Counts[string(s)] = r.Count(s)
	}
	nonEmpty := func(s []string) []string {
		if s == nil {
			return []string{}
		}
		return s
	}
	rows := func(n int) *int {
		if n < 0 {
			return nil
		}
		return &n
	}
	for _, f := range r.Files {
		jf := jFile{Path: f.Path, Kind: f.Kind, Status: f.Status, Summary: f.Summary(), Test: f.Test,
			OldRows: rows(f.OldRows), NewRows: rows(f.NewRows), OldKeys: nonEmpty(f.OldKeys), NewKeys: nonEmpty(f.NewKeys),
			Columns: nonEmpty(f.Columns), Problems: nonEmpty(f.Problems), Diff: json.RawMessage("null"), Lines: []jLine{},
			Added: f.Added, Removed: f.Removed, Paths: nonEmpty(f.Paths), PathCount: f.PathCount, Detail: f.Detail,
			Rules: []string{}, RulesChg: f.RulesChange}
		if f.Kind == KindTable && f.Diff != nil && f.Test == "" {
			jf.Rules = f.Rules.Parts()
		}
		if f.Diff != nil {
			js, err := f.Diff.JSON()
			if err != nil {
				return nil, err
			}
			jf.Diff = js
		}
		for _, l := range f.Lines {
			jf.Lines = append(jf.Lines, jLine{Mark: string(l.Mark), Old: l.Old, New: l.New, Text: l.Text})
		}
		out.Files = append(out.Files, jf)
	}
	b, err := json.MarshalIndent(out, "", "  ")
	if err != nil {
		return nil, err
	}
	return append(b, '\n'), nil
}

// The review page's style and script. The script is allowed by its hash
// in the page's Content-Security-Policy, which forbids every other script,
// any inline event handler and every outside resource.
const (
	reviewCSS = `:root{--ink:#1e2529;--paper:#f7f6f2;--card:#fff;--rule:#d9d6cc;--muted:#66707a;
--chg-bg:#fdf0c4;--chg-edge:#c98a00;--want:#a23b2a;--got:#14665a;
--st-changed:#8a5a00;--st-changed-bg:#fdf0c4;--st-new:#14665a;--st-new-bg:#dcf1ea;
--st-removed:#a23b2a;--st-removed-bg:#f8e0da;--st-unchanged:#4b5560;--st-unchanged-bg:#e8eaec}
*{box-sizing:border-box}
body{margin:0;background:var(--paper);color:var(--ink);font:15px/1.45 system-ui,-apple-system,"Segoe UI",Roboto,"DejaVu Sans",sans-serif}
.ps-top{position:sticky;top:0;z-index:2;background:#23343b;color:#f4f1e8;padding:.7rem 1.5rem;display:flex;flex-wrap:wrap;gap:.4rem 1.2rem;align-items:center}
.ps-top h1{font-size:1.15rem;margin:0;font-weight:650;letter-spacing:.01em}
.ps-against{margin:0;color:#c9d4d6;font-size:.9rem}
.ps-headline{margin:0;flex-basis:100%;font-size:.95rem}
.ps-tally{display:flex;gap:.4rem;margin:0;padding:0;list-style:none}
#ps-only-changed{margin-left:auto;font:inherit;font-size:.9rem;border:1px solid #9fb3b8;background:transparent;color:#f4f1e8;border-radius:999px;padding:.25rem .9rem;cursor:pointer}
#ps-only-changed[aria-pressed="true"]{background:#f4f1e8;color:#23343b}
main,.ps-index{max-width:78rem;margin:0 auto;padding:0 1.5rem}
.ps-index table{margin-top:1rem}
.ps-file{background:var(--card);border:1px solid var(--rule);border-radius:6px;margin:1.2rem 0;padding:.2rem 1.2rem 1rem}
.ps-file h2{font-size:1.05rem;margin:.8rem 0 .3rem;display:flex;gap:.6rem;align-items:baseline;flex-wrap:wrap}
.ps-file h2 code{font-size:.95rem;overflow-wrap:anywhere}
.ps-facts{margin:.2rem 0 .6rem;color:var(--muted);font-size:.9rem}
.ps-badge{font-size:.75rem;font-weight:650;text-transform:uppercase;letter-spacing:.04em;border-radius:3px;padding:.05rem .45rem;white-space:nowrap}
.ps-st-changed{color:var(--st-changed);background:var(--st-changed-bg)}
.ps-st-new{color:var(--st-new);background:var(--st-new-bg)}
.ps-st-removed{color:var(--st-removed);background:var(--st-removed-bg)}
.ps-st-unchanged{color:var(--st-unchanged);background:var(--st-unchanged-bg)}
.ps-scroll{overflow-x:auto;max-width:100%;margin:.3rem 0 .8rem}
table{border-collapse:collapse;font-size:.85rem}
th,td{border:1px solid var(--rule);padding:.2rem .5rem;text-align:left;vertical-align:top}
thead th{background:#eef0ee;font-weight:600;position:sticky;top:0}
td,th.ps-key{font-family:ui-monospace,"DejaVu Sans Mono",Menlo,Consolas,monospace;max-width:28rem;overflow-wrap:anywhere}
th.ps-key{background:#f4f3ee;font-weight:500}
.ps-num{text-align:right}
td.ps-changed{background:var(--chg-bg);box-shadow:inset 3px 0 0 var(--chg-edge)}
td.ps-changed del{color:var(--want);text-decoration:line-through;display:block}
td.ps-changed ins{color:var(--got);text-decoration:none;font-weight:650;display:block}
td.ps-changed small{display:block;color:var(--muted);font-size:.75rem}
td.ps-same{background:#fafaf8}
.ps-null{font-style:italic}
.ps-missing tbody tr{background:#fbeeea}
.ps-extra tbody tr{background:#e9f6f1}
.ps-verdict{font-weight:650;margin:.4rem 0 .1rem}
.ps-match{margin:0 0 .4rem;color:var(--muted);font-size:.9rem}
h4.ps-heading{font-size:.9rem;margin:.9rem 0 .2rem}
.ps-problems{color:var(--want)}
.ps-hints{margin:.2rem 0 .6rem;padding-left:1.2rem}.ps-hint{margin:.2rem 0}
.ps-pictures{display:flex;flex-wrap:wrap;gap:.8rem 1.4rem;align-items:flex-start;margin:.3rem 0 .8rem;overflow-x:auto}
.ps-figure{margin:0}.ps-figure svg{display:block}
.ps-caption{font-size:.78rem;color:var(--muted);width:0;min-width:100%;margin-top:.2rem}
.ps-lines td{border:none;padding:0 .5rem;white-space:pre-wrap}
.ps-lines .ps-ln{color:var(--muted);text-align:right;user-select:none}
.ps-lines tr.ps-del{background:#fbeeea}.ps-lines tr.ps-del .ps-mark{color:var(--want)}
.ps-lines tr.ps-add{background:#e9f6f1}.ps-lines tr.ps-add .ps-mark{color:var(--got)}
.ps-lines tr.ps-gap td{color:var(--muted);font-style:italic;padding:.2rem .5rem}
.ps-paths{font-family:ui-monospace,"DejaVu Sans Mono",monospace;font-size:.85rem;padding-left:1.2rem}
pre.ps-detail{background:#f4f3ee;border:1px solid var(--rule);padding:.6rem;overflow-x:auto;font-size:.8rem;white-space:pre-wrap}
a{color:#14665a}
[hidden]{display:none!important}`
	reviewScript = `(function(){var b=document.getElementById("ps-only-changed");if(!b)return;` +
		`b.addEventListener("click",function(){var on=b.getAttribute("aria-pressed")!=="true";b.setAttribute("aria-pressed",on?"true":"false");` +
		`var xs=document.querySelectorAll("[data-status]");for(var i=0;i<xs.length;i++){xs[i].hidden=on&&xs[i].getAttribute("data-status")==="unchanged";}});})();`
)

// HTML writes the review as one self-contained HTML page: no outside
// resources, an inline style, and one small inline script for the
// "changed only" button (which hides the files unchanged within
// tolerance). The top bar holds the headline and the tally of statuses; an
// index lists the files; then each file has a <section class="ps-file"
// data-status=…> with its facts and, for a changed table, assert's HTML
// fragment, whose differing cells are the page's only elements of class
// assert.HTMLChangedCell. Every text from the files is escaped, and the
// page's Content-Security-Policy runs no script but its own.
func (r *Review) HTML() string {
	var b strings.Builder
	_ = r.WriteHTML(&b) // a strings.Builder does not fail
	return b.String()
}

// WriteHTML writes what HTML returns to w as it goes: the differing cells
// of a table are written as the Diff lists them, so a page that lists
// millions of cells needs little memory. It returns the first error of w.
func (r *Review) WriteHTML(out io.Writer) error {
	b := bufio.NewWriterSize(out, 64<<10)
	w := func(s string) { b.WriteString(s) }
	e := html.EscapeString
	sum := sha256.Sum256([]byte(reviewScript))
	hash := base64.StdEncoding.EncodeToString(sum[:])
	w("<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n")
	w(`<meta http-equiv="Content-Security-Policy" content="default-src 'none'; style-src 'unsafe-inline'; script-src 'sha256-` + hash + `'; img-src data:; base-uri 'none'; form-action 'none'">` + "\n")
	w(`<meta name="viewport" content="width=device-width, initial-scale=1">` + "\n")
	w("<title>" + e(r.title()+" — "+r.Headline()) + "</title>\n<style>\n" + reviewCSS + "\n</style>\n</head>\n<body>\n")
	w(`<header class="ps-top"><h1>` + e(r.title()) + "</h1>")
	if r.Against != "" {
		w(`<p class="ps-against">against ` + e(r.Against) + "</p>")
	}
	w(`<ul class="ps-tally">`)
	for _, s := range statusOrder {
		if n := r.Count(s); n > 0 {
			w(`<li class="ps-badge ps-st-` + string(s) + `">` + e(fmt.Sprintf("%d %s", n, s.Label())) + "</li>")
		}
	}
	w("</ul>")
	if r.Count(ReviewUnchanged) > 0 {
		w(`<button type="button" id="ps-only-changed" aria-pressed="false" title="hide the files unchanged within tolerance">Changed only</button>`)
	}
	w(`<p class="ps-headline">` + e(capitalise(r.Headline())) + "</p></header>\n")
	if len(r.Files) > 0 {
		w(`<nav class="ps-index"><div class="ps-scroll"><table><thead><tr><th>file</th><th>status</th><th>kind</th><th>rows</th><th>what changed</th></tr></thead><tbody>` + "\n")
		for i, f := range r.Files {
			w(`<tr data-status="` + string(f.Status) + `"><td><a href="#f-` + strconv.Itoa(i+1) + `">` + e(f.Path) + "</a></td>")
			w(`<td><span class="ps-badge ps-st-` + string(f.Status) + `">` + e(f.Status.Label()) + "</span></td><td>" + e(string(f.Kind)) + `</td><td class="ps-num">` + e(f.Rows()) + "</td><td>" + e(f.Summary()) + "</td></tr>\n")
		}
		w("</tbody></table></div></nav>\n")
	}
	w("<main>\n")
	for i := range r.Files {
		htmlFile(b, i+1, &r.Files[i])
	}
	w("</main>\n<script>" + reviewScript + "</script>\n</body>\n</html>\n")
	return b.Flush()
}

// htmlFile writes the section of one file.
func htmlFile(b *bufio.Writer, n int, f *FileReview) {
	w := func(s string) { b.WriteString(s) }
	e := html.EscapeString
	w(`<section class="ps-file" id="f-` + strconv.Itoa(n) + `" data-status="` + string(f.Status) + `" data-kind="` + e(string(f.Kind)) + `">` + "\n")
	w(`<h2><span class="ps-badge ps-st-` + string(f.Status) + `">` + e(f.Status.Label()) + "</span><code>" + e(f.Path) + "</code></h2>\n")
	facts := []string{string(f.Kind), "rows " + f.Rows()}
	if f.Kind != KindTable {
		facts[1] = "lines " + f.Rows()
	}
	if f.Kind == KindTable && (len(f.NewKeys) > 0 || len(f.OldKeys) > 0) {
		if slices.Equal(f.OldKeys, f.NewKeys) || f.OldRows < 0 || f.NewRows < 0 {
			keys := f.NewKeys
			if len(keys) == 0 {
				keys = f.OldKeys
			}
			facts = append(facts, "keys "+keyList(keys))
		} else {
			facts = append(facts, "keys "+keyList(f.OldKeys)+" → "+keyList(f.NewKeys))
		}
	}
	if f.Test != "" {
		facts = append(facts, "checked by "+f.Test)
	}
	if f.Kind == KindTable && f.Diff != nil && f.Test == "" && f.OldRows >= 0 && f.NewRows >= 0 {
		facts = append(facts, "compared under: "+f.Rules.String())
		if f.RulesChange != "" {
			facts = append(facts, f.RulesChange)
		}
	}
	facts = append(facts, f.Summary())
	w(`<p class="ps-facts">` + e(strings.Join(facts, " · ")) + "</p>\n")
	if len(f.Problems) > 0 {
		w(`<ul class="ps-problems">`)
		for _, p := range f.Problems {
			w("<li>" + e(p) + "</li>")
		}
		w("</ul>\n")
	}
	switch {
	case f.Diff != nil && f.Status == ReviewChanged:
		_ = f.Diff.WriteHTML(b) // b keeps the first error for WriteHTML
	case len(f.Lines) > 0:
		w(`<div class="ps-scroll"><table class="ps-lines"><tbody>` + "\n")
		for _, l := range f.Lines {
			switch l.Mark {
			case '…':
				w(`<tr class="ps-gap"><td colspan="4">` + e(l.Text) + "</td></tr>\n")
				continue
			case '-':
				w(`<tr class="ps-del">`)
			case '+':
				w(`<tr class="ps-add">`)
			default:
				w(`<tr class="ps-ctx">`)
			}
			w(`<td class="ps-ln">` + lineNo(l.Old) + `</td><td class="ps-ln">` + lineNo(l.New) + `</td><td class="ps-mark">` + e(string(l.Mark)) + "</td><td>" + e(l.Text) + "</td></tr>\n")
		}
		w("</tbody></table></div>\n")
	case len(f.Paths) > 0:
		w(`<ul class="ps-paths">`)
		for _, p := range f.Paths {
			w("<li>" + e(p) + "</li>")
		}
		if f.PathCount > len(f.Paths) {
			w("<li>" + e(fmt.Sprintf("… %d more", f.PathCount-len(f.Paths))) + "</li>")
		}
		w("</ul>\n")
	case len(f.Preview) > 0:
		w(`<div class="ps-scroll"><table class="ps-preview">`)
		if len(f.Columns) > 0 {
			w("<thead><tr>")
			for _, c := range f.Columns {
				w("<th>" + e(c) + "</th>")
			}
			w("</tr></thead>")
		}
		w("<tbody>\n")
		for _, row := range f.Preview {
			w("<tr>")
			for _, c := range row {
				w("<td>" + e(c) + "</td>")
			}
			w("</tr>\n")
		}
		w("</tbody></table></div>\n")
	}
	if f.Detail != "" && f.Diff == nil && len(f.Lines) == 0 && len(f.Paths) == 0 {
		w(`<pre class="ps-detail">` + e(f.Detail) + "</pre>\n")
	}
	w("</section>\n")
}
