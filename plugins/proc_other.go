//go:build !linux

package plugins

import (
	"errors"
	"os"
	"os/exec"
	"syscall"
)

func sysProcAttr() *syscall.SysProcAttr { return &syscall.SysProcAttr{Setpgid: true} }

func execPath(exe *os.File, c *exec.Cmd) string { return c.Path }

func killGroup(pgid int) { _ = syscall.Kill(-pgid, syscall.SIGKILL) }

func killTree(pid int) { killGroup(pid) }

var errNoSealedCopy = errors.New("sealed copies need Linux")

func sealedCopy(string) (*os.File, error) { return nil, errNoSealedCopy }

func seal(*os.File) error { return errNoSealedCopy }
