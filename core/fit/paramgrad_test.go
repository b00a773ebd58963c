package fit_test

import (
	"math"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
	"gonum.org/v1/gonum/diff/fd"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/coretest"
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
			g, ok := pot.(core.ParamGradient)
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
			assert.ErrorIs(t, g.ParamGradient(c.r, dst[:1]), core.ErrLength, "length mismatch")
			assert.ErrorIs(t, g.ParamGradient([]float64{-1}, make([]float64, np)), core.ErrDomain)
		})
	}
}

// countedModel wraps a model so that its potentials are wrapped in a
// coretest.Counting, as a test of batching would.
type countedModel struct{ core.Model }

func (m countedModel) New(params []float64) (core.Potential, error) {
	p, err := m.Model.New(params)
	if err != nil {
		return nil, err
	}
	w, _ := coretest.Count(p)
	return w, nil
}

func (m countedModel) Match(t core.Target) ([]float64, []string, error) {
	return core.Match(m.Model, t)
}

// TestParamGradientSurvivesWrapping checks that a wrapper of a potential
// forwards core.ParamGradient bit for bit, reports core.ErrUnsupported
// for an inner potential without it, and that a fit through the wrapper
// still uses the analytic Jacobian.
func TestParamGradientSurvivesWrapping(t *testing.T) {
	for _, c := range builtinSets {
		t.Run(c.model.Info().Key, func(t *testing.T) {
			pot, err := c.model.New(c.params)
			require.NoError(t, err)
			w, _ := coretest.Count(pot)
			ww, _ := coretest.Count(w)
			np := len(c.params)
			want := make([]float64, len(c.r)*np)
			got := make([]float64, len(c.r)*np)
			require.NoError(t, core.ParamDerivatives(pot, c.r, want))
			require.NoError(t, core.ParamDerivatives(ww, c.r, got))
			assert.Equal(t, want, got, "twice wrapped: bit for bit")
		})
	}
	pot, err := models.Morse{}.New([]float64{4.6, 1.87, 1.27})
	require.NoError(t, err)
	w, _ := coretest.Count(opaque{pot})
	assert.ErrorIs(t, core.ParamDerivatives(w, []float64{1.2}, make([]float64, 3)), core.ErrUnsupported)

	truth := []float64{4.6, 1.87, 1.27}
	d := scan(t, models.Morse{}, truth, 0.95, 4, 40, 0)
	res, err := fit.FitForm(countedModel{models.Morse{}}, d, fit.Settings{Offset: fit.Offset{Mode: fit.OffsetValue}})
	require.NoError(t, err)
	assert.True(t, res.Analytic, "the analytic Jacobian survives the wrapper")
	for j, want := range truth {
		assert.InDelta(t, 1, res.Instance.Params[j]/want, 1e-8, "parameter %d", j)
	}
}

// opaque hides every optional capability of a potential.
type opaque struct{ core.Potential }
