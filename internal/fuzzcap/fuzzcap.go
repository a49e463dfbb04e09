package fuzzcap

import (
	"flag"
	"time"
)

// minimizeFlag is the testing package's flag for the minimization bound.
const minimizeFlag = "test.fuzzminimizetime"

// LimitMinimize parses the command line and, unless it sets
// -fuzzminimizetime, sets that bound to d. Call it from TestMain before
// m.Run; outside a test binary it does nothing.
func LimitMinimize(d time.Duration) {
	if flag.Lookup(minimizeFlag) == nil {
		return
	}
	if !flag.Parsed() {
		flag.Parse()
	}
	given := false
	flag.Visit(func(f *flag.Flag) {
		if f.Name == minimizeFlag {
			given = true
		}
	})
	if !given {
		_ = flag.Set(minimizeFlag, d.String()) // a duration is always a valid value
	}
}
