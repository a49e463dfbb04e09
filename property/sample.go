package property

import (
	"fmt"
	"slices"
	"strings"
	"sync"

	"github.com/proofsheet/proofsheet/fixtures"
)

// Sample is one generated table in three forms, with the cells behind them:
//
//   - Raw: the table as a chain reads it from a messy file, every column
//     string (what fixtures.ReadFile with fixtures.AllText gives for the
//     file Sample.CSV writes): messy spellings, null tokens, sentinels,
//     duplicate rows, and extra, missing or shuffled columns and rows as
//     the Options ask.
//   - Plain: the same rows and columns with every cell in its plain
//     spelling (see Spell) and header names as the schema has them: the
//     mess of spelling removed, the mess of structure kept.
//   - Clean: the table the raw file stands for, typed by the schema, one
//     row per distinct record in the order they were made: no duplicates,
//     no extra columns, nothing missing, nothing shuffled.
//
// A Sample never changes; the methods that shrink or shuffle return new
// ones sharing what they can.
type Sample struct {
	// Seed made the sample: Generate with the same schema, row count,
	// seed and options makes it again (before any shrinking).
	Seed int64
	// Schema is the intended schema, that of Clean.
	Schema fixtures.Schema

	cols []rawCol
	rows []rawRow
	recs [][]any // clean values of each record, in schema order
	root *Sample // the generated sample this one was shrunk or derived from; nil for that one
	cfg  *config // the options it was generated with; nil for a sample built by hand

	rawOnce, plainOnce, cleanOnce, rankOnce sync.Once
	raw, plain, clean                       *fixtures.Table
	rank                                    map[int]int // record → its row in Clean
}

// rawCol is one column of the raw table.
type rawCol struct {
	name  string // as the raw header spells it
	plain string // the schema's name, or an extra column's name
	field int    // index into Schema, or -1 for an extra column
	from  int    // the first upload of a series that has it (added-column)
}

// rawRow is one row of the raw table.
type rawRow struct {
	rec    int     // the record it spells; duplicates share one; -1 for none
	cells  []Messy // one per raw column
	mess   Mess    // a mess of the whole row (an upload mess), or none
	upload int     // the file of a series it is in
	// fileOnly: an empty line, which CSV readers skip, so Raw lacks it
	fileOnly bool
	// cut: the fields a line cut short has (0: a whole line)
	cut int
}

// Generate makes one sample of the given number of raw rows (duplicates
// included) deterministically from seed.
func Generate(schema fixtures.Schema, rows int, seed int64, opts Options) (*Sample, error) {
	c, err := opts.compile(schema)
	if err != nil {
		return nil, err
	}
	if rows < 0 {
		return nil, fmt.Errorf("property: %d rows", rows)
	}
	if err := c.checkCapacity(schema, rows, "the rows asked for,"); err != nil {
		return nil, err
	}
	return generate(schema, rows, seed, c), nil
}

// Names of extra columns, invented datalogger fields; more are extra_6,
// extra_7, ….
var extraNames = []string{"logger_id", "battery_v", "comment", "firmware", "uploaded_by"}

func generate(schema fixtures.Schema, n int, seed int64, c *config) *Sample {
	return generateFrom(schema, n, seed, newRng(seed), c)
}

