package assert

import (
	"fmt"
	"math"
	"math/bits"
	"slices"
	"strconv"
	"strings"
	"unicode"
	"unicode/utf8"

	"golang.org/x/text/cases"
	"golang.org/x/text/unicode/norm"

	"github.com/proofsheet/proofsheet/fixtures"
	"github.com/proofsheet/proofsheet/internal/cp1252"
	"github.com/proofsheet/proofsheet/internal/suggest"
)

// HintKind names a kind of Hint.
type HintKind string

// The kinds of hints Compare gives.
const (
	// HintRowOrder: rows paired by position differ, yet the tables hold the
	// same rows in another order.
	HintRowOrder HintKind = "row_order"
	// HintLooseTypes: a column's kind changed between int64 and float64,
	// category and string, or date and timestamp.
	HintLooseTypes HintKind = "loose_types"
	// HintDidYouMean: an option names a column that does not exist, and
	// another name is close to it.
	HintDidYouMean HintKind = "did_you_mean"
	// HintRenamed: a column missing from got and an extra column of got
	// have names close enough to be one column renamed.
	HintRenamed HintKind = "renamed"
	// HintNearMatch: missing and extra rows whose keys differ only by
	// letter case, blanks, Unicode normalisation or a mis-decoded
	// encoding.
	HintNearMatch HintKind = "near_match"
	// HintScale: every cell of a number column is off by one factor (×100,
	// ×1000) or by a temperature conversion (°F/°C).
	HintScale HintKind = "scale"
)

// Hint is a likely cause of a difference and what would fix it. Compare
// computes hints from the whole tables (not only the listed cells); a hint
// is a suggestion to check, never a verdict, and never changes Equal.
type Hint struct {
	Kind HintKind
	// Column is the column the hint is about; "" when it is about rows.
	Column string
	// Text says what was found and what would fix it, for a reader.
	Text string
	// Option is the Go option that would apply the fix, such as
	// "AnyRowOrder()"; Flag the proofsheet command-line flag, such as
	// "--any-row-order". Either is "" when there is none.
	Option, Flag string
	// Name and Suggest are, for HintDidYouMean and HintRenamed, the name
	// given (or missing) and the existing name close to it.
	Name, Suggest string
	// Factor and Offset are, for HintScale, the conversion that turns
	// every want cell into its got cell: got = want × Factor + Offset.
	Factor, Offset float64
	// Count is, for HintNearMatch, the exact number of near-matching pairs
	// of rows (Pairs lists at most Diff.Limit of them), and for HintScale
	// the number of cells that follow the conversion.
	Count int
	// Pairs are the near-matching rows, side by side.
	Pairs []NearMatch
}

// NearMatch is a missing row and an extra row whose keys differ only in
// spelling.
type NearMatch struct {
	// Missing is the row of want (its key and cells), Extra the row of
	// got.
	Missing, Extra RowRef
	// Why lists the differences between the keys, among "case",
	// "blanks", "Unicode normalisation" and "encoding" (one side holds
	// Windows-1252 bytes or UTF-8 read as Windows-1252).
	Why []string
}

// The spelling differences a near match can explain.
const (
	whyEncoding = "encoding"
	whyNorm     = "Unicode normalisation"
	whyBlanks   = "blanks"
	whyCase     = "case"
)

// hintRowCap bounds the missing and extra rows the near-match pass looks
// at on each side, so that a comparison of two unrelated big tables does
// not spend long on hints.
const hintRowCap = 1 << 17

// addHints looks for the likely causes of the differences found.
func (c *comparison) addHints(ran bool) {
	c.nameHints()
	c.typeHints()
	if !ran || c.d.Equal() {
		return
	}
	c.rowOrderHint()
	c.nearMatchHint()
	c.scaleHints()
}

