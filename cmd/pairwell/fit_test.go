package main

import (
	"encoding/json"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/models"
)

// fitKeys are the JSON keys of every fitted form (README, "pairwell fit").
var fitKeys = []string{
	"rank", "model", "name", "origin", "params", "standard_errors", "correlation", "spec",
	"energy_zero_ev", "energy_zero_fitted", "energy_zero_source", "energy_zero_standard_error_ev", "rmse_ev", "mae_ev",
	"max_abs_error_ev", "windows", "points", "fitted_points", "weighted_rss_ev2", "iterations",
	"evaluations", "converged", "reason", "gradient_norm", "jacobian", "well",
}

// writeMorseScan writes exact Morse data (De = 4.6 eV, a = 1.87 1/Å,
// re = 1.27 Å) in bohr and hartree shifted by −460 hartree, 40 points.
func writeMorseScan(t *testing.T) string {
	t.Helper()
	pot, err := models.NewMorse(4.6, 1.87, 1.27)
	require.NoError(t, err)
	var b strings.Builder
	b.WriteString("# exact Morse data for the tests\nr_bohr,energy_hartree\n")
	for i := 0; i < 40; i++ {
		r := 0.95 + 0.08*float64(i)
		v, err := core.Value(pot, r)
		require.NoError(t, err)
		// bohr and hartree, CODATA 2018
		fmt.Fprintf(&b, "%.17g,%.17g\n", r/0.529177210903, -460+v/27.211386245988)
	}
	path := filepath.Join(t.TempDir(), "scan.csv")
	require.NoError(t, os.WriteFile(path, []byte(b.String()), 0o644))
	return path
}

func fitJSON(t *testing.T, args ...string) []map[string]any {
	t.Helper()
	code, out, errOut := runCLI(t, append([]string{"fit", "--format", "json"}, args...)...)
	require.Equal(t, 0, code, errOut)
	var rows []map[string]any
	require.NoError(t, json.Unmarshal([]byte(out), &rows), out)
	return rows
}

func TestFitJSON(t *testing.T) {
	path := writeMorseScan(t)
	rows := fitJSON(t, path, "--offset", "fit", "--pair", "1H-35Cl")
	require.Len(t, rows, 4, "every built-in form")
	for i, row := range rows {
		for _, k := range fitKeys {
			assert.Contains(t, row, k, "%v", row["model"])
		}
		assert.Equal(t, float64(i+1), row["rank"])
		w := row["windows"].([]any)
		require.Len(t, w, 2)
		for _, k := range []string{"depth_fraction", "bound_ev", "points", "rmse_ev", "mae_ev", "max_abs_error_ev"} {
			assert.Contains(t, w[0], k)
		}
	}
	best := rows[0]
	assert.Equal(t, "morse", best["model"])
	p := best["params"].(map[string]any)
	assert.InDelta(t, 4.6, p["De"], 1e-8*4.6)
	assert.InDelta(t, 1.87, p["a"], 1e-8*1.87)
	assert.InDelta(t, 1.27, p["re"], 1e-8*1.27)
	// the zero: −460 hartree in eV (CODATA 2018)
	assert.InDelta(t, -460*27.211386245988, best["energy_zero_ev"], 1e-6)
	assert.Equal(t, true, best["converged"])
	well := best["well"].(map[string]any)
	assert.Contains(t, well, "harmonic_wavenumber_per_cm")
	// Morse levels (Morse 1929): E(v) = ωe(v+½) − ωe·xe(v+½)², so the
	// zero-point energy is ωe/2 − ωe·xe/4 and the fundamental ωe − 2ωe·xe;
	// core/levels converges to 1e-6 cm⁻¹.
	we, wexe := models.MorseSpectroscopic(4.6, 1.87, well["reduced_mass_u"].(float64))
	assert.InDelta(t, we/2-wexe/4, well["zero_point_energy_per_cm"], 1e-4)
	assert.InDelta(t, we-2*wexe, well["fundamental_per_cm"], 1e-4)
	// the spec is accepted by inspect and gives the same well
	code, out, errOut := runCLI(t, "inspect", best["spec"].(string), "--format", "json")
	require.Equal(t, 0, code, errOut)
	var ins map[string]any
	require.NoError(t, json.Unmarshal([]byte(out), &ins))
	assert.InDelta(t, well["equilibrium_r_angstrom"], ins["equilibrium_r_angstrom"], 1e-12)
}

