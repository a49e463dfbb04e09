package assert

import (
	"maps"
	"slices"
	"time"
)

// Settings is what a list of options asks for, as plain values: for code
// that carries out the same comparison somewhere else (inside a SQL
// engine, say) and must know every rule, so that it can apply each one or
// refuse it, never drop it. SettingsOf reads it from the options.
type Settings struct {
	// Match is how rows are paired; Keys are the key columns (MatchByKey).
	Match MatchMode
	Keys  []string

	// Tols holds the float rules (Tol, ULPs) by column name; AllColumns
	// ("*") holds the rule of every float64 column without one of its own.
	Tols map[string]FloatRule
	// TimeTols holds the TimeTol tolerances by column name (AllColumns as
	// for Tols).
	TimeTols map[string]time.Duration
	// Norms holds the NormText normalisations by column name (AllColumns
	// as for Tols).
	Norms map[string]TextNorm

	// Ignore lists the columns of IgnoreColumns, sorted.
	Ignore []string

	AnyColumnOrder bool // AnyColumnOrder was given
	LooseTypes     bool // LooseTypes was given
	NaNIsNull      bool // NaNIsNull was given

	// Limit is the listing cap (ListLimit; negative: no cap).
	Limit int

	// Problems are the bad option values found (a negative tolerance, a
	// key named twice), as Compare reports them.
	Problems []string
}

// FloatRule is the closeness rule of a float64 column. The zero FloatRule
// compares exactly.
type FloatRule struct {
	// ByTol says a Tol rule is set: w and g are equal when
	// |w − g| ≤ max(Abs, Rel × max(|w|, |g|)). Tol(col, 0, 0) sets it too.
	ByTol    bool
	Abs, Rel float64
	// ByULPs says a ULPs rule is set: at most ULPs units in the last place.
	ByULPs bool
	ULPs   uint64
}

// SettingsOf returns the settings the options ask for, after every option
// has been applied in order (later options win, as in Compare).
func SettingsOf(opts ...Option) Settings {
	c := newConfig(opts)
	s := Settings{
		Keys:           slices.Clone(c.keys),
		Tols:           make(map[string]FloatRule, len(c.tols)),
		TimeTols:       maps.Clone(c.timeTols),
		Norms:          maps.Clone(c.norms),
		AnyColumnOrder: c.anyColOrder,
		LooseTypes:     c.loose,
		NaNIsNull:      c.nanIsNull,
		Limit:          c.limit,
		Problems:       slices.Clone(c.problems),
	}
	switch c.mode {
	case byKey:
		s.Match = MatchByKey
	case asMultiset:
		s.Match = MatchAsMultiset
	default:
		s.Match = MatchByPosition
	}
	for col, r := range c.tols {
		s.Tols[col] = FloatRule{ByTol: r.hasTol, Abs: r.abs, Rel: r.rel, ByULPs: r.hasULP, ULPs: r.ulps}
	}
	for col := range c.ignore {
		s.Ignore = append(s.Ignore, col)
	}
	slices.Sort(s.Ignore)
	return s
}

// FloatRuleFor returns the float rule of column col: its own, else the
// AllColumns rule, else the exact rule.
func (s Settings) FloatRuleFor(col string) FloatRule {
	if r, ok := s.Tols[col]; ok {
		return r
	}
	return s.Tols[AllColumns]
}

// TimeTolFor returns the time tolerance of column col (its own, else the
// AllColumns one) and whether there is one.
func (s Settings) TimeTolFor(col string) (time.Duration, bool) {
	if d, ok := s.TimeTols[col]; ok {
		return d, true
	}
	d, ok := s.TimeTols[AllColumns]
	return d, ok
}

// NormFor returns the text normalisations of column col (its own, else
// the AllColumns ones).
func (s Settings) NormFor(col string) TextNorm {
	if n, ok := s.Norms[col]; ok {
		return n
	}
	return s.Norms[AllColumns]
}
