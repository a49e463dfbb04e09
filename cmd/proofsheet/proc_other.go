//go:build !unix

package main

import "os/exec"

// inOwnGroup does nothing where process groups are not available.
func inOwnGroup(cmd *exec.Cmd) {}

// killGroup ends the program itself; processes it started may live on.
func killGroup(cmd *exec.Cmd) {
	if cmd.Process != nil {
		_ = cmd.Process.Kill()
	}
}
