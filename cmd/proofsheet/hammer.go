package main

import (
	"context"
	"errors"
	"flag"
	"fmt"
	"iter"
	"os"
	"os/signal"
	"path/filepath"
	"runtime"
	"slices"
	"strconv"
	"strings"
	"sync"
	"syscall"
	"time"

	"github.com/proofsheet/proofsheet/assert"
	"github.com/proofsheet/proofsheet/fixtures"
	"github.com/proofsheet/proofsheet/property"
)

func hammerCommand() *command {
	c := &command{
		name:    "hammer",
		summary: "property-test a program in any language with generated mess, and shrink what breaks it",
		usage: `Usage: proofsheet hammer --schema FILE --run CMD [--check NAME[=ARG]]... [options]

Generates messy raw files from a gen schema file (the same generators as
the property package and proofsheet gen), runs the program on each, and
checks that the checks hold. The program is a shell command: {in} is the
path of a generated raw file (a folder of them with --files), {out} the
path the program must write its output table to, its format given by
--out-format; with no {out}, the program's standard output is read.

When a check fails, the failing input file is shrunk — rows, then
columns, then cells toward plain spellings and simpler values — while
the same check keeps failing the same way. The smallest failing input is
printed with its invisible characters made visible, with the seed, the
command that reproduces it, the program's standard error and the output
diff, and --keep DIR gets exactly the bytes the program failed on.

Checks (default: runs):
` + checkHelp + `

Options:
  --schema FILE      the gen schema file of the raw input (see proofsheet gen)
  --run CMD          the program, as a shell command with {in} and {out}
  --check NAME[=ARG] a check (repeatable; see above)
  --key COLS         compare outputs by these key columns
  --any-row-order    compare outputs as multisets of rows
` + tolHelp + `
  --ignore COLS      leave these output columns out of comparisons
  --loose-types      compare values across types: 3 equals 3.0
  --samples N        generated inputs to try (default 100)
  --rows N           most data rows of a generated file (default 30);
                     early samples are smaller
  --files N          each sample is a folder of 1 to N files, and {in}
                     is the folder (default: one file, {in} its path)
  --seed N           the seed (default: from the clock); the same schema,
                     seed and flags give the same inputs byte for byte
  --jobs N           programs run at once (default: the number of CPUs)
  --timeout D        each run's time limit, after which the program's whole
                     process group is killed (default 30s)
  --out-format F     the format of the output: csv (default), tsv, jsonl,
                     json, arrow or parquet (the extension of {out})
  --keep DIR         write the smallest failing input there (and its
                     variant, the outputs and a reproduce.txt)
  --max-shrinks N    most candidate inputs tried while shrinking (default
                     2000; 0 does not shrink)
  --format F         text (default), markdown or json
  --junit FILE       also write a JUnit XML report: one test case per check
  --quiet            print no progress on stderr

` + readerHelp + `
  (Reader options apply to reading the program's outputs.)

Each run gets a fresh temporary directory (TMPDIR points into it), removed
when the run ends, and nothing is left behind when hammer ends. When
` + stepSummaryVar + ` names a file, the Markdown report is appended to it.

Example:
  proofsheet hammer --schema uploads.schema --run 'python3 clean.py {in} {out}' \
      --key house,day --check runs --check order-free --check same-on-plain \
      --check no-nulls=house,day --check 'agrees=python3 reference.py {in} {out}' \
      --samples 100 --seed 7 --keep failing/

Exit status: 0 when every check held on every sample, 1 when one failed
(shrunk and reported), 2 on trouble: a bad schema or option, the program
not found, a reference that fails, every run timing out.
`,
	}
	c.run = func(e *env, args []string) int { return runHammer(e, c, args) }
	return c
}

// hammerDefaults.
const (
	defaultSamples    = 100
	defaultRows       = 30
	defaultTimeout    = 30 * time.Second
	defaultMaxShrinks = 2000
	stderrLines       = 20
)

// hammerRun is one hammer: its settings and what it found.
type hammerRun struct {
	e          *env
	schemaFile string
	spec       *property.GenSpec
	program    string
	checks     []*hammerCheck
	samples    int
	rows       int
	files      int
	seed       int64
	seedFrom   string
	jobs       int
	maxShrinks int
	keep       string
	judge      *judge
	reproduce  string // the command that runs this hammer again with its seed

	ran      int // samples run to the end
	start    time.Time
	timedOut int // samples whose run on the input timed out
	failure  *hammerFailure
	trouble  error
}

