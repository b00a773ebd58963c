package report

import (
	"encoding/json"
	"errors"
	"math"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/motion"
)

func TestMotionMorse(t *testing.T) {
	t0 := morseT0(testMu)
	m := Mass{Pair: "H-Cl", Mu: testMu}
	tests := []struct {
		name   string
		start  MotionStart
		method motion.Method
		tol    float64 // measured vs exact: the documented accuracy at the defaults
	}{
		{"stretch, dopri", MotionStart{Amplitude: 0.2}, motion.DormandPrince, 1e-7},
		{"compress, rk4", MotionStart{Amplitude: -0.1}, motion.RK4, 1e-6},
		{"energy, verlet", MotionStart{Energy: 2.3, ByEnergy: true}, motion.Verlet, 1e-4},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			r, tr, err := NewMotion(build(t, morseSpec), m, tt.start, motion.Settings{Method: tt.method, Periods: 3})
			require.NoError(t, err)
			assert.Empty(t, tr, "no trajectory unless recorded")
			E := tt.start.Energy
			inner, outer := morseTurning(morseEnergy(tt.start.Amplitude))
			if tt.start.ByEnergy {
				inner, outer = morseTurning(E)
				assert.InDelta(t, outer, r.Amplitude, 1e-10, "starts at the stretch-side turning point")
			} else {
				E = morseEnergy(tt.start.Amplitude)
				assert.Equal(t, tt.start.Amplitude, r.Amplitude)
			}
			assert.Equal(t, "morse", r.Model)
			assert.Equal(t, Text("H-Cl"), r.Pair)
			assert.Equal(t, tt.method.String(), r.Method)
			assert.InDelta(t, morseRe+r.Amplitude, r.R0, 1e-15)
			assert.InEpsilon(t, E, r.Energy, 1e-10)
			assert.InEpsilon(t, E/morseDe, float64(r.DepthFraction), 1e-10)
			assert.InEpsilon(t, E/morseDe, r.BoundFraction, 1e-10, "no barrier: the bound limit is the depth")
			assert.InEpsilon(t, t0, r.HarmonicPeriod, 1e-12)
			// Morse: T(E) = T0/√(1 − E/De) (standard result; from memory).
			assert.InEpsilon(t, t0/math.Sqrt(1-E/morseDe), r.ExactPeriod, 1e-10)
			// Second order on Morse: ω = ω0(1 − E/(2De)).
			assert.InEpsilon(t, t0/(1-E/(2*morseDe)), float64(r.PerturbativePeriod), 1e-9)
			assert.InDelta(t, morseRe+inner, r.InnerTurningPoint, 1e-10)
			assert.InDelta(t, morseRe+outer, r.OuterTurningPoint, 1e-10)
			assert.InDelta(t, 0, r.MeasuredError, tt.tol)
			assert.InDelta(t, r.MeasuredPeriod/r.ExactPeriod-1, r.MeasuredError, 1e-15)
			assert.Equal(t, 3, r.PeriodsMeasured)
			if tt.method == motion.DormandPrince {
				require.NotNil(t, r.RTol)
				assert.Equal(t, motion.DefaultRTol, *r.RTol)
				assert.Equal(t, motion.DefaultATol, *r.ATol)
			} else {
				assert.Nil(t, r.RTol, "fixed step: no tolerances")
			}
		})
	}
}

// TestMotionHarmonic: in the harmonic form every period is 2π√(μ/k) and
// the well has no top.
func TestMotionHarmonic(t *testing.T) {
	const k, mu = 30.0, 2.0
	t0 := harmonicT0(k, mu)
	r, tr, err := NewMotion(build(t, "harmonic:k=30,r0=1.2"), Mass{Mu: mu}, MotionStart{Amplitude: 0.3},
		motion.Settings{Periods: 2, Record: 1})
	require.NoError(t, err)
	assert.InEpsilon(t, t0, r.ExactPeriod, 1e-11)
	assert.InEpsilon(t, t0, float64(r.PerturbativePeriod), 1e-12, "c₃ = c₄ = 0: no shift")
	assert.InEpsilon(t, t0, r.MeasuredPeriod, 1e-7)
	assert.Equal(t, 0.0, r.BoundFraction, "unbounded well")
	assert.True(t, math.IsNaN(float64(r.DepthFraction)), "unbounded well: E/depth does not apply")
	// E = ½kx² (definition).
	assert.InEpsilon(t, 0.5*k*0.3*0.3, r.Energy, 1e-12)
	require.NotEmpty(t, tr, "Record = 1 keeps every step")
	assert.Equal(t, r.Steps+1, len(tr), "the start and every step")
	b, err := json.Marshal(r)
	require.NoError(t, err)
	assert.Contains(t, string(b), `"trajectory_file":null`, "set by the caller only")
}

