package main

import (
	"math"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"github.com/pairwell/pairwell/conformance"
	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/coretest"
)

// Invented parameters of the size of a light covalent bond.
const De, a, re = 4.6, 2.5, 1.27

func newRydberg(t *testing.T) core.Potential {
	t.Helper()
	p, err := Rydberg{}.New([]float64{De, a, re})
	require.NoError(t, err)
	return p
}

// TestDerivativesAreDerivatives checks each order against a central
// difference of the order below: V⁽ⁿ⁺¹⁾ ≈ [V⁽ⁿ⁾(r+h) − V⁽ⁿ⁾(r−h)]/2h,
// whose error is O(h²·V⁽ⁿ⁺³⁾) plus rounding O(ε·V⁽ⁿ⁾/h).
func TestDerivativesAreDerivatives(t *testing.T) {
	p := newRydberg(t)
	const h = 1e-5
	for _, r := range []float64{0.6, 1.0, 1.27, 1.5, 2.5, 4} {
		d := make([]float64, 12)
		require.NoError(t, coretest.Derivatives(p, r, d))
		for n := 0; n < 10; n++ {
			lo, hi := make([]float64, n+1), make([]float64, n+1)
			require.NoError(t, coretest.Derivatives(p, r-h, lo))
			require.NoError(t, coretest.Derivatives(p, r+h, hi))
			fd := (hi[n] - lo[n]) / (2 * h)
			scale := De * math.Pow(a, float64(n+1)) * float64(n+2)
			assert.InDelta(t, d[n+1], fd, 1e-6*scale, "V⁽%d⁾(%g)", n+1, r)
		}
	}
}

// TestClosedForm checks V⁽ⁿ⁾ = −De(−a)ⁿ(1 − n + a·x)e^{−a·x} (Rydberg 1931)
// at a few hand-checked points: V(re) = −De, V′(re) = 0, V″(re) = De·a²,
// and at x = 1/a (the inflection point) V″ = 0 and V′ = De·a/e.
func TestClosedForm(t *testing.T) {
	p := newRydberg(t)
	d := make([]float64, 5)
	require.NoError(t, coretest.Derivatives(p, re, d))
	assert.Equal(t, -De, d[0])
	assert.Equal(t, 0.0, d[1])
	assert.InDelta(t, De*a*a, d[2], 1e-14*De*a*a)
	assert.InDelta(t, -2*De*a*a*a, d[3], 1e-14*De*a*a*a)
	assert.InDelta(t, 3*De*a*a*a*a, d[4], 1e-14*De*a*a*a*a)
	require.NoError(t, coretest.Derivatives(p, re+1/a, d))
	assert.InDelta(t, 0, d[2], 1e-14*De*a*a)
	assert.InDelta(t, De*a/math.E, d[1], 1e-14*De*a)
	assert.InDelta(t, -2*De/math.E, d[0], 1e-14*De)
}

func TestSinglePointMatchesBatchBitForBit(t *testing.T) {
	p := newRydberg(t)
	rs := []float64{0.3, 0.9, 1.27, 1.31, 2, 7.5, 30}
	for n := 0; n <= 20; n++ {
		got := make([]float64, len(rs))
		require.NoError(t, coretest.Batch(p, n, rs, got))
		for i, r := range rs {
			d := make([]float64, n+1)
			require.NoError(t, coretest.Derivatives(p, r, d))
			assert.Equal(t, math.Float64bits(d[n]), math.Float64bits(got[i]), "V⁽%d⁾(%g)", n, r)
		}
	}
}

func TestIdentitiesHold(t *testing.T) {
	p := newRydberg(t)
	d := make([]float64, 5)
	require.NoError(t, coretest.Derivatives(p, re, d))
	w, err := core.AnalyzeWell(p, core.WellSettings{})
	require.NoError(t, err)
	for _, id := range p.(conformance.Identifier).Identities() {
		assert.Equal(t, reference, id.Source)
		switch id.Quantity {
		case conformance.EquilibriumR:
			assert.InDelta(t, w.Re, id.Value, 1e-14*re, id.Name)
		case conformance.MinimumEnergy:
			assert.InDelta(t, d[0], id.Value, 1e-14*De, id.Name)
		case conformance.DerivativeAtMinimum:
			assert.InDelta(t, d[id.Order], id.Value, 1e-14*math.Abs(id.Value), id.Name)
		}
	}
}

func TestErrors(t *testing.T) {
	_, err := Rydberg{}.New([]float64{De, -a, re})
	assert.ErrorIs(t, err, core.ErrParam)
	p := newRydberg(t)
	for _, r := range []float64{0, -1, math.NaN(), math.Inf(1)} {
		assert.ErrorIs(t, coretest.Derivatives(p, r, make([]float64, 2)), core.ErrDomain, "r = %g", r)
	}
	var pe *core.PointError
	require.ErrorAs(t, coretest.Batch(p, 1, []float64{1, 0}, make([]float64, 2)), &pe)
	assert.Equal(t, 1, pe.Index)
	assert.ErrorIs(t, coretest.Batch(p, maxOrder+1, []float64{1}, make([]float64, 1)), core.ErrOrder)
	assert.ErrorIs(t, coretest.Derivatives(p, 1, make([]float64, maxOrder+2)), core.ErrOrder)
	assert.ErrorIs(t, coretest.Batch(p, 0, []float64{1}, nil), core.ErrLength)
	// The normalized coefficients stay finite where the derivatives
	// overflow: V⁽¹⁰⁰⁾ ∝ 2000¹⁰⁰ ≈ 1e330, c₁₀₀ ∝ 2000¹⁰⁰/100! ≈ 1e172.
	// core.Derivative reports the overflow as a domain error, never ±Inf.
	steep, err := Rydberg{}.New([]float64{De, 2000, re})
	require.NoError(t, err)
	require.NoError(t, steep.Taylor(maxOrder, []float64{1.2}, make([]float64, maxOrder+1)))
	assert.ErrorIs(t, coretest.Batch(steep, maxOrder, []float64{1.2}, make([]float64, 1)), core.ErrDomain)
	_, err = core.Derivative(steep, maxOrder, 1.2)
	assert.ErrorIs(t, err, core.ErrDomain)
}

func TestMatch(t *testing.T) {
	params, notes, err := Rydberg{}.Match(core.Target{Re: 1.2, Depth: 4, K: 30})
	require.NoError(t, err)
	assert.Empty(t, notes)
	p, err := Rydberg{}.New(params)
	require.NoError(t, err)
	w, err := core.AnalyzeWell(p, core.WellSettings{})
	require.NoError(t, err)
	assert.InDelta(t, 1.2, w.Re, 1e-14)
	assert.InDelta(t, 4, w.Depth, 1e-14)
	assert.InDelta(t, 30, w.K, 1e-12)
	_, _, err = Rydberg{}.Match(core.Target{Re: 1.2, K: 30})
	assert.ErrorIs(t, err, core.ErrParam)
}
