package main

import (
	"bytes"
	"encoding/json"
	"math"
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"github.com/pairwell/pairwell/core/units"
)

// periodRowsJSON runs the period command with --format json and decodes
// its rows.
func periodRowsJSON(t *testing.T, args ...string) ([]map[string]any, string) {
	t.Helper()
	var stdout, stderr bytes.Buffer
	code := run(append([]string{"period", "--format", "json"}, args...), strings.NewReader(""), &stdout, &stderr)
	require.Equal(t, 0, code, stderr.String())
	var doc struct {
		Model string           `json:"model"`
		Rows  []map[string]any `json:"rows"`
	}
	require.NoError(t, json.Unmarshal(stdout.Bytes(), &doc), stdout.String())
	require.NotEmpty(t, doc.Model, "the model heads the rows")
	return doc.Rows, stderr.String()
}

func TestPeriodJSONContract(t *testing.T) {
	specs := []string{
		"morse:De=4.6,a=1.87,re=1.27",
		"lj:epsilon=120K,sigma=3.4",
		"buckingham:A=1500,rho=0.3,C=25",
		"harmonic:k=30,r0=1.2",
	}
	for _, spec := range specs {
		rows, _ := periodRowsJSON(t, spec, "--pair", "H-Cl", "--amplitudes", "0.01,2pm,-0.01")
		require.Len(t, rows, 3, spec)
		for _, r := range rows {
			for _, k := range []string{"amplitude_angstrom", "energy_ev", "exact_period_fs", "harmonic_period_fs", "perturbative_period_fs", "error"} {
				assert.Contains(t, r, k, "%s: key %s", spec, k)
			}
			assert.Nil(t, r["measured_period_fs"], "only with --method")
			assert.Nil(t, r["error"], spec)
			assert.Greater(t, r["exact_period_fs"], 0.0, spec)
		}
		assert.InDelta(t, 0.02, rows[1]["amplitude_angstrom"], 1e-15, "2 pm = 0.02 Å")
	}
}

// TestPeriodMorseClosedForm: T(E) = T₀/√(1 − E/De) for Morse (classical
// Morse oscillator, standard result, from memory), with
// E = De(1 − e^{−ax})² for a start at rest at displacement x.
func TestPeriodMorseClosedForm(t *testing.T) {
	const de, a = 4.6, 1.87
	rows, _ := periodRowsJSON(t, "morse:De=4.6,a=1.87,re=1.27", "--mu", "0.98", "--amplitudes=-0.2:0.8:6")
	require.Len(t, rows, 6)
	for i, r := range rows {
		x := -0.2 + 0.2*float64(i)
		assert.InDelta(t, x, r["amplitude_angstrom"], 1e-15)
		t0 := r["harmonic_period_fs"].(float64)
		if i == 1 {
			assert.Equal(t, 0.0, r["energy_ev"])
			assert.Equal(t, t0, r["exact_period_fs"])
			continue
		}
		E := de * math.Pow(-math.Expm1(-a*x), 2)
		assert.InEpsilon(t, E, r["energy_ev"], 1e-12)
		assert.InEpsilon(t, t0/math.Sqrt(1-E/de), r["exact_period_fs"], 1e-11, "x = %g", x)
		// Perturbative on Morse: ω = ω₀(1 − E/(2De)).
		assert.InEpsilon(t, t0/(1-E/(2*de)), r["perturbative_period_fs"], 1e-12, "x = %g", x)
	}
}