// generateFrom makes a sample drawing from root; seed is recorded as the
// sample's.
func generateFrom(schema fixtures.Schema, n int, seed int64, root *rng, c *config) *Sample {
	sr := root.split() // structure: columns, duplicates, order
	gens := make([]*colGen, len(schema))
	crs := make([]*rng, len(schema))
	for j, f := range schema {
		gens[j] = newColGen(f, c, c.cols[j])
		crs[j] = root.split()
	}
	s := &Sample{Seed: seed, Schema: append(fixtures.Schema(nil), schema...), cfg: c}

	// Columns: drop some, add some, maybe shuffle.
	keep := make([]bool, len(schema))
	for j := range keep {
		keep[j] = true
	}
	if c.missing > 0 && len(schema) > 1 {
		drop := sr.intn(min(c.missing, len(schema)-1) + 1)
		for k := 0; k < drop; k++ {
			keep[sr.intn(len(schema))] = false
		}
	}
	for j, f := range schema {
		if keep[j] {
			s.cols = append(s.cols, rawCol{name: f.Name, plain: f.Name, field: j})
		}
	}
	var extraGens []*colGen
	var extraRs []*rng
	if c.extra > 0 {
		add := sr.intn(c.extra + 1)
		k := 0
		for n := 0; len(extraGens) < add; n++ {
			name := fmt.Sprintf("extra_%d", n+1)
			if n < len(extraNames) {
				name = extraNames[n]
			}
			if schema.Index(name) >= 0 {
				continue
			}
			pos := sr.intn(len(s.cols) + 1)
			s.cols = slices.Insert(s.cols, pos, rawCol{name: name, plain: name, field: -1 - k})
			extraGens = append(extraGens, newColGen(fixtures.Col(name, fixtures.String), c, nil))
			extraRs = append(extraRs, root.split())
			k++
		}
	}
	if c.shuffleCols {
		for i := len(s.cols) - 1; i > 0; i-- {
			j := sr.intn(i + 1)
			s.cols[i], s.cols[j] = s.cols[j], s.cols[i]
		}
	}
	if c.headerMess {
		for i := range s.cols {
			if sr.chance(0.5) {
				v := headerVariant(sr, s.cols[i].plain)
				if !slices.ContainsFunc(s.cols, func(rc rawCol) bool { return rc.name == v }) && (c.fits == nil || c.fits(v)) {
					s.cols[i].name = v
				}
			}
		}
	}
	// Extra columns were numbered -1, -2, … in order of creation.
	extraOf := func(field int) int { return -1 - field }

	// Rows. Records with derived columns keep their numbers as fractions
	// too, for the fast path of derive.
	var fast []frac
	for _, cc := range c.cols {
		if cc.derive != nil {
			fast = make([]frac, len(schema))
			break
		}
	}
	w := len(s.cols)
	cells := make([]Messy, n*w)
	recCells := make([]Messy, len(schema))
	cleanAll := make([]any, 0, n*len(schema))
	s.rows = make([]rawRow, 0, n)
	for len(s.rows) < n {
		i := len(s.rows)
		row := cells[i*w : (i+1)*w : (i+1)*w]
		if len(s.rows) > 0 && sr.chance(c.dupRate) {
			src := s.rows[sr.intn(len(s.rows))]
			copy(row, src.cells)
			if c.respell && sr.chance(0.5) {
				for j, rc := range s.cols {
					if rc.field >= 0 {
						row[j] = gens[rc.field].respell(crs[rc.field], row[j])
					}
				}
			}
			s.rows = append(s.rows, rawRow{rec: src.rec, cells: row})
			continue
		}
		start := len(cleanAll)
		cleanAll = cleanAll[:start+len(schema)]
		rec := cleanAll[start:]
		for _, j := range c.order {
			if c.cols[j].derive != nil {
				recCells[j] = gens[j].derived(crs[j], rec, fast)
			} else {
				recCells[j] = gens[j].next(crs[j])
			}
			rec[j] = recCells[j].Clean
			if fast != nil {
				fast[j] = frac{}
				if rec[j] != nil && schema[j].Type.Kind().IsNumeric() && !recCells[j].Mess.Has(MessExtreme) {
					fast[j] = fracOf(&gens[j].tmp)
				}
			}
		}
		s.recs = append(s.recs, cleanAll[start:len(cleanAll):len(cleanAll)])
		for j, rc := range s.cols {
			if rc.field >= 0 {
				row[j] = recCells[rc.field]
			} else {
				e := extraOf(rc.field)
				row[j] = extraGens[e].next(extraRs[e])
			}
		}
		s.rows = append(s.rows, rawRow{rec: len(s.recs) - 1, cells: row})
	}
	if c.uploads > 1 {
		s.splitUploads(sr, root, c)
	} else if c.shuffle {
		shuffleRows(sr, s.rows)
	}
	s.uploadMess(sr, root, c)
	// Extra columns need no schema index from here on.
	for i := range s.cols {
		if s.cols[i].field < 0 {
			s.cols[i].field = -1
		}
	}
	return s
}

