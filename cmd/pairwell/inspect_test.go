package main

import (
	"bytes"
	"encoding/json"
	"fmt"
	"strings"
	"testing"
	"unicode/utf8"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"github.com/pairwell/pairwell/core/atoms"
	"github.com/pairwell/pairwell/models"
)

// runCLI runs pairwell in-process and returns exit code, stdout and stderr.
func runCLI(t *testing.T, args ...string) (int, string, string) {
	t.Helper()
	var stdout, stderr bytes.Buffer
	code := run(args, strings.NewReader(""), &stdout, &stderr)
	return code, stdout.String(), stderr.String()
}

func TestInspectJSONKeys(t *testing.T) {
	specs := []string{
		"morse:De=4.6,a=1.87,re=1.27",
		"lj:epsilon=120K,sigma=3.4",
		"buckingham:A=1500,rho=0.3,C=25",
		"harmonic:k=30,r0=1.2",
	}
	for _, spec := range specs {
		code, out, errOut := runCLI(t, "inspect", spec, "--pair", "H-Cl", "--coefficients", "6", "--format", "json")
		require.Equal(t, 0, code, "%s: %s", spec, errOut)
		var obj map[string]any
		require.NoError(t, json.Unmarshal([]byte(out), &obj), spec)
		for _, k := range []string{
			"model", "params", "equilibrium_r_angstrom", "equilibrium_energy_ev", "well_depth_ev",
			"force_constant_ev_per_angstrom2", "taylor_coefficients", "reduced_mass_u",
			"harmonic_wavenumber_per_cm", "harmonic_frequency_thz", "harmonic_period_fs",
		} {
			assert.Contains(t, obj, k, "%s: key %s", spec, k)
		}
		assert.Len(t, obj["taylor_coefficients"], 7, spec)
		if strings.HasPrefix(spec, "harmonic") {
			assert.Equal(t, "Infinity", obj["well_depth_ev"], "harmonic depth is unbounded")
			assert.Nil(t, obj["inflection_r_angstrom"], "harmonic has no inflection: does not apply")
		}
	}
	// Without a mass the harmonic keys are null.
	code, out, _ := runCLI(t, "inspect", specs[0], "--format", "json")
	require.Equal(t, 0, code)
	assert.Contains(t, out, `"harmonic_wavenumber_per_cm": null`)
	assert.Contains(t, out, `"pair": null`)
}

func TestInspectUnitsDoNotLeakIntoJSON(t *testing.T) {
	// The same Lennard-Jones well in eV/Å and in K/nm: ε = 120 K·k_B,
	// k_B = 8.617333262e-5 eV/K (CODATA 2018).
	_, a, _ := runCLI(t, "inspect", "lj:epsilon=0.010340799914,sigma=3.4", "--format", "json")
	_, b, _ := runCLI(t, "inspect", "lj:epsilon=120K,sigma=0.34nm", "--format", "json")
	var ra, rb map[string]any
	require.NoError(t, json.Unmarshal([]byte(a), &ra))
	require.NoError(t, json.Unmarshal([]byte(b), &rb))
	assert.InEpsilon(t, ra["equilibrium_r_angstrom"], rb["equilibrium_r_angstrom"], 1e-12)
	assert.InEpsilon(t, ra["force_constant_ev_per_angstrom2"], rb["force_constant_ev_per_angstrom2"], 1e-10)
}

func TestBadInput(t *testing.T) {
	const morse = "morse:De=4.6,a=1.87,re=1.27"
	tests := []struct {
		name    string
		args    []string
		mention string
	}{
		{"unknown model", []string{"inspect", "quartic:k=1"}, "unknown model"},
		{"unknown parameter", []string{"inspect", "morse:De=4.6,a=1.87,re=1.27,b=2"}, `no parameter "b"`},
		{"missing parameter", []string{"inspect", "morse:De=4.6,a=1.87"}, "missing re"},
		{"duplicate parameter", []string{"inspect", "morse:De=4.6,De=4,a=1.87,re=1.27"}, "twice"},
		{"malformed number", []string{"inspect", "morse:De=4.6.1,a=1.87,re=1.27"}, "De"},
		{"NaN", []string{"inspect", "morse:De=NaN,a=1.87,re=1.27"}, "De"},
		{"Inf", []string{"inspect", "morse:De=4.6,a=Inf,re=1.27"}, "a"},
		{"unknown unit", []string{"inspect", "morse:De=4.6parsec,a=1.87,re=1.27"}, "unit"},
		{"wrong dimension", []string{"inspect", "morse:De=4.6nm,a=1.87,re=1.27"}, "energy"},
		{"constraint", []string{"inspect", "morse:De=4.6,a=-1.87,re=1.27"}, "> 0"},
		{"unknown element", []string{"inspect", morse, "--pair", "H-Qz"}, "Qz"},
		{"unknown isotope", []string{"inspect", morse, "--pair", "1H-38Cl"}, "38Cl"},
		{"malformed pair", []string{"inspect", morse, "--pair", "HCl"}, "A-B"},
		{"pair and mu", []string{"inspect", morse, "--pair", "H-Cl", "--mu", "1"}, "--pair and --mu"},
		{"bad mu", []string{"inspect", morse, "--mu", "-1"}, "--mu"},
		{"no minimum", []string{"inspect", "buckingham:A=1000,rho=0.3,C=0"}, "minimum"},
		{"order too small", []string{"inspect", morse, "--coefficients", "1"}, "--coefficients"},
		{"bad format", []string{"inspect", morse, "--format", "xml"}, "--format"},
		{"no spec", []string{"inspect"}, "SPEC"},
		{"unknown flag", []string{"inspect", morse, "--colour"}, "colour"},
		{"unknown command", []string{"inspekt"}, "unknown command"},
	}
	for _, tt := range tests {
		code, out, errOut := runCLI(t, tt.args...)
		assert.Equal(t, 2, code, tt.name)
		assert.Empty(t, out, tt.name)
		assert.Equal(t, 1, strings.Count(errOut, "\n"), "%s: one line: %q", tt.name, errOut)
		assert.Contains(t, errOut, tt.mention, tt.name)
		assert.NotContains(t, errOut, "goroutine", tt.name)
	}
}

