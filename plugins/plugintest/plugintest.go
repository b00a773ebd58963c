// Package plugintest builds plugins for tests, the way package httptest
// serves HTTP for them: a test's TestMain builds the plugins it needs once,
// with the toolchain running the tests.
package plugintest

import (
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"runtime"
	"strconv"
	"strings"
)

// Module is the import path prefix of pairwell's packages.
const Module = "github.com/pairwell/pairwell/"

// Examples and TestPlugin are the package paths of the example plugins and
// of the test plugin (an independent Morse and deliberately faulty forms).
var (
	Examples   = []string{Module + "plugins/examples/rydberg", Module + "plugins/examples/mie"}
	TestPlugin = Module + "plugins/testdata/testplugin"
	// NoSDK is a test executable not built with the SDK that never
	// answers the handshake, ignores SIGINT/SIGTERM/SIGHUP and starts a
	// child holding its pipes.
	NoSDK = Module + "plugins/testdata/nosdk"
)

// Procs returns the processes started from an executable in dir: whose
// executable, or whose argv[0] (a pinned plugin runs from a sealed
// copy but keeps its path as argv[0]), lies in dir. Zombies (ended, not
// yet reaped) are returned negated. On systems without /proc it returns
// nil.
func Procs(dir string) []int {
	entries, err := os.ReadDir("/proc")
	if err != nil {
		return nil
	}
	prefix := dir + string(filepath.Separator)
	var pids []int
	for _, e := range entries {
		pid, err := strconv.Atoi(e.Name())
		if err != nil || pid == os.Getpid() {
			continue
		}
		exe, _ := os.Readlink(filepath.Join("/proc", e.Name(), "exe"))
		arg0 := ""
		if cl, err := os.ReadFile(filepath.Join("/proc", e.Name(), "cmdline")); err == nil {
			arg0, _, _ = strings.Cut(string(cl), "\x00")
		}
		if !strings.HasPrefix(exe, prefix) && !strings.HasPrefix(arg0, prefix) {
			continue
		}
		if st, err := os.ReadFile(filepath.Join("/proc", e.Name(), "stat")); err == nil && strings.Contains(string(st), ") Z ") {
			pids = append(pids, -pid)
			continue
		}
		pids = append(pids, pid)
	}
	return pids
}

// Build builds the main packages pkgs into dir, in one go build (one
// compilation of what they share), stripped of debug information. Each
// executable is named after the last element of its package path.
func Build(dir string, pkgs ...string) error {
	gobin := filepath.Join(runtime.GOROOT(), "bin", "go")
	if _, err := os.Stat(gobin); err != nil {
		if gobin, err = exec.LookPath("go"); err != nil {
			return fmt.Errorf("no go command to build the test plugins: %w", err)
		}
	}
	args := append([]string{"build", "-ldflags=-s -w", "-o", dir + string(filepath.Separator)}, pkgs...)
	if out, err := exec.Command(gobin, args...).CombinedOutput(); err != nil {
		return fmt.Errorf("building %v: %v\n%s", pkgs, err, out)
	}
	return nil
}
