package assert

import (
	"math/rand/v2"
	"strings"
	"testing"
	"unicode/utf8"

	"github.com/sergi/go-diff/diffmatchpatch"
	"github.com/stretchr/testify/require"
)

// lcsRunes is the length of the longest common subsequence of a and b in
// characters: the textbook dynamic programme, slow and obviously right.
// No edit can keep more characters unchanged.
func lcsRunes(a, b string) int {
	ra, rb := []rune(a), []rune(b)
	prev := make([]int, len(rb)+1)
	cur := make([]int, len(rb)+1)
	for i := 1; i <= len(ra); i++ {
		for j := 1; j <= len(rb); j++ {
			switch {
			case ra[i-1] == rb[j-1]:
				cur[j] = prev[j-1] + 1
			case prev[j] >= cur[j-1]:
				cur[j] = prev[j]
			default:
				cur[j] = cur[j-1]
			}
		}
		prev, cur = cur, prev
	}
	return prev[len(rb)]
}

// checkCharDiff holds charDiff(w, g) to what an edit must be: its equal
// and deleted pieces spell w, its equal and inserted pieces spell g, no
// piece is empty or splits a character; it keeps at least the common
// start and end unchanged and never more than the longest common
// subsequence; and a long changed middle is exactly one deletion and one
// insertion between the common start and end.
func checkCharDiff(t *testing.T, w, g string) {
	t.Helper()
	diffs := charDiff(w, g)
	var ws, gs strings.Builder
	equal := 0
	for _, d := range diffs {
		require.NotEmpty(t, d.Text, "an empty piece in %v", diffs)
		require.True(t, utf8.ValidString(d.Text), "piece %q splits a character", d.Text)
		switch d.Type {
		case diffmatchpatch.DiffEqual:
			ws.WriteString(d.Text)
			gs.WriteString(d.Text)
			equal += utf8.RuneCountInString(d.Text)
		case diffmatchpatch.DiffDelete:
			ws.WriteString(d.Text)
		case diffmatchpatch.DiffInsert:
			gs.WriteString(d.Text)
		}
	}
	require.Equal(t, w, ws.String(), "the edit does not spell want")
	require.Equal(t, g, gs.String(), "the edit does not spell got")
	p := commonPrefix(w, g)
	s := commonSuffix(w[p:], g[p:])
	ends := utf8.RuneCountInString(w[:p]) + utf8.RuneCountInString(w[len(w)-s:])
	require.GreaterOrEqual(t, equal, ends, "the edit loses the common start or end: %v", diffs)
	if len(w)+len(g)-2*(p+s) > editMiddle {
		require.Equal(t, ends, equal, "a long middle is one change: %v", diffs)
	} else if len(w)+len(g) < 400 {
		require.LessOrEqual(t, equal, lcsRunes(w, g), "%v", diffs)
	}
}

// TestCharDiffIsAnEdit checks charDiff on random texts that share a
// start and an end, with short and long changed middles.
func TestCharDiffIsAnEdit(t *testing.T) {
	r := rand.New(rand.NewPCG(1, 2))
	alpha := []rune("aab é🌱\t")
	text := func(n int) string {
		b := make([]rune, n)
		for i := range b {
			b[i] = alpha[r.IntN(len(alpha))]
		}
		return string(b)
	}
	for i := 0; i < 2000; i++ {
		common := text(r.IntN(40))
		tail := text(r.IntN(40))
		n := 60
		if i%10 == 0 {
			n = 600
		}
		checkCharDiff(t, common+text(r.IntN(n))+tail, common+text(r.IntN(n))+tail)
	}
	// Found by FuzzCharDiff: the library's semantic cleanup left empty
	// pieces here, which an edit showed as an empty change.
	checkCharDiff(t, "0020000001010", "01000102000000010")
	line, _ := textEdit("0020000001010", "01000102000000010", editStyle{})
	require.NotContains(t, line, editOpen+editArrow+editClose)
	// From memory: the diff-match-patch API documentation's example of
	// diff_cleanupSemantic: "mouse" → "sofas" shows as one change, not
	// as the letters the words happen to share.
	require.Equal(t, []diffmatchpatch.Diff{{Type: diffmatchpatch.DiffDelete, Text: "mouse"}, {Type: diffmatchpatch.DiffInsert, Text: "sofas"}}, charDiff("mouse", "sofas"))
}

// FuzzCharDiff checks charDiff on any two texts (as textEdit gives them:
// bytes that are not UTF-8 kept as characters of their own).
func FuzzCharDiff(f *testing.F) {
	f.Add("Étang nord", "Étang sud")
	f.Add("aaaa", "aaaaa")
	f.Add("x\u00e9y", "x\u0065\u0301y")
	f.Add("00a1", "01000a")
	f.Add(strings.Repeat("serre ", 50)+"a", strings.Repeat("serre ", 50)+strings.Repeat("b", 600))
	f.Fuzz(func(t *testing.T, w, g string) {
		checkCharDiff(t, keepBytes(w), keepBytes(g))
	})
}

// TestTextEditLongTexts: edits of long texts are made in time linear in
// their length (a Diff JSON with a few cells of 10,000 characters took
// seconds per renderer) and still show the change.
func TestTextEditLongTexts(t *testing.T) {
	body := strings.Repeat("the vent of house Étang opened at dawn; ", 250) // 10,000 characters
	w := body + "tmax 21.5" + body
	g := body + "tmax 22.5" + body
	line, ok := textEdit(w, g, editStyle{})
	require.True(t, ok)
	require.Equal(t, "… at dawn; tmax 2⟦1→2⟧.5the vent of ho…", line)

	// A long changed middle is one change, cut in its middle.
	other := strings.Repeat("a cloudy day at Les Pins with no wind at all. ", 20)
	line, ok = textEdit(body+"x"+body, body+other+body, editStyle{})
	require.True(t, ok)
	require.Equal(t, "…opened at dawn; ⟦x→a⟨sp⟩cloudy⟨sp⟩day⟨sp⟩at⟨sp⟩Les⟨sp⟩Pins⟨sp⟩with⟨sp⟩no…t⟨sp⟩Les⟨sp⟩Pins⟨sp⟩with⟨sp⟩no⟨sp⟩wind⟨sp⟩at⟨sp⟩all.⟨sp⟩⟧the vent of hous…", line)
	require.Less(t, len(line), 600)
}