func TestModelsListsBuiltins(t *testing.T) {
	code, out, _ := runCLI(t, "models", "--format", "json")
	require.Equal(t, 0, code)
	var list []map[string]any
	require.NoError(t, json.Unmarshal([]byte(out), &list))
	var keys []string
	for _, m := range list {
		keys = append(keys, m["key"].(string))
	}
	// The built-in Go forms, then the forms library (models/library), in
	// the order of its file.
	assert.Equal(t, []string{"morse", "lennard-jones", "buckingham", "harmonic",
		"mie", "exp6", "born-mayer", "rydberg", "varshni", "kratzer", "poschl-teller",
		"hulburt-hirschfelder", "tang-toennies"}, keys)
	for _, m := range list[4:] {
		assert.Equal(t, "library", m["kind"], m["key"])
		assert.Contains(t, m["origin"], "library/forms.toml:", m["key"])
		assert.NotEmpty(t, m["reference"], m["key"])
		for _, p := range m["parameters"].([]any) {
			assert.NotEmpty(t, p.(map[string]any)["meaning"], m["key"])
		}
	}
	code, out, _ = runCLI(t, "models")
	require.Equal(t, 0, code)
	assert.Contains(t, out, "½k(r−r0)²") // the ½ convention is stated
	// The library's forms with their origin, formula, parameters and
	// reference (the README table "The forms library").
	assert.Regexp(t, `kratzer\s+V = De\*\(\(re/r\)\^2 - 2\*re/r\)\s+De \[eV, > 0\]; re \[Å, > 0\]\s+forms library library/forms.toml:\d+`, out)
	assert.Contains(t, out, "kratzer — Kratzer. A. Kratzer, Z. Phys. 3, 289 (1920)")
	assert.Contains(t, out, "tang-toennies — Tang-Toennies. K. T. Tang & J. P. Toennies, J. Chem. Phys. 80, 3726 (1984)")
	// A long formula (Tang–Toennies, 400+ characters) is cut in the
	// table's column, so it does not widen every row, and printed whole
	// in its note.
	var tt string
	for _, m := range list {
		if m["key"] == "tang-toennies" {
			tt = m["formula"].(string)
		}
	}
	require.Greater(t, utf8.RuneCountInString(tt), formulaWidth)
	header, _, _ := strings.Cut(out, "\n")
	assert.Less(t, utf8.RuneCountInString(header), formulaWidth+140, "the formula column is at most formulaWidth wide")
	assert.Contains(t, out, "Formula: "+tt+".")
}

func TestInspectHandbookRoundTrip(t *testing.T) {
	// Huber & Herzberg 1979, Constants of Diatomic Molecules (values from
	// memory): X¹Σ⁺ ground states.
	tests := []struct {
		pair            string
		omegaE, omegaXe float64 // cm⁻¹
		re              float64 // Å
	}{
		{"1H-35Cl", 2990.946, 52.8186, 1.27455},
		{"12C-16O", 2169.81358, 13.28831, 1.128323},
	}
	for _, tt := range tests {
		p, err := atoms.ParsePair(tt.pair)
		require.NoError(t, err)
		params, err := models.MorseFromSpectroscopic(tt.omegaE, tt.omegaXe, tt.re, p.Mu)
		require.NoError(t, err)
		spec := fmt.Sprintf("morse:De=%.17g,a=%.17g,re=%.17g", params[0], params[1], params[2])
		code, out, errOut := runCLI(t, "inspect", spec, "--pair", tt.pair, "--format", "json")
		require.Equal(t, 0, code, errOut)
		var r struct {
			Re         float64 `json:"equilibrium_r_angstrom"`
			Depth      float64 `json:"well_depth_ev"`
			Wavenumber float64 `json:"harmonic_wavenumber_per_cm"`
			Taylor     []float64
		}
		require.NoError(t, json.Unmarshal([]byte(out), &r))
		assert.InEpsilon(t, tt.omegaE, r.Wavenumber, 1e-9, "%s ωe", tt.pair)
		assert.InEpsilon(t, tt.re, r.Re, 1e-12, "%s re", tt.pair)
		// Morse: ωe·xe = ωe²/(4De) in wavenumber units (Morse 1929); 1 cm⁻¹
		// = hc·100 m⁻¹ = 1.239841984e-4 eV (CODATA 2018).
		deCM := r.Depth / (6.62607015e-34 * 299792458 * 100 / 1.602176634e-19)
		assert.InEpsilon(t, tt.omegaXe, tt.omegaE*tt.omegaE/(4*deCM), 1e-9, "%s ωexe", tt.pair)
	}
}
