package main

import (
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/stretchr/testify/require"
)

func writeTreeFiles(t *testing.T, files map[string]string) string {
	t.Helper()
	root := t.TempDir()
	for p, content := range files {
		full := filepath.Join(root, filepath.FromSlash(p))
		require.NoError(t, os.MkdirAll(filepath.Dir(full), 0o755))
		require.NoError(t, os.WriteFile(full, []byte(content), 0o644))
	}
	return root
}

func TestDiffFolders(t *testing.T) {
	root := writeTreeFiles(t, map[string]string{
		"want/day=2026-04-01/part-0.csv": "house,tmax\nÉtang,21.5\nVerger,19\n",
		"want/day=2026-04-02/part-0.csv": "house,tmax\nÉtang,22.5\n",
		"got/day=2026-04-02/part-0.csv":  "house,tmax\nÉtang,22.5\n",
		"got/day=2026-04-01/part-0.csv":  "house,tmax\nVerger,19\nÉtang,21.75\n",
		"got/day=2026-04-01/_SUCCESS":    "",
	})
	want, got := filepath.Join(root, "want"), filepath.Join(root, "got")

	// As one table each: the partition folder is the day column.
	r := runBin(t, "", nil, "diff", "--format", "json", "--key", "house,day", want, got)
	require.Equal(t, exitDiffers, r.code, r.stderr)
	var d struct {
		Equal          bool `json:"equal"`
		CellsDiffering int  `json:"cells_differing"`
	}
	require.NoError(t, json.Unmarshal([]byte(r.stdout), &d))
	require.False(t, d.Equal)
	require.Equal(t, 1, d.CellsDiffering)
	r = runBin(t, "", nil, "diff", "--key", "house,day", "--tol", "tmax=abs:0.5", want, got)
	require.Equal(t, exitSame, r.code, r.stdout+r.stderr)

	// A glob picks some of the files; the day folders still give the day.
	r = runBin(t, "", nil, "diff", "--key", "house", filepath.Join(want, "day=2026-04-02", "*.csv"), filepath.Join(got, "day=2026-04-02", "*.csv"))
	require.Equal(t, exitSame, r.code, r.stdout+r.stderr)

	// File by file.
	require.NoError(t, os.WriteFile(filepath.Join(got, "extra.csv"), []byte("house\nMas\n"), 0o644))
	r = runBin(t, "", nil, "diff", "--by-file", "--key", "house", want, got)
	require.Equal(t, exitDiffers, r.code, r.stderr)
	require.True(t, strings.HasPrefix(r.stdout, "differs       day=2026-04-01/part-0.csv\n"+
		"equal         day=2026-04-02/part-0.csv\n"+
		"only-in-got   extra.csv\n"), r.stdout)
	require.Contains(t, r.stdout, "\n== day=2026-04-01/part-0.csv\n")
	require.True(t, strings.HasSuffix(r.stdout, "\n3 files compared: 1 equal, 1 differs, 1 only in got\n"), r.stdout)

	r = runBin(t, "", nil, "diff", "--by-file", "--format", "json", "--key", "house", "--tol", "tmax=abs:0.5", want, got)
	require.Equal(t, exitDiffers, r.code, r.stderr)
	var res struct {
		Equal bool `json:"equal"`
		Files []struct {
			Path   string          `json:"path"`
			Status string          `json:"status"`
			Diff   json.RawMessage `json:"diff"`
		} `json:"files"`
	}
	require.NoError(t, json.Unmarshal([]byte(r.stdout), &res))
	require.False(t, res.Equal)
	require.Equal(t, "equal", res.Files[0].Status)
	require.Equal(t, "only-in-got", res.Files[2].Status)
	require.Contains(t, string(res.Files[0].Diff), `"equal": true`)

	require.NoError(t, os.Remove(filepath.Join(got, "extra.csv")))
	r = runBin(t, "", nil, "diff", "--by-file", "--format", "markdown", "--key", "house", "--tol", "tmax=abs:0.5", want, got)
	require.Equal(t, exitSame, r.code, r.stdout+r.stderr)
	require.Contains(t, r.stdout, "**2 files compared: 2 equal, 0 differ**")

	for _, args := range [][]string{
		{"diff", "--by-file", filepath.Join(want, "day=2026-04-01", "part-0.csv"), got},
		{"diff", "--by-file", "--format", "html", want, got},
	} {
		r = runBin(t, "", nil, args...)
		require.Equal(t, exitTrouble, r.code, r.stdout)
	}
}
