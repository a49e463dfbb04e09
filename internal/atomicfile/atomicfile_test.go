package atomicfile

import (
	"bytes"
	"errors"
	"io"
	"os"
	"os/exec"
	"path/filepath"
	"runtime"
	"slices"
	"strconv"
	"strings"
	"testing"
	"time"

	"github.com/stretchr/testify/require"
)

// The test binary doubles as the writer that gets killed: with
// ATOMICFILE_CHILD set, TestMain writes the named file as the CLI or a
// golden update would and never finishes.
func TestMain(m *testing.M) {
	if mode := os.Getenv("ATOMICFILE_CHILD"); mode != "" {
		child(mode, os.Getenv("ATOMICFILE_TARGET"))
		return
	}
	os.Exit(m.Run())
}

func child(mode, target string) {
	switch mode {
	case "write":
		if err := Write(target, 0o644, func(w io.Writer) error {
			_, err := io.WriteString(w, "new\n")
			return err
		}); err != nil {
			os.Stderr.WriteString(err.Error())
			os.Exit(1)
		}
		os.Exit(0)
	case "slow-named", "slow-unnamed":
		chunk := bytes.Repeat([]byte("x"), 1<<20)
		writeFile(target, 0o644, func(w io.Writer) error {
			for {
				if _, err := w.Write(chunk); err != nil {
					return err
				}
				os.Stdout.WriteString("wrote\n")
				time.Sleep(20 * time.Millisecond)
			}
		}, mode == "slow-unnamed")
	}
	os.Exit(3)
}

func names(t *testing.T, dir string) []string {
	t.Helper()
	entries, err := os.ReadDir(dir)
	require.NoError(t, err)
	var out []string
	for _, e := range entries {
		out = append(out, e.Name())
	}
	slices.Sort(out)
	return out
}

// killMidWrite starts a writer of target, lets it write a few megabytes
// and kills it with SIGKILL, as the reliability trials did.
func killMidWrite(t *testing.T, target, mode string) {
	t.Helper()
	cmd := exec.Command(os.Args[0], "-test.run=^$")
	cmd.Env = append(os.Environ(), "ATOMICFILE_CHILD="+mode, "ATOMICFILE_TARGET="+target)
	out, err := cmd.StdoutPipe()
	require.NoError(t, err)
	require.NoError(t, cmd.Start())
	buf := make([]byte, 64)
	seen := 0
	for seen < 3*len("wrote\n") {
		n, err := out.Read(buf)
		require.NoError(t, err, "the writer stopped early")
		seen += n
	}
	require.NoError(t, cmd.Process.Kill())
	_ = cmd.Wait()
}

func runWriter(t *testing.T, target string) {
	t.Helper()
	cmd := exec.Command(os.Args[0], "-test.run=^$")
	cmd.Env = append(os.Environ(), "ATOMICFILE_CHILD=write", "ATOMICFILE_TARGET="+target)
	out, err := cmd.CombinedOutput()
	require.NoError(t, err, string(out))
}

func TestKilledWriterLeavesNothingUnnamed(t *testing.T) {
	if runtime.GOOS != "linux" {
		t.Skip("O_TMPFILE is Linux's")
	}
	dir := t.TempDir()
	target := filepath.Join(dir, "big.gold.tbl")
	require.NoError(t, os.WriteFile(target, []byte("old\n"), 0o644))
	killMidWrite(t, target, "slow-unnamed")
	require.Equal(t, []string{"big.gold.tbl"}, names(t, dir), "nothing but the old file")
	got, _ := os.ReadFile(target)
	require.Equal(t, "old\n", string(got))
}

func TestKilledWriterLeftoverRemovedNextTime(t *testing.T) {
	dir := t.TempDir()
	target := filepath.Join(dir, "big.gold.tbl")
	require.NoError(t, os.WriteFile(target, []byte("old\n"), 0o644))
	killMidWrite(t, target, "slow-named")
	left := names(t, dir)
	require.Len(t, left, 2)
	tmp := left[0]
	require.True(t, strings.HasPrefix(tmp, ".big_gold_tbl.proofsheet-tmp-"), tmp)
	// Never a golden file's name, under any of the patterns.
	for _, pattern := range []string{"*.gold.tbl", "*.gold.*", "*.tbl", "*.gold*"} {
		ok, err := filepath.Match(pattern, tmp)
		require.NoError(t, err)
		require.False(t, ok, "%s matches %s", tmp, pattern)
	}
	got, _ := os.ReadFile(target)
	require.Equal(t, "old\n", string(got), "the target is untouched")

	// The next process that writes the same target removes it.
	runWriter(t, target)
	require.Equal(t, []string{"big.gold.tbl"}, names(t, dir))
	got, _ = os.ReadFile(target)
	require.Equal(t, "new\n", string(got))
}

