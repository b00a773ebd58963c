package main

import (
	"encoding/json"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"runtime"
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// Tests of issue 17: one consistent interface across commands.

func TestPairsAllElements(t *testing.T) {
	for _, pair := range []string{"Au-Au", "Pt-O", "Cs-Cl", "63Cu-63Cu", "H-CL", "h-cl"} {
		code, out, errOut := runCLI(t, "inspect", "morse:De=2.3,a=1.5,re=2.5", "--pair", pair)
		assert.Equal(t, 0, code, "%s: %s", pair, errOut)
		assert.Contains(t, out, "reduced mass", pair)
	}
	code, _, errOut := runCLI(t, "inspect", "morse:De=4.6,a=1.87,re=1.27", "--pair", "HCl")
	assert.Equal(t, 2, code)
	assert.Contains(t, errOut, "did you mean H-Cl?")
}

func TestBrokenPathPluginIsAWarning(t *testing.T) {
	requirePlugins(t)
	dir := t.TempDir()
	require.NoError(t, os.Symlink(pluginBin.rydberg, filepath.Join(dir, "pairwell-plugin-rydberg")))
	broken := filepath.Join(dir, "pairwell-plugin-broken")
	require.NoError(t, os.WriteFile(broken, []byte("#!/bin/sh\necho 'no such library' >&2\nexit 3\n"), 0o755))
	t.Setenv(envPluginPath, dir)

	// A built-in form and the working plugin's form still work; the
	// broken plugin is named in a warning.
	for _, spec := range []string{"morse:De=4.6,a=1.87,re=1.27", rydbergSpec} {
		code, out, errOut := runPlugins(t, "inspect", spec)
		assert.Equal(t, 0, code, "%s: %s", spec, errOut)
		assert.Contains(t, out, "equilibrium")
		assert.Contains(t, errOut, "warning: plugin "+broken+" (found through PAIRWELL_PLUGIN_PATH) failed to start")
		assert.Equal(t, 1, strings.Count(errOut, "\n"), errOut)
	}
	// A form nobody serves: the broken plugin may serve it, so the error
	// names it and is a plugin failure (exit 1).
	code, _, errOut := runPlugins(t, "inspect", "buckingam:A=1,rho=0.3,C=1")
	assert.Equal(t, exitFailure, code)
	assert.Contains(t, errOut, `unknown model "buckingam" (did you mean buckingham?)`)
	assert.Contains(t, errOut, "it may be served by a plugin that failed to start: plugin "+broken)

	// Named explicitly, the same plugin stops the invocation.
	t.Setenv(envPluginPath, "")
	code, _, errOut = runPlugins(t, "--plugin", broken, "inspect", "morse:De=4.6,a=1.87,re=1.27")
	assert.Equal(t, exitFailure, code)
	assert.Contains(t, errOut, broken)
	assert.NotContains(t, errOut, "warning")
}

// TestTolerancesEverywhere: every --tolerance takes a fraction or a
// percentage, with the same message for a bad one.
func TestTolerancesEverywhere(t *testing.T) {
	morse := "morse:De=4.6,a=1.87,re=1.27" // invented, HCl-sized
	dir := t.TempDir()
	set := filepath.Join(dir, "set.toml")
	require.NoError(t, os.WriteFile(set, []byte("[[entry]]\nname = \"a\"\nspec = \""+morse+"\"\n"), 0o644))
	cmds := map[string][]string{
		"validity": {"validity", morse},
		"compare":  {"compare", morse, "--mu", "1"},
		"plot":     {"plot", "taylor", morse, "-o", filepath.Join(dir, "t.png")},
		"baseline": {"baseline", "record", "--set", set, "-o", filepath.Join(dir, "b.json")},
	}
	for name, args := range cmds {
		for _, tol := range []string{"0.01", "1%", "0.5 %"} {
			code, _, errOut := runCLI(t, append(args, "--tolerance", tol)...)
			assert.Equal(t, 0, code, "%s --tolerance %s: %s", name, tol, errOut)
		}
		code, _, errOut := runCLI(t, append(args, "--tolerance", "1x")...)
		assert.Equal(t, 2, code, name)
		assert.Contains(t, errOut, `"1x" is not a number (e.g. 0.01 or 1%)`, name)
		assert.NotContains(t, errOut, "strconv", name)
		code, _, errOut = runCLI(t, append(args, "--tolerance", "150%")...)
		assert.Equal(t, 2, code, name)
		assert.Contains(t, errOut, "must be between 0 and 1", name)
	}
	// The percentage reaches the computation: compare's JSON echoes it.
	code, out, errOut := runCLI(t, "compare", morse, "--mu", "1", "--tolerance", "0.1%", "--format", "json")
	require.Equal(t, 0, code, errOut)
	assert.Contains(t, out, `"tolerance": 0.001`)
}

// TestOrderFlags: --coefficients is what inspect shows, --truncation the
// order of a truncated Taylor potential; the old --order still works with
// a warning on stderr, never on stdout.
func TestOrderFlags(t *testing.T) {
	morse := "morse:De=4.6,a=1.87,re=1.27" // invented, HCl-sized
	code, out, errOut := runCLI(t, "inspect", morse, "--coefficients", "6", "--format", "json")
	require.Equal(t, 0, code, errOut)
	var got struct {
		Taylor []float64 `json:"taylor_coefficients"`
	}
	require.NoError(t, json.Unmarshal([]byte(out), &got))
	require.Len(t, got.Taylor, 7) // c0 … c6
	// c6 = De(−a)⁶(2⁶ − 2)/6! (Morse 1929) = 16.9381768883466761…
	// (mpmath, 40 digits).
	assert.InEpsilon(t, 16.938176888346676, got.Taylor[6], 1e-14)
	code, out2, errOut := runCLI(t, "inspect", morse, "--order", "6", "--format", "json")
	require.Equal(t, 0, code, errOut)
	assert.Equal(t, out, out2)
	assert.Contains(t, errOut, "warning: --order is deprecated: use --coefficients")
	for _, args := range [][]string{{"validity", morse}, {"compare", morse, "--mu", "1"}} {
		code, _, errOut := runCLI(t, append(args, "--truncation", "3")...)
		assert.Equal(t, 0, code, "%v: %s", args, errOut)
		code, _, errOut = runCLI(t, append(args, "--order", "3")...)
		assert.Equal(t, 0, code, "%v: %s", args, errOut)
		assert.Contains(t, errOut, "use --truncation", args)
	}
	code, _, errOut = runCLI(t, "inspect", morse, "--truncation", "3")
	assert.Equal(t, 2, code)
	assert.Contains(t, errOut, "unknown flag: --truncation")
}

// TestCaseInsensitive: formats, methods, element symbols and unambiguous
// unit names ignoring case.
func TestCaseInsensitive(t *testing.T) {
	morse := "morse:De=4.6,a=1.87,re=1.27" // invented, HCl-sized
	code, out, errOut := runCLI(t, "inspect", morse, "--format", "JSON", "--pair", "H-CL")
	require.Equal(t, 0, code, errOut)
	assert.True(t, strings.HasPrefix(out, "{"))
	code, _, errOut = runCLI(t, "motion", morse, "--pair", "h-cl", "--amplitude", "0.1", "--method", "Verlet", "--periods", "2")
	assert.Equal(t, 0, code, errOut)
	// 120 K·k_B in kJ/mol and in kj/mol are the same ε.
	_, a, _ := runCLI(t, "inspect", "lj:epsilon=0.9977kJ/mol,sigma=3.4", "--format", "json")
	_, b, errOut := runCLI(t, "inspect", "lj:epsilon=0.9977kj/mol,sigma=3.4", "--format", "json")
	var ja, jb map[string]any
	require.NoError(t, json.Unmarshal([]byte(a), &ja))
	require.NoError(t, json.Unmarshal([]byte(b), &jb), errOut)
	delete(ja, "name") // the spec as written
	delete(jb, "name")
	assert.Equal(t, ja, jb)
	code, _, errOut = runCLI(t, "inspect", "lj:epsilon=10MEV,sigma=3.4")
	assert.Equal(t, 2, code)
	assert.Contains(t, errOut, "MeV or meV")
	code, _, errOut = runCLI(t, "inspect", morse, "--format", "jsn")
	assert.Equal(t, 2, code)
	assert.Contains(t, errOut, `--format "jsn" (did you mean json?): allowed: table, json, csv`)
}

// TestMessagesDoNotMislead: the examples of issue 17.
func TestMessagesDoNotMislead(t *testing.T) {
	tests := []struct {
		args    []string
		contain string
		not     string
	}{
		{[]string{"inspect", "lj:epsilon=0.01,sigma=3.4Angstroms"}, "did you mean angstrom?", ""},
		{[]string{"inspect", "morse:De=4.6 a=1.87 re=1.27"}, "separate the parameters with commas, e.g. De=4.6,a=1.87,re=1.27", "unknown unit"},
		{[]string{"plot", "taylr", "x", "-o", "a.png"}, `unknown command "taylr" for "pairwell plot" (did you mean taylor?)`, "shorthand"},
		{[]string{"inspct", "x"}, `unknown command "inspct" for "pairwell" (did you mean inspect?)`, "\n\n"},
		{[]string{"inspect", "mrose:De=1,a=1,re=1"}, `unknown model "mrose" (did you mean morse?)`, ""},
		{[]string{"inspect", "morse:De=4.6,a=1.87,r0=1.27"}, `no parameter "r0" (did you mean re?)`, ""},
		{[]string{"inspect", "morse:De=4.6,a=1.87,re=1.27", "--pair", "HCl"}, "did you mean H-Cl?", ""},
		{[]string{"inspect", "morse:De=4.6,a=1.87,re=1.27", "--pair", "H-Clx"}, "did you mean Cl?", ""},
		{[]string{"validity", "morse:De=4.6,a=1.87,re=1.27", "--tolerence", "1%"}, "did you mean --tolerance?", ""},
		{[]string{"baseline", "recrd"}, "did you mean record?", ""},
	}
	for _, tt := range tests {
		code, _, errOut := runCLI(t, tt.args...)
		assert.Equal(t, 2, code, "%v", tt.args)
		assert.Contains(t, errOut, tt.contain, "%v", tt.args)
		if tt.not != "" {
			assert.NotContains(t, errOut, tt.not, "%v", tt.args)
		}
		assert.Equal(t, 1, strings.Count(errOut, "\n"), "one line: %q", errOut)
	}
}

func TestVersion(t *testing.T) {
	code, out, errOut := runCLI(t, "version", "--format", "json")
	require.Equal(t, 0, code, errOut)
	var v map[string]any
	require.NoError(t, json.Unmarshal([]byte(out), &v))
	for _, k := range []string{"module", "version", "commit", "modified", "go"} {
		assert.Contains(t, v, k)
	}
	assert.Equal(t, "github.com/pairwell/pairwell", v["module"])
	assert.Equal(t, runtime.Version(), v["go"])
	code, out, _ = runCLI(t, "--version")
	assert.Equal(t, 0, code)
	assert.True(t, strings.HasPrefix(out, "pairwell "), out)
	code, out, _ = runCLI(t, "version", "--format", "csv")
	assert.Equal(t, 0, code)
	assert.True(t, strings.HasPrefix(out, "module,version,commit,modified,go\n"), out)
	assert.Equal(t, 2, strings.Count(out, "\n"))
}

// TestCompareValidityOnlyWhenAsked: compare computes the validity ranges
// (about 0.1 ms per form at order 2) only with --validity, --truncation or
// --tolerance; without, the JSON key is null and the table columns do not
// appear.
func TestCompareValidityOnlyWhenAsked(t *testing.T) {
	morse := "morse:De=4.6,a=1.87,re=1.27" // invented, HCl-sized
	code, out, errOut := runCLI(t, "compare", morse, "--mu", "1", "--format", "json")
	require.Equal(t, 0, code, errOut)
	assert.Contains(t, out, `"validity": null`)
	code, out, errOut = runCLI(t, "compare", morse, "--mu", "1")
	require.Equal(t, 0, code, errOut)
	assert.NotContains(t, out, "V_n")
	for _, flag := range [][]string{{"--validity"}, {"--truncation", "3"}, {"--tolerance", "2%"}} {
		code, out, errOut = runCLI(t, append([]string{"compare", morse, "--mu", "1", "--format", "json"}, flag...)...)
		require.Equal(t, 0, code, errOut)
		assert.Contains(t, out, `"validity"`, flag)
	}
}

// TestInspectBatch: many SPECs and --set give one record per form, in input
// order, as a JSON array, CSV rows whose header is the JSON keys, or a
// table; a form without a minimum is a record with its error.
func TestInspectBatch(t *testing.T) {
	dir := t.TempDir()
	set := filepath.Join(dir, "set.toml")
	require.NoError(t, os.WriteFile(set, []byte(`
[[entry]]
name = "bond"
spec = "morse:De=4.6,a=1.87,re=1.27"
pair = "1H-35Cl"
`), 0o644))
	specs := []string{"lj:epsilon=120K,sigma=3.4", "buckingham:A=1500,rho=0.3,C=25", "buckingham:A=1,rho=0.3,C=25"}
	args := append([]string{"inspect", "--set", set, "--mu", "20"}, specs...)

	code, out, errOut := runCLI(t, append(args, "--format", "json")...)
	require.Equal(t, 0, code, errOut)
	var recs []map[string]any
	require.NoError(t, json.Unmarshal([]byte(out), &recs), out)
	require.Len(t, recs, 4)
	assert.Equal(t, "bond", recs[0]["name"])
	assert.Equal(t, "1H-35Cl", recs[0]["pair"]) // the entry's own mass
	assert.Equal(t, specs[0], recs[1]["name"])
	assert.InDelta(t, 20, recs[1]["reduced_mass_u"], 1e-12)
	assert.Equal(t, "buckingham", recs[3]["model"])
	assert.Contains(t, recs[3]["error"], "minimum")
	// The single inspect object and a batch record have the same keys.
	_, one, _ := runCLI(t, "inspect", specs[0], "--mu", "20", "--format", "json")
	var obj map[string]any
	require.NoError(t, json.Unmarshal([]byte(one), &obj))
	for k := range obj {
		assert.Contains(t, recs[1], k)
	}

	code, out, errOut = runCLI(t, append(args, "--format", "csv")...)
	require.Equal(t, 0, code, errOut)
	lines := strings.Split(strings.TrimSpace(out), "\n")
	require.Len(t, lines, 5)
	header := strings.Split(lines[0], ",")
	assert.Equal(t, inspectCSVKeys, header)
	// Every CSV column is a JSON key (nested ones joined by a dot).
	for _, k := range header {
		top, sub, nested := strings.Cut(k, ".")
		if k == "error" || k == "barrier.r_angstrom" || k == "barrier.energy_ev" || k == "pair" {
			continue // present only where they apply
		}
		assert.Contains(t, recs[1], top, k)
		_ = sub
		_ = nested
	}
	assert.Contains(t, lines[1], "bond,morse,built-in,De=4.6 a=1.87 re=1.27,1.27,")
	// One spec alone in CSV: one header and one row, no vertical list.
	code, out, _ = runCLI(t, "inspect", specs[0], "--format", "csv")
	require.Equal(t, 0, code)
	assert.Equal(t, 2, strings.Count(out, "\n"), out)

	code, out, errOut = runCLI(t, args...)
	require.Equal(t, 0, code, errOut)
	assert.Contains(t, out, "name")
	assert.Contains(t, out, "[1] buckingham:A=1,rho=0.3,C=25:")

	// Every form failing is an error.
	code, _, _ = runCLI(t, "inspect", specs[2], specs[2])
	assert.Equal(t, 2, code)
}

// countingWriter counts the calls to Write.
type countingWriter struct{ n int }

func (c *countingWriter) Write(p []byte) (int, error) { c.n++; return len(p), nil }

// TestOutputIsBuffered: a table of 2000 rows reaches stdout in a few large
// writes, not one per cell (issue 17: 131 098 writes for 10 000 rows).
func TestOutputIsBuffered(t *testing.T) {
	args := []string{"inspect", "--mu", "1"}
	for i := range 2000 {
		args = append(args, fmt.Sprintf("morse:De=%g,a=1.87,re=1.27", 1+float64(i)/1000))
	}
	for _, format := range []string{"table", "csv", "json"} {
		var w countingWriter
		var errOut strings.Builder
		code := run(append(args, "--format", format), strings.NewReader(""), &w, &errOut)
		require.Equal(t, 0, code, errOut.String())
		assert.Less(t, w.n, 100, format)
	}
}

// BenchmarkInspectBatch is inspect of 10 000 Morse forms in-process, CSV to
// a discarding writer (the target, whole process, is 0.5 s).
func BenchmarkInspectBatch(b *testing.B) {
	args := []string{"inspect", "--mu", "1", "--format", "csv"}
	for i := range 10000 {
		args = append(args, fmt.Sprintf("morse:De=%g,a=1.87,re=1.27", 1+float64(i)/10000))
	}
	for b.Loop() {
		var errOut strings.Builder
		if code := run(args, strings.NewReader(""), io.Discard, &errOut); code != 0 {
			b.Fatal(errOut.String())
		}
	}
}

// TestEnergyUnitTables: --energy-unit converts the energies of inspect and
// compare tables; JSON stays in eV. ε = 120 K·k_B (CODATA 2018 k_B).
func TestEnergyUnitTables(t *testing.T) {
	lj := "lj:epsilon=120K,sigma=3.4" // argon-sized, illustrative
	code, out, errOut := runCLI(t, "inspect", lj, "--energy-unit", "k")
	require.Equal(t, 0, code, errOut)
	assert.Regexp(t, `well depth V\(∞\) − V\(re\)\s+120\s+K\n`, out)
	assert.Regexp(t, `force constant k = V″\(re\)\s+\S+\s+K/Å²`, out)
	code, out, _ = runCLI(t, "inspect", lj, "--energy-unit", "K", "--format", "json")
	require.Equal(t, 0, code)
	assert.Contains(t, out, `"well_depth_ev": 0.01034079`)
	code, out, errOut = runCLI(t, "compare", lj, "--mu", "20", "--energy-unit", "kcal/mol")
	require.Equal(t, 0, code, errOut)
	assert.Contains(t, out, "depth [kcal/mol]")
	assert.Contains(t, out, "0.238") // 120 K·k_B·N_A = 0.2385 kcal/mol
	code, _, errOut = runCLI(t, "inspect", lj, "--energy-unit", "furlong")
	assert.Equal(t, 2, code)
	assert.Contains(t, errOut, "allowed: eV, meV, K, kcal/mol, kJ/mol, cm-1, hartree")
}

// TestEnergyUnitEveryTable: every command whose table shows energies
// converts them; the value is the JSON's (eV) in the unit (1 meV = 1e-3 eV,
// SI prefix; 120 K·k_B = 0.0103408 eV, CODATA 2018 k_B).
func TestEnergyUnitEveryTable(t *testing.T) {
	morse := "morse:De=4.6,a=1.87,re=1.27" // invented, HCl-sized
	lj := "lj:epsilon=120K,sigma=3.4"      // argon-sized, illustrative
	tests := []struct {
		args []string
		want string // a regexp on the table in meV
	}{
		// E = V(re + 0.2) − V(re) = De(1 − e^{−0.374})² = 447.848675 meV (the JSON's energy_ev).
		{[]string{"motion", morse, "--pair", "H-Cl", "--amplitude", "0.2", "--periods", "2"}, `oscillation energy E\s+447\.848675\s+meV`},
		// E/De = 1 − 0.99² = 0.0199 at 1 % (validity of Morse, README): E = 91.54 meV.
		{[]string{"validity", morse}, `largest energy E above V\(re\)\s+91\.54\s+meV`},
		{[]string{"period", morse, "--pair", "H-Cl", "--amplitudes", "0.1"}, `energy \[meV\][\s\S]*\n0\.1\s+133\.811\s`},
		{[]string{"mix", lj, lj, "--all-rules"}, `depth \[meV\][\s\S]*\s10\.3408\s`},
		{[]string{"fit", filepath.Join("demodata", "invented-scan.csv"), "--form", "morse"}, `RMSE \[meV\]`},
		// D0 = De − ZPE = 4.6 eV − 1478.768 cm⁻¹ (levels JSON d0_ev 4.41665614 eV).
		{[]string{"levels", morse, "--pair", "H-Cl", "--v-max", "1", "--j-max", "0"}, `D0 = depth − ZPE\s+4416\.656\d*\s+meV`},
		{[]string{"inspect", lj, morse}, `depth \[meV\][\s\S]*\s10\.3408\s`},
		{[]string{"demo", "--no-pictures"}, `depth \[meV\]`},
	}
	for _, tt := range tests {
		code, out, errOut := runCLI(t, append(tt.args, "--energy-unit", "meV")...)
		require.Equal(t, 0, code, "%v: %s", tt.args, errOut)
		assert.Regexp(t, tt.want, out, tt.args)
	}
}