func TestFitModelSet(t *testing.T) {
	path := writeMorseScan(t)
	set := filepath.Join(t.TempDir(), "fitted.toml")
	code, out, errOut := runCLI(t, "fit", path, "--form", "morse", "--form", "lj", "--offset", "fit", "--mu", "0.98", "-o", set)
	require.Equal(t, 0, code, errOut)
	assert.Contains(t, out, "1. morse")
	assert.Contains(t, out, "not a validated force field")
	data, err := os.ReadFile(set)
	require.NoError(t, err)
	assert.Contains(t, string(data), "# Written by pairwell fit")
	// compare and plot read the model set
	rows := compareJSON(t, "--set", set)
	require.Len(t, rows, 2)
	assert.Equal(t, "morse-fit", rows[0]["name"])
	assert.InDelta(t, 1.27, rows[0]["equilibrium_r_angstrom"], 1e-8)
	pic := filepath.Join(t.TempDir(), "forms.svg")
	code, _, errOut = runCLI(t, "plot", "compare", "--set", set, "-o", pic)
	require.Equal(t, 0, code, errOut)

	// levels reads it: the entries keep their mass; the fitted Morse's
	// zero-point energy is Morse's (P. M. Morse, Phys. Rev. 34, 57
	// (1929)) E₀ = ωe/2 − ωexe/4 with ωexe = ωe²/(4De), De in cm⁻¹
	// (1 eV = 8065.543937 cm⁻¹, CODATA 2018), to the levels' 1e-6 cm⁻¹
	// tolerance (10× margin for rounding of ωe).
	code, out, errOut = runCLI(t, "levels", "--set", set, "--j-max", "0", "--format", "json")
	require.Equal(t, 0, code, errOut)
	var lv []map[string]any
	require.NoError(t, json.Unmarshal([]byte(out), &lv), out)
	require.Len(t, lv, 2)
	assert.Equal(t, "morse-fit", lv[0]["name"])
	assert.Equal(t, "morse", lv[0]["model"])
	assert.Equal(t, "lennard-jones-fit", lv[1]["name"])
	assert.Nil(t, lv[1]["error"], "%v", lv[1]["error"])
	assert.InDelta(t, 0.98, lv[0]["reduced_mass_u"], 1e-15)
	we := lv[0]["harmonic"].(map[string]any)["omega_e_per_cm"].(float64)
	de := 4.6 * 8065.543937
	assert.InDelta(t, we/2-we*we/(16*de), lv[0]["zero_point_energy_per_cm"], 1e-5)
	// the same as levels of the fitted spec
	cp := rows[0]["params"].(map[string]any)
	spec := fmt.Sprintf("morse:De=%.17g,a=%.17g,re=%.17g", cp["De"], cp["a"], cp["re"])
	code, out, errOut = runCLI(t, "levels", spec, "--mu", "0.98", "--j-max", "0", "--format", "json")
	require.Equal(t, 0, code, errOut)
	var one map[string]any
	require.NoError(t, json.Unmarshal([]byte(out), &one))
	assert.InDelta(t, one["zero_point_energy_per_cm"], lv[0]["zero_point_energy_per_cm"], 1e-9)
	// CSV: one row per level, the form's name first; the table: one
	// block per form
	code, out, errOut = runCLI(t, "levels", "--set", set, "--j-max", "0", "--v-max", "1", "--format", "csv")
	require.Equal(t, 0, code, errOut)
	lines := strings.Split(strings.TrimSpace(out), "\n")
	require.Len(t, lines, 5, out)
	assert.True(t, strings.HasPrefix(lines[0], "name,model,params,pair,reduced_mass_u,v,j,"), lines[0])
	assert.True(t, strings.HasPrefix(lines[1], "morse-fit,morse,"), lines[1])
	assert.Contains(t, lines[1], ",0.98,0,0,")
	assert.True(t, strings.HasPrefix(lines[4], "lennard-jones-fit,lennard-jones,"), lines[4])
	assert.Contains(t, lines[4], ",0.98,1,0,")
	code, out, errOut = runCLI(t, "levels", "--set", set, "--j-max", "0", "--v-max", "1")
	require.Equal(t, 0, code, errOut)
	assert.Contains(t, out, "== morse-fit\n")
	assert.Contains(t, out, "== lennard-jones-fit\n")

	// baseline records and verifies it unchanged
	base := filepath.Join(t.TempDir(), "fitted.baseline.json")
	code, _, errOut = runCLI(t, "baseline", "record", "--set", set, "-o", base)
	require.Equal(t, 0, code, errOut)
	code, out, errOut = runCLI(t, "baseline", "verify", "--set", set, base)
	require.Equal(t, 0, code, errOut)
	assert.Contains(t, out, "0 changes")
}

