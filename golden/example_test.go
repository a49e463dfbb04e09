package golden_test

import (
	"fmt"
	"os"
	"testing"

	"github.com/proofsheet/proofsheet/assert"
	"github.com/proofsheet/proofsheet/fixtures"
	"github.com/proofsheet/proofsheet/golden"
)

// dailyReport stands for the chain under test.
func dailyReport(raw *fixtures.Table) *fixtures.Table { return raw }

func ExampleTable() {
	// In a test function:
	var t *testing.T // the test's *testing.T
	raw, _, err := fixtures.ReadFile("testdata/house-7.csv")
	if err != nil {
		t.Fatal(err)
	}
	// Compared with testdata/daily/house-7.gold.tbl; created and refreshed
	// by `go test -update`, stored sorted by house and day.
	golden.Table(t, "daily/house-7", dailyReport(raw),
		assert.ByKey("house", "day"),
		assert.Tol("tmean", 1e-9, 0))
}

func ExampleInlineTable() {
	// In a test function:
	var t *testing.T // the test's *testing.T
	got := fixtures.MustParse(t, `
		house:string | tmax:float64
		Kæreby       | 19.5
		Bellecôte    | 22.6
	`)
	// Written as InlineTable(t, got, ``, assert.ByKey("house")), then
	// filled in by `go test -update`:
	golden.InlineTable(t, got, `
		# proofsheet sheet v2
		# keys: house
		# rows: 2
		# match: by key
		house:string | tmax:float64
		Bellecôte    | 22.6
		Kæreby       | 19.5
	`, assert.ByKey("house"))
}

func ExampleRunTests() {
	// In the package's main_test.go:
	//
	//	func TestMain(m *testing.M) { os.Exit(golden.RunTests(m)) }
	//
	// then PROOFSHEET_STALE=list go test . lists golden files no test used.
	var m *testing.M
	os.Exit(golden.RunTests(m))
}

func ExampleUpdating() {
	// Instead of a second -update flag (which panics, see the package
	// documentation), follow the same switch for files of your own:
	if golden.Updating() {
		_ = os.WriteFile("testdata/expected-extra.csv", []byte("house,tmax\n"), 0o644)
	}
}

func ExampleEncodeTable() {
	daily, err := fixtures.Parse(`
		house:string | day:date   | tmax:float64 | kept:int64
		Étang        | 2026-04-02 | 19.25        | 138
		"Les Pins"   | 2026-04-01 | ~            | 0
		Étang        | 2026-04-01 | 21.5         | 140
	`)
	if err != nil {
		fmt.Println(err)
		return
	}
	data, err := golden.EncodeTable(daily, []string{"house", "day"})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Print(string(data))
	// Output:
	// # proofsheet sheet v2
	// # keys: house, day
	// # rows: 3
	// # match: by key
	// house:string | day:date | tmax:float64 | kept:int64
	// Les Pins | 2026-04-01 | ~ | 0
	// Étang | 2026-04-01 | 21.5 | 140
	// Étang | 2026-04-02 | 19.25 | 138
}

func ExampleEncodeTableRules() {
	daily, err := fixtures.Parse(`
		house:string | day:date   | tmax:float64 | note:string
		Étang        | 2026-04-02 | 19.25        | ""
		Étang        | 2026-04-01 | 21.5         | "door open"
	`)
	if err != nil {
		fmt.Println(err)
		return
	}
	// The rules a check compares under are stored with the table, so a
	// later check (or proofsheet golden) needs no options.
	rules := assert.RulesOf(assert.ByKey("house", "day"), assert.Tol("tmax", 0.005, 0), assert.IgnoreColumns("note"))
	data, err := golden.EncodeTableRules(daily, rules)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Print(string(data))
	// Output:
	// # proofsheet sheet v2
	// # keys: house, day
	// # rows: 2
	// # match: by key
	// # tol: tmax=abs:0.005
	// # ignore: note
	// house:string | day:date | tmax:float64 | note:string
	// Étang | 2026-04-01 | 21.5 | door open
	// Étang | 2026-04-02 | 19.25 | ""
}

func ExampleCanonicalJSON() {
	season := map[string]any{
		"season": 2026,
		"houses": []map[string]any{{"name": "Étang", "gdd": 412.5}, {"name": "Les Pins", "gdd": 380.0}},
	}
	data, _ := golden.CanonicalJSON(season)
	fmt.Print(string(data))
	// Output:
	// {
	//   "houses": [
	//     {
	//       "gdd": 412.5,
	//       "name": "Étang"
	//     },
	//     {
	//       "gdd": 380,
	//       "name": "Les Pins"
	//     }
	//   ],
	//   "season": 2026
	// }
}

func ExampleJSONDiff() {
	want := []byte(`{"houses":[{"name":"Étang","tmax":21.25},{"name":"Les Pins","tmax":19}],"note":"dry week"}`)
	got := []byte(`{"houses":[{"name":"Étang","tmax":21.5},{"name":"Les Pins","tmax":19},{"name":"Ruche","tmax":18}]}`)
	out, _ := golden.JSONDiff(want, got)
	fmt.Print(out)
	// Output:
	// 3 differences:
	// $.houses[0].tmax: got 21.5 want 21.25
	// $.houses[2]: added: {"name":"Ruche","tmax":18}
	// $.note: removed: "dry week"
}

func ExampleTextDiff() {
	want := "Étang: tmax 21.25\nLes Pins: tmax 19\n"
	got := "Étang: tmax 21.5\nLes Pins: tmax 19\n"
	fmt.Print(golden.TextDiff(want, got))
	// Output:
	// 1 line only in want (-), 1 line only in got (+):
	// want lines 1-2, got lines 1-2:
	// 1   -  Étang: tmax 21.25
	//   1 +  Étang: tmax 21.5
	// 2 2    Les Pins: tmax 19
}
