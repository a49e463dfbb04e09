package golden

import (
	"os/exec"
	"strings"
	"testing"

	"github.com/stretchr/testify/require"
)

func TestTakeUpdateArg(t *testing.T) {
	for _, c := range []struct {
		in   []string
		out  []string
		want bool
	}{
		{[]string{"x.test"}, []string{"x.test"}, false},
		{[]string{"x.test", "-test.v=true", "-update"}, []string{"x.test", "-test.v=true"}, true},
		{[]string{"x.test", "--update", "-test.run", "X"}, []string{"x.test", "-test.run", "X"}, true},
		{[]string{"x.test", "-update=false"}, []string{"x.test"}, false},
		{[]string{"x.test", "-update=1", "-update=0"}, []string{"x.test"}, false},
		{[]string{"x.test", "-update=maybe"}, []string{"x.test", "-update=maybe"}, false},
		{[]string{"x.test", "-updated", "update"}, []string{"x.test", "-updated", "update"}, false},
		{[]string{"x.test", "--", "-update"}, []string{"x.test", "--", "-update"}, false},
		{nil, nil, false},
	} {
		out, on := takeUpdateArg(c.in)
		require.Equal(t, c.out, out, "%q", c.in)
		require.Equal(t, c.want, on, "%q", c.in)
	}
}

// TestOwnUpdateFlag runs a test package that defines its own flag named
// update next to this package: it must not panic, and one -update must
// reach both.
func TestOwnUpdateFlag(t *testing.T) {
	if testing.Short() {
		t.Skip("builds a test binary")
	}
	run := func(args ...string) string {
		cmd := exec.Command("go", append([]string{"test", "-count=1", "-v", "./testdata/ownflag"}, args...)...)
		cmd.Env = append(cmd.Environ(), "CI=", EnvUpdate+"=")
		out, err := cmd.CombinedOutput()
		require.NoError(t, err, "%s", out)
		return string(out)
	}
	out := run()
	require.NotContains(t, out, "flag redefined")
	require.Contains(t, out, "golden.Updating()=false")
	require.Contains(t, out, "own update=false")
	out = run("-update")
	require.Contains(t, out, "golden.Updating()=true")
	require.Contains(t, out, "own update=true")
	require.True(t, strings.Contains(out, "PASS"))
}
