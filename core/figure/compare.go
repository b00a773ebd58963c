package figure

import (
	"fmt"
	"math"

	"github.com/pairwell/pairwell/core"
)

// Curve is one form of a comparison.
type Curve struct {
	// Name is the legend entry.
	Name      string
	Potential core.Potential
}

// CompareOptions selects the units of Compare.
//
//	Reduced  FromMinimum  x      y
//	false    false        r      V(r)                 [Å, eV]
//	false    true         r      V(r) − V(re)         [Å, eV]
//	true     false        r/re   (V(r) − V(∞))/De     [1]
//	true     true         r/re   (V(r) − V(re))/De    [1]
//
// V(∞) is the dissociation limit (Domain.Limit), 0 for every built-in
// form that has one, so that the third row is the usual V/De, −1 at the
// minimum; De = V(∞) − V(re) is the depth.
type CompareOptions struct {
	Reduced     bool
	FromMinimum bool
}

// Compare returns the picture of several forms overlaid.
//
// Each curve gives one Peer series, on a grid of 601 points across the
// union of the default ranges of the forms (in r, or in r/re when
// reduced), NaN outside the form's domain. The energy axis is the union
// of the default windows, narrowed to the curves. Forms without a depth
// (harmonic) are drawn over the ranges of the others when there are
// others. A form with an inner
// barrier (Buckingham) gets a vertical line there. In reduced units a form
// without a depth (harmonic) cannot be drawn: it is left out, with a note,
// and it is an error wrapping core.ErrParam when no form remains.
func Compare(curves []Curve, o CompareOptions) (*Figure, error) {
	if len(curves) == 0 {
		return nil, fmt.Errorf("figure: %w: no form to compare", core.ErrParam)
	}
	type form struct {
		Curve
		w     core.Well
		v     view
		scale float64 // of r: re when reduced, else 1
		shift float64 // subtracted from V
		div   float64 // V is divided by it
	}
	var (
		forms []form
		notes []string
	)
	xmin, xmax := math.Inf(1), math.Inf(-1)
	ylo, yhi := math.Inf(1), math.Inf(-1)
	for _, c := range curves {
		w, err := core.AnalyzeWell(c.Potential, core.WellSettings{Order: 2})
		if err != nil {
			return nil, fmt.Errorf("figure: %s: %w", c.Name, err)
		}
		v, err := newView(c.Potential, w)
		if err != nil {
			return nil, fmt.Errorf("figure: %s: %w", c.Name, err)
		}
		f := form{Curve: c, w: w, v: v, scale: 1, div: 1}
		if o.Reduced {
			if !v.bounded {
				notes = append(notes, fmt.Sprintf("%s is left out: it has no well depth De, so it has no reduced form (V − V(∞))/De", c.Name))
				continue
			}
			f.scale, f.div, f.shift = w.Re, w.Depth, v.limit
		}
		if o.FromMinimum {
			f.shift = w.Energy
		}
		forms = append(forms, f)
	}
	if len(forms) == 0 {
		return nil, fmt.Errorf("figure: %w: no form has a well depth, none can be drawn in reduced units", core.ErrParam)
	}
	// The ranges come from the forms with a depth when there are any:
	// the default range of a form without one is arbitrary.
	anyBounded := false
	for _, f := range forms {
		anyBounded = anyBounded || f.v.bounded
	}
	for _, f := range forms {
		if anyBounded && !f.v.bounded {
			continue
		}
		xmin, xmax = math.Min(xmin, f.v.rmin/f.scale), math.Max(xmax, f.v.rmax/f.scale)
		lo, hi := f.v.yWindow()
		ylo, yhi = math.Min(ylo, (lo-f.shift)/f.div), math.Max(yhi, (hi-f.shift)/f.div)
	}

	fig := &Figure{Kind: "compare", XMin: xmin, XMax: xmax, Notes: notes}
	switch {
	case o.Reduced && o.FromMinimum:
		fig.Title = "Forms compared in reduced units: (V − V(re))/De against r/re"
		fig.XLabel, fig.YLabel = "reduced separation r/re", "reduced energy (V − V(re))/De"
	case o.Reduced:
		fig.Title = "Forms compared in reduced units: (V − V(∞))/De against r/re"
		fig.XLabel, fig.YLabel = "reduced separation r/re", "reduced energy (V − V(∞))/De"
	case o.FromMinimum:
		fig.Title = "Forms compared: energy above the minimum, V(r) − V(re)"
		fig.XLabel, fig.YLabel = "separation r [Å]", "V(r) − V(re) [eV]"
	default:
		fig.Title = "Forms compared: V(r)"
		fig.XLabel, fig.YLabel = "separation r [Å]", "potential energy V [eV]"
	}
	xs := linspace(xmin, xmax, gridPoints)
	var all []float64
	for _, f := range forms {
		rs := make([]float64, len(xs))
		for i, x := range xs {
			rs[i] = x * f.scale
		}
		ys := make([]float64, len(xs))
		if err := batchInDomain(f.Potential, 0, rs, ys); err != nil {
			return nil, fmt.Errorf("figure: %s: %w", f.Name, err)
		}
		for i := range ys {
			ys[i] = (ys[i] - f.shift) / f.div
		}
		fig.Series = append(fig.Series, Series{Name: f.Name, Role: Peer, X: xs, Y: ys})
		all = append(all, ys...)
		if d := f.Potential.Domain(); d.Barrier && d.Min/f.scale > xmin {
			fig.Marks = append(fig.Marks, Mark{Kind: VLine, X0: d.Min / f.scale, Label: f.Name + ": inner barrier, collapses below"})
			fig.Notes = append(fig.Notes, fmt.Sprintf("%s: inner barrier at r = %.4g Å, %.4g eV above its minimum; below it the form collapses to −∞",
				f.Name, d.Min, barrierHeight(f.Potential, f.w)))
		}
	}
	dlo, dhi := extent(all)
	fig.YMin, fig.YMax = fitWindow(ylo, yhi, dlo, dhi)
	return fig, nil
}

// barrierHeight returns V at the inner barrier above V(re), NaN when the
// domain has no barrier.
func barrierHeight(p core.Potential, w core.Well) float64 {
	if d := p.Domain(); d.Barrier {
		return d.BarrierEnergy - w.Energy
	}
	return math.NaN()
}
