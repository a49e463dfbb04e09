//go:build linux

package atomicfile

import (
	"errors"
	"os"
	"strconv"

	"golang.org/x/sys/unix"
)

// createUnnamed makes a file without a name in dir (O_TMPFILE): if the
// process dies before publish, the file system frees it.
func createUnnamed(dir string) (*os.File, error) {
	fd, err := unix.Open(dir, unix.O_TMPFILE|unix.O_RDWR|unix.O_CLOEXEC, 0o600)
	if err != nil {
		return nil, err
	}
	return os.NewFile(uintptr(fd), dir+"/(unnamed)"), nil
}

// link gives the unnamed file f the name path; os.ErrExist when path is
// taken.
//
// Source: Linux open(2), "O_TMPFILE": such a file is made permanent with
// linkat(2) of /proc/self/fd/N with AT_SYMLINK_FOLLOW (AT_EMPTY_PATH needs
// a capability most processes lack).
func link(f *os.File, path string) error {
	err := unix.Linkat(unix.AT_FDCWD, "/proc/self/fd/"+strconv.Itoa(int(f.Fd())), unix.AT_FDCWD, path, unix.AT_SYMLINK_FOLLOW)
	if errors.Is(err, unix.EEXIST) {
		return os.ErrExist
	}
	if err != nil {
		err = unix.Linkat(int(f.Fd()), "", unix.AT_FDCWD, path, unix.AT_EMPTY_PATH)
		if errors.Is(err, unix.EEXIST) {
			return os.ErrExist
		}
	}
	return err
}

// processRunning reports whether a process with this id exists (signal 0
// checks without sending; EPERM means it exists under another user).
func processRunning(pid int) bool {
	if pid <= 0 {
		return false
	}
	err := unix.Kill(pid, 0)
	return err == nil || errors.Is(err, unix.EPERM)
}
