package fit_test

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/coretest"
	"github.com/pairwell/pairwell/core/fit"
	"github.com/pairwell/pairwell/models"
)

// scan returns n points of m(params) from lo to hi Å, plus shift eV.
func scan(t testing.TB, m core.Model, params []float64, lo, hi float64, n int, shift float64) fit.Data {
	t.Helper()
	pot, err := m.New(params)
	require.NoError(t, err)
	d := fit.Data{R: make([]float64, n), E: make([]float64, n)}
	for i := range d.R {
		d.R[i] = lo + (hi-lo)*float64(i)/float64(n-1)
	}
	require.NoError(t, pot.Taylor(0, d.R, d.E))
	for i := range d.E {
		d.E[i] += shift
	}
	return d
}

// recoveryCases are exact data of each built-in form (invented parameter
// sets) over a range that covers the well.
var recoveryCases = []struct {
	model     core.Model
	params    []float64
	lo, hi, n float64
}{
	{models.Morse{}, []float64{4.6, 1.87, 1.27}, 0.95, 4, 60},
	{models.LennardJones{}, []float64{0.0104, 3.4}, 3.2, 10, 60},
	{models.Harmonic{}, []float64{31.3, 1.27}, 1.1, 1.5, 30},
	{models.Buckingham{}, []float64{1000, 0.3, 20}, 2.4, 8, 60},
}

// TestRecovery fits data generated from each built-in form back from the
// automatic start and recovers every parameter to 1e-8 relative (the
// issue's check value), with the energy zero given (0) and with the zero
// fitted to data shifted by −1234.5 eV (an absolute-energy scan).
func TestRecovery(t *testing.T) {
	for _, c := range recoveryCases {
		for _, mode := range []string{"zero given", "zero fitted"} {
			t.Run(c.model.Info().Key+"/"+mode, func(t *testing.T) {
				s := fit.Settings{Offset: fit.Offset{Mode: fit.OffsetValue}}
				shift := 0.0
				if mode == "zero fitted" {
					shift = -1234.5
					s.Offset = fit.Offset{Mode: fit.OffsetFit}
				}
				d := scan(t, c.model, c.params, c.lo, c.hi, int(c.n), shift)
				res, err := fit.FitForm(c.model, d, s)
				require.NoError(t, err)
				assert.True(t, res.Converged(), "reason %s", res.Reason)
				for j, want := range c.params {
					assert.InDelta(t, 1, res.Instance.Params[j]/want, 1e-8, "parameter %s = %.15g, want %.15g", c.model.Info().Params[j].Name, res.Instance.Params[j], want)
				}
				if res.ZeroFitted {
					assert.InDelta(t, shift, res.Zero, 1e-8*math.Max(1, math.Abs(shift)))
				}
				assert.Less(t, res.All.Max, 1e-9)
				t.Logf("%s: %d iterations, %d evaluations, start %d, reason %s, analytic %v", mode, res.Iterations, res.Evaluations, res.StartIndex, res.Reason, res.Analytic)
			})
		}
	}
}

// TestStandardErrorsMonteCarlo checks the reported standard errors against
// the spread of 200 refits of Morse data with Gaussian noise (σ = 2 meV,
// fixed seed): the sample standard deviation of every parameter and of the
// fitted zero agrees with the mean reported standard error to within 20 %
// (the check value; with 200 samples the sample standard deviation
// itself scatters by about 1/√400 = 5 %).
func TestStandardErrorsMonteCarlo(t *testing.T) {
	const (
		fits  = 200
		sigma = 2e-3
	)
	m := models.Morse{}
	truth := []float64{4.6, 1.87, 1.27}
	clean := scan(t, m, truth, 0.95, 4, 40, 0)
	rng := rand.New(rand.NewPCG(14, 2026))
	np := len(truth) + 1
	var sum, sum2, se [4]float64
	for k := 0; k < fits; k++ {
		d := fit.Data{R: clean.R, E: make([]float64, len(clean.E))}
		for i, e := range clean.E {
			d.E[i] = e + sigma*rng.NormFloat64()
		}
		res, err := fit.FitForm(m, d, fit.Settings{Offset: fit.Offset{Mode: fit.OffsetFit}, Restarts: -1})
		require.NoError(t, err)
		require.True(t, res.Converged())
		vals := append(append([]float64(nil), res.Instance.Params...), res.Zero)
		errs := append(append([]float64(nil), res.StdErr...), res.ZeroErr)
		for j := 0; j < np; j++ {
			sum[j] += vals[j]
			sum2[j] += vals[j] * vals[j]
			se[j] += errs[j]
		}
	}
	for j := 0; j < np; j++ {
		mean := sum[j] / fits
		sd := math.Sqrt((sum2[j] - fits*mean*mean) / (fits - 1))
		reported := se[j] / fits
		assert.InDelta(t, 1, reported/sd, 0.2, "parameter %d: reported %.4g, spread of refits %.4g", j, reported, sd)
		t.Logf("parameter %d: reported standard error %.4g, spread of %d refits %.4g (ratio %.3f)", j, reported, fits, sd, reported/sd)
	}
}