// nameHints suggests existing names for option columns that do not exist,
// and notices a column renamed between the sides.
func (c *comparison) nameHints() {
	all := append(append([]string(nil), c.d.WantColumns...), c.d.GotColumns...)
	seen := map[string]bool{}
	for _, n := range c.cfg.named {
		if n.column == AllColumns || seen[n.column] {
			continue
		}
		inW, inG := c.want.Column(n.column) != nil, c.got.Column(n.column) != nil
		var among []string
		switch {
		case !inW && !inG:
			among = all
		case !inW && n.option == "ByKey":
			among = c.d.WantColumns
		case !inG && n.option == "ByKey":
			among = c.d.GotColumns
		default:
			continue
		}
		seen[n.column] = true
		best, ok := suggest.Closest(n.column, among)
		if !ok {
			continue
		}
		h := Hint{Kind: HintDidYouMean, Column: n.column, Name: n.column, Suggest: best,
			Text:   fmt.Sprintf("%s names column %q, which is not there: did you mean %q?", n.option, n.column, best),
			Option: fmt.Sprintf("%s(%q)", n.option, best), Flag: optionFlag(n.option, best)}
		if n.option == "ByKey" && c.cfg.mode == byKey {
			keys := slices.Clone(c.cfg.keys)
			quoted := make([]string, len(keys))
			for i, k := range keys {
				if k == n.column {
					keys[i] = best
				}
				quoted[i] = strconv.Quote(keys[i])
			}
			h.Option = "ByKey(" + strings.Join(quoted, ", ") + ")"
			h.Flag = "--key " + strings.Join(keys, ",")
		}
		c.d.Hints = append(c.d.Hints, h)
	}
	var missing, extra []string
	for _, s := range c.d.Schema {
		switch s.Change {
		case ColumnMissing:
			missing = append(missing, s.Column)
		case ColumnExtra:
			extra = append(extra, s.Column)
		}
	}
	for _, m := range missing {
		best, ok := suggest.Closest(m, extra)
		if !ok {
			continue
		}
		extra = slices.DeleteFunc(extra, func(s string) bool { return s == best })
		c.d.Hints = append(c.d.Hints, Hint{Kind: HintRenamed, Column: m, Name: m, Suggest: best,
			Text: fmt.Sprintf("column %q is missing from got and %q is extra: the same column renamed?", m, best)})
	}
}

// optionFlag is the command-line flag that names a column as the option
// does, "" when the command line has none.
func optionFlag(option, col string) string {
	switch option {
	case "ByKey":
		return "--key " + col
	case "IgnoreColumns":
		return "--ignore " + col
	case "Tol", "ULPs", "TimeTol":
		return "--tol " + col + "=…"
	}
	return ""
}

// typeHints suggests LooseTypes for kinds that changed in a way it
// accepts.
func (c *comparison) typeHints() {
	if c.cfg.loose {
		return
	}
	for _, s := range c.d.Schema {
		if s.Change != TypeChanged {
			continue
		}
		wc, gc := c.want.Column(s.Column), c.got.Column(s.Column)
		if wc == nil || gc == nil {
			continue
		}
		wk, gk := wc.Kind(), gc.Kind()
		var what string
		switch {
		case (wk == fixtures.KindInt64 && gk == fixtures.KindFloat64) || (wk == fixtures.KindFloat64 && gk == fixtures.KindInt64):
			what = "numbers compare by value (3 equals 3.0)"
		case wk.IsText() && gk.IsText() && wk != gk:
			what = "a category compares by its text"
		case (wk == fixtures.KindDate && gk == fixtures.KindTimestamp) || (wk == fixtures.KindTimestamp && gk == fixtures.KindDate):
			what = "a date equals the timestamp at midnight of that day"
		default:
			continue
		}
		agree := ""
		for _, col := range c.d.Columns {
			if col.Name == s.Column && c.rowsRan && col.Differing == 0 {
				agree = "; the values agree, only the type differs"
			}
		}
		c.d.Hints = append(c.d.Hints, Hint{Kind: HintLooseTypes, Column: s.Column,
			Text:   fmt.Sprintf("column %q is %s in want and %s in got: with loose types %s%s", s.Column, wc.Type(), gc.Type(), what, agree),
			Option: "LooseTypes()", Flag: "--loose-types"})
	}
}

