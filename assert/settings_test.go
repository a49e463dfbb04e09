package assert

import (
	"testing"
	"time"

	"github.com/stretchr/testify/require"
)

func TestSettingsOf(t *testing.T) {
	tests := []struct {
		name string
		opts []Option
		want Settings
	}{
		{"defaults", nil, Settings{Match: MatchByPosition, Tols: map[string]FloatRule{}, TimeTols: map[string]time.Duration{},
			Norms: map[string]TextNorm{}, Limit: DefaultListLimit}},
		{"every option", []Option{ByKey("house", "day"), Tol("tmax", 0.01, 1e-9), ULPs("gdd", 4), Tol(AllColumns, 0, 0),
			TimeTol("at", time.Second), NormText("house", NFC|TrimSpace), IgnoreColumns("note", "batch"), AnyColumnOrder(),
			LooseTypes(), NaNIsNull(), ListLimit(-1)},
			Settings{Match: MatchByKey, Keys: []string{"house", "day"},
				Tols:     map[string]FloatRule{"tmax": {ByTol: true, Abs: 0.01, Rel: 1e-9}, "gdd": {ByULPs: true, ULPs: 4}, AllColumns: {ByTol: true}},
				TimeTols: map[string]time.Duration{"at": time.Second}, Norms: map[string]TextNorm{"house": NFC | TrimSpace},
				Ignore: []string{"batch", "note"}, AnyColumnOrder: true, LooseTypes: true, NaNIsNull: true, Limit: -1}},
		{"later options win", []Option{ByKey("a"), AnyRowOrder(), Tol("x", 1, 0), ULPs("x", 2)},
			Settings{Match: MatchAsMultiset, Tols: map[string]FloatRule{"x": {ByULPs: true, ULPs: 2}}, TimeTols: map[string]time.Duration{},
				Norms: map[string]TextNorm{}, Limit: DefaultListLimit}},
		{"bad values are problems", []Option{Tol("x", -1, 0), ByKey()},
			Settings{Match: MatchByPosition, Tols: map[string]FloatRule{}, TimeTols: map[string]time.Duration{}, Norms: map[string]TextNorm{},
				Limit: DefaultListLimit, Problems: []string{`Tol("x", -1, 0): abs and rel must be finite and ≥ 0`, "ByKey: no key columns given"}}},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			require.Equal(t, tt.want, SettingsOf(tt.opts...))
		})
	}
}

func TestSettingsRuleFallback(t *testing.T) {
	s := SettingsOf(Tol(AllColumns, 0, 1e-6), Tol("tmax", 0.5, 0), TimeTol(AllColumns, time.Minute), NormText(AllColumns, FoldCase))
	require.Equal(t, FloatRule{ByTol: true, Abs: 0.5}, s.FloatRuleFor("tmax"))
	require.Equal(t, FloatRule{ByTol: true, Rel: 1e-6}, s.FloatRuleFor("tmin"))
	d, ok := s.TimeTolFor("at")
	require.True(t, ok)
	require.Equal(t, time.Minute, d)
	require.Equal(t, FoldCase, s.NormFor("house"))
	_, ok = SettingsOf().TimeTolFor("at")
	require.False(t, ok)
	require.Equal(t, FloatRule{}, SettingsOf().FloatRuleFor("x"))
}
