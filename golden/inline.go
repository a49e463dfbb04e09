package golden

import (
	"bytes"
	"errors"
	"fmt"
	"go/ast"
	"go/format"
	"go/parser"
	"go/token"
	"os"
	"runtime"
	"slices"
	"strconv"
	"strings"
	"sync"

	"github.com/proofsheet/proofsheet/assert"
	"github.com/proofsheet/proofsheet/fixtures"
)

// InlineTable checks got against a table written in the test's own source,
// as the string literal want of this very call: an inline snapshot. The
// literal holds a table in the stored golden format (see EncodeTableRules:
// a few "#" lines with the comparison rules, then a literal table, here
// padded into columns), indented as the code around it:
//
//	golden.InlineTable(t, got, `
//		# proofsheet sheet v2
//		# keys: house
//		# rows: 2
//		# match: by key
//		house:string | tmax:float64
//		Bellecôte    | 22.6
//		Kæreby       | 19.5
//	`, assert.ByKey("house"))
//
// Write the call with an empty literal (“) and run the test with -update:
// the got table is written into the source file at the call, a gofmt-clean
// file stays gofmt-clean, and only that literal changes (the file is
// replaced atomically). Later runs compare got with the literal as golden.Table
// compares with a file: under the stored rules, with the rules in opts on
// top, and fail with the table diff; -update rewrites a literal that
// differs. Under CI the rewrite is refused, as for golden files.
//
// The literal is found from the caller's file and line with go/parser, so
// the call must be in a test source file, with want written as a string
// literal right there. InlineTable refuses, saying why, when it cannot
// locate one literal for the call: want passed from a variable or a field
// (a table-driven test: keep those tables in golden files), two calls on
// one line, or one call reached twice in a run with different tables (a
// loop). A hand-written literal table without the "#" lines also reads;
// an update adds them.
func InlineTable(t T, got *fixtures.Table, want string, opts ...assert.Option) bool {
	t.Helper()
	_, file, line, ok := runtime.Caller(1)
	if !ok {
		t.Errorf("golden: InlineTable cannot find its caller's source")
		return false
	}
	where := fmt.Sprintf("%s:%d", displayPath(file), line)
	if got == nil {
		t.Errorf("golden: inline table at %s: got is a nil table", where)
		return false
	}
	given := assert.RulesOf(opts...)
	used := given
	var d *assert.Diff
	note := ""
	empty := strings.TrimSpace(want) == ""
	if !empty {
		stored, info, err := decodeInline(where, want)
		if err != nil {
			t.Errorf("golden: inline table at %s cannot be read: %v\nFix the literal, or empty it (``) and run with -update to write it from got.", where, err)
			return false
		}
		var rewrite bool
		used, note, rewrite = chooseRules(info, given)
		d = assert.Compare(stored, got, append(used.Options(), opts...)...)
		if d.Equal() && (!rewrite || !currentMode().allowed()) {
			if note != "" {
				t.Logf("golden: inline table at %s: %s", where, note)
			}
			return true
		}
	}
	m := currentMode()
	if m.allowed() {
		if p := assert.Compare(got, got, append(used.Options(), opts...)...).Problems; len(p) > 0 {
			t.Errorf("golden: inline table at %s not written: the options do not fit got: %s", where, strings.Join(p, "; "))
			return false
		}
		text, err := encodeInline(got, used)
		if err == nil {
			err = rewriteInline(file, line, text)
		}
		if err != nil {
			t.Errorf("golden: inline table at %s not written: %v", where, err)
			return false
		}
		t.Logf("golden: wrote the inline table at %s", where)
		return true
	}
	var msg strings.Builder
	if empty {
		fmt.Fprintf(&msg, "golden: the inline table at %s is empty.", where)
	} else {
		fmt.Fprintf(&msg, "golden: got differs from the inline table at %s (want):\n%s", where, strings.TrimRight(d.Text(), "\n"))
		if note != "" {
			fmt.Fprintf(&msg, "\n(%s)", note)
		}
		if page := assert.WriteArtifactPage(t, d, "inline table at "+where); page != "" {
			fmt.Fprintf(&msg, "\nHTML diff page: %s", page)
		}
	}
	if err := m.refusal(); err != nil {
		fmt.Fprintf(&msg, "\nNot updated: %v.", err)
	} else {
		fmt.Fprintf(&msg, "\nTo write got into the source at that call, and review it in your diff; from the module root run:\n\t%s", updateCommand(t.Name()))
	}
	t.Errorf("%s", msg.String())
	return false
}

