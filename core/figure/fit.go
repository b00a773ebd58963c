package figure

import (
	"fmt"
	"math"

	"github.com/pairwell/pairwell/core"
)

// FitCurve is one fitted form of a fit picture: its potential and the
// energy zero of the data it was fitted with (eV), so that V(r) + Zero is
// on the data's energy scale.
type FitCurve struct {
	Name      string
	Potential core.Potential
	Zero      float64
}

// fitGrid is the number of points of each fitted curve.
const fitGrid = 601

// Fit returns the picture of reference data (r in Å, e in eV) with fitted
// forms overlaid, energies measured from the data's lowest point, and a
// residual panel below (Figure.Below): V(rᵢ) + Zero − Eᵢ of each form at
// the data's points. The data are one Measured series; each form one
// Approximation series in both panels, in the same style. Each curve is
// drawn on 601 points across the data's range (NaN outside its domain),
// one batched call per form. The energy axis spans the data with a margin.
func Fit(r, e []float64, curves []FitCurve) (*Figure, error) {
	if len(r) < 2 || len(r) != len(e) {
		return nil, fmt.Errorf("figure: %w: fit picture needs at least two data points (got %d r, %d E)", core.ErrParam, len(r), len(e))
	}
	if len(curves) == 0 {
		return nil, fmt.Errorf("figure: %w: no fitted form to draw", core.ErrParam)
	}
	emin, emax := extent(e)
	rmin, rmax := extent(r)
	if math.IsNaN(emin) || !(rmax > rmin) {
		return nil, fmt.Errorf("figure: %w: the data have no finite extent", core.ErrParam)
	}
	span := emax - emin
	if !(span > 0) {
		span = 1
	}
	m := 0.04 * (rmax - rmin)
	f := &Figure{
		Kind:   "fit",
		Title:  "Reference data and fitted forms",
		XLabel: "", YLabel: "E − E_min [eV]", // the panel below names r
		XMin: math.Max(rmin-m, 0.5*rmin), XMax: rmax + m,
		YMin: -0.08 * span, YMax: emin + 1.08*span - emin,
	}
	data := Series{Name: "data", Role: Measured, X: append([]float64(nil), r...), Y: make([]float64, len(e))}
	for i, v := range e {
		data.Y[i] = v - emin
	}
	f.Series = append(f.Series, data)
	below := &Figure{Kind: "fit residuals", XLabel: "r [Å]", YLabel: "fit − data [eV]", XMin: f.XMin, XMax: f.XMax}
	below.Series = append(below.Series, Series{Name: "zero", Role: Reference, X: []float64{f.XMin, f.XMax}, Y: []float64{0, 0}})
	grid := linspace(f.XMin, f.XMax, fitGrid)
	worst := 0.0
	for _, c := range curves {
		s := Series{Name: c.Name, Role: Approximation, X: grid, Y: make([]float64, len(grid))}
		if err := batchInDomain(c.Potential, 0, grid, s.Y); err != nil {
			return nil, fmt.Errorf("figure: %s: %w", c.Name, err)
		}
		for i := range s.Y {
			s.Y[i] += c.Zero - emin
		}
		f.Series = append(f.Series, s)
		res := Series{Name: c.Name, Role: Approximation, X: data.X, Y: make([]float64, len(r))}
		if err := batchInDomain(c.Potential, 0, r, res.Y); err != nil {
			return nil, fmt.Errorf("figure: %s: %w", c.Name, err)
		}
		for i := range res.Y {
			res.Y[i] += c.Zero - e[i]
			if !math.IsNaN(res.Y[i]) {
				worst = math.Max(worst, math.Abs(res.Y[i]))
			}
		}
		below.Series = append(below.Series, res)
	}
	if !(worst > 0) {
		worst = 1e-12
	}
	below.YMin, below.YMax = -1.15*worst, 1.15*worst
	f.Below = below
	return f, nil
}
