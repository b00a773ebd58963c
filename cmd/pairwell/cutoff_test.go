package main

import (
	"io"
	"math"
	"os"
	"sort"
	"strconv"
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"github.com/pairwell/pairwell/core/cutoff"
)

// Illustrative, invented parameter sets.
const (
	cutLJ     = "lj:epsilon=0.0104,sigma=3.4" // argon-like
	cutMorse  = "morse:De=4.6,a=1.87,re=1.27" // HCl-like
	formsToml = "../../examples/forms.toml"
)

// allKeys collects every key of a decoded JSON value, nested ones too.
func allKeys(v any, out map[string]bool) {
	switch x := v.(type) {
	case map[string]any:
		for k, e := range x {
			out[k] = true
			allKeys(e, out)
		}
	case []any:
		for _, e := range x {
			allKeys(e, out)
		}
	}
}

// TestCutoffJSONContract: the keys of cutoff's JSON, each documented in the
// README (as `key`), with a mass and a density so that every key appears.
func TestCutoffJSONContract(t *testing.T) {
	obj := runJSON(t, "cutoff", cutLJ, "--cutoff", "8.5", "--switch-on", "7", "--mu", "19.974", "--density", "0.02")
	assert.Equal(t, []string{"bare", "caution", "cutoff_angstrom", "dv_at_cutoff_ev_per_angstrom", "error_scan", "model", "notes",
		"pair", "params", "reduced_mass_u", "schemes", "spec", "switch_on_angstrom", "tail_correction", "tail_correction_source",
		"v_at_cutoff_ev"}, keys(obj))
	rows := obj["schemes"].([]any)
	require.Len(t, rows, 5)
	assert.Equal(t, []string{"curvature_jump_ev_per_angstrom2", "depth_shift_ev", "energy_jump_ev", "force_jump_ev_per_angstrom", "formula",
		"k_shift_ev_per_angstrom2", "max_energy_error_ev", "max_energy_error_r_angstrom", "max_force_error_ev_per_angstrom",
		"max_force_error_r_angstrom", "re_shift_angstrom", "scheme", "spec_suffix", "wavenumber_shift_per_cm", "well"}, keys(rows[0].(map[string]any)))
	b, err := os.ReadFile("../../README.md")
	require.NoError(t, err)
	readme, ok := strings.CutPrefix(string(b)[strings.Index(string(b), "## Cutoffs and switching"):], "## Cutoffs")
	require.True(t, ok, "README section Cutoffs and switching")
	readme, _, _ = strings.Cut(readme, "\n## ")
	all := map[string]bool{}
	allKeys(obj, all)
	delete(all, "epsilon") // parameter names, not keys of the contract
	delete(all, "sigma")
	var names []string
	for k := range all {
		names = append(names, k)
	}
	sort.Strings(names)
	for _, k := range names {
		assert.True(t, strings.Contains(readme, "`"+k+"`"), "key %s is not documented in the README", k)
	}
	// The order of the schemes is that of cutoff.Schemes().
	for i, s := range cutoff.Schemes() {
		assert.Equal(t, s.String(), rows[i].(map[string]any)["scheme"])
	}
}

// TestCutoffCheckValues: the force shift's energy error at re is
// (re − r_c)V′(r_c) + V(r_c) (issue 16), its force continuous; the
// shift's depth changes by V(r_c); the Lennard-Jones tail corrections are
// Allen & Tildesley's closed form (2017, §2.8; checked by derivation in
// core/cutoff): u = (8/3)πρεσ³[(1/3)(σ/r_c)⁹ − (σ/r_c)³], p =
// (16/3)πρ²εσ³[(2/3)(σ/r_c)⁹ − (σ/r_c)³].
func TestCutoffCheckValues(t *testing.T) {
	obj := runJSON(t, "cutoff", cutLJ, "--cutoff", "8.5", "--density", "0.02")
	vc, dvc := obj["v_at_cutoff_ev"].(float64), obj["dv_at_cutoff_ev_per_angstrom"].(float64)
	eps, sigma, rc, rho := 0.0104, 3.4, 8.5, 0.02
	s6 := math.Pow(sigma/rc, 6)
	assert.InEpsilon(t, 4*eps*(s6*s6-s6), vc, 1e-14)
	assert.InEpsilon(t, 24*eps/rc*(s6-2*s6*s6), dvc, 1e-14)
	rows := obj["schemes"].([]any)
	byName := map[string]map[string]any{}
	for _, r := range rows {
		m := r.(map[string]any)
		byName[m["scheme"].(string)] = m
	}
	fs := byName["force-shift"]
	assert.Zero(t, fs["energy_jump_ev"])
	assert.Zero(t, fs["force_jump_ev_per_angstrom"])
	sh := byName["shift"]
	assert.InEpsilon(t, vc, sh["depth_shift_ev"].(float64), 1e-12)
	tr := byName["truncate"]
	assert.InEpsilon(t, -vc, tr["energy_jump_ev"].(float64), 1e-15)
	assert.InEpsilon(t, dvc, tr["force_jump_ev_per_angstrom"].(float64), 1e-15)
	tail := obj["tail_correction"].(map[string]any)
	s3 := math.Pow(sigma/rc, 3)
	u := 8.0 / 3 * math.Pi * rho * eps * sigma * sigma * sigma * (s3*s3*s3/3 - s3)
	p := 16.0 / 3 * math.Pi * rho * rho * eps * sigma * sigma * sigma * (2*s3*s3*s3/3 - s3)
	assert.InEpsilon(t, u, tail["energy_per_particle_ev"].(float64), 1e-14)
	assert.InEpsilon(t, p, tail["pressure_ev_per_angstrom3"].(float64), 1e-14)
	code, out, errOut := runCLI(t, "inspect", cutLJ+"@cut=force-shift,rc=8.5", "--format", "json")
	require.Equal(t, 0, code, errOut)
	assert.Contains(t, out, `"model": "lennard-jones@cut=force-shift,rc=8.5"`)
}