// headerVariant spells a column name with a case or space variant.
func headerVariant(r *rng, name string) string {
	switch r.intn(4) {
	case 0:
		return strings.ToUpper(name)
	case 1:
		return swapFirst(name)
	case 2:
		return " " + name
	}
	return name + " "
}

// NumRows returns the number of raw rows.
func (s *Sample) NumRows() int { return len(s.rows) }

// NumCols returns the number of raw columns.
func (s *Sample) NumCols() int { return len(s.cols) }

// Names returns the raw header names in order.
func (s *Sample) Names() []string {
	out := make([]string, len(s.cols))
	for i, c := range s.cols {
		out[i] = c.name
	}
	return out
}

// Field returns the schema index of raw column j, or -1 for a column the
// schema does not have.
func (s *Sample) Field(j int) int { return s.cols[j].field }

// Cell returns the raw cell at row i, column j.
func (s *Sample) Cell(i, j int) Messy { return s.rows[i].cells[j] }

// Record returns the index of the Clean row that raw row i spells; the
// rows of a duplicate share one; -1 for a row that spells no record (a
// repeated header, a total row, a blank line, a line cut short). After shrinking, records left without a
// raw row are not in Clean, and the index counts only those kept.
func (s *Sample) Record(i int) int {
	s.rankOnce.Do(func() {
		s.rank = make(map[int]int, len(s.recs))
		for k, r := range s.keptRecords() {
			s.rank[r] = k
		}
	})
	if s.rows[i].rec < 0 {
		return -1
	}
	return s.rank[s.rows[i].rec]
}

// Duplicates returns the number of raw rows that repeat an earlier row's
// record.
func (s *Sample) Duplicates() int { return len(s.rows) - len(s.keptRecords()) }

// MessCounts counts the cells of each single mess (compound messes count
// once for each part), and the rows of each upload mess.
func (s *Sample) MessCounts() map[Mess]int {
	out := map[Mess]int{}
	for _, r := range s.rows {
		if r.mess != MessNone {
			out[r.mess]++
		}
		for _, c := range r.cells {
			for _, p := range c.Mess.Parts() {
				out[p]++
			}
		}
	}
	return out
}

// colType returns the type of raw column j's clean values.
func (s *Sample) colType(j int) fixtures.Type {
	if f := s.cols[j].field; f >= 0 {
		return s.Schema[f].Type
	}
	return fixtures.String
}

func (s *Sample) textSchema(plainNames bool) fixtures.Schema {
	sc := make(fixtures.Schema, len(s.cols))
	for j, c := range s.cols {
		name := c.name
		if plainNames {
			name = c.plain
		}
		sc[j] = fixtures.Col(name, fixtures.String)
	}
	return sc
}

func mustBuild(b *fixtures.Builder) *fixtures.Table {
	t, err := b.Build()
	if err != nil {
		// The generators only make values their column type takes.
		panic(fmt.Sprintf("property: internal error building a generated table: %v", err))
	}
	return t
}

// Raw returns the raw table: string columns named as the raw header
// spells them, null where the raw cell is null (see Messy).
func (s *Sample) Raw() *fixtures.Table {
	s.rawOnce.Do(func() {
		b := fixtures.NewBuilder(s.textSchema(false))
		vals := make([]any, len(s.cols))
		for _, r := range s.rows {
			if r.fileOnly {
				continue
			}
			for j, c := range r.cells {
				if c.IsNull() {
					vals[j] = nil
				} else {
					vals[j] = c.Raw
				}
			}
			b.Row(vals...)
		}
		s.raw = mustBuild(b)
	})
	return s.raw
}

