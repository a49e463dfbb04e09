package assert

import (
	"reflect"
	"strings"
	"testing"

	"github.com/proofsheet/proofsheet/fixtures"
)

// FuzzParseTolerance fuzzes the parser of tolerance specs: the --tol flag
// of proofsheet diff, hammer and golden (which pass the spec to
// ParseTolerance as it is) and the "tol:" lines of stored golden tables.
// No spec may panic; an error says something; a spec that reads is
// written by Tolerance.String as a spec that reads back to the same
// tolerance and writes the same text, names the column SpecColumnOf
// finds, and compares two tables without trouble. The text rules of the
// "text:" lines (ParseTextRule) are held to the same round trip.
func FuzzParseTolerance(f *testing.F) {
	for _, s := range []string{
		"tmax=abs:0.01", "*=rel:1e-09", "tmean=abs:1e-09,rel:1e-12", "gdd=ulp:4", "at=time:1s",
		`"air temp"=abs:0.5`, "a=b=abs:1", " tmax = ABS:0.1 , rel:0 ", "x=time:1h30m", "x=ulps:18446744073709551615",
		"x=abs:-1", "x=abs:NaN", "x=ulp:1,abs:1", `"x=abs:1`, "=abs:1", "x=", "house=nfc+trim+fold", "house=none",
	} {
		f.Add(s)
	}
	want := fixtures.MustParse(f, "x:float64 | at:timestamp(s) | house:string\n1.5 | 2026-04-01T06:00:00 | Étang\n-0 | ~ | ~\n")
	got := fixtures.MustParse(f, "x:float64 | at:timestamp(s) | house:string\n1.5000001 | 2026-04-01T06:00:01 | étang \nNaN | ~ | x\n")
	f.Fuzz(func(t *testing.T, spec string) {
		if tol, err := ParseTolerance(spec); err != nil {
			if strings.TrimSpace(err.Error()) == "" {
				t.Fatalf("%q: an error that says nothing", spec)
			}
		} else {
			text := tol.String()
			back, err := ParseTolerance(text)
			if err != nil {
				t.Fatalf("%q reads as %+v, written %q, which does not read: %v", spec, tol, text, err)
			}
			if !reflect.DeepEqual(tol, back) {
				t.Fatalf("%q reads as %+v, written %q, read back as %+v", spec, tol, text, back)
			}
			if again := back.String(); again != text {
				t.Fatalf("written %q, then %q", text, again)
			}
			if c := SpecColumnOf(spec); c != tol.Column {
				t.Fatalf("%q: SpecColumnOf says %q, the tolerance names %q", spec, c, tol.Column)
			}
			_ = Compare(want, got, tol.Option(), NormText("house", FoldCase)).Text()
		}
		if r, err := ParseTextRule(spec); err == nil {
			text := r.String()
			back, err := ParseTextRule(text)
			if err != nil || !reflect.DeepEqual(r, back) {
				t.Fatalf("text rule %q reads as %+v, written %q, read back as %+v (%v)", spec, r, text, back, err)
			}
			_ = Compare(want, got, NormText(r.Column, r.Norm)).Text()
		}
	})
}
