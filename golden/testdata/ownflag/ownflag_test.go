// Package ownflag defines its own -update flag next to golden's, as a user
// package may; golden_test runs it with go test.
package ownflag

import (
	"flag"
	"testing"

	"github.com/proofsheet/proofsheet/golden"
)

var update = flag.Bool("update", false, "this package's own update switch")

func TestBothSwitches(t *testing.T) {
	t.Logf("golden.Updating()=%v", golden.Updating())
	t.Logf("own update=%v", *update)
}
