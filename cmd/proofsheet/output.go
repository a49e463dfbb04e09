package main

import (
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"strings"
	"time"

	"golang.org/x/term"

	"github.com/proofsheet/proofsheet/fixtures"
	"github.com/proofsheet/proofsheet/internal/atomicfile"
	"github.com/proofsheet/proofsheet/internal/textwidth"
)

// isTerminal reports whether w is a terminal: an *os.File whose
// descriptor answers the terminal control requests (golang.org/x/term).
// A character device that is not a terminal, such as /dev/null, is not.
func isTerminal(w io.Writer) bool {
	f, ok := w.(*os.File)
	if !ok || f == nil {
		return false
	}
	return term.IsTerminal(int(f.Fd()))
}

// useColor reports whether text for w may carry ANSI colours: w is a
// terminal and NO_COLOR is unset or empty (the no-color.org convention).
func useColor(e *env, w io.Writer) bool {
	return e.getenv("NO_COLOR") == "" && isTerminal(w)
}

// writeResult writes a report to the --out file, atomically (a temporary
// file renamed into place, so a failure leaves any earlier file as it
// was), or to stdout when out is empty. It returns a message on failure.
func writeResult(e *env, out string, data []byte) error {
	return writeResultWith(e, out, func(w io.Writer) error {
		_, err := w.Write(data)
		return err
	})
}

// writeResultWith is writeResult for a report written as it is made: write
// writes it to w. On stdout the report appears as it is written; an --out
// file is renamed into place only when write succeeds.
func writeResultWith(e *env, out string, write func(w io.Writer) error) error {
	if out == "" {
		return write(e.stdout)
	}
	if err := checkOut(out); err != nil {
		return err
	}
	if err := fixtures.WriteFileAtomicWith(out, 0o644, write); err != nil {
		return outError(out, err)
	}
	return nil
}

// outError is err about the --out file, which it names once.
func outError(out string, err error) error { return flagFileError("--out", out, err) }

// flagFileError is err about the file a flag names, naming it once.
func flagFileError(flag, path string, err error) error {
	var pe *os.PathError
	if errors.As(err, &pe) && pe.Path == path {
		return fmt.Errorf("%s %s: %w", flag, path, pe.Err)
	}
	return fmt.Errorf("%s %s: %w", flag, path, err)
}

// checkOut refuses an --out path that cannot be written before any work
// is done (see checkWritable).
func checkOut(out string) error { return checkWritable("--out", out) }

// checkWritable refuses a path a flag names for output that cannot be
// written, before any work is done, naming it (not a temporary file): a
// directory, a file in a directory that does not exist, a file or
// directory that may not be written. It tries the write as it would be
// made, leaving nothing behind.
func checkWritable(flag, path string) error {
	if path == "" {
		return nil
	}
	if err := atomicfile.Check(path); err != nil {
		return flagFileError(flag, path, err)
	}
	return nil
}

// progress draws a one-line progress bar on stderr while long work runs.
// It draws only when stderr is a terminal and --quiet is not given; a nil
// *progress draws nothing, so callers need not check.
type progress struct {
	w     io.Writer
	label string
	total int64
	done  int64
	count bool // the units are items, not bytes
	last  time.Time
	shown bool
}

// progressWidth is the width of the bar itself, in cells.
const progressWidth = 28

// newProgress returns a progress bar on e's stderr, or nil when it must
// not draw.
func newProgress(e *env, quiet bool) *progress {
	if quiet || !isTerminal(e.stderr) {
		return nil
	}
	return &progress{w: e.stderr}
}

// start begins a step of total bytes; total 0 shows the label alone, for
// a step whose length is not known.
func (p *progress) start(label string, total int64) { p.begin(label, total, false) }

// startCount begins a step of total items (files, say).
func (p *progress) startCount(label string, total int64) { p.begin(label, total, true) }

