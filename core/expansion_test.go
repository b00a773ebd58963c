package core_test

import (
	"math"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"github.com/pairwell/pairwell/core"
)

// morseEnergy is the Morse closed form (P. M. Morse, Phys. Rev. 34, 57
// (1929)) E(x) = De(1 − e^{−ax})², written with expm1 so that it keeps
// full relative precision at every x.
func morseEnergy(de, a, x float64) float64 {
	u := math.Expm1(-a * x)
	return de * u * u
}

// morseDisplacement inverts it: 1 − e^{−ax} = ±√(E/De), with log1p.
func morseDisplacement(de, a, E, dir float64) float64 {
	return -math.Log1p(-dir*math.Sqrt(E/de)) / a
}

// The energy of a displacement, and the displacement of an energy, from the
// series at re are right to 1e-14 relative at every amplitude on either side
// (the parameters are those of the example, illustrative).
func TestExpansionMorse(t *testing.T) {
	const de, a, re = 4.7, 2.0, 0.74
	p := build(t, "morse:De=4.7,a=2.0,re=0.74")
	w, err := core.AnalyzeWell(p, core.WellSettings{})
	require.NoError(t, err)
	require.Equal(t, re, w.Re)
	ex := core.NewExpansion(w)
	require.Equal(t, core.SeriesOrder, ex.Order())
	var worst, worstX float64
	for _, dir := range []float64{-1, 1} {
		for lg := -9.0; lg <= math.Log10(0.3); lg += 0.05 {
			x := dir * math.Pow(10, lg)
			v, err := core.Value(p, re+x)
			require.NoError(t, err)
			want := morseEnergy(de, a, x)
			got, bound := ex.Energy(x, v, w.Energy)
			rel := math.Abs(got/want - 1)
			assert.LessOrEqual(t, rel, 1e-14, "x = %g", x)
			// The bound covers the error (with the reference's few ulp).
			assert.LessOrEqual(t, math.Abs(got-want), bound+4*0x1p-52*want, "x = %g", x)
			worst = math.Max(worst, rel)

			if xs, ok := ex.Displacement(want, dir); ok {
				xw := morseDisplacement(de, a, want, dir)
				relx := math.Abs(xs/xw - 1)
				assert.LessOrEqual(t, relx, 1e-14, "E = %g", want)
				worstX = math.Max(worstX, relx)
			} else {
				// Only where the direct solve is as good: E above
				// 1e-4·De at least.
				assert.Greater(t, want, 1e-4*de, "x = %g: series refused", x)
			}
		}
	}
	t.Logf("worst relative error: energy %.2g, displacement %.2g", worst, worstX)
}

// A zero Expansion (no coefficients) always defers to the direct
// difference, and so does the series where it does not converge.
func TestExpansionZero(t *testing.T) {
	var ex core.Expansion
	_, b := ex.Sum(1e-3, 2)
	assert.True(t, math.IsInf(b, 1))
	e, _ := ex.Energy(1e-3, 2, 1)
	assert.Equal(t, 1.0, e)
	_, ok := ex.Displacement(1e-3, 1)
	assert.False(t, ok)
}
