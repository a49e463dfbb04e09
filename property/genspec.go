package property

import (
	"errors"
	"fmt"
	"strconv"
	"strings"
	"time"
	"unicode/utf8"

	"github.com/proofsheet/proofsheet/fixtures"
)

// GenSpec is what a schema file for generated raw files says: the columns,
// the generator options and the CSV style. MessyCSV makes the bytes.
//
// A schema file is UTF-8 text, one statement per line:
//
//	# bench bookings of the greenhouse network
//	@locale en-US
//	@encoding windows-1252
//	@dates 2026-03-01 2026-06-30
//	booking_id  int64          unique=sequential min=1001 mess=none
//	house       category       levels="Bellecôte|Kæreby|Ørnely" weights=5|3|1
//	minutes     int64          non-negative max=720
//	price       decimal(10,2)  min=0 max=2500 mess=currency|thousands mess-rate=0.6
//	booked_on   date           mess=month-first
//	note        string         length=3..40 null-rate=0.3
//	total       decimal(12,2)  derive="price * minutes / 60" mess=none
//
// A line starting with # is a comment (so is the rest of a line after a
// blank and #); blank lines are skipped.
//
// A column line is NAME TYPE [OPTION…]: the name, then a type as a literal
// table header spells it (bool, int64, float64, string, category, date,
// timestamp(UNIT[, ZONE]), decimal(P, S)). Columns come out in the order
// of their lines. The options are Rules:
//
//	levels=A|B|C                    a category's values (default: invented house names)
//	values=A|B|C  weights=3|1|1     the only values, drawn by weight (any type;
//	                                weights also go with levels=)
//	unique, unique=sequential, unique=gaps   unique values; a numbered sequence
//	min=X  max=Y                    bounds of numbers, dates and timestamps
//	non-negative, integer, decimals=N        numbers at 0 or more; whole; at most N decimals
//	length=N or MIN..MAX, alphabet=NAME|"chars"   strings (names: digits, lower,
//	                                upper, letters, alnum, hex)
//	mess=M|M…, mess=none (or plain), avoid=M|M…   the column's messes
//	mess-rate=R  null-rate=R  sentinel-rate=R     the column's shares (0: none)
//	null-tokens=A|B  sentinels=A|B  locale=TAG
//	derive=EXPR                     computed from other columns: "price * qty"
//
// A setting line is @NAME [VALUE…]:
//
//	@mess none|light|heavy          how much mess (default light)
//	@locale TAG                     en-US (default), en-GB, de-DE, de-CH, fr-FR, sv-SE, ja-JP
//	@mixed-sources                  cells may be spelled as other locales do
//	@encoding utf-8|utf-8-bom|utf-16le|windows-1252
//	@delimiter , ; | or tab         the field delimiter (default ,)
//	@quoting minimal|all|text|mixed which fields are quoted
//	@line-ending lf|crlf|mixed
//	@null-rate R                    share of null cells, 0 to 1 (0: none)
//	@mess-rate R                    share of cells spelled messily
//	@duplicate-rate R               share of rows repeating an earlier row
//	@sentinel-rate R                share of cells holding a fault code
//	@extreme-rate R                 share of numbers such as +Inf, NaN, -0
//	@dates FROM TO                  range of dates and timestamps (YYYY-MM-DD)
//	@null-tokens A|B|…              spellings of null
//	@sentinels A|B|…                fault codes
//	@spellings M M…                 only these messes (names: AllMesses)
//	@avoid M M…                     never these messes
//	@also M M…                      these messes too (upload messes, mixed-sources)
//	@uploads N, @overlap R, @upload-rate R   re-upload series and upload messes
//	@extra-columns N                most columns not in the schema
//	@missing-columns N              most schema columns left out
//	@max-digits N, @decimals N, @max-words N
//	@shuffle, @shuffle-columns, @header-mess   (no value: on)
//
// A name or value holding blanks, # or = is written in double quotes as a
// Go string literal: "air temp", levels="Les Pins|Étang".
type GenSpec struct {
	Schema  fixtures.Schema
	Options Options
	Style   CSVStyle
}