// TestPeriodRowErrors: amplitudes beyond the well get their own error,
// the other rows are computed, the exit code is 0.
func TestPeriodRowErrors(t *testing.T) {
	rows, errOut := periodRowsJSON(t, "morse:De=4.6,a=1.87,re=1.27", "--pair", "H-Cl", "--amplitudes=-0.6,0.3,-1,-3")
	require.Len(t, rows, 4)
	assert.Contains(t, rows[0]["error"], "dissociates")
	assert.Nil(t, rows[0]["exact_period_fs"])
	assert.Nil(t, rows[1]["error"])
	assert.Greater(t, rows[1]["exact_period_fs"], 0.0)
	assert.Contains(t, rows[2]["error"], "dissociates")
	assert.Contains(t, rows[3]["error"], "outside the domain", "r = −1.73 Å")
	assert.Contains(t, errOut, "3 of 4 rows")

	// Buckingham matched to re = 1.2 Å, De = 4 eV, k = 30 eV/Å²: its inner
	// barrier is 0.079 eV above the minimum, below the depth; above it
	// the pair collapses.
	rows, _ = periodRowsJSON(t, "buckingham:A=27496.8,rho=0.1638058,C=65.9992", "--mu", "7", "--energies", "0.05,0.5")
	require.Len(t, rows, 2)
	assert.Nil(t, rows[0]["error"])
	assert.Contains(t, rows[1]["error"], "collapses")
	assert.Greater(t, rows[0]["amplitude_angstrom"], 0.0, "stretch turning point")
	// Another Buckingham (re = 3.92 Å, barrier at 0.955 Å): a compression
	// to r = 0.92 Å is beyond the barrier, outside the domain.
	rows, _ = periodRowsJSON(t, "buckingham:A=1500,rho=0.3,C=25", "--mu", "20", "--amplitudes=-3,0.1")
	assert.Contains(t, rows[0]["error"], "collapses")
	assert.Nil(t, rows[1]["error"])
}

// TestPeriodMeasured: with --method the trajectory period is added and
// agrees with the quadrature (Dormand–Prince within 1e-7 at its defaults).
func TestPeriodMeasured(t *testing.T) {
	rows, _ := periodRowsJSON(t, "lj:epsilon=120K,sigma=3.4", "--pair", "Ar-Ar", "--amplitudes", "0,0.3", "--method", "dopri")
	require.Len(t, rows, 2)
	assert.Nil(t, rows[0]["measured_period_fs"], "zero amplitude: nothing to measure")
	assert.Contains(t, rows[0]["error"], "zero amplitude")
	assert.Nil(t, rows[1]["error"])
	assert.InEpsilon(t, rows[1]["exact_period_fs"], rows[1]["measured_period_fs"], 1e-7)
}

func TestPeriodEnergiesAndTable(t *testing.T) {
	// 300 K and 0.025852 eV are nearly the same energy (k_B = 8.617333262e-5 eV/K).
	rows, _ := periodRowsJSON(t, "morse:De=4.6,a=1.87,re=1.27", "--mu", "1", "--energies", "300K,0.025852")
	require.Len(t, rows, 2)
	assert.InEpsilon(t, 300*units.BoltzmannEV, rows[0]["energy_ev"], 1e-15)
	assert.InEpsilon(t, rows[0]["exact_period_fs"], rows[1]["exact_period_fs"], 1e-5)

	var stdout, stderr bytes.Buffer
	code := run([]string{"period", "morse:De=4.6,a=1.87,re=1.27", "--mu", "1", "--amplitudes", "0.1,-0.9"}, strings.NewReader(""), &stdout, &stderr)
	require.Equal(t, 0, code, stderr.String())
	out := stdout.String()
	for _, h := range []string{"amplitude [Å]", "energy [eV]", "exact period [fs]", "harmonic period [fs]", "perturbative period [fs]", "error", "dissociates"} {
		assert.Contains(t, out, h)
	}
	stdout.Reset()
	code = run([]string{"period", "morse:De=4.6,a=1.87,re=1.27", "--mu", "1", "--amplitudes", "0.1,0.2", "--format", "csv", "--method", "rk4"}, strings.NewReader(""), &stdout, &stderr)
	require.Equal(t, 0, code, stderr.String())
	lines := strings.Split(strings.TrimSpace(stdout.String()), "\n")
	require.Len(t, lines, 3)
	assert.Equal(t, "model,params,pair,reduced_mass_u,amplitude_angstrom,energy_ev,exact_period_fs,exact_period_relative_error_estimate,"+
		"harmonic_period_fs,perturbative_period_fs,measured_period_fs,inner_turning_point_angstrom,outer_turning_point_angstrom,error", lines[0])
	assert.True(t, strings.HasPrefix(lines[1], "morse,De=4.6 a=1.87 re=1.27,,1,0.1,"), lines[1])
}

