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
// directory, without the network (GOPROXY=off: the modules come from the
// cache the repository's own build filled), and loads the result.
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
			run(t, root, nil, "go", "work", "init", "./myform", repo)
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
			run(t, mod, env, "go", "build", "-o", bin, ".")

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

func run(t *testing.T, dir string, env []string, name string, args ...string) {
	t.Helper()
	cmd := exec.Command(name, args...)
	cmd.Dir = dir
	cmd.Env = append(os.Environ(), append([]string{"GOPROXY=off", "GOSUMDB=off"}, env...)...)
	out, err := cmd.CombinedOutput()
	require.NoError(t, err, "%s %s: %s", name, strings.Join(args, " "), out)
}
