package golden

import (
	"bytes"
	"errors"
	"fmt"
	"slices"
	"strconv"
	"strings"

	"github.com/proofsheet/proofsheet/assert"
	"github.com/proofsheet/proofsheet/fixtures"
)

// The stored table format ("sheet" layout). A golden table file is a
// literal text table (see fixtures.Parse) written without padding, after
// comment lines of metadata. Version 2 stores the comparison rules too:
//
//	# proofsheet sheet v2
//	# keys: house, day
//	# rows: 2
//	# match: by key
//	# tol: *=abs:1e-09
//	# tol: tmean=rel:1e-12
//	# ignore: note
//	house:string | day:date | tmax:float64 | kept:int64
//	Les Pins | 2026-04-01 | ~ | 0
//	Étang | 2026-04-01 | 21.5 | 140
//
//   - The first line names the layout and its version. A reader refuses
//     versions it does not know; every version it knows still reads.
//   - "keys:" lists the key columns the rows are sorted by (quoted as
//     literal cells when a name needs it), or "-" when rows are in the
//     order got had them.
//   - "rows:" is the number of rows, so a file cut short or a merge that
//     lost lines is noticed. Edit it when you edit rows by hand.
//   - The rules (version 2): "match:" says how rows pair — "by key" (the
//     keys line names them), "by position" or "in any order"; then, only
//     when set, one "tol:" line per tolerance in the --tol syntax of the
//     command line (COLUMN=abs:X,rel:Y, COLUMN=ulp:N, COLUMN=time:D; see
//     assert.ParseTolerance), "ignore:" with the ignored columns, one
//     "text:" line per text normalisation (COLUMN=nfc+trim+fold), and
//     "compare:" with any of any-column-order, loose-types, nan-is-null.
//     A check with no rules of its own compares under these.
//   - Then the header line: name:type per column, so column kinds are
//     recorded; then one row per line. Cells are separated by " | " and
//     not padded, so changing one value changes one line of a diff.
//   - Floats are written in shortest round-trip form; ~ is null and ""
//     the empty string; text that needs it is a quoted Go string. The file
//     reads back to the same table exactly.
//
// Version 1 files have no rules lines: their keys line says only how rows
// are sorted, and a check of one with no rules of its own matches rows by
// those keys. The metadata holds nothing that changes from run to run (no
// dates, no tool version), so an unchanged table writes the same bytes.

// SheetVersion is the version of the stored table format this package
// writes; it reads every version up to it.
const SheetVersion = 2

const sheetMagic = "# proofsheet sheet v"

// SheetInfo is the metadata of a stored golden table.
type SheetInfo struct {
	// Version is the format version the file was written in.
	Version int
	// Keys are the key columns the rows are sorted by; nil when rows are
	// stored in the order they came.
	Keys []string
	// Rows is the row count the file declares.
	Rows int
	// Rules are the comparison rules the file stores. A version 1 file
	// stores none: its Rules match rows by Keys (by position without
	// keys) and HasRules is false.
	Rules    assert.Rules
	HasRules bool
}

// EncodeTable writes tb in the stored golden table format, with rules
// that match rows by keys (by position without keys). With keys, the
// rows are stably sorted by those columns first (nulls first, as
// fixtures.Table.SortBy orders them); without, they keep their order. A
// table with no columns cannot be stored. EncodeTableRules stores other
// rules.
func EncodeTable(tb *fixtures.Table, keys []string) ([]byte, error) {
	r := assert.Rules{Match: assert.MatchByPosition}
	if len(keys) > 0 {
		r = assert.Rules{Match: assert.MatchByKey, Keys: keys}
	}
	return EncodeTableRules(tb, r)
}

