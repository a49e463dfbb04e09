//go:build unix

package assert

import (
	"syscall"
	"time"
)

// cpuTime returns the CPU time (user and system) the process has used.
func cpuTime() time.Duration {
	var ru syscall.Rusage
	if syscall.Getrusage(syscall.RUSAGE_SELF, &ru) != nil {
		return 0
	}
	return time.Duration(ru.Utime.Nano() + ru.Stime.Nano())
}

// pageFaults returns how many minor page faults the process has taken:
// pages of fresh memory touched for the first time. On a virtual machine
// each can cost tens of microseconds, which then dominates the time of
// work that writes new memory.
func pageFaults() int64 {
	var ru syscall.Rusage
	if syscall.Getrusage(syscall.RUSAGE_SELF, &ru) != nil {
		return 0
	}
	return int64(ru.Minflt)
}
