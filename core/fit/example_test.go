package fit_test

import (
	"fmt"
	"math"

	"github.com/pairwell/pairwell/core/fit"
	"github.com/pairwell/pairwell/models"
)

// Fitting the Morse form to an invented scan of 40 points taken from a
// Morse curve itself (De = 4.6 eV, a = 1.87 Å⁻¹, re = 1.27 Å, on an
// absolute scale of −460.0 eV, as a scan of total dimer energies would be):
// the automatic start (the form's match to the scan's own minimum, depth and
// curvature) leads back to the parameters that made the data, and the zero
// is taken as the energy at the largest r unless asked otherwise.
func ExampleFitForm() {
	const de, a, re, abs = 4.6, 1.87, 1.27, -460.0
	var d fit.Data
	for i := 0; i < 40; i++ {
		r := 0.95 + 0.2*float64(i) // 0.95 … 8.75 Å
		e := 1 - math.Exp(-a*(r-re))
		d.R = append(d.R, r)
		d.E = append(d.E, abs+de*(e*e-1))
	}
	// Fit the zero too: at 8.75 Å the Morse curve is still 1.3e-5 eV
	// below its limit, so "energy at the largest r" would bias the fit.
	res, err := fit.FitForm(models.Morse{}, d, fit.Settings{Offset: fit.Offset{Mode: fit.OffsetFit}})
	if err != nil {
		fmt.Println(err)
		return
	}
	p := res.Instance.Params
	fmt.Printf("De = %.6f eV, a = %.6f Å⁻¹, re = %.6f Å, zero = %.4f eV\n", p[0], p[1], p[2], res.Zero)
	fmt.Printf("converged: %v, rmse below 1e-9 eV: %v\n", res.Converged(), res.All.RMSE < 1e-9)
	// Output:
	// De = 4.600000 eV, a = 1.870000 Å⁻¹, re = 1.270000 Å, zero = -460.0000 eV
	// converged: true, rmse below 1e-9 eV: true
}