// EncodeTableRules writes tb in the stored golden table format with the
// comparison rules in its header; rows are sorted by the rules' keys when
// they match rows by key.
func EncodeTableRules(tb *fixtures.Table, rules assert.Rules) ([]byte, error) {
	if tb == nil {
		return nil, errors.New("golden: no table (nil)")
	}
	if tb.NumCols() == 0 {
		return nil, errors.New("golden: a table with no columns cannot be stored")
	}
	var keys []string
	if rules.Match == assert.MatchByKey {
		keys = rules.Keys
		if len(keys) == 0 {
			return nil, errors.New("golden: rules match rows by key but name no key column")
		}
	}
	if len(keys) > 0 {
		sorted, err := tb.SortBy(keys...)
		if err != nil {
			return nil, fmt.Errorf("golden: sorting rows by key: %w", err)
		}
		tb = sorted
	}
	var b bytes.Buffer
	fmt.Fprintf(&b, "%s%d\n", sheetMagic, SheetVersion)
	b.WriteString("# keys: ")
	if len(keys) == 0 {
		b.WriteString("-")
	}
	writeNames(&b, keys)
	fmt.Fprintf(&b, "\n# rows: %d\n", tb.NumRows())
	switch rules.Match {
	case assert.MatchByKey:
		b.WriteString("# match: by key\n")
	case assert.MatchAsMultiset:
		b.WriteString("# match: in any order\n")
	default:
		b.WriteString("# match: by position\n")
	}
	for _, t := range rules.Tolerances {
		b.WriteString("# tol: " + t.String() + "\n")
	}
	if len(rules.Ignore) > 0 {
		b.WriteString("# ignore: ")
		writeNames(&b, rules.Ignore)
		b.WriteString("\n")
	}
	for _, t := range rules.Text {
		b.WriteString("# text: " + t.String() + "\n")
	}
	var sw []string
	if rules.AnyColumnOrder {
		sw = append(sw, "any-column-order")
	}
	if rules.LooseTypes {
		sw = append(sw, "loose-types")
	}
	if rules.NaNIsNull {
		sw = append(sw, "nan-is-null")
	}
	if len(sw) > 0 {
		b.WriteString("# compare: " + strings.Join(sw, ", ") + "\n")
	}
	b.WriteString(tb.LiteralWith(fixtures.LiteralStyle{Pad: false}))
	return b.Bytes(), nil
}

// writeNames writes column names as a comma-separated list.
func writeNames(b *bytes.Buffer, names []string) {
	for i, k := range names {
		if i > 0 {
			b.WriteString(", ")
		}
		b.WriteString(keyCell(k))
	}
}

// keyCell writes a key column name, quoted when it could not be read back
// from a comma-separated list.
func keyCell(k string) string {
	if k == "" || k == "-" || strings.ContainsAny(k, `,"`) || strings.TrimSpace(k) != k || strings.IndexFunc(k, func(r rune) bool { return !strconv.IsPrint(r) }) >= 0 {
		return fixtures.QuoteText(k)
	}
	return k
}

