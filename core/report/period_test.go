package report

import (
	"encoding/json"
	"errors"
	"math"
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/motion"
	"github.com/pairwell/pairwell/core/units"
	"github.com/pairwell/pairwell/models"
)

// The Morse well of the tests, V(r) = De(1 − e^{−a(r − re)})² − De, and a
// reduced mass close to that of H-Cl.
const (
	morseDe, morseA, morseRe = 4.6, 1.87, 1.27
	morseSpec                = "morse:De=4.6,a=1.87,re=1.27"
	testMu                   = 0.98
)

// build returns the instance of a spec of the built-in forms.
func build(t testing.TB, spec string) core.Instance {
	t.Helper()
	inst, err := models.NewRegistry().Build(spec)
	require.NoError(t, err, spec)
	return inst
}

// harmonicT0 is the harmonic period 2π√(μ/k) in fs for k in eV/Å² and μ
// in u, with the time unit √(u·Å²/eV) from the SI values of u and eV
// (definition).
func harmonicT0(k, mu float64) float64 {
	tau := math.Sqrt(units.Dalton*1e-20/units.ElectronVolt) * 1e15
	return 2 * math.Pi * math.Sqrt(mu/k) * tau
}

// morseT0 is the harmonic period of the test well: k = V″(re) = 2De·a².
func morseT0(mu float64) float64 { return harmonicT0(2*morseDe*morseA*morseA, mu) }

// morseEnergy is E = V(re + x) − V(re) = De(1 − e^{−ax})² (definition of
// the Morse form).
func morseEnergy(x float64) float64 { return morseDe * math.Pow(-math.Expm1(-morseA*x), 2) }

// morseTurning are the turning points r± − re of energy E, the roots of
// De(1 − e^{−ax})² = E: x± = −ln(1 ∓ √(E/De))/a.
func morseTurning(E float64) (inner, outer float64) {
	s := math.Sqrt(E / morseDe)
	return -math.Log1p(s) / morseA, -math.Log1p(-s) / morseA
}

func TestPeriodSweepMorse(t *testing.T) {
	t0 := morseT0(testMu)
	amplitudes := []float64{-0.2, -0.05, 0.1, 0.4, 0.8}
	energies := []float64{0.01, 1, 3.5}
	rows, w, err := PeriodSweep(build(t, morseSpec), testMu, amplitudes, energies, PeriodSettings{})
	require.NoError(t, err)
	require.Len(t, rows, len(amplitudes)+len(energies))
	assert.InDelta(t, morseRe, w.Re, 1e-12)
	assert.InEpsilon(t, morseDe, w.Depth, 1e-12)
	tests := []struct {
		name      string
		amplitude float64 // NaN for an energy row
		energy    float64
	}{
		{"compressed 0.2 Å", -0.2, morseEnergy(-0.2)},
		{"compressed 0.05 Å", -0.05, morseEnergy(-0.05)},
		{"stretched 0.1 Å", 0.1, morseEnergy(0.1)},
		{"stretched 0.4 Å", 0.4, morseEnergy(0.4)},
		{"stretched 0.8 Å", 0.8, morseEnergy(0.8)},
		{"E = 0.01 eV", math.NaN(), 0.01},
		{"E = 1 eV", math.NaN(), 1},
		{"E = 3.5 eV", math.NaN(), 3.5},
	}
	for i, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			r := rows[i]
			require.NoError(t, r.Err)
			inner, outer := morseTurning(tt.energy)
			if math.IsNaN(tt.amplitude) {
				assert.InDelta(t, outer, float64(r.Amplitude), 1e-10, "stretch-side turning point r₊ − re")
			} else {
				assert.Equal(t, tt.amplitude, float64(r.Amplitude))
			}
			assert.InEpsilon(t, tt.energy, float64(r.Energy), 1e-12)
			assert.InEpsilon(t, t0, float64(r.HarmonicPeriod), 1e-12)
			// Morse: T(E) = T0/√(1 − E/De) (classical Morse oscillator,
			// standard result; from memory).
			assert.InEpsilon(t, t0/math.Sqrt(1-tt.energy/morseDe), float64(r.ExactPeriod), 1e-11)
			assert.Less(t, float64(r.ExactPeriodError), 1e-11)
			// Second order on Morse: ω = ω0(1 − E/(2De)) (the first term of
			// the closed form's expansion).
			assert.InEpsilon(t, t0/(1-tt.energy/(2*morseDe)), float64(r.PerturbativePeriod), 1e-10)
			assert.InDelta(t, morseRe+inner, float64(r.Inner), 1e-10)
			assert.InDelta(t, morseRe+outer, float64(r.Outer), 1e-10)
			assert.Nil(t, r.MeasuredPeriod, "not measured")
		})
	}
}