// decodeInline reads the table of an inline literal: the stored golden
// format, or a plain literal table, indented as the code is.
func decodeInline(where, want string) (*fixtures.Table, SheetInfo, error) {
	text := dedent(want)
	if strings.HasPrefix(text, sheetMagic) {
		return DecodeTable(where, []byte(text))
	}
	tb, err := fixtures.Parse(text)
	if err != nil {
		return nil, SheetInfo{}, err
	}
	return tb, SheetInfo{Rows: tb.NumRows(), Rules: assert.Rules{Match: assert.MatchByPosition}}, nil
}

// dedent drops the blank lines at the start and the end of s and the
// indentation every other line shares.
func dedent(s string) string {
	lines := strings.Split(strings.ReplaceAll(s, "\r\n", "\n"), "\n")
	for len(lines) > 0 && strings.TrimSpace(lines[0]) == "" {
		lines = lines[1:]
	}
	for len(lines) > 0 && strings.TrimSpace(lines[len(lines)-1]) == "" {
		lines = lines[:len(lines)-1]
	}
	prefix, first := "", true
	for _, l := range lines {
		if strings.TrimSpace(l) == "" {
			continue
		}
		ind := l[:len(l)-len(strings.TrimLeft(l, " \t"))]
		if first {
			prefix, first = ind, false
		}
		for !strings.HasPrefix(ind, prefix) {
			prefix = prefix[:len(prefix)-1]
		}
	}
	for i, l := range lines {
		lines[i] = strings.TrimPrefix(l, prefix)
	}
	return strings.Join(lines, "\n") + "\n"
}

// encodeInline writes got as an inline literal's table: the stored golden
// format's "#" lines, then the table padded into columns.
func encodeInline(got *fixtures.Table, rules assert.Rules) (string, error) {
	data, err := EncodeTableRules(got, rules)
	if err != nil {
		return "", err
	}
	sorted, _, err := DecodeTable("inline table", data)
	if err != nil {
		return "", err
	}
	var b strings.Builder
	for _, l := range strings.SplitAfter(string(data), "\n") {
		if !strings.HasPrefix(l, "#") {
			break
		}
		b.WriteString(l)
	}
	b.WriteString(sorted.LiteralWith(fixtures.LiteralStyle{Pad: true}))
	return b.String(), nil
}

// inlineFiles holds, per source file, its bytes as the test binary was
// built from them and the literals rewritten in this run, so that every
// rewrite is located in the unchanged original (whose lines are the
// caller lines the runtime reports) and all of a file's rewrites are kept.
// It is bookkeeping of one run, behind a mutex, like the name registry.
var inlineFiles = struct {
	sync.Mutex
	m map[string]*inlineFile
}{m: map[string]*inlineFile{}}

type inlineFile struct {
	orig  []byte
	fset  *token.FileSet
	file  *ast.File
	edits map[int]inlineEdit // by the literal's byte offset in orig
}

type inlineEdit struct {
	start, end int    // the literal's bytes in orig
	text       string // the table it now holds
	line       int    // the caller line that wrote it
	lit        string // the new literal
}

// ErrInlineNotFound is wrapped by the errors that say why the literal of an
// inline table could not be located or rewritten.
var ErrInlineNotFound = errors.New("cannot locate the inline table's literal")

// rewriteInline writes table text as the want literal of the InlineTable
// call at file:line, and rewrites the file atomically, gofmt-clean.
func rewriteInline(file string, line int, text string) error {
	inlineFiles.Lock()
	defer inlineFiles.Unlock()
	f := inlineFiles.m[file]
	if f == nil {
		orig, err := os.ReadFile(file)
		if err != nil {
			return err
		}
		fset := token.NewFileSet()
		af, err := parser.ParseFile(fset, file, orig, parser.ParseComments|parser.SkipObjectResolution)
		if err != nil {
			return fmt.Errorf("%w: %v", ErrInlineNotFound, err)
		}
		f = &inlineFile{orig: orig, fset: fset, file: af, edits: map[int]inlineEdit{}}
		inlineFiles.m[file] = f
	}
	lit, indent, err := f.locate(line)
	if err != nil {
		return err
	}
	start, end := f.fset.Position(lit.Pos()).Offset, f.fset.Position(lit.End()).Offset
	if prev, ok := f.edits[start]; ok {
		if prev.text == text {
			return nil
		}
		return fmt.Errorf("%w: the call at line %d ran again in this run with another table (in a loop, or a test run twice?); an inline table holds one table: use a golden file (golden.Table) there", ErrInlineNotFound, line)
	}
	f.edits[start] = inlineEdit{start: start, end: end, text: text, line: line, lit: inlineLiteral(text, indent)}
	out, err := f.render()
	if err != nil {
		delete(f.edits, start)
		return err
	}
	mode := os.FileMode(0o644)
	if st, err := os.Stat(file); err == nil {
		mode = st.Mode().Perm()
	}
	return fixtures.WriteFileAtomic(file, out, mode)
}