// TestLevelsSetErrors: a form of a set that cannot be solved is a record
// with its error (the others are solved); the command fails only when
// every form does; no SPEC and no --set is a usage error.
func TestLevelsSetErrors(t *testing.T) {
	dir := t.TempDir()
	set := filepath.Join(dir, "set.toml")
	require.NoError(t, os.WriteFile(set, []byte(`
[[entry]]
name = "spring"
spec = "harmonic:k=30,r0=1.2"
mu = 7
[[entry]]
name = "bond"
spec = "morse:De=4.6,a=1.87,re=1.27"
pair = "1H-35Cl"
`), 0o644))
	code, out, errOut := runCLI(t, "levels", "--set", set, "--j-max", "0", "--format", "json")
	require.Equal(t, 0, code, errOut)
	var lv []map[string]any
	require.NoError(t, json.Unmarshal([]byte(out), &lv), out)
	require.Len(t, lv, 2)
	assert.Equal(t, "harmonic", lv[0]["model"])
	assert.Contains(t, lv[0]["error"], "--v-max")
	assert.Equal(t, "1H-35Cl", lv[1]["pair"])
	assert.NotEmpty(t, lv[1]["levels"])

	code, _, errOut = runCLI(t, "levels", "harmonic:k=30,r0=1.2", "morse:De=4.6,a=1.87,re=1.27", "--j-max", "0")
	assert.Equal(t, 2, code, "every form fails: the specs have no mass")
	assert.Contains(t, errOut, "no form")
	code, _, errOut = runCLI(t, "levels", "--mu", "1")
	assert.Equal(t, 2, code)
	assert.Contains(t, errOut, "levels needs a SPEC")
	code, _, errOut = runCLI(t, "levels", "morse:De=4.6,a=1.87,re=1.27")
	assert.Equal(t, 2, code)
	assert.Contains(t, errOut, "reduced mass")
}

func TestFitCSVAndPlot(t *testing.T) {
	path := writeMorseScan(t)
	code, out, errOut := runCLI(t, "fit", path, "--form", "morse", "--offset", "fit", "--format", "csv")
	require.Equal(t, 0, code, errOut)
	assert.True(t, strings.HasPrefix(out, "rank,model,name,origin,params,"), out)
	assert.Contains(t, out, "morse:De=")
	pic := filepath.Join(t.TempDir(), "fit.png")
	code, out, errOut = runCLI(t, "plot", "fit", path, "--offset", "fit", "-o", pic, "--format", "json")
	require.Equal(t, 0, code, errOut)
	var rep plotReport
	require.NoError(t, json.Unmarshal([]byte(out), &rep))
	assert.Equal(t, "fit", rep.Kind)
	assert.Equal(t, "data", rep.Series[0])
	st, err := os.Stat(pic)
	require.NoError(t, err)
	assert.NotZero(t, st.Size())
}

