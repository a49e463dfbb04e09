package golden

import (
	"bytes"
	"encoding/json"
	"os"
	"strings"
	"testing"
	"time"

	"github.com/proofsheet/proofsheet/assert"
	"github.com/proofsheet/proofsheet/fixtures"
)

// goldenSeeds are stored golden tables: the package's own files, version
// 1 and 2 headers, every rule line, quoted keys, and a table with no
// rows.
func goldenSeeds(tb testing.TB) [][]byte {
	var seeds [][]byte
	for _, p := range []string{"testdata/sheet/daily.gold.tbl", "../cmd/proofsheet/internal/greenhouse/testdata/daily.gold.tbl"} {
		data, err := os.ReadFile(p)
		if err != nil {
			tb.Fatal(err)
		}
		seeds = append(seeds, data)
	}
	tbl := fixtures.MustParse(tb, "house:string | \"day x\":date | tmax:float64 | t:timestamp(ms,Europe/Lisbon) | n:int64\nÉtang | 2026-04-01 | 21.5 | 1900-06-15T12:00:00-00:36:45 | 3\n\"Les Pins\" | ~ | NaN | ~ | -1\n")
	for _, r := range []assert.Rules{
		{Match: assert.MatchByKey, Keys: []string{"house", "day x"}},
		assert.RulesOf(assert.AnyRowOrder(), assert.Tol("tmax", 0.5, 1e-9), assert.ULPs("*", 4), assert.TimeTol("t", time.Second), assert.IgnoreColumns("n"), assert.NormText("house", assert.NFC|assert.TrimSpace), assert.AnyColumnOrder(), assert.LooseTypes(), assert.NaNIsNull()),
		{Match: assert.MatchByPosition},
	} {
		data, err := EncodeTableRules(tbl, r)
		if err != nil {
			tb.Fatal(err)
		}
		seeds = append(seeds, data)
	}
	empty, err := fixtures.Empty(fixtures.Schema{fixtures.Col("a", fixtures.Int64)})
	if err != nil {
		tb.Fatal(err)
	}
	data, err := EncodeTable(empty, nil)
	if err != nil {
		tb.Fatal(err)
	}
	seeds = append(seeds, data,
		[]byte("# proofsheet sheet v1\n# keys: house\n# rows: 1\n# written by hand\nhouse:string | n:int64\nÉtang | 1\n"),
		[]byte("# proofsheet sheet v2\r\n# keys: -\r\n# rows: 0\r\n# match: in any order\r\n# text: \"a=b\"=fold\r\n\"a=b\":string\r\n"))
	return seeds
}

// FuzzDecodeTable reads any bytes as a stored golden table. No input may
// panic; an error names the file; a table that reads is stored again
// (EncodeTableRules with the rules read) and reads back to the same
// table (its rows sorted by the key when rows match by key) and rules,
// and storing that gives the same bytes. Rules that a
// check cannot use (a float64 key) are read: the check reports them.
func FuzzDecodeTable(f *testing.F) {
	for _, s := range goldenSeeds(f) {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, data []byte) {
		tb, info, err := DecodeTable("fuzz.gold.tbl", data)
		if err != nil {
			if !strings.HasPrefix(err.Error(), "fuzz.gold.tbl:") {
				t.Fatalf("the error does not name the file: %v", err)
			}
			return
		}
		if tb.NumRows() != info.Rows {
			t.Fatalf("read %d rows, the header says %d", tb.NumRows(), info.Rows)
		}
		stored, err := EncodeTableRules(tb, info.Rules)
		if err != nil {
			t.Fatalf("a table that reads cannot be stored again: %v", err)
		}
		back, info2, err := DecodeTable("again.gold.tbl", stored)
		if err != nil {
			t.Fatalf("what was stored does not read: %v\n%s", err, stored)
		}
		if !info2.Rules.Equal(info.Rules) {
			t.Fatalf("rules changed: %v, want %v", info2.Rules, info.Rules)
		}
		// Rows are stored sorted by the key when rows match by key, so a
		// file written by hand out of key order comes back sorted.
		want := tb
		if info.Rules.Match == assert.MatchByKey && len(info.Rules.Keys) > 0 {
			sorted, err := tb.SortBy(info.Rules.Keys...)
			if err != nil {
				t.Fatalf("a table stored by key cannot be sorted by it: %v", err)
			}
			want = sorted
		}
		if lit, again := want.Literal(), back.Literal(); lit != again {
			t.Fatalf("the table stored again differs:\n%s\nwant:\n%s", again, lit)
		}
		// A check compares under the stored rules. Rules a check cannot
		// use (a float64 key column) are its problems to report, then.
		// A key that repeats is reported whatever the rows hold (keyed
		// matching cannot pair them), so only the rest must be equal.
		if d := assert.Compare(tb, back, info.Rules.Options()...); !d.Equal() && len(d.Problems) == 0 &&
			(d.Duplicates.WantKeys == 0 || d.CellsDiffering > 0 || d.Missing.Count > 0 || d.Extra.Count > 0) {
			t.Fatalf("the table stored again differs:\n%s", d.Text())
		}
		again, err := EncodeTableRules(back, info2.Rules)
		if err != nil || !bytes.Equal(stored, again) {
			t.Fatalf("storing is not stable (%v):\n%s\nvs\n%s", err, stored, again)
		}
	})
}

