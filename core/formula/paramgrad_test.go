package formula_test

import (
	"math"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
	"gonum.org/v1/gonum/diff/fd"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/formula"
	"github.com/pairwell/pairwell/models"
	"github.com/pairwell/pairwell/models/library"
)

// TestParamGradientMorse compares the symbolic parameter derivatives of
// Morse typed as a formula with the built-in Morse's closed forms
// (models/paramgrad.go, from V = De(y² − 2y), y = e^{−a(r−re)}, P. M. Morse,
// Phys. Rev. 34, 57 (1929)) to 1e-12 relative to the size of each row (up
// to r = 4 Å: farther out the formula's (1 − y)² − 1 cancels, which is
// rounding in V itself).
func TestParamGradientMorse(t *testing.T) {
	f, err := formula.NewForm(formula.Decl{Key: "fmorse", Formula: "De*((1 - exp(-a*(r - re)))^2 - 1)", Limit: "0",
		Params: []formula.ParamDecl{{Name: "De", Unit: "eV", Constraint: "> 0"}, {Name: "a", Unit: "1/A", Constraint: "> 0"}, {Name: "re", Unit: "A", Constraint: "> 0"}}})
	require.NoError(t, err)
	params := []float64{4.6, 1.87, 1.27}
	r := []float64{0.8, 0.95, 1.1, 1.27, 1.6, 2.5, 4}
	fp, err := f.New(params)
	require.NoError(t, err)
	bp, err := models.Morse{}.New(params)
	require.NoError(t, err)
	got, want := make([]float64, 3*len(r)), make([]float64, 3*len(r))
	require.NoError(t, core.ParamDerivatives(fp, r, got))
	require.NoError(t, core.ParamDerivatives(bp, r, want))
	for i := range r {
		scale := 0.0
		for j := 0; j < 3; j++ {
			scale = math.Max(scale, math.Abs(want[3*i+j]*params[j]))
		}
		for j := 0; j < 3; j++ {
			assert.InDelta(t, want[3*i+j]*params[j], got[3*i+j]*params[j], 1e-12*scale, "r = %g, parameter %d", r[i], j)
		}
	}
	assert.ErrorIs(t, core.ParamDerivatives(fp, []float64{-1}, make([]float64, 3)), core.ErrDomain)
	assert.ErrorIs(t, core.ParamDerivatives(fp, r, got[:2]), core.ErrLength)
}

// TestParamGradientLibrary checks the symbolic parameter derivatives of
// every form of the library (which use exp, pow with parameter exponents,
// sqrt-free powers, erf-free sums…) at its representative set against
// gonum's central differences (diff/fd, step 1e-6 relative) to 1e-6
// relative to the row.
func TestParamGradientLibrary(t *testing.T) {
	forms, err := library.Forms()
	require.NoError(t, err)
	for _, f := range forms {
		t.Run(f.Info().Key, func(t *testing.T) {
			params := f.Example()
			pot, err := f.New(params)
			require.NoError(t, err)
			r := []float64{1, 2, 3}
			if w, err := core.AnalyzeWell(pot, core.WellSettings{}); err == nil {
				r = []float64{0.9 * w.Re, w.Re, 1.3 * w.Re, 2 * w.Re}
			}
			np := len(params)
			got := make([]float64, len(r)*np)
			require.NoError(t, core.ParamDerivatives(pot, r, got))
			for i, x := range r {
				// in relative parameters u: p = params·(1 + u), so the
				// step 1e-6 is relative and want[j] = pⱼ·∂V/∂pⱼ
				want := make([]float64, np)
				fd.Gradient(want, func(u []float64) float64 {
					p := make([]float64, np)
					for j := range p {
						p[j] = params[j] * (1 + u[j])
					}
					q, err := f.New(p)
					require.NoError(t, err)
					v, err := core.Value(q, x)
					require.NoError(t, err)
					return v
				}, make([]float64, np), &fd.Settings{Formula: fd.Central, Step: 1e-6})
				scale := 0.0
				for j := range want {
					scale = math.Max(scale, math.Abs(want[j]))
				}
				for j := range want {
					assert.InDelta(t, want[j], got[i*np+j]*params[j], 1e-6*scale, "r = %g, parameter %s", x, f.Info().Params[j].Name)
				}
			}
		})
	}
}
