package figure

import (
	"math"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/units"
	"github.com/pairwell/pairwell/models"
)

// segments returns the (x0, x1, y) of the NaN-separated level lines.
func segments(s *Series) (out [][3]float64) {
	for i := 0; i+1 < len(s.X); i += 3 {
		out = append(out, [3]float64{s.X[i], s.X[i+1], s.Y[i]})
	}
	return out
}

// TestLevelsFigureMorse: every bound level of a Morse well (25 for
// De = 4.6 eV, a = 1.87/Å, μ = 0.98 u: v < λ − ½, λ = 24.84, Morse 1929) is
// a line at E_v = V(re) + ωe(v+½) − ωexe(v+½)² between its turning points,
// where V(r) = E_v; the harmonic ladder has the spacing ħω.
func TestLevelsFigureMorse(t *testing.T) {
	p, err := models.NewMorse(4.6, 1.87, 1.27)
	require.NoError(t, err)
	f, err := Levels(p, LevelsOptions{Name: "morse", Mu: 0.98, VMax: -1})
	require.NoError(t, err)
	q := f.SeriesByName("quantum levels E_v")
	h := f.SeriesByName("harmonic ladder ħω(v+½)")
	require.NotNil(t, q)
	require.NotNil(t, h)
	require.NotNil(t, f.SeriesByName("dissociation limit"))
	lines := segments(q)
	require.Len(t, lines, 25)
	we, wexe := models.MorseSpectroscopic(4.6, 1.87, 0.98)
	for v, l := range lines {
		x := float64(v) + 0.5
		assert.InDelta(t, -4.6+(we*x-wexe*x*x)*units.WavenumberEV, l[2], 1e-9, "v = %d", v)
		for _, r := range l[:2] {
			e, err := core.Value(p, r)
			require.NoError(t, err)
			if r < f.XMax*0.99 {
				assert.InDelta(t, l[2], e, 2e-3*4.6, "v = %d: V at the turning point", v)
			}
		}
	}
	rungs := segments(h)
	require.GreaterOrEqual(t, len(rungs), 2)
	assert.InEpsilon(t, we*units.WavenumberEV, rungs[1][2]-rungs[0][2], 1e-12)
	assert.Greater(t, rungs[0][0], lines[0][1], "the ladder stands beside the well")
}

// TestLevelsFigureHarmonic: for the harmonic form the quantum levels and
// the ladder coincide (E_v = ħω(v+½)); without VMax it is refused.
func TestLevelsFigureHarmonic(t *testing.T) {
	p, err := models.Harmonic{}.New([]float64{30, 1.2})
	require.NoError(t, err)
	_, err = Levels(p, LevelsOptions{Mu: 7, VMax: -1})
	assert.ErrorIs(t, err, core.ErrParam)
	_, err = Levels(p, LevelsOptions{VMax: 3})
	assert.ErrorIs(t, err, core.ErrParam)
	f, err := Levels(p, LevelsOptions{Mu: 7, VMax: 5})
	require.NoError(t, err)
	q, h := segments(f.SeriesByName("quantum levels E_v")), segments(f.SeriesByName("harmonic ladder ħω(v+½)"))
	require.Len(t, q, 6)
	for v := range q {
		if v < len(h) {
			assert.InDelta(t, h[v][2], q[v][2], 1e-10, "v = %d", v)
		}
	}
	assert.Nil(t, f.SeriesByName("dissociation limit"))
	assert.False(t, math.IsNaN(f.YMax))
}