// CSV generates rows data rows from the spec, deterministically from
// seed: the same spec, rows and seed always give the same bytes.
func (s *GenSpec) CSV(rows int, seed int64) ([]byte, error) {
	return MessyCSV(s.Schema, rows, seed, s.Options, s.Style)
}

// ParseGenSpec reads a schema file (see GenSpec). name is used in error
// messages, which are *fixtures.ParseError values with line and column.
// The spec is checked as the generators would check it, so a spec that
// parses can generate.
func ParseGenSpec(name string, text []byte) (*GenSpec, error) {
	spec := &GenSpec{}
	src := strings.TrimPrefix(string(text), "\ufeff")
	lines := strings.Split(src, "\n")
	seen := map[string]int{}
	for i, raw := range lines {
		n := i + 1
		line := strings.TrimRight(raw, "\r")
		trimmed := strings.TrimSpace(line)
		if trimmed == "" || strings.HasPrefix(trimmed, "#") {
			continue
		}
		col := len(line) - len(strings.TrimLeft(line, " \t")) + 1
		if at, what := badText(line); at > 0 {
			return nil, &fixtures.ParseError{Path: name, Line: n, Column: at, Err: fmt.Errorf("%s: a schema file is UTF-8 text", what)}
		}
		toks, err := specTokens(line)
		if err != nil {
			return nil, &fixtures.ParseError{Path: name, Line: n, Column: err.col, Err: err.err}
		}
		fail := func(t specToken, format string, args ...any) error {
			return &fixtures.ParseError{Path: name, Line: n, Column: t.col, Err: fmt.Errorf(format, args...)}
		}
		if strings.HasPrefix(toks[0].text, "@") && !toks[0].quoted {
			if err := spec.setting(toks, fail); err != nil {
				return nil, err
			}
			continue
		}
		if len(toks) < 2 {
			return nil, &fixtures.ParseError{Path: name, Line: n, Column: col, Err: fmt.Errorf("column %q has no type: want NAME TYPE [levels=A|B]", toks[0].value)}
		}
		cname := toks[0].value
		if msg := nameProblem(cname); msg != "" {
			return nil, fail(toks[0], "column %q: %s", cname, msg)
		}
		if prev, dup := seen[cname]; dup {
			return nil, fail(toks[0], "column %q is already defined on line %d", cname, prev)
		}
		seen[cname] = n
		typ, terr := fixtures.ParseType(toks[1].text)
		if terr != nil {
			return nil, fail(toks[1], "%v", terr)
		}
		spec.Schema = append(spec.Schema, fixtures.Col(cname, typ))
		var rules Rules
		var weights []float64
		weightsTok := specToken{}
		for _, opt := range toks[2:] {
			if opt.quoted {
				return nil, fail(opt, "want an option KEY=VALUE or a flag, got %q", opt.text)
			}
			key, _, hasValue := strings.Cut(opt.text, "=")
			if !hasValue {
				switch key {
				case "unique":
					rules.Unique = Distinct
				case "non-negative":
					rules.NonNegative = true
				case "integer":
					rules.Integer = true
				case "plain":
					rules.Plain = true
				default:
					return nil, fail(opt, "unknown column flag %q (want unique, non-negative, integer or plain; options are KEY=VALUE)", key)
				}
				continue
			}
			if err := spec.columnOption(&rules, &weights, typ, cname, key, opt.value); err != nil {
				return nil, fail(opt, "%v", err)
			}
			if key == "weights" {
				weightsTok = opt
			}
		}
		if weights != nil && len(rules.Values) == 0 && spec.Options.Levels[cname] != nil {
			for _, l := range spec.Options.Levels[cname] {
				rules.Values = append(rules.Values, Choice{Value: l})
			}
		}
		if weights != nil {
			if len(weights) != len(rules.Values) {
				return nil, fail(weightsTok, "%d weights for %d values", len(weights), len(rules.Values))
			}
			for i, w := range weights {
				rules.Values[i].Weight = w
			}
		}
		if !rules.isZero() {
			if spec.Options.Columns == nil {
				spec.Options.Columns = map[string]Rules{}
			}
			spec.Options.Columns[cname] = rules
		}
	}
	if len(spec.Schema) == 0 {
		return nil, &fixtures.ParseError{Path: name, Err: errors.New("no columns: want one line per column, NAME TYPE")}
	}
	if err := spec.Options.Validate(spec.Schema); err != nil {
		var ce *ColumnError
		if errors.As(err, &ce) {
			if line, ok := seen[ce.Column]; ok {
				return nil, &fixtures.ParseError{Path: name, Line: line, Column: 1, Err: fmt.Errorf("column %q: %w", ce.Column, ce.Err)}
			}
		}
		return nil, &fixtures.ParseError{Path: name, Err: unprefixed{err}}
	}
	if _, err := spec.Style.norm(); err != nil {
		return nil, &fixtures.ParseError{Path: name, Err: unprefixed{err}}
	}
	return spec, nil
}

