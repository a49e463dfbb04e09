package property

import (
	"errors"
	"fmt"
	"reflect"
	"sync"

	"github.com/leanovate/gopter"

	"github.com/proofsheet/proofsheet/fixtures"
)

var (
	messyType  = reflect.TypeOf(Messy{})
	sampleType = reflect.TypeOf((*Sample)(nil))
	fileType   = reflect.TypeOf((*File)(nil))
)

// failGen is a generator whose every draw fails, labelled with why.
func failGen(t reflect.Type, err error) gopter.Gen {
	return func(*gopter.GenParameters) *gopter.GenResult {
		r := gopter.NewEmptyResult(t)
		r.Labels = []string{err.Error()}
		return r
	}
}

// Cells returns a generator of raw cells for a column: values of the
// field's type in plain and messy spellings, null tokens and sentinels,
// as the options ask. Each cell shrinks to its plain spelling.
// Invalid options make every draw fail; Options.Validate says why.
func Cells(f fixtures.Field, opts Options) gopter.Gen {
	c, err := opts.compile(fixtures.Schema{f})
	if err != nil {
		return failGen(messyType, err)
	}
	return cellGen(newColGen(f, c, c.cols[0]), MessNone)
}

// Spelled returns a generator of cells of the field's type that all carry
// the given mess, such as MessMojibake or MessSerialDate; nulls only for
// MessNullToken and MessSentinel. A spelling the options' locale (default
// en-US) does not use, such as day-first dates in en-US, comes as another
// source writes it, marked MessMixedSources. When a drawn value cannot
// take the mess (a mojibake of plain ASCII) another is drawn, up to 50
// times; a draw that still fails is discarded, which gopter counts against
// the check.
func Spelled(f fixtures.Field, m Mess, opts Options) gopter.Gen {
	opts.Spellings = []Mess{m}
	opts.MessRate, opts.NullRate = 1, -1
	switch m {
	case MessNullToken:
		opts.NullRate = 1
	case MessSentinel:
		opts.SentinelRate = 1
	case MessExtreme:
		opts.ExtremeRate = 1
	}
	c, err := opts.compile(fixtures.Schema{f})
	var np *errNotProducible
	if errors.As(err, &np) {
		// Not a spelling of this locale: let other sources in.
		opts.Spellings = []Mess{m, MessMixedSources}
		c, err = opts.compile(fixtures.Schema{f})
	}
	if err != nil {
		return failGen(messyType, err)
	}
	g := newColGen(f, c, c.cols[0])
	c.force = m
	return cellGen(g, m)
}

// valueMess reports whether a mess is made by the value drawn rather than
// by a speller.
func valueMess(m Mess) bool {
	switch m {
	case MessNullToken, MessSentinel, MessExtreme, MessLong, MessLineEndings:
		return true
	}
	return false
}

func cellGen(g *colGen, want Mess) gopter.Gen {
	var mu sync.Mutex // g makes one cell at a time; gopter may draw from several workers
	return func(p *gopter.GenParameters) *gopter.GenResult {
		mu.Lock()
		defer mu.Unlock()
		r := newRng(p.Rng.Int63())
		m := g.next(r)
		for try := 0; want != MessNone && !m.Mess.Has(want) && try < 50; try++ {
			m = g.next(r)
		}
		if want != MessNone && !m.Mess.Has(want) {
			return gopter.NewEmptyResult(messyType)
		}
		return gopter.NewGenResult(m, cellShrinker(g.field.Type))
	}
}

// cellShrinker shrinks a cell to its plain spelling.
func cellShrinker(t fixtures.Type) gopter.Shrinker {
	return func(v any) gopter.Shrink {
		m := v.(Messy)
		p := plainCell(m, t)
		done := p == m
		return func() (any, bool) {
			if done {
				return nil, false
			}
			done = true
			return p, true
		}
	}
}

// Convenience generators of single messes.

// NullTokens returns a generator of null cells spelled as null tokens
// (opts.NullTokens, or the level's list).
func NullTokens(opts Options) gopter.Gen {
	if opts.Mess == "" || opts.Mess == None {
		opts.Mess = Heavy
	}
	return Spelled(fixtures.Col("value", fixtures.String), MessNullToken, opts)
}

