package main

import (
	"fmt"
	"os"
	"path/filepath"
	"testing"

	"github.com/pairwell/pairwell/plugins/plugintest"
)

// TestMain builds, once for the package, the plugins the plugin tests run
// (the two examples and the test plugin) and the pairwell binary the
// signal test runs. Other tests of this package need none of it; if a
// second TestMain is wanted, merge it into this one.
func TestMain(m *testing.M) {
	os.Exit(testMain(m))
}

// pluginBin holds what TestMain built.
var pluginBin struct {
	dir          string // every executable below lives here
	pairwell     string
	rydberg, mie string
	test         string // plugin-morse and the faulty models
	oldproto     string // the test plugin speaking protocol 1, the one before this
	nosets       string // the test plugin answering as one built before EvaluateSets
	holdpipes    string // the test plugin with a child holding its pipes
	setsid       string // the same child in its own session
	nosdk        string // not built with the SDK: never answers, ignores SIGTERM
	buildErr     error
}

func testMain(m *testing.M) int {
	dir, err := os.MkdirTemp("", "pairwell-cli-plugins-")
	if err != nil {
		fmt.Fprintln(os.Stderr, err)
		return 1
	}
	defer os.RemoveAll(dir)
	pluginBin.dir = dir
	pluginBin.buildErr = buildTestBinaries(dir)
	return m.Run()
}

// buildTestBinaries builds into dir, in one go build, with the toolchain
// that runs the tests.
func buildTestBinaries(dir string) error {
	pkgs := append([]string{plugintest.Module + "cmd/pairwell", plugintest.TestPlugin, plugintest.NoSDK}, plugintest.Examples...)
	if err := plugintest.Build(dir, pkgs...); err != nil {
		return err
	}
	pluginBin.pairwell = filepath.Join(dir, "pairwell")
	pluginBin.rydberg = filepath.Join(dir, "rydberg")
	pluginBin.mie = filepath.Join(dir, "mie")
	pluginBin.test = filepath.Join(dir, "testplugin")
	pluginBin.oldproto = filepath.Join(dir, "oldproto")
	pluginBin.nosets = filepath.Join(dir, "nosets")
	pluginBin.holdpipes = filepath.Join(dir, "holdpipes")
	pluginBin.setsid = filepath.Join(dir, "setsid")
	pluginBin.nosdk = filepath.Join(dir, "nosdk")
	for _, link := range []string{pluginBin.oldproto, pluginBin.nosets, pluginBin.holdpipes, pluginBin.setsid} {
		if err := os.Symlink(pluginBin.test, link); err != nil {
			return err
		}
	}
	return nil
}

// requirePlugins skips nothing: it fails the test if the build failed.
func requirePlugins(t *testing.T) {
	t.Helper()
	if pluginBin.buildErr != nil {
		t.Fatal(pluginBin.buildErr)
	}
}
