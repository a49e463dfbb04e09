package golden

import (
	"encoding/json"
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
	"regexp"
	"strings"

	"github.com/proofsheet/proofsheet/assert"
	"github.com/proofsheet/proofsheet/fixtures"
)

// T is what the checks need of a test: *testing.T and *testing.B satisfy
// it (as does testing.TB). Checks report with Errorf, so a failing check
// lets the test go on and returns false; they never call Fatalf. Cleanup
// marks the end of the test's use of its golden names, and Logf tells
// about files written in update mode.
type T interface {
	Helper()
	Name() string
	Errorf(format string, args ...any)
	Logf(format string, args ...any)
	Cleanup(func())
}

// DefaultRoot is the golden directory of Table, Text and JSON, relative to
// the working directory, which go test sets to the package's directory.
const DefaultRoot = "testdata"

// Store is a golden directory. The zero Store is testdata/ of the test's
// package, where Table, Text and JSON keep their files; a Store with
// another Root keeps them elsewhere (a relative Root is taken from the
// working directory when the check runs).
type Store struct {
	// Root is the golden directory; "" means DefaultRoot.
	Root string
}

// Text checks got against the golden text file of name in testdata/
// (testdata/<name>.gold.txt). See Store.Text.
func Text(t T, name string, got string) bool {
	t.Helper()
	return Store{}.Text(t, name, got)
}

// JSON checks v, as canonical JSON, against the golden JSON file of name in
// testdata/ (testdata/<name>.gold.json). See Store.JSON.
func JSON(t T, name string, v any) bool {
	t.Helper()
	return Store{}.JSON(t, name, v)
}

func (s Store) absRoot() (string, error) {
	root := s.Root
	if root == "" {
		root = DefaultRoot
	}
	abs, err := filepath.Abs(root)
	if err != nil {
		return "", fmt.Errorf("golden: directory %s: %w", root, err)
	}
	return abs, nil
}

// Path returns the file a golden name of the kind is stored in, or an
// error (wrapping ErrBadName) for a name CheckName refuses or one that
// would lead outside the store's directory.
func (s Store) Path(name string, kind FileKind) (string, error) {
	if kind.Ext() == "" {
		return "", fmt.Errorf("golden: unknown file kind %q", kind)
	}
	if err := CheckName(name); err != nil {
		return "", err
	}
	root, err := s.absRoot()
	if err != nil {
		return "", err
	}
	path := filepath.Join(root, filepath.FromSlash(name)+kind.Ext())
	if err := within(root, path); err != nil {
		return "", err
	}
	return path, nil
}

// displayPath writes path relative to the working directory when it lies
// below it, else as it is.
func displayPath(path string) string {
	if wd, err := os.Getwd(); err == nil {
		if below(wd, path) {
			rel, _ := filepath.Rel(wd, path)
			return rel
		}
	}
	return path
}

// check is one golden check in progress.
type check struct {
	t    T
	name string
	kind FileKind
	path string // absolute
	show string // for messages
	mode mode
}

// begin validates the name, claims the file and reads the mode. On failure
// it has reported the error and returns nil.
func (s Store) begin(t T, name string, kind FileKind) *check {
	t.Helper()
	c := &check{t: t, name: name, kind: kind, mode: currentMode()}
	path, err := s.Path(name, kind)
	if err == nil {
		var root string
		root, err = s.absRoot()
		if err == nil {
			err = runState.claim(t, root, path, name)
		}
	}
	if err != nil {
		c.fail(StatusInvalid, nil, "golden: %v", err)
		return nil
	}
	c.path, c.show = path, displayPath(path)
	return c
}

// read returns the stored file, or nil, false when there is none.
func (c *check) read() ([]byte, bool, error) {
	data, err := os.ReadFile(c.path)
	if errors.Is(err, fs.ErrNotExist) {
		return nil, false, nil
	}
	if err != nil {
		return nil, false, fmt.Errorf("golden: %w", err)
	}
	return data, true, nil
}

// course is what a kind of check brings to the common course of a check
// (Store.run): a look at got before the file is read, the comparison of
// got with the stored bytes, and the bytes to store.
type course struct {
	prepare func() error                            // optional; an error fails the check
	compare func(file string, stored []byte) result // file: the path for messages
	encode  func() ([]byte, error)
}

// run is the course every check takes: claim the name, prepare, read the
// stored file, compare, then pass, fail or write (settle).
func (s Store) run(t T, name string, kind FileKind, k course) bool {
	t.Helper()
	c := s.begin(t, name, kind)
	if c == nil {
		return false
	}
	if k.prepare != nil {
		if err := k.prepare(); err != nil {
			c.fail(StatusInvalid, nil, "golden: %s: %v", c.show, err)
			return false
		}
	}
	data, exists, err := c.read()
	if err != nil {
		c.fail(StatusInvalid, nil, "%v", err)
		return false
	}
	r := result{}
	if exists {
		r = k.compare(c.show, data)
		r.exists = true
	}
	return c.settle(r, k.encode)
}

// result is what a kind found when comparing got with the stored file.
type result struct {
	exists  bool
	equal   bool
	bad     error           // the stored file could not be read or parsed
	diff    string          // readable difference, when not equal
	diffRec json.RawMessage // the difference as data (tables), for records
	note    string          // about the rules compared under (tables), for the log and the failure
	rewrite bool            // update mode rewrites the file even when equal (to store new rules)
	d       *assert.Diff    // the table difference, for the HTML page of -artifacts
}