func TestFitWeightsAndRank(t *testing.T) {
	path := writeMorseScan(t)
	for _, w := range []string{"uniform", "boltzmann:3000K", "window:1eV", "window:8000cm-1"} {
		rows := fitJSON(t, path, "--form", "morse", "--offset", "fit", "--weights", w, "--rank", "rmse10")
		assert.InDelta(t, 4.6, rows[0]["params"].(map[string]any)["De"], 1e-7, w)
	}
	rows := fitJSON(t, path, "--form", "morse", "--form", "harmonic", "--weights", "window:0.5eV", "--rank", "max")
	require.Len(t, rows, 2)
	assert.Less(t, rows[0]["fitted_points"], rows[0]["points"])
}

// TestFitErrors: bad files and options are one line with exit 2.
func TestFitErrors(t *testing.T) {
	dir := t.TempDir()
	write := func(name, body string) string {
		p := filepath.Join(dir, name)
		require.NoError(t, os.WriteFile(p, []byte(body), 0o644))
		return p
	}
	good := writeMorseScan(t)
	for _, c := range []struct {
		args []string
		want string
	}{
		{[]string{"fit", write("a.csv", "r_angstrom,energy_stone\n1,2\n")}, `line 1: unknown column "energy_stone"`},
		{[]string{"fit", write("b.csv", "r_angstrom,energy_ev\n1,2\n2,nan\n")}, "line 3"},
		{[]string{"fit", write("c.csv", "r_angstrom,energy_ev\n1,2\n1,3\n")}, "line 3: r = 1 Å given twice"},
		{[]string{"fit", write("d.csv", "energy_ev\n1\n")}, "no separation column"},
		{[]string{"fit", write("e.csv", "r_angstrom,energy_ev\n1,2\n2,1\n3,2\n"), "--form", "morse", "--offset", "fit"}, "fewer than the 4 parameters"},
		{[]string{"fit", write("f.csv", "r_angstrom,energy_ev\n1,3\n2,2\n3,1\n4,0.5\n"), "--form", "morse"}, "do not enclose a minimum"},
		{[]string{"fit", good, "--weights", "boltzmann:-3K"}, "--weights"},
		{[]string{"fit", good, "--weights", "gaussian"}, "--weights"},
		{[]string{"fit", good, "--offset", "lots"}, "--offset"},
		{[]string{"fit", good, "--rank", "best"}, "--rank"},
		{[]string{"fit", good, "--restarts", "9"}, "--restarts"},
		{[]string{"fit", good, "--form", "nosuchform"}, "nosuchform"},
		{[]string{"fit"}, "one DATA.csv"},
	} {
		code, _, errOut := runCLI(t, c.args...)
		assert.Equal(t, 2, code, "%v: %s", c.args, errOut)
		assert.Contains(t, errOut, c.want, "%v", c.args)
		assert.Equal(t, 1, strings.Count(strings.TrimSpace(errOut), "\n")+1, "one line: %q", errOut)
	}
	code, _, _ := runCLI(t, "fit", filepath.Join(dir, "missing.csv"))
	assert.Equal(t, 2, code, "a missing input file is bad input (files policy)")
	code, _, errOut := runCLI(t, "fit", good, "-o", good)
	assert.Equal(t, 2, code, "the output may not replace the input")
	assert.Contains(t, errOut, "-o")
}

// TestFitPluginNeedsStart: a plugin form without a match to a well (the
// test plugin's crashlater-morse) needs a start, and the one-line usage
// error (exit 2) says how to give one.
func TestFitPluginNeedsStart(t *testing.T) {
	path := writeMorseScan(t)
	code, _, errOut := runPlugins(t, "--plugin", pluginBin.test, "fit", path, "--form", "crashlater-morse")
	assert.Equal(t, 2, code, errOut)
	assert.Contains(t, errOut, "--form crashlater-morse: the form has no match to a well, so it needs a start: --start crashlater-morse:NAME=VALUE")
	assert.Equal(t, 1, strings.Count(strings.TrimSpace(errOut), "\n")+1, "one line: %q", errOut)
}

