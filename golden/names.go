package golden

import (
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"unicode"
)

// FileKind is the kind of a golden file: what it holds and how it is
// compared.
type FileKind string

// The kinds of golden file.
const (
	KindTable FileKind = "table" // a table, compared with assert.Compare
	KindText  FileKind = "text"  // text, compared byte for byte
	KindJSON  FileKind = "json"  // canonical JSON, compared by structure
)

// The file name extensions of golden files, one per kind. A name
// "daily/report" is stored as testdata/daily/report.gold.tbl (a table),
// testdata/daily/report.gold.txt (text) or testdata/daily/report.gold.json
// (JSON). Only files with these extensions are golden files; everything
// else in testdata/ is left alone.
const (
	ExtTable = ".gold.tbl"
	ExtText  = ".gold.txt"
	ExtJSON  = ".gold.json"
)

// Ext returns the file name extension of the kind, "" for an unknown kind.
func (k FileKind) Ext() string {
	switch k {
	case KindTable:
		return ExtTable
	case KindText:
		return ExtText
	case KindJSON:
		return ExtJSON
	}
	return ""
}

// kindOfFile returns the kind whose extension the file name has.
func kindOfFile(name string) (FileKind, bool) {
	for _, k := range []FileKind{KindTable, KindText, KindJSON} {
		if strings.HasSuffix(name, k.Ext()) && len(name) > len(k.Ext()) {
			return k, true
		}
	}
	return "", false
}

// ErrBadName is wrapped by the errors about golden names that are refused.
var ErrBadName = errors.New("bad golden name")

// windowsReserved are file names Windows gives to devices, in any case and
// with any extension.
var windowsReserved = map[string]bool{
	"CON": true, "PRN": true, "AUX": true, "NUL": true,
	"COM1": true, "COM2": true, "COM3": true, "COM4": true, "COM5": true, "COM6": true, "COM7": true, "COM8": true, "COM9": true,
	"LPT1": true, "LPT2": true, "LPT3": true, "LPT4": true, "LPT5": true, "LPT6": true, "LPT7": true, "LPT8": true, "LPT9": true,
}

// CheckName reports whether name can name a golden file, on every
// operating system: a relative path of one or more elements separated by
// /, none of them empty, "." or "..", with no backslash, colon, control
// character, leading or trailing blank, trailing dot, Windows device name
// (CON, NUL, COM1, …), and without a golden extension (the kind adds it).
// Refused names wrap ErrBadName.
func CheckName(name string) error {
	bad := func(why string) error { return fmt.Errorf("%w %q: %s", ErrBadName, name, why) }
	switch {
	case name == "":
		return bad("empty name")
	case name[0] == '/' || name[0] == '\\' || filepath.IsAbs(name):
		return bad("absolute path; golden names are relative to the golden directory")
	case len(name) >= 2 && name[1] == ':':
		return bad("drive letter; golden names are relative to the golden directory")
	case strings.Contains(name, `\`):
		return bad(`backslash; separate directories with /`)
	}
	for _, el := range strings.Split(name, "/") {
		switch {
		case el == "":
			return bad("empty path element (leading, trailing or doubled /)")
		case el == "..":
			return bad(`".." would leave the golden directory`)
		case el == ".":
			return bad(`"." path element; write the name without it`)
		case strings.ContainsRune(el, ':'):
			return bad("colon in a path element")
		case strings.IndexFunc(el, unicode.IsControl) >= 0:
			return bad("control character")
		case strings.TrimSpace(el) != el:
			return bad("path element starts or ends with a blank")
		case strings.HasSuffix(el, "."):
			return bad("path element ends with a dot (Windows drops it)")
		}
		base, _, _ := strings.Cut(el, ".")
		if windowsReserved[strings.ToUpper(base)] {
			return bad("Windows device name " + base)
		}
	}
	if k, ok := kindOfFile(name); ok {
		return bad("ends with the golden extension " + k.Ext() + "; leave it off, the kind adds it")
	}
	return nil
}

// within reports whether path, once symbolic links are followed as far as
// the file system has them, lies inside root.
func within(root, path string) error {
	if !below(root, path) {
		return fmt.Errorf("%w: %s is outside the golden directory %s", ErrBadName, path, root)
	}
	realRoot, err := filepath.EvalSymlinks(root)
	if err != nil {
		// The root does not exist yet, so nothing below it can be a link.
		return nil
	}
	// Resolve the deepest part of path that exists.
	dir, rest := path, ""
	for {
		if _, err := os.Lstat(dir); err == nil {
			break
		}
		parent := filepath.Dir(dir)
		if parent == dir {
			return nil
		}
		rest = filepath.Join(filepath.Base(dir), rest)
		dir = parent
	}
	real, err := filepath.EvalSymlinks(dir)
	if err != nil {
		return fmt.Errorf("%w: %s: %w", ErrBadName, path, err)
	}
	if !below(realRoot, filepath.Join(real, rest)) {
		return fmt.Errorf("%w: %s leads outside the golden directory %s through a symbolic link", ErrBadName, path, root)
	}
	return nil
}

// below reports whether path is dir or lies inside it, by their names.
func below(dir, path string) bool {
	rel, err := filepath.Rel(dir, path)
	return err == nil && rel != ".." && !strings.HasPrefix(rel, ".."+string(filepath.Separator)) && !filepath.IsAbs(rel)
}
