package assert

import (
	"math/rand/v2"
	"strings"
	"testing"

	"github.com/sergi/go-diff/diffmatchpatch"
	"github.com/stretchr/testify/require"
)

// referenceDiff is the character edit as diffmatchpatch makes it from the
// whole texts, without a time limit: slow for long texts, obviously what
// the library means.
func referenceDiff(want, got string) []diffmatchpatch.Diff {
	dmp := diffmatchpatch.New()
	dmp.DiffTimeout = 0
	return dmp.DiffCleanupSemantic(dmp.DiffMain(want, got, false))
}

// TestCharDiffMatchesReference: wherever the changed middle is short
// enough to be diffed, the edit is the library's own edit of the whole
// texts.
func TestCharDiffMatchesReference(t *testing.T) {
	r := rand.New(rand.NewPCG(1, 2))
	alpha := []rune("aab é🌱\t")
	text := func(n int) string {
		b := make([]rune, n)
		for i := range b {
			b[i] = alpha[r.IntN(len(alpha))]
		}
		return string(b)
	}
	for i := 0; i < 3000; i++ {
		common := text(r.IntN(40))
		tail := text(r.IntN(40))
		w := common + text(r.IntN(60)) + tail
		g := common + text(r.IntN(60)) + tail
		require.Equal(t, referenceDiff(w, g), charDiff(w, g), "%q → %q", w, g)
	}
}

// FuzzCharDiff is TestCharDiffMatchesReference on any texts whose
// changed middle is short enough to be diffed.
func FuzzCharDiff(f *testing.F) {
	f.Add("Étang nord", "Étang sud")
	f.Add("aaaa", "aaaaa")
	f.Add("x\u00e9y", "x\u0065\u0301y")
	f.Fuzz(func(t *testing.T, w, g string) {
		w, g = keepBytes(w), keepBytes(g)
		p := commonPrefix(w, g)
		s := commonSuffix(w[p:], g[p:])
		if len(w)+len(g)-2*(p+s) > editMiddle {
			return
		}
		if got, want := charDiff(w, g), referenceDiff(w, g); !equalDiffs(got, want) {
			t.Fatalf("%q → %q:\ngot  %v\nwant %v", w, g, got, want)
		}
	})
}

func equalDiffs(a, b []diffmatchpatch.Diff) bool {
	if len(a) != len(b) {
		return false
	}
	for i := range a {
		if a[i] != b[i] {
			return false
		}
	}
	return true
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