// settle turns a result into the check's outcome: pass, fail with the
// difference, or — in update mode — rewrite the file with encode's bytes.
func (c *check) settle(r result, encode func() ([]byte, error)) bool {
	c.t.Helper()
	if r.note != "" {
		c.t.Logf("golden: %s: %s", c.show, r.note)
	}
	if r.exists && r.equal && r.bad == nil && !(r.rewrite && c.mode.allowed()) {
		return c.pass(StatusEqual, nil)
	}
	if c.mode.allowed() {
		data, err := encode()
		if err == nil {
			err = writeGolden(c.path, data)
		}
		if err != nil {
			c.fail(StatusInvalid, r.diffRec, "golden: writing %s: %v", c.show, err)
			return false
		}
		status := StatusUpdated
		if !r.exists {
			status = StatusNew
		}
		c.t.Logf("golden: %s %s", map[Status]string{StatusNew: "created", StatusUpdated: "rewrote"}[status], c.show)
		return c.pass(status, r.diffRec)
	}
	var msg strings.Builder
	var hint string
	status := StatusChanged
	switch {
	case !r.exists:
		status = StatusMissing
		fmt.Fprintf(&msg, "golden: %s does not exist (golden name %q).", c.show, c.name)
		hint = "Create it from got, and review it before you commit it; from the module root run:"
	case r.bad != nil:
		status = StatusInvalid
		fmt.Fprintf(&msg, "golden: cannot read %s: %v", c.show, r.bad)
		hint = "Fix the file, or rewrite it from got; from the module root run:"
	default:
		fmt.Fprintf(&msg, "golden: %s: got differs from the golden file (want):\n%s\n", c.show, strings.TrimRight(r.diff, "\n"))
		if r.note != "" {
			fmt.Fprintf(&msg, "Note: %s.\n", r.note)
		}
		if page := assert.WriteArtifactPage(c.t, r.d, c.show); page != "" {
			fmt.Fprintf(&msg, "HTML diff page: %s\n", page)
		}
		hint = "If the change is intended, rewrite the file and review it in your diff; from the module root run:"
	}
	if err := c.mode.refusal(); err != nil {
		if status != StatusInvalid {
			status = StatusRefused
		}
		fmt.Fprintf(&msg, "\nNot updated: %v.", err)
	} else {
		fmt.Fprintf(&msg, "\n%s\n\t%s", hint, updateCommand(c.t.Name()))
	}
	c.fail(status, r.diffRec, "%s", msg.String())
	return false
}

func (c *check) pass(status Status, diff json.RawMessage) bool {
	c.t.Helper()
	c.record(status, diff, "")
	return true
}

func (c *check) fail(status Status, diff json.RawMessage, format string, args ...any) {
	c.t.Helper()
	msg := fmt.Sprintf(format, args...)
	c.t.Errorf("%s", msg)
	c.record(status, diff, msg)
}

func (c *check) record(status Status, diff json.RawMessage, detail string) {
	c.t.Helper()
	dir := os.Getenv(EnvRecords)
	if dir == "" {
		return
	}
	r := Record{Test: c.t.Name(), Name: c.name, Kind: c.kind, Status: status, Diff: diff, Detail: detail}
	if c.path != "" {
		r.File = filepath.ToSlash(c.path)
		r.Path = modulePath(c.path)
	}
	if err := appendRecord(dir, r); err != nil {
		c.t.Errorf("golden: %v", err)
	}
}

// writeGolden writes a golden file safely: the directory is made, then the
// bytes go to a temporary file that is synced and renamed over the old
// file, so a killed process leaves the old file or the new one, never a
// torn one.
func writeGolden(path string, data []byte) error {
	if err := os.MkdirAll(filepath.Dir(path), 0o755); err != nil {
		return err
	}
	return fixtures.WriteFileAtomic(path, data, 0o644)
}

// moduleRoot returns the directory holding the go.mod above the working
// directory, and the working directory relative to it; ok is false when
// there is none.
func moduleRoot() (root, rel string, ok bool) {
	wd, err := os.Getwd()
	if err != nil {
		return "", "", false
	}
	for dir := wd; ; {
		if st, err := os.Stat(filepath.Join(dir, "go.mod")); err == nil && st.Mode().IsRegular() {
			rel, err := filepath.Rel(dir, wd)
			if err != nil {
				return "", "", false
			}
			return dir, filepath.ToSlash(rel), true
		}
		parent := filepath.Dir(dir)
		if parent == dir {
			return "", "", false
		}
		dir = parent
	}
}

// modulePath writes path slash-separated and relative to the module root,
// or absolute when it lies outside the module.
func modulePath(path string) string {
	if root, _, ok := moduleRoot(); ok {
		if below(root, path) {
			rel, _ := filepath.Rel(root, path)
			return filepath.ToSlash(rel)
		}
	}
	return filepath.ToSlash(path)
}

// updateCommand is the command line that reruns exactly the test named
// test in update mode, to be run from the module root.
func updateCommand(test string) string {
	pkg := "."
	if _, rel, ok := moduleRoot(); ok && rel != "." {
		pkg = "./" + rel
	}
	return "go test " + pkg + " -run " + shellQuote(runPattern(test)) + " -update"
}

// runPattern is the -run pattern that selects exactly the (sub)test named
// name: each level anchored, regexp characters escaped.
func runPattern(name string) string {
	parts := strings.Split(name, "/")
	for i, p := range parts {
		parts[i] = "^" + regexp.QuoteMeta(p) + "$"
	}
	return strings.Join(parts, "/")
}

// shellQuote quotes s for a POSIX shell.
func shellQuote(s string) string {
	return "'" + strings.ReplaceAll(s, "'", `'\''`) + "'"
}
