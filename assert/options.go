package assert

import (
	"fmt"
	"math"
	"strings"
	"time"
)

// Option changes how Compare matches rows and decides that two cells are
// equal. Options are values: build them once and reuse them freely. A bad
// option (a negative tolerance, a column neither table has) never panics; it
// becomes a Problem in the Diff, so the comparison fails with the reason.
type Option struct {
	apply func(*config)
}

// AllColumns, given as the column name of Tol, ULPs, TimeTol or NormText,
// applies the rule to every column it fits (float64 columns for Tol and
// ULPs, date and timestamp columns for TimeTol, text columns for NormText).
// A rule naming a column by name wins over the AllColumns rule.
const AllColumns = "*"

// DefaultListLimit is how many differing cells, missing rows, extra rows
// and duplicate keys a Diff lists unless ListLimit says otherwise. The
// counts are always exact; only the listings are cut.
const DefaultListLimit = 20

// rowMode is how rows of want are paired with rows of got.
type rowMode uint8

const (
	byPosition rowMode = iota
	byKey
	asMultiset
)

// floatRule is the closeness rule of one float column.
type floatRule struct {
	abs, rel float64 // Tol; both 0 means exact
	ulps     uint64  // ULPs; used when hasULP
	hasTol   bool
	hasULP   bool
}

type config struct {
	mode        rowMode
	keys        []string
	tols        map[string]floatRule // by column; AllColumns for the default
	timeTols    map[string]time.Duration
	norms       map[string]TextNorm
	ignore      map[string]bool
	anyColOrder bool
	loose       bool
	nanIsNull   bool
	limit       int
	holdUpTo    int        // longest listing built at once (holdListing; tests change it)
	sweepFrom   int        // keyed ranges above which columns are swept (sweepRanges; tests change it)
	named       []namedCol // every column an option names, for the unknown-column check
	problems    []string   // bad option values, found while applying
}

// namedCol records which option named which column.
type namedCol struct {
	option, column string
}

func newConfig(opts []Option) *config {
	c := &config{
		tols:      map[string]floatRule{},
		timeTols:  map[string]time.Duration{},
		norms:     map[string]TextNorm{},
		ignore:    map[string]bool{},
		limit:     DefaultListLimit,
		holdUpTo:  holdListing,
		sweepFrom: sweepRanges,
	}
	for _, o := range opts {
		if o.apply != nil {
			o.apply(c)
		}
	}
	return c
}

func (c *config) name(option string, cols ...string) {
	for _, col := range cols {
		c.named = append(c.named, namedCol{option, col})
	}
}

func (c *config) problemf(format string, args ...any) {
	c.problems = append(c.problems, fmt.Sprintf(format, args...))
}

// ByKey matches rows by the values of the named columns, in any order: a
// row of want and a row of got are the same row when their key cells are
// equal (text keys byte for byte after any NormText of the key column).
// Rows whose key only one side has are missing or extra; a key that occurs
// more than once on a side is reported as a duplicate key, which makes the
// tables differ (rows with a repeated key are paired in order of
// appearance). Key columns must exist on both sides and must not be
// float64: a float key is refused, since values that print alike can differ
// in their last bits. Later ByKey options replace earlier ones, and ByKey
// replaces AnyRowOrder.
func ByKey(cols ...string) Option {
	cols = append([]string(nil), cols...)
	return Option{func(c *config) {
		if len(cols) == 0 {
			c.problemf("ByKey: no key columns given")
			return
		}
		seen := map[string]bool{}
		for _, k := range cols {
			if seen[k] {
				c.problemf("ByKey: column %q named twice", k)
				return
			}
			seen[k] = true
		}
		c.mode, c.keys = byKey, cols
		c.name("ByKey", cols...)
	}}
}

