package golden

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"math"
	"regexp"
	"slices"
	"strconv"
	"strings"
	"unicode/utf8"

	"github.com/sergi/go-diff/diffmatchpatch"
)

// JSON checks v, written as canonical JSON (see CanonicalJSON), against
// the golden JSON file of name under the store's directory
// (<name>.gold.json). The stored file is compared by structure, so a file
// edited by hand with other spacing or key order still matches; when they
// differ the test fails with one line per difference, by JSON path:
//
//	$.houses[2].tmax: got 21.5 want 21.25
//	$.houses[3]: added: {"name":"Ruche"}
//	$.season.note: removed: "late frost"
//
// Missing files and update mode work as for Text. v is marshalled with
// encoding/json; pass a json.RawMessage for JSON you already have.
func (s Store) JSON(t T, name string, v any) bool {
	t.Helper()
	var got []byte
	return s.run(t, name, KindJSON, course{
		prepare: func() (err error) {
			got, err = CanonicalJSON(v)
			return err
		},
		compare: func(_ string, stored []byte) result {
			diff, err := JSONDiff(stored, got)
			return result{equal: diff == "" && err == nil, diff: diff, bad: err}
		},
		encode: func() ([]byte, error) { return got, nil },
	})
}

// CanonicalJSON marshals v with encoding/json and writes it in one fixed
// form, so that equal values always give equal bytes: object keys sorted
// (by bytes), two-space indent, one value per line, a newline at the end;
// strings with only the escapes JSON needs (no HTML escaping); numbers
// that are integers written as integers (1.0 and 1e3 as 1 and 1000; long
// integer literals keep every digit), other numbers in the shortest form
// that reads back to the same float64 (21.25, 1e-7). Empty objects and
// arrays are {} and [].
func CanonicalJSON(v any) ([]byte, error) {
	raw, err := json.Marshal(v)
	if err != nil {
		return nil, fmt.Errorf("marshalling to JSON: %w", err)
	}
	tree, err := decodeJSON(raw)
	if err != nil {
		return nil, err
	}
	var b bytes.Buffer
	writeCanonical(&b, tree, "")
	b.WriteByte('\n')
	return b.Bytes(), nil
}

// decodeJSON reads exactly one JSON value, keeping numbers as text.
func decodeJSON(data []byte) (any, error) {
	dec := json.NewDecoder(bytes.NewReader(data))
	dec.UseNumber()
	var v any
	if err := dec.Decode(&v); err != nil {
		return nil, fmt.Errorf("not JSON: %w", err)
	}
	if _, err := dec.Token(); !errors.Is(err, io.EOF) {
		return nil, errors.New("not JSON: more than one value")
	}
	return v, nil
}

// writeCanonical writes v in canonical form at the given indent.
func writeCanonical(b *bytes.Buffer, v any, indent string) {
	switch x := v.(type) {
	case map[string]any:
		if len(x) == 0 {
			b.WriteString("{}")
			return
		}
		keys := sortedKeys(x)
		b.WriteString("{\n")
		inner := indent + "  "
		for i, k := range keys {
			b.WriteString(inner)
			writeJSONString(b, k)
			b.WriteString(": ")
			writeCanonical(b, x[k], inner)
			if i < len(keys)-1 {
				b.WriteByte(',')
			}
			b.WriteByte('\n')
		}
		b.WriteString(indent + "}")
	case []any:
		if len(x) == 0 {
			b.WriteString("[]")
			return
		}
		b.WriteString("[\n")
		inner := indent + "  "
		for i, e := range x {
			b.WriteString(inner)
			writeCanonical(b, e, inner)
			if i < len(x)-1 {
				b.WriteByte(',')
			}
			b.WriteByte('\n')
		}
		b.WriteString(indent + "]")
	default:
		writeScalar(b, v)
	}
}

// writeCompact writes v in canonical form on one line, for messages.
func writeCompact(b *bytes.Buffer, v any) {
	switch x := v.(type) {
	case map[string]any:
		b.WriteByte('{')
		for i, k := range sortedKeys(x) {
			if i > 0 {
				b.WriteByte(',')
			}
			writeJSONString(b, k)
			b.WriteByte(':')
			writeCompact(b, x[k])
		}
		b.WriteByte('}')
	case []any:
		b.WriteByte('[')
		for i, e := range x {
			if i > 0 {
				b.WriteByte(',')
			}
			writeCompact(b, e)
		}
		b.WriteByte(']')
	default:
		writeScalar(b, v)
	}
}

