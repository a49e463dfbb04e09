package suggest

import (
	"testing"

	"github.com/stretchr/testify/require"
)

func TestDistance(t *testing.T) {
	cases := []struct {
		a, b string
		want int
	}{
		// Source: Levenshtein (1966) worked example, as in most textbooks —
		// kitten → sitting takes 3 edits.
		{"kitten", "sitting", 3},
		{"", "abc", 3},
		{"abc", "", 3},
		{"abc", "abc", 0},
		// Source: Damerau (1964) — a swap of two neighbouring letters is one
		// error; the optimal string alignment distance counts it as 1.
		{"hosue", "house", 1},
		// Source: the optimal string alignment distance edits no substring
		// twice, so CA → ABC is 3 (it is 2 under unrestricted
		// Damerau–Levenshtein): the standard example of the difference.
		{"CA", "ABC", 3},
		{"Étang", "Etang", 1},
		{"漢字", "漢", 1},
	}
	for _, c := range cases {
		require.Equal(t, c.want, Distance(c.a, c.b), "%q → %q", c.a, c.b)
		require.Equal(t, c.want, Distance(c.b, c.a), "symmetric: %q → %q", c.b, c.a)
	}
}

func TestClosest(t *testing.T) {
	names := []string{"house", "day", "tmax", "tmin", "kept", "readings_dropped"}
	cases := []struct {
		typed string
		want  string
		ok    bool
	}{
		{"hosue", "house", true},
		{"House", "house", true},
		{"t_max", "tmax", true},
		{"tmean", "", false},
		{"readings_droped", "readings_dropped", true},
		{"dy", "day", true},
		{"zone", "", false},
		{"house", "", false}, // an existing name is no slip
		{"tmxa", "tmax", true},
	}
	for _, c := range cases {
		got, ok := Closest(c.typed, names)
		require.Equal(t, c.ok, ok, c.typed)
		require.Equal(t, c.want, got, c.typed)
	}
	got, ok := Closest("tmix", []string{"tmax", "tmin"})
	require.True(t, ok)
	require.Equal(t, "tmax", got, "ties go to the earlier name")
}
