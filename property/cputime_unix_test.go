//go:build unix

package property

import (
	"syscall"
	"time"
)

// cpuTime returns the CPU time the process has used, user and system, so
// that a benchmark on a busy machine can report speed per CPU second as
// well as per wall second.
func cpuTime() time.Duration {
	var ru syscall.Rusage
	if err := syscall.Getrusage(syscall.RUSAGE_SELF, &ru); err != nil {
		return 0
	}
	return time.Duration(ru.Utime.Nano() + ru.Stime.Nano())
}
