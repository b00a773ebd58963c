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

	"github.com/pairwell/pairwell/core/refdata"
)

// tableJSON runs table with --format json and decodes it.
func tableJSON(t *testing.T, run func(*testing.T, ...string) (int, string, string), args ...string) map[string]any {
	t.Helper()
	code, out, errOut := run(t, append(append([]string{"table"}, args...), "--format", "json")...)
	require.Equal(t, 0, code, errOut)
	var m map[string]any
	require.NoError(t, json.Unmarshal([]byte(out), &m), out)
	return m
}

// TestTableJSONKeys pins the JSON contract of table (README,
// "Tabulation: pairwell table").
func TestTableJSONKeys(t *testing.T) {
	m := tableJSON(t, runCLI, "morse:De=4.6,a=1.87,re=1.27", "--from", "0.9", "--to", "6", "--accuracy", "1e-6", "--second-derivative")
	for _, k := range []string{"spec", "model", "params", "interpolation", "interpolant", "from_angstrom", "to_angstrom",
		"step_angstrom", "points", "columns", "accuracy", "check", "caution", "rows"} {
		assert.Contains(t, m, k)
	}
	assert.Len(t, m, 14)
	acc := m["accuracy"].(map[string]any)
	for _, k := range []string{"energy_tolerance_ev", "force_tolerance_ev_per_angstrom", "bound_energy_ev", "bound_force_ev_per_angstrom",
		"energy_bound", "force_bound", "max_abs_d2v_ev_per_angstrom2", "max_abs_d2v_r_angstrom", "max_abs_d3v_ev_per_angstrom3",
		"max_abs_d3v_r_angstrom", "max_abs_d4v_ev_per_angstrom4", "max_abs_d4v_r_angstrom", "safety_factor", "refinements"} {
		assert.Contains(t, acc, k)
	}
	assert.Len(t, acc, 14)
	// Cubic: only max|V⁽⁴⁾| is used. For Morse it lies at the start of the
	// range, in the wall: with y = e^{−a(r−re)}, V = De(y² − 2y) and
	// V⁽⁴⁾ = De(16a⁴y² − 2a⁴y) (P. M. Morse 1929, differentiated).
	assert.Nil(t, acc["max_abs_d2v_ev_per_angstrom2"])
	assert.Equal(t, 0.9, acc["max_abs_d4v_r_angstrom"])
	yw := math.Exp(-1.87 * (0.9 - 1.27))
	assert.InEpsilon(t, 4.6*(16*math.Pow(1.87, 4)*yw*yw-2*math.Pow(1.87, 4)*yw), acc["max_abs_d4v_ev_per_angstrom4"].(float64), 1e-12)
	ch := m["check"].(map[string]any)
	for _, k := range []string{"energy_error_ev", "energy_error_r_angstrom", "force_error_ev_per_angstrom", "force_error_r_angstrom", "points", "where"} {
		assert.Contains(t, ch, k)
	}
	// The reported spacing reaches the requested accuracy (1e-6 eV and,
	// by default, 1e-6 eV/Å).
	assert.LessOrEqual(t, ch["energy_error_ev"].(float64), 1e-6)
	assert.LessOrEqual(t, ch["force_error_ev_per_angstrom"].(float64), 1e-6)
	rows := m["rows"].([]any)
	require.Len(t, rows, int(m["points"].(float64)))
	assert.Equal(t, []any{"r_angstrom", "energy_ev", "force_ev_per_angstrom", "d2v_ev_per_angstrom2"}, m["columns"])
	// At re = 1.27 Å (not a grid point in general) the nearest row has
	// F ≈ 0; the first row is r = 0.9 exactly, V, F, V″ of Morse there
	// (P. M. Morse 1929, closed forms as in core/tabulate's tests).
	first := rows[0].(map[string]any)
	y := math.Exp(-1.87 * (0.9 - 1.27))
	assert.Equal(t, 0.9, first["r_angstrom"])
	assert.InEpsilon(t, 4.6*((1-y)*(1-y)-1), first["energy_ev"].(float64), 1e-13)
	assert.InEpsilon(t, -2*1.87*4.6*y*(1-y), first["force_ev_per_angstrom"].(float64), 1e-13)
	assert.InEpsilon(t, 2*1.87*1.87*4.6*y*(2*y-1), first["d2v_ev_per_angstrom2"].(float64), 1e-12)
	last := rows[len(rows)-1].(map[string]any)
	assert.Equal(t, 6.0, last["r_angstrom"])
	// Without --accuracy: "accuracy" is null, the check is still there.
	m = tableJSON(t, runCLI, "morse:De=4.6,a=1.87,re=1.27", "--from", "0.9", "--to", "6", "--step", "0.5")
	assert.Nil(t, m["accuracy"])
	assert.Equal(t, 11.0, m["points"])
	assert.Equal(t, 5.9, m["to_angstrom"]) // the last point not past --to
	assert.Greater(t, m["check"].(map[string]any)["energy_error_ev"].(float64), 1e-3)
}

