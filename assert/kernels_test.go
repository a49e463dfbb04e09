package assert

import (
	"math/rand/v2"
	"testing"

	"github.com/stretchr/testify/require"
)

// checkDiffRuns checks that diffRuns reports every differing position of
// a and b (it may report more).
func checkDiffRuns[T int8 | int16 | int32 | int64 | float64](t *testing.T, a, b []T) {
	t.Helper()
	seen := map[int]bool{}
	diffRuns(a, b, func(k int) { seen[k] = true })
	for k := range a {
		if a[k] != b[k] {
			require.True(t, seen[k], "position %d of %d not reported", k, len(a))
		}
	}
}

func TestDiffRunsFindsEveryDifference(t *testing.T) {
	rng := rand.New(rand.NewPCG(7, 9))
	for _, n := range []int{0, 1, 3, 7, 8, 9, 31, 33, 255, 256, 257, 1000, 5003} {
		for trial := range 5 {
			a8, a16, a32, a64, af := make([]int8, n), make([]int16, n), make([]int32, n), make([]int64, n), make([]float64, n)
			for i := range n {
				a8[i], a16[i], a32[i], a64[i], af[i] = int8(i), int16(i), int32(i), int64(i), float64(i)
			}
			b8, b16, b32, b64, bf := append([]int8(nil), a8...), append([]int16(nil), a16...), append([]int32(nil), a32...), append([]int64(nil), a64...), append([]float64(nil), af...)
			for range trial * 3 {
				if n == 0 {
					break
				}
				i := rng.IntN(n)
				b8[i]++
				b16[i]++
				b32[i]++
				b64[i]++
				bf[i] += 0.5
			}
			if n > 0 {
				b8[n-1]--
				b64[n-1]--
				bf[0] = -bf[0] - 1
			}
			checkDiffRuns(t, a8, b8)
			checkDiffRuns(t, a16, b16)
			checkDiffRuns(t, a32, b32)
			checkDiffRuns(t, a64, b64)
			checkDiffRuns(t, af, bf)
		}
	}
}

func TestShiftedEqual(t *testing.T) {
	cases := []struct {
		a, b []int32
		want bool
	}{
		{nil, nil, true},
		{[]int32{0, 3, 5}, []int32{0, 3, 5}, true},
		{[]int32{0, 3, 5}, []int32{0, 3, 6}, false},
		{[]int32{10, 13, 15}, []int32{0, 3, 5}, true},
		{[]int32{10, 13, 15}, []int32{1, 3, 5}, false},
		{[]int32{7, 8, 9, 10, 11, 12, 13, 14, 15, 16, 17}, []int32{0, 1, 2, 3, 4, 5, 6, 7, 8, 9, 10}, true},
		{[]int32{7, 8, 9, 10, 11, 12, 13, 14, 15, 16, 17}, []int32{0, 1, 2, 3, 4, 5, 6, 7, 8, 9, 11}, false},
		{[]int32{7, 8, 9, 10, 11, 12, 13, 15, 15, 16, 17}, []int32{0, 1, 2, 3, 4, 5, 6, 7, 8, 9, 10}, false},
	}
	for _, c := range cases {
		require.Equal(t, c.want, shiftedEqual(c.a, c.b), "%v %v", c.a, c.b)
	}
}
