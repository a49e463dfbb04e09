package property

import (
	"bytes"
	"errors"
	"os"
	"testing"

	"github.com/proofsheet/proofsheet/fixtures"
)

// FuzzParseGenSpec fuzzes the reader of gen schema files (proofsheet gen
// and hammer --schema). No file may panic; an error is a
// *fixtures.ParseError naming the file with a line and column inside it;
// a spec that reads generates (as ParseGenSpec promises) the same bytes
// twice from one seed, and the file generated reads back with
// fixtures' reader, every column of the schema in it unless the spec
// leaves columns out.
func FuzzParseGenSpec(f *testing.F) {
	for _, p := range []string{
		"../testdata/greenhouse/uploads.schema",
		"../testdata/greenhouse/bookings.schema",
	} {
		data, err := os.ReadFile(p)
		if err != nil {
			f.Fatal(err)
		}
		f.Add(data)
	}
	for _, s := range []string{
		greenhouseSpec,
		"a int64 unique=sequential min=1\nb float64 min=-5 max=5 decimals=2 mess=none\nc string length=1..4 alphabet=hex\n",
		"@encoding utf-16le\n@delimiter tab\n@line-ending crlf\nd date mess=month-first\nt timestamp(ms, Europe/Lisbon)\n",
		"@mess heavy\n@mixed-sources\n@locale de-CH\nprice decimal(10,2) min=0 max=99\nqty int64 min=1 max=9\ntotal decimal(12,2) derive=\"price * qty\"\n",
		"@extra-columns 2\n@missing-columns 1\n@header-mess\n@shuffle-columns\nk category levels=\"x|y\" weights=1|3\nv bool\n",
		"\"air temp\" float64 null-rate=0.5 null-tokens=NA|-\n",
		"a int64 # comment\n\n# only a comment\n",
	} {
		f.Add([]byte(s))
	}
	f.Fuzz(func(t *testing.T, data []byte) {
		spec, err := ParseGenSpec("fuzz.schema", data)
		if err != nil {
			var pe *fixtures.ParseError
			if !errors.As(err, &pe) {
				t.Fatalf("got %T %v, want a *fixtures.ParseError", err, err)
			}
			lines := bytes.Count(data, []byte("\n")) + 1
			if pe.Path != "fuzz.schema" || pe.Line < 0 || pe.Line > lines || pe.Line > 0 && pe.Column < 1 {
				t.Fatalf("the error is not placed in the file (%d lines): %#v: %v", lines, pe, err)
			}
			return
		}
		a, err := spec.CSV(8, 3)
		if err != nil {
			t.Fatalf("a spec that reads does not generate: %v", err)
		}
		b, err := spec.CSV(8, 3)
		if err != nil || !bytes.Equal(a, b) {
			t.Fatalf("the same seed gave other bytes (%v)", err)
		}
		tb, _, err := fixtures.ReadBytes("gen.csv", a, fixtures.AllText())
		if err != nil {
			t.Fatalf("the generated file does not read: %v\n%q", err, a)
		}
		if spec.Options.MissingColumns == 0 && !spec.Options.HeaderMess {
			for _, c := range spec.Schema {
				if tb.Column(c.Name) == nil {
					t.Fatalf("column %q is not in the generated file (columns %q)\n%q", c.Name, tb.Names(), a)
				}
			}
		}
	})
}
