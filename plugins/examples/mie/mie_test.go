package main

import (
	"math"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"github.com/pairwell/pairwell/conformance"
	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/coretest"
	"github.com/pairwell/pairwell/models"
)

// Invented argon-sized parameters.
const eps, sigma = 0.0104, 3.4

func newMie(t *testing.T, n, m float64) core.Potential {
	t.Helper()
	p, err := Mie().New([]float64{eps, sigma, n, m})
	require.NoError(t, err)
	return p
}

// TestLennardJones checks n = 12, m = 6 against the built-in
// Lennard-Jones 12-6, 4ε[(σ/r)¹² − (σ/r)⁶] (C = 4, Mie 1903), relative to
// the size of the two terms.
func TestLennardJones(t *testing.T) {
	p := newMie(t, 12, 6)
	lj, err := models.LennardJones{}.New([]float64{eps, sigma})
	require.NoError(t, err)
	for _, r := range []float64{2.8, 3.4, 3.816, 4.5, 7, 15} {
		got, want := make([]float64, 9), make([]float64, 9)
		require.NoError(t, coretest.Derivatives(p, r, got))
		require.NoError(t, coretest.Derivatives(lj, r, want))
		for n := range got {
			scale := 4 * eps * (math.Pow(sigma/r, 12) + math.Pow(sigma/r, 6)) * math.Pow(20/r, float64(n))
			assert.InDelta(t, want[n], got[n], 1e-14*scale, "V⁽%d⁾(%g)", n, r)
		}
	}
}

// TestDerivativesAreDerivatives checks each order against a central
// difference of the order below, for a non-integer pair of exponents.
func TestDerivativesAreDerivatives(t *testing.T) {
	p := newMie(t, 13.5, 5.5)
	const h = 1e-5
	for _, r := range []float64{3, 3.6, 4.2, 6} {
		d := make([]float64, 9)
		require.NoError(t, coretest.Derivatives(p, r, d))
		for n := 0; n < 8; n++ {
			lo, hi := make([]float64, n+1), make([]float64, n+1)
			require.NoError(t, coretest.Derivatives(p, r-h, lo))
			require.NoError(t, coretest.Derivatives(p, r+h, hi))
			fd := (hi[n] - lo[n]) / (2 * h)
			assert.InDelta(t, d[n+1], fd, 1e-6*(math.Abs(d[n+1])+math.Abs(d[n])), "V⁽%d⁾(%g)", n+1, r)
		}
	}
}

func TestSinglePointMatchesBatchBitForBit(t *testing.T) {
	p := newMie(t, 9, 6)
	rs := []float64{2.5, 3.4, 3.9, 5, 12}
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

// TestIdentitiesHold checks r_min, V(r_min) = −ε, V″(r_min) = n·m·ε/r_min²
// and V(σ) = 0 against the potential, for several exponent pairs.
func TestIdentitiesHold(t *testing.T) {
	for _, nm := range [][2]float64{{12, 6}, {9, 6}, {14, 7}, {20.5, 3.5}} {
		p := newMie(t, nm[0], nm[1])
		w, err := core.AnalyzeWell(p, core.WellSettings{})
		require.NoError(t, err)
		for _, id := range p.(conformance.Identifier).Identities() {
			switch id.Quantity {
			case conformance.EquilibriumR:
				assert.InDelta(t, w.Re, id.Value, 1e-14*w.Re, "%v %s", nm, id.Name)
			case conformance.MinimumEnergy:
				assert.InDelta(t, w.Energy, id.Value, 1e-14*eps, "%v %s", nm, id.Name)
			case conformance.DerivativeAtMinimum:
				d, err := core.Derivative(p, id.Order, w.Re)
				require.NoError(t, err)
				assert.InDelta(t, d, id.Value, 1e-13*math.Abs(id.Value), "%v %s", nm, id.Name)
			case conformance.ValueAt:
				v, err := core.Value(p, id.R)
				require.NoError(t, err)
				assert.InDelta(t, id.Value, v, 1e-15, "%v %s", nm, id.Name)
			}
		}
	}
}

func TestErrors(t *testing.T) {
	for _, params := range [][]float64{{eps, sigma, 6, 6}, {eps, sigma, 6, 12}, {eps, sigma, 12}, {-eps, sigma, 12, 6}} {
		_, err := Mie().New(params)
		assert.ErrorIs(t, err, core.ErrParam, "%v", params)
	}
	p := newMie(t, 12, 6)
	assert.ErrorIs(t, coretest.Derivatives(p, 0, make([]float64, 1)), core.ErrDomain)
	assert.ErrorIs(t, coretest.Batch(p, 2, []float64{1e-200}, make([]float64, 1)), core.ErrDomain, "overflow is a domain error")
	assert.ErrorIs(t, coretest.Batch(p, maxOrder+1, []float64{1}, make([]float64, 1)), core.ErrOrder)
}

// TestConformance runs the conformance suite on the jet-written form, as
// a plugin author would.
func TestConformance(t *testing.T) {
	conformance.Test(t, Mie(), []float64{eps, sigma, 12, 6}, []float64{eps, sigma, 13.5, 5.5})
}
