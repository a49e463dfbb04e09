//go:build linux

package main

import (
	"os"
	"strconv"
	"testing"

	"golang.org/x/sys/unix"
)

// openPTY opens the follower side of a new pseudo-terminal (Linux
// /dev/ptmx), a real terminal for the terminal checks, and closes both
// sides when the test ends. It skips the test where there is none.
func openPTY(t *testing.T) *os.File {
	t.Helper()
	leader, err := os.OpenFile("/dev/ptmx", os.O_RDWR|unix.O_NOCTTY, 0)
	if err != nil {
		t.Skipf("no pseudo-terminal: %v", err)
	}
	t.Cleanup(func() { leader.Close() })
	fd := int(leader.Fd())
	// Source: Linux pts(4) — unlockpt() is the TIOCSPTLCK ioctl with 0,
	// ptsname() the TIOCGPTN ioctl.
	if err := unix.IoctlSetPointerInt(fd, unix.TIOCSPTLCK, 0); err != nil {
		t.Skipf("unlocking a pseudo-terminal: %v", err)
	}
	n, err := unix.IoctlGetInt(fd, unix.TIOCGPTN)
	if err != nil {
		t.Skipf("naming a pseudo-terminal: %v", err)
	}
	follower, err := os.OpenFile("/dev/pts/"+strconv.Itoa(n), os.O_RDWR|unix.O_NOCTTY, 0)
	if err != nil {
		t.Skipf("opening a pseudo-terminal: %v", err)
	}
	t.Cleanup(func() { follower.Close() })
	return follower
}