// badText returns the 1-based byte column of the first NUL byte or byte
// that is not UTF-8 in line, and what it is; 0 when there is none.
func badText(line string) (int, string) {
	for i := 0; i < len(line); {
		r, size := utf8.DecodeRuneInString(line[i:])
		switch {
		case r == 0:
			return i + 1, "a NUL byte"
		case r == utf8.RuneError && size == 1:
			return i + 1, fmt.Sprintf("byte 0x%02X is not UTF-8", line[i])
		}
		i += size
	}
	return 0, ""
}

// unprefixed shows an error of this package in a schema file's message
// without the "property: " its Go callers see.
type unprefixed struct{ err error }

func (u unprefixed) Error() string { return strings.TrimPrefix(u.err.Error(), "property: ") }

func (u unprefixed) Unwrap() error { return u.err }

// columnOption applies one KEY=VALUE option of a column line.
func (s *GenSpec) columnOption(r *Rules, weights *[]float64, typ fixtures.Type, cname, key, val string) error {
	if strings.ContainsRune(val, 0) {
		// A NUL in the file made the reader take it for UTF-16.
		return fmt.Errorf("%s: the value holds a NUL byte, which a generated file cannot carry", key)
	}
	shareOf := func(dst *float64) error {
		v, err := strconv.ParseFloat(val, 64)
		if err != nil || v < 0 || v > 1 {
			return fmt.Errorf("%s: want a share from 0 to 1, got %q", key, val)
		}
		if v == 0 {
			v = -1 // zero means the file's in Rules; written here it means none
		}
		*dst = v
		return nil
	}
	messes := func() ([]Mess, error) {
		var out []Mess
		for _, name := range splitBar(val) {
			m := Mess(name)
			if indexOf(AllMesses(), m) < 0 {
				return nil, fmt.Errorf("%s: unknown mess %q", key, name)
			}
			out = append(out, m)
		}
		if len(out) == 0 {
			return nil, fmt.Errorf("%s: no mess named", key)
		}
		return out, nil
	}
	switch key {
	case "levels":
		if typ.Kind() != fixtures.KindCategory {
			return fmt.Errorf("levels are for category columns; %q is %s", cname, typ)
		}
		levels := splitBar(val)
		if len(levels) == 0 {
			return errors.New("no levels given")
		}
		if s.Options.Levels == nil {
			s.Options.Levels = map[string][]string{}
		}
		s.Options.Levels[cname] = levels
	case "values":
		vals := strings.Split(val, "|")
		if val == "" {
			return errors.New("no values given")
		}
		for _, v := range vals {
			r.Values = append(r.Values, Choice{Value: v})
		}
	case "weights":
		for _, w := range strings.Split(val, "|") {
			f, err := strconv.ParseFloat(w, 64)
			if err != nil || f < 0 {
				return fmt.Errorf("weights: want numbers of 0 or more, got %q", w)
			}
			*weights = append(*weights, f)
		}
	case "unique":
		switch val {
		case "distinct", "yes":
			r.Unique = Distinct
		case "sequential":
			r.Unique = Sequential
		case "gaps":
			r.Unique = Gapped
		default:
			return fmt.Errorf("unique=%s: want unique, unique=sequential or unique=gaps", val)
		}
	case "min":
		r.Min = val
	case "max":
		r.Max = val
	case "decimals":
		n, err := strconv.Atoi(val)
		if err != nil || n < 0 || n > 15 {
			return fmt.Errorf("decimals: want a whole number from 0 to 15, got %q", val)
		}
		if n == 0 {
			r.Integer = true
		} else {
			r.Decimals = n
		}
	case "length":
		lo, hi, isRange := strings.Cut(val, "..")
		a, err1 := strconv.Atoi(lo)
		b := a
		var err2 error
		if isRange {
			b, err2 = strconv.Atoi(hi)
		}
		if err1 != nil || err2 != nil || a < 0 || b < a || b == 0 {
			return fmt.Errorf("length: want N or MIN..MAX in characters, got %q", val)
		}
		r.MinLen, r.MaxLen = a, b
	case "alphabet":
		if val == "" {
			return errors.New("alphabet: no characters given")
		}
		r.Alphabet = val
	case "mess":
		if val == "none" {
			r.Plain = true
			return nil
		}
		ms, err := messes()
		if err != nil {
			return err
		}
		r.Messes = ms
	case "avoid":
		ms, err := messes()
		if err != nil {
			return err
		}
		r.Avoid = ms
	case "mess-rate":
		return shareOf(&r.MessRate)
	case "null-rate":
		return shareOf(&r.NullRate)
	case "sentinel-rate":
		return shareOf(&r.SentinelRate)
	case "null-tokens":
		r.NullTokens = splitBar(val)
	case "sentinels":
		r.Sentinels = splitBar(val)
	case "locale":
		l, err := LocaleByTag(val)
		if err != nil {
			return err
		}
		r.Locale = l.Tag
	case "derive":
		if _, err := parseExpr(val); err != nil {
			return fmt.Errorf("derive %q: %v", val, err)
		}
		r.Derive = val
	default:
		return fmt.Errorf("unknown column option %q (want levels, values, weights, unique, min, max, decimals, length, alphabet, mess, avoid, mess-rate, null-rate, sentinel-rate, null-tokens, sentinels, locale, derive)", key)
	}
	return nil
}

