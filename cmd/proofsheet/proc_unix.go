//go:build unix

package main

import (
	"os/exec"
	"syscall"
)

// inOwnGroup makes cmd start a process group of its own, so that a
// timeout can end the program and every process it started.
func inOwnGroup(cmd *exec.Cmd) {
	cmd.SysProcAttr = &syscall.SysProcAttr{Setpgid: true}
}

// killGroup ends the process group cmd leads (SIGKILL to every member).
func killGroup(cmd *exec.Cmd) {
	if cmd.Process == nil {
		return
	}
	// The group's id is the leader's pid; a negative pid names the group.
	_ = syscall.Kill(-cmd.Process.Pid, syscall.SIGKILL)
}
