package golden

import (
	"math/rand/v2"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"github.com/sergi/go-diff/diffmatchpatch"
	"github.com/stretchr/testify/require"
)

// editDistance counts the inserted and deleted symbols of an edit script.
func editDistance(ops []diffmatchpatch.Diff) (dels, ins int) {
	for _, d := range ops {
		n := len([]rune(d.Text))
		switch d.Type {
		case diffmatchpatch.DiffDelete:
			dels += n
		case diffmatchpatch.DiffInsert:
			ins += n
		}
	}
	return dels, ins
}

func TestEditScriptMyersExample(t *testing.T) {
	// Source: E. W. Myers, "An O(ND) Difference Algorithm and Its
	// Variations", Algorithmica 1 (1986), §2 and Fig. 1: for
	// A = ABCABBA and B = CBABAC the shortest edit script has D = 5
	// (a longest common subsequence, e.g. CABA, has length 4).
	a, b := "ABCABBA", "CBABAC"
	ops := editOps([]rune(a), []rune(b))
	dels, ins := editDistance(ops)
	require.Equal(t, 5, dels+ins)
	require.Equal(t, 3, dels) // 7 − 4
	require.Equal(t, 2, ins)  // 6 − 4
	dmp := diffmatchpatch.New()
	require.Equal(t, a, dmp.DiffText1(ops)) // the script really turns A into B
	require.Equal(t, b, dmp.DiffText2(ops))

	// The same example as lines goes through the line diff of Text.
	lines := func(s string) string { return strings.Join(strings.Split(s, ""), "\n") + "\n" }
	ld, li := editDistance(lineDiffs(lines(a), lines(b)))
	require.Equal(t, 5, ld/2+li/2) // each line is a letter and its newline
	require.True(t, strings.HasPrefix(TextDiff(lines(a), lines(b)), "3 lines only in want (-), 2 lines only in got (+):\n"))
}

// lcs is the textbook dynamic programme for the length of a longest common
// subsequence.
func lcs(a, b []rune) int {
	prev := make([]int, len(b)+1)
	cur := make([]int, len(b)+1)
	for i := 1; i <= len(a); i++ {
		for j := 1; j <= len(b); j++ {
			switch {
			case a[i-1] == b[j-1]:
				cur[j] = prev[j-1] + 1
			case prev[j] >= cur[j-1]:
				cur[j] = prev[j]
			default:
				cur[j] = cur[j-1]
			}
		}
		prev, cur = cur, prev
	}
	return prev[len(b)]
}

func TestEditScriptIsShortest(t *testing.T) {
	// From memory: Myers 1986, §2: D = N + M − 2·L where L is the length
	// of a longest common subsequence; checked against the LCS dynamic
	// programme on random short strings over a small alphabet.
	r := rand.New(rand.NewPCG(1, 2))
	word := func() []rune {
		w := make([]rune, r.IntN(12))
		for i := range w {
			w[i] = rune('A' + r.IntN(3))
		}
		return w
	}
	for range 500 {
		a, b := word(), word()
		dels, ins := editDistance(editOps(a, b))
		require.Equal(t, len(a)+len(b)-2*lcs(a, b), dels+ins, "%s → %s", string(a), string(b))
	}
}

func TestTextDiffLayout(t *testing.T) {
	want := "house: Étang\nday: 2026-04-01\ntmax: 21.25\ntmin: 8\nkept: 140\ndropped: 2\nnote: ok\n"
	got := "house: Étang\nday: 2026-04-01\ntmax: 21.5\ntmin: 8\nkept: 140\ndropped: 2\nnote: ok\nsource: upload 3\n"
	require.Equal(t, ""+
		"1 line only in want (-), 2 lines only in got (+):\n"+
		"want lines 1-7, got lines 1-8:\n"+
		"1 1    house: Étang\n"+
		"2 2    day: 2026-04-01\n"+
		"3   -  tmax: 21.25\n"+
		"  3 +  tmax: 21.5\n"+
		"4 4    tmin: 8\n"+
		"5 5    kept: 140\n"+
		"6 6    dropped: 2\n"+
		"7 7    note: ok\n"+
		"  8 +  source: upload 3\n",
		TextDiff(want, got))
	require.Equal(t, "", TextDiff(want, want))
}

