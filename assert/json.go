package assert

import (
	"bytes"
	"encoding/json"
	"fmt"
	"io"
	"math"
	"reflect"
	"strconv"
	"strings"

	"github.com/proofsheet/proofsheet/fixtures"
	"github.com/proofsheet/proofsheet/internal/printable"
)

// JSON writes the Diff as an indented JSON object, for tools. The fields
// equal, want_rows, got_rows, missing_rows, extra_rows, cells_differing,
// columns[] {name, differing, max_abs_delta, max_rel_delta} and schema[]
// {column, change, want, got} are fixed; the others (match, keys, the
// column lists, rows_differing, problems, duplicate keys, the listed cells
// and rows, hints[] {kind, column, text, option, flag, name, suggest,
// factor, offset, count, pairs[]}) complete the picture. Rows are
// numbered from 1, the first data row, as in every other report; the Go
// fields (RowRef.Want, DuplicateKey.Rows) are 0-based indexes. Lists are never null, and a delta that
// is not a finite number (an infinity) is written as null. The output is
// the same for the same Diff, and DiffFromJSON reads it back.
func (d *Diff) JSON() ([]byte, error) {
	var b bytes.Buffer
	if err := d.WriteJSON(&b); err != nil {
		return nil, err
	}
	return b.Bytes(), nil
}

// WriteJSON writes what JSON returns to w as it goes, so that a listing of
// millions of cells needs little memory. It returns the first error of w.
func (d *Diff) WriteJSON(w io.Writer) error {
	if d == nil {
		d = &Diff{}
	}
	out := jsonDiff{
		Equal:          d.Equal(),
		Match:          string(d.Match),
		Keys:           orEmpty(d.Keys),
		WantColumns:    orEmpty(d.WantColumns),
		GotColumns:     orEmpty(d.GotColumns),
		Compared:       orEmpty(d.Compared),
		WantRows:       d.WantRows,
		GotRows:        d.GotRows,
		MissingRows:    d.Missing.Count,
		ExtraRows:      d.Extra.Count,
		CellsDiffering: d.CellsDiffering,
		RowsDiffering:  d.RowsDiffering,
		DuplicateKeys:  jsonDupCounts{Want: d.Duplicates.WantKeys, Got: d.Duplicates.GotKeys},
		Problems:       orEmpty(d.Problems),
		Schema:         []jsonSchema{},
		Columns:        []jsonColumn{},
		Duplicates:     []jsonDup{},
		Hints:          []jsonHint{},
		Overview:       jsonOverviewOf(d.Overview),
		Limit:          d.Limit,
	}
	for _, h := range d.Hints {
		jh := jsonHint{Kind: string(h.Kind), Column: h.Column, Text: h.Text, Option: h.Option, Flag: h.Flag,
			Name: h.Name, Suggest: h.Suggest, Count: h.Count, Pairs: []jsonNear{}}
		if h.Kind == HintScale {
			f, o := jsonNum(h.Factor), jsonNum(h.Offset)
			jh.Factor, jh.Offset = &f, &o
		}
		for _, p := range h.Pairs {
			jh.Pairs = append(jh.Pairs, jsonNear{Missing: *jsonRowOf(p.Missing), Extra: *jsonRowOf(p.Extra), Why: orEmpty(p.Why)})
		}
		out.Hints = append(out.Hints, jh)
	}
	if d.Match == "" {
		out.Match = string(MatchByPosition)
	}
	for _, s := range d.Schema {
		out.Schema = append(out.Schema, jsonSchema{s.Column, string(s.Change), s.Want, s.Got})
	}
	for _, c := range d.Columns {
		jc := jsonColumn{Name: c.Name, WantType: c.WantType.String(), GotType: c.GotType.String(), Rule: c.Rule, Differing: c.Differing,
			MaxAbs: jsonNumOrNull(), MaxRel: jsonNumOrNull()}
		if c.HasDelta {
			jc.MaxAbs = jsonNum(c.MaxAbs)
			if !isTimeKind(c.WantType.Kind()) && !isTimeKind(c.GotType.Kind()) {
				jc.MaxRel = jsonNum(c.MaxRel)
			}
			if c.MaxAbsAt.Want >= 0 {
				jc.MaxAbsAt = jsonRowOf(c.MaxAbsAt)
			}
			if c.MaxRelAt.Want >= 0 {
				jc.MaxRelAt = jsonRowOf(c.MaxRelAt)
			}
		}
		out.Columns = append(out.Columns, jc)
	}
	for _, k := range d.Duplicates.Keys {
		out.Duplicates = append(out.Duplicates, jsonDup{Side: string(k.Side), Key: orEmpty(k.Key), Count: k.Count, Rows: rowNumbers(k.Rows)})
	}
	// The object is written field by field in the order of jsonDiff, as
	// json.MarshalIndent(out, "", "  ") would, with the listings streamed.
	b := renderBuffer(w)
	var err error
	first := true
	field := func(name string) {
		if first {
			b.WriteString("{\n  ")
			first = false
		} else {
			b.WriteString(",\n  ")
		}
		b.WriteString(`"` + name + `": `)
	}
	value := func(v any) {
		if err != nil {
			return
		}
		var x []byte
		if x, err = json.MarshalIndent(v, "  ", "  "); err == nil {
			b.Write(x)
		}
	}
	list := func(n int, each func(func(v any) bool)) {
		if n == 0 {
			b.WriteString("[]")
			return
		}
		b.WriteString("[\n    ")
		i := 0
		each(func(v any) bool {
			if i > 0 {
				b.WriteString(",\n    ")
			}
			i++
			var x []byte
			if x, err = json.MarshalIndent(v, "    ", "  "); err != nil {
				return false
			}
			b.Write(x)
			return true
		})
		b.WriteString("\n  ]")
	}
	rt := reflect.TypeOf(out)
	rv := reflect.ValueOf(out)
	for i := 0; i < rt.NumField(); i++ {
		name, _, _ := strings.Cut(rt.Field(i).Tag.Get("json"), ",")
		field(name)
		switch name {
		case "cells":
			list(d.Cells.Len(), func(f func(v any) bool) {
				eachCell(d.Cells, func(_ int, c *CellDiff) bool { return f(jsonCellOfDiff(c)) })
			})
		case "missing":
			list(d.Missing.Rows.Len(), func(f func(v any) bool) {
				for _, r := range d.Missing.Rows.All() {
					if !f(jsonRowOf(r)) {
						return
					}
				}
			})
		case "extra":
			list(d.Extra.Rows.Len(), func(f func(v any) bool) {
				for _, r := range d.Extra.Rows.All() {
					if !f(jsonRowOf(r)) {
						return
					}
				}
			})
		default:
			value(rv.Field(i).Interface())
		}
	}
	b.WriteString("\n}")
	if err != nil {
		return err
	}
	return b.Flush()
}

