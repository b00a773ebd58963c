package main

import (
	"bytes"
	"encoding/csv"
	"encoding/json"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"github.com/pairwell/pairwell/core/units"
)

// runMotionCLI runs pairwell in-process and returns exit code, stdout and
// stderr.
func runMotionCLI(t *testing.T, args ...string) (int, string, string) {
	t.Helper()
	var stdout, stderr bytes.Buffer
	code := run(args, strings.NewReader(""), &stdout, &stderr)
	return code, stdout.String(), stderr.String()
}

// motionJSON runs motion with --format json and decodes the object.
func motionJSON(t *testing.T, args ...string) map[string]any {
	t.Helper()
	code, out, errOut := runMotionCLI(t, append(append([]string{"motion"}, args...), "--format", "json")...)
	require.Equal(t, 0, code, "stderr: %s", errOut)
	var obj map[string]any
	require.NoError(t, json.Unmarshal([]byte(out), &obj), out)
	return obj
}

func num64(t *testing.T, obj map[string]any, key string) float64 {
	t.Helper()
	v, ok := obj[key].(float64)
	require.True(t, ok, "%s = %v is not a number", key, obj[key])
	return v
}

// contractKeys are the JSON keys issue 3 fixes for CI scripts.
var contractKeys = []string{
	"method", "amplitude_angstrom", "energy_ev", "measured_period_fs", "exact_period_fs",
	"harmonic_period_fs", "perturbative_period_fs", "relative_energy_drift",
}

func TestMotionJSONContract(t *testing.T) {
	// Accuracy targets at the default steps (issue 3, item 2).
	target := map[string]float64{"heun": 1e-4, "verlet": 1e-4, "rk4": 1e-6, "dopri": 1e-7}
	cases := []struct {
		spec, mass, start string
	}{
		{"morse:De=4.6,a=1.87,re=1.27", "--pair=H-Cl", "--amplitude=0.2"},
		{"lj:epsilon=120K,sigma=3.4", "--pair=Ar-Ar", "--amplitude=-0.2"},
		{"buckingham:A=1500,rho=0.3,C=25", "--mu=20", "--energy=20K"},
		{"harmonic:k=30,r0=1.2", "--mu=7", "--amplitude=0.3"},
	}
	for _, c := range cases {
		for _, m := range []string{"heun", "verlet", "rk4", "dopri"} {
			obj := motionJSON(t, c.spec, c.mass, c.start, "--method", m)
			for _, k := range append(contractKeys, "period_spread_fs", "steps_per_period", "time_step_fs", "periods_measured") {
				assert.Contains(t, obj, k, "%s %s", c.spec, m)
			}
			assert.Equal(t, m, obj["method"])
			measured, exact := num64(t, obj, "measured_period_fs"), num64(t, obj, "exact_period_fs")
			assert.InDelta(t, 0, measured/exact-1, target[m], "%s %s", c.spec, m)
			assert.InDelta(t, measured/exact-1, num64(t, obj, "measured_relative_error"), 1e-15)
			assert.Equal(t, 10.0, num64(t, obj, "periods_measured"))
			assert.Greater(t, num64(t, obj, "energy_ev"), 0.0)
			assert.Less(t, num64(t, obj, "relative_energy_drift"), 1e-3)
			if strings.HasPrefix(c.spec, "harmonic") {
				// Harmonic well: every period is 2π√(μ/k), c₃ = c₄ = 0.
				h := num64(t, obj, "harmonic_period_fs")
				assert.InDelta(t, h, exact, 1e-10*h)
				assert.InDelta(t, h, num64(t, obj, "perturbative_period_fs"), 1e-12*h)
				assert.InDelta(t, 15*0.3*0.3, num64(t, obj, "energy_ev"), 1e-12, "E = ½kx0²")
			}
		}
	}
}

func TestMotionMorseClosedForm(t *testing.T) {
	// Morse: T(E) = T0/√(1 − E/De), T0 = 2π/ω0, ω0 = √(2De·a²/μ)
	// (standard closed form); ω0 converted with CODATA 2018 constants.
	const De, a, mu = 4.6, 1.87, 1.0
	obj := motionJSON(t, "morse:De=4.6,a=1.87,re=1.27", "--mu", "1", "--energy", "2.3", "--method", "rk4")
	t0 := 2 * math.Pi / math.Sqrt(2*De*a*a/mu*units.ElectronVolt/(1e-20*units.Dalton)*1e-30)
	want := t0 / math.Sqrt(1-2.3/De)
	assert.InDelta(t, t0, num64(t, obj, "harmonic_period_fs"), 1e-12*t0)
	assert.InDelta(t, want, num64(t, obj, "exact_period_fs"), 1e-10*want)
	assert.InDelta(t, want, num64(t, obj, "measured_period_fs"), 1e-6*want)
	// Stretch turning point x+ = −ln(1 − √(E/De))/a (closed form).
	assert.InDelta(t, -math.Log(1-math.Sqrt(0.5))/a, num64(t, obj, "amplitude_angstrom"), 1e-12)
	// Perturbative: ω ≈ ω0(1 − E/(2De)) for Morse.
	assert.InDelta(t, t0/(1-2.3/(2*De)), num64(t, obj, "perturbative_period_fs"), 1e-9*t0)
	assert.Equal(t, 200.0, num64(t, obj, "steps_per_period"))
	assert.InDelta(t, t0/200, num64(t, obj, "time_step_fs"), 1e-12)
}

