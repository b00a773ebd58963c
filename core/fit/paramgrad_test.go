package fit_test

import (
	"math"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
	"gonum.org/v1/gonum/diff/fd"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/fit"
	"github.com/pairwell/pairwell/models"
)

// builtinSets are realistic parameter sets of the built-in forms and
// separations around their wells (invented, HCl-like).
var builtinSets = []struct {
	model  core.Model
	params []float64
	r      []float64
}{
	{models.Morse{}, []float64{4.6, 1.87, 1.27}, []float64{0.9, 1.1, 1.27, 1.6, 2.5, 4}},
	{models.LennardJones{}, []float64{0.5, 3.4}, []float64{3.2, 3.6, 3.8, 4.5, 6, 9}},
	{models.Harmonic{}, []float64{31.3, 1.27}, []float64{0.9, 1.27, 1.5, 3}},
	{models.Buckingham{}, []float64{1000, 0.3, 20}, []float64{2.2, 2.5, 3, 3.5, 5, 8}},
}

// TestParamGradient checks the analytic parameter derivatives of every
// built-in form against gonum's central differences (diff/fd) to 1e-7
// relative to the size of the gradient row.
func TestParamGradient(t *testing.T) {
	for _, c := range builtinSets {
		t.Run(c.model.Info().Key, func(t *testing.T) {
			pot, err := c.model.New(c.params)
			require.NoError(t, err)
			g, ok := pot.(fit.ParamGradient)
			require.True(t, ok)
			np := len(c.params)
			dst := make([]float64, len(c.r)*np)
			require.NoError(t, g.ParamGradient(c.r, dst))
			for i, r := range c.r {
				want := make([]float64, np)
				fd.Gradient(want, func(p []float64) float64 {
					q, err := c.model.New(p)
					require.NoError(t, err)
					v, err := core.Value(q, r)
					require.NoError(t, err)
					return v
				}, c.params, &fd.Settings{Formula: fd.Central, Step: 1e-6})
				scale := 0.0
				for j := range want {
					scale = math.Max(scale, math.Abs(want[j]*c.params[j]))
				}
				for j := range want {
					assert.InDelta(t, want[j]*c.params[j], dst[i*np+j]*c.params[j], 1e-7*scale, "r = %g, parameter %d", r, j)
				}
			}
			assert.Error(t, g.ParamGradient(c.r, dst[:1]), "length mismatch")
			assert.ErrorIs(t, g.ParamGradient([]float64{-1}, make([]float64, np)), core.ErrDomain)
		})
	}
}
