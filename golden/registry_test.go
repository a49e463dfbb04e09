package golden

import (
	"bytes"
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"sync"
	"testing"

	"github.com/stretchr/testify/require"
)

func TestSameNameTwiceFails(t *testing.T) {
	quietEnv(t, true)
	s := tempStore(t)

	// Twice in one test.
	ft := newFake(t)
	require.True(t, s.Text(ft, "twice", "a\n"), ft.failures())
	require.False(t, s.Text(ft, "twice", "b\n"))
	require.Contains(t, ft.failures(), `golden name "twice" is used twice by `+ft.name)
	require.Equal(t, "a\n", readFile(t, filepath.Join(s.Root, "twice.gold.txt")))
	ft.end()

	// By another test, even after the first one ended.
	other := &fakeT{name: t.Name() + "/other"}
	require.False(t, s.Text(other, "twice", "a\n"))
	require.Contains(t, other.failures(), "already used by "+ft.name)
	other.end()

	// Another kind under the same name is another file: fine.
	ft2 := &fakeT{name: t.Name() + "/kinds"}
	require.True(t, s.JSON(ft2, "twice", 1), ft2.failures())
	ft2.end()
}

func TestSameTestRunAgainMayReuse(t *testing.T) {
	// go test -count=2 runs a test again under the same name.
	quietEnv(t, true)
	s := tempStore(t)
	for range 2 {
		ft := newFake(t)
		require.True(t, s.Text(ft, "again", "a\n"), ft.failures())
		ft.end()
	}
}

func TestBenchmarkMayRepeat(t *testing.T) {
	quietEnv(t, true)
	s := tempStore(t)
	fb := &fakeB{fakeT{name: t.Name() + "/bench"}}
	for range 3 {
		require.True(t, s.Text(fb, "loop", "a\n"), fb.failures())
	}
	fb.end()
}

func TestParallelChecks(t *testing.T) {
	// Run with -race: many parallel tests create, rewrite and read their own
	// golden files; two of them share a name, and exactly one of those two
	// fails.
	quietEnv(t, true)
	s := tempStore(t)
	var mu sync.Mutex
	var shared []bool
	t.Run("group", func(t *testing.T) {
		for i := range 16 {
			t.Run(fmt.Sprint("p", i), func(t *testing.T) {
				t.Parallel()
				ft := &fakeT{name: t.Name()}
				defer ft.end()
				name := fmt.Sprintf("par/%02d", i)
				require.True(t, s.Text(ft, name, strings.Repeat("x", i)+"\n"), ft.failures())
				require.True(t, s.JSON(ft, name, map[string]int{"i": i}), ft.failures())
				if i < 2 {
					ok := s.Text(ft, "par/shared", "same\n")
					mu.Lock()
					shared = append(shared, ok)
					mu.Unlock()
				}
			})
		}
	})
	require.ElementsMatch(t, []bool{true, false}, shared)
	for i := range 16 {
		require.Equal(t, strings.Repeat("x", i)+"\n", readFile(t, filepath.Join(s.Root, "par", fmt.Sprintf("%02d.gold.txt", i))))
	}
	// no temporary files left behind
	entries, err := os.ReadDir(filepath.Join(s.Root, "par"))
	require.NoError(t, err)
	for _, e := range entries {
		require.False(t, strings.Contains(e.Name(), ".tmp-"), e.Name())
	}
}

func TestStaleAndPrune(t *testing.T) {
	quietEnv(t, false)
	s := tempStore(t)
	for _, f := range []string{"used.gold.txt", "old/report.gold.tbl", "old/deep/x.gold.json", "input.csv", "notes.gold.txt.bak"} {
		writeFile(t, filepath.Join(s.Root, filepath.FromSlash(f)), "x\n")
	}
	ft := newFake(t)
	require.True(t, s.Text(ft, "used", "x\n"), ft.failures())
	ft.end()

	stale, err := s.Stale()
	require.NoError(t, err)
	require.Equal(t, []string{"old/deep/x.gold.json", "old/report.gold.tbl"}, stale)

	removed, err := s.Prune()
	require.NoError(t, err)
	require.Equal(t, stale, removed)
	require.NoDirExists(t, filepath.Join(s.Root, "old")) // emptied directories go too
	require.FileExists(t, filepath.Join(s.Root, "used.gold.txt"))
	require.FileExists(t, filepath.Join(s.Root, "input.csv"))
	require.FileExists(t, filepath.Join(s.Root, "notes.gold.txt.bak"))

	none, err := Store{Root: filepath.Join(s.Root, "absent")}.Stale()
	require.NoError(t, err)
	require.Empty(t, none)
}

func TestSweep(t *testing.T) {
	quietEnv(t, false)
	s := tempStore(t)
	writeFile(t, filepath.Join(s.Root, "keep.gold.txt"), "k\n")
	ft := newFake(t) // the check makes the store's root one the run used
	require.True(t, s.Text(ft, "keep", "k\n"), ft.failures())
	ft.end()
	stalePath := filepath.Join(s.Root, "gone.gold.txt")
	cases := []struct {
		name, what string
		code       int
		m          mode
		partial    string
		wantCode   int
		wantOut    string
		removed    bool
	}{
		{"off", "", 0, mode{}, "", 0, "", false},
		{"list", "list", 0, mode{}, "", 0, "golden: stale ", false},
		{"check fails", "check", 0, mode{}, "", 1, "1 stale golden file;", false},
		{"bad value", "tidy", 0, mode{}, "", 2, "want list, check or prune", false},
		{"partial run", "prune", 0, mode{}, "-run", 0, "stale check skipped: -run", false},
		{"failed run", "prune", 1, mode{}, "", 1, "prune skipped", false},
		{"CI", "prune", 0, mode{ci: "true"}, "", 1, "prune refused", false},
		{"prune", "prune", 0, mode{}, "", 0, "removed stale", true},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			writeFile(t, stalePath, "old\n")
			var out bytes.Buffer
			require.Equal(t, c.wantCode, sweep(&out, c.code, c.what, c.m, c.partial, []string{s.Root}))
			require.Contains(t, out.String(), c.wantOut)
			if c.removed {
				require.NoFileExists(t, stalePath)
			} else {
				require.FileExists(t, stalePath)
			}
		})
	}
}