// TestForces fits Morse to exact energies and forces (central differences
// for the Jacobian, since the gradient is only analytic for energies).
func TestForces(t *testing.T) {
	m := models.Morse{}
	truth := []float64{4.6, 1.87, 1.27}
	d := scan(t, m, truth, 0.95, 4, 30, 0)
	pot, err := m.New(truth)
	require.NoError(t, err)
	d.F = make([]float64, len(d.R))
	require.NoError(t, coretest.Batch(pot, 1, d.R, d.F))
	for i := range d.F {
		d.F[i] = -d.F[i]
	}
	res, err := fit.FitForm(m, d, fit.Settings{Offset: fit.Offset{Mode: fit.OffsetValue}})
	require.NoError(t, err)
	assert.False(t, res.Analytic)
	for j, want := range truth {
		assert.InDelta(t, 1, res.Instance.Params[j]/want, 1e-8)
	}
}

func TestWeights(t *testing.T) {
	m := models.Morse{}
	d := scan(t, m, []float64{4.6, 1.87, 1.27}, 0.95, 4, 30, 0)
	s := fit.Settings{Offset: fit.Offset{Mode: fit.OffsetValue}, Weights: fit.Weights{Scheme: fit.Window, Window: 1}}
	res, err := fit.FitForm(m, d, s)
	require.NoError(t, err)
	emin := math.Inf(1)
	for _, e := range d.E {
		emin = math.Min(emin, e)
	}
	n := 0
	for _, e := range d.E {
		if e-emin <= 1 {
			n++
		}
	}
	assert.Equal(t, n, res.Fitted, "points within 1 eV of the minimum")
	assert.Equal(t, len(d.R), res.All.N)
	require.Len(t, res.Windows, 2)
	assert.InDelta(t, -0.1*emin, res.Windows[0].Bound, 1e-15, "10 % of the data's depth (zero at 0 eV)")
	assert.InDelta(t, -0.5*emin, res.Windows[1].Bound, 1e-15, "50 % of the data's depth")

	s.Weights = fit.Weights{Scheme: fit.Boltzmann, T: 3000}
	res, err = fit.FitForm(m, d, s)
	require.NoError(t, err)
	assert.Equal(t, len(d.R), res.Fitted)
	assert.InDelta(t, 1, res.Instance.Params[0]/4.6, 1e-8)

	for _, w := range []fit.Weights{{Scheme: fit.Boltzmann}, {Scheme: fit.Window, Window: -1}, {Scheme: fit.FileWeights}} {
		_, err = fit.FitForm(m, d, fit.Settings{Weights: w})
		assert.ErrorIs(t, err, core.ErrParam, "%+v", w)
	}
}

func TestFitFormErrors(t *testing.T) {
	m := models.Morse{}
	d := scan(t, m, []float64{4.6, 1.87, 1.27}, 0.95, 4, 30, 0)
	_, err := fit.FitForm(m, fit.Data{R: d.R[:3], E: d.E[:3]}, fit.Settings{Offset: fit.Offset{Mode: fit.OffsetFit}})
	assert.ErrorIs(t, err, core.ErrParam, "3 points, 4 parameters")
	_, err = fit.FitForm(m, fit.Data{R: d.R[10:], E: d.E[10:]}, fit.Settings{})
	assert.ErrorIs(t, err, core.ErrNoMinimum, "no interior minimum")
	bad := fit.Data{R: []float64{1, 1, 2}, E: []float64{0, 1, 2}}
	assert.ErrorIs(t, bad.Validate(), core.ErrParam)
	bad = fit.Data{R: []float64{1, 2, 3}, E: []float64{0, math.NaN(), 2}}
	assert.ErrorIs(t, bad.Validate(), core.ErrParam)
}

