package property

import (
	"iter"
	"slices"
	"strings"

	"github.com/leanovate/gopter"

	"github.com/proofsheet/proofsheet/fixtures"
)

// The shrink order, for a sample: drop rows (all of them, then halves,
// quarters, … down to single rows), drop columns, spell header names
// plainly, spell cells plainly, make values simpler (see values.go),
// number sequences anew. Each stream is lazy, so a check runs the
// function only on the candidates it needs; a greedy search takes the
// first candidate that still fails and starts again from it.

// shrinkStream returns the candidates smaller than s, in shrink order.
func shrinkStream(s *Sample) func() (*Sample, bool) {
	n := len(s.rows)
	stage := 0
	k, start := n, 0 // row chunk size and position
	j := 0           // column
	ci, cj := 0, 0   // cell
	var kept []int   // records, for values
	vk, vf := 0, 0   // value: index into kept, schema column
	var pending []*Sample
	return func() (*Sample, bool) {
		for {
			switch stage {
			case 0: // rows
				if k < 1 {
					stage++
					continue
				}
				if start >= n {
					k /= 2
					start = 0
					continue
				}
				end := min(start+k, n)
				rows := make([]rawRow, 0, n-(end-start))
				rows = append(append(rows, s.rows[:start]...), s.rows[end:]...)
				start += k
				return s.derive(s.cols, rows), true
			case 1: // columns
				if len(s.cols) < 2 || j >= len(s.cols) {
					stage++
					j = 0
					continue
				}
				d := j
				j++
				return s.withoutColumn(d), true
			case 2: // header names
				if j >= len(s.cols) {
					stage++
					continue
				}
				d := j
				j++
				if s.cols[d].name == s.cols[d].plain {
					continue
				}
				cols := slices.Clone(s.cols)
				cols[d].name = cols[d].plain
				return s.derive(cols, s.rows), true
			case 3: // cells
				if ci >= len(s.rows) {
					stage++
					continue
				}
				i, jj := ci, cj
				if cj++; cj >= len(s.cols) {
					cj = 0
					ci++
				}
				if s.rows[i].rec < 0 {
					continue // a row that is no record has no plain spelling
				}
				c := s.rows[i].cells[jj]
				if peeled, ok := peelEdge(c); ok {
					// First take off the edge space laid over another mess;
					// the plain spelling is offered on the next pass.
					return s.withCell(i, jj, peeled), true
				}
				p := plainCell(c, s.colType(jj))
				if p == c {
					continue
				}
				return s.withCell(i, jj, p), true
			case 4: // values
				if len(pending) > 0 {
					c := pending[0]
					pending = pending[1:]
					return c, true
				}
				if kept == nil {
					kept = s.keptRecords()
					if s.cfg == nil {
						kept = kept[:0]
					}
				}
				if vk >= len(kept) {
					stage++
					vf = 0
					continue
				}
				k, f := kept[vk], vf
				if vf++; vf >= len(s.Schema) {
					vf = 0
					vk++
				}
				if !s.hasRawColumn(f) {
					continue
				}
				for _, v := range s.valueCandidates(k, f) {
					pending = append(pending, s.withValue(k, f, v))
				}
			case 5: // sequences numbered anew
				if s.cfg == nil || vf >= len(s.Schema) {
					stage++
					continue
				}
				f := vf
				vf++
				if c := s.renumbered(f); c != nil {
					return c, true
				}
			default:
				return nil, false
			}
		}
	}
}

// hasRawColumn reports whether schema column f is among the raw columns.
func (s *Sample) hasRawColumn(f int) bool {
	for _, c := range s.cols {
		if c.field == f {
			return true
		}
	}
	return false
}

// withCell returns s with cell (i, j) replaced.
func (s *Sample) withCell(i, j int, c Messy) *Sample {
	rows := slices.Clone(s.rows)
	cells := slices.Clone(rows[i].cells)
	cells[j] = c
	rows[i].cells = cells
	return s.derive(s.cols, rows)
}

// peelEdge takes the edge space off a cell whose mess has edge space on
// top of another mess.
func peelEdge(c Messy) (Messy, bool) {
	parts := c.Mess.Parts()
	if len(parts) < 2 || parts[len(parts)-1] != MessEdgeSpace {
		return c, false
	}
	raw := strings.TrimFunc(c.Raw, func(r rune) bool { return r == ' ' || r == '\t' || r == '\u00a0' })
	if raw == c.Raw || raw == "" {
		return c, false
	}
	rest := parts[0]
	for _, p := range parts[1 : len(parts)-1] {
		rest = rest.and(p)
	}
	return Messy{Raw: raw, Clean: c.Clean, Mess: rest}, true
}

// withoutColumn returns s without raw column d.
func (s *Sample) withoutColumn(d int) *Sample {
	cols := slices.Delete(slices.Clone(s.cols), d, d+1)
	w := len(cols)
	cells := make([]Messy, len(s.rows)*w)
	rows := make([]rawRow, len(s.rows))
	for i, r := range s.rows {
		row := cells[i*w : (i+1)*w : (i+1)*w]
		copy(row, r.cells[:d])
		copy(row[d:], r.cells[d+1:])
		rows[i] = r
		rows[i].cells = row
		if r.cut > 0 && d < r.cut {
			rows[i].cut = max(r.cut-1, 1)
		}
	}
	return s.derive(cols, rows)
}

// SampleShrinker is the gopter.Shrinker of *Sample values: it offers the
// candidates in the order described at Shrink.
func SampleShrinker(v any) gopter.Shrink {
	next := shrinkStream(v.(*Sample))
	return func() (any, bool) {
		s, ok := next()
		if !ok {
			return nil, false
		}
		return s, true
	}
}

