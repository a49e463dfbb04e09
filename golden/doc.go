// Package golden keeps golden files — stored snapshots of a test's whole
// output — for tables, text and JSON, so that a silent change to a report
// fails the test. Tables are compared with assert.Compare, with the same
// options as assert.Tables (keys, tolerances, …), so float noise within a
// tolerance passes and a real change fails with a table diff instead of a
// text diff.
//
// Typical use:
//
//	func TestDailyReport(t *testing.T) {
//		raw, _, err := fixtures.ReadFile("testdata/house-7.csv")
//		require.NoError(t, err)
//		got := dailyReport(raw)
//		golden.Table(t, "daily/house-7", got,
//			assert.ByKey("house", "day"),
//			assert.Tol("tmean", 1e-9, 1e-12))
//		golden.Text(t, "daily/house-7-summary", summary(got))
//		golden.JSON(t, "daily/house-7-season", season(got))
//	}
//
// # Files
//
// A golden name is a slash-separated relative path; the kind adds the
// extension, under the testdata/ directory of the test's package (go test
// runs tests there):
//
//	golden.Table(t, "daily/report", …)  →  testdata/daily/report.gold.tbl
//	golden.Text(t, "daily/report", …)   →  testdata/daily/report.gold.txt
//	golden.JSON(t, "daily/report", …)   →  testdata/daily/report.gold.json
//
// Use a Store to keep them in another directory. Names that could leave
// the directory on any system (absolute paths, "..", backslashes, drive
// letters, links that lead outside) are refused, and so is a name used a
// second time in one run: each golden file belongs to one check.
//
// A table file is a literal table (fixtures.Parse) without padding, after
// a few lines of metadata — see EncodeTableRules. Rows are sorted by the
// key columns (by bytes, so "Les Pins" before "Étang") when the check
// matches rows by key. It reads like this in a pull request:
//
//	# proofsheet sheet v2
//	# keys: house, day
//	# rows: 2
//	# match: by key
//	# tol: tmax=abs:0.005
//	house:string | day:date | tmax:float64 | kept:int64
//	Les Pins | 2026-04-01 | ~ | 0
//	Étang | 2026-04-01 | 21.5 | 140
//
// # Rules stored with the table
//
// The header keeps the rules the file was written with — how rows match,
// tolerances, ignored columns, text normalisations, switches (see
// assert.Rules) — so a later check, in Go or with proofsheet golden, needs
// no options: golden.Table(t, "daily", got) compares under the stored
// rules. Rules given to a check go on top of the stored ones, rule by rule
// (see MergeRules); when that changes them, the check uses the new rules,
// says so in the test log (and in its failure), and an update stores them.
// The review of changed golden files compares the two versions under the
// rules the new one stores, and counts a change of rules as a change.
// Files written before rules were stored (sheet v1) still read; their keys
// are their only rule.
//
// Text files hold the text as it is. JSON files hold canonical JSON (see
// CanonicalJSON) and are compared by structure, reporting differences by
// JSON path ($.houses[2].tmax: got 21.5 want 21.25).
//
// # Updating
//
// When a check finds no file, or a file that differs, it fails. To write
// the files from what the tests got, run the tests in update mode:
//
//	go test ./... -update
//	PROOFSHEET_UPDATE=1 go test ./...
//
// then review the changed golden files in your diff before you commit
// them. A missing file is never created outside update mode; its failure
// message gives the exact command that creates it. Update mode rewrites
// only files that differ: a table equal to the stored one under the
// check's options (within its tolerances) is left untouched, so float
// noise makes no churn in the repository.
//
// The -update switch is understood only by test binaries that import this
// package (or define a flag named update): `go test ./... -update` fails
// in a package that does not ("flag provided but not defined: -update"). The variable PROOFSHEET_UPDATE=1 works for
// any mix of packages.
//
// # Updates in CI
//
// When the CI variable is set to a true value (CI=true, CI=1 — anything but
// "", 0, false, no or off), as continuous-integration services set it,
// updates are refused: every check that would write fails and says why,
// because a golden file rewritten in CI is a change nobody reviewed. Set
// PROOFSHEET_UPDATE_IN_CI=1 as well to force updates in a job made for
// regenerating files.
//
// # The -update flag and your own
//
// This package defines no flag, so a test package (or any other package in
// the test binary) may define its own flag named update without a clash:
//
//	var update = flag.Bool("update", false, "…") // in your _test.go: fine
//
// When the package is initialised and no flag named update exists yet, it
// takes -update (also --update and -update=true|false) out of os.Args
// itself, before flag.Parse runs, and remembers it. If your package
// defines update as well, one -update then sets both: your flag is set to
// true at the first golden check or Updating call, or in RunTests when it
// is your TestMain, so read *update inside your tests (not in TestMain
// before m.Run). If a flag named update was defined before this package
// was initialised, that flag owns -update and golden follows its value.
// golden.Updating() reports whether this run updates (-update or
// PROOFSHEET_UPDATE, with the CI rule applied) for files of your own.
//
// # Stale files
//
// A golden file that no test uses any more is stale. RunTests, used as the
// package's TestMain, can find and remove them after a full run:
//
//	func TestMain(m *testing.M) { os.Exit(golden.RunTests(m)) }
//
//	PROOFSHEET_STALE=list  go test .   # print stale files
//	PROOFSHEET_STALE=check go test .   # print them and fail if any
//	PROOFSHEET_STALE=prune go test .   # remove them
//
// It only makes sense for a full run of the package: with -run or -skip
// the files of the tests left out would look stale, so the sweep is skipped;
// prune is also skipped when the run failed. Files used only by benchmarks,
// or by tests that skipped themselves, look stale as well: list before you
// prune.
//
// # Inline tables
//
// InlineTable keeps the wanted table in the test's source, as the string
// literal of the call, instead of in a file under testdata/: write the
// call with an empty literal and run with -update, and the table is
// written there (with its rules, gofmt-clean, only that literal changed).
// It suits small tables that read best next to the code; tables of
// table-driven tests and large tables belong in golden files.
//
// # Test artifacts
//
// In a test run with go test -artifacts (Go 1.26), a failing Table or
// InlineTable check writes the Diff's HTML page to t.ArtifactDir() and
// names it in the failure (see assert.WriteArtifactPage).
//
// # Run records
//
// When PROOFSHEET_RECORDS names a directory, every check appends a Record
// (test, name, file, kind, status, and for tables the assert.Diff as JSON)
// to a JSON Lines file there, one file per test process, so a tool can
// summarise what a run found; ReadRecords reads them back.
//
// # Reviews
//
// A Review summarises a set of changed golden files for a person: per file
// its status (new, removed, changed, unchanged within tolerance), row
// counts, key and schema changes, the first changed cells and the largest
// deltas. ReviewChange compares the old and new bytes of one file by its
// kind (tables with assert.Compare, text by line, JSON by path);
// ReviewRecords builds a Review from run records. A Review renders as Text,
// Markdown (for a pull-request comment), JSON and one self-contained HTML
// page. The proofsheet changes command builds one from git.
//
// # Concurrency
//
// Checks may run in parallel tests. Files are written through a temporary
// file that is synced and renamed into place, so a killed process leaves
// either the old file or the new one. The package keeps the bookkeeping of
// one run (which test used which file, which directories) in memory shared
// by the tests of the binary, guarded by a mutex.
package golden
