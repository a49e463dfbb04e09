package main

import (
	"fmt"
	"os"

	"github.com/proofsheet/proofsheet/property"
)

// genMaxRows caps --rows, so a typo cannot ask for more memory than a
// machine has.
const genMaxRows = 10_000_000

func genCommand() *command {
	c := &command{
		name:    "gen",
		summary: "generate a messy raw CSV file from a schema file, reproducibly",
		usage: `Usage: proofsheet gen --schema FILE [options]

Generates a raw CSV file of the kind a cleanup chain reads — numbers in
many spellings, null words, sentinels, odd dates, mojibake, duplicate
rows — from a schema file, with proofsheet's property generators. The
same schema, rows, seed and options always give the same bytes, so a
generated file can be remade instead of committed.

Options:
  --schema FILE      the schema file (see below); required
  --rows N           data rows to write (default 100; duplicates count)
  --seed N           the seed (default 1)
  --mess LEVEL       none, light or heavy (default: the schema's @mess,
                     else light)
  --encoding E       utf-8, utf-8-bom, utf-16le or windows-1252
                     (default: the schema's @encoding, else utf-8)
  --out FILE         write to FILE (atomically) instead of stdout
  --quiet            print nothing on stderr while generating

Schema file: UTF-8 text, one statement per line; # starts a comment.
A column is NAME TYPE [OPTION...]: the type as a literal table header
spells it — bool, int64, float64, string, category, date,
timestamp(s|ms|us|ns[, ZONE]), decimal(P,S) — then what that column may
be:
  levels=A|B|C  values=A|B|C  weights=3|1|1   allowed values, by weight
  unique  unique=sequential  unique=gaps       ids
  min=X  max=Y  non-negative  integer  decimals=N
  length=N|MIN..MAX  alphabet=digits|lower|upper|letters|alnum|hex|"chars"
  mess=M|M  mess=none  avoid=M|M               the column's messes
  mess-rate=R  null-rate=R  sentinel-rate=R  null-tokens=A|B  sentinels=A|B
  locale=TAG  derive="price * qty"
A setting is @NAME VALUE:
  @mess none|light|heavy        @encoding utf-8|utf-8-bom|utf-16le|windows-1252
  @locale en-US|en-GB|de-DE|de-CH|fr-FR|sv-SE|ja-JP (default en-US)
  @mixed-sources                cells spelled as other locales do too
  @delimiter , ; | or tab       @quoting minimal|all|text|mixed
  @line-ending lf|crlf|mixed    @dates FROM TO (YYYY-MM-DD)
  @null-rate R   @mess-rate R   @duplicate-rate R   @sentinel-rate R
  @extreme-rate R               (shares from 0 to 1; 0 turns it off)
  @null-tokens A|B|…            @sentinels A|B|…
  @spellings MESS…              @avoid MESS…  (mess names such as
                                thousands, currency, day-first, mojibake)
  @also MESS…                   upload messes (re-upload, cut-short,
                                repeated-header, total-row, blank-lines,
                                added-column) and mixed-sources
  @uploads N   @overlap R   @upload-rate R
  @extra-columns N   @missing-columns N   @max-digits N   @decimals N
  @max-words N       @shuffle   @shuffle-columns   @header-mess
Names or values with blanks, # or = go in double quotes: "air temp",
levels="Les Pins|Étang".

  # greenhouse datalogger uploads
  @delimiter ;
  @dates 2026-03-01 2026-06-30
  house   category      levels="Étang|Les Pins|Mühlbach"
  at      timestamp(s)
  temp_c  float64       min=-30 max=55 decimals=1
  kept    int64         non-negative

Example:
  proofsheet gen --schema houses.schema --rows 5000 --seed 42 --mess heavy \
      --encoding windows-1252 --out testdata/raw/house-heavy.csv

Exit status: 0 when the file was written, 2 on trouble (a bad schema file
or option).
`,
	}
	c.run = func(e *env, args []string) int { return runGen(e, c, args) }
	return c
}

func runGen(e *env, c *command, args []string) int {
	fs := newFlags(c)
	schemaFile := fs.String("schema", "", "")
	rows := fs.Int("rows", 100, "")
	seed := fs.Int64("seed", 1, "")
	mess := fs.String("mess", "", "")
	encoding := fs.String("encoding", "", "")
	out := fs.String("out", "", "")
	quiet := fs.Bool("quiet", false, "")
	rest, status, ok := parseFlags(e, c, fs, args)
	if !ok {
		return status
	}
	if len(rest) > 0 {
		return trouble(e, c, "unexpected argument %q: the schema goes in --schema FILE\n\n%s", rest[0], c.usage)
	}
	if *schemaFile == "" {
		return trouble(e, c, "no --schema FILE given\n\n%s", c.usage)
	}
	if *rows < 0 || *rows > genMaxRows {
		return trouble(e, c, "--rows %d: want 0 to %d", *rows, genMaxRows)
	}
	var level property.MessLevel
	if isSet(fs, "mess") {
		l, err := property.ParseMessLevel(*mess)
		if err != nil || *mess == "" {
			return trouble(e, c, "--mess %q: want none, light or heavy", *mess)
		}
		level = l
	}
	if isSet(fs, "encoding") {
		if _, err := property.ParseEncoding(*encoding); err != nil {
			return trouble(e, c, "--encoding: %v", err)
		}
	}
	if err := checkOut(*out); err != nil {
		return trouble(e, c, "%v", err)
	}
	text, err := os.ReadFile(*schemaFile)
	if err != nil {
		return trouble(e, c, "--schema: %v", err)
	}
	spec, err := property.ParseGenSpec(*schemaFile, text)
	if err != nil {
		return trouble(e, c, "%v", err)
	}
	if level != "" {
		spec.Options.Mess = level
	}
	if isSet(fs, "encoding") {
		spec.Style.Encoding, _ = property.ParseEncoding(*encoding)
	}
	bar := newProgress(e, *quiet)
	if *rows >= 100_000 {
		bar.start(fmt.Sprintf("generating %d rows …", *rows), 0)
	}
	data, err := spec.CSV(*rows, *seed)
	bar.finish()
	if err != nil {
		return trouble(e, c, "%s: %v", *schemaFile, err)
	}
	if err := writeResult(e, *out, data); err != nil {
		return trouble(e, c, "%v", err)
	}
	return exitSame
}