// hammerFailure is the failure hammer reports.
type hammerFailure struct {
	sample   *sample    // as generated
	shrunk   *sample    // the smallest failing input found
	verdict  *verdict   // of the check on the shrunk input
	others   []*verdict // the other checks that failed on the generated sample
	steps    int        // shrink steps taken
	tried    int        // candidates tried
	kept     []string   // files written to --keep
	keepNote string
}

func runHammer(e *env, c *command, args []string) int {
	fs := newFlags(c)
	schemaFile := fs.String("schema", "", "")
	program := fs.String("run", "", "")
	var checkSpecs tolFlags
	fs.Var(&checkSpecs, "check", "")
	cf := addCompareFlags(fs)
	rf := addReaderFlags(fs)
	samples := fs.Int("samples", defaultSamples, "")
	rows := fs.Int("rows", defaultRows, "")
	files := fs.Int("files", 0, "")
	seedFlag := fs.String("seed", "", "")
	jobs := fs.Int("jobs", runtime.NumCPU(), "")
	timeout := fs.Duration("timeout", defaultTimeout, "")
	outFormat := fs.String("out-format", "csv", "")
	keep := fs.String("keep", "", "")
	maxShrinks := fs.Int("max-shrinks", defaultMaxShrinks, "")
	format := fs.String("format", "text", "")
	junit := fs.String("junit", "", "")
	quiet := fs.Bool("quiet", false, "")
	rest, status, ok := parseFlags(e, c, fs, args)
	if !ok {
		return status
	}
	if len(rest) > 0 {
		return trouble(e, c, "unexpected argument %q: the program goes in --run 'CMD {in} {out}'\n\n%s", rest[0], c.usage)
	}
	switch {
	case *schemaFile == "":
		return trouble(e, c, "no --schema FILE given\n\n%s", c.usage)
	case strings.TrimSpace(*program) == "":
		return trouble(e, c, "no --run CMD given: the program, as a shell command with {in} and {out}\n\n%s", c.usage)
	case *samples < 1:
		return trouble(e, c, "--samples %d: want 1 or more", *samples)
	case *rows < 1 || *rows > 1_000_000:
		return trouble(e, c, "--rows %d: want 1 to 1000000", *rows)
	case *files < 0 || *files > 1000:
		return trouble(e, c, "--files %d: want 1 to 1000 (0: one file, not a folder)", *files)
	case *jobs < 1:
		return trouble(e, c, "--jobs %d: want 1 or more", *jobs)
	case *timeout <= 0:
		return trouble(e, c, "--timeout %v: want a duration above 0, such as 30s or 2m", *timeout)
	case *maxShrinks < 0:
		return trouble(e, c, "--max-shrinks %d: want 0 or more", *maxShrinks)
	case !goldenFormats[*format]:
		return trouble(e, c, "--format %q: unknown format (want text, markdown or json)", *format)
	}
	if in, _ := placeholders(*program); !in {
		return trouble(e, c, "--run %q has no {in}: the program must be told where its input is", *program)
	}
	of, err := fixtures.ParseFormat(*outFormat)
	if err != nil {
		return trouble(e, c, "--out-format: %v", err)
	}
	outExt := "." + string(of)
	if _, err := fixtures.FormatFor("output" + outExt); err != nil {
		return trouble(e, c, "--out-format %q: %v", *outFormat, err)
	}
	if err := checkJUnit(*junit); err != nil {
		return trouble(e, c, "%v", err)
	}
	if err := checkKeep(*keep); err != nil {
		return trouble(e, c, "%v", err)
	}
	var checks []*hammerCheck
	seen := map[string]bool{}
	for _, s := range checkSpecs {
		ch, err := parseCheck(s)
		if err != nil {
			return trouble(e, c, "%v", err)
		}
		if seen[ch.spec] {
			return trouble(e, c, "--check %q is given twice", ch.spec)
		}
		seen[ch.spec] = true
		checks = append(checks, ch)
	}
	if len(checks) == 0 {
		checks = []*hammerCheck{{spec: "runs", name: "runs"}}
	}
	for _, ch := range checks {
		if ch.ref != "" {
			if in, _ := placeholders(ch.ref); !in {
				return trouble(e, c, "--check %q: the reference has no {in}", ch.spec)
			}
		}
	}
	opts, err := cf.options()
	if err != nil {
		return trouble(e, c, "%v", err)
	}
	opts = append(opts, assert.ListLimit(assert.DefaultListLimit))

	readOpts, err := rf.options()
	if err != nil {
		return trouble(e, c, "%v", err)
	}

	text, err := os.ReadFile(*schemaFile)
	if err != nil {
		return trouble(e, c, "--schema: %v", err)
	}
	spec, err := property.ParseGenSpec(*schemaFile, text)
	if err != nil {
		return trouble(e, c, "%v", err)
	}
	seed, seedFrom := time.Now().UnixNano(), "from the clock"
	if *seedFlag != "" {
		seed, err = strconv.ParseInt(strings.TrimSpace(*seedFlag), 10, 64)
		if err != nil {
			return trouble(e, c, "--seed %q: want a whole number", *seedFlag)
		}
		seedFrom = "given"
	}

	root, err := os.MkdirTemp("", "proofsheet-hammer-")
	if err != nil {
		return trouble(e, c, "%v", err)
	}
	defer os.RemoveAll(root)
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt, syscall.SIGTERM)
	defer stop()

	h := &hammerRun{
		e: e, schemaFile: *schemaFile, spec: spec, program: *program, checks: checks,
		samples: *samples, rows: *rows, files: *files, seed: seed, seedFrom: seedFrom, jobs: *jobs,
		maxShrinks: *maxShrinks, keep: *keep, start: time.Now(),
		judge: &judge{rn: &runner{root: root, timeout: *timeout, outExt: outExt, readOpts: readOpts}, program: *program, opts: opts, keyed: cf.keyed()},
	}
	h.reproduce = reproduceLine(fs, seed)
	bar := newProgress(e, *quiet)
	h.hammer(ctx, bar)
	bar.finish()
	if ctx.Err() != nil && h.trouble == nil {
		h.trouble = errors.New("interrupted")
	}

	report := h.report(*format)
	if _, err := e.stdout.Write([]byte(report)); err != nil {
		return trouble(e, c, "%v", err)
	}
	if err := h.junit().write(*junit); err != nil {
		return trouble(e, c, "%v", err)
	}
	if err := stepSummary(e, h.report("markdown")); err != nil {
		return trouble(e, c, "%v", err)
	}
	switch {
	case h.trouble != nil:
		return trouble(e, c, "%v", h.trouble)
	case h.failure != nil:
		return exitDiffers
	}
	return exitSame
}