func TestPeriodSweepRowErrors(t *testing.T) {
	// x = −0.6 Å: E = De(1 − e^{1.122})² ≈ 18 eV, above the depth; x = −3 Å
	// puts r at −1.73 Å.
	rows, _, err := PeriodSweep(build(t, morseSpec), testMu, []float64{-0.6, 0.3, -3, 0}, []float64{5}, PeriodSettings{})
	require.NoError(t, err)
	tests := []struct {
		name  string
		ok    bool
		text  string
		energ bool // energy reported
	}{
		{"above the depth", false, "dissociates", true},
		{"inside", true, "", true},
		{"outside the domain", false, "outside the domain", false},
		{"zero amplitude", true, "", true},
		{"energy above the depth", false, "dissociates", true},
	}
	for i, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			r := rows[i]
			if tt.ok {
				require.NoError(t, r.Err)
				assert.Greater(t, float64(r.ExactPeriod), 0.0)
				return
			}
			require.Error(t, r.Err)
			assert.Contains(t, r.Err.Error(), tt.text)
			assert.True(t, errors.Is(r.Err, core.ErrDomain), "%v", r.Err)
			assert.True(t, math.IsNaN(float64(r.ExactPeriod)))
			assert.True(t, math.IsNaN(float64(r.PerturbativePeriod)), "no perturbative period without an oscillation")
			assert.Equal(t, tt.energ, !math.IsNaN(float64(r.Energy)))
		})
	}
	assert.Equal(t, 0.0, float64(rows[3].Energy))
	assert.Equal(t, float64(rows[3].HarmonicPeriod), float64(rows[3].ExactPeriod), "E = 0: the harmonic period")
}

func TestPeriodSweepMeasured(t *testing.T) {
	var calls, last, total int
	s := PeriodSettings{Measure: true, Method: motion.DormandPrince, Progress: func(done, n int) {
		calls++
		assert.Equal(t, last+1, done, "serialised, one step at a time")
		last, total = done, n
	}}
	rows, _, err := PeriodSweep(build(t, morseSpec), testMu, []float64{0, 0.3, -3}, []float64{1}, s)
	require.NoError(t, err)
	// Three rows have an energy (x = −3 Å is outside the domain): three
	// exact periods and three measurements.
	assert.Equal(t, 6, total)
	assert.Equal(t, 6, calls)
	for _, r := range rows {
		require.NotNil(t, r.MeasuredPeriod, "every row has the key when measuring")
	}
	assert.True(t, math.IsNaN(float64(*rows[0].MeasuredPeriod)))
	assert.ErrorContains(t, rows[0].Err, "measured period: zero amplitude")
	assert.False(t, math.IsNaN(float64(rows[0].ExactPeriod)), "the exact values are kept")
	assert.True(t, math.IsNaN(float64(*rows[2].MeasuredPeriod)))
	for _, i := range []int{1, 3} {
		require.NoError(t, rows[i].Err)
		// Dormand–Prince at its default tolerances: within 1e-7 of the
		// quadrature (see the motion command's documentation).
		assert.InEpsilon(t, float64(rows[i].ExactPeriod), float64(*rows[i].MeasuredPeriod), 1e-7, "row %d", i)
	}
}

func TestPeriodSweepErrors(t *testing.T) {
	tests := []struct {
		name string
		spec string
		mu   float64
		is   error
	}{
		{"zero mass", morseSpec, 0, core.ErrParam},
		{"negative mass", "lj:epsilon=0.01,sigma=3.4", -1, core.ErrParam},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			_, _, err := PeriodSweep(build(t, tt.spec), tt.mu, []float64{0.1}, nil, PeriodSettings{})
			require.Error(t, err)
			assert.True(t, errors.Is(err, tt.is), "%v", err)
			assert.Regexp(t, `^(morse|lennard-jones): `, err.Error(), "prefixed with the model key")
		})
	}
}

func TestPeriodRowJSON(t *testing.T) {
	rows, _, err := PeriodSweep(build(t, morseSpec), testMu, []float64{0.1, -3}, nil, PeriodSettings{})
	require.NoError(t, err)
	b, err := json.Marshal(rows)
	require.NoError(t, err)
	var got []map[string]any
	require.NoError(t, json.Unmarshal(b, &got))
	keys := []string{"amplitude_angstrom", "energy_ev", "exact_period_fs", "exact_period_relative_error_estimate",
		"harmonic_period_fs", "perturbative_period_fs", "measured_period_fs", "inner_turning_point_angstrom", "outer_turning_point_angstrom", "error"}
	for _, r := range got {
		assert.Len(t, r, len(keys))
		assert.Nil(t, r["measured_period_fs"], "null when not measured")
		for _, k := range keys {
			assert.Contains(t, r, k)
		}
	}
	assert.Nil(t, got[0]["error"])
	assert.Contains(t, got[1]["error"], "outside the domain")
	assert.Nil(t, got[1]["energy_ev"], "NaN is null")
	// Keys in the order of the fields, "error" last.
	s := string(b)
	assert.Less(t, strings.Index(s, `"amplitude_angstrom"`), strings.Index(s, `"energy_ev"`))
	assert.Less(t, strings.Index(s, `"outer_turning_point_angstrom"`), strings.Index(s, `"error"`))
}

