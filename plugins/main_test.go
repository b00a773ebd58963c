package plugins_test

import (
	"fmt"
	"os"
	"path/filepath"
	"testing"

	"github.com/pairwell/pairwell/plugins/plugintest"
)

// bin holds the paths of the plugins TestMain builds.
var bin struct {
	rydberg, mie string
	test         string // testdata/testplugin: plugin-morse and the faulty models
	oldproto     string // testplugin under a name that makes it speak protocol 1
	grpconly     string // testplugin without the direct evaluation channel
	nosets       string // testplugin answering as one built before EvaluateSets
	holdpipes    string // testplugin with a child holding its pipes
	setsid       string // testplugin with such a child in its own session
	nosdk        string // testdata/nosdk: not built with the SDK, never answers
	dir          string // where they all are
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
	if err := plugintest.Build(dir, append(plugintest.Examples, plugintest.TestPlugin, plugintest.NoSDK)...); err != nil {
		fmt.Fprintln(os.Stderr, err)
		return 1
	}
	bin.rydberg = filepath.Join(dir, "rydberg")
	bin.mie = filepath.Join(dir, "mie")
	bin.test = filepath.Join(dir, "testplugin")
	bin.oldproto = filepath.Join(dir, "oldproto")
	bin.grpconly = filepath.Join(dir, "grpconly")
	bin.nosets = filepath.Join(dir, "nosets")
	bin.holdpipes = filepath.Join(dir, "holdpipes")
	bin.setsid = filepath.Join(dir, "setsid")
	bin.nosdk = filepath.Join(dir, "nosdk")
	bin.dir = dir
	for _, link := range []string{bin.oldproto, bin.grpconly, bin.nosets, bin.holdpipes, bin.setsid} {
		if err := os.Symlink(bin.test, link); err != nil {
			fmt.Fprintln(os.Stderr, err)
			return 1
		}
	}
	return m.Run()
}