// TestFitPluginRecovery fits the test plugin's Morse (an independent
// implementation, central differences in the parameters) to exact built-in
// Morse data and recovers the parameters to 1e-8 relative, from the
// automatic start, also through a plugin without EvaluateSets; a plugin
// form is ranked with the built-in ones.
func TestFitPluginRecovery(t *testing.T) {
	for _, bin := range []string{pluginBin.test, pluginBin.nosets} {
		fitPluginRecovery(t, bin)
	}
}

// fitPluginRecovery is TestFitPluginRecovery with the plugin at bin: the
// test plugin, and the same answering as a plugin built before
// EvaluateSets (the host then opens each parameter set).
func fitPluginRecovery(t *testing.T, bin string) {
	path := writeMorseScan(t)
	code, out, errOut := runPlugins(t, "--plugin", bin, "fit", path, "--form", "plugin-morse", "--form", "morse", "--offset", "fit", "--format", "json")
	require.Equal(t, 0, code, errOut)
	var rows []map[string]any
	require.NoError(t, json.Unmarshal([]byte(out), &rows), out)
	require.Len(t, rows, 2)
	for _, row := range rows {
		p := row["params"].(map[string]any)
		for name, want := range map[string]float64{"De": 4.6, "a": 1.87, "re": 1.27} {
			assert.InDelta(t, 1, p[name].(float64)/want, 1e-8, "%v %s", row["model"], name)
		}
		if row["model"] == "plugin-morse" {
			assert.Equal(t, "central differences", row["jacobian"])
		}
		assert.Less(t, row["rmse_ev"].(float64), 1e-8)
		assert.False(t, math.IsNaN(row["rmse_ev"].(float64)))
	}
}

// TestFitFormulaForm fits a formula form (Morse typed as a formula in a
// forms file) from a given start and from the automatic one to exact Morse
// data and recovers the parameters to 1e-8 relative.
func TestFitFormulaForm(t *testing.T) {
	path := writeMorseScan(t)
	forms := filepath.Join(t.TempDir(), "forms.toml")
	require.NoError(t, os.WriteFile(forms, []byte(formTOML("fmorse", morseFormula, "limit = 0", morseParams...)), 0o644))
	code, out, errOut := runCLI(t, "--forms", forms, "fit", path, "--form", "fmorse", "--form", "morse", "--start", "fmorse:De=5.5,a=1.6,re=1.35", "--offset", "fit", "--format", "json")
	require.Equal(t, 0, code, errOut)
	var rows []map[string]any
	require.NoError(t, json.Unmarshal([]byte(out), &rows), out)
	require.Len(t, rows, 2)
	for _, row := range rows {
		p := row["params"].(map[string]any)
		for name, want := range map[string]float64{"De": 4.6, "a": 1.87, "re": 1.27} {
			assert.InDelta(t, 1, p[name].(float64)/want, 1e-8, "%v %s", row["model"], name)
		}
	}
	// from the automatic start (the formula form's numerical match)
	rows = fitJSON(t, "--forms", forms, path, "--form", "fmorse", "--offset", "fit")
	require.Len(t, rows, 1)
	p := rows[0]["params"].(map[string]any)
	for name, want := range map[string]float64{"De": 4.6, "a": 1.87, "re": 1.27} {
		assert.InDelta(t, 1, p[name].(float64)/want, 1e-8, "automatic start %s", name)
	}
	code, _, errOut = runCLI(t, "--forms", forms, "fit", path, "--form", "morse", "--start", "fmorse:De=5.5,a=1.6,re=1.35")
	assert.Equal(t, 2, code)
	assert.Contains(t, errOut, "not fitted")
}
