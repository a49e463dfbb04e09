package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"os"
	"os/exec"
	"path/filepath"
	"slices"
	"strings"
	"sync/atomic"
	"time"

	"github.com/proofsheet/proofsheet/fixtures"
)

// inputFile is one file of a program's input.
type inputFile struct {
	name string
	data []byte
}

// input is what a program is run on: one file ({in} is its path), or a
// folder of files ({in} is the folder).
type input struct {
	files  []inputFile
	folder bool
}

// runner runs programs on inputs, each run in a directory of its own
// below root, with a timeout that ends the program's whole process group.
type runner struct {
	root     string // removed at the end of hammer
	timeout  time.Duration
	outExt   string // the extension of {out}, which names its format
	readOpts []fixtures.ReadOption
	runs     atomic.Int64 // how many programs were started
}

// runResult is one run of a program on one input.
type runResult struct {
	cmdline  string // the command as the shell ran it
	exit     int    // the exit status; -1 when it did not exit by itself
	timedOut bool
	killed   string // how it ended when a signal ended it
	startErr error  // the shell could not be started
	outBytes []byte // the output file (or standard output)
	outName  string // a file name whose extension names the output's format
	readErr  error  // no output, or an output that is no table
	table    *fixtures.Table
	stderr   []byte // the last stderrKeep bytes the program wrote to stderr
	took     time.Duration
}

// stderrKeep is how much of a run's standard error is kept.
const stderrKeep = 64 << 10

// ok reports whether the run exited 0 and wrote a readable table.
func (r *runResult) ok() bool {
	return r.startErr == nil && !r.timedOut && r.killed == "" && r.exit == 0 && r.readErr == nil
}

// failure says how the run failed: class in a few words without the
// details that change from input to input ("exit status 3"), and line as
// the rest of a sentence that starts "the program" ("exited with status
// 3").
func (r *runResult) failure() (class, line string) {
	switch {
	case r.startErr != nil:
		return "could not start", "could not be started: " + r.startErr.Error()
	case r.timedOut:
		return "timed out", "timed out (its whole process group was killed)"
	case r.killed != "":
		return "killed by " + r.killed, "was killed by " + r.killed
	case r.exit != 0:
		return fmt.Sprintf("exit status %d", r.exit), fmt.Sprintf("exited with status %d", r.exit)
	case r.readErr != nil:
		if errors.Is(r.readErr, errNoOutput) {
			return "no output", r.readErr.Error()
		}
		return "unreadable output", "wrote an output that is not a readable table: " + r.readErr.Error()
	}
	return "", ""
}

// errNoOutput is the error of a run that wrote no output file.
var errNoOutput = errors.New("wrote no output file")

// placeholders reports which of {in} and {out} a command uses.
func placeholders(cmd string) (in, out bool) {
	return strings.Contains(cmd, "{in}"), strings.Contains(cmd, "{out}")
}

// fill puts the paths into a command for the shell, quoted.
func fill(cmd, in, out string) string {
	return strings.NewReplacer("{in}", shellQuote(in), "{out}", shellQuote(out)).Replace(cmd)
}