// TestCutoffFormula: a formula form (the README's forms file: lj-ab, the
// Lennard-Jones form in A = 4εσ¹², B = 4εσ⁶) gives the same cutoff report
// as the built-in, its tail by quadrature within 1e-10 of the closed form.
func TestCutoffFormula(t *testing.T) {
	eps, sigma := 0.0104, 3.4
	A, B := 4*eps*math.Pow(sigma, 12), 4*eps*math.Pow(sigma, 6)
	g := func(v float64) string { return strconv.FormatFloat(v, 'g', -1, 64) }
	spec := "lj-ab:A=" + g(A) + "eV*A^12,B=" + g(B) + "eV*A^6" // bare numbers would be kcal/mol·Åⁿ
	f := runJSON(t, "--forms", formsToml, "cutoff", spec, "--cutoff", "8.5", "--density", "0.02")
	b := runJSON(t, "cutoff", cutLJ, "--cutoff", "8.5", "--density", "0.02")
	ft, bt := f["tail_correction"].(map[string]any), b["tail_correction"].(map[string]any)
	assert.Equal(t, "quadrature", ft["method"])
	assert.InEpsilon(t, bt["energy_per_particle_ev"].(float64), ft["energy_per_particle_ev"].(float64), 1e-10)
	assert.InEpsilon(t, bt["pressure_ev_per_angstrom3"].(float64), ft["pressure_ev_per_angstrom3"].(float64), 1e-10)
	fr, br := f["schemes"].([]any), b["schemes"].([]any)
	for i := range fr {
		fm, bm := fr[i].(map[string]any), br[i].(map[string]any)
		for _, k := range []string{"energy_jump_ev", "force_jump_ev_per_angstrom", "max_energy_error_ev", "max_force_error_ev_per_angstrom"} {
			assert.InDelta(t, bm[k].(float64), fm[k].(float64), 1e-12*math.Abs(bm[k].(float64))+1e-18, "%s %s", bm["scheme"], k)
		}
	}
	code, _, errOut := runCLI(t, "--forms", formsToml, "check", spec+"@cut=switch-c2,on=7,rc=8.5")
	assert.Equal(t, 0, code, errOut)
}

// TestCutoffPlugin: a plugin form (the rydberg example) through cutoff and
// check; its tail by quadrature.
func TestCutoffPlugin(t *testing.T) {
	requirePlugins(t)
	code, out, errOut := runPlugins(t, "--plugin", pluginBin.rydberg, "cutoff", rydbergSpec, "--cutoff", "5", "--mu", "0.98", "--density", "0.05", "--format", "json")
	require.Equal(t, 0, code, errOut)
	assert.Contains(t, out, `"method": "quadrature"`)
	assert.Contains(t, out, `"scheme": "switch-c2"`)
	code, _, errOut = runPlugins(t, "--plugin", pluginBin.rydberg, "check", rydbergSpec+"@cut=switch-c1,on=2.5,rc=3.5", rydbergSpec+"@cut=force-shift,rc=3")
	assert.Equal(t, 0, code, errOut)
}

