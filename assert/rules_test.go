package assert

import (
	"math"
	"strings"
	"testing"
	"time"

	"github.com/stretchr/testify/require"
)

func TestRulesRoundTrip(t *testing.T) {
	cases := []struct {
		name  string
		opts  []Option
		parts []string
	}{
		{"none", nil, []string{"rows by position"}},
		{"list limit is no rule", []Option{ListLimit(3)}, []string{"rows by position"}},
		{"keys and tolerances", []Option{ByKey("house", "day"), Tol("tmean", 1e-9, 1e-12), Tol("*", 0, 1e-9), TimeTol("at", time.Second), ULPs("gdd", 4)},
			[]string{"rows by key house, day", "*=rel:1e-09", "at=time:1s", "gdd=ulp:4", "tmean=abs:1e-09,rel:1e-12"}},
		{"multiset, ignore, text, switches", []Option{AnyRowOrder(), IgnoreColumns("note", "battery_v"), NormText("house", NFC|TrimSpace), AnyColumnOrder(), LooseTypes(), NaNIsNull()},
			[]string{"rows in any order", "ignore battery_v, note", "text house=nfc+trim", "any column order", "loose types", "NaN is null"}},
		{"later options win", []Option{AnyRowOrder(), ByKey("k"), Tol("x", 1, 0), ULPs("x", 2)}, []string{"rows by key k", "x=ulp:2"}},
		{"odd names are quoted", []Option{ByKey(" k"), Tol("a=b", 0.5, 0), Tol(`"q`, 0, 0)},
			[]string{`rows by key " k"`, `"\"q"=abs:0`, "a=b=abs:0.5"}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			r := RulesOf(c.opts...)
			require.Equal(t, c.parts, r.Parts())
			back := RulesOf(r.Options()...)
			require.True(t, r.Equal(back), "%v vs %v", r, back)
			require.Equal(t, len(c.parts) == 1 && c.parts[0] == "rows by position", r.IsZero())
			for _, tol := range r.Tolerances {
				p, err := ParseTolerance(tol.String())
				require.NoError(t, err, tol.String())
				require.Equal(t, tol, p)
			}
			for _, tr := range r.Text {
				p, err := ParseTextRule(tr.String())
				require.NoError(t, err)
				require.Equal(t, tr, p)
			}
		})
	}
	require.False(t, RulesOf(ByKey("a")).Equal(RulesOf(ByKey("b"))))
	require.True(t, Rules{}.Equal(RulesOf()), "the zero Rules are the defaults")
}

func TestParseTolerance(t *testing.T) {
	cases := []struct {
		spec string
		want Tolerance
	}{
		{"tmax=abs:0.5", Tolerance{Column: "tmax", Kind: TolAbsRel, Abs: 0.5}},
		{" tmax = ABS:0.1 , rel:0.01 ", Tolerance{Column: "tmax", Kind: TolAbsRel, Abs: 0.1, Rel: 0.01}},
		{"*=rel:1e-9", Tolerance{Column: "*", Kind: TolAbsRel, Rel: 1e-9}},
		{"gdd=ulps:4", Tolerance{Column: "gdd", Kind: TolULPs, ULPs: 4}},
		{"at=time:1m30s", Tolerance{Column: "at", Kind: TolTime, Within: 90 * time.Second}},
		{"a=b=abs:1", Tolerance{Column: "a=b", Kind: TolAbsRel, Abs: 1}},
		{`"air temp " = abs:2`, Tolerance{Column: "air temp ", Kind: TolAbsRel, Abs: 2}},
	}
	for _, c := range cases {
		got, err := ParseTolerance(c.spec)
		require.NoError(t, err, c.spec)
		require.Equal(t, c.want, got, c.spec)
		require.Equal(t, c.want.Column, SpecColumnOf(c.spec))
	}
	bad := []struct{ spec, msg string }{
		{"tmax", "want COLUMN=RULE"},
		{"=abs:1", "no column before ="},
		{"tmax=", "no rule after ="},
		{`"tmax=abs:1`, "no closing quote"},
		{`"tmax" abs:1`, "want = after"},
		{"tmax=abs:" + "NaN", "finite number"},
		{"tmax=ulp:1,time:1s", "ulp stands alone"},
	}
	for _, c := range bad {
		_, err := ParseTolerance(c.spec)
		require.ErrorContains(t, err, c.msg, c.spec)
	}
	_, err := ParseTextRule("house=nfc+shout")
	require.ErrorContains(t, err, `unknown normalisation "shout"`)
}

func TestRulesCompareAlike(t *testing.T) {
	// Options rebuilt from Rules compare exactly as the originals do.
	want := lit(t, `house:string | tmax:float64 | note:string
		Bellecôte | 21.5 | a
		Kæreby    | 19.0 | b`)
	got := lit(t, `house:string | tmax:float64 | note:string
		Kæreby    | 19.0000001 | x
		Bellecôte | 21.5 | y`)
	opts := []Option{ByKey("house"), Tol("tmax", 1e-6, 0), IgnoreColumns("note")}
	require.True(t, Compare(want, got, opts...).Equal())
	require.True(t, Compare(want, got, RulesOf(opts...).Options()...).Equal())
	require.False(t, Compare(want, got, RulesOf(ByKey("house")).Options()...).Equal())
	// Shortest round-trip numbers survive the text form.
	tol := Tolerance{Column: "x", Kind: TolAbsRel, Abs: math.Nextafter(0.1, 1)}
	back, err := ParseTolerance(tol.String())
	require.NoError(t, err)
	require.Equal(t, tol.Abs, back.Abs)
}

func TestSideNames(t *testing.T) {
	want := lit(t, `k:int64 | v:float64 | s:string
		1 | 1.5 | a
		2 | 2.5 | b
		2 | 2.5 | b`)
	got := lit(t, `k:int64 | v:float64
		1 | 1.75
		3 | 3.5`)
	d := Compare(want, got, ByKey("k"))
	d.WantName, d.GotName = "before", "after"
	for name, out := range map[string]string{"text": d.Text(), "markdown": d.Markdown(), "html": d.HTML()} {
		require.Contains(t, out, "before", name)
		require.Contains(t, out, "after", name)
		out = strings.NewReplacer("ps-want", "", "ps-got", "").Replace(out) // class names, not labels
		require.NotRegexp(t, `\bwant\b|\bgot\b`, out, name)
	}
	plain := Compare(want, got, ByKey("k"))
	require.Contains(t, plain.Text(), "want 3 rows, got 2 rows")
}
