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
)

// fourSpecs are one spec of every built-in form.
var fourSpecs = []string{
	"morse:De=4.6,a=1.87,re=1.27",
	"lj:epsilon=120K,sigma=3.4",
	"buckingham:A=1500,rho=0.3,C=25",
	"harmonic:k=30,r0=1.2",
}

// inspectKeys are the keys of every analysed compare row (from inspect).
var inspectKeys = []string{
	"name", "model", "params", "equilibrium_r_angstrom", "equilibrium_energy_ev", "well_depth_ev",
	"force_constant_ev_per_angstrom2", "taylor_coefficients", "reduced_mass_u",
	"harmonic_wavenumber_per_cm", "harmonic_frequency_thz", "harmonic_period_fs", "validity",
}

// compareJSON runs compare with --format json --validity and decodes the
// rows.
func compareJSON(t *testing.T, args ...string) []map[string]any {
	t.Helper()
	code, out, errOut := runCLI(t, append([]string{"compare", "--format", "json", "--validity"}, args...)...)
	require.Equal(t, 0, code, errOut)
	var rows []map[string]any
	require.NoError(t, json.Unmarshal([]byte(out), &rows), out)
	return rows
}

// requireValidityKeys checks the validity object against the contract of
// the validity command.
func requireValidityKeys(t *testing.T, row map[string]any) {
	t.Helper()
	v, ok := row["validity"].(map[string]any)
	require.True(t, ok, "%v: validity object", row["name"])
	for _, k := range []string{"truncation_order", "tolerance", "potential", "period"} {
		assert.Contains(t, v, k, "%v", row["name"])
	}
	pot, _ := v["potential"].(map[string]any)
	for _, k := range []string{"compression_angstrom", "stretch_angstrom"} {
		assert.Contains(t, pot, k, "%v: potential.%s", row["name"], k)
	}
	per, _ := v["period"].(map[string]any)
	for _, k := range []string{"energy_ev", "depth_fraction", "temperature_k", "compression_angstrom", "stretch_angstrom"} {
		assert.Contains(t, per, k, "%v: period.%s", row["name"], k)
	}
}

func TestCompareSpecsJSON(t *testing.T) {
	rows := compareJSON(t, append(fourSpecs, "--pair", "H-Cl")...)
	require.Len(t, rows, 4)
	var names []string
	for _, r := range rows {
		names = append(names, r["name"].(string))
		for _, k := range inspectKeys {
			assert.Contains(t, r, k, "%v: key %s", r["name"], k)
		}
		assert.Nil(t, r["error"])
		requireValidityKeys(t, r)
		v := r["validity"].(map[string]any)
		assert.EqualValues(t, 2, v["truncation_order"])
		assert.EqualValues(t, 0.01, v["tolerance"])
		assert.Equal(t, "H-Cl", r["pair"])
	}
	assert.Equal(t, []string{"morse", "lennard-jones", "buckingham", "harmonic"}, names, "input order")
	// The truncation V_2 of the harmonic form is the form itself: its
	// ranges are unbounded, encoded as "Infinity"; E/depth does not apply.
	h := rows[3]["validity"].(map[string]any)
	assert.Equal(t, "Infinity", h["period"].(map[string]any)["energy_ev"])
	assert.Equal(t, "Infinity", h["potential"].(map[string]any)["stretch_angstrom"])
	assert.Nil(t, h["period"].(map[string]any)["depth_fraction"])

	// --truncation and --tolerance reach the validity object.
	rows = compareJSON(t, fourSpecs[0], "--mu", "1", "--truncation", "4", "--tolerance", "0.001")
	v := rows[0]["validity"].(map[string]any)
	assert.EqualValues(t, 4, v["truncation_order"])
	assert.EqualValues(t, 0.001, v["tolerance"])
}