func sortedKeys(m map[string]any) []string {
	keys := make([]string, 0, len(m))
	for k := range m {
		keys = append(keys, k)
	}
	slices.Sort(keys)
	return keys
}

func writeScalar(b *bytes.Buffer, v any) {
	switch x := v.(type) {
	case nil:
		b.WriteString("null")
	case bool:
		b.WriteString(strconv.FormatBool(x))
	case string:
		writeJSONString(b, x)
	case json.Number:
		b.WriteString(canonicalNumber(string(x)))
	}
}

// writeJSONString writes s as a JSON string with only the escapes JSON
// requires (quote, backslash, control characters) plus U+2028 and U+2029,
// which some JavaScript readers cannot take raw.
func writeJSONString(b *bytes.Buffer, s string) {
	b.WriteByte('"')
	for _, r := range s {
		switch {
		case r == '"':
			b.WriteString(`\"`)
		case r == '\\':
			b.WriteString(`\\`)
		case r == '\n':
			b.WriteString(`\n`)
		case r == '\r':
			b.WriteString(`\r`)
		case r == '\t':
			b.WriteString(`\t`)
		case r < 0x20 || r == 0x2028 || r == 0x2029:
			fmt.Fprintf(b, `\u%04x`, r)
		default:
			b.WriteRune(r)
		}
	}
	b.WriteByte('"')
}

var jsonInteger = regexp.MustCompile(`^-?(0|[1-9][0-9]*)$`)

// canonicalNumber writes a JSON number literal in canonical form.
func canonicalNumber(s string) string {
	if jsonInteger.MatchString(s) {
		if s == "-0" {
			return "0"
		}
		return s
	}
	f, err := strconv.ParseFloat(s, 64)
	if err != nil { // beyond float64: keep it as written
		return s
	}
	switch a := math.Abs(f); {
	case f == 0:
		return "0"
	case f == math.Trunc(f) && a < 1e21:
		return strconv.FormatFloat(f, 'f', -1, 64)
	case a >= 1e-6 && a < 1e21:
		return strconv.FormatFloat(f, 'f', -1, 64)
	}
	e := strconv.FormatFloat(f, 'e', -1, 64) // 1e-07 → 1e-7, 1e+21 → 1e+21
	if i := strings.IndexByte(e, 'e'); i >= 0 && len(e) > i+3 && e[i+2] == '0' {
		e = e[:i+2] + e[i+3:]
	}
	return e
}

// jsonDiffMaxLines caps the lines JSONDiff lists.
const jsonDiffMaxLines = 200

// JSONDiff compares two JSON documents by structure and returns one line
// per difference, by JSON path ($ is the whole document; .name or
// ["odd name"] an object member; [i] an array element), or "" when they
// are equal. Numbers are equal when their canonical forms are (see
// CanonicalJSON). Arrays are aligned by a shortest edit script over their
// elements, so an element inserted in the middle is one "added" line, not
// a change of every later element; the index of an added or changed
// element counts in got, that of a removed one in want. The error reports
// a document that is not JSON.
func JSONDiff(want, got []byte) (string, error) {
	w, err := decodeJSON(want)
	if err != nil {
		return "", fmt.Errorf("want: %w", err)
	}
	g, err := decodeJSON(got)
	if err != nil {
		return "", fmt.Errorf("got: %w", err)
	}
	var jl jsonLines
	diffJSON(&jl, "$", w, g)
	lines := jl.list
	if len(lines) == 0 {
		return "", nil
	}
	n := len(lines)
	if n > jsonDiffMaxLines {
		lines = append(lines[:jsonDiffMaxLines], "… "+plural(n-jsonDiffMaxLines, "more difference", "more differences")+" not shown")
	}
	return fmt.Sprintf("%s:\n%s\n", plural(n, "difference", "differences"), strings.Join(lines, "\n")), nil
}

// jsonLines collects the differences of two JSON documents, one line
// each. A value that changed reads "$.p: got G want W", or in a review of
// two versions "$.p: before W, after G".
type jsonLines struct {
	list   []string
	review bool
}

func (l *jsonLines) add(line string) { l.list = append(l.list, line) }

func (l *jsonLines) changed(path, w, g string) {
	if l.review {
		l.add(path + ": before " + w + ", after " + g)
		return
	}
	l.add(path + ": got " + g + " want " + w)
}