// rowOrderHint notices rows paired by position that are the same rows in
// another order, and names a column that could serve as the key.
func (c *comparison) rowOrderHint() {
	d := c.d
	if c.cfg.mode != byPosition || d.WantRows != d.GotRows || d.WantRows < 2 || len(d.Problems) > 0 ||
		d.Missing.Count+d.Extra.Count+d.RowsDiffering == 0 {
		return
	}
	// A cheap look first. Rows that stand where want has them are equal,
	// so when the tables hold the same rows, the rows of want at the
	// differing positions are the rows of got at those positions, in
	// another order: the want row of the first differing cell must be one
	// of them. When a cell really changed it is none, and the multiset
	// pairing below, a join of every row, is not needed.
	if d.Cells.Len() > 0 && !c.foundAtDiffering(d.Cells.At(0).Row.Want, d.Cells.At(0).Column) {
		return
	}
	sub := c.sub(asMultiset, nil)
	sub.matchAsMultiset()
	if sub.d.Missing.Count+sub.d.Extra.Count > 0 {
		return
	}
	h := Hint{Kind: HintRowOrder, Option: "AnyRowOrder()", Flag: "--any-row-order"}
	moved := plural(d.RowsDiffering, "row differs", "rows differ")
	if key := c.keyCandidate(); key != "" {
		h.Text = fmt.Sprintf("%s by position, yet the tables hold the same rows in another order: match rows by a key (%q is unique on both sides) or in any order", moved, key)
		h.Option = fmt.Sprintf("ByKey(%q) or AnyRowOrder()", key)
		h.Flag = "--key " + key + " or --any-row-order"
	} else {
		h.Text = fmt.Sprintf("%s by position, yet the tables hold the same rows in another order: match rows in any order, or by a key", moved)
	}
	d.Hints = append(d.Hints, h)
}

// foundAtDiffering reports whether a row of got at a position with a
// differing cell (rows paired by position) equals row wi of want in every
// compared column, under the rules; the column named first is checked
// first.
func (c *comparison) foundAtDiffering(wi int, first string) bool {
	cols := slices.Clone(c.cols) // the column that differs first: it tells most rows apart
	if i := slices.IndexFunc(cols, func(cc *colCmp) bool { return cc.name == first }); i > 0 {
		cols[0], cols[i] = cols[i], cols[0]
	}
	for k, word := range c.diffRows {
		for word != 0 {
			gi := k*64 + bits.TrailingZeros64(word)
			word &= word - 1
			same := true
			for _, cc := range cols {
				if !cc.eq(wi, gi) {
					same = false
					break
				}
			}
			if same {
				return true
			}
		}
	}
	return false
}

// sub returns a comparison of the same tables in another row mode, listing
// nothing, for the hints' second looks.
func (c *comparison) sub(mode rowMode, keys []string) *comparison {
	cfg := *c.cfg
	cfg.mode, cfg.keys, cfg.limit = mode, keys, 0
	s := &comparison{cfg: &cfg, d: &Diff{Limit: 0}, want: c.want, got: c.got}
	s.pairColumns()
	return s
}

// keyCandidate returns the first column (in want's order, among the first
// eight) whose values are unique on both sides and pair every row, or "".
func (c *comparison) keyCandidate() string {
	for i, cc := range c.cols {
		if i == 8 {
			break
		}
		if !cc.keyable() || cc.wc.NullCount() > 0 || cc.gc.NullCount() > 0 {
			continue
		}
		sub := c.sub(byKey, []string{cc.name})
		if !sub.checkKeys() {
			continue
		}
		sub.matchByKey()
		sd := sub.d
		if sd.Missing.Count+sd.Extra.Count+sd.Duplicates.WantKeys+sd.Duplicates.GotKeys == 0 {
			return cc.name
		}
	}
	return ""
}

