package main

import (
	"errors"
	"flag"
	"fmt"
	"io"
	"os"
	"strconv"
	"strings"

	"github.com/proofsheet/proofsheet/fixtures"
	"github.com/proofsheet/proofsheet/property"
)

// readerFlags are the reader options every command that reads tables
// takes, with the same names and meanings: profile, diff, and any command
// that reads table files (golden, hammer's output reading). A command adds
// them to its flag set with addReaderFlags, appends readerHelp to its
// usage, and reads each table argument with read.
type readerFlags struct {
	fs          *flag.FlagSet
	inputFormat string
	delimiter   string
	nulls       string
	noHeader    bool
	asText      bool
	sheet       string
	types       listFlag
	typesFile   string
	strict      strictFlag
	stdinUsed   bool
}

// readerHelp documents the reader options for a command's usage text.
const readerHelp = `Reading (the same options in every command that reads tables):
  --input-format F   read every input as F: csv, tsv, jsonl, json, arrow,
                     arrow-stream, parquet, xlsx (default: by extension,
                     else by the bytes)
  --delimiter C      CSV field delimiter instead of sniffing (\t for tab)
  --null TOKENS      comma-separated null tokens instead of the defaults
                     (NA, N/A, n/a, NULL, null, None, #N/A); --null '' for
                     none but the empty field
  --no-header        the first line (row) is data; columns are col1, col2, …
  --sheet S          the spreadsheet sheet to read, by name or 1-based number
                     (default: the first)
  --as-text          read every column as text (no type inference)
  --types SPEC       declare column kinds, e.g. 'amount=decimal(12,2),day=date';
                     repeatable. Types: bool, int64, float64, string,
                     category, date, timestamp(UNIT[,ZONE]), decimal(P,S),
                     time(UNIT), duration(UNIT); UNIT s, ms, us or ns.
                     Money read as decimal compares exactly.
  --types-file FILE  declare the kinds of the columns a file names: a literal
                     table header (amount:decimal(12,2) | day:date) or a gen
                     schema file (NAME TYPE per line)
  --strict[=QUIRKS]  refuse what the readers otherwise read and report:
                     empty-name, repeated-name, bare-quote, nested,
                     number-as-text, merged-cells, hidden-rows
                     (comma-separated; all when none is named)
  A FILE may be - (standard input, its format told by its bytes), a .gz,
  .zst or .bz2 file, a folder or a quoted glob ('out/*.csv'): the table
  files of a folder read as one table in name order, key=value folders
  (Hive-style partitions) adding typed columns.`

// addReaderFlags defines the reader options on fs.
func addReaderFlags(fs *flag.FlagSet) *readerFlags {
	r := &readerFlags{fs: fs}
	fs.StringVar(&r.inputFormat, "input-format", "", "")
	fs.StringVar(&r.delimiter, "delimiter", "", "")
	fs.StringVar(&r.nulls, "null", "", "")
	fs.BoolVar(&r.noHeader, "no-header", false, "")
	fs.StringVar(&r.sheet, "sheet", "", "")
	fs.BoolVar(&r.asText, "as-text", false, "")
	fs.Var(&r.types, "types", "")
	fs.StringVar(&r.typesFile, "types-file", "", "")
	fs.Var(&r.strict, "strict", "")
	return r
}

// given returns the name of the first reader option given on the command
// line, or "".
func (r *readerFlags) given() string {
	for _, name := range []string{"input-format", "delimiter", "null", "no-header", "sheet", "as-text", "types", "types-file", "strict"} {
		if isSet(r.fs, name) {
			return name
		}
	}
	return ""
}

// options turns the flags into fixtures reader options. Errors name the
// flag.
func (r *readerFlags) options() ([]fixtures.ReadOption, error) {
	var opts []fixtures.ReadOption
	if r.inputFormat != "" {
		f, err := fixtures.ParseFormat(r.inputFormat)
		if err != nil {
			return nil, fmt.Errorf("--input-format: %w", err)
		}
		opts = append(opts, fixtures.WithFormat(f))
	}
	if r.delimiter != "" || isSet(r.fs, "delimiter") { // --delimiter "" is a mistake, not "sniff"
		d := r.delimiter
		if d == `\t` || d == "tab" {
			d = "\t"
		}
		rs := []rune(d)
		if len(rs) != 1 {
			return nil, fmt.Errorf("--delimiter %q: want one character", r.delimiter)
		}
		opts = append(opts, fixtures.WithDelimiter(rs[0]))
	}
	if isSet(r.fs, "null") {
		opts = append(opts, fixtures.WithNullTokens(splitList(r.nulls)...))
	}
	if r.noHeader {
		opts = append(opts, fixtures.NoHeader())
	}
	if r.asText {
		opts = append(opts, fixtures.AllText())
	}
	if r.sheet != "" {
		opts = append(opts, fixtures.WithSheet(r.sheet))
	}
	types := map[string]fixtures.Type{}
	if r.typesFile != "" {
		data, err := os.ReadFile(r.typesFile)
		if err != nil {
			return nil, fmt.Errorf("--types-file: %w", err)
		}
		schema, err := parseTypesFile(r.typesFile, data)
		if err != nil {
			return nil, fmt.Errorf("--types-file: %w", err)
		}
		for _, f := range schema {
			types[f.Name] = f.Type
		}
	}
	for _, spec := range r.types {
		declared, err := parseTypes(spec)
		if err != nil {
			return nil, fmt.Errorf("--types %q: %w", spec, err)
		}
		for _, f := range declared {
			types[f.Name] = f.Type // a later declaration wins
		}
	}
	if len(types) > 0 {
		opts = append(opts, fixtures.WithColumnTypes(types))
	}
	if r.strict.set {
		opts = append(opts, fixtures.Strict(r.strict.kinds...))
	}
	return opts, nil
}

