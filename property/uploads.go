package property

import (
	"fmt"
	"math/big"
	"slices"
	"time"

	"github.com/proofsheet/proofsheet/fixtures"
)

// Upload messes: a sample can be a series of files (re-uploads over
// overlapping time windows, a column added halfway) and each file can end
// cut short, repeat its header, end with a total row or hold blank lines.
// The rows these add spell no record (rec -1), so Clean stays the truth.

func shuffleRows(r *rng, rows []rawRow) {
	for i := len(rows) - 1; i > 0; i-- {
		j := r.intn(i + 1)
		rows[i], rows[j] = rows[j], rows[i]
	}
}

// timeField returns the first date or timestamp column of the schema
// among the raw columns, or -1.
func (s *Sample) timeField() int {
	for j, c := range s.cols {
		if c.field >= 0 {
			k := s.Schema[c.field].Type.Kind()
			if k == fixtures.KindDate || k == fixtures.KindTimestamp {
				return j
			}
		}
	}
	return -1
}

// splitUploads orders the rows by the first time column (when there is
// one) and splits them into c.uploads files of consecutive windows; each
// file after the first covers again the last rows of the one before
// (MessReupload), and with MessAddedColumn the files from the middle of
// the series on have a column the earlier ones lack.
func (s *Sample) splitUploads(sr, root *rng, c *config) {
	if tj := s.timeField(); tj >= 0 {
		slices.SortStableFunc(s.rows, func(a, b rawRow) int {
			ta, oka := a.cells[tj].Clean.(time.Time)
			tb, okb := b.cells[tj].Clean.(time.Time)
			switch {
			case oka && okb:
				return ta.Compare(tb)
			case oka:
				return -1
			case okb:
				return 1
			}
			return 0
		})
	}
	n := len(s.rows)
	k := c.uploads
	var out []rawRow
	for u := 0; u < k; u++ {
		lo, hi := u*n/k, (u+1)*n/k
		if u > 0 && c.overlap > 0 {
			prevLo := (u - 1) * n / k
			again := int(float64(lo-prevLo)*c.overlap + 0.5)
			for i := lo - again; i < lo; i++ {
				r := s.rows[i]
				r.cells = slices.Clone(r.cells)
				r.mess, r.upload = MessReupload, u
				out = append(out, r)
			}
		}
		start := len(out)
		for i := lo; i < hi; i++ {
			r := s.rows[i]
			r.upload = u
			out = append(out, r)
		}
		if c.shuffle {
			shuffleRows(sr, out[start:])
		}
	}
	s.rows = out
	if c.allowed[MessAddedColumn] {
		s.addColumn(root, c, k/2)
	}
}

// addColumn adds a text column, not in the schema, to the files from
// upload from on; the rows of earlier files hold null in it.
func (s *Sample) addColumn(root *rng, c *config, from int) {
	name := ""
	for n := 0; name == ""; n++ {
		cand := fmt.Sprintf("extra_%d", n+1)
		if n < len(extraNames) {
			cand = extraNames[len(extraNames)-1-n]
		}
		if s.Schema.Index(cand) < 0 && !slices.ContainsFunc(s.cols, func(rc rawCol) bool { return rc.plain == cand }) {
			name = cand
		}
	}
	g := newColGen(fixtures.Col(name, fixtures.String), c, nil)
	r := root.split()
	s.cols = append(s.cols, rawCol{name: name, plain: name, field: -1, from: from})
	for i := range s.rows {
		var m Messy
		if s.rows[i].upload >= from {
			m = g.next(r)
		}
		s.rows[i].cells = append(slices.Clip(s.rows[i].cells), m)
	}
}

// Words for a summary row, by language. Common practice, no published
// source.
var totalWords = map[string]string{"en": "Total", "de": "Summe", "fr": "Total", "sv": "Summa", "ja": "合計"}

// uploadMess gives each file the upload messes asked for, each with
// chance c.uploadRate: a repeated header, blank lines, a total row, and
// a last line cut short.
func (s *Sample) uploadMess(sr, root *rng, c *config) {
	want := func(m Mess) bool { return c.allowed[m] }
	if !want(MessRepeatedHeader) && !want(MessBlankLines) && !want(MessTotalRow) && !want(MessCutShort) {
		return
	}
	var out []rawRow
	for u := 0; u < c.uploads; u++ {
		var rows []rawRow
		for _, r := range s.rows {
			if r.upload == u {
				rows = append(rows, r)
			}
		}
		if want(MessRepeatedHeader) && len(rows) > 1 && sr.chance(c.uploadRate) {
			at := 1 + sr.intn(len(rows)-1)
			rows = slices.Insert(rows, at, s.headerRow(u))
		}
		if want(MessBlankLines) && len(rows) > 0 && sr.chance(c.uploadRate) {
			for b := 1 + sr.intn(3); b > 0; b-- {
				at := 1 + sr.intn(len(rows))
				row := rawRow{rec: -1, mess: MessBlankLines, upload: u, cells: make([]Messy, len(s.cols))}
				// Half empty lines, half lines of empty fields (,,,); with
				// one column a line of empty fields is a null value, so
				// only empty lines.
				row.fileOnly = len(s.cols) == 1 || sr.next()&1 == 1
				rows = slices.Insert(rows, at, row)
			}
		}
		if want(MessTotalRow) && len(rows) > 0 && sr.chance(c.uploadRate) {
			rows = append(rows, s.totalRow(rows, u))
		}
		if want(MessCutShort) && len(rows) > 0 && sr.chance(c.uploadRate) {
			// The last line with text is cut; blank lines after it go.
			last := len(rows) - 1
			for last > 0 && !hasText(rows[last]) {
				last--
			}
			if hasText(rows[last]) {
				rows[last] = s.cutRow(sr, rows[last])
				rows = rows[:last+1]
			}
		}
		out = append(out, rows...)
	}
	s.rows = out
}