// locate finds the want literal of the one InlineTable call whose lines
// hold line, and the indentation of the line the call starts on.
func (f *inlineFile) locate(line int) (*ast.BasicLit, string, error) {
	var calls []*ast.CallExpr
	ast.Inspect(f.file, func(n ast.Node) bool {
		call, ok := n.(*ast.CallExpr)
		if !ok || !isInlineCall(call) {
			return true
		}
		if f.fset.Position(call.Pos()).Line <= line && line <= f.fset.Position(call.End()).Line {
			calls = append(calls, call)
		}
		return true
	})
	switch len(calls) {
	case 0:
		return nil, "", fmt.Errorf("%w: no call of InlineTable spans line %d of the source", ErrInlineNotFound, line)
	case 1:
	default:
		return nil, "", fmt.Errorf("%w: %d calls of InlineTable span line %d; put each call on lines of its own", ErrInlineNotFound, len(calls), line)
	}
	call := calls[0]
	if len(call.Args) < 3 {
		return nil, "", fmt.Errorf("%w: the call at line %d has no want argument", ErrInlineNotFound, line)
	}
	lit, ok := call.Args[2].(*ast.BasicLit)
	if !ok || lit.Kind != token.STRING {
		var src bytes.Buffer
		_ = format.Node(&src, f.fset, call.Args[2])
		return nil, "", fmt.Errorf("%w: the want argument of the call at line %d is %s, not a string literal; an inline table lives in a literal written at the call (a table-driven test keeps its tables in golden files: golden.Table)", ErrInlineNotFound, line, src.String())
	}
	pos := f.fset.Position(call.Pos())
	lineStart := pos.Offset - (pos.Column - 1)
	rest := f.orig[lineStart:]
	indent := string(rest[:len(rest)-len(bytes.TrimLeft(rest, " \t"))])
	return lit, indent, nil
}

// isInlineCall reports whether call calls a function named InlineTable
// (golden.InlineTable, or InlineTable after a dot import).
func isInlineCall(call *ast.CallExpr) bool {
	switch fn := call.Fun.(type) {
	case *ast.SelectorExpr:
		return fn.Sel.Name == "InlineTable"
	case *ast.Ident:
		return fn.Name == "InlineTable"
	}
	return false
}

// inlineLiteral writes table text as a Go string literal: a raw literal
// with one line per table line, indented one tab more than the call, or a
// quoted literal when the text holds a backquote.
func inlineLiteral(text, indent string) string {
	if strings.Contains(text, "`") || strings.Contains(text, "\r") {
		return strconv.Quote(text)
	}
	var b strings.Builder
	b.WriteString("`\n")
	for _, l := range strings.Split(strings.TrimRight(text, "\n"), "\n") {
		b.WriteString(indent + "\t" + strings.TrimRight(l, " ") + "\n")
	}
	b.WriteString(indent + "`")
	return b.String()
}

// render applies the edits to the original and formats the result.
func (f *inlineFile) render() ([]byte, error) {
	edits := make([]inlineEdit, 0, len(f.edits))
	for _, e := range f.edits {
		edits = append(edits, e)
	}
	slices.SortFunc(edits, func(a, b inlineEdit) int { return a.start - b.start })
	var out bytes.Buffer
	at := 0
	for _, e := range edits {
		out.Write(f.orig[at:e.start])
		out.WriteString(e.lit)
		at = e.end
	}
	out.Write(f.orig[at:])
	// A gofmt-clean file stays gofmt-clean (a new literal can move the
	// alignment of comments around it); a file that was not is left as it
	// was but for the literal.
	if clean, err := format.Source(f.orig); err == nil && bytes.Equal(clean, f.orig) {
		formatted, err := format.Source(out.Bytes())
		if err != nil {
			return nil, fmt.Errorf("%w: the rewritten source does not format: %v", ErrInlineNotFound, err)
		}
		return formatted, nil
	}
	if _, err := parser.ParseFile(token.NewFileSet(), "", out.Bytes(), parser.SkipObjectResolution); err != nil {
		return nil, fmt.Errorf("%w: the rewritten source does not parse: %v", ErrInlineNotFound, err)
	}
	return out.Bytes(), nil
}