// jsonCellOfDiff is the JSON form of a listed cell.
func jsonCellOfDiff(c *CellDiff) jsonCell {
	jc := jsonCell{Row: *jsonRowOf(c.Row), Column: c.Column, Want: jsonCellOf(c.Want), Got: jsonCellOf(c.Got),
		Abs: jsonNumOrNull(), Rel: jsonNumOrNull()}
	if c.Delta.Has {
		jc.Abs = jsonNum(c.Delta.Abs)
		if !isTimeKind(c.Want.Kind) && !isTimeKind(c.Got.Kind) {
			jc.Rel = jsonNum(c.Delta.Rel)
		}
	}
	if c.Delta.HasULPs {
		u := c.Delta.ULPs
		jc.ULPs = &u
	}
	return jc
}

type jsonDiff struct {
	Equal          bool          `json:"equal"`
	Match          string        `json:"match"`
	Keys           []string      `json:"keys"`
	WantColumns    []string      `json:"want_columns"`
	GotColumns     []string      `json:"got_columns"`
	Compared       []string      `json:"compared"`
	WantRows       int           `json:"want_rows"`
	GotRows        int           `json:"got_rows"`
	MissingRows    int           `json:"missing_rows"`
	ExtraRows      int           `json:"extra_rows"`
	CellsDiffering int           `json:"cells_differing"`
	RowsDiffering  int           `json:"rows_differing"`
	DuplicateKeys  jsonDupCounts `json:"duplicate_keys"`
	Problems       []string      `json:"problems"`
	Schema         []jsonSchema  `json:"schema"`
	Columns        []jsonColumn  `json:"columns"`
	Cells          []jsonCell    `json:"cells"`
	Missing        []jsonRow     `json:"missing"`
	Extra          []jsonRow     `json:"extra"`
	Duplicates     []jsonDup     `json:"duplicates"`
	Hints          []jsonHint    `json:"hints"`
	Overview       *jsonOverview `json:"overview"`
	Limit          int           `json:"limit"`
}

