package main

import (
	"encoding/json"
	"math"
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"github.com/pairwell/pairwell/core/units"
)

func TestDemoTable(t *testing.T) {
	code, out, errOut := runCLI(t, "demo", "--no-pictures")
	require.Equal(t, 0, code, errOut)
	assert.Empty(t, errOut)
	assert.Contains(t, out, "INVENTED bond, not a real molecule")
	assert.Contains(t, out, "not a validated force field", "the caution line")
	for _, s := range []string{"== Four forms, one bond", "== Period against amplitude", "== What the numbers say",
		"== The bond warms up", "== An INVENTED gas against INVENTED B₂ data",
		"morse", "lennard-jones", "buckingham", "harmonic", "6.7× stiffer", "== Quantum levels"} {
		assert.Contains(t, out, s)
	}
}

func TestDemoJSON(t *testing.T) {
	code, out, errOut := runCLI(t, "demo", "--format", "json", "--no-pictures")
	require.Equal(t, 0, code, errOut)
	var r struct {
		Scenario struct {
			Invented bool    `json:"invented"`
			Depth    float64 `json:"well_depth_ev"`
		} `json:"scenario"`
		Compare []map[string]any `json:"compare"`
		Period  struct {
			Name string `json:"name"`
			Rows []struct {
				Amplitude    float64  `json:"amplitude_angstrom"`
				Energy       float64  `json:"energy_ev"`
				Fraction     float64  `json:"depth_fraction"`
				Exact        float64  `json:"exact_period_fs"`
				Harmonic     float64  `json:"harmonic_period_fs"`
				Perturbative *float64 `json:"perturbative_period_fs"`
			} `json:"rows"`
		} `json:"period"`
		Fit struct {
			Invented bool             `json:"invented"`
			Data     string           `json:"data"`
			Points   int              `json:"points"`
			Fits     []map[string]any `json:"fits"`
		} `json:"fit"`
		Temperature struct {
			Expansion struct {
				Rows []map[string]any `json:"rows"`
			} `json:"expansion"`
			Gas struct {
				Invented bool           `json:"invented"`
				Virial   map[string]any `json:"virial"`
			} `json:"gas"`
		} `json:"temperature"`
		Levels         map[string]any `json:"levels"`
		Interpretation string         `json:"interpretation"`
		Caution        string         `json:"caution"`
	}
	require.NoError(t, json.Unmarshal([]byte(out), &r))
	assert.True(t, r.Scenario.Invented)
	require.Len(t, r.Compare, 4)
	for _, row := range r.Compare {
		requireValidityKeys(t, row)
	}
	assert.Equal(t, "morse", r.Period.Name)
	require.NotEmpty(t, r.Period.Rows)
	for _, row := range r.Period.Rows {
		// Morse: T(E) = T0/√(1 − E/De) (closed form, standard result;
		// from memory); near the top of the well T is ill-conditioned,
		// hence the looser tolerance there.
		assert.InEpsilon(t, row.Harmonic/math.Sqrt(1-row.Fraction), row.Exact, 1e-9, "amplitude %g", row.Amplitude)
		// Morse: E = De(1 − e^{−a·x})² at stretch x, a = √(k/(2De)).
		a := math.Sqrt(30 / 8.0)
		assert.InEpsilon(t, 4*math.Pow(1-math.Exp(-a*row.Amplitude), 2), row.Energy, 1e-12)
		// Perturbative: ω ≈ ω0(1 − E/(2De)) on Morse (the first-order term
		// of the closed form).
		require.NotNil(t, row.Perturbative)
		assert.InEpsilon(t, row.Harmonic/(1-row.Fraction/2), *row.Perturbative, 1e-9)
	}
	for _, s := range []string{"1 %", "Lennard-Jones", "stiffer", "Buckingham"} {
		assert.Contains(t, r.Interpretation, s)
	}
	assert.Contains(t, r.Caution, "not a validated force field")
	// The quantum levels of the matched Morse well (De = 4 eV,
	// a = √(k/(2De)), μ = 7 u): ZPE = ωe/2 − ωexe/4 and the fundamental
	// ωe − 2ωexe of the Morse closed form (Morse 1929), with
	// ωe = √(k/μ)/(2πc) and ωexe = ωe²/(4De).
	require.NotNil(t, r.Levels)
	we := units.Wavenumber(units.AngularFrequency(30, 7))
	wexe := we * we / (4 * 4 / units.WavenumberEV)
	assert.InDelta(t, we/2-wexe/4, r.Levels["zero_point_energy_per_cm"], 1e-5)
	assert.InDelta(t, we-2*wexe, r.Levels["fundamental_per_cm"], 1e-5)
	for _, s := range []string{"zero-point energy", "D0 =", "bound vibrational levels"} {
		assert.Contains(t, r.Interpretation, s)
	}
	// The temperature section: the bond's expansion with the quantum
	// column, and the invented gas against its invented data.
	require.Len(t, r.Temperature.Expansion.Rows, len(demoExpansionTemperatures))
	for _, row := range r.Temperature.Expansion.Rows {
		assert.Greater(t, row["mean_r_quantum_angstrom"], 1.2)
		assert.Greater(t, row["mean_r_classical_angstrom"], 1.2)
	}
	assert.True(t, r.Temperature.Gas.Invented)
	data := r.Temperature.Gas.Virial["data"].(map[string]any)
	assert.Less(t, data["rms_deviation_cm3_per_mol"], 2.0)
	// Boyle T* = 3.4179 of Lennard-Jones (Hirschfelder, Curtiss & Bird 1954, from memory), ε/k_B = 120 K.
	assert.InDelta(t, 3.4179*120, r.Temperature.Gas.Virial["boyle_temperature_k"], 0.02)
	// the fit section: the four built-ins fitted to the invented scan,
	// Morse first (the scan is an extended-Rydberg curve of the demo bond)
	assert.True(t, r.Fit.Invented)
	assert.Equal(t, 44, r.Fit.Points)
	require.Len(t, r.Fit.Fits, 4)
	assert.Equal(t, "morse", r.Fit.Fits[0]["model"])
	well := r.Fit.Fits[0]["well"].(map[string]any)
	assert.InDelta(t, 1.20, well["equilibrium_r_angstrom"], 0.01, "the curve's re")
	assert.InDelta(t, 4.00, well["well_depth_ev"], 0.01, "the curve's De")
}

func TestDemoBadInput(t *testing.T) {
	for _, args := range [][]string{{"demo", "extra"}, {"demo", "--format", "csv"}} {
		code, out, errOut := runCLI(t, args...)
		assert.Equal(t, 2, code, args)
		assert.Empty(t, out, args)
		assert.Equal(t, 1, strings.Count(errOut, "\n"), errOut)
	}
}

// BenchmarkDemo is the whole demo, in process, as a table, pictures
// included; they go to a temporary directory, not the package directory.
func BenchmarkDemo(b *testing.B) {
	b.Chdir(b.TempDir())
	for b.Loop() {
		var out, errOut strings.Builder
		if code := run([]string{"demo"}, strings.NewReader(""), &out, &errOut); code != 0 {
			b.Fatal(errOut.String())
		}
	}
}