func TestMotionErrors(t *testing.T) {
	tests := []struct {
		name  string
		spec  string
		mu    float64
		start MotionStart
		check func(t *testing.T, err error)
	}{
		{"zero amplitude", morseSpec, testMu, MotionStart{}, startErr(core.ErrParam, "zero displacement")},
		{"beyond the depth", morseSpec, testMu, MotionStart{Amplitude: -1}, startErr(core.ErrDomain, "dissociates")},
		{"energy at the depth", morseSpec, testMu, MotionStart{Energy: morseDe, ByEnergy: true}, startErr(core.ErrDomain, "dissociates")},
		{"negative energy", morseSpec, testMu, MotionStart{Energy: -1, ByEnergy: true}, startErr(core.ErrParam, "must be finite and > 0")},
		// E/De = 1 − 2.2e-8: within 1e-6 of the top, where
		// T = T0/√(1 − E/De) ≈ 6700·T0.
		{"near the top", morseSpec, testMu, MotionStart{Energy: 4.5999999, ByEnergy: true}, func(t *testing.T, err error) {
			assert.True(t, errors.Is(err, ErrTooLong), "%v", err)
			assert.EqualError(t, err, "morse: E = 4.6 eV is too close to the limit of bound motion (4.6 eV): "+
				"E/limit = 1 − 2.2e-08, the period diverges there, too long to integrate; choose a smaller amplitude or energy")
		}},
		{"no mass", morseSpec, 0, MotionStart{Amplitude: 0.1}, func(t *testing.T, err error) {
			var se *StartError
			assert.False(t, errors.As(err, &se))
			assert.True(t, errors.Is(err, core.ErrParam), "%v", err)
			assert.Regexp(t, "^morse: ", err.Error())
		}},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			_, _, err := NewMotion(build(t, tt.spec), Mass{Mu: tt.mu}, tt.start, motion.Settings{})
			require.Error(t, err)
			tt.check(t, err)
		})
	}
}

// startErr checks that err is a *StartError wrapping is, with text.
func startErr(is error, text string) func(t *testing.T, err error) {
	return func(t *testing.T, err error) {
		var se *StartError
		require.True(t, errors.As(err, &se), "%T %v", err, err)
		assert.True(t, errors.Is(err, is), "%v", err)
		assert.Contains(t, se.Error(), text)
		assert.False(t, errors.Is(err, ErrTooLong))
	}
}

// TestMotionNotes: above the energies the default steps were validated for
// (half the limit of bound motion) the report says that the default
// accuracy is not guaranteed; with a step of the user's own it does not.
func TestMotionNotes(t *testing.T) {
	inst := build(t, morseSpec)
	start := MotionStart{Energy: 0.9 * morseDe, ByEnergy: true}
	r, _, err := NewMotion(inst, Mass{Mu: testMu}, start, motion.Settings{Method: motion.RK4, Periods: 2})
	require.NoError(t, err)
	require.Len(t, r.Notes, 1)
	assert.Contains(t, r.Notes[0], "not guaranteed")
	r, _, err = NewMotion(inst, Mass{Mu: testMu}, start, motion.Settings{Method: motion.RK4, Periods: 2, StepsPerPeriod: 2000})
	require.NoError(t, err)
	assert.Empty(t, r.Notes)
	r, _, err = NewMotion(inst, Mass{Mu: testMu}, MotionStart{Energy: 0.2 * morseDe, ByEnergy: true}, motion.Settings{Periods: 2})
	require.NoError(t, err)
	assert.Empty(t, r.Notes)
	assert.Greater(t, float64(r.RelativeEnergyDrift), r.RelativeEnergyFloor)
}
