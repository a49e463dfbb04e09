package property

import "math/bits"

// rng is a small deterministic pseudo-random generator (SplitMix64). The
// package uses its own so that a seed gives the same bytes on every Go
// version and platform, and so that a whole table is made without the lock
// that gopter's shared source takes on every draw.
type rng struct{ s uint64 }

func newRng(seed int64) *rng { return &rng{s: uint64(seed)} }

// next returns 64 random bits.
func (r *rng) next() uint64 {
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
// draws must not shift when another sub-task changes.
func (r *rng) split() *rng { return &rng{s: r.next()} }

// pick returns a random element of xs, which must not be empty.
func pick[T any](r *rng, xs []T) T { return xs[r.intn(len(xs))] }