// headerRow returns the header line of upload u as a row.
func (s *Sample) headerRow(u int) rawRow {
	cells := make([]Messy, len(s.cols))
	for j, c := range s.cols {
		if u >= c.from {
			cells[j] = Messy{Raw: c.name}
		}
	}
	return rawRow{rec: -1, cells: cells, mess: MessRepeatedHeader, upload: u}
}

// totalRow returns a summary row of the data rows: "Total" (in the first
// text column's locale) in the first text column, the sums of the number
// columns, nothing else.
func (s *Sample) totalRow(rows []rawRow, u int) rawRow {
	cells := make([]Messy, len(s.cols))
	label := -1
	for j, c := range s.cols {
		if c.field < 0 {
			if label < 0 && u >= c.from {
				label = j
			}
			continue
		}
		t := s.Schema[c.field].Type
		switch {
		case t.Kind().IsText() && (label < 0 || s.cols[label].field < 0):
			label = j
		case t.Kind().IsNumeric():
			sum := new(big.Rat)
			any := false
			for _, r := range rows {
				if r.rec < 0 {
					continue
				}
				if v, ok := ratOf(r.cells[j].Clean); ok {
					sum.Add(sum, v)
					any = true
				}
			}
			if any {
				cells[j] = Messy{Raw: sumText(sum, t)}
			}
		}
	}
	if label < 0 {
		label = 0
	}
	word := totalWords["en"]
	if f := s.cols[label].field; f >= 0 && s.cfg != nil {
		word = totalWords[s.cfg.cols[f].lc.Tag[:2]]
	} else if s.cfg != nil {
		word = totalWords[s.cfg.locale.Tag[:2]]
	}
	cells[label] = Messy{Raw: word}
	return rawRow{rec: -1, cells: cells, mess: MessTotalRow, upload: u}
}

// sumText writes an exact sum plainly in the column's type.
func sumText(r *big.Rat, t fixtures.Type) string {
	switch t.Kind() {
	case fixtures.KindInt64:
		return r.Num().String()
	case fixtures.KindDecimal:
		return r.FloatString(t.Scale())
	}
	f, _ := r.Float64()
	return fixtures.FormatFloat(f)
}

// hasText reports whether a row has a cell with text.
func hasText(r rawRow) bool {
	if r.fileOnly {
		return false
	}
	for _, c := range r.cells {
		if c.Raw != "" {
			return true
		}
	}
	return false
}

// cutRow returns the row cut inside one of its cells that has text: the
// cells before it, the start of that one (at least a byte, and not all of
// it when it has two or more), none after. It spells no record.
func (s *Sample) cutRow(r *rng, row rawRow) rawRow {
	var texts []int
	for j, c := range row.cells {
		if c.Raw != "" {
			texts = append(texts, j)
		}
	}
	at := texts[r.intn(len(texts))]
	cells := make([]Messy, len(row.cells))
	copy(cells, row.cells[:at])
	raw := row.cells[at].Raw
	k := len(raw)
	if k >= 2 {
		k = 1 + r.intn(k-1)
		for k > 1 && raw[k]&0xC0 == 0x80 {
			k-- // keep whole characters
		}
	}
	cells[at] = Messy{Raw: raw[:k]}
	return rawRow{rec: -1, cells: cells, mess: MessCutShort, upload: row.upload, cut: at + 1}
}

// NumUploads returns the number of files the sample is a series of (1
// unless a re-upload series was asked for).
func (s *Sample) NumUploads() int {
	n := 1
	for _, r := range s.rows {
		n = max(n, r.upload+1)
	}
	if s.cfg != nil {
		n = max(n, s.cfg.uploads)
	}
	return n
}

// Uploads returns the files of a series as samples of their own, in
// order: each holds the raw rows of one file and only the columns that
// file has (a column added halfway is missing from the earlier ones). They
// share the sample's records, so each one's Clean holds the records it
// carries; the whole sample's Clean is the truth the series stands for.
// A sample that is no series gives itself.
func (s *Sample) Uploads() []*Sample {
	n := s.NumUploads()
	if n == 1 {
		return []*Sample{s}
	}
	out := make([]*Sample, n)
	for u := range out {
		var keep []int
		var cols []rawCol
		for j, c := range s.cols {
			if u >= c.from {
				keep = append(keep, j)
				cols = append(cols, c)
			}
		}
		var rows []rawRow
		for _, r := range s.rows {
			if r.upload != u {
				continue
			}
			cells := make([]Messy, len(keep))
			for i, j := range keep {
				cells[i] = r.cells[j]
			}
			r.cells = cells
			r.cut = min(r.cut, len(keep)) // an added column is the last
			rows = append(rows, r)
		}
		out[u] = s.derive(cols, rows)
	}
	return out
}

// UploadCSVs writes each file of the series (see Uploads) as CSV in the
// given style.
func (s *Sample) UploadCSVs(style CSVStyle) ([][]byte, error) {
	var out [][]byte
	for i, u := range s.Uploads() {
		data, err := u.CSV(style)
		if err != nil {
			return nil, fmt.Errorf("upload %d: %w", i+1, err)
		}
		out = append(out, data)
	}
	return out, nil
}
