package golden

import (
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"sync"
	"testing"

	"github.com/stretchr/testify/require"
)

// fakeT is a T that records what a check reports, so tests can drive the
// checks and look at their failures.
type fakeT struct {
	mu       sync.Mutex
	name     string
	errs     []string
	logs     []string
	cleanups []func()
}

func newFake(t *testing.T) *fakeT { return &fakeT{name: t.Name() + "/fake"} }

func (f *fakeT) Helper()      {}
func (f *fakeT) Name() string { return f.name }
func (f *fakeT) Errorf(format string, args ...any) {
	f.mu.Lock()
	defer f.mu.Unlock()
	f.errs = append(f.errs, fmt.Sprintf(format, args...))
}
func (f *fakeT) Logf(format string, args ...any) {
	f.mu.Lock()
	defer f.mu.Unlock()
	f.logs = append(f.logs, fmt.Sprintf(format, args...))
}
func (f *fakeT) Cleanup(fn func()) {
	f.mu.Lock()
	defer f.mu.Unlock()
	f.cleanups = append(f.cleanups, fn)
}

// end runs the cleanups, as the end of a test does.
func (f *fakeT) end() {
	for i := len(f.cleanups) - 1; i >= 0; i-- {
		f.cleanups[i]()
	}
	f.cleanups = nil
}

func (f *fakeT) failures() string { return strings.Join(f.errs, "\n") }

// fakeB is a fakeT that looks like a benchmark.
type fakeB struct{ fakeT }

func (*fakeB) ReportMetric(float64, string) {}

// quietEnv clears every variable and the flag that change the mode, so a
// test sees plain check mode whatever the caller's environment (CI=true,
// -update) is; update turns update mode on.
func quietEnv(t testing.TB, update bool) {
	t.Helper()
	for _, v := range []string{EnvUpdate, EnvUpdateInCI, EnvCI, EnvRecords, EnvStale} {
		t.Setenv(v, "")
	}
	old := *updateFlag
	*updateFlag = update
	t.Cleanup(func() { *updateFlag = old })
}

// tempStore is a Store in a fresh temporary directory.
func tempStore(t *testing.T) Store { return Store{Root: t.TempDir()} }

func readFile(t *testing.T, path string) string {
	t.Helper()
	b, err := os.ReadFile(path)
	require.NoError(t, err)
	return string(b)
}

func writeFile(t *testing.T, path, data string) {
	t.Helper()
	require.NoError(t, os.MkdirAll(filepath.Dir(path), 0o755))
	require.NoError(t, os.WriteFile(path, []byte(data), 0o644))
}