// AnyRowOrder matches rows as a multiset, with no key: row order does not
// matter, and a row that occurs twice in want must occur twice in got.
//
// Rows are grouped by their cells in the columns compared exactly; columns
// with a tolerance (Tol, ULPs, TimeTol) and date-with-timestamp columns are
// left out of the grouping. Without such columns, rows pair when all their
// cells are equal, in order of appearance. With them, rows of a group pair
// when their remaining cells are equal under the rules: a group of at most
// 64 rows a side gets a maximum matching (augmenting paths, so the most
// rows pair however the near-equal values interleave); a larger group is
// sorted by its first tolerant column and each want row, in that order,
// takes the first unpaired near got row among up to 64 candidates whose
// value lies within the column's tolerance of its own — fast, but it can
// miss a pairing that a maximum matching would find when many rows are
// near several others.
//
// Rows left over are missing or extra. Cells of paired rows never count as
// differing in this mode: a changed row shows as one missing and one extra
// row. ByKey replaces AnyRowOrder.
func AnyRowOrder() Option {
	return Option{func(c *config) {
		c.mode, c.keys = asMultiset, nil
	}}
}

// Tol lets float cells of column col differ a little: want w and got g are
// equal when
//
//	|w − g| ≤ max(abs, rel × max(|w|, |g|))
//
// which is symmetric in w and g (the semantics of Python's math.isclose,
// PEP 485). With rel only, nothing but 0 is close to 0; use abs for values
// near zero. An infinity equals only the same infinity; NaN follows the NaN
// rules (NaN equals NaN unless a null is involved; see NaNIsNull). col
// AllColumns ("*") sets the rule of every float64 column; a rule for a
// named column wins over it. abs and rel must be finite and ≥ 0. Tol on a
// decimal column is refused: decimals compare exactly, by value. Tol
// replaces an earlier ULPs rule for the same column.
//
// A tolerance can hide a real difference: keep it as small as the
// computation's rounding needs.
func Tol(col string, abs, rel float64) Option {
	return Option{func(c *config) {
		if !(abs >= 0) || !(rel >= 0) || math.IsInf(abs, 0) || math.IsInf(rel, 0) {
			c.problemf("Tol(%q, %v, %v): abs and rel must be finite and ≥ 0", col, abs, rel)
			return
		}
		c.tols[col] = floatRule{abs: abs, rel: rel, hasTol: true}
		c.name("Tol", col)
	}}
}

// ULPs lets float cells of column col differ by at most n units in the last
// place: n steps of math.Nextafter. The distance is computed from the IEEE
// 754 bit patterns: each float64 is mapped to an integer that orders like
// the floats (non-negative floats to their bits, negative floats to the
// negated bits of their magnitude), and the distance is the difference of
// the two integers. So −0 and +0 are 0 apart, the smallest subnormals on
// either side of zero are 2 apart, and MaxFloat64 is 1 from +Inf — yet, as
// under Tol, an infinity equals only the same infinity. NaN follows the
// NaN rules. col AllColumns ("*") means every float64 column. ULPs
// replaces an earlier Tol rule for the same column.
func ULPs(col string, n uint) Option {
	return Option{func(c *config) {
		c.tols[col] = floatRule{ulps: uint64(n), hasULP: true}
		c.name("ULPs", col)
	}}
}

// TimeTol lets date and timestamp cells of column col differ by at most d:
// |w − g| ≤ d, measured exactly between the instants (dates as midnight
// UTC, or in the zone of the timestamp they are compared with). col
// AllColumns ("*") means every date and timestamp column. d must be ≥ 0.
func TimeTol(col string, d time.Duration) Option {
	return Option{func(c *config) {
		if d < 0 {
			c.problemf("TimeTol(%q, %v): the tolerance must be ≥ 0", col, d)
			return
		}
		c.timeTols[col] = d
		c.name("TimeTol", col)
	}}
}

// TextNorm is a set of changes applied to text cells before they are
// compared. Combine them with |.
type TextNorm uint8

