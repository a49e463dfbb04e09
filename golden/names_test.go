package golden

import (
	"os"
	"path/filepath"
	"runtime"
	"strings"
	"testing"

	"github.com/stretchr/testify/require"
)

func TestCheckName(t *testing.T) {
	// Path rules of POSIX and of Windows file naming; from memory of the
	// Windows "Naming Files, Paths, and Namespaces" rules (reserved device
	// names, no trailing dot or space, : and \ reserved).
	cases := []struct {
		name string
		ok   bool
		why  string
	}{
		{"report", true, ""},
		{"daily/report", true, ""},
		{"daily/house-7_v2.summary", true, ""},
		{"Étang/été", true, ""},
		{"", false, "empty"},
		{"/etc/passwd", false, "absolute"},
		{`\\server\share\x`, false, "absolute"},
		{`C:\Users\x`, false, "drive"},
		{"C:x", false, "drive"},
		{`daily\report`, false, "backslash"},
		{"../secret", false, `".."`},
		{"daily/../../x", false, `".."`},
		{"daily/..", false, `".."`},
		{"./report", false, `"."`},
		{"daily//report", false, "empty path element"},
		{"daily/", false, "empty path element"},
		{"ab:c", false, "colon"},
		{"daily/x:stream", false, "colon"},
		{"a\x00b", false, "control"},
		{"a\nb", false, "control"},
		{" report", false, "blank"},
		{"report ", false, "blank"},
		{"report.", false, "dot"},
		{"daily/NUL", false, "device"},
		{"con.txt", false, "device"},
		{"com1", false, "device"},
		{"report.gold.tbl", false, "extension"},
		{"report.gold.json", false, "extension"},
	}
	for _, c := range cases {
		t.Run(strings.ReplaceAll(c.name, "/", "|"), func(t *testing.T) {
			err := CheckName(c.name)
			if c.ok {
				require.NoError(t, err)
				return
			}
			require.ErrorIs(t, err, ErrBadName)
			require.Contains(t, err.Error(), c.why)
		})
	}
}

func TestPathStaysInside(t *testing.T) {
	s := tempStore(t)
	p, err := s.Path("daily/report", KindTable)
	require.NoError(t, err)
	require.Equal(t, filepath.Join(s.Root, "daily", "report.gold.tbl"), p)
	for _, k := range []FileKind{KindText, KindJSON} {
		p, err := s.Path("x", k)
		require.NoError(t, err)
		require.True(t, strings.HasSuffix(p, k.Ext()))
	}
	_, err = s.Path("x", FileKind("csv"))
	require.Error(t, err)
	_, err = s.Path("../x", KindText)
	require.ErrorIs(t, err, ErrBadName)
}

func TestPathRefusesSymlinkOut(t *testing.T) {
	if runtime.GOOS == "windows" {
		t.Skip("symbolic links need privileges on Windows")
	}
	s := tempStore(t)
	outside := t.TempDir()
	require.NoError(t, os.Symlink(outside, filepath.Join(s.Root, "out")))
	_, err := s.Path("out/report", KindText)
	require.ErrorIs(t, err, ErrBadName)
	require.Contains(t, err.Error(), "symbolic link")

	// A link that stays inside is fine.
	require.NoError(t, os.Mkdir(filepath.Join(s.Root, "real"), 0o755))
	require.NoError(t, os.Symlink(filepath.Join(s.Root, "real"), filepath.Join(s.Root, "alias")))
	_, err = s.Path("alias/report", KindText)
	require.NoError(t, err)

	// The golden file itself a link to a file outside.
	target := filepath.Join(outside, "victim.txt")
	writeFile(t, target, "keep")
	require.NoError(t, os.Symlink(target, filepath.Join(s.Root, "leak.gold.txt")))
	_, err = s.Path("leak", KindText)
	require.ErrorIs(t, err, ErrBadName)
}

func TestEscapingNameIsRefusedByChecks(t *testing.T) {
	quietEnv(t, true) // even in update mode nothing is written
	s := tempStore(t)
	for _, name := range []string{"../escape", "/abs/x", `..\x`, "a/../../b"} {
		ft := newFake(t)
		require.False(t, s.Text(ft, name, "x"))
		require.Contains(t, ft.failures(), "bad golden name")
		require.False(t, s.JSON(ft, name, 1))
		ft.end()
	}
	entries, err := os.ReadDir(filepath.Dir(s.Root))
	require.NoError(t, err)
	for _, e := range entries {
		require.NotEqual(t, "escape.gold.txt", e.Name())
	}
}
