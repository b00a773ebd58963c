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
)

// Module is the import path prefix of pairwell's packages.
const Module = "github.com/pairwell/pairwell/"

// Examples and TestPlugin are the package paths of the example plugins and
// of the test plugin (an independent Morse and deliberately faulty forms).
var (
	Examples   = []string{Module + "plugins/examples/rydberg", Module + "plugins/examples/mie"}
	TestPlugin = Module + "plugins/testdata/testplugin"
)

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