func TestPeriodBadInput(t *testing.T) {
	tests := []struct {
		name string
		args []string
		text string
	}{
		{"no mass", []string{"morse:De=4.6,a=1.87,re=1.27", "--amplitudes", "0.1"}, "reduced mass"},
		{"no amplitudes", []string{"morse:De=4.6,a=1.87,re=1.27", "--mu", "1"}, "--amplitudes"},
		{"bad list", []string{"morse:De=4.6,a=1.87,re=1.27", "--mu", "1", "--amplitudes", "0.1,,0.2"}, "--amplitudes"},
		{"bad unit", []string{"morse:De=4.6,a=1.87,re=1.27", "--mu", "1", "--amplitudes", "0.1eV"}, "--amplitudes"},
		{"bad count", []string{"morse:De=4.6,a=1.87,re=1.27", "--mu", "1", "--amplitudes", "0:1:0"}, "COUNT"},
		{"bad method", []string{"morse:De=4.6,a=1.87,re=1.27", "--mu", "1", "--amplitudes", "0.1", "--method", "euler"}, "--method"},
		{"bad spec", []string{"morse:De=-1,a=1.87,re=1.27", "--mu", "1", "--amplitudes", "0.1"}, "De"},
		{"no spec", []string{"--mu", "1", "--amplitudes", "0.1"}, "SPEC"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			var stdout, stderr bytes.Buffer
			code := run(append([]string{"period"}, tt.args...), strings.NewReader(""), &stdout, &stderr)
			assert.Equal(t, exitUsage, code)
			assert.Empty(t, stdout.String())
			assert.Contains(t, stderr.String(), tt.text)
		})
	}
}

func TestParseSweep(t *testing.T) {
	tests := []struct {
		in   string
		want []float64
	}{
		{"0.1", []float64{0.1}},
		{" 0.1, 20pm ,-0.05 ", []float64{0.1, 0.2, -0.05}},
		{"-0.2:0.2:5", []float64{-0.2, -0.1, 0, 0.1, 0.2}},
		{"1:1:1", []float64{1}},
		{"0.1nm:0.3nm:3", []float64{1, 2, 3}},
	}
	for _, tt := range tests {
		got, err := parseSweep(tt.in, units.Length)
		require.NoError(t, err, tt.in)
		require.Len(t, got, len(tt.want), tt.in)
		for i := range got {
			assert.InDelta(t, tt.want[i], got[i], 1e-15, "%s [%d]", tt.in, i)
		}
	}
	for _, bad := range []string{"", ",", "1:2", "1:2:3:4", "1:2:x", "0:1:0", "0:1:1", "1:2:2000000", "a", "1,2,", "1e999", "1:2:-3"} {
		_, err := parseSweep(bad, units.Length)
		assert.Error(t, err, "%q", bad)
	}
}

// FuzzParseSweep: parseSweep never panics and returns finite values, at most
// maxSweepCount of them, with the range ends exact.
func FuzzParseSweep(f *testing.F) {
	for _, s := range []string{"0.1", "0.1,0.2", "-1:1:3", "1pm:2nm:10", "1e308:-1e308:3", " 1 : 2 : 2 ", "1:2:1000000"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		vs, err := parseSweep(s, units.Length)
		if err != nil {
			return
		}
		if len(vs) == 0 || len(vs) > maxSweepCount {
			t.Fatalf("%q: %d values", s, len(vs))
		}
		for _, v := range vs {
			if math.IsNaN(v) || math.IsInf(v, 0) {
				t.Fatalf("%q: non-finite value %g", s, v)
			}
		}
	})
}
