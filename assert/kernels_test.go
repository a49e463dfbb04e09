package assert

import (
	"testing"

	"github.com/stretchr/testify/require"
)

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
