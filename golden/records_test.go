package golden

import (
	"os"
	"path/filepath"
	"testing"

	"github.com/stretchr/testify/require"
)

func TestRecordsOfChecks(t *testing.T) {
	quietEnv(t, false)
	dir := t.TempDir()
	t.Setenv(EnvRecords, dir)
	s := tempStore(t)

	ft := newFake(t)
	s.Text(ft, "b/missing", "x\n") // missing
	*updateFlag = true
	s.Text(ft, "a/new", "x\n") // new
	writeFile(t, filepath.Join(s.Root, "c.gold.txt"), "old\n")
	s.Text(ft, "c", "new\n") // updated
	*updateFlag = false
	writeFile(t, filepath.Join(s.Root, "d.gold.txt"), "same\n")
	s.Text(ft, "d", "same\n") // equal
	writeFile(t, filepath.Join(s.Root, "e.gold.txt"), "was\n")
	s.Text(ft, "e", "is\n") // changed
	s.Text(ft, "../f", "x") // invalid
	t.Setenv(EnvCI, "1")
	*updateFlag = true
	s.Text(ft, "g", "x\n") // refused
	*updateFlag = false
	ft.end()

	recs, err := ReadRecords(dir)
	require.NoError(t, err)
	got := map[string]Status{}
	for _, r := range recs {
		got[r.Name] = r.Status
		require.Equal(t, ft.name, r.Test)
		require.Equal(t, KindText, r.Kind)
		require.Equal(t, r.Status.Failed(), r.Detail != "", r.Name)
	}
	require.Equal(t, map[string]Status{
		"b/missing": StatusMissing, "a/new": StatusNew, "c": StatusUpdated, "d": StatusEqual,
		"e": StatusChanged, "../f": StatusInvalid, "g": StatusRefused,
	}, got)
	// sorted by path; the refused name has none and comes first
	require.Equal(t, "../f", recs[0].Name)
	require.Equal(t, "a/new", recs[1].Name)
}

func TestReadRecordsErrors(t *testing.T) {
	dir := t.TempDir()
	recs, err := ReadRecords(dir)
	require.NoError(t, err)
	require.Empty(t, recs)
	writeFile(t, filepath.Join(dir, "records-1.jsonl"), `{"test":"T","name":"n","kind":"text","status":"equal","future":1}`+"\n\nnot json\n")
	writeFile(t, filepath.Join(dir, "other.jsonl"), "ignored\n")
	_, err = ReadRecords(dir)
	require.ErrorContains(t, err, "records-1.jsonl:3")
}

func TestModulePath(t *testing.T) {
	wd, err := os.Getwd()
	require.NoError(t, err)
	require.Equal(t, "golden/testdata/x.gold.tbl", modulePath(filepath.Join(wd, "testdata", "x.gold.tbl")))
	outside := filepath.Join(t.TempDir(), "x")
	require.Equal(t, filepath.ToSlash(outside), modulePath(outside))
}
