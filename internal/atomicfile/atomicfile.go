package atomicfile

import (
	"errors"
	"fmt"
	"io"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"time"
	"unicode/utf8"
)

// marker is what every temporary file name of proofsheet holds.
const marker = ".proofsheet-tmp-"

// started is when this process began writing files: temporary files
// older than it cannot be this process's own. Set once, never changed.
var started = time.Now()

// maxStem bounds the part of a temporary name taken from the target, so
// that the name stays within the 255 bytes most file systems allow.
const maxStem = 120

// stem is the target's base name with its dots made underscores, cut to
// maxStem bytes.
func stem(base string) string {
	s := strings.ReplaceAll(base, ".", "_")
	if len(s) > maxStem {
		s = s[:maxStem]
		for len(s) > 0 && !utf8.ValidString(s) {
			s = s[:len(s)-1]
		}
	}
	return s
}

// TempPrefix is how the names of the temporary files of target begin.
func TempPrefix(target string) string {
	return "." + stem(filepath.Base(target)) + marker
}

// tempName returns a fresh temporary name for target in its directory.
func tempName(target string) string {
	return filepath.Join(filepath.Dir(target), TempPrefix(target)+strconv.Itoa(os.Getpid())+"-"+strconv.FormatUint(rand.Uint64()%1e10, 10))
}

// tempPID reads "PID-RANDOM".
func tempPID(rest string) (int, bool) {
	p, r, ok := strings.Cut(rest, "-")
	if !ok || !allDigits(p) || !allDigits(r) {
		return 0, false
	}
	pid, err := strconv.Atoi(p)
	return pid, err == nil
}

func allDigits(s string) bool {
	for i := 0; i < len(s); i++ {
		if s[i] < '0' || s[i] > '9' {
			return false
		}
	}
	return s != ""
}

// RemoveStale removes the temporary files of target that a killed run
// left: those whose names are proofsheet's for this target, that were
// last written before the current process started, and whose process (by
// the id in the name) is no longer running. Names of earlier versions
// (".NAME.tmp-DIGITS", made by os.CreateTemp) carry no process id; they
// are removed when older than the current process. It returns the names
// removed.
func RemoveStale(target string) ([]string, error) {
	dir, base := filepath.Dir(target), filepath.Base(target)
	entries, err := os.ReadDir(dir)
	if err != nil {
		return nil, err
	}
	prefix, legacy := TempPrefix(target), "."+base+".tmp-"
	var removed []string
	for _, e := range entries {
		name := e.Name()
		switch {
		case strings.HasPrefix(name, prefix):
			p, ok := tempPID(name[len(prefix):])
			if !ok || processRunning(p) {
				continue
			}
		case strings.HasPrefix(name, legacy) && allDigits(name[len(legacy):]):
		default:
			continue
		}
		info, err := e.Info()
		if err != nil || !info.Mode().IsRegular() || !info.ModTime().Before(started) {
			continue
		}
		if err := os.Remove(filepath.Join(dir, name)); err == nil {
			removed = append(removed, name)
		}
	}
	return removed, nil
}

// Write writes a file through write, atomically: the content goes to a
// temporary file in path's directory, is synced to disk and then takes
// path's place; when write fails, nothing changes and its error is
// returned. The file gets mode perm.
func Write(path string, perm os.FileMode, write func(w io.Writer) error) error {
	return writeFile(path, perm, write, true)
}

func writeFile(path string, perm os.FileMode, write func(w io.Writer) error, unnamed bool) (err error) {
	_, _ = RemoveStale(path) // best effort: a directory we cannot list fails below with a clear error
	t, err := create(path, unnamed)
	if err != nil {
		return err
	}
	defer func() {
		if err != nil {
			t.discard()
		}
	}()
	if err = write(t.f); err != nil {
		return err
	}
	if err = t.f.Sync(); err == nil {
		if err = t.f.Chmod(perm); err == nil {
			err = t.publish(path)
		}
	}
	if err != nil {
		return creationError(path, err)
	}
	if d, derr := os.Open(filepath.Dir(path)); derr == nil {
		d.Sync() // make the rename durable where the OS allows
		d.Close()
	}
	return nil
}