type jsonOverview struct {
	Strip struct {
		Order string     `json:"order"`
		Rows  int        `json:"rows"`
		Bins  []StripBin `json:"bins"`
	} `json:"strip"`
	Numbers    []jsonNumberShape   `json:"numbers"`
	Categories []jsonCategoryShape `json:"categories"`
}

type jsonNumberShape struct {
	Column string         `json:"column"`
	Cells  int            `json:"cells"`
	Others int            `json:"others"`
	Log    bool           `json:"log"`
	Bins   []jsonDeltaBin `json:"bins"`
	Points [][2]jsonNum   `json:"points"`
	Abs    jsonNum        `json:"abs"`
	Rel    jsonNum        `json:"rel"`
}

type jsonDeltaBin struct {
	Lo    jsonNum `json:"lo"`
	Hi    jsonNum `json:"hi"`
	Count int     `json:"count"`
}

type jsonCategoryShape struct {
	Column string       `json:"column"`
	Levels []LevelCount `json:"levels"`
	More   int          `json:"more"`
}

func jsonOverviewOf(o *Overview) *jsonOverview {
	if o == nil {
		return nil
	}
	out := &jsonOverview{Numbers: []jsonNumberShape{}, Categories: []jsonCategoryShape{}}
	out.Strip.Order, out.Strip.Rows, out.Strip.Bins = o.Strip.Order, o.Strip.Rows, orEmpty(o.Strip.Bins)
	for _, n := range o.Numbers {
		jn := jsonNumberShape{Column: n.Column, Cells: n.Cells, Others: n.Others, Log: n.Log, Bins: []jsonDeltaBin{},
			Points: [][2]jsonNum{}, Abs: jsonNum(n.Abs), Rel: jsonNum(n.Rel)}
		for _, b := range n.Bins {
			jn.Bins = append(jn.Bins, jsonDeltaBin{jsonNum(b.Lo), jsonNum(b.Hi), b.Count})
		}
		for _, p := range n.Points {
			jn.Points = append(jn.Points, [2]jsonNum{jsonNum(p.Want), jsonNum(p.Got)})
		}
		out.Numbers = append(out.Numbers, jn)
	}
	for _, c := range o.Categories {
		out.Categories = append(out.Categories, jsonCategoryShape{Column: c.Column, Levels: orEmpty(c.Levels), More: c.More})
	}
	return out
}

func overviewFromJSON(j *jsonOverview) *Overview {
	if j == nil {
		return nil
	}
	o := &Overview{Strip: RowStrip{Order: j.Strip.Order, Rows: j.Strip.Rows, Bins: j.Strip.Bins}}
	for _, n := range j.Numbers {
		s := NumberShape{Column: n.Column, Cells: n.Cells, Others: n.Others, Log: n.Log, Abs: float64(n.Abs), Rel: float64(n.Rel)}
		for _, b := range n.Bins {
			s.Bins = append(s.Bins, DeltaBin{float64(b.Lo), float64(b.Hi), b.Count})
		}
		for _, p := range n.Points {
			s.Points = append(s.Points, Point{float64(p[0]), float64(p[1])})
		}
		o.Numbers = append(o.Numbers, s)
	}
	for _, c := range j.Categories {
		o.Categories = append(o.Categories, CategoryShape{Column: c.Column, Levels: c.Levels, More: c.More})
	}
	return o
}

type jsonHint struct {
	Kind    string     `json:"kind"`
	Column  string     `json:"column,omitempty"`
	Text    string     `json:"text"`
	Option  string     `json:"option,omitempty"`
	Flag    string     `json:"flag,omitempty"`
	Name    string     `json:"name,omitempty"`
	Suggest string     `json:"suggest,omitempty"`
	Factor  *jsonNum   `json:"factor,omitempty"`
	Offset  *jsonNum   `json:"offset,omitempty"`
	Count   int        `json:"count,omitempty"`
	Pairs   []jsonNear `json:"pairs"`
}

