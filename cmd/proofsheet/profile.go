package main

import (
	"encoding/json"
	"flag"
	"fmt"
	"strings"

	"github.com/proofsheet/proofsheet/fixtures"
)

func profileCommand() *command {
	c := &command{
		name:    "profile",
		summary: "what a raw file holds: encoding, delimiter, kinds, nulls, bad values",
		usage: `Usage: proofsheet profile [options] FILE...

Loads each table file the way fixtures.ReadFile does and reports what the
loader found: the encoding (UTF-8, UTF-8 with BOM, UTF-16, or Windows-1252
for bytes that are not UTF-8), the delimiter, line endings, and per column
the inferred kind, nulls and null tokens, distinct values, values that did
not fit the kind (with line numbers), numbers written as text, and whether
storing the column as a category would save memory.

Options:
  --format F         text (default) or json (an array when several files)
  --json             the same as --format json

` + readerHelp + `

Example:
  proofsheet profile testdata/greenhouse/raw/bellecote.csv
  proofsheet profile --json testdata/greenhouse/raw/*.csv
  gzip -dc export.csv.gz | proofsheet profile --types 'amount=decimal(12,2)' -

Exit status: 0 when every file loaded, 2 when one could not be read.
`,
	}
	c.run = func(e *env, args []string) int { return runProfile(e, c, args) }
	return c
}

func runProfile(e *env, c *command, args []string) int {
	fs := newFlags(c)
	asJSON := fs.Bool("json", false, "")
	format := fs.String("format", "text", "")
	rf := addReaderFlags(fs)
	files, status, ok := parseFlags(e, c, fs, args)
	if !ok {
		return status
	}
	if len(files) == 0 {
		return trouble(e, c, "no file given\n\n%s", c.usage)
	}
	switch *format {
	case "text":
	case "json":
		*asJSON = true
	default:
		return trouble(e, c, "--format %q: unknown report format (want text or json; the format of the files read is --input-format)", *format)
	}
	opts, err := rf.options()
	if err != nil {
		return trouble(e, c, "%v", err)
	}
	var reports []*fixtures.LoadReport
	for _, f := range files {
		_, rep, err := rf.read(e, nil, f, opts)
		if err != nil {
			return trouble(e, c, "%v", err)
		}
		reports = append(reports, rep)
	}
	if *asJSON {
		var out []byte
		var err error
		if len(reports) == 1 {
			out, err = reports[0].JSON()
		} else {
			out, err = json.Marshal(reports)
		}
		if err == nil {
			out, err = versioned(out)
		}
		if err != nil {
			return trouble(e, c, "%v", err)
		}
		e.stdout.Write(out)
		return exitSame
	}
	for i, r := range reports {
		if i > 0 {
			fmt.Fprintln(e.stdout)
		}
		fmt.Fprint(e.stdout, r.Text())
	}
	return exitSame
}

// isSet reports whether the named flag was given on the command line.
func isSet(fs *flag.FlagSet, name string) bool {
	found := false
	fs.Visit(func(f *flag.Flag) {
		if f.Name == name {
			found = true
		}
	})
	return found
}

// splitList splits a comma-separated list, trimming blanks and dropping
// empty items.
func splitList(s string) []string {
	var out []string
	for _, p := range strings.Split(s, ",") {
		if p = strings.TrimSpace(p); p != "" {
			out = append(out, p)
		}
	}
	return out
}