// Plain returns the raw rows and columns with every cell in its plain
// spelling and the schema's header names: string columns, null where the
// clean value is null. Rows that spell no record (a repeated header, a
// total row) stay as they are.
func (s *Sample) Plain() *fixtures.Table {
	s.plainOnce.Do(func() {
		b := fixtures.NewBuilder(s.textSchema(true))
		vals := make([]any, len(s.cols))
		types := make([]fixtures.Type, len(s.cols))
		for j := range s.cols {
			types[j] = s.colType(j)
		}
		for _, r := range s.rows {
			if r.fileOnly {
				continue
			}
			for j, c := range r.cells {
				if p, ok := Spell(c.Clean, types[j]); ok {
					vals[j] = p
				} else if r.rec < 0 && !c.IsNull() {
					vals[j] = c.Raw // a row that is no record stays as it is
				} else {
					vals[j] = nil
				}
			}
			b.Row(vals...)
		}
		s.plain = mustBuild(b)
	})
	return s.plain
}

// keptRecords returns the records that still have a raw row, ascending.
func (s *Sample) keptRecords() []int {
	seen := make([]bool, len(s.recs))
	for _, r := range s.rows {
		if r.rec >= 0 {
			seen[r.rec] = true
		}
	}
	out := make([]int, 0, len(s.recs))
	for i, ok := range seen {
		if ok {
			out = append(out, i)
		}
	}
	return out
}

// Clean returns the table the raw rows stand for, typed by Schema: one row
// per distinct record, in the order the records were made.
func (s *Sample) Clean() *fixtures.Table {
	s.cleanOnce.Do(func() {
		b := fixtures.NewBuilder(s.Schema)
		for _, i := range s.keptRecords() {
			b.Row(s.recs[i]...)
		}
		s.clean = mustBuild(b)
	})
	return s.clean
}

// String returns the raw table as a literal table when it is small (at most
// 20 rows and 12 columns), else a one-line summary.
func (s *Sample) String() string {
	if len(s.rows) <= 20 && len(s.cols) <= 12 {
		return "\n" + s.Raw().LiteralWith(fixtures.LiteralStyle{Pad: true, Indent: "\t"})
	}
	return fmt.Sprintf("sample of %s × %s (seed %d)", plural(len(s.rows), "row"), plural(len(s.cols), "column"), s.Seed)
}

// derive returns a sample sharing s's schema, records and columns, with
// the given rows.
func (s *Sample) derive(cols []rawCol, rows []rawRow) *Sample {
	return &Sample{Seed: s.Seed, Schema: s.Schema, cols: cols, rows: rows, recs: s.recs, root: s.origin(), cfg: s.cfg}
}

// origin returns the generated sample s derives from (s itself when it
// was generated).
func (s *Sample) origin() *Sample {
	if s.root != nil {
		return s.root
	}
	return s
}

// Shuffled returns the sample with its raw rows in an order drawn from
// seed.
func (s *Sample) Shuffled(seed int64) *Sample {
	r := newRng(seed)
	rows := slices.Clone(s.rows)
	for i := len(rows) - 1; i > 0; i-- {
		j := r.intn(i + 1)
		rows[i], rows[j] = rows[j], rows[i]
	}
	return s.derive(s.cols, rows)
}

// Simplified returns the sample with every cell and header name in its
// plain spelling: its Raw table equals s.Plain().
func (s *Sample) Simplified() *Sample {
	cols := slices.Clone(s.cols)
	for j := range cols {
		cols[j].name = cols[j].plain
	}
	types := make([]fixtures.Type, len(cols))
	for j := range cols {
		types[j] = s.colType(j)
	}
	cells := make([]Messy, len(s.rows)*len(cols))
	rows := make([]rawRow, len(s.rows))
	for i, r := range s.rows {
		row := cells[i*len(cols) : (i+1)*len(cols) : (i+1)*len(cols)]
		for j, c := range r.cells {
			if r.rec < 0 {
				row[j] = c // a row that is no record stays as it is
			} else {
				row[j] = plainCell(c, types[j])
			}
		}
		rows[i] = r
		rows[i].cells = row
	}
	return s.derive(cols, rows)
}

// plainCell returns the cell in its plain spelling.
func plainCell(c Messy, t fixtures.Type) Messy {
	p, ok := Spell(c.Clean, t)
	if !ok {
		return Messy{}
	}
	return Messy{Raw: p, Clean: c.Clean}
}
