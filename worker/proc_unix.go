//go:build unix

package worker

import (
	"os/exec"
	"syscall"
)

// processGroup starts a worker in a process group of its own, so that
// killing it kills what it started too (git).
func processGroup(cmd *exec.Cmd) {
	cmd.SysProcAttr = &syscall.SysProcAttr{Setpgid: true}
}

func killGroup(cmd *exec.Cmd) {
	if cmd.Process == nil {
		return
	}
	_ = syscall.Kill(-cmd.Process.Pid, syscall.SIGKILL)
	_ = cmd.Process.Kill()
}