// nearMatchHint pairs missing and extra rows whose keys are equal once
// letter case, blanks, Unicode normalisation and mis-decoded encodings are
// set aside.
func (c *comparison) nearMatchHint() {
	d := c.d
	if c.cfg.mode != byKey || len(c.missingRows) == 0 || len(c.extraRows) == 0 {
		return
	}
	textKey := false
	for _, k := range c.keyCols {
		textKey = textKey || k.class == classText
	}
	if !textKey {
		return
	}
	const all = stepEncoding | stepNorm | stepBlanks | stepCase
	byFolded := map[string][]int32{}
	for _, gi := range c.extraRows[:min(len(c.extraRows), hintRowCap)] {
		f := c.foldedKey(GotSide, int(gi), all)
		byFolded[f] = append(byFolded[f], gi)
	}
	h := Hint{Kind: HintNearMatch}
	var why []string
	optionHelps := true
	for _, wi := range c.missingRows[:min(len(c.missingRows), hintRowCap)] {
		f := c.foldedKey(WantSide, int(wi), all)
		cands := byFolded[f]
		if len(cands) == 0 {
			continue
		}
		gi := cands[0]
		byFolded[f] = cands[1:]
		reasons := c.nearReasons(int(wi), int(gi))
		for _, r := range reasons {
			if !slices.Contains(why, r) {
				why = append(why, r)
			}
		}
		optionHelps = optionHelps && c.normTextEquates(int(wi), int(gi))
		h.Count++
		if !d.listFull(len(h.Pairs)) {
			wk, gk := c.keyText(WantSide, int(wi)), c.keyText(GotSide, int(gi))
			for i, k := range c.keyCols {
				// Keys that print alike (composed and decomposed accents)
				// are shown with their code points spelled out.
				if wk[i] == gk[i] && k.class == classText && !k.wc.IsNull(int(wi)) && !k.gc.IsNull(int(gi)) && k.wc.Str(int(wi)) != k.gc.Str(int(gi)) {
					wk[i], gk[i] = strconv.QuoteToASCII(k.wc.Str(int(wi))), strconv.QuoteToASCII(k.gc.Str(int(gi)))
				}
			}
			h.Pairs = append(h.Pairs, NearMatch{
				Missing: RowRef{Want: int(wi), Got: -1, Key: wk, Cells: rowCells(c.want, int(wi))},
				Extra:   RowRef{Want: -1, Got: int(gi), Key: gk, Cells: rowCells(c.got, int(gi))},
				Why:     reasons})
		}
	}
	if h.Count == 0 {
		return
	}
	slices.SortFunc(why, func(a, b string) int { return slices.Index(whyOrder, a) - slices.Index(whyOrder, b) })
	h.Text = fmt.Sprintf("%s and %s have keys that differ only by %s: probably the same %s, spelled differently",
		plural(h.Count, "missing row", "missing rows"), plural(h.Count, "extra row", "extra rows"), orList(why), pick(h.Count == 1, "row", "rows"))
	if slices.Contains(why, whyEncoding) {
		h.Text += "; read both files in the same encoding (one side has Windows-1252 text where the other has UTF-8)"
	} else if optionHelps {
		var opts []string
		for _, k := range c.keyCols {
			if k.class == classText {
				opts = append(opts, fmt.Sprintf("NormText(%q, NFC|TrimSpace|FoldCase)", k.name))
			}
		}
		h.Option = strings.Join(opts, ", ")
	}
	d.Hints = append(d.Hints, h)
}

var whyOrder = []string{whyCase, whyBlanks, whyNorm, whyEncoding}

// foldSteps are the spelling differences a near match sets aside.
type foldSteps uint8

const (
	stepEncoding foldSteps = 1 << iota
	stepNorm
	stepBlanks
	stepCase
)

var caseFolder = cases.Fold()

// foldText sets aside the differences of the steps.
func foldText(s string, steps foldSteps) string {
	if steps&stepEncoding != 0 {
		s = repairEncoding(s)
	}
	if steps&stepNorm != 0 {
		s = norm.NFC.String(s)
	}
	if steps&stepBlanks != 0 {
		s = strings.Join(strings.FieldsFunc(s, unicode.IsSpace), "")
	}
	if steps&stepCase != 0 {
		s = caseFolder.String(s)
		if steps&stepNorm != 0 {
			s = norm.NFC.String(s)
		}
	}
	return s
}