// reproduceLine is the hammer command that runs this one again: the same
// flags, the seed made explicit, without the report flags.
func reproduceLine(fs *flag.FlagSet, seed int64) string {
	parts := []string{"proofsheet", "hammer"}
	var set []*flag.Flag
	fs.Visit(func(f *flag.Flag) { set = append(set, f) })
	// The schema, the program and the checks first; then the rest.
	rank := map[string]int{"schema": 0, "run": 1, "check": 2}
	slices.SortStableFunc(set, func(a, b *flag.Flag) int {
		ra, ok := rank[a.Name]
		if !ok {
			ra = 3
		}
		rb, ok := rank[b.Name]
		if !ok {
			rb = 3
		}
		return ra - rb
	})
	for _, f := range set {
		switch f.Name {
		case "seed", "format", "junit", "quiet", "jobs":
			continue
		}
		parts = append(parts, flagWords(f)...)
	}
	return strings.Join(append(parts, "--seed", strconv.FormatInt(seed, 10)), " ")
}

// checkKeep refuses a --keep directory that holds files hammer did not
// write (a reproduce.txt marks a directory it wrote before).
func checkKeep(dir string) error {
	if dir == "" {
		return nil
	}
	entries, err := os.ReadDir(dir)
	switch {
	case errors.Is(err, os.ErrNotExist):
		parent := filepath.Dir(filepath.Clean(dir))
		if fi, err := os.Stat(parent); err != nil || !fi.IsDir() {
			return fmt.Errorf("--keep %s: no directory %s", dir, parent)
		}
		return nil
	case err != nil:
		return fmt.Errorf("--keep %s: %w", dir, err)
	case len(entries) == 0:
		return nil
	}
	if _, err := os.Stat(filepath.Join(dir, keepMarker)); err != nil {
		return fmt.Errorf("--keep %s is a directory with files hammer did not write; give an empty or new directory", dir)
	}
	return nil
}

