package main

import (
	"encoding/json"
	"os"
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// levelsKeys are the JSON keys of pairwell levels that the README
// documents as a contract.
var (
	levelsKeys = []string{"model", "params", "reduced_mass_u", "levels", "zero_point_energy_per_cm", "fundamental_per_cm",
		"first_overtone_per_cm", "bound_levels", "d0_ev", "harmonic", "perturbative", "from_levels", "error_estimate_per_cm"}
	levelRowKeys = []string{"v", "j", "term_value_per_cm", "binding_energy_per_cm", "mean_r_angstrom", "rms_displacement_angstrom"}
	levelsGroups = map[string][]string{
		"harmonic":     {"omega_e_per_cm", "b_e_per_cm"},
		"perturbative": {"omega_e_x_e_per_cm", "alpha_e_per_cm", "y00_per_cm", "centrifugal_d_e_per_cm"},
		"from_levels":  {"omega_e_per_cm", "omega_e_x_e_per_cm", "omega_e_y_e_per_cm", "b_e_per_cm", "alpha_e_per_cm"},
	}
)

func checkLevelsJSON(t *testing.T, out string, bounded bool) map[string]any {
	t.Helper()
	var obj map[string]any
	require.NoError(t, json.Unmarshal([]byte(out), &obj), out)
	for _, k := range levelsKeys {
		require.Contains(t, obj, k)
	}
	rows := obj["levels"].([]any)
	require.NotEmpty(t, rows)
	for _, r := range rows {
		for _, k := range levelRowKeys {
			require.Contains(t, r, k)
		}
	}
	for g, ks := range levelsGroups {
		grp, ok := obj[g].(map[string]any)
		require.True(t, ok, "%s is an object", g)
		for _, k := range ks {
			assert.Contains(t, grp, k, g)
		}
	}
	if bounded {
		assert.NotNil(t, obj["bound_levels"])
		assert.NotNil(t, rows[0].(map[string]any)["binding_energy_per_cm"])
	} else {
		assert.Equal(t, "Infinity", obj["bound_levels"], "unbounded: infinitely many levels")
		assert.Equal(t, "Infinity", obj["d0_ev"])
		assert.Equal(t, "Infinity", rows[0].(map[string]any)["binding_energy_per_cm"])
	}
	return obj
}

func TestLevelsJSONContract(t *testing.T) {
	for _, tc := range []struct {
		args    []string
		bounded bool
	}{
		{[]string{"morse:De=4.6,a=1.87,re=1.27", "--pair", "1H-35Cl", "--j-max", "1"}, true},
		{[]string{"lj:epsilon=120K,sigma=3.4", "--pair", "Ar-Ar"}, true},
		{[]string{"buckingham:A=1500,rho=0.3,C=25", "--mu", "20"}, true},
		{[]string{"harmonic:k=30,r0=1.2", "--mu", "7", "--v-max", "4"}, false},
	} {
		t.Run(tc.args[0], func(t *testing.T) {
			code, out, errOut := runCLI(t, append([]string{"levels", "--format", "json"}, tc.args...)...)
			require.Equal(t, 0, code, errOut)
			obj := checkLevelsJSON(t, out, tc.bounded)
			assert.LessOrEqual(t, obj["error_estimate_per_cm"], 1e-6)
		})
	}
}

// TestLevelsMorseHCl: the Morse well of H³⁵Cl constants (Huber & Herzberg
// 1979, from memory: ωe = 2990.946, ωexe = 52.8186 cm⁻¹) gives the
// fundamental ωe − 2ωexe = 2885.3088 cm⁻¹ (Morse 1929) and 28 bound levels
// (v < ωe/(2ωexe) − ½ = 27.8).
func TestLevelsMorseHCl(t *testing.T) {
	// De = ωe²/(4ωexe) = 42341.8927 cm⁻¹, a = √(μω²/(2De)) = 1.751934758/Å
	// for μ(¹H³⁵Cl) = 0.97959254 u (AME2020), re = 1.27455 Å (CODATA 2018
	// constants; computed by hand with python3).
	code, out, errOut := runCLI(t, "levels", "--format", "json", "morse:De=42341.8927cm-1,a=1.751934758,re=1.27455", "--pair", "1H-35Cl")
	require.Equal(t, 0, code, errOut)
	obj := checkLevelsJSON(t, out, true)
	assert.EqualValues(t, 28, obj["bound_levels"])
	we := obj["harmonic"].(map[string]any)["omega_e_per_cm"].(float64)
	wexe := obj["perturbative"].(map[string]any)["omega_e_x_e_per_cm"].(float64)
	assert.InDelta(t, we-2*wexe, obj["fundamental_per_cm"], 1e-5)
	assert.InDelta(t, 2990.946, we, 1e-5)
	assert.InDelta(t, 52.8186, wexe, 1e-5)
	assert.InDelta(t, 2885.3088, obj["fundamental_per_cm"], 1e-4)
}

func TestLevelsTableAndCSV(t *testing.T) {
	code, out, errOut := runCLI(t, "levels", "morse:De=4.6,a=1.87,re=1.27", "--pair", "1H-35Cl")
	require.Equal(t, 0, code, errOut)
	for _, s := range []string{"term value [cm⁻¹]", "binding energy [cm⁻¹]", "zero-point energy", "fundamental E(1) − E(0)",
		"bound levels at J = 0", "from levels ωexe (fit, v ≤ 3, J ≤ 4)", "below the zero-point energy", "Caution"} {
		assert.Contains(t, out, s)
	}
	code, out, errOut = runCLI(t, "levels", "morse:De=4.6,a=1.87,re=1.27", "--pair", "1H-35Cl", "--format", "csv", "--v-max", "2", "--j-max", "1")
	require.Equal(t, 0, code, errOut)
	lines := strings.Split(strings.TrimSpace(out), "\n")
	require.Len(t, lines, 1+6)
	assert.Equal(t, "model,params,pair,reduced_mass_u,v,j,term_value_per_cm,term_value_ev,mean_r_angstrom,rms_displacement_angstrom,"+
		"error_estimate_per_cm,spacing_per_cm,classical_spacing_per_cm,binding_energy_per_cm,binding_energy_ev", lines[0])
	assert.True(t, strings.HasPrefix(lines[4], "morse,De=4.6 a=1.87 re=1.27,1H-35Cl,0.9795925394006898,0,1,"), lines[4])
}

func TestLevelsBadInput(t *testing.T) {
	for _, tc := range []struct {
		args []string
		code int
		msg  string
	}{
		{[]string{"morse:De=4.6,a=1.87,re=1.27"}, 2, "reduced mass is needed"},
		{[]string{"harmonic:k=30,r0=1.2", "--mu", "7"}, 2, "--v-max"},
		{[]string{"morse:De=4.6,a=1.87,re=1.27", "--mu", "1", "--v-max", "40"}, 2, "bound levels"},
		{[]string{"morse:De=4.6,a=1.87,re=1.27", "--mu", "1", "--v-max", "-2"}, 2, "--v-max"},
		{[]string{"morse:De=4.6,a=1.87,re=1.27", "--mu", "1", "--j-max", "-1"}, 2, "--j-max"},
		{[]string{"morse:De=4.6,a=1.87,re=1.27", "--mu", "1", "--accuracy", "0"}, 2, "--accuracy"},
		{[]string{"morse:De=4.6,a=1.87,re=1.27", "--mu", "1", "--accuracy", "abc"}, 2, "--accuracy"},
		{[]string{"morse:De=1e-4,a=1,re=3", "--mu", "1"}, 2, "too shallow"},
		{[]string{"buckingham:A=1500,rho=0.3,C=25", "--mu", "20", "--v-max", "30"}, 2, "bound levels"},
	} {
		t.Run(strings.Join(tc.args, " "), func(t *testing.T) {
			code, out, errOut := runCLI(t, append([]string{"levels"}, tc.args...)...)
			assert.Equal(t, tc.code, code)
			assert.Empty(t, out)
			assert.Contains(t, errOut, tc.msg)
			assert.Equal(t, 1, strings.Count(strings.TrimSpace(errOut), "\n")+1, "one line: %q", errOut)
		})
	}
}

// TestLevelsPlugin runs levels on a plugin form; the potential is
// evaluated in batches (see TestBatched in core/levels).
func TestLevelsPlugin(t *testing.T) {
	code, out, errOut := runPlugins(t, "--plugin", pluginBin.rydberg, "levels", rydbergSpec, "--pair", "1H-35Cl", "--format", "json")
	require.Equal(t, 0, code, errOut)
	checkLevelsJSON(t, out, true)
}

// TestCompareQuantumColumnsCLI: with a mass, compare shows the fundamental
// and ZPE columns.
func TestCompareQuantumColumnsCLI(t *testing.T) {
	code, out, errOut := runCLI(t, "compare", "morse:De=4.6,a=1.87,re=1.27", "--pair", "1H-35Cl")
	require.Equal(t, 0, code, errOut)
	assert.Contains(t, out, "fundamental [cm⁻¹]")
	assert.Contains(t, out, "ZPE [cm⁻¹]")
	code, out, errOut = runCLI(t, "compare", "morse:De=4.6,a=1.87,re=1.27", "--pair", "1H-35Cl", "--format", "csv")
	require.Equal(t, 0, code, errOut)
	assert.Contains(t, strings.SplitN(out, "\n", 2)[0], "zero_point_energy_per_cm,fundamental_per_cm")
}

func TestPlotLevels(t *testing.T) {
	dir := t.TempDir()
	out := dir + "/levels.svg"
	code, _, errOut := runCLI(t, "plot", "levels", "morse:De=4.6,a=1.87,re=1.27", "--pair", "1H-35Cl", "-o", out)
	require.Equal(t, 0, code, errOut)
	b, err := os.ReadFile(out)
	require.NoError(t, err)
	assert.Contains(t, string(b), "<svg")
	for _, tc := range []struct {
		args []string
		msg  string
	}{
		{[]string{"morse:De=4.6,a=1.87,re=1.27"}, "reduced mass"},
		{[]string{"harmonic:k=30,r0=1.2", "--mu", "7"}, "highest v"},
		{[]string{"morse:De=4.6,a=1.87,re=1.27", "--mu", "1", "--v-max", "-3"}, "--v-max"},
	} {
		code, _, errOut := runCLI(t, append(append([]string{"plot", "levels"}, tc.args...), "-o", dir+"/x.png")...)
		assert.Equal(t, 2, code, errOut)
		assert.Contains(t, errOut, tc.msg)
		assert.NoFileExists(t, dir+"/x.png")
	}
}

// TestLevelsFormulaForm runs levels on forms typed as formulas: one of the
// README's example forms file and one of the forms library.
func TestLevelsFormulaForm(t *testing.T) {
	code, out, errOut := runCLI(t, "--forms", "../../examples/forms.toml", "levels", "morse-k:De=4.6,k=32.17,re=1.27", "--pair", "H-Cl", "--format", "json")
	require.Equal(t, 0, code, errOut)
	checkLevelsJSON(t, out, true)
	code, out, errOut = runCLI(t, "levels", "varshni:De=4.6,re=1.27,beta=0.5", "--pair", "H-Cl", "--format", "json")
	require.Equal(t, 0, code, errOut)
	checkLevelsJSON(t, out, true)
}
