package main

import (
	"bytes"
	"errors"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"slices"
	"strings"

	"github.com/proofsheet/proofsheet/golden"
)

// The errors of the git plumbing that a user can cause.
var (
	errNotRepo    = errors.New("not a git repository")
	errUnknownRev = errors.New("unknown revision")
	errNoGit      = errors.New("git is not installed")
)

// gitRepo runs git in a directory of a work tree.
type gitRepo struct {
	dir string // where git runs; pathspecs are relative to it
	top string // the top of the work tree
}

// git runs one git command in dir and returns its standard output.
func git(dir string, args ...string) ([]byte, error) {
	cmd := exec.Command("git", args...)
	cmd.Dir = dir
	// Plain messages, no pager, and no lock taken on the index for a
	// command that only reads.
	cmd.Env = append(os.Environ(), "LC_ALL=C", "LANGUAGE=", "GIT_PAGER=cat", "GIT_OPTIONAL_LOCKS=0", "GIT_TERMINAL_PROMPT=0")
	var out, stderr bytes.Buffer
	cmd.Stdout, cmd.Stderr = &out, &stderr
	if err := cmd.Run(); err != nil {
		var ee *exec.ExitError
		if !errors.As(err, &ee) {
			return nil, fmt.Errorf("running git: %w", err)
		}
		msg := strings.TrimSpace(stderr.String())
		if msg == "" {
			msg = err.Error()
		}
		return nil, &gitError{args: args, msg: msg}
	}
	return out.Bytes(), nil
}

// gitError is a git command that failed, with what git said.
type gitError struct {
	args []string
	msg  string
}

func (e *gitError) Error() string {
	return "git " + strings.Join(e.args, " ") + ": " + e.msg
}

// openRepo finds the work tree around dir.
func openRepo(dir string) (*gitRepo, error) {
	if _, err := exec.LookPath("git"); err != nil {
		return nil, fmt.Errorf("%w: changes compares golden files with a git revision; install git, or read run records with --records DIR", errNoGit)
	}
	out, err := git(dir, "rev-parse", "--show-toplevel")
	if err != nil {
		var ge *gitError
		if errors.As(err, &ge) && strings.Contains(ge.msg, "not a git repository") {
			return nil, fmt.Errorf("%s: %w (nor is any parent directory): changes compares golden files with a git revision; run it in a work tree, or read run records with --records DIR", dir, errNotRepo)
		}
		return nil, err
	}
	top := strings.TrimSpace(string(out))
	if top == "" {
		return nil, fmt.Errorf("%s: %w: no work tree (a bare repository?)", dir, errNotRepo)
	}
	return &gitRepo{dir: dir, top: filepath.FromSlash(top)}, nil
}

// resolve returns the commit a revision names.
func (r *gitRepo) resolve(rev string) (string, error) {
	if rev == "" {
		return "", fmt.Errorf("%w: an empty --base", errUnknownRev)
	}
	out, err := git(r.dir, "rev-parse", "--verify", "--quiet", "--end-of-options", rev+"^{commit}")
	if err != nil {
		if _, herr := git(r.dir, "rev-parse", "--verify", "--quiet", "HEAD"); herr != nil && rev == "HEAD" {
			return "", fmt.Errorf("%w %q: the repository has no commit yet", errUnknownRev, rev)
		}
		return "", fmt.Errorf("%w %q: git knows no commit by that name", errUnknownRev, rev)
	}
	return strings.TrimSpace(string(out)), nil
}

// inTestdata reports whether the working directory lies in a testdata
// directory of the work tree.
func (r *gitRepo) inTestdata() bool {
	out, err := git(r.dir, "rev-parse", "--show-prefix")
	if err != nil {
		return false
	}
	for _, el := range strings.Split(strings.TrimSpace(string(out)), "/") {
		if el == "testdata" {
			return true
		}
	}
	return false
}

// shortCommit returns the abbreviated name of a commit.
func (r *gitRepo) shortCommit(commit string) string {
	out, err := git(r.dir, "rev-parse", "--short", commit)
	if err != nil {
		return commit
	}
	return strings.TrimSpace(string(out))
}

// gitChange is a file that differs between a commit and the work tree.
type gitChange struct {
	path     string // slash-separated, from the top of the work tree
	old, cur bool   // present in the commit; present in the work tree
}

// changed lists the golden files under the pathspecs that differ between
// the commit and the work tree, untracked new files included, sorted by
// path.
func (r *gitRepo) changed(commit string, pathspecs []string) ([]gitChange, error) {
	args := append([]string{"diff", "--no-renames", "--no-ext-diff", "--name-status", "-z", commit, "--"}, pathspecs...)
	out, err := git(r.dir, args...)
	if err != nil {
		return nil, err
	}
	var changes []gitChange
	seen := map[string]bool{}
	fields := strings.Split(strings.TrimSuffix(string(out), "\x00"), "\x00")
	for i := 0; i+1 < len(fields); i += 2 {
		status, path := fields[i], fields[i+1]
		if !isGoldenFile(path) || seen[path] {
			continue
		}
		seen[path] = true
		c := gitChange{path: path, old: true, cur: true}
		switch {
		case strings.HasPrefix(status, "A"):
			c.old = false
		case strings.HasPrefix(status, "D"):
			c.cur = false
		}
		changes = append(changes, c)
	}
	args = append([]string{"ls-files", "--others", "--exclude-standard", "--full-name", "-z", "--"}, pathspecs...)
	out, err = git(r.dir, args...)
	if err != nil {
		return nil, err
	}
	for _, path := range strings.Split(string(out), "\x00") {
		if path == "" || !isGoldenFile(path) || seen[path] {
			continue
		}
		seen[path] = true
		changes = append(changes, gitChange{path: path, cur: true})
	}
	slices.SortFunc(changes, func(a, b gitChange) int { return strings.Compare(a.path, b.path) })
	return changes, nil
}

// show returns a file as the commit has it.
func (r *gitRepo) show(commit, path string) ([]byte, error) {
	return git(r.dir, "show", "--no-textconv", commit+":"+path)
}

// read returns a file as the work tree has it.
func (r *gitRepo) read(path string) ([]byte, error) {
	return os.ReadFile(filepath.Join(r.top, filepath.FromSlash(path)))
}

// isGoldenFile reports whether a path has a golden file extension.
func isGoldenFile(path string) bool {
	for _, ext := range []string{golden.ExtTable, golden.ExtText, golden.ExtJSON} {
		if strings.HasSuffix(path, ext) && len(path) > len(ext) && !strings.HasSuffix(path, "/"+ext) {
			return true
		}
	}
	return false
}

// defaultPathspec selects every testdata/ directory below the working
// directory (all of it when it lies in one; see inTestdata).
const defaultPathspec = ":(glob)**/testdata/**"
