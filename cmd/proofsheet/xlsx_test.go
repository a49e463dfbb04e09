package main

import (
	"encoding/json"
	"os"
	"path/filepath"
	"testing"

	"github.com/stretchr/testify/require"
	"github.com/xuri/excelize/v2"

	"github.com/proofsheet/proofsheet/fixtures"
)

func TestDiffSpreadsheetAgainstCSV(t *testing.T) {
	dir := t.TempDir()
	// The expected output kept in a spreadsheet, written by excelize.
	f := excelize.NewFile()
	require.NoError(t, f.SetSheetName("Sheet1", "Notes"))
	_, err := f.NewSheet("Daily")
	require.NoError(t, err)
	require.NoError(t, f.SetSheetRow("Daily", "A1", &[]any{"house", "day", "cost"}))
	dateStyle, err := f.NewStyle(&excelize.Style{NumFmt: 14})
	require.NoError(t, err)
	for i, row := range [][]any{{"Étang", 46113, 12.4}, {"Verger", 46114, 3.05}} {
		cell, _ := excelize.CoordinatesToCellName(1, i+2)
		require.NoError(t, f.SetSheetRow("Daily", cell, &row))
		day, _ := excelize.CoordinatesToCellName(2, i+2)
		require.NoError(t, f.SetCellStyle("Daily", day, day, dateStyle))
	}
	want := filepath.Join(dir, "expected.xlsx")
	require.NoError(t, f.SaveAs(want))
	require.NoError(t, f.Close())
	got := filepath.Join(dir, "got.csv")
	require.NoError(t, os.WriteFile(got, []byte("house,day,cost\nVerger,2026-04-02,3.05\nÉtang,2026-04-01,12.40\n"), 0o644))

	r := runBin(t, "", nil, "diff", "--sheet", "Daily", "--key", "house", "--types", "cost=decimal(10,2)", want, got)
	require.Equal(t, exitSame, r.code, r.stdout+r.stderr)
	r = runBin(t, "", nil, "diff", "--sheet", "2", "--key", "house", "--types", "cost=decimal(10,2)", want, got)
	require.Equal(t, exitSame, r.code, r.stdout+r.stderr)
	r = runBin(t, "", nil, "diff", "--key", "house", want, got)
	require.Equal(t, exitTrouble, r.code, "the first sheet, Notes, is empty")
	require.Contains(t, r.stderr, "expected.xlsx:Notes row 1: the sheet is empty")

	r = runBin(t, "", nil, "profile", "--format", "json", "--sheet", "Daily", want)
	require.Equal(t, exitSame, r.code, r.stderr)
	var rep fixtures.LoadReport
	require.NoError(t, json.Unmarshal([]byte(r.stdout), &rep))
	require.Equal(t, fixtures.FormatXLSX, rep.Format)
	require.Equal(t, "Daily", rep.Sheet)
	require.Equal(t, fixtures.KindDate, rep.Column("day").Kind)
}
