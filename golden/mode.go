package golden

import (
	"errors"
	"flag"
	"fmt"
	"os"
	"strconv"
	"strings"
	"sync"
	"testing"
)

// The environment variables the package reads. Each is read at the moment
// it matters (a check, the end of TestMain), so t.Setenv works for them in
// tests that do not run in parallel.
const (
	// EnvUpdate, set to a true value (1, true, yes, on), rewrites golden
	// files as -update does. Use it where the flag cannot be given, e.g.
	// for `go test ./...` over packages that do not all import golden.
	EnvUpdate = "PROOFSHEET_UPDATE"
	// EnvUpdateInCI, set to a true value, allows updates even though CI is
	// set. Meant for a deliberate job that regenerates golden files.
	EnvUpdateInCI = "PROOFSHEET_UPDATE_IN_CI"
	// EnvCI is the variable continuous-integration services set. When it
	// holds a true value, updates are refused unless EnvUpdateInCI allows
	// them. Any value other than "", 0, false, no and off counts as true,
	// since services spell it differently.
	EnvCI = "CI"
	// EnvRecords names a directory; when set, every check appends a Record
	// to a JSON Lines file there (see Record).
	EnvRecords = "PROOFSHEET_RECORDS"
	// EnvStale asks RunTests to look for stale golden files after a full
	// run: "list" prints them, "check" prints them and fails the run if
	// there are any, "prune" removes them.
	EnvStale = "PROOFSHEET_STALE"
)

// updateFlag is -update as this package took it from the command line
// (see takeUpdateArg). It is the package's only global mutable state apart
// from the bookkeeping of one run (see registry).
var updateFlag = new(bool)

// otherFlag is a flag named update that another package defined before
// this one was initialised; its value is read at each check.
var otherFlag *flag.Flag

// The package defines no flag: a flag named update defined anywhere else in
// the test binary, before or after this package is initialised, must not
// clash with it (the flag package panics on a second definition). Instead,
// -update is taken out of the command line here, before flag.Parse sees
// it. Only in a test binary: a program that imports the package (the
// proofsheet command has its own --update) keeps its arguments.
func init() {
	if !testing.Testing() {
		return
	}
	if f := flag.Lookup(updateName); f != nil {
		otherFlag = f // defined first by another package: it owns -update
		return
	}
	os.Args, *updateFlag = takeUpdateArg(os.Args)
}

const updateName = "update"

// takeUpdateArg removes -update, --update and -update=BOOL from the
// arguments before a "--", and reports whether the last of them asked for
// an update. An -update=VALUE whose value is not a boolean is left for
// flag.Parse to refuse.
func takeUpdateArg(args []string) ([]string, bool) {
	if len(args) == 0 {
		return args, false
	}
	out := []string{args[0]}
	on := false
	for i, a := range args[1:] {
		if a == "--" {
			out = append(out, args[i+1:]...)
			break
		}
		name, value, hasValue := strings.Cut(strings.TrimPrefix(strings.TrimPrefix(a, "-"), "-"), "=")
		if !strings.HasPrefix(a, "-") || name != updateName {
			out = append(out, a)
			continue
		}
		if !hasValue {
			on = true
			continue
		}
		v, err := strconv.ParseBool(value)
		if err != nil {
			out = append(out, a)
			continue
		}
		on = v
	}
	return out, on
}

var syncOther sync.Once

// flagUpdate reports whether -update was given. When a package of the
// test binary defined its own update flag after this one took -update from
// the command line, that flag is set to true as well (once), so one
// -update refreshes both.
func flagUpdate() bool {
	if otherFlag != nil {
		return truthy(otherFlag.Value.String())
	}
	if *updateFlag {
		syncOther.Do(func() {
			if f := flag.Lookup(updateName); f != nil && !truthy(f.Value.String()) {
				f.Value.Set("true")
			}
		})
	}
	return *updateFlag
}

// truthy reads a yes/no environment value: "", 0, false, no and off (any
// case, blanks trimmed) are false; anything else is true.
func truthy(v string) bool {
	switch strings.ToLower(strings.TrimSpace(v)) {
	case "", "0", "false", "no", "off":
		return false
	}
	return true
}

// mode is the update mode of a check, read from the flag and environment.
type mode struct {
	requested bool   // -update or EnvUpdate
	byFlag    bool   // requested through -update
	ci        string // the value of CI when it is true, else ""
	forced    bool   // EnvUpdateInCI
}

func currentMode() mode {
	m := mode{byFlag: flagUpdate(), forced: truthy(os.Getenv(EnvUpdateInCI))}
	m.requested = m.byFlag || truthy(os.Getenv(EnvUpdate))
	if v := os.Getenv(EnvCI); truthy(v) {
		m.ci = v
	}
	return m
}

// allowed reports whether files may be rewritten.
func (m mode) allowed() bool { return m.requested && (m.ci == "" || m.forced) }

// ErrUpdateRefused is wrapped by the error that explains why an update was
// refused.
var ErrUpdateRefused = errors.New("golden files are not updated in CI")

// refusal returns why a requested update is refused, or nil.
func (m mode) refusal() error {
	if !m.requested || m.allowed() {
		return nil
	}
	how := "-update"
	if !m.byFlag {
		how = EnvUpdate
	}
	return refusedError(how, m.ci)
}

// refusedError explains why an update asked for by how is refused while
// CI holds ci.
func refusedError(how, ci string) error {
	return fmt.Errorf("%w: %s was given but %s=%s is set; rewriting golden files in CI would hide changes from review. "+
		"Update them on your machine and commit them, or set %s=1 to force it", ErrUpdateRefused, how, EnvCI, ci, EnvUpdateInCI)
}

// Updating reports whether this run rewrites golden files: -update or
// PROOFSHEET_UPDATE asked for it and CI does not refuse it. A test package
// that needs the update switch for files of its own can call Updating or
// keep a flag of its own named update (see the package documentation).
func Updating() bool { return currentMode().allowed() }

// UpdateRefused returns, when an update was asked for but CI refuses it,
// the error explaining why (wrapping ErrUpdateRefused); otherwise nil.
func UpdateRefused() error { return currentMode().refusal() }
