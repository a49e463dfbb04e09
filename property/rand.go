package property

import "math/bits"

// rng is a small deterministic pseudo-random generator (SplitMix64). The
// package uses its own so that a seed gives the same bytes on every Go
// version and platform, and so that a whole table is made without the lock
// that gopter's shared source takes on every draw.
//
// A generator can instead read its bits from bytes (see FromBytes): then
// every draw, of it and of the generators split from it, takes the next
// eight bytes, and zero bits once they run out, so that Go's fuzzer steers
// each choice and a shorter input makes a plainer table.
type rng struct {
	s   uint64
	src *byteSource
}

// byteSource is a stream of bytes shared by a generator and its splits.
type byteSource struct{ data []byte }

func newRng(seed int64) *rng { return &rng{s: uint64(seed)} }

// newByteRng returns a generator drawing from data.
func newByteRng(data []byte) *rng { return &rng{src: &byteSource{data: data}} }

// next returns 64 random bits.
func (r *rng) next() uint64 {
	if r.src != nil {
		return r.src.next()
	}
	r.s += 0x9e3779b97f4a7c15
	z := r.s
	z = (z ^ (z >> 30)) * 0xbf58476d1ce4e5b9
	z = (z ^ (z >> 27)) * 0x94d049bb133111eb
	return z ^ (z >> 31)
}

// intn returns a uniform int in [0, n); n must be > 0.
func (r *rng) intn(n int) int {
	hi, _ := bits.Mul64(r.next(), uint64(n))
	return int(hi)
}

// between returns a uniform int64 in [lo, hi].
func (r *rng) between(lo, hi int64) int64 {
	if hi <= lo {
		return lo
	}
	span := uint64(hi-lo) + 1
	if span == 0 { // the whole int64 range
		return int64(r.next())
	}
	h, _ := bits.Mul64(r.next(), span)
	return lo + int64(h)
}

// float returns a uniform float64 in [0, 1).
func (r *rng) float() float64 { return float64(r.next()>>11) / (1 << 53) }

// chance reports true with probability p. It is true for the high draws,
// so that a source of zero bits (a fuzz input that ran out) says no.
func (r *rng) chance(p float64) bool { return p > 0 && r.float() >= 1-p }

// split returns a new generator seeded from this one, for a sub-task whose
// draws must not shift when another sub-task changes. A generator reading
// bytes shares them with its splits.
func (r *rng) split() *rng {
	if r.src != nil {
		return &rng{src: r.src}
	}
	return &rng{s: r.next()}
}

// next takes the next eight bytes as a little-endian word; zero when the
// bytes have run out.
func (b *byteSource) next() uint64 {
	var w [8]byte
	n := copy(w[:], b.data)
	b.data = b.data[n:]
	return uint64(w[0]) | uint64(w[1])<<8 | uint64(w[2])<<16 | uint64(w[3])<<24 |
		uint64(w[4])<<32 | uint64(w[5])<<40 | uint64(w[6])<<48 | uint64(w[7])<<56
}

// pick returns a random element of xs, which must not be empty.
func pick[T any](r *rng, xs []T) T { return xs[r.intn(len(xs))] }
