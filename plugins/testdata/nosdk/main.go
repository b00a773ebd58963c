// Command nosdk is a test "plugin" not built with pairwell's SDK: it never
// answers the handshake, ignores SIGINT, SIGTERM and SIGHUP, does not watch
// its parent, and starts a child that inherits its standard output and
// error and sleeps. pairwell must still stop it (and its child) on a
// start timeout, on Ctrl-C, and when pairwell itself is killed.
package main

import (
	"os"
	"os/exec"
	"os/signal"
	"syscall"
	"time"
)

func main() {
	signal.Ignore(syscall.SIGINT, syscall.SIGTERM, syscall.SIGHUP)
	if os.Getenv("NOSDK_CHILD") == "" {
		c := exec.Command(os.Args[0])
		c.Env = append(os.Environ(), "NOSDK_CHILD=1")
		c.Stdout, c.Stderr = os.Stdout, os.Stderr
		_ = c.Start()
	}
	os.Stderr.WriteString("nosdk: not a plugin, sleeping\n")
	for {
		time.Sleep(time.Hour)
	}
}