// FuzzReadRecords reads any bytes as a run record file and summarises
// the records as proofsheet changes --records does. No input may panic;
// an error names the file and line; records that read are written again
// (one JSON object a line, as the recorder writes them) and read back the
// same; and the summary renders in every format, its JSON valid.
func FuzzReadRecords(f *testing.F) {
	seed := func(rs ...Record) []byte {
		var b bytes.Buffer
		for _, r := range rs {
			line, err := json.Marshal(r)
			if err != nil {
				f.Fatal(err)
			}
			b.Write(append(line, '\n'))
		}
		return b.Bytes()
	}
	d := assert.Compare(
		fixtures.MustParse(f, "house:string | tmax:float64\nÉtang | 21.5\nVerger | 19\n"),
		fixtures.MustParse(f, "house:string | tmax:float64\nÉtang | 21.75\nColline | 18\n"), assert.ByKey("house"))
	dj, err := d.JSON()
	if err != nil {
		f.Fatal(err)
	}
	var compact bytes.Buffer
	if err := json.Compact(&compact, dj); err != nil {
		f.Fatal(err)
	}
	f.Add(seed(
		Record{Test: "TestDaily", Name: "daily/etang", Kind: KindTable, Status: StatusChanged, Path: "report/testdata/daily/etang.gold.tbl", Diff: compact.Bytes(), Detail: "golden: differs"},
		Record{Test: "TestDaily", Name: "daily/etang", Kind: KindTable, Status: StatusEqual, Path: "report/testdata/daily/etang.gold.tbl"},
		Record{Test: "TestNotes", Name: "notes", Kind: KindText, Status: StatusInvalid, Detail: "golden: name used twice"},
		Record{Test: "TestNew", Name: "new", Kind: KindJSON, Status: StatusNew, Path: "x/testdata/new.gold.json", File: "/nonexistent/new.gold.json"},
		Record{Test: "TestMissing", Name: "gone", Kind: KindTable, Status: StatusMissing, Path: "x/testdata/gone.gold.tbl"},
	))
	f.Add([]byte("{\"test\":\"T\",\"status\":\"updated\",\"kind\":\"table\",\"diff\":{\"equal\":false,\"cells_differing\":1}}\n\n  \n{}\n"))
	f.Add([]byte("not json\n"))
	f.Fuzz(func(t *testing.T, data []byte) {
		const file = "/run/records-fuzz.jsonl"
		recs, err := parseRecords(file, data)
		if err != nil {
			if !strings.Contains(err.Error(), file+":") {
				t.Fatalf("the error does not name the file and line: %v", err)
			}
			return
		}
		sortRecords(recs)
		// Written again as the recorder writes them, they read the same.
		var b bytes.Buffer
		for _, r := range recs {
			line, err := json.Marshal(r)
			if err != nil {
				t.Fatalf("a record that reads does not write: %v", err)
			}
			b.Write(append(line, '\n'))
		}
		back, err := parseRecords("again", b.Bytes())
		if err != nil {
			t.Fatalf("records written again do not read: %v", err)
		}
		if len(back) != len(recs) {
			t.Fatalf("%d records read back, want %d", len(back), len(recs))
		}
		for i := range recs {
			w, _ := json.Marshal(recs[i])
			g, _ := json.Marshal(back[i])
			if !bytes.Equal(w, g) {
				t.Fatalf("record %d read back as %s, want %s", i, g, w)
			}
		}
		rv := ReviewRecords(recs)
		_ = rv.Text()
		_ = rv.TextWith(assert.TextStyle{Color: true, Flags: true, Width: 60})
		_ = rv.Markdown()
		_ = rv.HTML()
		js, err := rv.JSON()
		if err != nil {
			t.Fatalf("summary JSON: %v", err)
		}
		if !json.Valid(js) {
			t.Fatalf("summary JSON is not valid:\n%s", js)
		}
	})
}
