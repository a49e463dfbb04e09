package assert

import (
	"bytes"

	"github.com/proofsheet/proofsheet/fixtures"
)

// Columns with nulls, rows paired by position: 64 rows at a time, the
// validity bits of both sides and the raw values are compared in bulk. A
// run whose validity words are equal and whose raw values are identical is
// equal as a whole (null with null, and identical values are equal under
// every rule); only the rows of other runs are looked at one by one.

// validity is a column's validity bitmap (nil: no nulls) and bit offset;
// it also serves to read a bool column's values.
type validity struct {
	bits []byte
	off  int
}

func validityOf(col *fixtures.Column) validity {
	b, off := col.ValidBits()
	return validity{b, off}
}

// boolBits views a bool column's values as a bitmap.
func boolBits(col *fixtures.Column) validity {
	b, off := col.BoolBits()
	return validity{b, off}
}

// from returns the validity of the rows from row base on, as rows 0….
func (v validity) from(base int) validity {
	if v.bits == nil {
		return v
	}
	return validity{v.bits, v.off + base}
}

// word returns the validity of rows i..i+63 (bit t: row i+t is valid) for
// a column of n rows; rows from n on read as valid.
func (v validity) word(i, n int) uint64 {
	if v.bits == nil {
		return ^uint64(0)
	}
	var w uint64
	pos := v.off + i
	byteAt, shift := pos>>3, uint(pos&7)
	end := min(byteAt+9, len(v.bits))
	for b := end - 1; b >= byteAt; b-- { // up to nine bytes hold 64 bits from any bit position
		w = w<<8 | uint64(v.bits[b])
	}
	if end-byteAt == 9 {
		w = w>>shift | uint64(v.bits[byteAt+8])<<(64-shift)
	} else {
		w >>= shift
	}
	if left := n - i; left < 64 {
		w |= ^uint64(0) << uint(left)
	}
	return w
}

// nullableRun compares rows lo..hi-1 (paired by position; slots are rows)
// of cc's columns, which may hold nulls. rawEqual(a, b) reports whether the
// raw values of rows a..b-1 are identical on both sides; rawSame(k)
// whether row k's raw values are equal as cells when both are valid.
func (cc *colCmp) nullableRun(lo, hi int, rawEqual func(a, b int) bool, rawSame func(k int) bool, r *colResult) {
	wv, gv := validityOf(cc.wc), validityOf(cc.gc)
	n := cc.wc.Len()
	for a := lo; a < hi; a += 64 {
		b := min(a+64, hi)
		vw, vg := wv.word(a, n), gv.word(a, cc.gc.Len())
		if b-a < 64 {
			mask := uint64(1)<<uint(b-a) - 1
			vw, vg = vw&mask, vg&mask
		}
		if vw == vg && rawEqual(a, b) {
			continue
		}
		for k := a; k < b; k++ {
			bit := uint64(1) << uint(k-a)
			wValid, gValid := vw&bit != 0, vg&bit != 0
			switch {
			case !wValid && !gValid:
			case wValid != gValid, !rawSame(k):
				cc.slowCell(k, k, k, r)
			}
		}
	}
}

// compareNullableByPosition is compare for rows paired by position in
// columns with nulls, and in bool columns; it reports false for the kinds
// it does not handle.
func (cc *colCmp) compareNullableByPosition(p pairing, r *colResult, sc *scratch) bool {
	lo, hi := p.base, p.base+p.n
	switch cc.class {
	case classBool:
		wb, gb := boolBits(cc.wc), boolBits(cc.gc)
		nw, ng := cc.wc.Len(), cc.gc.Len()
		cc.nullableRun(lo, hi, func(x, y int) bool {
			mask := ^uint64(0) >> uint(64-(y-x))
			return wb.word(x, nw)&mask == gb.word(x, ng)&mask
		}, func(k int) bool { return cc.wc.Bool(k) == cc.gc.Bool(k) }, r)
	case classText:
		switch {
		case cc.norm == 0 && cc.wc.Kind() == fixtures.KindString && cc.gc.Kind() == fixtures.KindString:
			wo, wd := cc.wc.TextBytes()
			gOff, gd := cc.gc.TextBytes()
			cc.nullableRun(lo, hi, func(x, y int) bool {
				return wo[y]-wo[x] == gOff[y]-gOff[x] && shiftedEqual(wo[x:y+1], gOff[x:y+1]) && bytes.Equal(wd[wo[x]:wo[y]], gd[gOff[x]:gOff[y]])
			}, func(k int) bool { return string(wd[wo[k]:wo[k+1]]) == string(gd[gOff[k]:gOff[k+1]]) }, r)
		default:
			return false
		}
	default:
		return false
	}
	return true
}