// Sentinels returns a generator of sentinel cells for a column of type t.
func Sentinels(t fixtures.Type, opts Options) gopter.Gen {
	return Spelled(fixtures.Col("value", t), MessSentinel, opts)
}

// ExtremeFloats returns a generator of float64 cells holding ±Inf, NaN,
// -0, subnormals and ±MaxFloat64 in the spellings files use.
func ExtremeFloats() gopter.Gen {
	return Spelled(fixtures.Col("value", fixtures.Float64), MessExtreme, Options{})
}

// InvalidUTF8 returns a generator of string cells with one ill-formed
// UTF-8 sequence (see IllFormedUTF8) inserted; the clean value lacks it.
func InvalidUTF8() gopter.Gen {
	return Spelled(fixtures.Col("value", fixtures.String), MessInvalidUTF8, Options{})
}

// Mojibaked returns a generator of string cells garbled by Mojibake; the
// clean value is the text before.
func Mojibaked() gopter.Gen {
	return Spelled(fixtures.Col("value", fixtures.String), MessMojibake, Options{})
}

// LongTexts returns a generator of string cells n bytes long (n ≥ 1).
func LongTexts(n int) gopter.Gen {
	return Spelled(fixtures.Col("value", fixtures.String), MessLong, Options{LongText: n})
}

// rowsFor picks a row count within the options' bounds and gopter's size.
func rowsFor(c *config, p *gopter.GenParameters) int {
	hi := min(c.maxRows, max(c.minRows, p.MaxSize))
	return c.minRows + p.Rng.Intn(hi-c.minRows+1)
}

// Tables returns a generator of samples (*Sample) of the schema: raw,
// plain and clean tables as the options ask. Tables grow with gopter's
// size within Options.MinRows and MaxRows, and shrink with
// SampleShrinker. Invalid options make every draw fail; Options.Validate
// says why.
func Tables(schema fixtures.Schema, opts Options) gopter.Gen {
	c, err := opts.compile(schema)
	if err != nil {
		return failGen(sampleType, err)
	}
	return func(p *gopter.GenParameters) *gopter.GenResult {
		n := rowsFor(c, p)
		s := generate(schema, n, p.Rng.Int63(), c)
		return gopter.NewGenResult(s, SampleShrinker)
	}
}

// Files returns a generator of raw CSV files (*File) of the schema. Each
// file takes one of the given styles, or, when none is given, a random
// delimiter, quoting, encoding and line ending. Files shrink with
// FileShrinker.
func Files(schema fixtures.Schema, opts Options, styles ...CSVStyle) gopter.Gen {
	c, err := opts.compile(schema)
	if err != nil {
		return failGen(fileType, err)
	}
	for _, st := range styles {
		if _, err := st.norm(); err != nil {
			return failGen(fileType, err)
		}
	}
	return func(p *gopter.GenParameters) *gopter.GenResult {
		n := rowsFor(c, p)
		seed := p.Rng.Int63()
		var st CSVStyle
		if len(styles) > 0 {
			st = styles[p.Rng.Intn(len(styles))]
		} else {
			st = RandomStyle(seed)
		}
		st, _ = st.norm()
		cc := *c
		cc.fits = fitsFor(st.Encoding)
		s := generate(schema, n, seed, &cc)
		data, err := s.CSV(st)
		if err != nil {
			// A value the encoding cannot carry: write UTF-8 instead.
			st.Encoding = fixtures.EncodingUTF8
			data, err = s.CSV(st)
		}
		if err != nil {
			r := gopter.NewEmptyResult(fileType)
			r.Labels = []string{fmt.Sprintf("property: %v", err)}
			return r
		}
		return gopter.NewGenResult(&File{Data: data, Style: st, Sample: s}, FileShrinker)
	}
}

// RandomStyle draws a CSV style from seed: any delimiter, quoting,
// encoding and line ending.
func RandomStyle(seed int64) CSVStyle {
	r := newRng(seed ^ 0x51c5)
	return CSVStyle{
		Delimiter:  pick(r, Delimiters()),
		Quoting:    Quoting(r.intn(int(QuoteMixed) + 1)),
		Encoding:   pick(r, Encodings()),
		LineEnding: LineEnding(r.intn(int(MixedEndings) + 1)),
	}
}