// run runs the command on the input. ctx ends it early (the run then
// counts as killed). The run's directory is removed before run returns.
func (rn *runner) run(ctx context.Context, command string, in input) *runResult {
	res := &runResult{exit: -1}
	dir, err := os.MkdirTemp(rn.root, "run-")
	if err != nil {
		res.startErr = err
		return res
	}
	defer os.RemoveAll(dir)
	inPath, err := writeInput(dir, in)
	if err != nil {
		res.startErr = err
		return res
	}
	outDir := filepath.Join(dir, "out")
	tmp := filepath.Join(dir, "tmp")
	for _, d := range []string{outDir, tmp} {
		if err := os.Mkdir(d, 0o755); err != nil {
			res.startErr = err
			return res
		}
	}
	res.outName = "output" + rn.outExt
	outPath := filepath.Join(outDir, res.outName)
	_, usesOut := placeholders(command)
	res.cmdline = fill(command, inPath, outPath)

	cmd := exec.Command("sh", "-c", res.cmdline)
	// The program's own temporary files go below the run's directory, so
	// they go when it goes.
	cmd.Env = append(os.Environ(), "TMPDIR="+tmp, "TMP="+tmp, "TEMP="+tmp)
	inOwnGroup(cmd)
	// Files, not pipes, so Wait returns when the program exits even if a
	// process it started still holds them open.
	errFile, err := os.Create(filepath.Join(dir, "stderr"))
	if err != nil {
		res.startErr = err
		return res
	}
	defer errFile.Close()
	cmd.Stderr = errFile
	if !usesOut {
		outFile, err := os.Create(outPath)
		if err != nil {
			res.startErr = err
			return res
		}
		defer outFile.Close()
		cmd.Stdout = outFile
	}
	start := time.Now()
	if err := cmd.Start(); err != nil {
		res.startErr = err
		return res
	}
	rn.runs.Add(1)
	done := make(chan error, 1)
	go func() { done <- cmd.Wait() }()
	timer := time.NewTimer(rn.timeout)
	defer timer.Stop()
	var werr error
	select {
	case werr = <-done:
	case <-timer.C:
		res.timedOut = true
		killGroup(cmd)
		werr = <-done
	case <-ctx.Done():
		killGroup(cmd)
		werr = <-done
		res.killed = "hammer stopping"
	}
	// Whatever the program left running in its group ends with it.
	killGroup(cmd)
	res.took = time.Since(start)
	res.stderr = tailOf(errFile, stderrKeep)
	var ee *exec.ExitError
	switch {
	case werr == nil:
		res.exit = 0
	case errors.As(werr, &ee):
		res.exit = ee.ExitCode()
		if res.exit < 0 && !res.timedOut && res.killed == "" {
			res.killed = strings.TrimPrefix(ee.ProcessState.String(), "signal: ")
		}
	default:
		res.startErr = werr
	}
	if res.exit != 0 || res.timedOut || res.killed != "" {
		return res
	}
	data, err := os.ReadFile(outPath)
	if err != nil {
		res.readErr = fmt.Errorf("%w at {out}", errNoOutput)
		return res
	}
	res.outBytes = data
	tb, _, err := fixtures.ReadBytes(res.outName, data, rn.readOpts...)
	if err != nil {
		// A header with no rows has no kinds to infer; read as text, it is
		// the empty table it is.
		if empty, _, terr := fixtures.ReadBytes(res.outName, data, append(slices.Clone(rn.readOpts), fixtures.AllText())...); terr == nil && empty.NumRows() == 0 {
			tb, err = empty, nil
		}
	}
	if err != nil {
		res.readErr = err
		return res
	}
	res.table = tb
	return res
}

// writeInput writes the input below dir and returns the path {in} names.
func writeInput(dir string, in input) (string, error) {
	inDir := filepath.Join(dir, "in")
	if err := os.Mkdir(inDir, 0o755); err != nil {
		return "", err
	}
	for _, f := range in.files {
		if err := os.WriteFile(filepath.Join(inDir, f.name), f.data, 0o644); err != nil {
			return "", err
		}
	}
	if in.folder {
		return inDir, nil
	}
	if len(in.files) != 1 {
		return "", fmt.Errorf("an input of %d files is not one file", len(in.files))
	}
	return filepath.Join(inDir, in.files[0].name), nil
}

// tailOf returns the last n bytes of a file.
func tailOf(f *os.File, n int64) []byte {
	size, err := f.Seek(0, io.SeekEnd)
	if err != nil {
		return nil
	}
	from := max(0, size-n)
	b := make([]byte, size-from)
	if _, err := f.ReadAt(b, from); err != nil && !errors.Is(err, io.EOF) {
		return nil
	}
	return b
}

// trimStderr keeps the last lines of a program's standard error for a
// report: at most maxLines lines of at most 300 bytes each.
func trimStderr(b []byte, maxLines int) string {
	s := strings.TrimRight(strings.ToValidUTF8(string(b), "\uFFFD"), "\n")
	if s == "" {
		return ""
	}
	lines := strings.Split(s, "\n")
	cut := 0
	if len(lines) > maxLines {
		cut = len(lines) - maxLines
		lines = lines[cut:]
	}
	for i, l := range lines {
		if len(l) > 300 {
			lines[i] = strings.ToValidUTF8(l[:300], "") + " …"
		}
	}
	out := strings.Join(lines, "\n")
	if cut > 0 {
		out = fmt.Sprintf("… %d earlier lines left out\n", cut) + out
	}
	return out
}
