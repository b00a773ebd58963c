package main

import (
	"encoding/json"
	"math"
	"sort"
	"strconv"
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// Invented like pairs (argon-like and krypton-like Lennard-Jones sets).
const (
	mixA = "lj:epsilon=0.0103,sigma=3.40"
	mixB = "lj:epsilon=0.0140,sigma=3.60"
)

func keys(m map[string]any) []string {
	var k []string
	for x := range m {
		k = append(k, x)
	}
	sort.Strings(k)
	return k
}

// The JSON keys of mix are a contract (README "Combining rules").
func TestMixJSONContract(t *testing.T) {
	obj := runJSON(t, "mix", mixA, mixB, "--all-rules", "--mu", "20")
	assert.Equal(t, []string{"caution", "model", "pair", "params_a", "params_b", "rules", "spec_a", "spec_b"}, keys(obj))
	assert.Nil(t, obj["pair"], "a mass given directly: no pair")
	rules := obj["rules"].([]any)
	require.Len(t, rules, 5)
	row := rules[0].(map[string]any)
	assert.Equal(t, []string{"equilibrium_r_angstrom", "force_constant_ev_per_angstrom2", "formula", "harmonic_wavenumber_per_cm",
		"params", "reduced_mass_u", "reference", "rule", "spec", "title", "well_depth_ev"}, keys(row))
	// Lorentz–Berthelot (Lorentz 1881; Berthelot 1898): σ = 3.50 Å,
	// ε = √(0.0103·0.0140) eV; the Lennard-Jones minimum is at 2^{1/6}σ
	// with depth ε and k = 72ε/r_min² (Lennard-Jones 1924). Relative 1e-12.
	eps, sigma := math.Sqrt(0.0103*0.0140), 3.5
	rmin := math.Pow(2, 1.0/6) * sigma
	assert.Equal(t, "lorentz-berthelot", row["rule"])
	assert.InEpsilon(t, rmin, row["equilibrium_r_angstrom"].(float64), 1e-12)
	assert.InEpsilon(t, eps, row["well_depth_ev"].(float64), 1e-12)
	assert.InEpsilon(t, 72*eps/(rmin*rmin), row["force_constant_ev_per_angstrom2"].(float64), 1e-9)
	p := row["params"].(map[string]any)
	assert.InEpsilon(t, sigma, p["sigma"].(float64), 1e-15)
}

// The printed spec is ready for the other commands and builds the cross
// pair again exactly.
func TestMixSpecRoundTrip(t *testing.T) {
	for _, c := range []struct{ a, b, rule string }{
		{mixA, mixB, "waldman-hagler"},
		{mixA, mixB, "kong"},
		{"buckingham:A=1500,rho=0.3,C=25", "buckingham:A=2400,rho=0.25,C=36", "exp-harmonic"},
		{"morse:De=4.4,a=1.9,re=1.27", "morse:De=1.1,a=2.1,re=1.41", "morse-mean"},
	} {
		code, out, errOut := runCLI(t, "mix", c.a, c.b, "--rule", c.rule)
		require.Equal(t, 0, code, errOut)
		spec := strings.TrimSpace(out)
		obj := runJSON(t, "mix", c.a, c.b, "--rule", c.rule)
		row := obj["rules"].([]any)[0].(map[string]any)
		assert.Equal(t, row["spec"], spec)
		ins := runJSON(t, "inspect", spec)
		assert.Equal(t, row["equilibrium_r_angstrom"], ins["equilibrium_r_angstrom"], c.rule)
		assert.Equal(t, row["well_depth_ev"], ins["well_depth_ev"], c.rule)
	}
	// Morse (common practice rule): De = √(4.4·1.1) = 2.2 eV, a = 2.0/Å, re = 1.34 Å.
	code, out, _ := runCLI(t, "mix", "morse:De=4.4,a=1.9,re=1.27", "morse:De=1.1,a=2.1,re=1.41", "--rule", "morse-mean")
	require.Equal(t, 0, code)
	spec, re, ok := strings.Cut(strings.TrimSpace(out), ",re=")
	require.True(t, ok, out)
	assert.Equal(t, "morse:De=2.2,a=2", spec)
	v, err := strconv.ParseFloat(re, 64)
	require.NoError(t, err)
	assert.InDelta(t, 1.34, v, 1e-15)
}

func TestMixCSV(t *testing.T) {
	code, out, errOut := runCLI(t, "mix", mixA, mixB, "--all-rules", "--format", "csv")
	require.Equal(t, 0, code, errOut)
	lines := strings.Split(strings.TrimSpace(out), "\n")
	assert.Equal(t, "model,pair,rule,title,formula,reference,spec,params,equilibrium_r_angstrom,well_depth_ev,"+
		"force_constant_ev_per_angstrom2,reduced_mass_u,harmonic_wavenumber_per_cm", lines[0])
	assert.Len(t, lines, 6)
}

func TestMixErrors(t *testing.T) {
	for _, args := range [][]string{
		{"mix", mixA, "morse:De=4.4,a=1.9,re=1.27", "--rule", "kong"},                      // different forms
		{"mix", "morse:De=4.4,a=1.9,re=1.27", "morse:De=4,a=1.9,re=1.3", "--rule", "kong"}, // rule of another form
		{"mix", mixA, mixB, "--rule", "lorentz"},                                           // unknown rule
		{"mix", "harmonic:k=1,r0=1", "harmonic:k=2,r0=1", "--all-rules"},                   // no rules for the form
		{"mix", mixA, mixB}, // no rule
		{"mix", mixA, mixB, "--rule", "kong", "--all-rules"}, // both
		{"mix", mixA, "--rule", "kong"},                      // one spec
	} {
		code, _, errOut := runCLI(t, args...)
		assert.Equal(t, 2, code, "%v", args)
		assert.Equal(t, 1, strings.Count(strings.TrimSpace(errOut), "\n")+1, "one-line error: %q", errOut)
	}
}

// TestMixOtherForms: the rules that mix each parameter on its own work on a
// library form (Mie n–m, a formula form) and on a plugin form (the rydberg
// example, parameters De, a, re) by parameter names; a rule of the 12-6
// form and unequal exponents are errors. Check values: the rules' formulas
// (Lorentz 1881, Berthelot 1898; morse-mean common practice).
func TestMixOtherForms(t *testing.T) {
	cross := func(t *testing.T, out string) (string, map[string]float64) {
		t.Helper()
		var got struct {
			Rules []struct {
				Spec   string             `json:"spec"`
				Params map[string]float64 `json:"params"`
			} `json:"rules"`
		}
		require.NoError(t, json.Unmarshal([]byte(out), &got), out)
		require.Len(t, got.Rules, 1)
		return got.Rules[0].Spec, got.Rules[0].Params
	}
	mieA, mieB := "mie:epsilon=0.0103,sigma=3.40,n=14,m=6", "mie:epsilon=0.0140,sigma=3.60,n=14,m=6"
	code, out, errOut := runCLI(t, "mix", mieA, mieB, "--rule", "lorentz-berthelot", "--format", "json")
	require.Equal(t, 0, code, errOut)
	spec, p := cross(t, out)
	assert.InDelta(t, math.Sqrt(0.0103*0.0140), p["epsilon"], 1e-17)
	assert.InDelta(t, 3.5, p["sigma"], 1e-15)
	assert.Equal(t, 14.0, p["n"])
	assert.Equal(t, 6.0, p["m"])
	code, _, errOut = runCLI(t, "inspect", spec)
	assert.Equal(t, 0, code, "the cross-pair spec is a form: %s", errOut)

	code, _, errOut = runCLI(t, "mix", mieA, strings.Replace(mieB, "n=14", "n=12", 1), "--rule", "lorentz-berthelot")
	assert.Equal(t, 2, code)
	assert.Contains(t, errOut, "n = 14 and 12 differ")
	code, _, errOut = runCLI(t, "mix", mieA, mieB, "--rule", "kong")
	assert.Equal(t, 2, code, errOut)

	code, out, errOut = runPlugins(t, "--plugin", pluginBin.rydberg, "mix", "rydberg:De=4.4,a=2.4,re=1.27", "rydberg:De=4.6,a=2.6,re=1.41", "--rule", "morse-mean", "--format", "json")
	require.Equal(t, 0, code, errOut)
	_, p = cross(t, out)
	assert.InDelta(t, math.Sqrt(4.4*4.6), p["De"], 1e-15)
	assert.InDelta(t, 2.5, p["a"], 1e-15)
	assert.InDelta(t, 1.34, p["re"], 1e-15)
}
