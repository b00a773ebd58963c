package figure

import (
	"bytes"
	"math"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"github.com/pairwell/pairwell/models"
)

func TestFit(t *testing.T) {
	pot, err := models.NewMorse(4.6, 1.87, 1.27)
	require.NoError(t, err)
	lj, err := models.NewLennardJones(4.6, 1.13)
	require.NoError(t, err)
	r := linspace(1, 3, 21)
	e := make([]float64, len(r))
	require.NoError(t, pot.Taylor(0, r, e))
	for i := range e {
		e[i] += 100 // an absolute scale: the zero of the data is at 100 eV
	}
	f, err := Fit(r, e, []FitCurve{{Name: "morse", Potential: pot, Zero: 100}, {Name: "lj", Potential: lj, Zero: 100}})
	require.NoError(t, err)
	require.NotNil(t, f.Below)
	assert.Equal(t, []string{"data", "morse", "lj"}, names(f))
	res := f.Below.SeriesByName("morse")
	require.NotNil(t, res)
	for _, v := range res.Y {
		assert.InDelta(t, 0, v, 1e-12, "exact data: no residual")
	}
	data := f.SeriesByName("data")
	lo, _ := extent(data.Y)
	assert.Equal(t, 0.0, lo, "energies from the lowest point")
	worst := 0.0
	for _, v := range f.Below.SeriesByName("lj").Y {
		worst = math.Max(worst, math.Abs(v))
	}
	assert.InDelta(t, 1.15*worst, f.Below.YMax, 1e-12)
	for _, format := range []Format{PNG, SVG} {
		var b bytes.Buffer
		require.NoError(t, f.Render(&b, format))
		assert.NotZero(t, b.Len())
	}
	_, err = Fit(r[:1], e[:1], nil)
	assert.Error(t, err)
	_, err = Fit(r, e, nil)
	assert.Error(t, err)
	f.Below.XMax++
	assert.ErrorIs(t, f.Render(&bytes.Buffer{}, PNG), ErrFigure)
}
