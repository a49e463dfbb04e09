package assert

import (
	"encoding/json"
	"math"
	"strconv"

	"github.com/proofsheet/proofsheet/fixtures"
)

// JSON writes the Diff as an indented JSON object, for tools. The fields
// equal, want_rows, got_rows, missing_rows, extra_rows, cells_differing,
// columns[] {name, differing, max_abs_delta, max_rel_delta} and schema[]
// {column, change, want, got} are fixed; the others (match, keys,
// rows_differing, problems, duplicate keys, the listed cells and rows)
// complete the picture. Lists are never null, and a delta that is not a
// finite number (an infinity) is written as null. The output is the same
// for the same Diff.
func (d *Diff) JSON() ([]byte, error) {
	if d == nil {
		d = &Diff{}
	}
	out := jsonDiff{
		Equal:          d.Equal(),
		Match:          string(d.Match),
		Keys:           orEmpty(d.Keys),
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
		Cells:          []jsonCell{},
		Missing:        jsonRows(d.Missing.Rows),
		Extra:          jsonRows(d.Extra.Rows),
		Duplicates:     []jsonDup{},
		Limit:          d.Limit,
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
	for _, c := range d.Cells {
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
		out.Cells = append(out.Cells, jc)
	}
	for _, k := range d.Duplicates.Keys {
		out.Duplicates = append(out.Duplicates, jsonDup{Side: string(k.Side), Key: orEmpty(k.Key), Count: k.Count, Rows: orEmpty(k.Rows)})
	}
	return json.MarshalIndent(out, "", "  ")
}

type jsonDiff struct {
	Equal          bool          `json:"equal"`
	Match          string        `json:"match"`
	Keys           []string      `json:"keys"`
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
	Limit          int           `json:"limit"`
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

func jsonNumOrNull() jsonNum { return jsonNum(math.NaN()) }

func jsonRowOf(r RowRef) *jsonRow {
	out := &jsonRow{Key: r.Key, Cells: r.Cells}
	if r.Want >= 0 {
		w := r.Want
		out.Want = &w
	}
	if r.Got >= 0 {
		g := r.Got
		out.Got = &g
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
