package golden

import (
	"errors"
	"flag"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"sync"
	"testing"

	"github.com/stretchr/testify/require"
)

func TestTruthy(t *testing.T) {
	// Common practice, no published source: CI services set CI=true, CI=1
	// or the service's name.
	for _, v := range []string{"1", "true", "TRUE", "yes", "on", " true ", "woodpecker", "2"} {
		require.True(t, truthy(v), v)
	}
	for _, v := range []string{"", "0", "false", "False", "no", "off", " "} {
		require.False(t, truthy(v), v)
	}
}

func TestModeFromEnvironment(t *testing.T) {
	cases := []struct {
		name                 string
		flag                 bool
		update, ci, force    string
		updating, refusedMsg bool
	}{
		{"nothing", false, "", "", "", false, false},
		{"flag", true, "", "", "", true, false},
		{"env", false, "1", "", "", true, false},
		{"env false", false, "0", "", "", false, false},
		{"flag in CI", true, "", "true", "", false, true},
		{"env in CI", false, "yes", "1", "", false, true},
		{"forced in CI", true, "", "true", "1", true, false},
		{"CI without update", false, "", "true", "", false, false},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			quietEnv(t, c.flag)
			t.Setenv(EnvUpdate, c.update)
			t.Setenv(EnvCI, c.ci)
			t.Setenv(EnvUpdateInCI, c.force)
			require.Equal(t, c.updating, Updating())
			err := UpdateRefused()
			if !c.refusedMsg {
				require.NoError(t, err)
				return
			}
			require.ErrorIs(t, err, ErrUpdateRefused)
			require.Contains(t, err.Error(), "CI="+c.ci)
			require.Contains(t, err.Error(), EnvUpdateInCI+"=1")
			if c.flag {
				require.Contains(t, err.Error(), "-update was given")
			} else {
				require.Contains(t, err.Error(), EnvUpdate+" was given")
			}
		})
	}
}

func TestNoUpdateFlagDefined(t *testing.T) {
	// The package defines no flag, so a package of the same test binary may
	// define one named update (TestOwnUpdateFlag runs such a package with
	// -update). Source: the flag package's FlagSet.Var, which panics on a
	// name defined twice; here it must not.
	require.Nil(t, otherFlag)
	if flag.Lookup("update") == nil {
		require.NotPanics(t, func() { flag.Bool("update", false, "a test package's own update flag") })
	}
	require.NotNil(t, flag.Lookup("update"))
}

func TestRunPatternAndQuoting(t *testing.T) {
	require.Equal(t, "^TestDaily$", runPattern("TestDaily"))
	require.Equal(t, `^TestDaily$/^house_7\.csv$`, runPattern("TestDaily/house_7.csv"))
	require.Equal(t, `'it'\''s'`, shellQuote("it's"))
	require.Equal(t, "go test ./golden -run '^TestX$/^a\\(b\\)$' -update", updateCommand("TestX/a(b)"))
}

// helperScenarios are the checks TestHelperProcess can run in a child
// process, by name.
var helperScenarios = map[string]func(t *testing.T, s Store, value string){
	"text": func(t *testing.T, s Store, value string) { s.Text(t, "report", value) },
	"json": func(t *testing.T, s Store, value string) { s.JSON(t, "season", map[string]string{"v": value}) },
}

// TestHelperProcess is not a test on its own: runHelper starts the test
// binary again with it selected, to check the real -update flag and
// environment handling in a process of its own.
func TestHelperProcess(t *testing.T) {
	scenario := os.Getenv("GOLDEN_HELPER")
	if scenario == "" {
		t.Skip("runs only as a child process of runHelper")
	}
	helperScenarios[scenario](t, Store{Root: os.Getenv("GOLDEN_HELPER_ROOT")}, os.Getenv("GOLDEN_HELPER_VALUE"))
}

// runHelper runs scenario in a child test process with the given golden
// directory, value, environment and extra flags, and returns its output
// and exit code.
func runHelper(t *testing.T, scenario, root, value string, env []string, flags ...string) (string, int) {
	t.Helper()
	args := append([]string{"-test.run=^TestHelperProcess$", "-test.count=1"}, flags...)
	cmd := exec.Command(os.Args[0], args...)
	cmd.Env = append(os.Environ(), EnvUpdate+"=", EnvUpdateInCI+"=", EnvCI+"=", EnvRecords+"=", EnvStale+"=")
	cmd.Env = append(cmd.Env, "GOLDEN_HELPER="+scenario, "GOLDEN_HELPER_ROOT="+root, "GOLDEN_HELPER_VALUE="+value)
	cmd.Env = append(cmd.Env, env...)
	out, err := cmd.CombinedOutput()
	code := 0
	if ee := (*exec.ExitError)(nil); errors.As(err, &ee) {
		code = ee.ExitCode()
	} else {
		require.NoError(t, err)
	}
	return string(out), code
}

func TestRealUpdateFlag(t *testing.T) {
	root := t.TempDir()
	path := filepath.Join(root, "report.gold.txt")

	out, code := runHelper(t, "text", root, "v1", nil)
	require.Equal(t, 1, code, out)
	require.Contains(t, out, "does not exist")
	require.Contains(t, out, "go test ./golden -run '^TestHelperProcess$' -update")
	require.NoFileExists(t, path)

	out, code = runHelper(t, "text", root, "v1", nil, "-update")
	require.Equal(t, 0, code, out)
	require.Equal(t, "v1", readFile(t, path))

	out, code = runHelper(t, "text", root, "v1", nil)
	require.Equal(t, 0, code, out)

	out, code = runHelper(t, "text", root, "v2", []string{"CI=true"}, "-update")
	require.Equal(t, 1, code, out)
	require.Contains(t, out, "Not updated")
	require.Equal(t, "v1", readFile(t, path))

	out, code = runHelper(t, "text", root, "v2", []string{"CI=true", EnvUpdate + "=1", EnvUpdateInCI + "=1"})
	require.Equal(t, 0, code, out)
	require.Equal(t, "v2", readFile(t, path))
}

func TestRecordsFromParallelProcesses(t *testing.T) {
	dir := t.TempDir()
	const procs = 4
	var wg sync.WaitGroup
	codes := make([]int, procs)
	for p := range procs {
		wg.Add(1)
		go func() {
			defer wg.Done()
			root := filepath.Join(t.TempDir(), fmt.Sprint(p))
			_, codes[p] = runHelper(t, "json", root, fmt.Sprint(p), []string{EnvRecords + "=" + dir}, "-update")
		}()
	}
	wg.Wait()
	require.Equal(t, make([]int, procs), codes)
	recs, err := ReadRecords(dir)
	require.NoError(t, err)
	require.Len(t, recs, procs)
	files, err := filepath.Glob(filepath.Join(dir, "records-*.jsonl"))
	require.NoError(t, err)
	require.Len(t, files, procs) // one file per process
	for _, r := range recs {
		require.Equal(t, StatusNew, r.Status)
		require.Equal(t, KindJSON, r.Kind)
		require.Equal(t, "TestHelperProcess", r.Test)
		require.True(t, strings.HasSuffix(r.File, "/season.gold.json"), r.File)
	}
}
