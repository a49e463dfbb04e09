package golden

import (
	"errors"
	"flag"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"sync"
)

// registry is the bookkeeping of one test binary's run: which golden file
// each check claimed (to refuse a name used twice) and which golden
// directories were used (to find stale files at the end). It is state of
// the process by nature, as a run is; it is guarded by its mutex, so
// parallel tests are safe.
type registry struct {
	mu     sync.Mutex
	claims map[string]*claim // absolute file path → its claim
	roots  map[string]bool   // absolute golden directories used
}

// claim is which test checked a golden file and whether it is still
// running.
type claim struct {
	test   string
	active bool
}

var runState = &registry{claims: map[string]*claim{}, roots: map[string]bool{}}

// repeater is the method that tells a benchmark (*testing.B) from a test:
// a benchmark calls the same check b.N times.
type repeater interface {
	ReportMetric(n float64, unit string)
}

// claim records that test t checks the file at path. A file belongs to one
// test: another test using it, or the same test using it twice while it
// runs, is an error. The same test may use it again in a later run of
// itself (go test -count=2), and a benchmark may use it on every iteration.
func (r *registry) claim(t T, root, path, name string) error {
	_, repeats := t.(repeater)
	test := t.Name()
	r.mu.Lock()
	defer r.mu.Unlock()
	r.roots[root] = true
	if c, ok := r.claims[path]; ok {
		switch {
		case c.test != test:
			return fmt.Errorf("golden name %q is already used by %s in this run; give each check its own name", name, c.test)
		case c.active && repeats:
			return nil
		case c.active:
			return fmt.Errorf("golden name %q is used twice by %s; give each check its own name", name, test)
		}
	}
	c := &claim{test: test, active: true}
	r.claims[path] = c
	t.Cleanup(func() {
		r.mu.Lock()
		c.active = false
		r.mu.Unlock()
	})
	return nil
}

// touched reports whether a check used the file at path in this run.
func (r *registry) touched(path string) bool {
	r.mu.Lock()
	defer r.mu.Unlock()
	_, ok := r.claims[path]
	return ok
}

// usedRoots returns the golden directories used in this run, sorted.
func (r *registry) usedRoots() []string {
	r.mu.Lock()
	defer r.mu.Unlock()
	roots := make([]string, 0, len(r.roots))
	for root := range r.roots {
		roots = append(roots, root)
	}
	slices.Sort(roots)
	return roots
}

// Stale returns the golden files under the store's directory (files with a
// golden extension, in any subdirectory) that no check of this test binary
// has used so far, as slash-separated paths relative to the directory,
// sorted. It means "unused" only after every test of the package has run:
// call it at the end of TestMain after m.Run (RunTests does), never from a
// test, and not when -run or -skip left tests out. A missing directory has
// no stale files.
func (s Store) Stale() ([]string, error) {
	root, err := s.absRoot()
	if err != nil {
		return nil, err
	}
	var stale []string
	err = filepath.WalkDir(root, func(path string, d fs.DirEntry, err error) error {
		if err != nil {
			if path == root && errors.Is(err, fs.ErrNotExist) {
				return fs.SkipAll
			}
			return err
		}
		if d.IsDir() || !d.Type().IsRegular() {
			return nil
		}
		if _, ok := kindOfFile(d.Name()); !ok || runState.touched(path) {
			return nil
		}
		rel, err := filepath.Rel(root, path)
		if err != nil {
			return err
		}
		stale = append(stale, filepath.ToSlash(rel))
		return nil
	})
	if err != nil {
		return nil, fmt.Errorf("golden: looking for stale files: %w", err)
	}
	return stale, nil
}

