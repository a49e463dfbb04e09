package main

import (
	"math"
	"testing"

	"github.com/stretchr/testify/require"

	"github.com/proofsheet/proofsheet/assert"
	"github.com/proofsheet/proofsheet/fixtures"
)

func TestParseTol(t *testing.T) {
	want := fixtures.MustParse(t, `tmax:float64 | at:timestamp(s)
		100 | 2026-04-01T06:00:00`)
	near := func(tmax float64, at string) *fixtures.Table {
		return fixtures.MustParse(t, "tmax:float64 | at:timestamp(s)\n"+fixtures.FormatFloat(tmax)+" | "+at)
	}
	next := math.Nextafter(100, 200)
	cases := []struct {
		spec  string
		got   *fixtures.Table
		equal bool
	}{
		{"tmax=abs:0.5", near(100.5, "2026-04-01T06:00:00"), true},
		{"tmax=abs:0.5", near(100.6, "2026-04-01T06:00:00"), false},
		// Source: PEP 485 — the relative bound scales with the larger
		// magnitude: |a−b| ≤ rel × max(|a|, |b|).
		{"tmax=rel:0.01", near(101, "2026-04-01T06:00:00"), true},
		{"tmax=rel:0.001", near(101, "2026-04-01T06:00:00"), false},
		{"tmax=abs:0.1,rel:0.01", near(101, "2026-04-01T06:00:00"), true},
		{" tmax = ABS:0.1 , rel:0.01 ", near(101, "2026-04-01T06:00:00"), true},
		{"*=abs:1", near(100.9, "2026-04-01T06:00:00"), true},
		// Source: IEEE 754-2019 §5.3.1 nextUp — the adjacent float is one
		// unit in the last place away.
		{"tmax=ulp:1", near(next, "2026-04-01T06:00:00"), true},
		{"tmax=ulp:0", near(next, "2026-04-01T06:00:00"), false},
		{"at=time:1s", near(100, "2026-04-01T06:00:01"), true},
		{"*=time:500ms", near(100, "2026-04-01T06:00:01"), false},
	}
	for _, c := range cases {
		t.Run(c.spec, func(t *testing.T) {
			o, err := parseTol(c.spec)
			require.NoError(t, err)
			d := assert.Compare(want, c.got, o)
			require.Empty(t, d.Problems)
			require.Equal(t, c.equal, d.Equal(), d.Text())
		})
	}
}

func TestParseTolErrors(t *testing.T) {
	cases := []struct{ spec, msg string }{
		{"tmax", "want COLUMN=RULE"},
		{"=abs:1", "no column before ="},
		{"tmax=", "no rule after ="},
		{"tmax=abs", `rule "abs": want KIND:VALUE`},
		{"tmax=abs:x", "abs:x: want a finite number ≥ 0"},
		{"tmax=abs:NaN", "want a finite number ≥ 0"},
		{"tmax=rel:Inf", "want a finite number ≥ 0"},
		{"tmax=rel:-1e-9", "want a finite number ≥ 0"},
		{"tmax=abs:1,abs:2", "abs given twice"},
		{"tmax=ulp:1.5", "want a whole number"},
		{"tmax=ulp:-1", "want a whole number"},
		{"tmax=ulp:1,rel:1", "ulp stands alone"},
		{"at=time:soon", "want a duration ≥ 0"},
		{"at=time:-1s", "want a duration ≥ 0"},
		{"at=time:1s,abs:1", "time stands alone"},
		{"tmax=close:1", `unknown rule kind "close"`},
	}
	for _, c := range cases {
		t.Run(c.spec, func(t *testing.T) {
			_, err := parseTol(c.spec)
			require.ErrorContains(t, err, c.msg)
			require.ErrorContains(t, err, `--tol "`+c.spec+`"`)
		})
	}
	// A column name may itself hold "=": the rule follows the last one.
	o, err := parseTol("a=b=abs:1")
	require.NoError(t, err)
	tb := fixtures.MustParse(t, "\"a=b\":float64\n1")
	require.True(t, assert.Compare(tb, fixtures.MustParse(t, "\"a=b\":float64\n1.5"), o).Equal())
}