// The text normalisations, applied in this order.
const (
	// NFC composes text to Unicode Normalization Form C, so "é" written as
	// e + combining acute equals the single code point é.
	NFC TextNorm = 1 << iota
	// TrimSpace drops leading and trailing white space (Unicode White_Space,
	// which includes the no-break space).
	TrimSpace
	// FoldCase compares text case-insensitively (Unicode full case folding).
	FoldCase
)

// String names the normalisations, joined by "+": "NFC+trim+fold".
func (n TextNorm) String() string {
	var parts []string
	if n&NFC != 0 {
		parts = append(parts, "NFC")
	}
	if n&TrimSpace != 0 {
		parts = append(parts, "trim")
	}
	if n&FoldCase != 0 {
		parts = append(parts, "fold")
	}
	if len(parts) == 0 {
		return "none"
	}
	return strings.Join(parts, "+")
}

// NormText compares the text cells (string and category) of column col
// after the normalisations in how; listings still show the cells as they
// are. col AllColumns ("*") means every text column. It applies to key
// columns too.
func NormText(col string, how TextNorm) Option {
	return Option{func(c *config) {
		c.norms[col] = how
		c.name("NormText", col)
	}}
}

// IgnoreColumns leaves the named columns out of the comparison altogether:
// their cells, types and presence on either side do not matter. A key
// column cannot be ignored.
func IgnoreColumns(cols ...string) Option {
	cols = append([]string(nil), cols...)
	return Option{func(c *config) {
		for _, col := range cols {
			c.ignore[col] = true
		}
		c.name("IgnoreColumns", cols...)
	}}
}

// AnyColumnOrder lets the columns present on both sides stand in any order.
// Without it a different order is a schema change.
func AnyColumnOrder() Option {
	return Option{func(c *config) { c.anyColOrder = true }}
}

// LooseTypes lets a column's type differ between the sides when the values
// can still be compared: int64 and float64 cells compare by value (3 equals
// 3.0; tolerances apply), category and string cells by their text, a date
// equals a timestamp at midnight of that day (in the timestamp's zone),
// timestamps of other units or zones compare as instants, and decimals of
// other precisions or scales by value. Such type changes are then not
// reported; other changes (int64 vs string) still are. Without it the
// values are compared the same way but the type change itself is a
// difference. Category level changes are not reported either.
func LooseTypes() Option {
	return Option{func(c *config) { c.loose = true }}
}

// NaNIsNull makes NaN and null equal to each other in every float64
// column, for computations that write NaN where data was missing. Without
// it NaN equals NaN, null equals null, and NaN does not equal null.
func NaNIsNull() Option {
	return Option{func(c *config) { c.nanIsNull = true }}
}

// ListLimit sets how many differing cells the Diff lists, and likewise how
// many missing rows, extra rows and duplicate keys (default
// DefaultListLimit). n < 0 lists all of them. Counts stay exact.
func ListLimit(n int) Option {
	return Option{func(c *config) { c.limit = n }}
}

// KeyColumns returns the key columns that the options name (the last
// ByKey), or nil when rows are not matched by key. Golden files use it to
// store rows sorted by key.
func KeyColumns(opts ...Option) []string {
	c := newConfig(opts)
	if c.mode != byKey {
		return nil
	}
	return append([]string(nil), c.keys...)
}

// floatRuleFor returns the float rule of a column: its own, else the
// AllColumns rule, else exact.
func (c *config) floatRuleFor(col string) floatRule {
	if r, ok := c.tols[col]; ok {
		return r
	}
	return c.tols[AllColumns]
}

func (c *config) timeTolFor(col string) (time.Duration, bool) {
	if d, ok := c.timeTols[col]; ok {
		return d, true
	}
	d, ok := c.timeTols[AllColumns]
	return d, ok
}

func (c *config) normFor(col string) TextNorm {
	if n, ok := c.norms[col]; ok {
		return n
	}
	return c.norms[AllColumns]
}
