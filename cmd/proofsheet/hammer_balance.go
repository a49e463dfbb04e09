package main

import (
	"fmt"
	"math"
	"math/big"
	"strconv"
	"strings"
	"unicode"

	"github.com/proofsheet/proofsheet/fixtures"
)

// A balance check relates counts and sums of the input and the output:
//
//	balance=sum(kept) + sum(dropped) = in.rows(house, logged_at)
//	balance=out.rows <= in.records
//
// Each side is terms joined by + and -; the relation is one of = (or ==),
// !=, <, <=, >, >=. The terms:
//
//	in.rows           data rows of the input, every file, re-uploads included
//	in.rows(A, B)     input rows whose A and B are not null (null words and
//	                  fault codes count as null)
//	in.records        input rows with re-uploaded duplicates counted once
//	in.files          input files
//	out.rows          output rows
//	sum(C)            the sum of output column C (int64, float64 or
//	                  decimal), nulls left out
//	count(C)          output rows where C is not null
//	123               a whole number
//
// Column names that are not plain words go in double quotes as Go string
// literals: sum("kept rows"). Sums are exact; when a float64 column is
// summed, the sides count as equal within 1e-9 of the larger magnitude.

// balance is a parsed balance relation.
type balance struct {
	text        string
	left, right []balanceTerm
	op          string
}

// balanceTerm is one term of a side, with its sign.
type balanceTerm struct {
	neg  bool
	kind string   // "in.rows", "in.records", "in.files", "out.rows", "sum", "count", "num"
	cols []string // in.rows(…), sum(C), count(C)
	num  int64
}

func (t balanceTerm) String() string {
	switch t.kind {
	case "num":
		return strconv.FormatInt(t.num, 10)
	case "sum", "count", "in.rows":
		if len(t.cols) > 0 {
			return t.kind + "(" + strings.Join(quoteNames(t.cols), ", ") + ")"
		}
	}
	return t.kind
}

func quoteNames(cols []string) []string {
	out := make([]string, len(cols))
	for i, c := range cols {
		if isWord(c) {
			out[i] = c
		} else {
			out[i] = strconv.Quote(c)
		}
	}
	return out
}

func isWord(s string) bool {
	if s == "" {
		return false
	}
	for _, r := range s {
		if !(unicode.IsLetter(r) || unicode.IsDigit(r) || r == '_') {
			return false
		}
	}
	return true
}

// parseBalance reads a balance relation.
func parseBalance(text string) (*balance, error) {
	p := &balanceParser{s: text}
	b := &balance{text: strings.TrimSpace(text)}
	var err error
	if b.left, err = p.side(); err != nil {
		return nil, err
	}
	p.blanks()
	for _, op := range []string{"==", "!=", "<=", ">=", "=", "<", ">"} {
		if strings.HasPrefix(p.s[p.i:], op) {
			b.op = op
			p.i += len(op)
			break
		}
	}
	if b.op == "" {
		return nil, p.errorf("want a relation =, !=, <, <=, > or >= between two sides")
	}
	if b.op == "==" {
		b.op = "="
	}
	if b.right, err = p.side(); err != nil {
		return nil, err
	}
	p.blanks()
	if p.i < len(p.s) {
		return nil, p.errorf("unexpected %q", p.s[p.i:])
	}
	return b, nil
}

type balanceParser struct {
	s string
	i int
}

func (p *balanceParser) errorf(format string, args ...any) error {
	return fmt.Errorf("at column %d: %s", p.i+1, fmt.Sprintf(format, args...))
}

func (p *balanceParser) blanks() {
	for p.i < len(p.s) && (p.s[p.i] == ' ' || p.s[p.i] == '\t') {
		p.i++
	}
}

// side reads terms joined by + and -.
func (p *balanceParser) side() ([]balanceTerm, error) {
	var terms []balanceTerm
	neg := false
	p.blanks()
	if p.i < len(p.s) && (p.s[p.i] == '-' || p.s[p.i] == '+') {
		neg = p.s[p.i] == '-'
		p.i++
	}
	for {
		t, err := p.term()
		if err != nil {
			return nil, err
		}
		t.neg = neg
		terms = append(terms, t)
		p.blanks()
		if p.i < len(p.s) && (p.s[p.i] == '+' || p.s[p.i] == '-') {
			neg = p.s[p.i] == '-'
			p.i++
			continue
		}
		return terms, nil
	}
}

