package main

import (
	"encoding/json"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"slices"
	"strings"

	"github.com/proofsheet/proofsheet/assert"
	"github.com/proofsheet/proofsheet/fixtures"
)

// File-by-file comparison of two folders (diff --by-file).

// fileStatus is how one file of a by-file comparison came out.
type fileStatus string

const (
	fileEqual     fileStatus = "equal"
	fileDiffers   fileStatus = "differs"
	fileOnlyWant  fileStatus = "only-in-want"
	fileOnlyGot   fileStatus = "only-in-got"
	fileUnreadble fileStatus = "unreadable"
)

// fileResult is one file of a by-file comparison.
type fileResult struct {
	Path   string       // relative to both roots, / separated
	Status fileStatus   //
	Diff   *assert.Diff // for equal and differs
	Err    error        // for unreadable
}

// byFileResult is a whole by-file comparison.
type byFileResult struct {
	WantRoot, GotRoot string
	Files             []fileResult
}

// count returns how many files have the status.
func (r *byFileResult) count(s fileStatus) int {
	n := 0
	for _, f := range r.Files {
		if f.Status == s {
			n++
		}
	}
	return n
}

// equal reports whether every file is on both sides and equal.
func (r *byFileResult) equal() bool { return r.count(fileEqual) == len(r.Files) }

// compareByFile pairs the table files of two folders by their path
// below the folder and compares each pair with the same options.
func compareByFile(wantRoot, gotRoot string, read func(string) (*fixtures.Table, error), opts []assert.Option) (*byFileResult, error) {
	for _, root := range []string{wantRoot, gotRoot} {
		if fi, err := os.Stat(root); err != nil || !fi.IsDir() {
			return nil, fmt.Errorf("--by-file compares two folders; %s is not one", root)
		}
	}
	wantFiles, err := fixtures.TableFiles(wantRoot)
	if err != nil {
		return nil, err
	}
	gotFiles, err := fixtures.TableFiles(gotRoot)
	if err != nil {
		return nil, err
	}
	all := append(slices.Clone(wantFiles), gotFiles...)
	slices.Sort(all)
	all = slices.Compact(all)
	if len(all) == 0 {
		return nil, fmt.Errorf("no table files in %s or %s", wantRoot, gotRoot)
	}
	res := &byFileResult{WantRoot: wantRoot, GotRoot: gotRoot}
	for _, rel := range all {
		fr := fileResult{Path: rel}
		_, inWant := slices.BinarySearch(wantFiles, rel)
		_, inGot := slices.BinarySearch(gotFiles, rel)
		switch {
		case !inGot:
			fr.Status = fileOnlyWant
		case !inWant:
			fr.Status = fileOnlyGot
		default:
			want, err := read(filepath.Join(wantRoot, filepath.FromSlash(rel)))
			var got *fixtures.Table
			if err == nil {
				got, err = read(filepath.Join(gotRoot, filepath.FromSlash(rel)))
			}
			if err != nil {
				fr.Status, fr.Err = fileUnreadble, err
				break
			}
			fr.Diff = assert.Compare(want, got, opts...)
			fr.Status = fileDiffers
			if fr.Diff.Equal() {
				fr.Status = fileEqual
			}
		}
		res.Files = append(res.Files, fr)
	}
	return res, nil
}

// summary is the one-line count of a by-file comparison.
func (r *byFileResult) summary() string {
	parts := []string{fmt.Sprintf("%d equal", r.count(fileEqual)), pluralWord(r.count(fileDiffers), "differs", "differ")}
	for _, s := range []fileStatus{fileOnlyWant, fileOnlyGot, fileUnreadble} {
		if n := r.count(s); n > 0 {
			parts = append(parts, fmt.Sprintf("%d %s", n, strings.ReplaceAll(string(s), "-", " ")))
		}
	}
	return fmt.Sprintf("%s compared: %s", pluralWord(len(r.Files), "file", "files"), strings.Join(parts, ", "))
}

// writeText writes each file's outcome, the diffs of those that differ,
// then the summary.
func (r *byFileResult) writeText(w io.Writer, st assert.TextStyle) error {
	for _, f := range r.Files {
		fmt.Fprintf(w, "%-13s %s\n", f.Status, f.Path)
	}
	for _, f := range r.Files {
		switch f.Status {
		case fileDiffers:
			fmt.Fprintf(w, "\n== %s\n", f.Path)
			if err := f.Diff.WriteText(w, st); err != nil {
				return err
			}
		case fileUnreadble:
			fmt.Fprintf(w, "\n== %s\n%v\n", f.Path, f.Err)
		}
	}
	_, err := fmt.Fprintf(w, "\n%s\n", r.summary())
	return err
}

// writeMarkdown writes a table of the files, then each differing file's
// Markdown diff.
func (r *byFileResult) writeMarkdown(w io.Writer) error {
	fmt.Fprintf(w, "**%s**\n\n| file | result |\n|---|---|\n", r.summary())
	for _, f := range r.Files {
		fmt.Fprintf(w, "| %s | %s |\n", mdCodeSpan(f.Path), f.Status)
	}
	for _, f := range r.Files {
		switch f.Status {
		case fileDiffers:
			fmt.Fprintf(w, "\n### %s\n\n", mdCodeSpan(f.Path))
			if err := f.Diff.WriteMarkdown(w); err != nil {
				return err
			}
		case fileUnreadble:
			fmt.Fprintf(w, "\n### %s\n\n%s\n", mdCodeSpan(f.Path), mdCodeSpan(f.Err.Error()))
		}
	}
	return nil
}

// writeJSON writes {"equal", "summary", "files": [{"path", "status",
// "diff" or "error"}]}; each diff is the Diff's own JSON.
func (r *byFileResult) writeJSON(w io.Writer) error {
	type file struct {
		Path   string          `json:"path"`
		Status fileStatus      `json:"status"`
		Diff   json.RawMessage `json:"diff,omitempty"`
		Error  string          `json:"error,omitempty"`
	}
	out := struct {
		SchemaVersion int    `json:"schema_version"`
		Equal         bool   `json:"equal"`
		Summary       string `json:"summary"`
		Want          string `json:"want"`
		Got           string `json:"got"`
		Files         []file `json:"files"`
	}{SchemaVersion: 1, Equal: r.equal(), Summary: r.summary(), Want: r.WantRoot, Got: r.GotRoot}
	for _, f := range r.Files {
		jf := file{Path: f.Path, Status: f.Status}
		if f.Diff != nil {
			b, err := f.Diff.JSON()
			if err != nil {
				return err
			}
			jf.Diff = b
		}
		if f.Err != nil {
			jf.Error = f.Err.Error()
		}
		out.Files = append(out.Files, jf)
	}
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	return enc.Encode(out)
}