// TestEstimateWell checks the spline estimate on Morse data: re, depth and
// k = 2De·a² (Morse 1929) within the accuracy a 0.1 Å grid allows.
func TestEstimateWell(t *testing.T) {
	d := scan(t, models.Morse{}, []float64{4.6, 1.87, 1.27}, 0.9, 3, 22, 0)
	tg, err := fit.EstimateWell(d, 0)
	require.NoError(t, err)
	assert.InDelta(t, 1.27, tg.Re, 2e-3)
	assert.InDelta(t, 4.6, tg.Depth, 5e-3)
	assert.InDelta(t, 2*4.6*1.87*1.87, tg.K, 0.05*2*4.6*1.87*1.87)
	three := fit.Data{R: d.R[3:6], E: d.E[3:6]}
	_, err = fit.EstimateWell(three, math.Inf(1))
	require.NoError(t, err)
}

// noMatch is Morse without a Match (a form that must be given a start).
type noMatch struct{ m models.Morse }

func (n noMatch) Info() core.ModelInfo                         { return n.m.Info() }
func (n noMatch) New(params []float64) (core.Potential, error) { return n.m.New(params) }

// countMatch is Morse counting its Match calls (for a plugin each is a
// round trip).
type countMatch struct {
	models.Morse
	calls *int
}

func (c countMatch) Match(t core.Target) ([]float64, []string, error) {
	*c.calls++
	return c.Morse.Match(t)
}

// TestStartMatches: a form without Match needs a start (core.ErrParam,
// saying so) and fits from one; a form with Match is asked once for the
// probe of its domain and once for each start reached (here the main one
// only: Restarts < 0), not once more to learn that it has one.
func TestStartMatches(t *testing.T) {
	params := []float64{4.6, 1.87, 1.27} // invented Morse set
	d := scan(t, models.Morse{}, params, 0.95, 4, 30, 0)
	zero := fit.Offset{Mode: fit.OffsetValue} // the zero of the data: 0 eV
	_, err := fit.FitForm(noMatch{}, d, fit.Settings{})
	require.ErrorIs(t, err, core.ErrParam)
	assert.ErrorContains(t, err, "has no Match (give a start)")
	res, err := fit.FitForm(noMatch{}, d, fit.Settings{Start: []float64{4, 2, 1.3}, Offset: zero})
	require.NoError(t, err)
	assert.InDeltaSlice(t, params, res.Instance.Params, 1e-8, "exact data of the form itself")

	calls := 0
	res, err = fit.FitForm(countMatch{calls: &calls}, d, fit.Settings{Restarts: -1, Offset: zero})
	require.NoError(t, err)
	assert.InDeltaSlice(t, params, res.Instance.Params, 1e-8, "exact data of the form itself")
	assert.Equal(t, 2, calls, "the probe and the main start")
}

// noMatchHarmonic is the harmonic form without a Match.
type noMatchHarmonic struct{ m models.Harmonic }

func (n noMatchHarmonic) Info() core.ModelInfo { return n.m.Info() }
func (n noMatchHarmonic) New(params []float64) (core.Potential, error) {
	return n.m.New(params)
}

// TestGivenStartLearnsTheDomain: a form without a dissociation limit gets
// its energy zero fitted from the potential at the given start even when it
// has no Match (the harmonic form, V = ½k(r−r0)², at an invented
// k = 31.3 eV/Å², r0 = 1.27 Å on an absolute scale of −50 eV); with the
// zero taken from the largest r instead the fit could not reproduce the
// data.
func TestGivenStartLearnsTheDomain(t *testing.T) {
	params := []float64{31.3, 1.27}
	d := scan(t, models.Harmonic{}, params, 1.1, 1.5, 30, -50)
	res, err := fit.FitForm(noMatchHarmonic{}, d, fit.Settings{Start: []float64{25, 1.25}})
	require.NoError(t, err)
	assert.True(t, res.ZeroFitted, "%v", res.Notes)
	assert.InDeltaSlice(t, params, res.Instance.Params, 1e-8, "exact data of the form itself")
	assert.InDelta(t, -50, res.Zero, 1e-8)
}