func TestTextDiffShowsInvisibles(t *testing.T) {
	cases := []struct{ name, want, got, line string }{
		{"trailing blank", "a\nb\n", "a\nb \n", `"b "`},
		{"carriage return", "a\nb\n", "a\nb\r\n", `"b\r"`},
		{"tab", "a\nb\n", "a\n\tb\n", `"\tb"`},
		{"no final newline", "a\nb\n", "a\nb", "b   [no newline at end]"},
		{"no-break space", "a b\n", "a\u00a0b\n", `"a\u00a0b"`},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			require.Contains(t, TextDiff(c.want, c.got), "+  "+c.line+"\n")
		})
	}
}

func TestTextDiffGroupsAndContext(t *testing.T) {
	var w, g []string
	for i := 1; i <= 40; i++ {
		w = append(w, "row "+string(rune('a'+i%26)))
	}
	g = append(g, w...)
	g[4] = "changed near the top"
	g[35] = "changed near the end"
	out := TextDiff(strings.Join(w, "\n")+"\n", strings.Join(g, "\n")+"\n")
	require.Contains(t, out, "want lines 2-8, got lines 2-8:\n")
	require.Contains(t, out, "want lines 33-39, got lines 33-39:\n")
	require.NotContains(t, out, " row "+string(rune('a'+20%26))+"\n") // line 20 is far from both
}

func TestTextDiffLimit(t *testing.T) {
	var w, g strings.Builder
	for i := range 1000 {
		w.WriteString("w" + strings.Repeat("x", i%7) + "\n")
		g.WriteString("g" + strings.Repeat("x", i%7) + "\n")
	}
	out := TextDiff(w.String(), g.String())
	require.Contains(t, out, "more changed lines not shown")
	require.LessOrEqual(t, strings.Count(out, "\n"), textDiffMaxLines+3)
}

func TestTextCheckLifecycle(t *testing.T) {
	quietEnv(t, false)
	s := tempStore(t)
	path := filepath.Join(s.Root, "report", "daily.gold.txt")
	report := "house,tmax\nÉtang,21.5\n"

	// 1. missing: fails and says how to create it
	ft := newFake(t)
	require.False(t, s.Text(ft, "report/daily", report))
	msg := ft.failures()
	require.Contains(t, msg, "does not exist")
	require.Contains(t, msg, "go test ./golden -run '^TestTextCheckLifecycle$/^fake$' -update")
	require.NoFileExists(t, path)
	ft.end()

	// 2. update mode creates it
	*updateFlag = true
	ft = newFake(t)
	require.True(t, s.Text(ft, "report/daily", report), ft.failures())
	require.Equal(t, report, readFile(t, path))
	require.Contains(t, strings.Join(ft.logs, "\n"), "created")
	ft.end()
	*updateFlag = false

	// 3. passes next time
	ft = newFake(t)
	require.True(t, s.Text(ft, "report/daily", report), ft.failures())
	ft.end()

	// 4. a change fails with the line diff
	ft = newFake(t)
	require.False(t, s.Text(ft, "report/daily", "house,tmax\nÉtang,21.75\n"))
	require.Contains(t, ft.failures(), "-  Étang,21.5\n")
	require.Contains(t, ft.failures(), "+  Étang,21.75\n")
	require.Contains(t, ft.failures(), "-update")
	ft.end()

	// 5. update under CI is refused, the file stays
	t.Setenv(EnvCI, "true")
	*updateFlag = true
	ft = newFake(t)
	require.False(t, s.Text(ft, "report/daily", "changed\n"))
	require.Contains(t, ft.failures(), "Not updated")
	require.Contains(t, ft.failures(), EnvUpdateInCI)
	require.Equal(t, report, readFile(t, path))
	ft.end()

	// 6. unless forced
	t.Setenv(EnvUpdateInCI, "1")
	ft = newFake(t)
	require.True(t, s.Text(ft, "report/daily", "changed\n"), ft.failures())
	require.Equal(t, "changed\n", readFile(t, path))
	ft.end()
}

func TestUpdateLeavesEqualFileUntouched(t *testing.T) {
	quietEnv(t, true)
	s := tempStore(t)
	path := filepath.Join(s.Root, "same.gold.txt")
	writeFile(t, path, "same\n")
	old := time.Date(2020, 1, 2, 3, 4, 5, 0, time.UTC)
	require.NoError(t, os.Chtimes(path, old, old))
	ft := newFake(t)
	require.True(t, s.Text(ft, "same", "same\n"))
	st, err := os.Stat(path)
	require.NoError(t, err)
	require.True(t, st.ModTime().Equal(old), "mtime changed to %v", st.ModTime())
	require.Empty(t, ft.logs)
	ft.end()
}