func TestPeriodTableMorse(t *testing.T) {
	amplitudes := []float64{0.05, 0.2, 0.5, 2}
	tab, err := NewPeriodTable("m", build(t, morseSpec), testMu, amplitudes)
	require.NoError(t, err)
	assert.Equal(t, "m", tab.Name)
	require.Len(t, tab.Rows, len(amplitudes))
	t0 := morseT0(testMu)
	for i, r := range tab.Rows {
		f := morseEnergy(amplitudes[i]) / morseDe
		require.Empty(t, r.Error)
		assert.Equal(t, amplitudes[i], r.Amplitude)
		assert.InEpsilon(t, f, r.DepthFraction, 1e-12)
		assert.InEpsilon(t, t0, r.Harmonic, 1e-12)
		// T/T0 = 1/√(1 − E/De) (Morse closed form, as above).
		assert.InEpsilon(t, 1/math.Sqrt(1-f), r.PeriodRatio(), 1e-11)
		assert.InDelta(t, 1/math.Sqrt(1-f)-1, r.Lengthening(), 1e-11)
		// T_pert/T = √(1 − f)/(1 − f/2), both closed forms above.
		assert.InDelta(t, math.Sqrt(1-f)/(1-f/2)-1, r.PerturbativeError(), 1e-10)
	}
	b, err := json.Marshal(tab)
	require.NoError(t, err)
	assert.NotContains(t, string(b), `"error":"`, "null when there is none")
	assert.Contains(t, string(b), `"error":null`)

	// |√(1 − f)/(1 − f/2) − 1| ≈ f²/8 grows with the amplitude: 7.9e-6 at
	// x = 0.05 Å (f ≈ 0.008), 1.2e-3 at 0.2 Å (f ≈ 0.097), 2.6e-2 at
	// 0.5 Å (f ≈ 0.37), 0.59 at 2 Å (f ≈ 0.95).
	tests := []struct {
		tol  float64
		want float64 // amplitude of the reach; NaN for none
	}{
		{1e-6, math.NaN()},
		{1e-3, 0.05},
		{1e-2, 0.2},
		{0.05, 0.5},
		{10, 2},
	}
	for _, tt := range tests {
		r, ok := tab.PerturbativeReach(tt.tol)
		if math.IsNaN(tt.want) {
			assert.False(t, ok, "tol %g", tt.tol)
			continue
		}
		require.True(t, ok, "tol %g", tt.tol)
		assert.Equal(t, tt.want, r.Amplitude, "tol %g", tt.tol)
	}
}

func TestPeriodTableErrors(t *testing.T) {
	// An amplitude outside the domain has no energy to tabulate.
	_, err := NewPeriodTable("m", build(t, morseSpec), testMu, []float64{0.1, -2})
	assert.True(t, errors.Is(err, core.ErrDomain), "%v", err)
	// Beyond the depth the row carries the error.
	tab, err := NewPeriodTable("m", build(t, morseSpec), testMu, []float64{-0.6})
	require.NoError(t, err)
	assert.Contains(t, tab.Rows[0].Error, "dissociates")
	_, ok := tab.PerturbativeReach(10)
	assert.False(t, ok, "rows with an error are skipped")
}

// The energies of tiny amplitudes come from the series at re: right to
// 1e-14 relative against the Morse closed form E = De·expm1(−ax)²
// (P. M. Morse, Phys. Rev. 34, 57 (1929)), and ±x differ as they should.
// The parameters are those of the reproduction (illustrative).
func TestPeriodSweepTinyAmplitudes(t *testing.T) {
	const de, a = 4.7, 2.0
	xs := []float64{1e-5, 1e-6, -1e-6, 1e-7, -1e-9, 1e-3, -0.1, 0.3}
	rows, _, err := PeriodSweep(build(t, "morse:De=4.7,a=2.0,re=0.74"), 4.0282, xs, nil, PeriodSettings{})
	require.NoError(t, err)
	for i, x := range xs {
		u := math.Expm1(-a * x)
		assert.InEpsilon(t, de*u*u, float64(rows[i].Energy), 1e-14, "x = %g", x)
	}
	assert.NotEqual(t, rows[1].Energy, rows[2].Energy)
}
