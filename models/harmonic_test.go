package models

import (
	"math"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/coretest"
)

func TestHarmonic(t *testing.T) {
	k, r0 := 32.2, 1.2746
	p, err := NewHarmonic(k, r0)
	require.NoError(t, err)
	assert.Equal(t, []float64{k, r0}, p.Params())
	assert.True(t, math.IsInf(p.Domain().Limit, 1), "unbounded")
	assert.False(t, p.Domain().Bounded())
	assert.Contains(t, Harmonic{}.Info().Notes, "½")
	d := make([]float64, 8)
	for _, r := range linspace(0.5, 3, 11) {
		require.NoError(t, coretest.Derivatives(p, r, d))
		x := r - r0
		// ½k(r − r0)² and its derivatives k(r − r0), k, 0, … (definition).
		assert.InDelta(t, 0.5*k*x*x, d[0], 1e-15*k)
		assert.InDelta(t, k*x, d[1], 1e-15*k)
		assert.Equal(t, k, d[2])
		for n := 3; n < len(d); n++ {
			assert.Zero(t, d[n])
		}
	}
}

func TestHarmonicMatch(t *testing.T) {
	tg := core.Target{Re: 1.2746, K: 32.2}
	ps, notes, err := Harmonic{}.Match(tg)
	require.NoError(t, err)
	assert.Empty(t, notes)
	re, _, k := wellOf(t, mustNew(t, Harmonic{}, ps...))
	assert.InEpsilon(t, tg.Re, re, 1e-12)
	assert.InEpsilon(t, tg.K, k, 1e-12)

	_, notes, err = Harmonic{}.Match(core.Target{Re: 1, Depth: 2, K: 3})
	require.NoError(t, err)
	require.Len(t, notes, 1)
	assert.Contains(t, notes[0], "De =")

	for _, tg := range []core.Target{{Re: 1}, {K: 1}, {Re: 1, K: -1}} {
		_, _, err := Harmonic{}.Match(tg)
		assert.ErrorIs(t, err, core.ErrParam, "%+v", tg)
	}
}