// DecodeTable reads a stored golden table of any version this package
// knows. name is the file name used in error messages; table errors are
// *fixtures.ParseError values with line and column.
func DecodeTable(name string, data []byte) (*fixtures.Table, SheetInfo, error) {
	var info SheetInfo
	text := string(data)
	first, rest, _ := strings.Cut(text, "\n")
	first = strings.TrimSuffix(first, "\r")
	if !strings.HasPrefix(first, sheetMagic) {
		return nil, info, fmt.Errorf("%s:1: not a golden table file: want first line %q", name, fmt.Sprintf("%s%d", sheetMagic, SheetVersion))
	}
	v, err := strconv.Atoi(strings.TrimSpace(first[len(sheetMagic):]))
	if err != nil || v < 1 {
		return nil, info, fmt.Errorf("%s:1: bad format version %q", name, first[len(sheetMagic):])
	}
	if v > SheetVersion {
		return nil, info, fmt.Errorf("%s:1: format version %d is newer than this package reads (%d); update proofsheet", name, v, SheetVersion)
	}
	info.Version = v
	info.HasRules = v >= 2
	// Metadata: "# NAME: VALUE" among the comment lines before the header.
	gotRows, gotMatch := false, false
	keysLine := 0
	for i := 1; rest != ""; i++ {
		var raw string
		raw, rest, _ = strings.Cut(rest, "\n")
		line := strings.TrimSpace(strings.TrimSuffix(raw, "\r"))
		if line == "" {
			continue
		}
		if line[0] != '#' {
			break
		}
		key, val, ok := strings.Cut(strings.TrimSpace(line[1:]), ":")
		if !ok {
			continue
		}
		val = strings.TrimSpace(val)
		at := func(err error) error { return fmt.Errorf("%s:%d: %s: %w", name, i+1, strings.TrimSpace(key), err) }
		switch k := strings.TrimSpace(key); {
		case k == "keys":
			if info.Keys, err = parseKeyList(val); err != nil {
				return nil, info, at(err)
			}
			keysLine = i + 1
		case k == "rows":
			n, err := strconv.Atoi(val)
			if err != nil || n < 0 {
				return nil, info, fmt.Errorf("%s:%d: rows: want a count, got %q", name, i+1, val)
			}
			info.Rows, gotRows = n, true
		case v < 2:
			// Version 1 has no other metadata: the rest are comments.
		case k == "match":
			switch val {
			case "by key":
				info.Rules.Match = assert.MatchByKey
			case "by position":
				info.Rules.Match = assert.MatchByPosition
			case "in any order":
				info.Rules.Match = assert.MatchAsMultiset
			default:
				return nil, info, at(fmt.Errorf("want by key, by position or in any order, got %q", val))
			}
			gotMatch = true
		case k == "tol":
			t, err := assert.ParseTolerance(val)
			if err != nil {
				return nil, info, at(err)
			}
			info.Rules.Tolerances = append(info.Rules.Tolerances, t)
		case k == "ignore":
			if info.Rules.Ignore, err = parseKeyList(val); err != nil || len(info.Rules.Ignore) == 0 {
				if err == nil {
					err = errors.New("no column named")
				}
				return nil, info, at(err)
			}
		case k == "text":
			t, err := assert.ParseTextRule(val)
			if err != nil {
				return nil, info, at(err)
			}
			info.Rules.Text = append(info.Rules.Text, t)
		case k == "compare":
			for _, s := range strings.Split(val, ",") {
				switch s = strings.TrimSpace(s); s {
				case "any-column-order":
					info.Rules.AnyColumnOrder = true
				case "loose-types":
					info.Rules.LooseTypes = true
				case "nan-is-null":
					info.Rules.NaNIsNull = true
				default:
					return nil, info, at(fmt.Errorf("unknown switch %q (want any-column-order, loose-types or nan-is-null)", s))
				}
			}
		default:
			return nil, info, at(errors.New("unknown metadata (want keys, rows, match, tol, ignore, text or compare)"))
		}
	}
	if !gotRows {
		return nil, info, fmt.Errorf("%s: no \"# rows:\" line before the header", name)
	}
	if info.HasRules {
		switch {
		case !gotMatch:
			return nil, info, fmt.Errorf("%s: no \"# match:\" line before the header", name)
		case info.Rules.Match == assert.MatchByKey && len(info.Keys) == 0:
			return nil, info, fmt.Errorf("%s: match: by key, but the keys line names no key", name)
		case info.Rules.Match != assert.MatchByKey && len(info.Keys) > 0:
			return nil, info, fmt.Errorf("%s: the keys line names keys, but match: is not by key", name)
		}
		if info.Rules.Match == assert.MatchByKey {
			info.Rules.Keys = slices.Clone(info.Keys)
		}
		// Put the rules in the order RulesOf gives, so equal rules are
		// Equal however the lines were ordered by hand.
		info.Rules = assert.RulesOf(info.Rules.Options()...)
	} else {
		info.Rules = assert.Rules{Match: assert.MatchByPosition}
		if len(info.Keys) > 0 {
			info.Rules = assert.Rules{Match: assert.MatchByKey, Keys: slices.Clone(info.Keys)}
		}
	}
	tb, err := fixtures.ParseFile(name, text)
	if err != nil {
		return nil, info, err
	}
	// The rows are sorted by the keys, and a check matches by them: a key
	// the header line does not name could never be stored again.
	for _, k := range info.Keys {
		if tb.Column(k) == nil {
			return nil, info, fmt.Errorf("%s:%d: keys: no column %q in the table", name, keysLine, k)
		}
	}
	if tb.NumRows() != info.Rows {
		return nil, info, fmt.Errorf("%s: the file says rows: %d but has %s (cut short, a lost merge, or a hand edit that did not fix the count)", name, info.Rows, plural(tb.NumRows(), "row", "rows"))
	}
	return tb, info, nil
}

// parseKeyList reads the value of the keys line.
func parseKeyList(s string) ([]string, error) {
	if s == "-" {
		return nil, nil
	}
	var keys []string
	for s != "" {
		var k string
		if s[0] == '"' {
			end := -1 // just past the closing quote; escapes honoured
			for j := 1; j < len(s); j++ {
				if s[j] == '\\' {
					j++
				} else if s[j] == '"' {
					end = j + 1
					break
				}
			}
			if end < 0 {
				return nil, errors.New("quoted name has no closing quote")
			}
			var err error
			if k, err = strconv.Unquote(s[:end]); err != nil {
				return nil, fmt.Errorf("bad quoted name %s", s[:end])
			}
			s = strings.TrimSpace(s[end:])
		} else {
			i := strings.IndexByte(s, ',')
			if i < 0 {
				i = len(s)
			}
			k, s = strings.TrimSpace(s[:i]), s[i:]
		}
		keys = append(keys, k)
		if s == "" {
			break
		}
		if s[0] != ',' {
			return nil, fmt.Errorf("unexpected %q after a name", s[0])
		}
		s = strings.TrimSpace(s[1:])
		if s == "" {
			return nil, errors.New("list ends with a comma")
		}
	}
	return keys, nil
}