// read reads one table argument with the options: "-" is standard input
// (once per command), anything else a file, directory or glob as
// fixtures.ReadFile reads it, with the progress bar for large files.
func (r *readerFlags) read(e *env, bar *progress, path string, opts []fixtures.ReadOption) (*fixtures.Table, *fixtures.LoadReport, error) {
	if path != "-" {
		return readTableReport(bar, path, opts...)
	}
	if r.stdinUsed {
		return nil, nil, errors.New("-: standard input can be read only once")
	}
	r.stdinUsed = true
	data, err := io.ReadAll(e.stdin)
	if err != nil {
		return nil, nil, &fixtures.ParseError{Path: "-", Err: fmt.Errorf("cannot read standard input: %w", err)}
	}
	return fixtures.ReadBytes("-", data, opts...)
}

// parseTypes reads 'NAME=TYPE,NAME=TYPE'. Commas inside a type's
// parentheses (decimal(12,2)) do not split; a name holding '=', ',' or
// blanks at its ends is written as a Go string literal ("air temp").
func parseTypes(spec string) (fixtures.Schema, error) {
	var out fixtures.Schema
	seen := map[string]bool{}
	for _, item := range splitTopLevel(spec) {
		item = strings.TrimSpace(item)
		if item == "" {
			continue
		}
		name, typ, err := splitNameType(item)
		if err != nil {
			return nil, err
		}
		if seen[name] {
			return nil, fmt.Errorf("column %q is declared twice", name)
		}
		seen[name] = true
		t, err := fixtures.ParseType(typ)
		if err != nil {
			return nil, fmt.Errorf("column %q: %w", name, err)
		}
		out = append(out, fixtures.Col(name, t))
	}
	if len(out) == 0 {
		return nil, errors.New("no column declared (want NAME=TYPE[,NAME=TYPE…])")
	}
	return out, nil
}

// splitTopLevel splits at commas outside parentheses and quotes.
func splitTopLevel(s string) []string {
	var parts []string
	depth, start, quoted := 0, 0, false
	for i := 0; i < len(s); i++ {
		switch c := s[i]; {
		case quoted && c == '\\':
			i++
		case c == '"':
			quoted = !quoted
		case quoted:
		case c == '(':
			depth++
		case c == ')':
			depth--
		case c == ',' && depth == 0:
			parts = append(parts, s[start:i])
			start = i + 1
		}
	}
	return append(parts, s[start:])
}

func splitNameType(item string) (string, string, error) {
	if strings.HasPrefix(item, `"`) {
		prefix, err := strconv.QuotedPrefix(item)
		if err != nil {
			return "", "", fmt.Errorf("%s: a quoted name must be a Go string literal", item)
		}
		name, _ := strconv.Unquote(prefix)
		rest := strings.TrimSpace(item[len(prefix):])
		typ, ok := strings.CutPrefix(rest, "=")
		if !ok || name == "" {
			return "", "", fmt.Errorf("%s: want NAME=TYPE", item)
		}
		return name, strings.TrimSpace(typ), nil
	}
	name, typ, ok := strings.Cut(item, "=")
	name = strings.TrimSpace(name)
	if !ok || name == "" || strings.TrimSpace(typ) == "" {
		return "", "", fmt.Errorf("%q: want NAME=TYPE", item)
	}
	return name, strings.TrimSpace(typ), nil
}

// parseTypesFile reads a types file: a literal table header (rows, if
// any, are ignored) or a gen schema file, whose settings are ignored.
func parseTypesFile(name string, data []byte) (fixtures.Schema, error) {
	first := ""
	for _, line := range strings.Split(strings.TrimPrefix(string(data), "\ufeff"), "\n") {
		if t := strings.TrimSpace(line); t != "" && !strings.HasPrefix(t, "#") {
			first = t
			break
		}
	}
	if first == "" {
		return nil, fmt.Errorf("%s: no column declared", name)
	}
	if strings.Contains(first, ":") && !strings.HasPrefix(first, "@") {
		t, err := fixtures.ParseFile(name, first+"\n")
		if err != nil {
			return nil, err
		}
		return t.Schema(), nil
	}
	spec, err := property.ParseGenSpec(name, data)
	if err != nil {
		return nil, err
	}
	return spec.Schema, nil
}

// listFlag collects a repeatable string flag.
type listFlag []string

func (l *listFlag) String() string     { return strings.Join(*l, " ") }
func (l *listFlag) Set(s string) error { *l = append(*l, s); return nil }

// strictFlag is --strict (every quirk) or --strict=KIND,KIND.
type strictFlag struct {
	set   bool
	kinds []fixtures.QuirkKind
}

func (s *strictFlag) String() string { return "" }

// IsBoolFlag lets --strict stand alone.
func (s *strictFlag) IsBoolFlag() bool { return true }

func (s *strictFlag) Set(v string) error {
	switch strings.ToLower(strings.TrimSpace(v)) {
	case "true", "all":
		s.set, s.kinds = true, nil
		return nil
	case "false":
		s.set, s.kinds = false, nil
		return nil
	}
	for _, name := range splitList(v) {
		k, err := fixtures.ParseQuirkKind(name)
		if err != nil {
			return err
		}
		s.kinds = append(s.kinds, k)
	}
	s.set = true
	return nil
}