// repairEncoding undoes the two usual mis-decodings: bytes that are not
// UTF-8 are read as Windows-1252 (a Windows-1252 file read as UTF-8), and
// text whose Windows-1252 bytes form UTF-8 with non-ASCII characters is
// read as that UTF-8 (a UTF-8 file read as Windows-1252, "PÃ¨re").
func repairEncoding(s string) string {
	if !utf8.ValidString(s) {
		var b strings.Builder
		for i := 0; i < len(s); {
			r, n := utf8.DecodeRuneInString(s[i:])
			if r == utf8.RuneError && n == 1 {
				r = cp1252.Rune(s[i])
			}
			b.WriteRune(r)
			i += n
		}
		return b.String()
	}
	raw, ok := cp1252.Encode([]byte(s))
	if !ok || len(raw) == len(s) || !utf8.Valid(raw) {
		return s
	}
	return string(raw)
}

// foldedKey writes the key of a row with the steps' differences set aside.
func (c *comparison) foldedKey(side Side, row int, steps foldSteps) string {
	var b strings.Builder
	for _, k := range c.keyCols {
		col := pick(side == WantSide, k.wc, k.gc)
		var s string
		switch {
		case col.IsNull(row):
			s = "\x00null"
		case k.class == classText:
			s = "t" + foldText(col.Str(row), steps)
		default:
			s = "v" + fixtures.LiteralCell(col, row)
		}
		b.WriteString(strconv.Itoa(len(s)))
		b.WriteByte(':')
		b.WriteString(s)
	}
	return b.String()
}

// nearReasons names the steps without which the two keys would not be
// equal.
func (c *comparison) nearReasons(wi, gi int) []string {
	const all = stepEncoding | stepNorm | stepBlanks | stepCase
	var out []string
	for _, st := range []struct {
		step foldSteps
		name string
	}{{stepCase, whyCase}, {stepBlanks, whyBlanks}, {stepNorm, whyNorm}, {stepEncoding, whyEncoding}} {
		if c.foldedKey(WantSide, wi, all&^st.step) != c.foldedKey(GotSide, gi, all&^st.step) {
			out = append(out, st.name)
		}
	}
	if len(out) == 0 {
		out = []string{whyCase} // several steps each suffice; name the first
		for _, st := range []struct {
			step foldSteps
			name string
		}{{stepCase, whyCase}, {stepBlanks, whyBlanks}, {stepNorm, whyNorm}, {stepEncoding, whyEncoding}} {
			if c.foldedKey(WantSide, wi, st.step) == c.foldedKey(GotSide, gi, st.step) {
				out = []string{st.name}
				break
			}
		}
	}
	return out
}

// normTextEquates reports whether NormText(NFC|TrimSpace|FoldCase) on the
// text key columns makes the two keys equal.
func (c *comparison) normTextEquates(wi, gi int) bool {
	for _, k := range c.keyCols {
		if k.class != classText {
			continue
		}
		if k.wc.IsNull(wi) || k.gc.IsNull(gi) {
			continue
		}
		if normalize(k.wc.Str(wi), NFC|TrimSpace|FoldCase) != normalize(k.gc.Str(gi), NFC|TrimSpace|FoldCase) {
			return false
		}
	}
	return true
}

// scaleHints notices number columns whose every got cell is its want cell
// times one factor, or converted between °C and °F.
func (c *comparison) scaleHints() {
	for j, cc := range c.cols {
		if cc.skip || (cc.class != classFloat && cc.class != classIntFloat) || j >= len(c.results) {
			continue
		}
		r := c.results[j]
		if r.differing < 2 || r.differing*2 < c.pairs.n {
			continue
		}
		if h, ok := c.scaleOf(cc); ok {
			c.d.Hints = append(c.d.Hints, h)
		}
	}
}

