//go:build !unix

package assert

import "time"

// cpuTime returns 0 where the process's CPU time is not read.
func cpuTime() time.Duration { return 0 }

// pageFaults returns 0 where the process's page faults are not read.
func pageFaults() int64 { return 0 }
