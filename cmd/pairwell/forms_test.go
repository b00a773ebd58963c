package main

import (
	"encoding/json"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// formulaForms declares the four built-in forms as formulas (Morse 1929,
// Lennard-Jones 1924, Buckingham 1938, harmonic), with the built-ins'
// parameter names, and a Varshni form (Y. P. Varshni, Rev. Mod. Phys. 29,
// 664 (1957)). It starts with an empty line: the tests name its forms by
// FILE:LINE.
var formulaForms = "\n" + formTOML("fmorse", morseFormula, "", morseParams...) + "\n" +
	formTOML("flj", ljFormula, "", ljParams...) + "\n" +
	formTOML("fbuck", "A*exp(-r/rho) - C/r^6", "", formParam{"A", "eV", "> 0"}, formParam{"rho", "A", "> 0"}, formParam{"C", "eV*A^6", ">= 0"}) + "\n" +
	formTOML("fharm", "0.5*k*(r - r0)^2", `limit = "none"`, formParam{"k", "eV/A^2", "> 0"}, formParam{"r0", "A", "> 0"}) + "\n" +
	formTOML("varshni", "De*(1 - (re/r)*exp(-beta*(r^2 - re^2)))^2 - De", `reference = "Y. P. Varshni, Rev. Mod. Phys. 29, 664 (1957)"`,
		formParam{"De", "eV", "> 0"}, formParam{"re", "A", "> 0"}, formParam{"beta", "1/A^2", "> 0"})

// fourFormulaSpecs are fourSpecs with the formula forms.
var fourFormulaSpecs = []string{
	"fmorse:De=4.6,a=1.87,re=1.27",
	"flj:epsilon=120K,sigma=3.4",
	"fbuck:A=1500,rho=0.3,C=25",
	"fharm:k=30,r0=1.2",
}

func writeForms(t testing.TB, doc string) string {
	t.Helper()
	path := filepath.Join(t.TempDir(), "forms.toml")
	require.NoError(t, os.WriteFile(path, []byte(doc), 0o644))
	return path
}

// Every command works on formula forms; compare of the four formula forms
// gives the built-ins' rows (the compiled formulas agree with the closed
// forms to 1e-13, see core/formula).
func TestFormsEveryCommand(t *testing.T) {
	forms := writeForms(t, formulaForms)
	const v = "varshni:De=4.6,re=1.27,beta=0.5"
	for _, args := range [][]string{
		{"models"},
		{"inspect", v, "--pair", "H-Cl", "--order", "8"},
		{"compare", v, "fmorse:De=4.6,a=1.87,re=1.27", "--pair", "H-Cl"},
		{"motion", v, "--pair", "H-Cl", "--amplitude", "0.2"},
		{"period", v, "--pair", "H-Cl", "--amplitudes", "0.05:0.5:4"},
		{"validity", v, "--order", "4"},
		{"check", v, "flj:epsilon=0.0104,sigma=3.4", "fbuck:A=1500,rho=0.3,C=25", "fharm:k=30,r0=1.2"},
		{"plot", "taylor", v, "-o", filepath.Join(t.TempDir(), "t.png")},
		{"plot", "compare", v, "fmorse:De=4.6,a=1.87,re=1.27", "-o", filepath.Join(t.TempDir(), "c.svg")},
	} {
		code, _, errOut := runCLI(t, append([]string{"--forms", forms}, args...)...)
		assert.Equal(t, 0, code, "%v: %s", args, errOut)
	}
	rows := compareJSON(t, append([]string{"--forms", forms, "--pair", "H-Cl"}, fourFormulaSpecs...)...)
	want := compareJSON(t, append([]string{"--pair", "H-Cl"}, fourSpecs...)...)
	require.Len(t, rows, 4)
	for i := range rows {
		for _, k := range []string{"equilibrium_r_angstrom", "force_constant_ev_per_angstrom2"} {
			g, w := rows[i][k].(float64), want[i][k].(float64)
			assert.InDelta(t, w, g, 1e-12*math.Abs(w), "%s %s", fourFormulaSpecs[i], k)
		}
	}
}

// Baselines record and verify sets that declare their own forms.
func TestFormsInModelSetAndBaseline(t *testing.T) {
	dir := t.TempDir()
	set := writeSet(t, dir, formulaForms+`
[defaults]
pair = "H-Cl"
[[entry]]
name = "v"
spec = "varshni:De=4.6,re=1.27,beta=0.5"
[[entry]]
name = "m"
model = "fmorse"
[entry.params]
De = "106 kcal/mol"
a = 1.87
re = "127 pm"
`)
	b := filepath.Join(dir, "b.json")
	code, _, errOut := runCLI(t, "baseline", "record", "--set", set, "-o", b)
	require.Equal(t, 0, code, errOut)
	code, out, errOut := runCLI(t, "baseline", "verify", b, "--set", set)
	require.Equal(t, 0, code, errOut)
	assert.Contains(t, out, "0 changes")
	code, _, errOut = runCLI(t, "compare", "--set", set)
	assert.Equal(t, 0, code, errOut)
	code, _, errOut = runCLI(t, "check", "--set", set)
	assert.Equal(t, 0, code, errOut)
}

func TestFormsModelsAndMatch(t *testing.T) {
	dir := t.TempDir()
	require.NoError(t, os.WriteFile(filepath.Join(dir, "a.toml"), []byte(formulaForms), 0o644))
	t.Setenv(envFormsPath, dir+string(os.PathListSeparator)+filepath.Join(dir, "missing"))
	code, out, errOut := runCLI(t, "models", "--format", "json")
	require.Equal(t, 0, code, errOut)
	var entries []map[string]any
	require.NoError(t, json.Unmarshal([]byte(out), &entries))
	found := false
	for _, e := range entries {
		if e["key"] == "varshni" {
			found = true
			assert.Equal(t, "formula", e["kind"])
			assert.Equal(t, filepath.Join(dir, "a.toml")+":59", e["origin"])
			ps := e["parameters"].([]any)
			assert.Equal(t, "1/Å²", ps[2].(map[string]any)["unit"])
			assert.Equal(t, "length^-2", ps[2].(map[string]any)["dimension"])
		}
		if e["key"] == "morse" {
			assert.Equal(t, "built-in", e["kind"])
		}
	}
	assert.True(t, found)
	code, out, _ = runCLI(t, "models")
	require.Equal(t, 0, code)
	assert.Contains(t, out, "forms file "+filepath.Join(dir, "a.toml")+":59")
	// --match: the formula forms have no closed-form match, and say so.
	code, _, errOut = runCLI(t, "compare", "--match", "re=1.27,De=4.6,k=30", "--mu", "1")
	require.Equal(t, 0, code, errOut)
	assert.Contains(t, errOut, "--match: varshni (formula) declares no closed-form match to a target, so it is left out")
}

// Bad forms files: one clear line (plus the caret picture for a formula),
// exit 2, also for a file that cannot be read (as for --set).
func TestFormsBadInput(t *testing.T) {
	form := func(key, f string) string {
		return formTOML(key, f, "", formParam{"epsilon", "eV", ""}, formParam{"sigma", "A", ""})
	}
	tests := []struct {
		doc, contain string
		caret        bool
	}{
		{form("x", "4*epsilon*((sigam/r)^12 - (sigma/r)^6)"), "unknown name 'sigam' at column 13 (did you mean sigma?); parameters are epsilon, sigma", true},
		{form("x", "epsilon*(sigma/r)^5/r"), "the formula 'epsilon*(sigma/r)^5/r' has dimension energy·length^-1: expected energy at column 1", true},
		{form("x", "epsilon*exp(-r)*sigma/sigma"), "exp argument '-r' has dimension length: expected dimensionless", true},
		{form("morse", "epsilon*sigma/r"), `name "morse" already used by "morse" (built-in)`, false},
		{form("x", "epsilon*sigma/r") + "\n" + form("x", "epsilon*sigma/r"), `key "x" already declared`, false},
		{form("x", "epsilon*sigma/r") + "bogus = 1\n", "unknown key form.param.bogus", false},
		{strings.Replace(form("x", "epsilon*sigma/r"), `unit = "A"`, `unit = "A/s"`, 1), `unit "A/s" is a length·time^-1`, false},
		{strings.Replace(form("x", "epsilon*sigma/r"), `unit = "A"`, `unit = "A"`+"\nconstraint = \"positive\"", 1), `constraint "positive": allowed are`, false},
	}
	for _, tt := range tests {
		path := writeForms(t, tt.doc)
		code, _, errOut := runCLI(t, "--forms", path, "models")
		assert.Equal(t, exitUsage, code, tt.contain)
		lines := strings.Split(strings.TrimRight(errOut, "\n"), "\n")
		assert.Contains(t, lines[0], tt.contain)
		if tt.caret {
			require.Len(t, lines, 3, errOut)
			assert.Contains(t, lines[2], "^")
		} else {
			assert.Len(t, lines, 1, errOut)
		}
	}
	code, _, errOut := runCLI(t, "--forms", filepath.Join(t.TempDir(), "none.toml"), "models")
	assert.Equal(t, exitUsage, code, errOut)
	// An unused parameter is a warning; the form works.
	path := writeForms(t, form("w", "epsilon*(2 - exp(-r/r))"))
	code, out, errOut := runCLI(t, "--forms", path, "models")
	assert.Equal(t, 0, code, errOut)
	assert.Contains(t, errOut, "warning: "+path+":1: form \"w\": parameter sigma is declared but not used")
	assert.Contains(t, out, "forms file")
}

// BenchmarkCompareFourFormulas is BenchmarkCompareFourSpecs with the four
// forms typed as formulas, the forms file read and compiled in every
// iteration (issue 10: ≤ 1.5× the built-ins).
func BenchmarkCompareFourFormulas(b *testing.B) {
	forms := writeForms(b, formulaForms)
	args := append([]string{"--forms", forms, "compare", "--pair", "H-Cl", "--format", "json"}, fourFormulaSpecs...)
	for b.Loop() {
		var out, errOut strings.Builder
		if code := run(args, strings.NewReader(""), &out, &errOut); code != 0 {
			b.Fatal(errOut.String())
		}
	}
}

// A formula without a minimum, and one that is not finite inside its
// declared domain, are clear errors (exit 2), never numbers.
func TestFormsNoMinimumAndDomain(t *testing.T) {
	de, re := formParam{"De", "eV", ""}, formParam{"re", "A", ""}
	forms := writeForms(t, formTOML("rep", "A*exp(-r/rho)", "", formParam{"A", "eV", ""}, formParam{"rho", "A", ""})+"\n"+
		formTOML("lw", "De*log(r/re - 1)^2 - De", `limit = "none"`, de, re)+"\n"+
		formTOML("lw2", "De*log(r/re - 1)^2 - De", "limit = \"none\"\nr_min = \"re\"", de, re))
	code, out, errOut := runCLI(t, "--forms", forms, "inspect", "rep:A=100,rho=0.3")
	assert.Equal(t, exitUsage, code)
	assert.Empty(t, out)
	assert.Contains(t, errOut, "no minimum: V′ does not change sign")
	code, out, errOut = runCLI(t, "--forms", forms, "inspect", "lw:De=1,re=1")
	assert.Equal(t, exitUsage, code)
	assert.Empty(t, out)
	assert.Contains(t, errOut, "r = 0.01 Å: separation outside the domain: the formula gives NaN for its coefficient of order")
	assert.Contains(t, errOut, "inside the declared domain r > 0 (declare r_min")
	// With the domain declared, the minimum at r = 2re is found:
	// d/dr log(r/re − 1)² = 0 at r/re − 1 = 1.
	code, out, errOut = runCLI(t, "--forms", forms, "inspect", "lw2:De=1,re=1", "--format", "json")
	require.Equal(t, 0, code, errOut)
	var obj map[string]any
	require.NoError(t, json.Unmarshal([]byte(out), &obj))
	assert.InDelta(t, 2, obj["equilibrium_r_angstrom"].(float64), 1e-14)
}

// TestLibraryForms: the forms library is in every command without --forms;
// `check` passes on each form at its representative set.
func TestLibraryForms(t *testing.T) {
	for _, args := range [][]string{
		{"inspect", "mie:epsilon=0.0104,sigma=3.4,n=12,m=6", "--pair", "Ar-Ar"},
		{"inspect", "kratzer:De=4.6,re=1.27", "--pair", "H-Cl"},
		{"compare", "rydberg:De=4.6,a=2.6,re=1.27", "morse:De=4.6,a=1.87,re=1.27", "--pair", "H-Cl"},
		{"levels", "varshni:De=4.6,re=1.27,beta=0.5", "--pair", "H-Cl", "--j-max", "0"},
		{"check", "tang-toennies:A=20362,b=3.838,C6=38.43,C8=271.6,C10=2299", "exp6:epsilon=120K,rm=3.8,alpha=13"},
	} {
		code, _, errOut := runCLI(t, args...)
		assert.Equal(t, 0, code, "%v: %s", args, errOut)
		assert.Empty(t, errOut, "%v", args)
	}
	// Mie 12-6 is Lennard-Jones (G. Mie 1903): the same well to 1e-12.
	mie := inspectJSON(t, "mie:epsilon=0.0104,sigma=3.4,n=12,m=6")
	lj := inspectJSON(t, "lj:epsilon=0.0104,sigma=3.4")
	for _, k := range []string{"equilibrium_r_angstrom", "well_depth_ev", "force_constant_ev_per_angstrom2"} {
		assert.InEpsilon(t, lj[k].(float64), mie[k].(float64), 1e-12, k)
	}
}

func inspectJSON(t *testing.T, spec string) map[string]any {
	t.Helper()
	code, out, errOut := runCLI(t, "inspect", spec, "--format", "json")
	require.Equal(t, 0, code, errOut)
	var m map[string]any
	require.NoError(t, json.Unmarshal([]byte(out), &m))
	return m
}

// TestLibraryPrecedence: a user's form with a library key replaces the
// library form — silently when the parameters are the same, with one
// warning line when they differ; a user's form never replaces a built-in
// one, and two user forms with one key still clash.
func TestLibraryPrecedence(t *testing.T) {
	const other = "[[form]]\nkey = \"varshni\"\nformula = \"De*(1 - (re/r)*exp(-b*(r - re)))^2 - De\"\nlimit = 0\n" +
		"[[form.param]]\nname = \"De\"\nunit = \"kcal/mol\"\nconstraint = \"> 0\"\n" +
		"[[form.param]]\nname = \"re\"\nunit = \"A\"\nconstraint = \"> 0\"\n" +
		"[[form.param]]\nname = \"b\"\nunit = \"1/A\"\nconstraint = \"> 0\"\n"
	same := writeForms(t, formulaForms) // its varshni has the library's parameters
	diff := writeForms(t, other)

	code, out, errOut := runCLI(t, "--forms", same, "models", "--format", "json")
	require.Equal(t, 0, code, errOut)
	assert.Empty(t, errOut)
	assert.Contains(t, out, same+":59")

	code, out, errOut = runCLI(t, "--forms", diff, "inspect", "varshni:De=106,re=1.27,b=2", "--format", "json")
	require.Equal(t, 0, code, errOut)
	assert.Equal(t, 1, strings.Count(errOut, "\n"), errOut)
	assert.Contains(t, errOut, `warning: `+diff+`:1: form "varshni" replaces the library form "varshni" (library/forms.toml:`)
	assert.Contains(t, errOut, "whose parameters differ: De [eV, > 0], re [Å, > 0], beta [1/Å², > 0]")
	var m map[string]any
	require.NoError(t, json.Unmarshal([]byte(out), &m))
	assert.InEpsilon(t, 106*0.0433641043, m["well_depth_ev"].(float64), 1e-6) // 1 kcal/mol = 0.0433641043 eV (CODATA 2018)

	// The same key in a model set's [[form]] table replaces it too.
	dir := t.TempDir()
	set := writeSet(t, dir, other+"[[entry]]\nname = \"v\"\nspec = \"varshni:De=106,re=1.27,b=2\"\nmu = 1\n")
	code, _, errOut = runCLI(t, "compare", "--set", set)
	require.Equal(t, 0, code, errOut)
	assert.Contains(t, errOut, "replaces the library form")

	// Two user files with one key, and a user's built-in key: errors.
	code, _, errOut = runCLI(t, "--forms", same, "--forms", diff, "models")
	assert.Equal(t, 2, code)
	assert.Contains(t, errOut, `already used by "varshni"`)
	clash := writeForms(t, strings.Replace(other, `key = "varshni"`, `key = "morse"`, 1))
	code, _, errOut = runCLI(t, "--forms", clash, "models")
	assert.Equal(t, 2, code)
	assert.Contains(t, errOut, `already used by "morse" (built-in)`)
}