// term reads one term.
func (p *balanceParser) term() (balanceTerm, error) {
	p.blanks()
	start := p.i
	for p.i < len(p.s) && (unicode.IsLetter(rune(p.s[p.i])) || unicode.IsDigit(rune(p.s[p.i])) || p.s[p.i] == '.' || p.s[p.i] == '_') {
		p.i++
	}
	word := p.s[start:p.i]
	if word == "" {
		p.i = start
		return balanceTerm{}, p.errorf("want a term: in.rows, in.rows(COLS), in.records, in.files, out.rows, sum(COL), count(COL) or a number")
	}
	if n, err := strconv.ParseInt(word, 10, 64); err == nil {
		return balanceTerm{kind: "num", num: n}, nil
	}
	t := balanceTerm{kind: word}
	p.blanks()
	hasArgs := p.i < len(p.s) && p.s[p.i] == '('
	switch word {
	case "in.records", "in.files", "out.rows":
		if hasArgs {
			return t, p.errorf("%s takes no columns", word)
		}
		return t, nil
	case "in.rows":
		if !hasArgs {
			return t, nil
		}
	case "sum", "count", "out.sum", "out.count":
		t.kind = strings.TrimPrefix(word, "out.")
		if !hasArgs {
			return t, p.errorf("%s takes a column: %s(COL)", word, word)
		}
	default:
		p.i = start
		return t, p.errorf("unknown term %q (want in.rows, in.rows(COLS), in.records, in.files, out.rows, sum(COL), count(COL) or a number)", word)
	}
	p.i++ // (
	for {
		p.blanks()
		var col string
		if p.i < len(p.s) && p.s[p.i] == '"' {
			q, err := strconv.QuotedPrefix(p.s[p.i:])
			if err != nil {
				return t, p.errorf("a quoted column name has no end")
			}
			col, _ = strconv.Unquote(q)
			p.i += len(q)
		} else {
			cs := p.i
			for p.i < len(p.s) && !strings.ContainsRune(",)", rune(p.s[p.i])) {
				p.i++
			}
			col = strings.TrimSpace(p.s[cs:p.i])
		}
		if col == "" {
			return t, p.errorf("a column name is missing")
		}
		t.cols = append(t.cols, col)
		p.blanks()
		if p.i >= len(p.s) {
			return t, p.errorf("%s( has no closing )", t.kind)
		}
		if p.s[p.i] == ')' {
			p.i++
			break
		}
		p.i++ // ,
	}
	if t.kind != "in.rows" && len(t.cols) != 1 {
		return t, fmt.Errorf("%s takes one column, got %d", t.kind, len(t.cols))
	}
	return t, nil
}

// balanceFacts is what the terms read from one trial: the input's counts
// and the output table.
type balanceFacts struct {
	inRows    int
	inRecords int
	inFiles   int
	inRowsOf  func(cols []string) (int, error)
	out       *fixtures.Table
}

