package main

import (
	"encoding/json"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// TestVirialPlugin: the Mie plugin with n = 12, m = 6 is Lennard-Jones, so
// its reduced B* = B₂/(⅔πN_Aσ³) must follow the Lennard-Jones series
// (Hirschfelder, Curtiss & Bird 1954, from memory: −8.7202, −2.5381,
// −0.62763, 0.24334, 0.46088, 0.46407 at T* = 0.5 … 100), and the built-in
// Lennard-Jones to 1e-10.
func TestVirialPlugin(t *testing.T) {
	const eps, sigma = 0.0104, 3.4
	tstars := []float64{0.5, 1, 2, 5, 10, 100}
	want := []float64{-8.7202, -2.5381, -0.62763, 0.24334, 0.46088, 0.46407}
	kB := 8.617333262e-5 // eV/K, CODATA 2018 (exact)
	temps := ""
	for i, ts := range tstars {
		if i > 0 {
			temps += ","
		}
		temps += fmtFloat(ts * eps / kB)
	}
	code, out, errOut := runPlugins(t, "--plugin", pluginBin.mie, "virial", "mie:epsilon=0.0104,sigma=3.4,n=12,m=6", "--temperatures", temps, "--format", "json")
	require.Equal(t, 0, code, errOut)
	var plug map[string]any
	require.NoError(t, json.Unmarshal([]byte(out), &plug))
	builtin := runJSON(t, "virial", "lj:epsilon=0.0104,sigma=3.4", "--temperatures", temps)
	b0 := 2 * math.Pi / 3 * 6.02214076e23 * 1e-24 * sigma * sigma * sigma // N_A exact (SI 2019)
	for i, r := range plug["rows"].([]any) {
		got := r.(map[string]any)["b2_cm3_per_mol"].(float64)
		ref := builtin["rows"].([]any)[i].(map[string]any)["b2_cm3_per_mol"].(float64)
		assert.InDelta(t, want[i], got/b0, 6e-5*math.Max(1, math.Abs(want[i])), "T* = %g", tstars[i])
		assert.InDelta(t, ref, got, 1e-10*math.Max(1, math.Abs(ref)), "T* = %g", tstars[i])
	}
	assert.InDelta(t, 3.4179*eps/kB, plug["boyle_temperature_k"], 1e-4*eps/kB)
}

// TestExpansionPlugin: the test plugin's own Morse gives the built-in
// Morse's thermal expansion, quantum column included.
func TestExpansionPlugin(t *testing.T) {
	args := []string{"morse:De=4.6,a=1.87,re=1.27", "--pair", "H-Cl", "--temperatures", "10,300,1000,2000", "--format", "json"}
	code, out, errOut := runPlugins(t, append([]string{"--plugin", pluginBin.test, "expansion", "plugin-" + args[0]}, args[1:]...)...)
	require.Equal(t, 0, code, errOut)
	var plug map[string]any
	require.NoError(t, json.Unmarshal([]byte(out), &plug))
	builtin := runJSON(t, append([]string{"expansion"}, args[:len(args)-2]...)...)
	for i, r := range plug["rows"].([]any) {
		row := r.(map[string]any)
		ref := builtin["rows"].([]any)[i].(map[string]any)
		for _, k := range []string{"mean_r_classical_angstrom", "mean_r_cubic_estimate_angstrom", "mean_r_quantum_angstrom", "rms_displacement_classical_angstrom"} {
			assert.InDelta(t, ref[k], row[k], 1e-9, k)
		}
		assert.InDelta(t, ref["expansion_coefficient_classical_per_k"], row["expansion_coefficient_classical_per_k"], 1e-12, "expansion")
	}
}

func fmtFloat(v float64) string { return strconv.FormatFloat(v, 'g', -1, 64) }

// thermalForms declares Lennard-Jones and Morse as formula forms (forms
// file), under keys of their own.
var thermalForms = formTOML("lj-formula", ljFormula, "limit = 0", ljParams...) + "\n" +
	formTOML("morse-formula", morseFormula, "limit = 0", morseParams...)

// TestThermalFormulaForms: formula forms give the built-in forms' B₂,
// Boyle temperature and thermal expansion.
func TestThermalFormulaForms(t *testing.T) {
	file := filepath.Join(t.TempDir(), "forms.toml")
	require.NoError(t, os.WriteFile(file, []byte(thermalForms), 0o644))
	temps := "60,120,300,1000"
	f := runJSON(t, "--forms", file, "virial", "lj-formula:epsilon=0.0104,sigma=3.4", "--pair", "Ar-Ar", "--temperatures", temps)
	b := runJSON(t, "virial", "lj:epsilon=0.0104,sigma=3.4", "--pair", "Ar-Ar", "--temperatures", temps)
	for i, r := range f["rows"].([]any) {
		row, ref := r.(map[string]any), b["rows"].([]any)[i].(map[string]any)
		for _, k := range []string{"b2_cm3_per_mol", "b2_classical_cm3_per_mol", "b2_quantum_correction_cm3_per_mol"} {
			assert.InDelta(t, ref[k].(float64), row[k].(float64), 1e-10*math.Max(1, math.Abs(ref[k].(float64))), k)
		}
	}
	assert.InDelta(t, b["boyle_temperature_k"].(float64), f["boyle_temperature_k"].(float64), 1e-8)

	f = runJSON(t, "--forms", file, "expansion", "morse-formula:De=4.6,a=1.87,re=1.27", "--pair", "H-Cl", "--temperatures", "10,300,2000")
	b = runJSON(t, "expansion", "morse:De=4.6,a=1.87,re=1.27", "--pair", "H-Cl", "--temperatures", "10,300,2000")
	for i, r := range f["rows"].([]any) {
		row, ref := r.(map[string]any), b["rows"].([]any)[i].(map[string]any)
		for _, k := range []string{"mean_r_classical_angstrom", "mean_r_cubic_estimate_angstrom", "mean_r_quantum_angstrom", "rms_displacement_classical_angstrom"} {
			assert.InDelta(t, ref[k], row[k], 1e-9, k)
		}
	}
}
