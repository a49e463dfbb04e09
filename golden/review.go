package golden

import (
	"errors"
	"fmt"
	"os"
	"slices"
	"strings"

	"github.com/proofsheet/proofsheet/assert"
	"github.com/proofsheet/proofsheet/fixtures"
	"github.com/proofsheet/proofsheet/internal/printable"
)

// ReviewStatus says what became of one golden file between two versions.
type ReviewStatus string

// The statuses of a reviewed golden file.
const (
	ReviewNew     ReviewStatus = "new"     // only the new version exists
	ReviewRemoved ReviewStatus = "removed" // only the old version exists
	ReviewChanged ReviewStatus = "changed" // the content differs (or a version cannot be read)
	// ReviewUnchanged: the bytes differ but the content is the same —
	// a table equal under the review's options (within its tolerances,
	// rows in another order under a key), JSON equal by structure.
	ReviewUnchanged ReviewStatus = "unchanged"
)

// Label is the status as a reader sees it: "new", "removed", "changed",
// "unchanged within tolerance".
func (s ReviewStatus) Label() string {
	if s == ReviewUnchanged {
		return "unchanged within tolerance"
	}
	return string(s)
}

// statusOrder is the order of statuses in headlines and tallies.
var statusOrder = []ReviewStatus{ReviewChanged, ReviewNew, ReviewRemoved, ReviewUnchanged}

// FileChange is one golden file in two versions, old and new, as a review
// compares them: for example the file at a git revision and in the
// working tree.
type FileChange struct {
	// Path names the file (slash-separated); its golden extension
	// (.gold.tbl, .gold.txt, .gold.json) gives the kind.
	Path string
	// Old and New are the bytes of each version; OldExists and NewExists
	// say whether the version exists at all (an empty file exists).
	Old, New             []byte
	OldExists, NewExists bool
}

// FileReview is what a review found in one golden file.
type FileReview struct {
	Path   string
	Kind   FileKind
	Status ReviewStatus
	// Test is the test that made the check, for reviews of run records.
	Test string

	// OldRows and NewRows are the row counts of a table's versions (lines
	// of a text file), -1 where the version is absent or unreadable.
	OldRows, NewRows int
	// OldKeys and NewKeys are the key columns each stored table declares.
	OldKeys, NewKeys []string
	// Rules are the rules a table's two versions were compared under: the
	// rules the new version stores, else the old version's (see
	// SheetInfo), with the review's own options on top. RulesChange says
	// how the stored rules differ between the versions ("" when they do
	// not); a change of rules makes the file changed, since a wider
	// tolerance can hide a difference.
	Rules       assert.Rules
	RulesChange string
	// Columns lists the columns ("name:type") of a new or removed table.
	Columns []string
	// Preview holds the first rows of a new or removed table (cells in the
	// literal spelling) or the first lines of a new or removed text or
	// JSON file (one cell per line).
	Preview [][]string
	// Diff is the comparison of a table's versions, old as want and new
	// as got, labelled "before" and "after".
	Diff *assert.Diff
	// Lines is the line diff of a changed text file: changed lines with
	// up to three unchanged lines around them; Added and Removed count the
	// changed lines exactly.
	Lines          []ReviewLine
	Added, Removed int
	// Paths lists the differences of a changed JSON file, one per JSON
	// path ("$.houses[2].tmax: got 21.5 want 21.25"); PathCount counts
	// them exactly.
	Paths     []string
	PathCount int
	// Problems are versions that could not be read.
	Problems []string
	// NewUnreadable is set when the new version (the working tree's, in a
	// review against git) exists but cannot be read as its kind: a file
	// that a check would fail to read, which is trouble rather than a
	// change.
	NewUnreadable bool
	// Detail is the failure message of a run record.
	Detail string
}

