package plugins_test

import (
	"context"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/plugins"
)

// TestPluginOutsideTheTree follows the README's two recipes for a plugin
// author whose module lives outside this repository, while the module
// cannot be fetched by its path: a replace directive, and a go.work file.
// Each builds the Rydberg example as a module of its own in a temporary
// directory, and loads the result.
//
// The outside module's graph needs go.mod files that the repository's own
// build never reads (requirements of dependencies, e.g. an older
// go-colorable), so on a fresh clone the module cache lacks them: the
// builds use the environment's module proxy (GOPROXY as the user has it;
// nothing is fetched when the cache has everything). Without the network
// and without those files the test skips, saying so.
func TestPluginOutsideTheTree(t *testing.T) {
	if testing.Short() {
		t.Skip("builds two plugin modules; skipped with -short")
	}
	repo, err := filepath.Abs("..")
	require.NoError(t, err)
	src := filepath.Join(repo, "plugins", "examples", "rydberg")
	goMod, err := os.ReadFile(filepath.Join(repo, "go.mod"))
	require.NoError(t, err)
	goLine := ""
	for _, l := range strings.Split(string(goMod), "\n") {
		if strings.HasPrefix(l, "go ") {
			goLine = l
		}
	}
	require.NotEmpty(t, goLine)

	recipes := []struct {
		name  string
		setup func(t *testing.T, root, mod string) []string // returns extra environment
	}{
		{"replace", func(t *testing.T, root, mod string) []string {
			write(t, filepath.Join(mod, "go.mod"), "module example.com/myform\n\n"+goLine+"\n\n"+
				"require github.com/pairwell/pairwell v0.0.0-00010101000000-000000000000\n\n"+
				"replace github.com/pairwell/pairwell => "+repo+"\n")
			// go.sum: pairwell's own, so that nothing is looked up.
			sum, err := os.ReadFile(filepath.Join(repo, "go.sum"))
			require.NoError(t, err)
			write(t, filepath.Join(mod, "go.sum"), string(sum))
			return []string{"GOWORK=off", "GOFLAGS=-mod=mod"}
		}},
		{"go.work", func(t *testing.T, root, mod string) []string {
			write(t, filepath.Join(mod, "go.mod"), "module example.com/myform\n\n"+goLine+"\n")
			run(t, root, nil, "work", "init", "./myform", repo)
			return []string{"GOWORK=" + filepath.Join(root, "go.work"), "GOFLAGS="}
		}},
	}
	for _, rc := range recipes {
		t.Run(rc.name, func(t *testing.T) {
			root := t.TempDir()
			require.False(t, strings.HasPrefix(root, repo+string(filepath.Separator)), "must be outside the tree")
			mod := filepath.Join(root, "myform")
			require.NoError(t, os.Mkdir(mod, 0o755))
			for _, f := range []string{"main.go", "rydberg.go"} {
				b, err := os.ReadFile(filepath.Join(src, f))
				require.NoError(t, err)
				write(t, filepath.Join(mod, f), string(b))
			}
			env := rc.setup(t, root, mod)
			bin := filepath.Join(root, "pairwell-plugin-myform")
			if out, err := runGo(mod, env, "build", "-o", bin, "."); err != nil {
				if offline(out) {
					t.Skipf("the plugin module outside the tree needs modules that are neither in the module cache nor reachable "+
						"through GOPROXY (offline?); run this test once with the network to fill the cache: %s", oneLine(out))
				}
				require.NoError(t, err, "go build: %s", out)
			}

			p, err := plugins.Load(context.Background(), bin, plugins.Options{})
			require.NoError(t, err)
			defer p.Close()
			models := p.Models()
			require.Len(t, models, 1)
			assert.Equal(t, "rydberg", models[0].Info().Key)
			pot, err := models[0].New([]float64{4.6, 2.5, 1.27})
			require.NoError(t, err)
			v, err := core.Value(pot, 1.27)
			require.NoError(t, err)
			assert.InDelta(t, -4.6, v, 1e-12, "V(re) = −De (Rydberg 1931)")
		})
	}
}

func write(t *testing.T, path, content string) {
	t.Helper()
	require.NoError(t, os.WriteFile(path, []byte(content), 0o644))
}

// run runs the go command with args in dir (see runGo) and requires it to
// succeed.
func run(t *testing.T, dir string, env []string, args ...string) {
	t.Helper()
	out, err := runGo(dir, env, args...)
	require.NoError(t, err, "go %s: %s", strings.Join(args, " "), out)
}

// runGo runs the go command in dir with the environment's module proxy,
// the checksum database off (the hashes come from the repository's go.sum)
// and the extra environment env.
func runGo(dir string, env []string, args ...string) (string, error) {
	cmd := exec.Command("go", args...)
	cmd.Dir = dir
	cmd.Env = append(os.Environ(), append([]string{"GOSUMDB=off"}, env...)...)
	out, err := cmd.CombinedOutput()
	return string(out), err
}

// offline reports whether the go command failed for want of the network or
// of a module proxy.
func offline(out string) bool {
	for _, s := range []string{"GOPROXY=off", "dial tcp", "no such host", "connection refused", "network is unreachable",
		"i/o timeout", "TLS handshake timeout", "proxyconnect"} {
		if strings.Contains(out, s) {
			return true
		}
	}
	return false
}

// oneLine returns the output s on one line, at most 300 bytes of it.
func oneLine(s string) string {
	s = strings.Join(strings.Fields(s), " ")
	if len(s) > 300 {
		s = s[:300] + "…"
	}
	return s
}