func TestRemoveStaleOnlyOurOwnAndOld(t *testing.T) {
	dir := t.TempDir()
	target := filepath.Join(dir, "report.gold.tbl")
	old := started.Add(-time.Hour)
	dead := deadPID(t)
	files := map[string]time.Time{
		".report_gold_tbl.proofsheet-tmp-" + strconv.Itoa(dead) + "-77":        old,                         // removed
		".report.gold.tbl.tmp-123456":                                          old,                         // an earlier version's: removed
		".report_gold_tbl.proofsheet-tmp-" + strconv.Itoa(os.Getpid()) + "-78": old,                         // a running process's: kept
		".report_gold_tbl.proofsheet-tmp-" + strconv.Itoa(dead) + "-79":        time.Now().Add(time.Minute), // newer than this process: kept
		".other_gold_tbl.proofsheet-tmp-" + strconv.Itoa(dead) + "-80":         old,                         // another target's: kept
		".report_gold_tbl.proofsheet-tmp-x-81":                                 old,                         // not our form: kept
		".report.gold.tbl.tmp-abc":                                             old,                         // not our form: kept
		"report.gold.tbl":                                                      old,
	}
	for name, mt := range files {
		p := filepath.Join(dir, name)
		require.NoError(t, os.WriteFile(p, []byte("x"), 0o644))
		require.NoError(t, os.Chtimes(p, mt, mt))
	}
	removed, err := RemoveStale(target)
	require.NoError(t, err)
	slices.Sort(removed)
	require.Equal(t, []string{".report.gold.tbl.tmp-123456", ".report_gold_tbl.proofsheet-tmp-" + strconv.Itoa(dead) + "-77"}, removed)
	require.Len(t, names(t, dir), len(files)-2)
}

// deadPID returns the id of a process that has exited.
func deadPID(t *testing.T) int {
	t.Helper()
	cmd := exec.Command(os.Args[0], "-test.run=^$")
	cmd.Env = append(os.Environ(), "ATOMICFILE_CHILD=none")
	_ = cmd.Run()
	return cmd.Process.Pid
}

func TestWrite(t *testing.T) {
	dir := t.TempDir()
	target := filepath.Join(dir, "out.csv")
	for _, unnamed := range []bool{true, false} {
		for _, content := range []string{"first\n", "second, over the first\n"} {
			require.NoError(t, writeFile(target, 0o640, func(w io.Writer) error {
				_, err := io.WriteString(w, content)
				return err
			}, unnamed))
			got, err := os.ReadFile(target)
			require.NoError(t, err)
			require.Equal(t, content, string(got))
			fi, err := os.Stat(target)
			require.NoError(t, err)
			require.Equal(t, os.FileMode(0o640), fi.Mode().Perm())
			require.Equal(t, []string{"out.csv"}, names(t, dir))
		}
		// A failed write leaves the file as it was and nothing else.
		boom := errors.New("boom")
		err := writeFile(target, 0o644, func(w io.Writer) error {
			io.WriteString(w, "half")
			return boom
		}, unnamed)
		require.ErrorIs(t, err, boom)
		got, _ := os.ReadFile(target)
		require.Equal(t, "second, over the first\n", string(got))
		require.Equal(t, []string{"out.csv"}, names(t, dir))
	}
}

func TestCheck(t *testing.T) {
	dir := t.TempDir()
	require.NoError(t, Check(filepath.Join(dir, "new.html")))
	require.Equal(t, []string(nil), names(t, dir), "Check leaves nothing")
	require.ErrorContains(t, Check(dir), "is a directory")
	require.ErrorContains(t, Check(filepath.Join(dir, "no", "x.html")), "no directory")
	if runtime.GOOS == "linux" {
		// Nobody, root included, may make files in /sys.
		err := Check("/sys/proofsheet-report.html")
		require.Error(t, err)
		require.True(t, strings.HasPrefix(err.Error(), "write /sys/proofsheet-report.html: "), err.Error())
		var pe *os.PathError
		require.ErrorAs(t, err, &pe)
		require.Equal(t, "/sys/proofsheet-report.html", pe.Path)
		require.NotContains(t, err.Error(), "proofsheet-tmp")
	}
}

func TestStem(t *testing.T) {
	require.Equal(t, "big_gold_tbl", stem("big.gold.tbl"))
	long := strings.Repeat("é", 100) // 200 bytes
	s := stem(long)
	require.LessOrEqual(t, len(s), maxStem)
	require.True(t, strings.HasPrefix(long, s))
	require.Equal(t, 0, len(s)%2, "cut on a character boundary")
}