// ReviewLine is one line of a text file's line diff.
type ReviewLine struct {
	// Mark is '-' for a line only in the old version, '+' only in the new,
	// ' ' in both; '…' stands for unchanged lines left out (Text then
	// says how many).
	Mark rune
	// Old and New are the line's 1-based numbers in each version, 0 where
	// it is absent.
	Old, New int
	// Text is the line, quoted as a Go string when it has invisible
	// content (trailing blanks, tabs, control characters).
	Text string
}

// Review is the summary of a set of golden files.
type Review struct {
	// Title heads the reports; "" means "Golden file review".
	Title string
	// Against says what the files were compared with, such as
	// "HEAD (3f2a9c1)" or "the run records in out/records".
	Against string
	// Files are the reviewed files, in the order given.
	Files []FileReview
	// Equal counts files or checks found equal and not listed.
	Equal int
	// Noun names what the files are in the headline: "golden file" when
	// empty ("table" for a comparison of two table files, say).
	Noun string
}

// Unreadable returns the paths of the files whose new version cannot be
// read (see FileReview.NewUnreadable).
func (r *Review) Unreadable() []string {
	var out []string
	for _, f := range r.Files {
		if f.NewUnreadable {
			out = append(out, f.Path)
		}
	}
	return out
}

// Count returns how many files have the status.
func (r *Review) Count(s ReviewStatus) int {
	n := 0
	for _, f := range r.Files {
		if f.Status == s {
			n++
		}
	}
	return n
}

// Changed reports whether any file is new, removed or changed.
func (r *Review) Changed() bool {
	for _, f := range r.Files {
		if f.Status != ReviewUnchanged {
			return true
		}
	}
	return false
}

// Headline sums the review up in one line: "3 golden files differ: 1
// changed, 1 new, 1 removed; 2 unchanged within tolerance".
func (r *Review) Headline() string {
	moved := len(r.Files) - r.Count(ReviewUnchanged)
	var parts []string
	for _, s := range statusOrder[:3] {
		if n := r.Count(s); n > 0 {
			parts = append(parts, fmt.Sprintf("%d %s", n, s.Label()))
		}
	}
	noun := r.Noun
	if noun == "" {
		noun = "golden file"
	}
	var head string
	switch moved {
	case 0:
		head = "no " + noun + " differs"
	case 1:
		head = "1 " + noun + " differs: " + strings.Join(parts, ", ")
	default:
		head = fmt.Sprintf("%d %ss differ: %s", moved, noun, strings.Join(parts, ", "))
	}
	if n := r.Count(ReviewUnchanged); n > 0 {
		head += fmt.Sprintf("; %d unchanged within tolerance", n)
	}
	if r.Equal > 0 {
		head += fmt.Sprintf("; %d equal", r.Equal)
	}
	return head
}

// ReviewChange compares the old and new version of one golden file by its
// kind: a table with assert.Compare (old as want, new as got; rows
// matched by the key columns the new file declares, else the old one's,
// and opts added — tolerances, ignored columns, a listing limit), text
// line by line, JSON by path (see JSONDiff). A version that cannot be
// read is a Problem and makes the file changed. A file whose kind is not
// known is compared as text.
//
// The same opts apply to every table, so an option naming a column that a
// table lacks is a Problem of that table's comparison; use
// ReviewChangeFor to choose options by a table's columns.
func ReviewChange(c FileChange, opts ...assert.Option) FileReview {
	return ReviewChangeFor(c, func([]string) []assert.Option { return opts })
}

// OptionsFor chooses the comparison options of a table from its columns:
// the names of both versions' columns, old first, each name once.
type OptionsFor func(columns []string) []assert.Option

