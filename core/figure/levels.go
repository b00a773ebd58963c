package figure

import (
	"fmt"
	"math"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/levels"
	"github.com/pairwell/pairwell/core/units"
)

// LevelsOptions controls Levels. Mu is required; the zero value of the rest
// draws every bound level (at most MaxLevelsDrawn).
type LevelsOptions struct {
	// Name names the form in the title, e.g. "morse".
	Name string
	// Mu is the reduced mass in u.
	Mu float64
	// VMax is the highest v drawn; −1 means every bound level (at most
	// MaxLevelsDrawn). An unbounded form needs VMax ≥ 0.
	VMax int
	// Tolerance is the accuracy of the levels in cm⁻¹; zero means
	// levels.DefaultTolerance.
	Tolerance float64
}

// MaxLevelsDrawn is the most levels Levels draws; above it the ladder
// turns into a grey band.
const MaxLevelsDrawn = 120

// Levels returns the picture of the well V(r) of p with its quantum
// vibrational levels at J = 0 (package levels), each drawn as a horizontal
// line between its classical turning points, and beside the well, for
// contrast, the harmonic ladder V(re) + ħω(v + ½), ω = √(V″(re)/μ), as
// short lines in a column on the right. For a bounded form a dotted line
// marks the dissociation limit.
//
// Series, in order: "exact V(r)" (Reference), "quantum levels E_v"
// (Approximation) and "harmonic ladder ħω(v+½)" (Approximation), the level
// lines separated by NaN gaps, and "dissociation limit" for a bounded
// form. Errors wrap those of levels.Solve (core.ErrParam for bad input).
func Levels(p core.Potential, o LevelsOptions) (*Figure, error) {
	if !(o.Mu > 0) {
		return nil, fmt.Errorf("figure: %w: a reduced mass is needed", core.ErrParam)
	}
	w, err := core.AnalyzeWell(p, core.WellSettings{Order: 2})
	if err != nil {
		return nil, fmt.Errorf("figure: %w", err)
	}
	s := levels.Settings{Tolerance: o.Tolerance, Well: &w}
	switch {
	case o.VMax >= 0:
		s.Count = o.VMax + 1
	case !w.Bounded():
		return nil, fmt.Errorf("figure: %w: the form grows without bound: give the highest v", core.ErrParam)
	}
	res, err := levels.Solve(p, o.Mu, s)
	if err != nil {
		return nil, fmt.Errorf("figure: %w", err)
	}
	ls := res.Levels
	if len(ls) > MaxLevelsDrawn {
		ls = ls[:MaxLevelsDrawn]
	}
	top := ls[len(ls)-1].Energy
	hw := units.HbarEVfs * units.AngularFrequency(w.K, o.Mu)
	v, err := newView(p, w)
	if err != nil {
		return nil, err
	}
	// Energies: from just below the minimum to above the highest level
	// (and the limit).
	emax := top + 0.5*hw
	if w.Bounded() {
		emax = math.Max(emax, v.limit) + 0.08*(v.limit-w.Energy)
	}
	emin := w.Energy - 0.06*(emax-w.Energy)
	// Separations: the well up to the outer turning point of the highest
	// level drawn (at most the default window, or 6·re), and a column on
	// the right for the harmonic ladder.
	d := p.Domain()
	lo := math.Max(v.rmin, d.Min)
	hi := math.Max(v.rmax, w.Re*1.5)
	rs := linspace(lo, math.Min(6*w.Re, 3*hi), 4*gridPoints)
	vs := make([]float64, len(rs))
	if err := batchInDomain(p, 0, rs, vs); err != nil {
		return nil, fmt.Errorf("figure: V on the grid: %w", err)
	}
	rin, rout := turning(rs, vs, w.Re, top)
	xmin := math.Max(lo, rin-0.15*(rout-rin))
	if e0, _ := turning(rs, vs, w.Re, emax); !math.IsNaN(e0) {
		xmin = math.Max(xmin, e0)
	}
	wellMax := math.Min(rout+0.1*(rout-rin), rs[len(rs)-1])
	colLo := wellMax + 0.06*(wellMax-xmin)
	colHi := colLo + 0.14*(wellMax-xmin)
	xmax := colHi + 0.03*(wellMax-xmin)

	f := &Figure{
		Kind:   "levels",
		Title:  fmt.Sprintf("%s: vibrational levels (J = 0) for μ = %.6g u, and the harmonic ladder ħω(v + ½)\nlevels to %.2g cm⁻¹ (Colbert–Miller DVR); ħω = %.6g cm⁻¹", o.Name, o.Mu, res.Accuracy, hw/units.WavenumberEV),
		XLabel: "separation r [Å]",
		YLabel: "energy [eV]",
		XMin:   xmin, XMax: xmax, YMin: emin, YMax: emax,
	}
	var cx, cy []float64
	for i, r := range rs {
		if r <= wellMax {
			cx, cy = append(cx, r), append(cy, vs[i])
		}
	}
	f.Series = append(f.Series, Series{Name: "exact V(r)", Role: Reference, X: cx, Y: cy})
	var qx, qy []float64
	for _, l := range ls {
		a, b := turning(rs, vs, w.Re, l.Energy)
		if math.IsNaN(a) || math.IsNaN(b) {
			continue
		}
		qx = append(qx, a, b, b)
		qy = append(qy, l.Energy, l.Energy, math.NaN())
	}
	f.Series = append(f.Series, Series{Name: "quantum levels E_v", Role: Approximation, X: qx, Y: qy})
	var hx, hy []float64
	for k := range ls {
		e := w.Energy + hw*(float64(k)+0.5)
		if e > emax {
			break
		}
		hx = append(hx, colLo, colHi, colHi)
		hy = append(hy, e, e, math.NaN())
	}
	f.Series = append(f.Series, Series{Name: "harmonic ladder ħω(v+½)", Role: Approximation, X: hx, Y: hy})
	if w.Bounded() {
		f.Series = append(f.Series, Series{Name: "dissociation limit", Role: Approximation, X: []float64{xmin, xmax}, Y: []float64{v.limit, v.limit}})
	}
	if len(res.Levels) > len(ls) {
		f.Notes = append(f.Notes, fmt.Sprintf("%d levels drawn of %d", len(ls), len(res.Levels)))
	}
	f.Notes = append(f.Notes, fmt.Sprintf("zero-point energy %.6g cm⁻¹; harmonic ħω/2 = %.6g cm⁻¹", (ls[0].Energy-w.Energy)/units.WavenumberEV, hw/2/units.WavenumberEV))
	return f, nil
}

// turning returns the separations on either side of re where the sampled
// V crosses e, by linear interpolation (NaN where it does not within the
// samples).
func turning(rs, vs []float64, re, e float64) (in, out float64) {
	in, out = math.NaN(), math.NaN()
	k := 0
	for k < len(rs)-1 && rs[k+1] < re {
		k++
	}
	for i := k; i > 0; i-- {
		if !math.IsNaN(vs[i-1]) && vs[i-1] >= e && vs[i] < e {
			in = rs[i-1] + (e-vs[i-1])/(vs[i]-vs[i-1])*(rs[i]-rs[i-1])
			break
		}
	}
	for i := k; i < len(rs)-1; i++ {
		if !math.IsNaN(vs[i+1]) && vs[i] < e && vs[i+1] >= e {
			out = rs[i] + (e-vs[i])/(vs[i+1]-vs[i])*(rs[i+1]-rs[i])
			break
		}
	}
	if math.IsNaN(out) && len(rs) > 0 {
		out = rs[len(rs)-1]
	}
	return in, out
}