func TestMotionUnits(t *testing.T) {
	spec := "morse:De=4.6,a=1.87,re=1.27"
	a := motionJSON(t, spec, "--pair", "H-Cl", "--amplitude", "0.2")
	b := motionJSON(t, spec, "--pair", "H-Cl", "--amplitude", "20pm")
	assert.Equal(t, a["measured_period_fs"], b["measured_period_fs"])
	assert.Equal(t, 0.2, num64(t, b, "amplitude_angstrom"))
	// 300 K as an energy is k_B·300 K (exact SI 2019 k_B).
	c := motionJSON(t, spec, "--pair", "H-Cl", "--energy", "300K")
	assert.InDelta(t, 300*units.BoltzmannEV, num64(t, c, "energy_ev"), 1e-18)
}

func TestMotionSettingsReported(t *testing.T) {
	spec := "lj:epsilon=120K,sigma=3.4"
	obj := motionJSON(t, spec, "--pair", "Ar-Ar", "--amplitude", "0.1", "--method", "heun", "--steps-per-period", "400", "--periods", "3")
	assert.Equal(t, 400.0, num64(t, obj, "steps_per_period"))
	assert.Equal(t, 3.0, num64(t, obj, "periods_measured"))
	assert.Nil(t, obj["rtol"], "a fixed-step method has no tolerances")
	assert.Contains(t, obj, "rtol")
	obj = motionJSON(t, spec, "--pair", "Ar-Ar", "--amplitude", "0.1", "--rtol", "1e-11", "--atol", "1e-12")
	assert.Equal(t, 1e-11, num64(t, obj, "rtol"))
	assert.Equal(t, 1e-12, num64(t, obj, "atol"))
	assert.InDelta(t, 0, num64(t, obj, "measured_relative_error"), 1e-9)
}

func TestMotionTableAndCSV(t *testing.T) {
	args := []string{"motion", "morse:De=4.6,a=1.87,re=1.27", "--pair", "H-Cl", "--amplitude", "0.2", "--periods", "2"}
	code, out, errOut := runMotionCLI(t, args...)
	require.Equal(t, 0, code, errOut)
	for _, row := range []string{"measured period", "exact period", "harmonic period", "perturbative period", "relative energy drift", "steps accepted, rejected"} {
		assert.Contains(t, out, row)
	}
	code, out, errOut = runMotionCLI(t, append(args, "--format", "csv")...)
	require.Equal(t, 0, code, errOut)
	recs, err := csv.NewReader(strings.NewReader(out)).ReadAll()
	require.NoError(t, err)
	require.Len(t, recs, 2, "one record")
	assert.Equal(t, []string{"model", "params", "pair", "reduced_mass_u", "method"}, recs[0][:5])
	assert.Equal(t, []string{"morse", "De=4.6 a=1.87 re=1.27", "H-Cl"}, recs[1][:3])
}

func TestMotionTrajectory(t *testing.T) {
	dir := t.TempDir()
	path := filepath.Join(dir, "run.csv")
	obj := motionJSON(t, "morse:De=4.6,a=1.87,re=1.27", "--pair", "H-Cl", "--amplitude", "-0.1",
		"--method", "verlet", "--periods", "2", "--trajectory", path)
	assert.Equal(t, path, obj["trajectory_file"])
	f, err := os.Open(path)
	require.NoError(t, err)
	defer f.Close()
	recs, err := csv.NewReader(f).ReadAll()
	require.NoError(t, err)
	assert.Equal(t, []string{"t_fs", "r_angstrom", "x_angstrom", "v_angstrom_per_fs", "energy_ev"}, recs[0])
	require.Len(t, recs, 1+int(num64(t, obj, "trajectory_samples")))
	assert.Equal(t, num64(t, obj, "steps")+1, num64(t, obj, "trajectory_samples"), "the start and every step")
	e0 := num64(t, obj, "energy_ev")
	prev := -1.0
	for _, r := range recs[1:] {
		v := make([]float64, 5)
		for i := range v {
			v[i], err = strconv.ParseFloat(r[i], 64)
			require.NoError(t, err)
		}
		assert.Greater(t, v[0], prev)
		prev = v[0]
		assert.InDelta(t, v[1]-1.27, v[2], 1e-12)
		assert.InDelta(t, e0, v[4], 1e-3*e0)
	}
	entries, err := os.ReadDir(dir)
	require.NoError(t, err)
	assert.Len(t, entries, 1, "no temporary file left behind")

	code, out, errOut := runMotionCLI(t, "motion", "morse:De=4.6,a=1.87,re=1.27", "--pair", "H-Cl", "--amplitude", "0.1",
		"--trajectory", filepath.Join(dir, "missing", "run.csv"))
	assert.Equal(t, 1, code)
	assert.Empty(t, out)
	assert.Contains(t, errOut, "cannot create a file")
}

