package golden

import (
	"os"
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

// TestReviewEscapesNames: column and file names with terminal escape
// sequences (ECMA-48 CSI) are quoted in the text and Markdown summaries.
func TestReviewEscapesNames(t *testing.T) {
	old := []byte("# proofsheet sheet v2\n# keys: \"k\\x1b[2J\"\n# rows: 1\n# match: by key\n\"k\\x1b[2J\":int64 | \"v\\x1b]0;t\\a\":float64\n1 | 1.5\n")
	cur := []byte("# proofsheet sheet v2\n# keys: \"k\\x1b[2J\"\n# rows: 1\n# match: by key\n\"k\\x1b[2J\":int64 | \"v\\x1b]0;t\\a\":float64\n1 | 2.5\n")
	f := ReviewChange(FileChange{Path: "testdata/x\x1b[8m.gold.tbl", Old: old, New: cur, OldExists: true, NewExists: true})
	require.Empty(t, f.Problems)
	rv := &Review{Files: []FileReview{f, ReviewChange(FileChange{Path: "n.gold.tbl", New: cur, NewExists: true})}}
	for name, out := range map[string]string{"text": rv.Text(), "markdown": rv.Markdown()} {
		for _, r := range out {
			require.False(t, r != '\n' && (r < 0x20 || r == 0x7f || (r >= 0x80 && r < 0xa0)), "%s: control %U in:\n%s", name, r, out)
		}
		require.Contains(t, out, `"v\x1b]0;t\a"`, name)
		require.Contains(t, out, `"testdata/x\x1b[8m.gold.tbl"`, name)
	}
}

// TestReviewRecordsReadOnlyRegularFiles: a record of a new file whose
// path names a device is summarised without reading it (reading
// /dev/zero never ends).
func TestReviewRecordsReadOnlyRegularFiles(t *testing.T) {
	if _, err := os.Stat("/dev/zero"); err != nil {
		t.Skip("no /dev/zero here")
	}
	rv := ReviewRecords([]Record{{Test: "T", Name: "z", Kind: KindText, Status: StatusNew, Path: "testdata/z.gold.txt", File: "/dev/zero"}})
	require.Len(t, rv.Files, 1)
	require.Equal(t, ReviewNew, rv.Files[0].Status)
	_, err := readRegular("/dev/zero")
	require.ErrorContains(t, err, "/dev/zero is not a regular file")
	_, err = readRegular("")
	require.Error(t, err)
}
