package period

import (
	"encoding/json"
	"math"
	"os"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/models"
	"github.com/pairwell/pairwell/models/modelstest"
)

// TestAmplitudeSeriesMorse: for Morse T(E)/T₀ = 1/√(1 − E/De) (classical
// Morse oscillator, standard result, from memory), whose binomial series
// has A_m = C(2m,m)/4^m·a^{2m} in ε = E/c₂; the series agrees, and its
// bound is never below the true error.
func TestAmplitudeSeriesMorse(t *testing.T) {
	const de, a, re = 4.4, 1.9, 1.27
	f := modelstest.NewForm(t, "morse", models.Morse{}, []float64{de, a, re})
	s := NewAmplitudeSeries(f.W)
	require.Equal(t, core.SeriesOrder/2, s.Terms(), "K = (M − 2)/2 + 1 terms")
	b := 1.0
	for m := 0; m < s.Terms(); m++ {
		if m > 0 {
			b *= float64(2*m-1) / float64(2*m)
		}
		assert.InEpsilon(t, b*math.Pow(a, float64(2*m)), s.a[m], 1e-12, "A_%d", m)
	}
	used := 0
	for lg := -10.0; lg <= -0.5; lg += 0.05 {
		frac := math.Pow(10, lg)
		r, bound := s.Ratio(frac * de)
		if math.IsInf(bound, 1) {
			continue
		}
		want := 1 / math.Sqrt(1-frac)
		err := math.Abs(r - want)
		assert.LessOrEqual(t, err, bound+2*eps, "E/De = %g", frac)
		if bound <= 1e-13 {
			used++
			assert.LessOrEqual(t, err, 1e-13, "E/De = %g", frac)
		}
	}
	assert.Greater(t, used, 150, "the series covers E/De up to a few per cent")
	r, bound := s.Ratio(0.4 * de)
	assert.True(t, math.IsInf(bound, 1) || bound > 1e-6, "no claim of precision at 0.4 De: %g ± %g", r, bound)
}

// TestAmplitudeSeriesReference: against the mpmath periods of
// testdata/reference.json (see reference) and against the quadrature on a
// fine grid of small energies, the series is within its bound wherever
// that is finite, for Morse, Lennard-Jones and Buckingham wells.
//
// The reference ratio is T(E)/T₀ with T₀ from the exact c₂ at the exact re
// (mpmath 1.3.0 at 40 digits, c₂ = V″(re)/2 by mp.diff, with the potentials
// and re of make_reference.py):
//
//	python3 -c "…; print(mp.nstr(diff(V, mpf(re), 2)/2, 25))"
//
// The well's own c₂ of buckingham-low is 3e-12 off (its two terms cancel to
// 1e-3 of their size), which moves the harmonic period but not the ratio of
// the series, computed from the same coefficients.
func TestAmplitudeSeriesReference(t *testing.T) {
	c2exact := map[string]float64{
		"morse":          18.80000000000000071054274,
		"lennard-jones":  0.02570601011491755567112609,
		"buckingham-low": 0.02398054389135740901999635,
		"buckingham":     0.008140727940988535450421346,
	}
	data, err := os.ReadFile("testdata/reference.json")
	require.NoError(t, err)
	var ref reference
	require.NoError(t, json.Unmarshal(data, &ref))
	reg := models.NewRegistry()
	in, err := NewIntegrator(Settings{})
	require.NoError(t, err)
	checked := 0
	for _, f := range ref.Forms {
		inst, err := reg.Build(f.Spec)
		require.NoError(t, err, f.Spec)
		w, err := core.AnalyzeWell(inst.Potential, core.WellSettings{})
		require.NoError(t, err)
		s := NewAmplitudeSeries(w)
		t0, err := Harmonic(w, 1)
		require.NoError(t, err)
		for _, row := range f.Rows {
			E := parse(t, row.Energy)
			r, bound := s.Ratio(E)
			if math.IsInf(bound, 1) {
				continue
			}
			t0x := t0 * math.Sqrt(w.Taylor[2]/c2exact[f.Key])
			want := math.Sqrt(2) * parse(t, row.Integral) * timeUnit() / t0x
			assert.LessOrEqual(t, math.Abs(r-want), bound+1e-15, "%s at %s of the top", f.Key, row.Fraction)
			checked++
		}
		top := parse(t, f.Top)
		for lg := -9.0; lg <= -1; lg += 0.25 {
			E := top * math.Pow(10, lg)
			r, bound := s.Ratio(E)
			if !(bound <= 1e-12) {
				continue
			}
			q, err := in.Exact(inst.Potential, w, 1, E)
			require.NoError(t, err)
			assert.LessOrEqual(t, math.Abs(r-q.Period/t0), bound+q.ErrorEstimate, "%s at E = %g eV", f.Key, E)
			checked++
		}
	}
	assert.Greater(t, checked, 30)
}