// ReviewChangeFor is ReviewChange with the options of each table chosen
// by its columns, so one set of rules (a tolerance for tmax, say) can
// serve tables that do not all have the columns it names.
func ReviewChangeFor(c FileChange, optsFor OptionsFor) FileReview {
	kind, ok := kindOfFile(c.Path)
	if !ok {
		kind = KindText
	}
	f := FileReview{Path: c.Path, Kind: kind, OldRows: -1, NewRows: -1}
	switch {
	case !c.OldExists && !c.NewExists:
		f.Status = ReviewUnchanged
		f.Problems = append(f.Problems, "neither version exists")
		return f
	case !c.OldExists:
		f.Status = ReviewNew
	case !c.NewExists:
		f.Status = ReviewRemoved
	}
	switch kind {
	case KindTable:
		reviewTable(&f, c, optsFor)
	case KindJSON:
		reviewJSON(&f, c)
	default:
		reviewText(&f, c)
	}
	return f
}

// previewRows is how many rows or lines a new or removed file shows.
const previewRows = 10

func reviewTable(f *FileReview, c FileChange, optsFor OptionsFor) {
	var old, cur *fixtures.Table
	var oldInfo, newInfo SheetInfo
	var err error
	if c.OldExists {
		if old, oldInfo, err = DecodeTable(c.Path+" (old)", c.Old); err != nil {
			f.Problems = append(f.Problems, err.Error())
		} else {
			f.OldRows, f.OldKeys = old.NumRows(), oldInfo.Keys
		}
	}
	if c.NewExists {
		if cur, newInfo, err = DecodeTable(c.Path+" (new)", c.New); err != nil {
			f.Problems = append(f.Problems, err.Error())
			f.NewUnreadable = true
		} else {
			f.NewRows, f.NewKeys = cur.NumRows(), newInfo.Keys
		}
	}
	if f.Status == ReviewNew || f.Status == ReviewRemoved {
		if only := cmpOr(cur, old); only != nil {
			f.Columns, f.Preview = tablePreview(only)
		}
		return
	}
	if old == nil || cur == nil {
		f.Status = ReviewChanged
		return
	}
	// The stored rules, the new version's first, as long as their keys
	// fit both versions.
	fits := func(r assert.Rules) bool {
		return r.Match != assert.MatchByKey || (hasColumns(old, r.Keys) && hasColumns(cur, r.Keys))
	}
	f.Rules = assert.Rules{Match: assert.MatchByPosition}
	switch {
	case fits(newInfo.Rules):
		f.Rules = newInfo.Rules
	case fits(oldInfo.Rules):
		f.Rules = oldInfo.Rules
	}
	if oldInfo.HasRules && newInfo.HasRules {
		// A version 1 file stores only how its rows are sorted, so there is
		// no change of rules to speak of before both versions store them.
		f.RulesChange = rulesChange(oldInfo.Rules, newInfo.Rules, "stored rules changed")
	}
	names := old.Names()
	for _, n := range cur.Names() {
		if old.Column(n) == nil {
			names = append(names, n)
		}
	}
	all := f.Rules.Options()
	if optsFor != nil {
		extra := optsFor(names)
		all = append(all, extra...)
		f.Rules = assert.RulesOf(all...)
	}
	f.Diff = assert.Compare(old, cur, all...)
	f.Diff.WantName, f.Diff.GotName = "before", "after"
	f.Status = ReviewChanged
	if f.Diff.Equal() && f.RulesChange == "" {
		f.Status = ReviewUnchanged
	}
}

func cmpOr(a, b *fixtures.Table) *fixtures.Table {
	if a != nil {
		return a
	}
	return b
}

func hasColumns(t *fixtures.Table, cols []string) bool {
	for _, c := range cols {
		if t.Column(c) == nil {
			return false
		}
	}
	return true
}

// tablePreview returns the columns and the first rows of t.
func tablePreview(t *fixtures.Table) ([]string, [][]string) {
	cols := make([]string, 0, t.NumCols())
	for _, fd := range t.Schema() {
		cols = append(cols, printable.Name(fd.Name)+":"+fd.Type.String())
	}
	var rows [][]string
	for i := 0; i < min(previewRows, t.NumRows()); i++ {
		row := make([]string, t.NumCols())
		for j, col := range t.Columns() {
			row[j] = fixtures.LiteralCell(col, i)
		}
		rows = append(rows, row)
	}
	return cols, rows
}