type jsonNear struct {
	Missing jsonRow  `json:"missing"`
	Extra   jsonRow  `json:"extra"`
	Why     []string `json:"why"`
}

type jsonDupCounts struct {
	Want int `json:"want"`
	Got  int `json:"got"`
}

type jsonSchema struct {
	Column string `json:"column"`
	Change string `json:"change"`
	Want   string `json:"want"`
	Got    string `json:"got"`
}

type jsonColumn struct {
	Name      string   `json:"name"`
	WantType  string   `json:"want_type"`
	GotType   string   `json:"got_type"`
	Rule      string   `json:"rule"`
	Differing int      `json:"differing"`
	MaxAbs    jsonNum  `json:"max_abs_delta"`
	MaxRel    jsonNum  `json:"max_rel_delta"`
	MaxAbsAt  *jsonRow `json:"max_abs_at"`
	MaxRelAt  *jsonRow `json:"max_rel_at"`
}

type jsonRow struct {
	Want  *int     `json:"want"`
	Got   *int     `json:"got"`
	Key   []string `json:"key,omitempty"`
	Cells []string `json:"cells,omitempty"`
}

type jsonCell struct {
	Row    jsonRow      `json:"row"`
	Column string       `json:"column"`
	Want   jsonCellText `json:"want"`
	Got    jsonCellText `json:"got"`
	Abs    jsonNum      `json:"abs_delta"`
	Rel    jsonNum      `json:"rel_delta"`
	ULPs   *uint64      `json:"ulps,omitempty"`
}

type jsonCellText struct {
	Text string `json:"text"`
	Kind string `json:"kind"`
	Null bool   `json:"null"`
}

type jsonDup struct {
	Side  string   `json:"side"`
	Key   []string `json:"key"`
	Count int      `json:"count"`
	Rows  []int    `json:"rows"`
}

// jsonNum is a float written as a JSON number in shortest round-trip
// form, or null when it is not finite (or was never set: NaN).
type jsonNum float64

func (n jsonNum) MarshalJSON() ([]byte, error) {
	f := float64(n)
	if math.IsNaN(f) || math.IsInf(f, 0) {
		return []byte("null"), nil
	}
	return []byte(strconv.FormatFloat(f, 'g', -1, 64)), nil
}

// UnmarshalJSON reads a number, or null as NaN.
func (n *jsonNum) UnmarshalJSON(b []byte) error {
	if string(b) == "null" {
		*n = jsonNum(math.NaN())
		return nil
	}
	f, err := strconv.ParseFloat(string(b), 64)
	if err != nil {
		return fmt.Errorf("assert: bad number %s in diff JSON: %w", b, err)
	}
	*n = jsonNum(f)
	return nil
}

func (n jsonNum) isNull() bool { return math.IsNaN(float64(n)) }

func jsonNumOrNull() jsonNum { return jsonNum(math.NaN()) }

func jsonRowOf(r RowRef) *jsonRow {
	out := &jsonRow{Key: r.Key, Cells: r.Cells}
	if r.Want >= 0 {
		w := r.Want + 1
		out.Want = &w
	}
	if r.Got >= 0 {
		g := r.Got + 1
		out.Got = &g
	}
	return out
}

// rowNumbers turns 0-based row indexes into the row numbers the JSON
// writes, counting from 1.
func rowNumbers(rows []int) []int {
	out := make([]int, len(rows))
	for i, r := range rows {
		out[i] = r + 1
	}
	return out
}

// rowIndexes undoes rowNumbers.
func rowIndexes(rows []int) []int {
	if rows == nil {
		return nil
	}
	out := make([]int, len(rows))
	for i, r := range rows {
		out[i] = r - 1
	}
	return out
}

func jsonRows(rs []RowRef) []jsonRow {
	out := make([]jsonRow, 0, len(rs))
	for _, r := range rs {
		out = append(out, *jsonRowOf(r))
	}
	return out
}

func jsonCellOf(c Cell) jsonCellText {
	return jsonCellText{Text: c.Text, Kind: kindName(c.Kind), Null: c.Null}
}

func kindName(k fixtures.Kind) string { return k.String() }

func orEmpty[T any](s []T) []T {
	if s == nil {
		return []T{}
	}
	return s
}