// setting applies one @ line.
func (s *GenSpec) setting(toks []specToken, fail func(specToken, string, ...any) error) error {
	key := strings.ToLower(toks[0].text[1:])
	args := toks[1:]
	one := func() (specToken, error) {
		if len(args) != 1 {
			return specToken{}, fail(toks[0], "@%s takes one value, got %d", key, len(args))
		}
		return args[0], nil
	}
	// value parses the one value of a setting; an error points at it.
	value := func(parse func(string) error) error {
		v, err := one()
		if err != nil {
			return err
		}
		if perr := parse(v.value); perr != nil {
			return fail(v, "%v", perr)
		}
		return nil
	}
	rateOf := func(dst *float64) error {
		return value(func(s string) error {
			r, err := strconv.ParseFloat(s, 64)
			if err != nil || r < 0 || r > 1 {
				return fmt.Errorf("@%s: want a share from 0 to 1, got %q", key, s)
			}
			if r == 0 {
				r = -1 // zero means the default in Options; written here it means none
			}
			*dst = r
			return nil
		})
	}
	countOf := func(dst *int, most int) error {
		return value(func(s string) error {
			c, err := strconv.Atoi(s)
			if err != nil || c < 0 || c > most {
				return fmt.Errorf("@%s: want a whole number from 0 to %d, got %q", key, most, s)
			}
			if c == 0 {
				c = -1
			}
			*dst = c
			return nil
		})
	}
	choice := func(names []string, what string, dst func(int)) error {
		return value(func(s string) error {
			i := indexOf(names, strings.ToLower(s))
			if i < 0 {
				return fmt.Errorf("@%s: unknown %s %q (want %s)", key, what, s, strings.Join(names, ", "))
			}
			dst(i)
			return nil
		})
	}
	flag := func(dst *bool) error {
		if len(args) != 0 {
			return fail(args[0], "@%s takes no value", key)
		}
		*dst = true
		return nil
	}
	o, st := &s.Options, &s.Style
	switch key {
	case "mess":
		return value(func(v string) (err error) { o.Mess, err = ParseMessLevel(v); return err })
	case "encoding":
		return value(func(v string) (err error) { st.Encoding, err = ParseEncoding(v); return err })
	case "delimiter":
		return value(func(v string) (err error) { st.Delimiter, err = ParseDelimiter(v); return err })
	case "quoting":
		return choice(quotingNames[:], "style", func(i int) { st.Quoting = Quoting(i) })
	case "line-ending":
		return choice([]string{"lf", "crlf", "mixed"}, "ending", func(i int) { st.LineEnding = LineEnding(i) })
	case "null-rate":
		return rateOf(&o.NullRate)
	case "mess-rate":
		return rateOf(&o.MessRate)
	case "duplicate-rate":
		return rateOf(&o.DuplicateRate)
	case "sentinel-rate":
		return rateOf(&o.SentinelRate)
	case "extreme-rate":
		return rateOf(&o.ExtremeRate)
	case "dates":
		if len(args) != 2 {
			return fail(toks[0], "@dates takes two dates, FROM TO (YYYY-MM-DD)")
		}
		var ts [2]time.Time
		for i, a := range args {
			t, perr := time.Parse(time.DateOnly, a.value)
			if perr != nil {
				return fail(a, "@dates: %q is not a date YYYY-MM-DD", a.value)
			}
			ts[i] = t
		}
		if ts[1].Before(ts[0]) {
			return fail(args[1], "@dates: the range ends on %s, before it starts on %s: want FROM TO, the earlier date first", args[1].value, args[0].value)
		}
		o.DateFrom, o.DateTo = ts[0], ts[1].Add(24*time.Hour-time.Second)
	case "null-tokens":
		return value(func(v string) error { o.NullTokens = append([]string{}, splitBar(v)...); return nil })
	case "sentinels":
		return value(func(v string) error { o.Sentinels = splitBar(v); return nil })
	case "spellings", "avoid":
		if len(args) == 0 {
			return fail(toks[0], "@%s takes one or more mess names", key)
		}
		known := AllMesses()
		var list []Mess
		for _, a := range args {
			m := Mess(a.value)
			if indexOf(known, m) < 0 {
				return fail(a, "@%s: unknown mess %q", key, a.value)
			}
			list = append(list, m)
		}
		if key == "avoid" {
			o.Avoid = list
		} else {
			o.Spellings = list
		}
	case "extra-columns":
		return countOf(&o.ExtraColumns, len(extraNames))
	case "missing-columns":
		return countOf(&o.MissingColumns, 1000)
	case "max-digits":
		return countOf(&o.MaxDigits, 15)
	case "decimals":
		return countOf(&o.Decimals, 6)
	case "max-words":
		return countOf(&o.MaxWords, 1000)
	case "locale":
		return value(func(v string) error {
			l, err := LocaleByTag(v)
			if err != nil {
				return err
			}
			o.Locale = l.Tag
			return nil
		})
	case "mixed-sources":
		return flag(&o.MixedSources)
	case "also":
		if len(args) == 0 {
			return fail(toks[0], "@also takes one or more mess names")
		}
		for _, a := range args {
			m := Mess(a.value)
			if indexOf(AllMesses(), m) < 0 {
				return fail(a, "@also: unknown mess %q", a.value)
			}
			o.Also = append(o.Also, m)
		}
	case "uploads":
		return value(func(v string) error {
			n, err := strconv.Atoi(v)
			if err != nil || n < 1 || n > 1000 {
				return fmt.Errorf("@uploads: want a whole number from 1 to 1000, got %q", v)
			}
			o.Uploads = n
			return nil
		})
	case "overlap":
		return value(func(v string) error {
			r, err := strconv.ParseFloat(v, 64)
			if err != nil || r < 0 || r >= 1 {
				return fmt.Errorf("@overlap: want a share from 0 to below 1, got %q", v)
			}
			if r == 0 {
				r = -1
			}
			o.Overlap = r
			return nil
		})
	case "upload-rate":
		return rateOf(&o.UploadRate)
	case "shuffle":
		return flag(&o.Shuffle)
	case "shuffle-columns":
		return flag(&o.ShuffleColumns)
	case "header-mess":
		return flag(&o.HeaderMess)
	default:
		return fail(toks[0], "unknown setting %q", toks[0].text)
	}
	return nil
}

