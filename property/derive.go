package property

import (
	"errors"
	"fmt"
	"math"
	"math/big"
	"strconv"
	"strings"
	"unicode"
	"unicode/utf8"

	"github.com/proofsheet/proofsheet/fixtures"
)

// expr is a parsed Derive expression: column names, numbers, + - * / and
// parentheses, with the usual precedence, computed exactly.
type expr struct {
	op          byte // 0 leaf, '+', '-', '*', '/', 'n' negation
	left, right *expr
	num         *big.Rat // a number leaf
	name        string   // a column leaf
	field       int      // the column's schema index, after bind
}

// parseExpr reads an expression such as "price * qty" or
// "(gross - fee) / 2". A column name with blanks or symbols is written in
// double quotes.
func parseExpr(s string) (*expr, error) {
	p := &exprParser{s: s}
	e, err := p.sum()
	if err != nil {
		return nil, err
	}
	p.blanks()
	if p.i < len(p.s) {
		return nil, fmt.Errorf("unexpected %q at byte %d", p.s[p.i:], p.i+1)
	}
	return e, nil
}

type exprParser struct {
	s string
	i int
}

func (p *exprParser) blanks() {
	for p.i < len(p.s) && (p.s[p.i] == ' ' || p.s[p.i] == '\t') {
		p.i++
	}
}

func (p *exprParser) sum() (*expr, error) {
	e, err := p.product()
	if err != nil {
		return nil, err
	}
	for {
		p.blanks()
		if p.i >= len(p.s) || (p.s[p.i] != '+' && p.s[p.i] != '-') {
			return e, nil
		}
		op := p.s[p.i]
		p.i++
		r, err := p.product()
		if err != nil {
			return nil, err
		}
		e = &expr{op: op, left: e, right: r}
	}
}

func (p *exprParser) product() (*expr, error) {
	e, err := p.unary()
	if err != nil {
		return nil, err
	}
	for {
		p.blanks()
		if p.i >= len(p.s) {
			return e, nil
		}
		op := p.s[p.i]
		switch {
		case op == '*' || op == '/':
			p.i++
		case strings.HasPrefix(p.s[p.i:], "×"):
			op = '*'
			p.i += len("×")
		default:
			return e, nil
		}
		r, err := p.unary()
		if err != nil {
			return nil, err
		}
		e = &expr{op: op, left: e, right: r}
	}
}

func (p *exprParser) unary() (*expr, error) {
	p.blanks()
	if p.i < len(p.s) && p.s[p.i] == '-' {
		p.i++
		e, err := p.unary()
		if err != nil {
			return nil, err
		}
		return &expr{op: 'n', left: e}, nil
	}
	return p.atom()
}

func (p *exprParser) atom() (*expr, error) {
	p.blanks()
	if p.i >= len(p.s) {
		return nil, errors.New("the expression ends early")
	}
	c := p.s[p.i]
	switch {
	case c == '(':
		p.i++
		e, err := p.sum()
		if err != nil {
			return nil, err
		}
		p.blanks()
		if p.i >= len(p.s) || p.s[p.i] != ')' {
			return nil, errors.New("a ( has no )")
		}
		p.i++
		return e, nil
	case c >= '0' && c <= '9' || c == '.':
		start := p.i
		for p.i < len(p.s) && (p.s[p.i] >= '0' && p.s[p.i] <= '9' || p.s[p.i] == '.') {
			p.i++
		}
		v, ok := new(big.Rat).SetString(p.s[start:p.i])
		if !ok {
			return nil, fmt.Errorf("%q is not a number", p.s[start:p.i])
		}
		return &expr{num: v}, nil
	case c == '"':
		end := p.i + 1
		for end < len(p.s) && p.s[end] != '"' {
			if p.s[end] == '\\' {
				end++
			}
			end++
		}
		if end >= len(p.s) {
			return nil, errors.New("a quoted column name has no closing quote")
		}
		name, err := strconv.Unquote(p.s[p.i : end+1])
		if err != nil {
			return nil, fmt.Errorf("bad quoted name %s", p.s[p.i:end+1])
		}
		p.i = end + 1
		return &expr{name: name}, nil
	}
	start := p.i
	for p.i < len(p.s) {
		r, n := utf8.DecodeRuneInString(p.s[p.i:])
		if !(unicode.IsLetter(r) || unicode.IsDigit(r) || r == '_') {
			break
		}
		p.i += n
	}
	if p.i == start {
		return nil, fmt.Errorf("unexpected %q at byte %d", p.s[p.i:], p.i+1)
	}
	return &expr{name: p.s[start:p.i]}, nil
}

// columns lists the column names the expression reads, in order of first
// use.
func (e *expr) columns() []string {
	var out []string
	var walk func(*expr)
	walk = func(x *expr) {
		if x == nil {
			return
		}
		if x.num == nil && x.op == 0 {
			for _, n := range out {
				if n == x.name {
					return
				}
			}
			out = append(out, x.name)
		}
		walk(x.left)
		walk(x.right)
	}
	walk(e)
	return out
}

// bind looks up the schema index of every column leaf.
func (e *expr) bind(schema fixtures.Schema) {
	if e == nil {
		return
	}
	if e.op == 0 && e.num == nil {
		e.field = schema.Index(e.name)
	}
	e.left.bind(schema)
	e.right.bind(schema)
}

// eval computes the expression on a record's clean values; ok is false
// when a value it reads is null or a divisor is zero.
func (e *expr) eval(rec []any) (*big.Rat, bool) {
	switch e.op {
	case 0:
		if e.num != nil {
			return e.num, true
		}
		return ratOf(rec[e.field])
	case 'n':
		v, ok := e.left.eval(rec)
		if !ok {
			return nil, false
		}
		return new(big.Rat).Neg(v), true
	}
	a, ok := e.left.eval(rec)
	if !ok {
		return nil, false
	}
	b, ok := e.right.eval(rec)
	if !ok {
		return nil, false
	}
	out := new(big.Rat)
	switch e.op {
	case '+':
		out.Add(a, b)
	case '-':
		out.Sub(a, b)
	case '*':
		out.Mul(a, b)
	case '/':
		if b.Sign() == 0 {
			return nil, false
		}
		out.Quo(a, b)
	}
	return out, true
}

// ratOf returns a clean number as an exact rational; ok is false for null
// and for values that are not finite numbers.
func ratOf(v any) (*big.Rat, bool) {
	switch x := v.(type) {
	case int64:
		return new(big.Rat).SetInt64(x), true
	case float64:
		// The number as written (its shortest round-trip spelling), not
		// the binary fraction: 0.1 is 1/10, as a reader of the file takes
		// it.
		if math.IsInf(x, 0) || math.IsNaN(x) {
			return nil, false
		}
		return new(big.Rat).SetString(strconv.FormatFloat(x, 'g', -1, 64))
	case fixtures.Decimal:
		return x.Rat(), true
	}
	return nil, false
}

// roundRat rounds r to d decimals, half away from zero, and returns the
// units of 10^-d.
func roundRat(r *big.Rat, d int) *big.Int {
	scale := new(big.Int).Exp(big.NewInt(10), big.NewInt(int64(d)), nil)
	n := new(big.Int).Mul(r.Num(), scale)
	den := r.Denom()
	q, m := new(big.Int).QuoRem(n, den, new(big.Int))
	m.Abs(m).Mul(m, big.NewInt(2))
	if m.Cmp(den) >= 0 {
		if n.Sign() < 0 {
			q.Sub(q, big.NewInt(1))
		} else {
			q.Add(q, big.NewInt(1))
		}
	}
	return q
}