// maxShrinkSteps bounds a standalone shrink, as gopter's MaxShrinkCount
// bounds its own.
const maxShrinkSteps = 10000

// Shrink returns the smallest sample it finds for which fails still
// reports true, starting from s (which should fail), and the number of
// steps taken. It tries, in order: dropping rows (all, then halves,
// quarters, … single rows), dropping columns, spelling header names
// plainly, spelling cells plainly, and making each value simpler within
// its column's rules (numbers toward 0 or the nearest bound, then 1,
// whole numbers and fewer decimals; strings shorter; dates toward
// 1970-01-01; levels and allowed values toward the first; false), taking
// the first candidate that fails and starting again from it until none
// does. A simpler value keeps its cell's mess when it can carry it and
// changes the columns derived from it.
func Shrink(s *Sample, fails func(*Sample) bool) (*Sample, int) {
	return greedy(s, shrinkStream, fails)
}

// greedy takes the first failing candidate of stream(v) and starts again
// from it until none fails, at most maxShrinkSteps times.
func greedy[T any](v T, stream func(T) func() (T, bool), fails func(T) bool) (T, int) {
	steps := 0
	for steps < maxShrinkSteps {
		next := stream(v)
		found := false
		for c, ok := next(); ok; c, ok = next() {
			if fails(c) {
				v, found = c, true
				steps++
				break
			}
		}
		if !found {
			break
		}
	}
	return v, steps
}

// ShrinkTable shrinks any table for which fails reports true by dropping
// rows (all, halves, … single rows) and columns, and returns the smallest
// failing table found and the number of steps. It knows no clean values,
// so it leaves cells as they are; use Shrink for generated samples.
func ShrinkTable(t *fixtures.Table, fails func(*fixtures.Table) bool) (*fixtures.Table, int) {
	steps := 0
	for steps < maxShrinkSteps {
		c, ok := firstFailing(t, fails)
		if !ok {
			break
		}
		t = c
		steps++
	}
	return t, steps
}

func firstFailing(t *fixtures.Table, fails func(*fixtures.Table) bool) (*fixtures.Table, bool) {
	n := t.NumRows()
	for k := n; k >= 1; k /= 2 {
		for start := 0; start < n; start += k {
			end := min(start+k, n)
			idx := make([]int, 0, n-(end-start))
			for i := 0; i < n; i++ {
				if i < start || i >= end {
					idx = append(idx, i)
				}
			}
			c, err := t.Take(idx)
			if err == nil && fails(c) {
				return c, true
			}
		}
	}
	if t.NumCols() > 1 {
		for _, name := range t.Names() {
			c, err := t.Drop(name)
			if err == nil && fails(c) {
				return c, true
			}
		}
	}
	return nil, false
}

// fileStream returns the candidates smaller than f: the sample's row
// candidates, then the style made plain (UTF-8, comma, minimal quoting,
// LF, one at a time), then the sample's other candidates, each written in
// the file's style. Candidates that cannot be written are skipped.
func fileStream(f *File) func() (*File, bool) {
	next := shrinkStream(f.Sample)
	rowsLeft := len(f.Sample.rows) // the sample stream's first candidates are row drops
	var rowCands int
	for k := rowsLeft; k >= 1; k /= 2 {
		rowCands += (rowsLeft + k - 1) / k
	}
	styles := plainerStyles(f.Style)
	taken := 0
	return func() (*File, bool) {
		for {
			if taken == rowCands && len(styles) > 0 {
				st := styles[0]
				styles = styles[1:]
				data, err := f.Sample.CSV(st)
				if err != nil {
					continue
				}
				return &File{Data: data, Style: st, Sample: f.Sample, root: f.origin()}, true
			}
			s, ok := next()
			if !ok {
				return nil, false
			}
			taken++
			data, err := s.CSV(f.Style)
			if err != nil {
				continue
			}
			return &File{Data: data, Style: f.Style, Sample: s, root: f.origin()}, true
		}
	}
}

// plainerStyles returns st with one of its parts made plain, for each part
// that is not.
func plainerStyles(st CSVStyle) []CSVStyle {
	var out []CSVStyle
	if st.Encoding != fixtures.EncodingUTF8 {
		c := st
		c.Encoding = fixtures.EncodingUTF8
		out = append(out, c)
	}
	if st.Delimiter != ',' {
		c := st
		c.Delimiter = ','
		out = append(out, c)
	}
	if st.Quoting != QuoteMinimal {
		c := st
		c.Quoting = QuoteMinimal
		out = append(out, c)
	}
	if st.LineEnding != LF {
		c := st
		c.LineEnding = LF
		out = append(out, c)
	}
	return out
}

// FileShrinker is the gopter.Shrinker of *File values: the sample shrinks
// as SampleShrinker does and the style towards UTF-8, comma, minimal
// quoting and LF.
func FileShrinker(v any) gopter.Shrink {
	next := fileStream(v.(*File))
	return func() (any, bool) {
		f, ok := next()
		if !ok {
			return nil, false
		}
		return f, true
	}
}

// Smaller returns the candidates smaller than f in the order ShrinkFile
// tries them (FileShrinker's order), lazily: rows dropped, the CSV style
// made plain, columns dropped, header names and cells spelled plainly,
// values made simpler. A tool that runs its own search — running
// candidates in parallel, say, and taking the first that fails in this
// order — ranges over it; each candidate is a *File whose Data are the
// bytes to feed.
func (f *File) Smaller() iter.Seq[*File] {
	return func(yield func(*File) bool) {
		next := fileStream(f)
		for c, ok := next(); ok; c, ok = next() {
			if !yield(c) {
				return
			}
		}
	}
}

// ShrinkFile is Shrink for a generated file.
func ShrinkFile(f *File, fails func(*File) bool) (*File, int) {
	return greedy(f, fileStream, fails)
}