// ParseEncoding reads an encoding name CSVStyle takes: utf-8, utf-8-bom,
// utf-16le or windows-1252 (any case; also utf8, cp1252).
func ParseEncoding(s string) (fixtures.Encoding, error) {
	switch strings.ToLower(strings.TrimSpace(s)) {
	case "utf-8", "utf8":
		return fixtures.EncodingUTF8, nil
	case "utf-8-bom", "utf8-bom":
		return fixtures.EncodingUTF8BOM, nil
	case "utf-16le", "utf16le":
		return fixtures.EncodingUTF16LE, nil
	case "windows-1252", "cp1252":
		return fixtures.EncodingWindows1252, nil
	}
	return "", fmt.Errorf("unknown encoding %q (want utf-8, utf-8-bom, utf-16le or windows-1252)", s)
}

// ParseDelimiter reads a delimiter CSVStyle takes: , ; | or tab (also \t).
func ParseDelimiter(s string) (rune, error) {
	switch s {
	case ",", ";", "|":
		return rune(s[0]), nil
	case "tab", `\t`, "\t":
		return '\t', nil
	}
	return 0, fmt.Errorf("unknown delimiter %q (want , ; | or tab)", s)
}

func indexOf[T comparable](xs []T, x T) int {
	for i, v := range xs {
		if v == x {
			return i
		}
	}
	return -1
}

