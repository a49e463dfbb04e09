//go:build !linux

package atomicfile

import (
	"errors"
	"os"
	"runtime"
	"syscall"
)

var errNoUnnamed = errors.New("unnamed files are not available here")

func createUnnamed(string) (*os.File, error) { return nil, errNoUnnamed }

func link(*os.File, string) error { return errNoUnnamed }

// processRunning reports whether a process with this id exists; where
// that cannot be asked, every process counts as running, so only age
// decides for names without an id.
func processRunning(pid int) bool {
	if pid <= 0 {
		return false
	}
	if runtime.GOOS == "windows" {
		return true
	}
	p, err := os.FindProcess(pid)
	if err != nil {
		return false
	}
	err = p.Signal(syscall.Signal(0))
	return err == nil || errors.Is(err, os.ErrPermission)
}
