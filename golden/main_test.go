package golden

import (
	"encoding/json"
	"os"
	"testing"
	"time"

	"github.com/proofsheet/proofsheet/internal/fuzzcap"
)

// The package's own tests use RunTests, so PROOFSHEET_STALE=list go test
// ./golden lists golden files here that no test uses.
// It also bounds the fuzzer's minimizing of each new input (see
// internal/fuzzcap): run records and golden files are kilobytes long.
func TestMain(m *testing.M) {
	fuzzcap.LimitMinimize(3 * time.Second)
	os.Exit(RunTests(m))
}

// The package's own golden files: a sample of the stored table format with
// every column kind, a table check, and the run record layout the CLI
// reads. They are also the documentation of those formats by example.
func TestOwnGoldenFiles(t *testing.T) {
	data, err := EncodeTable(allKinds(t), []string{"day"})
	if err != nil {
		t.Fatal(err)
	}
	Text(t, "sheet/all-kinds", string(data))
	Table(t, "sheet/daily", daily(t, "reordered"), dailyOpts...)
	JSON(t, "records/changed-table", Record{
		Test: "TestDailyReport", Name: "daily/house-7", Kind: KindTable, Status: StatusChanged,
		Path: "report/testdata/daily/house-7.gold.tbl", File: "/src/report/testdata/daily/house-7.gold.tbl",
		Diff: json.RawMessage(`{"equal":false,"cells_differing":1}`), Detail: "golden: testdata/daily/house-7.gold.tbl: got differs from the golden file (want): …",
	})
}