func reviewText(f *FileReview, c FileChange) {
	oldText, newText := string(c.Old), string(c.New)
	if c.OldExists {
		f.OldRows = countLines(oldText)
	}
	if c.NewExists {
		f.NewRows = countLines(newText)
	}
	if f.Status == ReviewNew || f.Status == ReviewRemoved {
		f.Preview = linePreview(oldText + newText)
		return
	}
	if oldText == newText {
		f.Status = ReviewUnchanged
		return
	}
	f.Status = ReviewChanged
	f.Lines, f.Added, f.Removed = reviewLines(oldText, newText)
}

// countLines counts the lines of a text, a last line without a newline
// included.
func countLines(s string) int {
	n := strings.Count(s, "\n")
	if s != "" && !strings.HasSuffix(s, "\n") {
		n++
	}
	return n
}

func linePreview(s string) [][]string {
	var rows [][]string
	for s != "" && len(rows) < previewRows {
		line, rest, _ := strings.Cut(s, "\n")
		rows = append(rows, []string{showLine(lineOp{text: line})})
		s = rest
	}
	return rows
}

// reviewMaxLines caps the listed lines of a text file's diff.
const reviewMaxLines = textDiffMaxLines

// reviewLines is the line diff of a text file in groups of changes with
// textContext unchanged lines around them, as TextDiff groups them.
func reviewLines(old, cur string) (lines []ReviewLine, added, removed int) {
	ops := lineOps(old, cur)
	changed, removed, added := changedOps(ops)
	last := -1 // the last op listed
	for _, h := range hunks(changed, len(ops)) {
		from, to := h[0], h[1]
		if from > last+1 {
			lines = append(lines, ReviewLine{Mark: '…', Text: plural(from-last-1, "unchanged line", "unchanged lines")})
		}
		for k := from; k <= to; k++ {
			if len(lines) >= reviewMaxLines {
				lines = append(lines, ReviewLine{Mark: '…', Text: "more lines not shown"})
				return lines, added, removed
			}
			op := ops[k]
			lines = append(lines, ReviewLine{Mark: rune(op.mark()), Old: op.a, New: op.b, Text: showLine(op)})
		}
		last = to
	}
	if last >= 0 && last < len(ops)-1 {
		lines = append(lines, ReviewLine{Mark: '…', Text: plural(len(ops)-1-last, "unchanged line", "unchanged lines")})
	}
	return lines, added, removed
}

func reviewJSON(f *FileReview, c FileChange) {
	var w, g any
	var err error
	if c.OldExists {
		if w, err = decodeJSON(c.Old); err != nil {
			f.Problems = append(f.Problems, fmt.Sprintf("%s (old): %v", c.Path, err))
		}
	}
	if c.NewExists {
		if g, err = decodeJSON(c.New); err != nil {
			f.Problems = append(f.Problems, fmt.Sprintf("%s (new): %v", c.Path, err))
			f.NewUnreadable = true
		}
	}
	f.OldRows, f.NewRows = -1, -1
	if c.OldExists {
		f.OldRows = countLines(string(c.Old))
	}
	if c.NewExists {
		f.NewRows = countLines(string(c.New))
	}
	if f.Status == ReviewNew || f.Status == ReviewRemoved {
		f.Preview = linePreview(string(c.Old) + string(c.New))
		return
	}
	f.Status = ReviewChanged
	if len(f.Problems) > 0 {
		return
	}
	jl := jsonLines{review: true}
	diffJSON(&jl, "$", w, g)
	lines := jl.list
	f.PathCount = len(lines)
	if len(lines) > jsonDiffMaxLines {
		lines = lines[:jsonDiffMaxLines]
	}
	f.Paths = lines
	if f.PathCount == 0 {
		f.Status = ReviewUnchanged
	}
}

