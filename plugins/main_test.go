package plugins_test

import (
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"runtime"
	"testing"
)

// bin holds the paths of the plugins TestMain builds.
var bin struct {
	rydberg, mie string
	test         string // testdata/testplugin: plugin-morse and the faulty models
	badproto     string // testplugin under a name that makes it speak protocol 2
	grpconly     string // testplugin without the direct evaluation channel
}

// transports are the test plugin with and without the direct evaluation
// channel.
func transports() []struct{ name, path string } {
	return []struct{ name, path string }{{"direct", bin.test}, {"grpc", bin.grpconly}}
}

func TestMain(m *testing.M) {
	os.Exit(testMain(m))
}

func testMain(m *testing.M) int {
	dir, err := os.MkdirTemp("", "pairwell-plugins-test-")
	if err != nil {
		fmt.Fprintln(os.Stderr, err)
		return 1
	}
	defer os.RemoveAll(dir)
	if err := buildPlugins(dir); err != nil {
		fmt.Fprintln(os.Stderr, err)
		return 1
	}
	bin.rydberg = filepath.Join(dir, "rydberg")
	bin.mie = filepath.Join(dir, "mie")
	bin.test = filepath.Join(dir, "testplugin")
	bin.badproto = filepath.Join(dir, "badproto")
	bin.grpconly = filepath.Join(dir, "grpconly")
	for _, link := range []string{bin.badproto, bin.grpconly} {
		if err := os.Symlink(bin.test, link); err != nil {
			fmt.Fprintln(os.Stderr, err)
			return 1
		}
	}
	return m.Run()
}

// buildPlugins builds the example plugins and the test plugin into dir in
// one go build, with the toolchain that runs the tests.
func buildPlugins(dir string) error {
	gobin := filepath.Join(runtime.GOROOT(), "bin", "go")
	if _, err := os.Stat(gobin); err != nil {
		if gobin, err = exec.LookPath("go"); err != nil {
			return fmt.Errorf("no go command to build the test plugins: %w", err)
		}
	}
	const mod = "github.com/pairwell/pairwell/plugins/"
	cmd := exec.Command(gobin, "build", "-ldflags=-s -w", "-o", dir+string(filepath.Separator),
		mod+"examples/rydberg", mod+"examples/mie", mod+"testdata/testplugin")
	if out, err := cmd.CombinedOutput(); err != nil {
		return fmt.Errorf("building the test plugins: %v\n%s", err, out)
	}
	return nil
}