// keepMarker is the file hammer writes into --keep DIR.
const keepMarker = "reproduce.txt"

// makeSample generates sample i: its seed is derived from the run's seed,
// its size grows over the first half of the samples, and with --files it
// is a folder of 1 to N files.
func (h *hammerRun) makeSample(i int) (*sample, error) {
	si := mix(h.seed, int64(i))
	s := &sample{index: i, seed: si, folder: h.files > 0}
	n := 1
	if h.files > 1 {
		n = 1 + int(uint64(mix(si, 1))%uint64(h.files))
	}
	half := max(1, h.samples/2)
	limit := min(h.rows, max(1, (h.rows*(i+1)+half-1)/half))
	for k := 0; k < n; k++ {
		rows := 1 + int(uint64(mix(si, 2+int64(k)))%uint64(limit))
		f, err := property.GenerateFile(h.spec.Schema, rows, mix(si, 1000+int64(k)), h.spec.Options, h.spec.Style)
		if err != nil {
			return nil, fmt.Errorf("%s: generating sample %d: %w", h.schemaFile, i+1, err)
		}
		name := f.Name()
		if h.files > 0 {
			name = f.Style.FileName(fmt.Sprintf("upload-%02d", k+1))
		}
		s.files = append(s.files, f)
		s.names = append(s.names, name)
	}
	return s, nil
}

// sampleResult is what one sample gave.
type sampleResult struct {
	s        *sample
	verdicts []*verdict
	err      error
}

// failed reports whether a check failed or could not be judged.
func (r *sampleResult) failed() bool {
	if r.err != nil {
		return true
	}
	for _, v := range r.verdicts {
		if !v.held || v.trouble != nil {
			return true
		}
	}
	return false
}

// hammer runs the samples, --jobs at a time, and stops at the first that
// fails: the failure reported is that of the lowest-numbered failing
// sample, whatever order the runs end in, so a seed always gives the same
// report. It then shrinks the failing input.
func (h *hammerRun) hammer(ctx context.Context, bar *progress) {
	results := make([]*sampleResult, h.samples)
	cancels := make([]context.CancelFunc, h.samples)
	var mu sync.Mutex
	next, first := 0, h.samples
	bar.startCount("hammering "+filepath.Base(h.schemaFile), int64(h.samples))
	var wg sync.WaitGroup
	for w := 0; w < h.jobs; w++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for {
				mu.Lock()
				i := next
				if i >= first || ctx.Err() != nil {
					mu.Unlock()
					return
				}
				next++
				sctx, cancel := context.WithCancel(ctx)
				cancels[i] = cancel
				mu.Unlock()

				r := &sampleResult{}
				r.s, r.err = h.makeSample(i)
				if r.err == nil {
					r.verdicts = h.judge.judgeSample(sctx, r.s, h.checks)
				}
				cancel()
				mu.Lock()
				results[i] = r
				if r.failed() && i < first {
					first = i
					// Samples after it no longer matter: end their runs.
					for k := i + 1; k < len(cancels); k++ {
						if cancels[k] != nil {
							cancels[k]()
						}
					}
				}
				mu.Unlock()
				bar.add(1)
			}
		}()
	}
	wg.Wait()
	bar.finish()
	if ctx.Err() != nil {
		return
	}
	h.ran = min(first+1, h.samples)
	if first == h.samples {
		return
	}
	r := results[first]
	if r.err != nil {
		h.trouble = r.err
		return
	}
	var failing *verdict
	var others []*verdict
	for _, v := range r.verdicts {
		if v.trouble != nil {
			h.trouble = v.trouble
			return
		}
		if v.held {
			continue
		}
		if failing == nil {
			failing = v
		} else {
			others = append(others, v)
		}
	}
	if err := h.programTrouble(ctx, first, failing.base, results); err != nil {
		h.trouble = err
		return
	}
	f := &hammerFailure{sample: r.s, others: others}
	h.failure = f
	if h.maxShrinks > 0 {
		bar.start("shrinking the failing input …", 0)
		f.shrunk, f.verdict, f.steps, f.tried = h.shrink(ctx, r.s, failing)
		bar.finish()
	} else {
		f.shrunk, f.verdict = r.s, failing
	}
	if h.keep != "" {
		if err := h.keepFailure(f); err != nil {
			f.keepNote = err.Error()
		}
	}
}

