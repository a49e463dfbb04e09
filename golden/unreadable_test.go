package golden

import (
	"testing"

	"github.com/stretchr/testify/require"
)

func TestReviewNewUnreadable(t *testing.T) {
	good := []byte("# proofsheet sheet v2\n# rows: 1\n# match: by position\na:int64\n1\n")
	bad := []byte("a:int64\n\"open\n")
	cases := []struct {
		name     string
		old, new []byte
		want     bool
	}{
		{"new unreadable", good, bad, true},
		{"old unreadable", bad, good, false},
		{"both fine", good, good, false},
	}
	for _, c := range cases {
		f := ReviewChange(FileChange{Path: "t.gold.tbl", Old: c.old, New: c.new, OldExists: true, NewExists: true})
		require.Equal(t, c.want, f.NewUnreadable, c.name)
		rv := &Review{Files: []FileReview{f}}
		if c.want {
			require.Equal(t, []string{"t.gold.tbl"}, rv.Unreadable())
		} else {
			require.Empty(t, rv.Unreadable())
		}
	}
	f := ReviewChange(FileChange{Path: "j.gold.json", Old: []byte("{}"), New: []byte("{"), OldExists: true, NewExists: true})
	require.True(t, f.NewUnreadable)
}