// splitBar splits a |-separated list, dropping empty items.
func splitBar(s string) []string {
	var out []string
	for _, p := range strings.Split(s, "|") {
		if p != "" {
			out = append(out, p)
		}
	}
	return out
}

// specToken is one word of a schema file line. text is the word as
// written; value is what it means: for "x" the unquoted string, for
// key="v" the unquoted v, else the text.
type specToken struct {
	text, value string
	quoted      bool
	col         int // 1-based byte column
}

type tokenError struct {
	col int
	err error
}

// specTokens splits a line into words at blanks outside double quotes and
// parentheses.
func specTokens(line string) ([]specToken, *tokenError) {
	var toks []specToken
	i := 0
	for i < len(line) {
		if c := line[i]; c == ' ' || c == '\t' {
			i++
			continue
		}
		if line[i] == '#' && len(toks) > 0 {
			break // a comment after the statement
		}
		start := i
		depth := 0
		quoteAt := -1 // where a quoted part starts
		for i < len(line) {
			c := line[i]
			if c == '"' {
				end, ok := closingQuote(line, i)
				if !ok {
					return nil, &tokenError{i + 1, errors.New("quoted text has no closing quote")}
				}
				if quoteAt < 0 {
					quoteAt = i
				}
				i = end
				continue
			}
			if c == '(' {
				depth++
			} else if c == ')' {
				depth--
			} else if (c == ' ' || c == '\t') && depth <= 0 {
				break
			}
			i++
		}
		text := line[start:i]
		tok := specToken{text: text, value: text, col: start + 1}
		if quoteAt >= 0 {
			if quoteAt == start && text[len(text)-1] == '"' {
				v, err := strconv.Unquote(text)
				if err != nil {
					return nil, &tokenError{start + 1, fmt.Errorf("bad quoted text %s", text)}
				}
				tok.value, tok.quoted = v, true
			} else if eq := strings.IndexByte(text, '='); eq >= 0 && eq+1 == quoteAt-start && text[len(text)-1] == '"' {
				v, err := strconv.Unquote(text[eq+1:])
				if err != nil {
					return nil, &tokenError{quoteAt + 1, fmt.Errorf("bad quoted text %s", text[eq+1:])}
				}
				tok.value = v
			} else {
				return nil, &tokenError{quoteAt + 1, fmt.Errorf("quotes must surround a whole word or the value after =, got %s", text)}
			}
		} else if eq := strings.IndexByte(text, '='); eq >= 0 {
			tok.value = text[eq+1:]
		}
		toks = append(toks, tok)
	}
	return toks, nil
}

// closingQuote returns the index just past the double quote closing the
// one at i, honouring backslash escapes.
func closingQuote(s string, i int) (int, bool) {
	for j := i + 1; j < len(s); j++ {
		switch s[j] {
		case '\\':
			j++
		case '"':
			return j + 1, true
		}
	}
	return 0, false
}