// programTrouble tells trouble apart from a failure: a program the shell
// cannot find or run, or one that times out on every input — when the
// failing sample timed out and no other run ended by itself, the next
// sample is run to see whether any does.
func (h *hammerRun) programTrouble(ctx context.Context, first int, base *runResult, results []*sampleResult) error {
	if base.startErr != nil {
		return fmt.Errorf("the program could not be started: %w", base.startErr)
	}
	// Source: POSIX Shell Command Language §2.8.2 (Exit Status for
	// Commands) — 127 when a command is not found, 126 when it is found
	// but cannot be run.
	if base.exit == 127 || base.exit == 126 {
		what := "was not found"
		if base.exit == 126 {
			what = "cannot be run"
		}
		msg := fmt.Sprintf("the program %s (the shell exited %d running %s)", what, base.exit, base.cmdline)
		if tail := trimStderr(base.stderr, 5); tail != "" {
			msg += ":\n" + tail
		}
		return errors.New(msg)
	}
	if !base.timedOut {
		return nil
	}
	for _, r := range results {
		if r == nil || r.err != nil || len(r.verdicts) == 0 {
			continue
		}
		if b := r.verdicts[0].base; !b.timedOut && b.killed == "" {
			return nil // some run ended by itself
		}
	}
	if first+1 < h.samples {
		if s, err := h.makeSample(first + 1); err == nil {
			if r := h.judge.rn.run(ctx, h.program, s.input()); !r.timedOut && r.killed == "" {
				return nil
			}
		}
	}
	return fmt.Errorf("every run timed out (--timeout %v): raise --timeout, or see whether the program waits for input", h.judge.rn.timeout)
}

// shrink finds the smallest input on which the check fails the same way,
// greedily: it takes the first candidate (in File.Smaller's order: rows,
// style, columns, cells) that still fails and starts again from it. Up to
// --jobs candidates are tried at once; the first failing one in order
// wins, and the budget (--max-shrinks) counts candidates in that order, so
// the result does not depend on --jobs.
func (h *hammerRun) shrink(ctx context.Context, s *sample, failing *verdict) (*sample, *verdict, int, int) {
	chk, class := failing.check, failing.class
	try := func(c *sample) *verdict {
		v := h.judge.judge(ctx, c, chk, h.judge.rn.run(ctx, h.program, c.input()))
		if v.held || v.trouble != nil || v.class != class {
			return nil
		}
		return v
	}
	cur, curV := s, failing
	steps, tried := 0, 0
	for tried < h.maxShrinks && ctx.Err() == nil {
		next, stop := iter.Pull(candidates(cur))
		found := false
		for !found && tried < h.maxShrinks && ctx.Err() == nil {
			var batch []*sample
			for len(batch) < min(h.jobs, h.maxShrinks-tried) {
				c, ok := next()
				if !ok {
					break
				}
				batch = append(batch, c)
			}
			if len(batch) == 0 {
				break
			}
			vs := make([]*verdict, len(batch))
			var wg sync.WaitGroup
			for i, c := range batch {
				wg.Add(1)
				go func() {
					defer wg.Done()
					vs[i] = try(c)
				}()
			}
			wg.Wait()
			// Candidates count in order up to the first that fails, as
			// a one-at-a-time search would count them: those after it
			// in the batch were run ahead of need. So --max-shrinks
			// stops at the same candidate whatever --jobs is.
			tried += len(batch)
			for i, v := range vs {
				if v != nil {
					cur, curV, found = batch[i], v, true
					tried -= len(batch) - 1 - i
					break
				}
			}
		}
		stop()
		if !found {
			break
		}
		steps++
	}
	return cur, curV, steps, tried
}

// candidates are the inputs smaller than s, in shrink order: a file of a
// folder left out, then each file's own candidates.
func candidates(s *sample) iter.Seq[*sample] {
	return func(yield func(*sample) bool) {
		if len(s.files) > 1 {
			for k := range s.files {
				if !yield(s.without(k)) {
					return
				}
			}
		}
		for k, f := range s.files {
			for c := range f.Smaller() {
				if !yield(s.with(k, c)) {
					return
				}
			}
		}
	}
}

// inputPath says where a file of the failing input is kept, relative to
// --keep DIR.
func (f *hammerFailure) inputPath(name string) string {
	if f.shrunk.folder {
		return filepath.Join("input", name)
	}
	return name
}

