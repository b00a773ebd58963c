package main

import (
	"encoding/json"
	"fmt"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"runtime"
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"github.com/pairwell/pairwell/plugins/plugintest"
)

// linnettSpec is an invented, bond-sized parameter set of the Linnett form
// served by the Python example plugin (plugins/examples/python).
const linnettSpec = "linnett:De=4.6,re=1.27,m=6,n=2.5"

// runPython runs pairwell in process with the Python example plugin, then
// checks that no Python plugin process is left.
func runPython(t *testing.T, env []string, args ...string) (int, string, string) {
	t.Helper()
	launcher, _ := plugintest.RequirePython(t)
	code, out, errOut := runCLIEnv(t, env, args...)
	if runtime.GOOS == "linux" {
		dir, err := filepath.EvalSymlinks(filepath.Dir(launcher))
		require.NoError(t, err)
		assert.Empty(t, plugintest.ProcsWithArg(filepath.Join(dir, "linnett.py")),
			"Python plugin processes left after pairwell %s", strings.Join(args, " "))
	}
	return code, out, errOut
}

// TestPythonPluginCommands runs the plugin written in Python through
// inspect, compare and check, by --plugin and found in
// PAIRWELL_PLUGIN_PATH. Reference values: reference.py beside the plugin
// (mpmath 1.3.0 at 50 digits on Linnett's own a/r^m − b·exp(−n·r)), output
// in plugins/examples/python/testdata/reference.txt.
func TestPythonPluginCommands(t *testing.T) {
	launcher, _ := plugintest.RequirePython(t)

	t.Run("inspect", func(t *testing.T) {
		code, out, errOut := runPython(t, nil, "--plugin", launcher, "inspect", linnettSpec, "--pair", "H-Cl", "--format", "json")
		require.Equal(t, 0, code, errOut)
		var got struct {
			Model      string    `json:"model"`
			Origin     string    `json:"origin"`
			Re         float64   `json:"equilibrium_r_angstrom"`
			Depth      float64   `json:"well_depth_ev"`
			K          float64   `json:"force_constant_ev_per_angstrom2"`
			Taylor     []float64 `json:"taylor_coefficients"`
			Inflection float64   `json:"inflection_r_angstrom"`
			MaxForce   float64   `json:"max_restoring_force_ev_per_angstrom"`
		}
		require.NoError(t, json.Unmarshal([]byte(out), &got), out)
		assert.Equal(t, "linnett", got.Model)
		assert.Equal(t, launcher, got.Origin)
		assert.InDelta(t, 1.27, got.Re, 1e-12)
		assert.InDelta(t, 4.6, got.Depth, 1e-12)
		assert.InDelta(t, 73.562817922096021183, got.K, 1e-11) // mpmath: minimum
		require.Len(t, got.Taylor, 5)
		for k, want := range []float64{-4.6, 0, 36.781408961048011, -115.89585789791049, 234.50101470659704} { // mpmath: c_k at r = 1.27
			assert.InDelta(t, want, got.Taylor[k], 1e-12*(1+math.Abs(want)), "c_%d", k)
		}
		assert.InDelta(t, 1.5120972821422646291, got.Inflection, 1e-9) // mpmath: inflection
		assert.InDelta(t, 6.1334083857445194164, got.MaxForce, 1e-9)   // mpmath: max restoring force
	})

	t.Run("compare", func(t *testing.T) {
		code, out, errOut := runPython(t, nil, "--plugin", launcher, "compare", linnettSpec,
			"morse:De=4.6,a=1.87,re=1.27", "--pair", "H-Cl", "--validity", "--format", "json")
		require.Equal(t, 0, code, errOut)
		var rows []struct {
			Model    string          `json:"model"`
			K        float64         `json:"force_constant_ev_per_angstrom2"`
			Validity json.RawMessage `json:"validity"`
			Error    string          `json:"error"`
		}
		require.NoError(t, json.Unmarshal([]byte(out), &rows), out)
		require.Len(t, rows, 2)
		assert.Equal(t, "linnett", rows[0].Model)
		assert.Empty(t, rows[0].Error)
		assert.InDelta(t, 73.562817922096021183, rows[0].K, 1e-11) // mpmath
		assert.NotEmpty(t, rows[0].Validity)
		assert.Equal(t, "morse", rows[1].Model)
	})

	t.Run("check", func(t *testing.T) {
		code, out, errOut := runPython(t, nil, "--plugin", launcher, "check", linnettSpec,
			"linnett:De=0.0104,re=3.8,m=12,n=1.5") // a second, argon-sized invented set
		require.Equal(t, 0, code, "%s\n%s", out, errOut)
		assert.Contains(t, out, "40 checks on 2 forms: 40 passed, 0 failed, 0 skipped")
	})

	t.Run("fit", func(t *testing.T) {
		// Recovery: points of the form itself (invented parameters
		// linnettSpec, closed form in Go) are fitted back from another
		// start through the plugin (a plugin without EvaluateSets: one
		// Open per parameter set).
		const de, re, m, n = 4.6, 1.27, 6.0, 2.5
		a, b := de*n*re/(m-n*re), de*m/(m-n*re)
		var csv strings.Builder
		csv.WriteString("r_angstrom,energy_ev\n")
		for i := range 40 {
			r := 0.95 + 0.06*float64(i)
			fmt.Fprintf(&csv, "%.6f,%.15g\n", r, a*math.Pow(re/r, m)-b*math.Exp(-n*(r-re)))
		}
		data := filepath.Join(t.TempDir(), "linnett.csv")
		require.NoError(t, os.WriteFile(data, []byte(csv.String()), 0o644))
		code, out, errOut := runPython(t, nil, "--plugin", launcher, "fit", data, "--offset", "0",
			"--start", "linnett:De=4,re=1.3,m=7,n=2", "--format", "json")
		require.Equal(t, 0, code, errOut)
		var fits []struct {
			Model  string             `json:"model"`
			Params map[string]float64 `json:"params"`
			RMSE   float64            `json:"rmse_ev"`
		}
		require.NoError(t, json.Unmarshal([]byte(out), &fits), out)
		require.NotEmpty(t, fits)
		assert.Equal(t, "linnett", fits[0].Model, "the generating form ranks first")
		for name, want := range map[string]float64{"De": de, "re": re, "m": m, "n": n} {
			assert.InDelta(t, want, fits[0].Params[name], 1e-8*want, name)
		}
		assert.Less(t, fits[0].RMSE, 1e-10)
	})

	t.Run("discovered", func(t *testing.T) {
		dir := t.TempDir()
		require.NoError(t, os.Symlink(launcher, filepath.Join(dir, "pairwell-plugin-linnett")))
		code, out, errOut := runPython(t, []string{"PAIRWELL_PLUGIN_PATH=" + dir}, "models")
		require.Equal(t, 0, code, errOut)
		assert.Contains(t, out, "A(re/r)^m − B·exp(−n(r − re))")
		assert.Contains(t, out, "plugin "+filepath.Join(dir, "pairwell-plugin-linnett")+" (version 1.0.0)")
	})

	t.Run("pinned", func(t *testing.T) {
		// A pin runs a sealed copy of the launcher, away from its Python
		// files: it fails to start. (Whether its last words are quoted
		// depends on how soon the host reads them; the copy below shows
		// them.)
		code, _, errOut := runPython(t, nil, "--plugin", launcher+"@sha256:"+sha256Hex(t, launcher), "models")
		assert.Equal(t, 1, code, errOut)
		assert.Contains(t, errOut, "plugin handshake failed")

		alone := filepath.Join(t.TempDir(), "pairwell-plugin-linnett")
		b, err := os.ReadFile(launcher)
		require.NoError(t, err)
		require.NoError(t, os.WriteFile(alone, b, 0o755))
		out, err := exec.Command(alone).CombinedOutput()
		require.Error(t, err)
		assert.Contains(t, string(out), "linnett.py is not beside this launcher")
		assert.Contains(t, string(out), "do not pin it with @sha256:")
	})

	t.Run("bad parameters", func(t *testing.T) {
		code, _, errOut := runPython(t, nil, "--plugin", launcher, "inspect", "linnett:De=4.6,re=1.27,m=3,n=2.5")
		assert.Equal(t, 2, code, errOut)
		assert.Contains(t, errOut, "must be less than m")
	})
}