// TestCompareMorseClosedForm checks the Morse row against closed forms.
func TestCompareMorseClosedForm(t *testing.T) {
	const De, a, re, tol = 4.6, 1.87, 1.27, 0.01
	rows := compareJSON(t, fmt.Sprintf("morse:De=%g,a=%g,re=%g", De, a, re), "--mu", "1")
	per := rows[0]["validity"].(map[string]any)["period"].(map[string]any)
	// Morse: T(E) = T0/√(1 − E/De) (closed form, standard result; from
	// memory), so |T0/T − 1| = 1 − √(1 − E/De) ≤ τ up to
	// E/De = 1 − (1 − τ)².
	f := 1 - (1-tol)*(1-tol)
	assert.InEpsilon(t, f, per["depth_fraction"], 1e-9)
	assert.InEpsilon(t, f*De, per["energy_ev"], 1e-9)
	// Temperature E/k_B, k_B = 8.617333262e-5 eV/K (CODATA 2018).
	assert.InEpsilon(t, f*De/8.617333262e-5, per["temperature_k"], 1e-9)
	// Morse turning points x± = −ln(1 ∓ √(E/De))/a (closed form, from
	// memory).
	assert.InEpsilon(t, math.Log(1+math.Sqrt(f))/a, per["compression_angstrom"], 1e-9)
	assert.InEpsilon(t, -math.Log(1-math.Sqrt(f))/a, per["stretch_angstrom"], 1e-9)
	// Potential criterion to leading order: |V_2 − V|/(V − V(re)) ≈
	// |c3/c2|·s = a·s for Morse (c2 = De·a², c3 = −De·a³), so s ≈ τ/a on
	// both sides, up to O(s²) corrections of a few per cent here.
	pot := rows[0]["validity"].(map[string]any)["potential"].(map[string]any)
	assert.InEpsilon(t, tol/a, pot["stretch_angstrom"], 0.03)
	assert.InEpsilon(t, tol/a, pot["compression_angstrom"], 0.03)
}

func TestCompareMatch(t *testing.T) {
	rows := compareJSON(t, "--match", "re=1.2,De=4,k=30", "--mu", "7")
	require.Len(t, rows, 4)
	byModel := map[string]map[string]any{}
	for _, r := range rows {
		for _, k := range inspectKeys {
			assert.Contains(t, r, k, "%v: key %s", r["name"], k)
		}
		requireValidityKeys(t, r)
		byModel[r["model"].(string)] = r
		assert.Equal(t, "matched-"+r["model"].(string), r["name"])
		assert.InEpsilon(t, 1.2, r["equilibrium_r_angstrom"], 1e-12, "%v: re honoured", r["name"])
		assert.EqualValues(t, 7, r["reduced_mass_u"])
	}
	// Morse, Buckingham and harmonic honour k exactly.
	for _, m := range []string{"morse", "buckingham", "harmonic"} {
		assert.InEpsilon(t, 30, byModel[m]["force_constant_ev_per_angstrom2"], 1e-9, m)
	}
	for _, m := range []string{"morse", "lennard-jones", "buckingham"} {
		assert.InEpsilon(t, 4, byModel[m]["well_depth_ev"], 1e-9, m)
	}
	// Lennard-Jones from (re, De): k = 72ε/re² (closed form) = 200 eV/Å²,
	// and a note gives the mismatch.
	lj := byModel["lennard-jones"]
	assert.InEpsilon(t, 72*4/(1.2*1.2), lj["force_constant_ev_per_angstrom2"], 1e-9)
	require.Contains(t, lj, "notes")
	assert.Contains(t, fmt.Sprint(lj["notes"]), "+567%")
	assert.Contains(t, fmt.Sprint(byModel["harmonic"]["notes"]), "De =")
	// Morse matched exactly: a = √(k/(2De)) (closed form).
	p := byModel["morse"]["params"].(map[string]any)
	assert.InEpsilon(t, math.Sqrt(30/8.0), p["a"], 1e-12)

	// Units: 120 pm, 4 eV and k in N/m give the same target; 1 eV/Å² =
	// 16.02176634 N/m (e = 1.602176634e-19 C, exact).
	rows2 := compareJSON(t, "--match", "re=120pm,De=4eV,k=480.6529902N/m", "--mu", "7")
	for i := range rows {
		assert.InEpsilon(t, rows[i]["harmonic_wavenumber_per_cm"], rows2[i]["harmonic_wavenumber_per_cm"], 1e-9)
	}

	// SPECs are compared alongside, before the matched forms.
	rows = compareJSON(t, "--match", "re=1.2,De=4,k=30", "--mu", "7", fourSpecs[0])
	require.Len(t, rows, 5)
	assert.Equal(t, "morse", rows[0]["name"])
	assert.Equal(t, "matched-morse", rows[1]["name"])
}