// DiffFromJSON reads a Diff back from what JSON wrote, for tools that keep
// diffs (run records, review pages) and render them later: every field
// JSON writes is restored, so JSON of the result gives the same bytes. Cell
// values (Cell.Value) are restored from their text for bool, int64,
// float64 and text cells; date, timestamp and decimal cells keep only
// their text. A delta written as null (an infinity) comes back as +Inf
// where the column names a row for it. Text that would not show as
// itself (control characters such as a terminal's escape sequences,
// bidirectional controls, bytes that are not UTF-8) is never taken raw:
// cell spellings and keys are quoted as Compare quotes them, and
// problems, hints, rules and types have such characters escaped (\x1b),
// so a renderer cannot write them to a terminal or a page.
func DiffFromJSON(b []byte) (*Diff, error) {
	var j jsonDiff
	if err := json.Unmarshal(b, &j); err != nil {
		return nil, fmt.Errorf("assert: reading diff JSON: %w", err)
	}
	d := &Diff{
		WantRows: j.WantRows, GotRows: j.GotRows, Match: MatchMode(j.Match), Keys: j.Keys,
		WantColumns: j.WantColumns, GotColumns: j.GotColumns, Compared: j.Compared, Problems: shownTexts(j.Problems),
		Missing:        RowList{Count: j.MissingRows, Rows: ListOf(rowsFromJSON(j.Missing)...)},
		Extra:          RowList{Count: j.ExtraRows, Rows: ListOf(rowsFromJSON(j.Extra)...)},
		Duplicates:     DuplicateList{WantKeys: j.DuplicateKeys.Want, GotKeys: j.DuplicateKeys.Got},
		CellsDiffering: j.CellsDiffering, RowsDiffering: j.RowsDiffering, Limit: j.Limit,
	}
	if d.Match == "" {
		d.Match = MatchByPosition
	}
	for _, s := range j.Schema {
		d.Schema = append(d.Schema, SchemaChange{Column: s.Column, Change: ChangeKind(s.Change), Want: printable.Text(s.Want), Got: printable.Text(s.Got)})
	}
	for _, c := range j.Columns {
		cs := ColumnSummary{Name: c.Name, Rule: printable.Text(c.Rule), Differing: c.Differing,
			MaxAbsAt: rowFromJSON(c.MaxAbsAt), MaxRelAt: rowFromJSON(c.MaxRelAt)}
		var err error
		if cs.WantType, err = fixtures.ParseType(c.WantType); err != nil {
			return nil, fmt.Errorf("assert: column %q in diff JSON: %w", c.Name, err)
		}
		if cs.GotType, err = fixtures.ParseType(c.GotType); err != nil {
			return nil, fmt.Errorf("assert: column %q in diff JSON: %w", c.Name, err)
		}
		switch {
		case !c.MaxAbs.isNull():
			cs.HasDelta, cs.MaxAbs = true, float64(c.MaxAbs)
		case c.MaxAbsAt != nil || !c.MaxRel.isNull():
			// A largest distance written as null beside a place or a
			// relative distance is an infinity, which JSON cannot
			// spell (JSON writes a relative distance only with a
			// distance).
			cs.HasDelta, cs.MaxAbs = true, math.Inf(1)
		}
		switch {
		case !c.MaxRel.isNull():
			cs.MaxRel = float64(c.MaxRel)
		case c.MaxRelAt != nil:
			cs.MaxRel = math.Inf(1)
		}
		d.Columns = append(d.Columns, cs)
	}
	var cells []CellDiff
	for _, c := range j.Cells {
		cd := CellDiff{Row: rowFromJSON(&c.Row), Column: c.Column}
		var err error
		if cd.Want, err = cellFromJSON(c.Want); err != nil {
			return nil, err
		}
		if cd.Got, err = cellFromJSON(c.Got); err != nil {
			return nil, err
		}
		switch {
		case !c.Abs.isNull():
			cd.Delta.Has, cd.Delta.Abs = true, float64(c.Abs)
			if !c.Rel.isNull() {
				cd.Delta.Rel = float64(c.Rel)
			}
		case infiniteDelta(cd.Want, cd.Got):
			cd.Delta = Delta{Has: true, Abs: math.Inf(1), Rel: math.Inf(1)}
		}
		if c.ULPs != nil {
			cd.Delta.ULPs, cd.Delta.HasULPs = *c.ULPs, true
		}
		cells = append(cells, cd)
	}
	d.Cells = ListOf(cells...)
	for _, k := range j.Duplicates {
		d.Duplicates.Keys = append(d.Duplicates.Keys, DuplicateKey{Side: Side(k.Side), Key: shownCells(k.Key), Count: k.Count, Rows: rowIndexes(k.Rows)})
	}
	d.Overview = overviewFromJSON(j.Overview)
	for _, jh := range j.Hints {
		h := Hint{Kind: HintKind(jh.Kind), Column: jh.Column, Text: printable.Text(jh.Text), Option: printable.Text(jh.Option), Flag: printable.Text(jh.Flag),
			Name: printable.Text(jh.Name), Suggest: printable.Text(jh.Suggest), Count: jh.Count}
		if jh.Factor != nil {
			h.Factor = float64(*jh.Factor)
		}
		if jh.Offset != nil {
			h.Offset = float64(*jh.Offset)
		}
		for i := range jh.Pairs {
			p := &jh.Pairs[i]
			h.Pairs = append(h.Pairs, NearMatch{Missing: rowFromJSON(&p.Missing), Extra: rowFromJSON(&p.Extra), Why: shownTexts(p.Why)})
		}
		d.Hints = append(d.Hints, h)
	}
	return d, nil
}

