package fuzzcap

import (
	"flag"
	"testing"
	"time"

	"github.com/stretchr/testify/require"
)

// TestLimitMinimize: the bound is set when the command line leaves it,
// and a value given wins.
func TestLimitMinimize(t *testing.T) {
	f := flag.Lookup(minimizeFlag)
	require.NotNil(t, f, "the testing package no longer has -%s", minimizeFlag)
	old := f.Value.String()
	t.Cleanup(func() { _ = flag.Set(minimizeFlag, old) })

	given := false
	flag.Visit(func(f *flag.Flag) { given = given || f.Name == minimizeFlag })
	LimitMinimize(7 * time.Second)
	if given {
		require.Equal(t, old, f.Value.String())
	} else {
		require.Equal(t, "7s", f.Value.String())
	}
}