// TestCompareMatchRowErrors checks that forms that cannot reach the target
// get an error in their row, not a crash of the comparison.
func TestCompareMatchRowErrors(t *testing.T) {
	// Without k, Morse, Buckingham and harmonic cannot be matched;
	// Lennard-Jones can, from (re, De).
	rows := compareJSON(t, "--match", "re=1.2,De=4", "--mu", "7")
	require.Len(t, rows, 4)
	for _, r := range rows {
		if r["model"] == "lennard-jones" {
			assert.Nil(t, r["error"])
			requireValidityKeys(t, r)
			continue
		}
		assert.Contains(t, r["error"], "cannot match", r["name"])
		assert.NotContains(t, r, "validity", r["name"])
		assert.NotContains(t, r, "equilibrium_r_angstrom", r["name"])
		assert.Contains(t, r, "model")
	}
	// The table shows the error as a footnote, CSV in the error column.
	code, out, _ := runCLI(t, "compare", "--match", "re=1.2,De=4", "--mu", "7")
	require.Equal(t, 0, code)
	assert.Contains(t, out, "matched-morse: error: cannot match")
	code, out, _ = runCLI(t, "compare", "--match", "re=1.2,De=4", "--mu", "7", "--format", "csv")
	require.Equal(t, 0, code)
	assert.Contains(t, out, ",\"cannot match: morse:")
	assert.Equal(t, 5, strings.Count(out, "\n"), "header and four rows")

	// A target so stiff that Buckingham's A overflows: only that row fails.
	rows = compareJSON(t, "--match", "re=3,De=0.01,k=100", "--mu", "7")
	for _, r := range rows {
		if r["model"] == "buckingham" {
			assert.NotNil(t, r["error"])
		} else {
			assert.Nil(t, r["error"], r["name"])
		}
	}
}

func TestCompareSet(t *testing.T) {
	dir := t.TempDir()
	path := filepath.Join(dir, "set.toml")
	// Invented numbers for the test, not fitted to any molecule.
	require.NoError(t, os.WriteFile(path, []byte(`
title = "test set (invented numbers)"

[[entry]]
name  = "morse-a"
model = "morse"
pair  = "1H-35Cl"
[entry.params]
De = "4.6 eV"
a  = 1.87
re = "127 pm"

[[entry]]
name = "lj-b"
spec = "lj:epsilon=0.5,sigma=1.1"
mu   = 0.98

[[entry]]
name = "harm-c"
spec = "harmonic:k=30,r0=1.2"
`), 0o644))
	rows := compareJSON(t, "--set", path, "--mu", "3", fourSpecs[0])
	require.Len(t, rows, 4)
	want := []struct {
		name string
		mu   float64
	}{
		{"morse-a", 0.979593}, // its own pair, 1H-35Cl (AME2020 masses)
		{"lj-b", 0.98},        // its own mu
		{"harm-c", 3},         // no mass in the file: --mu
		{"morse", 3},          // a SPEC: --mu
	}
	for i, w := range want {
		assert.Equal(t, w.name, rows[i]["name"])
		assert.InEpsilon(t, w.mu, rows[i]["reduced_mass_u"], 1e-5, w.name)
		requireValidityKeys(t, rows[i])
	}
	assert.Equal(t, "1H-35Cl", rows[0]["pair"])
	assert.InEpsilon(t, 1.27, rows[0]["equilibrium_r_angstrom"], 1e-12, "units in the file")

	// Without a command-line mass the entry without one is an error.
	code, out, errOut := runCLI(t, "compare", "--set", path)
	assert.Equal(t, 2, code)
	assert.Empty(t, out)
	assert.Contains(t, errOut, "harm-c")
}

func TestCompareBadInput(t *testing.T) {
	dir := t.TempDir()
	bad := filepath.Join(dir, "bad.toml")
	require.NoError(t, os.WriteFile(bad, []byte("[[entry]]\nname = \"x\"\nspec = \"morse:De=-1,a=1,re=1\"\n"), 0o644))
	typo := filepath.Join(dir, "typo.toml")
	require.NoError(t, os.WriteFile(typo, []byte("[[entry]]\nname = \"x\"\nspek = \"morse:De=1,a=1,re=1\"\n"), 0o644))
	m := fourSpecs[0]
	tests := []struct {
		name    string
		args    []string
		code    int
		mention string
	}{
		{"nothing to compare", []string{"compare", "--mu", "1"}, 2, "SPEC"},
		{"no mass", []string{"compare", m}, 2, "reduced mass"},
		{"bad spec", []string{"compare", "morse:De=1", "--mu", "1"}, 2, "missing"},
		{"order", []string{"compare", m, "--mu", "1", "--truncation", "5"}, 2, "--truncation"},
		{"tolerance", []string{"compare", m, "--mu", "1", "--tolerance", "0"}, 2, "--tolerance"},
		{"tolerance ≥ 1", []string{"compare", m, "--mu", "1", "--tolerance", "1"}, 2, "--tolerance"},
		{"match syntax", []string{"compare", "--match", "re:1.2", "--mu", "1"}, 2, "NAME=VALUE"},
		{"match quantity", []string{"compare", "--match", "re=1.2,x=3", "--mu", "1"}, 2, "unknown quantity"},
		{"match twice", []string{"compare", "--match", "re=1.2,re=1.3", "--mu", "1"}, 2, "twice"},
		{"match unit", []string{"compare", "--match", "re=1.2eV,De=4,k=30", "--mu", "1"}, 2, "re"},
		{"match negative", []string{"compare", "--match", "re=1.2,De=-4,k=30", "--mu", "1"}, 2, "De"},
		{"match unreachable", []string{"compare", "--match", "re=1.2", "--mu", "1"}, 2, "no form could be compared"},
		{"no minimum", []string{"compare", "buckingham:A=1000,rho=0.3,C=0", "--mu", "1"}, 2, "minimum"},
		{"missing set", []string{"compare", "--set", filepath.Join(dir, "none.toml"), "--mu", "1"}, 2, "none.toml"},
		{"bad set entry", []string{"compare", "--set", bad, "--mu", "1"}, 2, "De"},
		{"set typo", []string{"compare", "--set", typo, "--mu", "1"}, 2, "spek"},
	}
	for _, tt := range tests {
		code, out, errOut := runCLI(t, tt.args...)
		assert.Equal(t, tt.code, code, tt.name)
		assert.Empty(t, out, tt.name)
		assert.Equal(t, 1, strings.Count(errOut, "\n"), "%s: one line: %q", tt.name, errOut)
		assert.Contains(t, errOut, tt.mention, tt.name)
	}
}