// temp is a temporary file being written: unnamed (name == "") or named.
type temp struct {
	f    *os.File
	name string
}

// create makes the temporary file for path: unnamed where the system
// allows and unnamed is true, else named.
func create(path string, unnamed bool) (*temp, error) {
	if unnamed {
		if f, err := createUnnamed(filepath.Dir(path)); err == nil {
			return &temp{f: f}, nil
		}
	}
	for range 100 {
		name := tempName(path)
		f, err := os.OpenFile(name, os.O_RDWR|os.O_CREATE|os.O_EXCL, 0o600)
		if err == nil {
			return &temp{f: f, name: name}, nil
		}
		if !errors.Is(err, os.ErrExist) {
			return nil, creationError(path, err)
		}
	}
	return nil, fmt.Errorf("cannot make a temporary file beside %s", path)
}

// creationError says why the file at path cannot be made, naming path
// rather than the temporary file: an *os.PathError for path.
func creationError(path string, err error) error {
	var pe *os.PathError
	if errors.As(err, &pe) {
		err = pe.Err
	}
	return &os.PathError{Op: "write", Path: path, Err: err}
}

func (t *temp) discard() {
	t.f.Close()
	if t.name != "" {
		os.Remove(t.name)
	}
}

// publish gives the finished file path's name.
func (t *temp) publish(path string) error {
	if t.name == "" {
		return t.publishUnnamed(path)
	}
	if err := t.f.Close(); err != nil {
		return err
	}
	return os.Rename(t.name, path)
}

// publishUnnamed links an unnamed file into place: straight to path when
// nothing is there, else to a temporary name renamed over path. When the
// file cannot be linked at all, its content is copied into a named
// temporary file instead.
func (t *temp) publishUnnamed(path string) error {
	err := link(t.f, path)
	if err == nil {
		return t.f.Close()
	}
	if errors.Is(err, os.ErrExist) {
		for range 100 {
			name := tempName(path)
			err = link(t.f, name)
			if errors.Is(err, os.ErrExist) {
				continue
			}
			if err != nil {
				break
			}
			t.name = name // removed by discard if the rename fails
			if err := t.f.Close(); err != nil {
				return err
			}
			return os.Rename(name, path)
		}
	}
	// Copy into a named file.
	named, cerr := create(path, false)
	if cerr != nil {
		return cerr
	}
	if _, err := t.f.Seek(0, io.SeekStart); err != nil {
		named.discard()
		return err
	}
	if _, err := io.Copy(named.f, t.f); err != nil {
		named.discard()
		return err
	}
	if fi, err := t.f.Stat(); err == nil {
		named.f.Chmod(fi.Mode().Perm())
	}
	if err := named.f.Sync(); err != nil {
		named.discard()
		return err
	}
	t.f.Close()
	if err := named.publish(path); err != nil {
		named.discard()
		return err
	}
	return nil
}

// Check reports whether a file could be written at path, trying it the
// way Write would (and leaving nothing behind): not when path is a
// directory, its directory is missing, or an existing file or the
// directory may not be written. The error is an *os.PathError for path.
func Check(path string) error {
	fail := func(err error) error { return &os.PathError{Op: "write", Path: path, Err: err} }
	if fi, err := os.Stat(path); err == nil {
		if fi.IsDir() {
			return fail(errors.New("is a directory"))
		}
		f, err := os.OpenFile(path, os.O_WRONLY, 0)
		if err != nil {
			return creationError(path, err)
		}
		f.Close()
	}
	dir := filepath.Dir(path)
	if fi, err := os.Stat(dir); err != nil || !fi.IsDir() {
		return fail(fmt.Errorf("no directory %s", dir))
	}
	t, err := create(path, true)
	if err != nil {
		return creationError(path, err)
	}
	t.discard()
	return nil
}
