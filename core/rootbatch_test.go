package core

import (
	"errors"
	"math"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// batchOf evaluates the scalar functions fs for RootBatch and counts the
// calls.
func batchOf(fs []func(x float64) (float64, float64), calls *int) BatchFunc {
	return func(idx []int, x, fx, dfx []float64) error {
		*calls++
		for k, i := range idx {
			v, d := fs[i](x[k])
			fx[k] = v
			if k < len(dfx) {
				dfx[k] = d
			}
		}
		return nil
	}
}

// TestRootBatch solves several problems together and checks every root
// against Root on the same bracket, to a few ulp, in about as many calls as
// the slowest problem needs iterations.
func TestRootBatch(t *testing.T) {
	fs := []func(x float64) (float64, float64){
		func(x float64) (float64, float64) { return x*x*x - 2, 3 * x * x },
		func(x float64) (float64, float64) { return math.Cos(x) - x, -math.Sin(x) - 1 },
		func(x float64) (float64, float64) { return math.Exp(x) - 10, math.Exp(x) },
		func(x float64) (float64, float64) { return math.Atan(x - 0.3), 1 / (1 + (x-0.3)*(x-0.3)) }, // Newton overshoots
		func(x float64) (float64, float64) { return x - 1, 0 },                                      // no slope: bisection
	}
	brackets := [][2]float64{{0, 2}, {1, 0}, {-5, 5}, {-20, 30}, {0, 3}}
	probs := make([]RootProblem, len(fs))
	for i, b := range brackets {
		flo, _ := fs[i](b[0])
		fhi, _ := fs[i](b[1])
		probs[i] = RootProblem{Lo: b[0], Hi: b[1], FLo: flo, FHi: fhi, Start: math.NaN()}
	}
	roots := make([]float64, len(fs))
	errs := make([]error, len(fs))
	calls := 0
	require.NoError(t, RootBatch(batchOf(fs, &calls), probs, roots, errs))
	for i, f := range fs {
		require.NoError(t, errs[i], "problem %d", i)
		want, err := Root(func(x float64) (float64, float64, error) { v, d := f(x); return v, d, nil }, brackets[i][0], brackets[i][1])
		require.NoError(t, err)
		assert.InDelta(t, want, roots[i], 4*ulp(want), "problem %d", i)
	}
	assert.InDelta(t, math.Cbrt(2), roots[0], 4*ulp(roots[0]))
	assert.InDelta(t, math.Log(10), roots[2], 4*ulp(roots[2]))
	assert.Less(t, calls, 70, "bisection of [0, 3] to 2 ulp takes ~55 halvings")

	// A problem's result does not depend on the others.
	one := make([]float64, 1)
	oneErr := make([]error, 1)
	for i := range fs {
		calls = 0
		require.NoError(t, RootBatch(batchOf(fs[i:i+1], &calls), probs[i:i+1], one, oneErr))
		require.NoError(t, oneErr[0])
		assert.Equal(t, roots[i], one[0], "problem %d alone", i)
	}
}

// TestRootBatchNoise: for a function known only to a rounding error, once
// |f| is within it the bracket is narrowed by sampling, 16-fold per call,
// rather than by Newton steps that wander in the noise.
func TestRootBatchNoise(t *testing.T) {
	// (x + 1e8) − (1 + 1e8) − 1e-9: a root near x = 1, values rounded to
	// ulp(1e8) ≈ 1.5e-8.
	f := func(x float64) (float64, float64) { return (x + 1e8) - (1 + 1e8) - 1e-9, 1 }
	flo, _ := f(0.5)
	fhi, _ := f(1.5)
	for _, noise := range []float64{0, 2e-8} {
		calls := 0
		roots := make([]float64, 1)
		errs := make([]error, 1)
		probs := []RootProblem{{Lo: 0.5, Hi: 1.5, FLo: flo, FHi: fhi, Start: 0.9, Noise: noise}}
		require.NoError(t, RootBatch(batchOf([]func(float64) (float64, float64){f}, &calls), probs, roots, errs))
		require.NoError(t, errs[0])
		assert.InDelta(t, 1, roots[0], 3e-8, "noise %g", noise)
		// The sign of f changes within 2 ulp of the root.
		lo, _ := f(roots[0] - 2*ulp(1))
		hi, _ := f(roots[0] + 2*ulp(1))
		assert.True(t, lo <= 0 && hi >= 0, "noise %g: sign change at %v", noise, roots[0])
		if noise > 0 {
			assert.LessOrEqual(t, calls, 10, "noise %g", noise)
		}
	}
}

func TestRootBatchErrors(t *testing.T) {
	sq := func(x float64) (float64, float64) { return x*x - 2, 2 * x }
	roots := make([]float64, 3)
	errs := make([]error, 3)
	probs := []RootProblem{
		{Lo: 0, Hi: 2, FLo: -2, FHi: 2},
		{Lo: 2, Hi: 3, FLo: 2, FHi: 7}, // same sign
		{Lo: -1, Hi: 0, FLo: 0, FHi: -2},
	}
	calls := 0
	fs := []func(float64) (float64, float64){sq, sq, sq}
	require.NoError(t, RootBatch(batchOf(fs, &calls), probs, roots, errs))
	require.NoError(t, errs[0])
	assert.InDelta(t, math.Sqrt2, roots[0], 4*ulp(math.Sqrt2))
	assert.ErrorIs(t, errs[1], ErrNoConvergence)
	require.NoError(t, errs[2])
	assert.Equal(t, -1.0, roots[2], "a zero at an end")
	assert.ErrorIs(t, RootBatch(batchOf(fs, &calls), probs, roots[:1], errs), ErrLength)

	// A point error fails its own problem only; any other error is
	// returned and set for every unfinished problem.
	bad := errors.New("broken")
	pointFail := func(idx []int, x, fx, dfx []float64) error {
		for k, i := range idx {
			if i == 1 {
				return &PointError{Index: k, R: x[k], Err: ErrDomain}
			}
			fx[k] = x[k]*x[k] - 2
			if k < len(dfx) {
				dfx[k] = 2 * x[k]
			}
		}
		return nil
	}
	probs = []RootProblem{{Lo: 0, Hi: 2, FLo: -2, FHi: 2}, {Lo: 0, Hi: 2, FLo: -2, FHi: 2}}
	require.NoError(t, RootBatch(pointFail, probs, roots[:2], errs[:2]))
	require.NoError(t, errs[0])
	assert.InDelta(t, math.Sqrt2, roots[0], 4*ulp(math.Sqrt2))
	assert.ErrorIs(t, errs[1], ErrDomain)
	err := RootBatch(func([]int, []float64, []float64, []float64) error { return bad }, probs, roots[:2], errs[:2])
	assert.ErrorIs(t, err, bad)
	assert.ErrorIs(t, errs[0], bad)
	assert.ErrorIs(t, errs[1], bad)
}