// Prune removes the files Stale returns, and the directories it leaves
// empty below the store's directory, and returns the removed files. The
// same warning as for Stale applies, more so: run it only after a full,
// passing run, or it deletes the golden files of tests that did not run.
// RunTests calls it only then, and only when asked with
// PROOFSHEET_STALE=prune.
func (s Store) Prune() ([]string, error) {
	stale, err := s.Stale()
	if err != nil {
		return nil, err
	}
	root, _ := s.absRoot()
	var removed []string
	for _, rel := range stale {
		path := filepath.Join(root, filepath.FromSlash(rel))
		if err := os.Remove(path); err != nil {
			return removed, fmt.Errorf("golden: pruning: %w", err)
		}
		removed = append(removed, rel)
		for dir := filepath.Dir(path); dir != root && strings.HasPrefix(dir, root); dir = filepath.Dir(dir) {
			if os.Remove(dir) != nil { // fails when not empty: stop
				break
			}
		}
	}
	return removed, nil
}

// M is what RunTests needs of *testing.M.
type M interface {
	Run() int
}

// RunTests runs the tests of a package and then, when PROOFSHEET_STALE
// asks for it, reports or removes stale golden files: files with a golden
// extension under testdata/ (and under every other golden directory the
// run used) that no check used. Use it as the package's TestMain:
//
//	func TestMain(m *testing.M) { os.Exit(golden.RunTests(m)) }
//
// PROOFSHEET_STALE=list prints the stale files; =check prints them and
// makes the run fail when there are any; =prune removes them (refused
// under CI like updates, unless PROOFSHEET_UPDATE_IN_CI is set). The check
// is skipped, with a note, when -run, -skip or -list chose only some tests,
// since the files of tests that did not run would look stale; prune is
// also skipped when the run failed. Tests that skip themselves (testing.Short,
// a missing tool) or golden checks made only by benchmarks make their files
// look stale too: list before you prune. The result is the exit code for
// os.Exit.
func RunTests(m M) int {
	flagUpdate() // a flag named update of the test package learns of -update before any test
	code := m.Run()
	roots := runState.usedRoots()
	if def, err := (Store{}).absRoot(); err == nil && !slices.Contains(roots, def) {
		roots = append(roots, def)
		slices.Sort(roots)
	}
	return sweep(os.Stderr, code, os.Getenv(EnvStale), currentMode(), partialRun(), roots)
}

// partialRun names the flag that made this run select only some tests, or
// returns "".
func partialRun() string {
	for _, name := range []string{"test.run", "test.skip", "test.list"} {
		if f := flag.Lookup(name); f != nil && f.Value.String() != "" {
			return "-" + strings.TrimPrefix(name, "test.")
		}
	}
	return ""
}

// sweep is RunTests after m.Run, over the given golden directories.
func sweep(w io.Writer, code int, what string, m mode, partial string, roots []string) int {
	what = strings.ToLower(strings.TrimSpace(what))
	switch what {
	case "":
		return code
	case "list", "check", "prune":
	default:
		fmt.Fprintf(w, "golden: %s=%q: want list, check or prune\n", EnvStale, what)
		return max(code, 2)
	}
	if partial != "" {
		fmt.Fprintf(w, "golden: stale check skipped: %s ran only some tests, so files of the others would look stale\n", partial)
		return code
	}
	if what == "prune" && code != 0 {
		fmt.Fprintf(w, "golden: prune skipped: the run failed, so some checks may not have been reached\n")
		return code
	}
	if what == "prune" && m.ci != "" && !m.forced {
		fmt.Fprintf(w, "golden: prune refused: %s=%s is set; set %s=1 to force it\n", EnvCI, m.ci, EnvUpdateInCI)
		return max(code, 1)
	}
	found := 0
	for _, root := range roots {
		s := Store{Root: root}
		var files []string
		var err error
		if what == "prune" {
			files, err = s.Prune()
		} else {
			files, err = s.Stale()
		}
		if err != nil {
			fmt.Fprintln(w, err)
			code = max(code, 1)
		}
		found += len(files)
		for _, f := range files {
			verb := "stale"
			if what == "prune" {
				verb = "removed stale"
			}
			fmt.Fprintf(w, "golden: %s %s\n", verb, displayPath(filepath.Join(root, filepath.FromSlash(f))))
		}
	}
	if found > 0 && what == "check" {
		fmt.Fprintf(w, "golden: %s; remove them with %s=prune after a full run\n", plural(found, "stale golden file", "stale golden files"), EnvStale)
		return max(code, 1)
	}
	return code
}