// TestCutoffOutputs: the table shows the schemes side by side with the
// caution; CSV has one row per scheme.
func TestCutoffOutputs(t *testing.T) {
	code, out, errOut := runCLI(t, "cutoff", cutMorse, "--cutoff", "6", "--pair", "H-Cl")
	require.Equal(t, 0, code, errOut)
	for _, s := range []string{"truncate", "shift", "force-shift", "switch-c1", "switch-c2", "harmonic wavenumber", "Caution:"} {
		assert.Contains(t, out, s)
	}
	code, out, errOut = runCLI(t, "cutoff", cutMorse, "--cutoff", "6", "--format", "csv")
	require.Equal(t, 0, code, errOut)
	lines := strings.Split(strings.TrimSpace(out), "\n")
	require.Len(t, lines, 6) // the header and one row per scheme
	assert.True(t, strings.HasPrefix(lines[0], "model,params,pair,reduced_mass_u,scheme,spec_suffix,"), lines[0])
	assert.Contains(t, lines[0], ",well.equilibrium_r_angstrom,")
	assert.True(t, strings.HasPrefix(lines[3], `morse,De=4.6 a=1.87 re=1.27,,,force-shift,"cut=force-shift,rc=6",`), lines[3])
}

// TestCutoffDensity: a mass density with a like pair's atom mass. 1.40
// g/cm³ of argon (standard atomic weight 39.95, IUPAC 2021 conventional)
// is 1.40/(39.95·1.66053906660) atoms/Å³ (u = 1.66053906660e-24 g,
// CODATA 2018).
func TestCutoffDensity(t *testing.T) {
	obj := runJSON(t, "cutoff", cutLJ, "--cutoff", "8.5", "--pair", "Ar-Ar", "--density", "1.40g/cm3")
	rho := obj["tail_correction"].(map[string]any)["density_per_angstrom3"].(float64)
	assert.InEpsilon(t, 1.40/(39.95*1.66053906660), rho, 2e-4) // 39.95 rounds the weight
	obj = runJSON(t, "cutoff", cutLJ, "--cutoff", "8.5", "--density", "21/nm^3")
	assert.InEpsilon(t, 0.021, obj["tail_correction"].(map[string]any)["density_per_angstrom3"].(float64), 1e-14)
	obj = runJSON(t, "cutoff", cutLJ, "--cutoff", "8.5", "--mu", "10", "--density", "1000kg/m3")
	assert.InEpsilon(t, 1/(20*1.66053906660), obj["tail_correction"].(map[string]any)["density_per_angstrom3"].(float64), 1e-12)
}

// TestCutoffBadInput: one line on stderr and exit 2.
func TestCutoffBadInput(t *testing.T) {
	tests := []struct {
		args    []string
		mention string
	}{
		{[]string{"cutoff", cutLJ}, "--cutoff RC is required"},
		{[]string{"cutoff", cutLJ, "--cutoff", "0"}, "must be a length > 0"},
		{[]string{"cutoff", cutLJ, "--cutoff", "8eV"}, "--cutoff"},
		{[]string{"cutoff", cutLJ, "--cutoff", "3"}, "inside the repulsive wall"},
		{[]string{"cutoff", cutLJ, "--cutoff", "8", "--switch-on", "9"}, "≥ r_c"},
		{[]string{"cutoff", cutLJ, "--cutoff", "8", "--density", "-1"}, "--density"},
		{[]string{"cutoff", cutLJ, "--cutoff", "8", "--density", "1g/cm3"}, "needs the atom mass"},
		{[]string{"cutoff", cutLJ, "--cutoff", "8", "--density", "1g/cm3", "--pair", "Ar-Kr"}, "unlike"},
		{[]string{"cutoff", cutLJ, "--cutoff", "8", "--density", "2eV"}, "--density"},
		{[]string{"cutoff", cutLJ + "@cut=shift,rc=8", "--cutoff", "8"}, "already a cut form"},
		{[]string{"cutoff", "harmonic:k=30,r0=1.2", "--cutoff", "3"}, "no minimum"},
		{[]string{"cutoff", cutLJ, cutMorse, "--cutoff", "8"}, "one SPEC"},
	}
	for _, tt := range tests {
		code, _, errOut := runCLI(t, tt.args...)
		assert.Equal(t, 2, code, "%v: %s", tt.args, errOut)
		assert.Contains(t, errOut, tt.mention, "%v", tt.args)
		assert.Equal(t, 1, strings.Count(errOut, "\n"), "one line: %q", errOut)
	}
	// The table's "--cutoff" alone would match the usage text too: the
	// message names the flag and the dimension it wants.
	_, _, errOut := runCLI(t, "cutoff", cutLJ, "--cutoff", "8eV")
	assert.Contains(t, errOut, "--cutoff: ")
	assert.Contains(t, errOut, "want length")
}

// BenchmarkCutoffCommand is pairwell cutoff with every scheme, a mass and
// a density, in-process (issue 16's target, whole process: 50 ms).
func BenchmarkCutoffCommand(b *testing.B) {
	args := []string{"cutoff", cutLJ, "--cutoff", "8.5", "--pair", "Ar-Ar", "--density", "1.40g/cm3"}
	for b.Loop() {
		var errOut strings.Builder
		if code := run(args, strings.NewReader(""), io.Discard, &errOut); code != 0 {
			b.Fatal(errOut.String())
		}
	}
}