// ReviewDiff makes the review entry of one table comparison that is not
// about a golden file, such as two table files compared by the command
// line's diff: label names it, want is the old side and got the new.
func ReviewDiff(label string, d *assert.Diff) FileReview {
	f := FileReview{Path: label, Kind: KindTable, Diff: d, Status: ReviewChanged, OldRows: -1, NewRows: -1}
	if d != nil {
		f.OldRows, f.NewRows = d.WantRows, d.GotRows
		if d.Equal() {
			f.Status = ReviewUnchanged
		}
	}
	return f
}

// ReviewRecords summarises run records (see ReadRecords): one entry per
// golden file, from the record that says most about it (a failed check
// before an update, an update before a pass). Checks that passed unchanged
// are counted in Equal, not listed. Files created by update mode are
// read from disk for their preview; files that changed carry the Diff the
// record holds (tables) or the failure message (text and JSON).
func ReviewRecords(recs []Record) *Review {
	best := map[string]Record{}
	var order []string
	for _, r := range recs {
		id := r.Path
		if id == "" {
			id = r.Name
		}
		prev, seen := best[id]
		if !seen {
			order = append(order, id)
		}
		if !seen || recordRank(r.Status) > recordRank(prev.Status) {
			best[id] = r
		}
	}
	slices.Sort(order)
	rv := &Review{}
	for _, id := range order {
		r := best[id]
		if r.Status == StatusEqual {
			rv.Equal++
			continue
		}
		rv.Files = append(rv.Files, reviewRecord(id, r))
	}
	return rv
}

// recordRank orders record statuses by how much they tell a reviewer.
func recordRank(s Status) int {
	switch s {
	case StatusEqual:
		return 0
	case StatusNew:
		return 1
	case StatusUpdated:
		return 2
	case StatusMissing:
		return 3
	}
	return 4 // changed, refused, invalid
}

func reviewRecord(path string, r Record) FileReview {
	kind := r.Kind
	if kind.Ext() == "" {
		kind = KindText
	}
	f := FileReview{Path: path, Kind: kind, Test: r.Test, OldRows: -1, NewRows: -1, Detail: r.Detail}
	switch r.Status {
	case StatusNew:
		if data, err := readRegular(r.File); err == nil {
			fr := ReviewChange(FileChange{Path: path, New: data, NewExists: true})
			fr.Test, fr.Detail = r.Test, r.Detail
			return fr
		}
		f.Status = ReviewNew
	case StatusMissing:
		f.Status = ReviewNew
	case StatusInvalid:
		f.Status = ReviewChanged
		if r.Detail != "" {
			f.Problems = append(f.Problems, r.Detail)
			f.Detail = ""
		}
	default: // changed, updated, refused
		f.Status = ReviewChanged
	}
	if len(r.Diff) > 0 && kind == KindTable {
		d, err := assert.DiffFromJSON(r.Diff)
		if err != nil {
			f.Problems = append(f.Problems, fmt.Sprintf("the record's diff: %v", err))
		} else {
			f.Diff = d
			f.Diff.WantName, f.Diff.GotName = "before", "after"
			f.OldRows, f.NewRows = d.WantRows, d.GotRows
		}
	}
	return f
}

// readRegular reads the file a run record names, refusing anything but a
// regular file: a record names its file as a test wrote it, and reading a
// device or a pipe named there (/dev/zero, a FIFO) would never end.
func readRegular(path string) ([]byte, error) {
	if path == "" {
		return nil, errors.New("no file named")
	}
	// Stat before opening: opening a FIFO waits for a writer.
	fi, err := os.Stat(path)
	if err != nil {
		return nil, err
	}
	if !fi.Mode().IsRegular() {
		return nil, fmt.Errorf("%s is not a regular file", path)
	}
	return os.ReadFile(path)
}