func TestMotionBadInput(t *testing.T) {
	const morse = "morse:De=4.6,a=1.87,re=1.27"
	tests := []struct {
		name    string
		args    []string
		mention string
	}{
		{"no mass", []string{morse, "--amplitude", "0.1"}, "reduced mass is needed"},
		{"no start", []string{morse, "--pair", "H-Cl"}, "give --amplitude X"},
		{"amplitude and energy", []string{morse, "--pair", "H-Cl", "--amplitude", "0.1", "--energy", "1"}, "both given"},
		{"unknown method", []string{morse, "--pair", "H-Cl", "--amplitude", "0.1", "--method", "euler"}, "allowed: heun, rk4, verlet, dopri"},
		{"compressed beyond the depth", []string{morse, "--pair", "H-Cl", "--amplitude", "-0.5"}, "dissociates"},
		{"energy above the depth", []string{morse, "--pair", "H-Cl", "--energy", "5eV"}, "dissociates"},
		{"r below zero", []string{morse, "--pair", "H-Cl", "--amplitude", "-2"}, "outside the domain"},
		{"stretched to the limit", []string{morse, "--pair", "H-Cl", "--amplitude", "2nm"}, "too close to the limit"},
		{"below the Buckingham barrier", []string{"buckingham:A=1500,rho=0.3,C=25", "--mu", "20", "--amplitude", "-3"}, "collapses"},
		{"zero amplitude", []string{morse, "--pair", "H-Cl", "--amplitude", "0"}, "zero displacement"},
		{"amplitude in eV", []string{morse, "--pair", "H-Cl", "--amplitude", "1eV"}, "length"},
		{"energy in Å", []string{morse, "--pair", "H-Cl", "--energy", "1A"}, "energy"},
		{"steps for dopri", []string{morse, "--pair", "H-Cl", "--amplitude", "0.1", "--steps-per-period", "100"}, "dopri adapts its step"},
		{"rtol for rk4", []string{morse, "--pair", "H-Cl", "--amplitude", "0.1", "--method", "rk4", "--rtol", "1e-6"}, "dopri only"},
		{"too few steps", []string{morse, "--pair", "H-Cl", "--amplitude", "0.1", "--method", "rk4", "--steps-per-period", "2"}, "from 4 to"},
		{"too many steps", []string{morse, "--pair", "H-Cl", "--amplitude", "0.1", "--method", "rk4", "--steps-per-period", "100000000"}, "from 4 to"},
		{"zero periods", []string{morse, "--pair", "H-Cl", "--amplitude", "0.1", "--periods", "0"}, "from 1 to"},
		{"too many periods", []string{morse, "--pair", "H-Cl", "--amplitude", "0.1", "--periods", "1000000000"}, "from 1 to"},
		{"rtol out of range", []string{morse, "--pair", "H-Cl", "--amplitude", "0.1", "--rtol", "2"}, "(0, 1)"},
		{"no spec", []string{"--pair", "H-Cl", "--amplitude", "0.1"}, "takes SPEC"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			code, out, errOut := runMotionCLI(t, append([]string{"motion"}, tc.args...)...)
			assert.Equal(t, 2, code, errOut)
			assert.Empty(t, out)
			assert.Equal(t, 1, strings.Count(errOut, "\n"), "one line: %q", errOut)
			assert.Contains(t, errOut, tc.mention)
		})
	}
}

func TestMotionStepTooLarge(t *testing.T) {
	// Heun's energy grows by ≈ θ⁴/4 per step; at 5 steps per period it
	// passes the depth: a failure of the run (exit 1), with the reason.
	code, out, errOut := runMotionCLI(t, "motion", "morse:De=4.6,a=1.87,re=1.27", "--pair", "H-Cl", "--amplitude", "0.2",
		"--method", "heun", "--steps-per-period", "5")
	assert.Equal(t, 1, code)
	assert.Empty(t, out)
	assert.Contains(t, errOut, "too large")
}

func TestMotionHelp(t *testing.T) {
	code, out, _ := runMotionCLI(t, "motion", "--help")
	require.Equal(t, 0, code)
	for _, s := range []string{"--amplitude", "--energy", "--method", "--steps-per-period", "--periods", "--trajectory", "Example", "dopri"} {
		assert.Contains(t, out, s)
	}
}
