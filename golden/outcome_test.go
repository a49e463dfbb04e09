package golden

import (
	"errors"
	"os"
	"path/filepath"
	"testing"
	"time"

	"github.com/stretchr/testify/require"

	"github.com/proofsheet/proofsheet/assert"
)

func TestOutcomeTable(t *testing.T) {
	s := tempStore(t)
	path := filepath.Join(s.Root, "daily.gold.tbl")

	o := s.CheckTable("daily", daily(t, "reordered"), dailyOpts...)
	require.Equal(t, StatusMissing, o.Status)
	require.Equal(t, path, o.Path)
	require.NoFileExists(t, path, "checking never writes")
	require.True(t, o.NeedsWrite())
	require.NoError(t, o.Update())
	require.Equal(t, StatusNew, o.Status)
	stored := readFile(t, path)
	require.Contains(t, stored, "# match: by key\n# tol: *=abs:1e-09\n")

	// No rules given: the stored ones apply. Noise passes, a change fails.
	o = s.CheckTable("daily", daily(t, "noise"))
	require.Equal(t, StatusEqual, o.Status, o.Detail)
	require.True(t, assert.RulesOf(dailyOpts...).Equal(o.Rules))
	require.False(t, o.NeedsWrite())
	old := time.Date(2021, 3, 4, 5, 6, 7, 0, time.UTC)
	require.NoError(t, os.Chtimes(path, old, old))
	require.NoError(t, o.Update())
	st, err := os.Stat(path)
	require.NoError(t, err)
	require.True(t, st.ModTime().Equal(old), "equal within the rules: untouched")

	o = s.CheckTable("daily", daily(t, "change"))
	require.Equal(t, StatusChanged, o.Status)
	require.Equal(t, 1, o.Diff.CellsDiffering)
	require.Contains(t, o.Detail, "22.5")

	// Rules that differ: used, noted, and an update stores them.
	o = s.CheckTable("daily", daily(t, "base"), assert.ByKey("house", "day"), assert.Tol("*", 0.01, 0))
	require.Equal(t, StatusEqual, o.Status)
	require.Contains(t, o.Note, "rules differ from the stored ones: *=abs:1e-09 → *=abs:0.01")
	require.True(t, o.NeedsWrite())
	require.NoError(t, o.Update())
	require.Equal(t, StatusUpdated, o.Status)
	require.Contains(t, readFile(t, path), "# tol: *=abs:0.01\n")

	// An unreadable golden file is invalid, and an update rewrites it.
	writeFile(t, path, "# proofsheet sheet v2\nnot a table\n")
	o = s.CheckTable("daily", daily(t, "base"))
	require.Equal(t, StatusInvalid, o.Status)
	require.ErrorContains(t, o.Err, "cannot read")
	require.True(t, o.NeedsWrite())
	require.NoError(t, o.Update())
	require.Equal(t, StatusUpdated, o.Status)

	// Bad names and tables the rules do not fit are never written.
	o = s.CheckTable("../escape", daily(t, "base"))
	require.Equal(t, StatusInvalid, o.Status)
	require.ErrorIs(t, o.Err, ErrBadName)
	require.False(t, o.NeedsWrite())
	require.Error(t, o.Update())
	o = s.CheckTable("other", daily(t, "base"), assert.ByKey("greenhouse"))
	require.Equal(t, StatusMissing, o.Status)
	require.ErrorContains(t, o.Update(), "options do not fit")
	require.NoFileExists(t, filepath.Join(s.Root, "other.gold.tbl"))
}

func TestOutcomeTextAndJSON(t *testing.T) {
	s := tempStore(t)
	o := s.CheckText("notes", "season 2026\n")
	require.Equal(t, StatusMissing, o.Status)
	require.NoError(t, o.Update())
	require.Equal(t, "season 2026\n", readFile(t, filepath.Join(s.Root, "notes.gold.txt")))
	require.Equal(t, StatusEqual, s.CheckText("notes", "season 2026\n").Status)
	o = s.CheckText("notes", "season 2027\n")
	require.Equal(t, StatusChanged, o.Status)
	require.Contains(t, o.Detail, "season 2027")

	o = s.CheckJSON("summary", []byte(`{"houses": 3, "gdd": 120.5}`))
	require.NoError(t, o.Update())
	require.Equal(t, "{\n  \"gdd\": 120.5,\n  \"houses\": 3\n}\n", readFile(t, filepath.Join(s.Root, "summary.gold.json")))
	require.Equal(t, StatusEqual, s.CheckJSON("summary", []byte(`{"gdd":120.50,"houses":3.0}`)).Status)
	o = s.CheckJSON("summary", []byte(`{"gdd":121,"houses":3}`))
	require.Equal(t, StatusChanged, o.Status)
	require.Contains(t, o.Detail, "$.gdd: got 121 want 120.5")
	o = s.CheckJSON("summary", []byte(`{"gdd":`))
	require.Equal(t, StatusInvalid, o.Status)
	require.ErrorContains(t, o.Err, "not JSON")
}

func TestUpdateRefusedIn(t *testing.T) {
	env := func(kv map[string]string) func(string) string { return func(k string) string { return kv[k] } }
	require.NoError(t, UpdateRefusedIn(env(nil), "--update"))
	require.NoError(t, UpdateRefusedIn(env(map[string]string{EnvCI: "false"}), "--update"))
	err := UpdateRefusedIn(env(map[string]string{EnvCI: "true"}), "--update")
	require.True(t, errors.Is(err, ErrUpdateRefused))
	require.ErrorContains(t, err, "--update was given but CI=true is set")
	require.NoError(t, UpdateRefusedIn(env(map[string]string{EnvCI: "true", EnvUpdateInCI: "1"}), "--update"))
}
