//go:build !linux

package main

import (
	"os"
	"testing"
)

// openPTY skips: opening a pseudo-terminal is written for Linux only.
func openPTY(t *testing.T) *os.File {
	t.Helper()
	t.Skip("the pseudo-terminal check runs on Linux")
	return nil
}