// TestTableCSVReadBack: the CSV is the rows under the reference-data keys,
// so that pairwell's own reader (pairwell fit) takes it back unchanged;
// the summary goes to standard error.
func TestTableCSVReadBack(t *testing.T) {
	code, out, errOut := runCLI(t, "table", "lj:epsilon=120K,sigma=3.4", "--from", "3", "--to", "12", "--points", "200", "--format", "csv")
	require.Equal(t, 0, code, errOut)
	lines := strings.Split(strings.TrimSpace(out), "\n")
	assert.Equal(t, "r_angstrom,energy_ev,force_ev_per_angstrom", lines[0])
	assert.Len(t, lines, 1+200)
	assert.Contains(t, errOut, "pairwell: table: measured interpolation error")
	assert.Contains(t, errOut, "pairwell: table: Caution:")
	data, err := refdata.Read(strings.NewReader(out), "table.csv")
	require.NoError(t, err)
	require.Len(t, data.R, 200)
	assert.Equal(t, 3.0, data.R[0])
	assert.Equal(t, 12.0, data.R[199])
	require.Len(t, data.F, 200)
}

// TestTableForms: table works on built-in, library, formula and plugin
// forms, and the accuracy is reached on each.
func TestTableForms(t *testing.T) {
	forms := writeForms(t, formulaForms)
	cases := []struct {
		name string
		run  func(*testing.T, ...string) (int, string, string)
		args []string
	}{
		{"built-in", runCLI, []string{"buckingham:A=1500,rho=0.3,C=25", "--from", "2", "--to", "10"}},
		{"library", runCLI, []string{"kratzer:De=4.6,re=1.27", "--from", "0.8", "--to", "20"}},
		{"cut", runCLI, []string{"lj:epsilon=120K,sigma=3.4@cut=force-shift,rc=8.5", "--from", "3", "--to", "8.5"}},
		{"formula", runCLI, []string{"--forms", forms, "fmorse:De=4.6,a=1.87,re=1.27", "--from", "0.9", "--to", "6"}},
		{"plugin", runPlugins, []string{"--plugin", pluginBin.rydberg, rydbergSpec, "--from", "0.9", "--to", "6"}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			if c.name == "plugin" {
				requirePlugins(t)
			}
			for _, how := range []string{"cubic", "linear"} {
				m := tableJSON(t, c.run, append(c.args, "--accuracy", "1e-5eV", "--force-accuracy", "1e-4", "--interpolation", how)...)
				ch := m["check"].(map[string]any)
				assert.LessOrEqual(t, ch["energy_error_ev"].(float64), 1e-5, how)
				assert.LessOrEqual(t, ch["force_error_ev_per_angstrom"].(float64), 1e-4, how)
				assert.Equal(t, how, m["interpolation"])
			}
		})
	}
}

// TestTableOutputFile: -o goes through the file policy (atomic, never over
// an input, refused before the work) and prints the summary.
func TestTableOutputFile(t *testing.T) {
	dir := t.TempDir()
	out := filepath.Join(dir, "t.csv")
	code, stdout, errOut := runCLI(t, "table", "morse:De=4.6,a=1.87,re=1.27", "--from", "0.9", "--to", "6", "--points", "50", "--format", "csv", "-o", out)
	require.Equal(t, 0, code, errOut)
	assert.Contains(t, stdout, "50 rows written to "+out)
	assert.Contains(t, stdout, "measured interpolation error")
	data, err := os.ReadFile(out)
	require.NoError(t, err)
	assert.Contains(t, string(data), "r_angstrom,energy_ev,force_ev_per_angstrom\n0.9,")
	// Over an input of the run (the forms file) and onto a directory: refused, exit 2.
	forms := writeForms(t, formulaForms)
	code, _, errOut = runCLI(t, "--forms", forms, "table", "morse:De=4.6,a=1.87,re=1.27", "--from", "1", "--to", "2", "--points", "5", "-o", forms)
	assert.Equal(t, exitUsage, code, errOut)
	code, _, _ = runCLI(t, "table", "morse:De=4.6,a=1.87,re=1.27", "--from", "1", "--to", "2", "--points", "5", "-o", dir)
	assert.Equal(t, exitUsage, code)
}