// scaleTests are the conversions scaleOf tries besides a plain factor:
// the two directions between degrees Celsius and Fahrenheit.
var scaleTests = []struct {
	factor, offset, slack float64
	text                  string
}{
	// Source: NIST SP 811 (2008) appendix B.8 — t/°F = 1.8 × t/°C + 32.
	// The slack allows both sides rounded to 0.1 of their unit.
	{1.8, 32, 0.15, "got looks like °F where want is °C (°F = °C × 1.8 + 32)"},
	{1 / 1.8, -32 / 1.8, 0.08, "got looks like °C where want is °F (°C = (°F − 32) / 1.8)"},
}

// scaleOf checks every paired cell of a number column for one conversion.
func (c *comparison) scaleOf(cc *colCmp) (Hint, bool) {
	value := func(col *fixtures.Column, i int) (float64, bool) {
		if col.IsNull(i) {
			return 0, false
		}
		if col.Kind() == fixtures.KindInt64 {
			return float64(col.Int64(i)), true
		}
		f := col.Float64(i)
		return f, !math.IsNaN(f) && !math.IsInf(f, 0)
	}
	factor, haveFactor := 0.0, false
	ratioOK := true
	affineOK := make([]bool, len(scaleTests))
	for i := range affineOK {
		affineOK[i] = true
	}
	cells := 0
	for k := 0; k < c.pairs.n; k++ {
		wi, gi := c.pairs.at(k)
		if gi < 0 {
			continue
		}
		w, wok := value(cc.wc, wi)
		g, gok := value(cc.gc, gi)
		if wok != gok {
			return Hint{}, false // a null or NaN on one side only
		}
		if !wok {
			continue
		}
		cells++
		if ratioOK {
			switch {
			case w == 0:
				ratioOK = g == 0
			case !haveFactor:
				factor, haveFactor = g/w, true
			default:
				ratioOK = math.Abs(g-factor*w) <= 1e-9*math.Max(math.Abs(g), math.Abs(factor*w))
			}
		}
		fits := ratioOK
		for t, st := range scaleTests {
			if affineOK[t] {
				affineOK[t] = math.Abs(g-(w*st.factor+st.offset)) <= st.slack
				fits = fits || affineOK[t]
			}
		}
		if !fits {
			return Hint{}, false
		}
	}
	if cells < 2 {
		return Hint{}, false
	}
	h := Hint{Kind: HintScale, Column: cc.name, Count: cells}
	if ratioOK && haveFactor && factor != 1 && factor != 0 {
		h.Factor = snapPow10(factor)
		h.Text = fmt.Sprintf("every cell of column %q in got is its want cell × %s%s", cc.name, fixtures.FormatFloat(h.Factor), factorCause(h.Factor))
		return h, true
	}
	for t, st := range scaleTests {
		if affineOK[t] {
			h.Factor, h.Offset = st.factor, st.offset
			h.Text = fmt.Sprintf("every cell of column %q follows one conversion: %s", cc.name, st.text)
			return h, true
		}
	}
	return Hint{}, false
}

// snapPow10 returns the power of ten f is within a rounding error of, or
// f.
func snapPow10(f float64) float64 {
	e := math.Round(math.Log10(math.Abs(f)))
	p := math.Copysign(math.Pow(10, e), f)
	if math.Abs(f-p) <= 1e-9*math.Abs(p) {
		return p
	}
	return f
}

// factorCause names the usual cause of a factor.
func factorCause(f float64) string {
	switch math.Abs(f) {
	case 100, 0.01:
		return " (a fraction written as a percentage, or cents as whole units?)"
	case 1000, 0.001:
		return " (units a thousand apart: g and kg, m and km, ms and s?)"
	case 10, 0.1:
		return " (units ten apart: mm and cm?)"
	}
	return ""
}

// orList joins words as "a, b or c".
func orList(words []string) string {
	switch len(words) {
	case 0:
		return ""
	case 1:
		return words[0]
	}
	return strings.Join(words[:len(words)-1], ", ") + " or " + words[len(words)-1]
}

// plural writes a count with the singular or plural noun: "1 row", "2
// rows", "0 rows".
func plural(n int, one, many string) string {
	if n == 1 {
		return "1 " + one
	}
	return strconv.Itoa(n) + " " + many
}
