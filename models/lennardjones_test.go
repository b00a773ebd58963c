package models

import (
	"math"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/coretest"
)

// TestLJClosedForms checks the Lennard-Jones 12-6 closed forms (standard
// result): r_min = 2^{1/6}σ, V(r_min) = −ε, V″(r_min) = 36·2^{2/3}ε/σ².
func TestLJClosedForms(t *testing.T) {
	const (
		twoSixth  = 1.122462048309373 // 2^{1/6}
		curvature = 57.14643787085518 // 36·2^{2/3} = 36 × 1.5874010519681995
	)
	for _, ps := range [][2]float64{{1, 1}, {0.0104, 3.40}, {0.25, 2.1}} {
		eps, sigma := ps[0], ps[1]
		p, err := NewLennardJones(eps, sigma)
		require.NoError(t, err)
		assert.Equal(t, []float64{eps, sigma}, p.Params())
		rmin := p.Domain().EquilibriumGuess
		assert.InEpsilon(t, twoSixth*sigma, rmin, 1e-15)
		var d [3]float64
		require.NoError(t, coretest.Derivatives(p, rmin, d[:]))
		assert.InEpsilon(t, -eps, d[0], 1e-14, "V(r_min) = −ε")
		assert.InDelta(t, 0, d[1], 1e-14*d[2]*rmin, "V′(r_min) = 0")
		assert.InEpsilon(t, curvature*eps/(sigma*sigma), d[2], 1e-14, "V″(r_min)")
		// V(σ) = 0.
		v, err := core.Value(p, sigma)
		require.NoError(t, err)
		assert.InDelta(t, 0, v, 1e-15*eps)
		// Textbook form at a few points.
		for _, r := range linspace(0.8*sigma, 4*sigma, 17) {
			s6 := math.Pow(sigma/r, 6)
			v, err := core.Value(p, r)
			require.NoError(t, err)
			assert.InDelta(t, 4*eps*(s6*s6-s6), v, 1e-14*4*eps*(s6*s6+s6))
		}
	}
}

func TestLJMatch(t *testing.T) {
	// (re, Depth): both honoured; K reported in a note.
	tg := core.Target{Re: 3.816, Depth: 0.0104, K: 0.06}
	ps, notes, err := LennardJones{}.Match(tg)
	require.NoError(t, err)
	p := mustNew(t, LennardJones{}, ps...)
	re, depth, k := wellOf(t, p)
	assert.InEpsilon(t, tg.Re, re, 1e-12)
	assert.InEpsilon(t, tg.Depth, depth, 1e-12)
	require.Len(t, notes, 1)
	assert.Contains(t, notes[0], "k not honoured")
	assert.InEpsilon(t, 72*tg.Depth/(tg.Re*tg.Re), k, 1e-12)

	// (re, Depth) without K: no note.
	_, notes, err = LennardJones{}.Match(core.Target{Re: 3.816, Depth: 0.0104})
	require.NoError(t, err)
	assert.Empty(t, notes)

	// (re, K): both honoured, depth from K with a note.
	tg = core.Target{Re: 1.5, K: 20}
	ps, notes, err = LennardJones{}.Match(tg)
	require.NoError(t, err)
	require.Len(t, notes, 1)
	p = mustNew(t, LennardJones{}, ps...)
	re, _, k = wellOf(t, p)
	assert.InEpsilon(t, tg.Re, re, 1e-12)
	assert.InEpsilon(t, tg.K, k, 1e-12)

	for _, tg := range []core.Target{{Re: 1}, {Depth: 1, K: 1}, {Re: 1, Depth: -1}, {Re: 1, K: math.Inf(1)}} {
		_, _, err := LennardJones{}.Match(tg)
		assert.ErrorIs(t, err, core.ErrParam, "%+v", tg)
	}
}