// keepFailure writes the failing input, its variant, the outputs, the
// program's stderr and a reproduce.txt into --keep DIR.
func (h *hammerRun) keepFailure(f *hammerFailure) error {
	dir := h.keep
	if entries, err := os.ReadDir(dir); err == nil && len(entries) > 0 {
		// A directory hammer wrote before (checkKeep made sure): empty it.
		for _, en := range entries {
			if err := os.RemoveAll(filepath.Join(dir, en.Name())); err != nil {
				return fmt.Errorf("--keep %s: %w", dir, err)
			}
		}
	}
	write := func(rel string, data []byte) error {
		p := filepath.Join(dir, rel)
		if err := os.MkdirAll(filepath.Dir(p), 0o755); err != nil {
			return err
		}
		if err := os.WriteFile(p, data, 0o644); err != nil {
			return err
		}
		f.kept = append(f.kept, filepath.ToSlash(rel))
		return nil
	}
	in := f.shrunk.input()
	for _, file := range in.files {
		if err := write(f.inputPath(file.name), file.data); err != nil {
			return fmt.Errorf("--keep %s: %w", dir, err)
		}
	}
	v := f.verdict
	if v.variant != nil {
		for _, file := range v.variant.files {
			rel := filepath.Join(v.variantName, file.name)
			if f.shrunk.folder {
				rel = filepath.Join(v.variantName, "input", file.name)
			}
			if err := write(rel, file.data); err != nil {
				return fmt.Errorf("--keep %s: %w", dir, err)
			}
		}
	}
	ext := h.judge.rn.outExt
	if v.base != nil && v.base.outBytes != nil {
		if err := write("output"+ext, v.base.outBytes); err != nil {
			return err
		}
	}
	if v.other != nil && v.other.outBytes != nil {
		name := v.variantName
		if name == "" {
			name = map[string]string{"agrees": "reference", "repeatable": "second-run"}[v.check.name]
		}
		if err := write(name+"-output"+ext, v.other.outBytes); err != nil {
			return err
		}
	}
	if v.base != nil && len(v.base.stderr) > 0 {
		if err := write("stderr.txt", v.base.stderr); err != nil {
			return err
		}
	}
	return write(keepMarker, []byte(h.reproduceText(f)))
}

// byHand are the commands that run the program on the kept input (and its
// variant) by hand.
func (h *hammerRun) byHand(f *hammerFailure) []string {
	if h.keep == "" {
		return nil
	}
	ext := h.judge.rn.outExt
	_, usesOut := placeholders(h.program)
	cmd := func(program, in, out string) string {
		if usesOut {
			return fill(program, in, out)
		}
		return fill(program, in, out) + " > " + shellQuote(out)
	}
	inPath := func(variant string) string {
		base := h.keep
		if variant != "" {
			base = filepath.Join(h.keep, variant)
		}
		if f.shrunk.folder {
			return filepath.Join(base, "input")
		}
		return filepath.Join(base, f.shrunk.names[0])
	}
	out := []string{cmd(h.program, inPath(""), "out"+ext)}
	v := f.verdict
	switch {
	case v.variant != nil && v.check.name == "idempotent" && !f.shrunk.folder:
		out = append(out, cmd(h.program, filepath.Join(h.keep, v.variantName, v.variant.files[0].name), "out-"+v.variantName+ext))
	case v.variant != nil:
		out = append(out, cmd(h.program, inPath(v.variantName), "out-"+v.variantName+ext))
	case v.check.name == "agrees":
		out = append(out, fill(v.check.ref, inPath(""), "out-reference"+ext))
	case v.check.name == "repeatable":
		out = append(out, cmd(h.program, inPath(""), "out-again"+ext))
	}
	return out
}

// reproduceText is the reproduce.txt of --keep.
func (h *hammerRun) reproduceText(f *hammerFailure) string {
	var b strings.Builder
	fmt.Fprintf(&b, "# proofsheet hammer: %s failed on sample %d (seed %d): %s\n", f.verdict.check.spec, f.sample.index+1, h.seed, f.verdict.line)
	b.WriteString("# Run hammer again with the same inputs:\n" + h.reproduce + "\n")
	if cmds := h.byHand(f); len(cmds) > 0 {
		b.WriteString("# Run the program on the kept input by hand:\n" + strings.Join(cmds, "\n") + "\n")
	}
	return b.String()
}