// diffJSON appends the differences of w and g at path.
func diffJSON(lines *jsonLines, path string, w, g any) {
	switch wx := w.(type) {
	case map[string]any:
		gx, ok := g.(map[string]any)
		if !ok {
			break
		}
		keys := sortedKeys(wx)
		for k := range gx {
			if _, ok := wx[k]; !ok {
				keys = append(keys, k)
			}
		}
		slices.Sort(keys)
		for _, k := range keys {
			p := path + memberPath(k)
			wv, inW := wx[k]
			gv, inG := gx[k]
			switch {
			case !inW:
				lines.add(p + ": added: " + brief(gv))
			case !inG:
				lines.add(p + ": removed: " + brief(wv))
			default:
				diffJSON(lines, p, wv, gv)
			}
		}
		return
	case []any:
		gx, ok := g.([]any)
		if !ok {
			break
		}
		diffArrays(lines, path, wx, gx)
		return
	}
	if compact(w) != compact(g) {
		lines.changed(path, brief(w), brief(g))
	}
}

// diffArrays aligns two arrays by a shortest edit script over their
// elements (each distinct element one symbol), then pairs removed and
// added elements that stand at the same place as changes.
func diffArrays(lines *jsonLines, path string, w, g []any) {
	if len(w) == len(g) {
		same := 0
		for i := range w {
			if compact(w[i]) == compact(g[i]) {
				same++
			}
		}
		if same == len(w) {
			return
		}
	}
	symbols := map[string]rune{}
	encode := func(xs []any) ([]rune, bool) {
		rs := make([]rune, len(xs))
		for i, x := range xs {
			k := compact(x)
			r, ok := symbols[k]
			if !ok {
				r = symbolRune(len(symbols))
				if r < 0 {
					return nil, false
				}
				symbols[k] = r
			}
			rs[i] = r
		}
		return rs, true
	}
	ra, okA := encode(w)
	rb, okB := encode(g)
	if !okA || !okB { // too many distinct elements: compare by position
		for i := 0; i < max(len(w), len(g)); i++ {
			switch p := fmt.Sprintf("%s[%d]", path, i); {
			case i >= len(w):
				lines.add(p + ": added: " + brief(g[i]))
			case i >= len(g):
				lines.add(p + ": removed: " + brief(w[i]))
			default:
				diffJSON(lines, p, w[i], g[i])
			}
		}
		return
	}
	i, j := 0, 0 // next element of w and g
	var dels, ins int
	flush := func() {
		pairs := min(dels, ins)
		for k := 0; k < pairs; k++ {
			diffJSON(lines, fmt.Sprintf("%s[%d]", path, j-ins+k), w[i-dels+k], g[j-ins+k])
		}
		for k := pairs; k < dels; k++ {
			lines.add(fmt.Sprintf("%s[%d]: removed: %s", path, i-dels+k, brief(w[i-dels+k])))
		}
		for k := pairs; k < ins; k++ {
			lines.add(fmt.Sprintf("%s[%d]: added: %s", path, j-ins+k, brief(g[j-ins+k])))
		}
		dels, ins = 0, 0
	}
	for _, d := range editOps(ra, rb) {
		n := utf8.RuneCountInString(d.Text)
		switch d.Type {
		case diffmatchpatch.DiffEqual:
			flush()
			i += n
			j += n
		case diffmatchpatch.DiffDelete:
			dels += n
			i += n
		case diffmatchpatch.DiffInsert:
			ins += n
			j += n
		}
	}
	flush()
}

// symbolRune maps the n-th distinct array element to a rune that survives
// conversion to a string (no surrogates), or -1 when they run out.
func symbolRune(n int) rune {
	r := rune(n) + 1
	if r >= 0xD800 {
		r += 0x800
	}
	if r > utf8.MaxRune {
		return -1
	}
	return r
}

var jsonIdent = regexp.MustCompile(`^[A-Za-z_$][A-Za-z0-9_$]*$`)

// memberPath writes the path step to an object member.
func memberPath(k string) string {
	if jsonIdent.MatchString(k) {
		return "." + k
	}
	var b bytes.Buffer
	writeJSONString(&b, k)
	return "[" + b.String() + "]"
}

func compact(v any) string {
	var b bytes.Buffer
	writeCompact(&b, v)
	return b.String()
}

// briefMax is the longest value a JSONDiff line shows, in runes.
const briefMax = 80

// brief writes v compactly, cut to briefMax runes.
func brief(v any) string {
	s := compact(v)
	if utf8.RuneCountInString(s) <= briefMax {
		return s
	}
	r := []rune(s)
	return string(r[:briefMax-1]) + "…"
}