// value is a term's value and whether it came from float64 cells.
func (t balanceTerm) value(f balanceFacts) (*big.Rat, bool, error) {
	n := func(v int) *big.Rat { return new(big.Rat).SetInt64(int64(v)) }
	switch t.kind {
	case "num":
		return new(big.Rat).SetInt64(t.num), false, nil
	case "in.rows":
		if len(t.cols) == 0 {
			return n(f.inRows), false, nil
		}
		c, err := f.inRowsOf(t.cols)
		return n(c), false, err
	case "in.records":
		return n(f.inRecords), false, nil
	case "in.files":
		return n(f.inFiles), false, nil
	case "out.rows":
		return n(f.out.NumRows()), false, nil
	}
	col := f.out.Column(t.cols[0])
	if col == nil {
		return nil, false, fmt.Errorf("no column %q in the output (it has %s)%s", t.cols[0], strings.Join(f.out.Names(), ", "), didYouMean(t.cols[0], f.out.Names()))
	}
	if t.kind == "count" {
		c := 0
		for i := 0; i < col.Len(); i++ {
			if !col.IsNull(i) {
				c++
			}
		}
		return n(c), false, nil
	}
	sum := new(big.Rat)
	float := false
	for i := 0; i < col.Len(); i++ {
		if col.IsNull(i) {
			continue
		}
		switch col.Kind() {
		case fixtures.KindInt64:
			sum.Add(sum, new(big.Rat).SetInt64(col.Int64(i)))
		case fixtures.KindFloat64:
			v := col.Float64(i)
			if math.IsNaN(v) || math.IsInf(v, 0) {
				return nil, true, fmt.Errorf("column %q holds %v on row %d", t.cols[0], v, i+1)
			}
			float = true
			sum.Add(sum, new(big.Rat).SetFloat64(v))
		case fixtures.KindDecimal:
			sum.Add(sum, col.Decimal(i).Rat())
		default:
			return nil, false, fmt.Errorf("column %q is %s; sum() takes int64, float64 or decimal", t.cols[0], col.Type())
		}
	}
	return sum, float, nil
}

// floatSlack is how far apart the sides of a balance may be when a
// float64 column is summed, relative to the larger magnitude. Common
// practice, no published source: a few thousand rounding steps of a sum
// of float64 values stay far below it.
const floatSlack = 1e-9

// check evaluates the relation; it returns "" when it holds, else a line
// with the values of both sides.
func (b *balance) check(f balanceFacts) (string, error) {
	side := func(terms []balanceTerm) (*big.Rat, bool, []string, error) {
		total := new(big.Rat)
		float := false
		var parts []string
		for _, t := range terms {
			v, fl, err := t.value(f)
			if err != nil {
				return nil, false, nil, err
			}
			float = float || fl
			if t.neg {
				total.Sub(total, v)
			} else {
				total.Add(total, v)
			}
			parts = append(parts, t.String()+" = "+ratText(v))
		}
		return total, float, parts, nil
	}
	l, lf, lp, err := side(b.left)
	if err != nil {
		return "", err
	}
	r, rf, rp, err := side(b.right)
	if err != nil {
		return "", err
	}
	cmp := l.Cmp(r)
	if (lf || rf) && cmp != 0 {
		diff := new(big.Rat).Sub(l, r)
		diff.Abs(diff)
		big1 := new(big.Rat).Abs(l)
		if a := new(big.Rat).Abs(r); a.Cmp(big1) > 0 {
			big1 = a
		}
		if diff.Cmp(new(big.Rat).Mul(big1, new(big.Rat).SetFloat64(floatSlack))) <= 0 {
			cmp = 0
		}
	}
	holds := false
	switch b.op {
	case "=":
		holds = cmp == 0
	case "!=":
		holds = cmp != 0
	case "<":
		holds = cmp < 0
	case "<=":
		holds = cmp <= 0
	case ">":
		holds = cmp > 0
	case ">=":
		holds = cmp >= 0
	}
	if holds {
		return "", nil
	}
	return fmt.Sprintf("%s %s %s does not hold: %s is %s, %s is %s (%s; %s)", sideText(b.left), b.op, sideText(b.right),
		sideText(b.left), ratText(l), sideText(b.right), ratText(r), strings.Join(lp, ", "), strings.Join(rp, ", ")), nil
}

func sideText(terms []balanceTerm) string {
	var b strings.Builder
	for i, t := range terms {
		switch {
		case i == 0 && t.neg:
			b.WriteString("-")
		case i > 0 && t.neg:
			b.WriteString(" - ")
		case i > 0:
			b.WriteString(" + ")
		}
		b.WriteString(t.String())
	}
	return b.String()
}

// ratText writes a value: whole numbers as integers, others as the
// shortest float64 that reads back to the nearest float.
func ratText(r *big.Rat) string {
	if r.IsInt() {
		return r.Num().String()
	}
	f, _ := r.Float64()
	return strconv.FormatFloat(f, 'g', -1, 64)
}
