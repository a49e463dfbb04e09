package suggest

import (
	"strings"
	"unicode/utf8"
)

// Closest returns the name among names that typed is most likely a slip
// for, and false when none is close enough. Names equal but for letter
// case (Unicode simple folding) come first; then the smallest optimal
// string alignment distance (insertions, deletions, substitutions and
// swaps of two neighbouring characters, counted in characters and without
// regard to case), accepted when it is at most a third of the longer
// name's length (at least 1, at most 3). Ties go to the earlier name, so
// the answer does not depend on anything but the order of names. A name
// equal to typed is not a suggestion.
func Closest(typed string, names []string) (string, bool) {
	best, bestD := "", -1
	for _, n := range names {
		if n == typed {
			continue
		}
		if strings.EqualFold(n, typed) {
			return n, true
		}
		d := Distance(strings.ToLower(typed), strings.ToLower(n))
		limit := min(3, max(1, max(utf8.RuneCountInString(typed), utf8.RuneCountInString(n))/3))
		if d <= limit && (bestD < 0 || d < bestD) {
			best, bestD = n, d
		}
	}
	return best, bestD >= 0
}

// Distance is the optimal string alignment distance between a and b, in
// characters: the fewest insertions, deletions, substitutions and swaps of
// two neighbouring characters that turn a into b, no character edited
// twice.
func Distance(a, b string) int {
	x, y := []rune(a), []rune(b)
	// Three rows of the dynamic-programming table suffice.
	prev2 := make([]int, len(y)+1)
	prev := make([]int, len(y)+1)
	cur := make([]int, len(y)+1)
	for j := range prev {
		prev[j] = j
	}
	for i := 1; i <= len(x); i++ {
		cur[0] = i
		for j := 1; j <= len(y); j++ {
			cost := 1
			if x[i-1] == y[j-1] {
				cost = 0
			}
			cur[j] = min(prev[j]+1, cur[j-1]+1, prev[j-1]+cost)
			if i > 1 && j > 1 && x[i-1] == y[j-2] && x[i-2] == y[j-1] {
				cur[j] = min(cur[j], prev2[j-2]+1)
			}
		}
		prev2, prev, cur = prev, cur, prev2
	}
	return prev[len(y)]
}
