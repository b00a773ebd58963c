package fit_test

import (
	"math"
	"testing"

	"github.com/stretchr/testify/require"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/fit"
	"github.com/pairwell/pairwell/models"
)

// inventedScan is an INVENTED scan of n points from 0.85 to 8 Å: the
// extended-Rydberg curve of the demo (re = 1.20 Å, De = 4.00 eV,
// k = 30 eV/Å², a₃ = 0.40 Å⁻³) on the absolute scale −12539.0 eV.
func inventedScan(n int) fit.Data {
	d := fit.Data{R: make([]float64, n), E: make([]float64, n)}
	for i := range d.R {
		r := 0.85 + (8-0.85)*math.Pow(float64(i)/float64(n-1), 2)
		p := r - 1.2
		d.R[i] = r
		d.E[i] = -12539.0 - 4*(1+3*p+0.75*p*p+0.4*p*p*p)*math.Exp(-3*p)
	}
	return d
}

// BenchmarkFitBuiltins fits the four built-in forms to 200 points, one
// after the other, with the default settings (automatic start, 4
// restarts); the target is ≤ 50 ms for all four.
func BenchmarkFitBuiltins(b *testing.B) {
	d := inventedScan(200)
	forms := []core.Model{models.Morse{}, models.LennardJones{}, models.Buckingham{}, models.Harmonic{}}
	b.Run("all four", func(b *testing.B) {
		for b.Loop() {
			for _, m := range forms {
				_, err := fit.FitForm(m, d, fit.Settings{})
				require.NoError(b, err)
			}
		}
	})
	for _, m := range forms {
		for _, central := range []bool{false, true} {
			name := m.Info().Key + "/analytic"
			if central {
				name = m.Info().Key + "/central"
			}
			b.Run(name, func(b *testing.B) {
				for b.Loop() {
					_, err := fit.FitForm(m, d, fit.Settings{Central: central})
					require.NoError(b, err)
				}
			})
		}
	}
}

// BenchmarkMinimize times the engine alone: a Morse fit of 200 points
// with central differences.
func BenchmarkMinimize(b *testing.B) {
	d := inventedScan(200)
	p := fit.Problem{N: len(d.R), P: 3, Residuals: func(t, dst []float64) error {
		for i, r := range d.R {
			y := math.Exp(-t[1] * (r - t[2]))
			dst[i] = t[0]*(y*y-2*y) - 12539.0 - d.E[i]
		}
		return nil
	}}
	for b.Loop() {
		_, err := fit.Minimize(p, []float64{3, 2, 1.1}, fit.LMSettings{})
		require.NoError(b, err)
	}
}
