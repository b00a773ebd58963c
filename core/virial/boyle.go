package virial

import (
	"errors"
	"fmt"
	"math"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/units"
)

// Range of the search of Characteristic, in units of depth/k_B: the scan
// runs over 10^(k/8)·depth/k_B for k = scanLowK … scanHighK (β·depth from
// about 18 down to 10⁻⁴).
const (
	scanLowK  = -10
	scanHighK = 32
)

// Temperatures are the characteristic temperatures of the classical B₂.
type Temperatures struct {
	// Boyle is the temperature in K at which B₂^cl changes sign from − to
	// +; NaN when it does not within the searched range. BoyleError is
	// its estimated error, the error estimate of B₂ there divided by
	// |dB₂/dT|.
	Boyle, BoyleError float64
	// Max is the temperature in K of the maximum of B₂^cl (dB₂/dT changes
	// sign from + to −) above the Boyle temperature; NaN when there is none
	// within the searched range. MaxError is its estimated error.
	Max, MaxError float64
	// Low and High bound the searched range in K.
	Low, High float64
}

// Characteristic finds the Boyle temperature and the temperature of the
// maximum of the classical B₂ (the quantum correction is not included). It
// scans 43 temperatures spaced by 10^(1/8) from 0.056·depth/k_B to
// 10⁴·depth/k_B (fewer at the top when the form's wall cannot be resolved
// there), brackets the first sign change of B₂ and the first sign change of
// dB₂/dT above it, and refines each by core.Root: Newton steps with the
// analytic dB₂/dT (or d²B₂/dT²) on the same quadrature nodes, safeguarded by
// bisection. Errors are those of Points.
func (c *Calculator) Characteristic() (Temperatures, error) { return c.characteristic(true) }

// Boyle is Characteristic without the maximum (Max and MaxError are NaN):
// fewer evaluations, for comparisons of many forms.
func (c *Calculator) Boyle() (Temperatures, error) { return c.characteristic(false) }

func (c *Calculator) characteristic(wantMax bool) (Temperatures, error) {
	unit := c.depth / units.BoltzmannEV
	var scan []float64
	for k := scanLowK; k <= scanHighK; k++ {
		scan = append(scan, unit*math.Pow(10, float64(k)/8))
	}
	var pts []Point
	var err error
	for len(scan) > 8 {
		if pts, err = c.Points(scan, 0); err == nil || !errors.Is(err, core.ErrDomain) {
			break
		}
		scan = scan[:len(scan)-8]
	}
	if err != nil {
		return Temperatures{}, err
	}
	out := Temperatures{Boyle: math.NaN(), BoyleError: math.NaN(), Max: math.NaN(), MaxError: math.NaN(),
		Low: scan[0], High: scan[len(scan)-1]}
	at := func(T float64) (Point, error) {
		p, err := c.Points([]float64{T}, 0)
		if err != nil {
			return Point{}, err
		}
		return p[0], nil
	}
	start := 0
	for k := 1; k < len(pts); k++ {
		if pts[k-1].Classical < 0 && pts[k].Classical >= 0 {
			T, err := core.Root(func(T float64) (float64, float64, error) {
				p, err := at(T)
				return p.Classical, p.Slope, err
			}, scan[k-1], scan[k])
			if err != nil {
				return out, fmt.Errorf("virial: Boyle temperature: %w", err)
			}
			p, err := at(T)
			if err != nil {
				return out, err
			}
			out.Boyle, out.BoyleError = T, p.ErrorEstimate/math.Abs(p.Slope)
			start = k
			break
		}
	}
	for k := max(start, 1); wantMax && k < len(pts); k++ {
		if pts[k-1].Slope > 0 && pts[k].Slope <= 0 {
			T, err := core.Root(func(T float64) (float64, float64, error) {
				p, err := at(T)
				return p.Slope, p.Curvature, err
			}, scan[k-1], scan[k])
			if err != nil {
				return out, fmt.Errorf("virial: temperature of the maximum of B₂: %w", err)
			}
			p, err := at(T)
			if err != nil {
				return out, err
			}
			// The error of the slope over the curvature is the shift
			// of the root.
			out.Max, out.MaxError = T, p.SlopeError/math.Abs(p.Curvature)
			break
		}
	}
	return out, nil
}