func (p *progress) begin(label string, total int64, count bool) {
	if p == nil {
		return
	}
	p.label, p.total, p.done, p.count = label, total, 0, count
	p.draw()
}

// add counts n more units of the step, redrawing at most ten times a
// second.
func (p *progress) add(n int64) {
	if p == nil {
		return
	}
	p.done += n
	if time.Since(p.last) >= 100*time.Millisecond || p.done >= p.total {
		p.draw()
	}
}

func (p *progress) draw() {
	p.last = time.Now()
	line := p.label
	if p.total > 0 {
		frac := min(1, float64(p.done)/float64(p.total))
		filled := int(frac * progressWidth)
		done, total := sizeText(p.done), sizeText(p.total)
		if p.count {
			done, total = fmt.Sprint(p.done), fmt.Sprint(p.total)
		}
		line = fmt.Sprintf("[%s%s] %3.0f%%  %s of %s  %s", strings.Repeat("#", filled), strings.Repeat(".", progressWidth-filled),
			frac*100, done, total, p.label)
	}
	fmt.Fprint(p.w, "\r"+textwidth.PadRight(textwidth.Truncate(line, 79), 79))
	p.shown = true
}

// finish clears the bar's line.
func (p *progress) finish() {
	if p == nil || !p.shown {
		return
	}
	fmt.Fprint(p.w, "\r"+strings.Repeat(" ", 79)+"\r")
	p.shown = false
}

// sizeText writes a byte count for people: 512 B, 3.4 MB.
func sizeText(n int64) string {
	switch {
	case n < 1000:
		return fmt.Sprintf("%d B", n)
	case n < 1000*1000:
		return fmt.Sprintf("%.1f kB", float64(n)/1e3)
	case n < 1000*1000*1000:
		return fmt.Sprintf("%.1f MB", float64(n)/1e6)
	}
	return fmt.Sprintf("%.2f GB", float64(n)/1e9)
}

// progressMin is the smallest file whose reading draws a bar.
const progressMin = 8 << 20

// readTable loads a table file as fixtures.ReadFile does; when the bar is
// on and the file is large, it reads the bytes itself to show how far the
// reading has come, then parses them.
func readTable(p *progress, path string, opts ...fixtures.ReadOption) (*fixtures.Table, error) {
	t, _, err := readTableReport(p, path, opts...)
	return t, err
}

// readTableReport is readTable that also returns the LoadReport.
func readTableReport(p *progress, path string, opts ...fixtures.ReadOption) (*fixtures.Table, *fixtures.LoadReport, error) {
	fi, err := os.Stat(path)
	if p == nil || err != nil || !fi.Mode().IsRegular() || fi.Size() < progressMin {
		return fixtures.ReadFile(path, opts...)
	}
	format, err := fixtures.FormatFor(path)
	if err != nil {
		return fixtures.ReadFile(path, opts...) // the same message as without the bar
	}
	if format == fixtures.FormatParquet {
		// Read in place, by offset: the file's bytes never sit in memory
		// beside the table; the bar says what is being read.
		p.start("reading "+filepath.Base(path)+" …", 0)
		return fixtures.ReadFile(path, opts...)
	}
	f, err := os.Open(path)
	if err != nil {
		return fixtures.ReadFile(path, opts...)
	}
	defer f.Close()
	data := make([]byte, 0, fi.Size()+1)
	p.start("reading "+filepath.Base(path), fi.Size())
	buf := make([]byte, 1<<20)
	for {
		n, rerr := f.Read(buf)
		data = append(data, buf[:n]...)
		p.add(int64(n))
		if rerr == io.EOF {
			break
		}
		if rerr != nil {
			p.finish()
			return nil, nil, &fixtures.ParseError{Path: path, Err: fmt.Errorf("cannot read the file: %w", rerr)}
		}
	}
	p.start("parsing "+filepath.Base(path)+" …", 0)
	return fixtures.ReadBytes(path, data, opts...)
}