// infiniteDelta reports whether a null delta between two cells stands for
// an infinite one: both are numbers, neither NaN (which has no delta).
func infiniteDelta(w, g Cell) bool {
	isNum := func(c Cell) bool {
		f, ok := c.Value.(float64)
		_, isInt := c.Value.(int64)
		return !c.Null && (isInt || (ok && f == f))
	}
	return isNum(w) && isNum(g)
}

func rowFromJSON(r *jsonRow) RowRef {
	out := RowRef{Want: -1, Got: -1}
	if r == nil {
		return out
	}
	if r.Want != nil {
		out.Want = *r.Want - 1
	}
	if r.Got != nil {
		out.Got = *r.Got - 1
	}
	out.Key, out.Cells = shownCells(r.Key), shownCells(r.Cells)
	return out
}

func rowsFromJSON(rs []jsonRow) []RowRef {
	var out []RowRef
	for i := range rs {
		out = append(out, rowFromJSON(&rs[i]))
	}
	return out
}

// shownTexts is printable.Text of each sentence: text read from JSON may
// hold characters that a Diff made by Compare never shows raw (a
// terminal would obey an escape sequence), and every renderer writes
// these fields as they are.
func shownTexts(ss []string) []string {
	if ss == nil {
		return nil
	}
	out := make([]string, len(ss))
	for i, s := range ss {
		out[i] = printable.Text(s)
	}
	return out
}

// shownCells is printable.Name of each cell spelling: a spelling that
// does not show as itself is quoted, as Compare's spellings are.
func shownCells(ss []string) []string {
	if ss == nil {
		return nil
	}
	out := make([]string, len(ss))
	for i, s := range ss {
		out[i] = printable.Name(s)
	}
	return out
}

// cellFromJSON restores a cell from its literal spelling; a spelling
// that does not show as itself is quoted (its value stays the text).
func cellFromJSON(c jsonCellText) (Cell, error) {
	out := Cell{Text: printable.Name(c.Text), Null: c.Null}
	if err := out.Kind.UnmarshalText([]byte(c.Kind)); err != nil {
		return Cell{}, fmt.Errorf("assert: cell in diff JSON: %w", err)
	}
	if c.Null {
		return out, nil
	}
	switch out.Kind {
	case fixtures.KindBool:
		if v, err := fixtures.ParseBool(c.Text); err == nil {
			out.Value = v
		}
	case fixtures.KindInt64:
		if v, err := strconv.ParseInt(c.Text, 10, 64); err == nil {
			out.Value = v
		}
	case fixtures.KindFloat64:
		if v, err := strconv.ParseFloat(c.Text, 64); err == nil {
			out.Value = v
		}
	case fixtures.KindString, fixtures.KindCategory:
		out.Value = c.Text
		if strings.HasPrefix(c.Text, `"`) {
			if v, err := strconv.Unquote(c.Text); err == nil {
				out.Value = v
			}
		}
	}
	return out, nil
}