// TestCompareDeterministic runs a comparison of many forms, which the
// worker pool computes in parallel, and checks that the rows come in input
// order and that repeated runs give the same bytes.
func TestCompareDeterministic(t *testing.T) {
	var args []string
	for i := range 40 {
		args = append(args, fmt.Sprintf("morse:De=4,a=%g,re=1.2", 1+0.05*float64(i)))
	}
	args = append(args, "--mu", "7", "--format", "json")
	_, first, _ := runCLI(t, append([]string{"compare"}, args...)...)
	var rows []map[string]any
	require.NoError(t, json.Unmarshal([]byte(first), &rows))
	require.Len(t, rows, 40)
	for i, r := range rows {
		want := "morse"
		if i > 0 {
			want = fmt.Sprintf("morse-%d", i+1)
		}
		assert.Equal(t, want, r["name"])
		assert.InEpsilon(t, 1+0.05*float64(i), r["params"].(map[string]any)["a"], 1e-12)
	}
	for range 3 {
		_, again, _ := runCLI(t, append([]string{"compare"}, args...)...)
		require.Equal(t, first, again)
	}
}

func TestCompareTable(t *testing.T) {
	code, out, _ := runCLI(t, append([]string{"compare", "--pair", "H-Cl", "--validity"}, fourSpecs...)...)
	require.Equal(t, 0, code)
	for _, s := range []string{"name", "re [Å]", "c3", "wavenumber [cm⁻¹]", "T_n E [eV]", "E/k_B [K]", "Validity of the Taylor potential V_2 at 1 %"} {
		assert.Contains(t, out, s)
	}
	code, out, _ = runCLI(t, append([]string{"compare", "--pair", "H-Cl", "--format", "csv", "--validity"}, fourSpecs...)...)
	require.Equal(t, 0, code)
	lines := strings.Split(strings.TrimSpace(out), "\n")
	require.Len(t, lines, 5)
	assert.True(t, strings.HasPrefix(lines[0], "name,model,origin,params,equilibrium_r_angstrom,"), lines[0])
	assert.Contains(t, lines[4], "Infinity", "harmonic ranges are unbounded")
	assert.NotContains(t, out, "Validity of", "no legend in CSV")
}

// BenchmarkCompareFour is the comparison of the four built-in forms matched
// to one well, with validity ranges, in process: everything but the
// process start-up.
func BenchmarkCompareFour(b *testing.B) {
	args := []string{"compare", "--match", "re=1.2,De=4,k=30", "--mu", "7", "--format", "json"}
	for b.Loop() {
		var out, errOut strings.Builder
		if code := run(args, strings.NewReader(""), &out, &errOut); code != 0 {
			b.Fatal(errOut.String())
		}
	}
}

// BenchmarkCompareFourSpecs is BenchmarkCompareFour on the four specs of
// the other tests.
func BenchmarkCompareFourSpecs(b *testing.B) {
	args := append([]string{"compare", "--pair", "H-Cl", "--format", "json"}, fourSpecs...)
	for b.Loop() {
		var out, errOut strings.Builder
		if code := run(args, strings.NewReader(""), &out, &errOut); code != 0 {
			b.Fatal(errOut.String())
		}
	}
}