// TestTableBadInput: one line, exit 2, nothing on stdout.
func TestTableBadInput(t *testing.T) {
	const m = "morse:De=4.6,a=1.87,re=1.27"
	tests := []struct {
		name    string
		args    []string
		mention string
	}{
		{"no grid", []string{m, "--from", "1", "--to", "2"}, "exactly one of"},
		{"two grids", []string{m, "--from", "1", "--to", "2", "--points", "10", "--step", "0.1"}, "exactly one of"},
		{"grid and accuracy", []string{m, "--from", "1", "--to", "2", "--points", "10", "--accuracy", "1e-6"}, "exactly one of"},
		{"force alone", []string{m, "--from", "1", "--to", "2", "--points", "10", "--force-accuracy", "1e-6"}, "goes with --accuracy"},
		{"no from", []string{m, "--to", "2", "--points", "10"}, "from"},
		{"reversed", []string{m, "--from", "2", "--to", "1", "--points", "10"}, "beyond the start"},
		{"zero start", []string{m, "--from", "0", "--to", "1", "--points", "10"}, "positive"},
		{"bad unit", []string{m, "--from", "1eV", "--to", "2", "--points", "10"}, "--from"},
		{"one point", []string{m, "--from", "1", "--to", "2", "--points", "1"}, "2 to 1000000"},
		{"too many", []string{m, "--from", "1", "--to", "2", "--points", "2000000"}, "2 to 1000000"},
		{"step too small", []string{m, "--from", "1", "--to", "2", "--step", "1e-9"}, "at most 1000000"},
		{"accuracy unit", []string{m, "--from", "1", "--to", "2", "--accuracy", "1e-6A"}, "--accuracy"},
		{"accuracy negative", []string{m, "--from", "1", "--to", "2", "--accuracy", "-1e-6"}, "positive"},
		{"force unit", []string{m, "--from", "1", "--to", "2", "--accuracy", "1e-6", "--force-accuracy", "1e-6eV"}, "--force-accuracy"},
		{"interpolation", []string{m, "--from", "1", "--to", "2", "--points", "10", "--interpolation", "cubik"}, "did you mean cubic?"},
		{"outside domain", []string{"buckingham:A=1500,rho=0.3,C=25", "--from", "0.1", "--to", "2", "--points", "10"}, "domain"},
		{"deep in the wall", []string{"lj:epsilon=120K,sigma=3.4", "--from", "1", "--to", "12", "--accuracy", "1e-6", "--interpolation", "linear"}, "start the table further out"},
		{"kink inside", []string{"lj:epsilon=120K,sigma=3.4@cut=force-shift,rc=8.5", "--from", "3", "--to", "12", "--accuracy", "1e-6"}, "kink at 8.5"},
		{"below rounding", []string{m, "--from", "0.9", "--to", "6", "--accuracy", "1e-17"}, "rounding"},
	}
	for _, tt := range tests {
		code, out, errOut := runCLI(t, append([]string{"table"}, tt.args...)...)
		assert.Equal(t, exitUsage, code, "%s: %s", tt.name, errOut)
		assert.Empty(t, out, tt.name)
		assert.Equal(t, 1, strings.Count(errOut, "\n"), "%s: one line: %q", tt.name, errOut)
		assert.Contains(t, errOut, tt.mention, tt.name)
	}
}

// TestTableTableFormat: the aligned table has units in its headers.
func TestTableTableFormat(t *testing.T) {
	code, out, errOut := runCLI(t, "table", "lj:epsilon=120K,sigma=3.4", "--from", "3", "--to", "4", "--points", "3", "--second-derivative")
	require.Equal(t, 0, code, errOut)
	assert.Regexp(t, `r \[Å\]\s+V \[eV\]\s+F \[eV/Å\]\s+V″ \[eV/Å²\]\n3 `, out)
	assert.Contains(t, out, "grid: 3 points from 3 to 4 Å, step 0.5 Å")
}
