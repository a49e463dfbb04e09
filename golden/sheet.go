package golden

import (
	"bytes"
	"errors"
	"fmt"
	"strconv"
	"strings"

	"github.com/proofsheet/proofsheet/fixtures"
)

// The stored table format ("sheet" layout, version 1). A golden table file
// is a literal text table (see fixtures.Parse) written without padding,
// after three comment lines of metadata:
//
//	# proofsheet sheet v1
//	# keys: house, day
//	# rows: 2
//	house:string | day:date | tmax:float64 | kept:int64
//	Les Pins | 2026-04-01 | ~ | 0
//	Étang | 2026-04-01 | 21.5 | 140
//
//   - The first line names the layout and its version. A reader refuses
//     versions it does not know.
//   - "keys:" lists the key columns the rows are sorted by (quoted as
//     literal cells when a name needs it), or "-" when rows are in the
//     order got had them.
//   - "rows:" is the number of rows, so a file cut short or a merge that
//     lost lines is noticed. Edit it when you edit rows by hand.
//   - Then the header line: name:type per column, so column kinds are
//     recorded; then one row per line. Cells are separated by " | " and
//     not padded, so changing one value changes one line of a diff.
//   - Floats are written in shortest round-trip form; ~ is null and ""
//     the empty string; text that needs it is a quoted Go string. The file
//     reads back to the same table exactly.
//
// The metadata holds nothing that changes from run to run (no dates, no
// tool version), so an unchanged table writes the same bytes.

// SheetVersion is the version of the stored table format this package
// writes and reads.
const SheetVersion = 1

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
}

// EncodeTable writes tb in the stored golden table format. With keys, the
// rows are stably sorted by those columns first (nulls first, as
// fixtures.Table.SortBy orders them); without, they keep their order. A
// table with no columns cannot be stored.
func EncodeTable(tb *fixtures.Table, keys []string) ([]byte, error) {
	if tb == nil {
		return nil, errors.New("golden: no table (nil)")
	}
	if tb.NumCols() == 0 {
		return nil, errors.New("golden: a table with no columns cannot be stored")
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
	for i, k := range keys {
		if i > 0 {
			b.WriteString(", ")
		}
		b.WriteString(keyCell(k))
	}
	fmt.Fprintf(&b, "\n# rows: %d\n", tb.NumRows())
	b.WriteString(tb.LiteralWith(fixtures.LiteralStyle{Pad: false}))
	return b.Bytes(), nil
}

// keyCell writes a key column name, quoted when it could not be read back
// from a comma-separated list.
func keyCell(k string) string {
	if k == "" || k == "-" || strings.ContainsAny(k, `,"`) || strings.TrimSpace(k) != k || strings.IndexFunc(k, func(r rune) bool { return !strconv.IsPrint(r) }) >= 0 {
		return fixtures.QuoteText(k)
	}
	return k
}

// DecodeTable reads a stored golden table. name is the file name used in
// error messages; table errors are *fixtures.ParseError values with line
// and column.
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
	// Metadata: "# keys:" and "# rows:" among the comment lines before the
	// header.
	gotRows := false
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
		switch strings.TrimSpace(key) {
		case "keys":
			if info.Keys, err = parseKeyList(val); err != nil {
				return nil, info, fmt.Errorf("%s:%d: keys: %w", name, i+1, err)
			}
		case "rows":
			n, err := strconv.Atoi(val)
			if err != nil || n < 0 {
				return nil, info, fmt.Errorf("%s:%d: rows: want a count, got %q", name, i+1, val)
			}
			info.Rows, gotRows = n, true
		}
	}
	if !gotRows {
		return nil, info, fmt.Errorf("%s: no \"# rows:\" line before the header", name)
	}
	tb, err := fixtures.ParseFile(name, text)
	if err != nil {
		return nil, info, err
	}
	if tb.NumRows() != info.Rows {
		return nil, info, fmt.Errorf("%s: the file says rows: %d but has %d rows (cut short, a lost merge, or a hand edit that did not fix the count)", name, info.Rows, tb.NumRows())
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
