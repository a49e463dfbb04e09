package property

import (
	"math"
	"math/bits"
	"strconv"

	"github.com/proofsheet/proofsheet/fixtures"
)

// A fast path for derived columns: the values a record's number columns
// were drawn with, as small fractions n/d of int64, so that "price × qty"
// needs no big.Rat. Any overflow falls back to the exact big.Rat path,
// which the tests hold it to (TestFastDeriveAgreesWithBigRat).

// frac is n/d with d > 0; ok is false when unknown (null, or too large).
type frac struct {
	n, d int64
	ok   bool
}

// fracOf returns the value v spells, from its digit parts.
func fracOf(v *value) frac {
	if len(v.intd)+len(v.frac) > 18 || v.intd == "" {
		return frac{}
	}
	u, err := strconv.ParseInt(v.intd+v.frac, 10, 64)
	if err != nil {
		return frac{}
	}
	if v.neg {
		u = -u
	}
	return frac{n: u, d: pow10s[len(v.frac)], ok: true}
}

func gcd(a, b int64) int64 {
	if a < 0 {
		a = -a
	}
	for b != 0 {
		a, b = b, a%b
	}
	return a
}

// mulOK returns a × b, or false on overflow.
func mulOK(a, b int64) (int64, bool) {
	if a == 0 || b == 0 {
		return 0, true
	}
	hi, lo := bits.Mul64(uint64(abs64(a)), uint64(abs64(b)))
	if hi != 0 || lo > math.MaxInt64 || a == math.MinInt64 || b == math.MinInt64 {
		return 0, false
	}
	p := int64(lo)
	if (a < 0) != (b < 0) {
		p = -p
	}
	return p, true
}

func addOK(a, b int64) (int64, bool) {
	s := a + b
	if (a > 0 && b > 0 && s < 0) || (a < 0 && b < 0 && s >= 0) {
		return 0, false
	}
	return s, true
}

func reduce(n, d int64) frac {
	if d < 0 {
		if n == math.MinInt64 || d == math.MinInt64 {
			return frac{}
		}
		n, d = -n, -d
	}
	if g := gcd(n, d); g > 1 {
		n, d = n/g, d/g
	}
	return frac{n: n, d: d, ok: true}
}

// evalFast computes the expression on fractions; ok is false when a value
// is unknown, a divisor is zero or a step overflows.
func (e *expr) evalFast(vals []frac) frac {
	switch e.op {
	case 0:
		if e.num != nil {
			if !e.num.Num().IsInt64() || !e.num.Denom().IsInt64() {
				return frac{}
			}
			return frac{n: e.num.Num().Int64(), d: e.num.Denom().Int64(), ok: true}
		}
		return vals[e.field]
	case 'n':
		a := e.left.evalFast(vals)
		if !a.ok || a.n == math.MinInt64 {
			return frac{}
		}
		return frac{n: -a.n, d: a.d, ok: true}
	}
	a := e.left.evalFast(vals)
	if !a.ok {
		return frac{}
	}
	b := e.right.evalFast(vals)
	if !b.ok {
		return frac{}
	}
	switch e.op {
	case '+', '-':
		if e.op == '-' {
			if b.n == math.MinInt64 {
				return frac{}
			}
			b.n = -b.n
		}
		x, ok1 := mulOK(a.n, b.d)
		y, ok2 := mulOK(b.n, a.d)
		d, ok3 := mulOK(a.d, b.d)
		s, ok4 := addOK(x, y)
		if !ok1 || !ok2 || !ok3 || !ok4 {
			return frac{}
		}
		return reduce(s, d)
	case '*':
		n, ok1 := mulOK(a.n, b.n)
		d, ok2 := mulOK(a.d, b.d)
		if !ok1 || !ok2 {
			return frac{}
		}
		return reduce(n, d)
	case '/':
		if b.n == 0 {
			return frac{}
		}
		n, ok1 := mulOK(a.n, b.d)
		d, ok2 := mulOK(a.d, b.n)
		if !ok1 || !ok2 {
			return frac{}
		}
		return reduce(n, d)
	}
	return frac{}
}

// roundFrac rounds n/d to dec decimals, half away from zero, as units of
// 10^-dec; ok is false on overflow.
func roundFrac(f frac, dec int) (int64, bool) {
	n, ok := mulOK(f.n, pow10s[dec])
	if !ok {
		return 0, false
	}
	q, r := n/f.d, n%f.d
	if r < 0 {
		r = -r
	}
	if r >= f.d-r { // 2r ≥ d without overflow
		if n < 0 {
			q--
		} else {
			q++
		}
	}
	return q, true
}

// derivedFast sets v to the derived value of f; false when the fast path
// cannot (the caller then takes the exact one).
func (g *colGen) derivedFast(f frac, v *value) bool {
	dec := g.cc.maxDec
	u, ok := roundFrac(f, dec)
	if !ok {
		return false
	}
	switch g.kind {
	case fixtures.KindInt64:
		setUnits(v, u, 0, true)
		v.clean, v.plain = u, strconv.FormatInt(u, 10)
	case fixtures.KindFloat64:
		if abs64(u) >= 1<<53 {
			return false
		}
		// Both exact in binary64, so the quotient is the float nearest
		// the decimal (IEEE 754 division is correctly rounded).
		x := float64(u) / math.Pow10(dec)
		setUnits(v, u, dec, false)
		v.clean, v.plain = x, fixtures.FormatFloat(x)
		if v.plain != numberText(v.neg, v.intd, v.frac, ".") {
			return false // an exponent spelling: let the exact path spell it
		}
	case fixtures.KindDecimal:
		t := g.field.Type
		units, ok := mulOK(u, pow10s[t.Scale()-dec])
		if !ok || abs64(units) >= pow10s[min(t.Precision(), 18)] {
			return false
		}
		setUnits(v, units, t.Scale(), true)
		v.clean, v.plain = fixtures.NewDecimal(units, t.Scale()), numberText(v.neg, v.intd, v.frac, ".")
	default:
		return false
	}
	return true
}
