package tabulate

import (
	"fmt"
	"math"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/units"
)

// DefaultSafety multiplies the sampled maximum of |V⁽ᵏ⁾| in the error
// bounds: the scan could miss a little of a sharp maximum, so the planned
// spacing is that of a derivative 1.5 times larger. Verification then
// checks the result.
const DefaultSafety = 1.5

// DefaultSamples is the number of points of the scan for the maximum of
// |V⁽ᵏ⁾| over the range (refined three times around its largest value).
const DefaultSamples = 4096

// maxRefinements bounds the refinements of the spacing after verification.
const maxRefinements = 8

// Settings controls a table. The zero value is usable: the cubic spline,
// no V″ column, safety factor DefaultSafety, DefaultSamples scan points.
type Settings struct {
	// Interpolation is the interpolant the table is meant for (zero:
	// Cubic).
	Interpolation Interpolation
	// SecondDerivative adds the V″ column.
	SecondDerivative bool
	// Safety multiplies the sampled maximum of |V⁽ᵏ⁾| in the bounds; zero
	// means DefaultSafety; it must be ≥ 1.
	Safety float64
	// Samples is the number of scan points for the maximum of |V⁽ᵏ⁾|; zero
	// means DefaultSamples; at least 16.
	Samples int
}

func (s Settings) withDefaults() (Settings, error) {
	if s.Safety == 0 {
		s.Safety = DefaultSafety
	}
	if s.Samples == 0 {
		s.Samples = DefaultSamples
	}
	switch {
	case !(s.Safety >= 1) || math.IsInf(s.Safety, 0):
		return s, fmt.Errorf("%w: safety factor %g: it must be ≥ 1", core.ErrParam, s.Safety)
	case s.Samples < 16:
		return s, fmt.Errorf("%w: %d scan points: at least 16", core.ErrParam, s.Samples)
	case s.Interpolation != Cubic && s.Interpolation != Linear:
		return s, fmt.Errorf("%w: unknown interpolation %d", core.ErrParam, s.Interpolation)
	}
	return s, nil
}

// Tolerance is a requested accuracy of an interpolated table.
type Tolerance struct {
	Energy float64 // max |V − V_interp| in eV, > 0
	Force  float64 // max |F − F_interp| in eV/Å, > 0
}

// Plan says how a spacing was chosen for a Tolerance.
type Plan struct {
	Tolerance Tolerance
	Safety    float64
	// Orders of the derivatives in the bounds (4 and 4 for Cubic, 2 and 3
	// for Linear) with their sampled maxima |V⁽ᵏ⁾| (eV/Åᵏ, before the
	// safety factor) and where they lie (Å).
	EnergyOrder, ForceOrder int
	EnergyMax, ForceMax     float64
	EnergyMaxR, ForceMaxR   float64
	// Bound is the a-priori bound at the final spacing (safety included).
	Bound Tolerance
	// Refinements counts the times the spacing from the bounds was
	// refined because the measured error did not reach the request.
	Refinements int
}

// constants of the bounds: error ≤ coef·h^pow·max|V⁽ᵒʳᵈᵉʳ⁾|.
type bound struct {
	order int
	coef  float64
	pow   float64
}

// bounds returns the bounds of V and F for an interpolation (see the
// package documentation for the sources).
func bounds(how Interpolation) (energy, force bound) {
	if how == Linear {
		return bound{2, 1.0 / 8, 2}, bound{3, 1.0 / 8, 2}
	}
	return bound{4, 5.0 / 384, 4}, bound{4, 1.0 / 24, 3}
}

// spacing returns the largest h with coef·h^pow·m ≤ tol (+Inf for m = 0).
func (b bound) spacing(tol, m float64) float64 {
	if m == 0 {
		return math.Inf(1)
	}
	return math.Pow(tol/(b.coef*m), 1/b.pow)
}

func (b bound) at(h, m float64) float64 { return b.coef * math.Pow(h, b.pow) * m }

// PlanFor chooses the spacing of a table of p from from to to for which
// the interpolant reaches tol, tabulates it and verifies it; see the
// package documentation. The error wraps ErrTooFine (with what limits it)
// when tol needs more than MaxPoints points or lies below the rounding
// error of V, core.ErrDomain when the range leaves the form's domain,
// core.ErrParam when a kink of the form (Domain.Kinks) lies inside it, and
// core.ErrNoConvergence when refinement does not reach tol.
func PlanFor(p core.Potential, from, to float64, tol Tolerance, s Settings) (*Result, error) {
	s, err := s.withDefaults()
	if err != nil {
		return nil, err
	}
	if err := checkRange(from, to); err != nil {
		return nil, err
	}
	if !(tol.Energy > 0) || !(tol.Force > 0) || math.IsInf(tol.Energy, 0) || math.IsInf(tol.Force, 0) {
		return nil, fmt.Errorf("%w: accuracy %g eV, %g eV/Å: both must be positive", core.ErrParam, tol.Energy, tol.Force)
	}
	if err := checkDomain(p, from, to); err != nil {
		return nil, err
	}
	for _, k := range p.Domain().Kinks {
		if k > from && k < to {
			return nil, fmt.Errorf("%w: the form has a kink at %g Å (a cutoff or the start of a switch), inside the range %g to %g Å: the error bounds need a smooth V; plan the table on each side of it (e.g. up to %g Å)",
				core.ErrParam, k, from, to, k)
		}
	}
	be, bf := bounds(s.Interpolation)
	if p.MaxOrder() < bf.order || p.MaxOrder() < be.order {
		return nil, fmt.Errorf("%w: the form has derivatives up to order %d; the %s bounds need order %d", core.ErrOrder, p.MaxOrder(), s.Interpolation, max(be.order, bf.order))
	}
	sc, err := scan(p, from, to, max(be.order, bf.order), s.Samples)
	if err != nil {
		return nil, err
	}
	plan := &Plan{Tolerance: tol, Safety: s.Safety, EnergyOrder: be.order, ForceOrder: bf.order,
		EnergyMax: sc.max[be.order], EnergyMaxR: sc.at[be.order], ForceMax: sc.max[bf.order], ForceMaxR: sc.at[bf.order]}
	// Rounding: V is stored and interpolated in float64, so no table
	// resolves less than a few ulp of the largest |V|.
	if floor := 64 * 0x1p-52 * sc.max[0]; tol.Energy < floor {
		return nil, fmt.Errorf("%w: an accuracy of %g eV is below the rounding error of V on this range (|V| reaches %.4g eV at %g Å; about %.2g eV is the best a float64 table can do): relax --accuracy or start the table further out",
			ErrTooFine, tol.Energy, sc.max[0], sc.at[0], floor)
	}
	span := to - from
	hv, hf := be.spacing(tol.Energy, s.Safety*plan.EnergyMax), bf.spacing(tol.Force, s.Safety*plan.ForceMax)
	h := math.Min(hv, hf)
	// The derivative that limits h, for messages.
	limit := derivativeMax{plan.EnergyOrder, plan.EnergyMax, plan.EnergyMaxR}
	if hf < hv {
		limit = derivativeMax{plan.ForceOrder, plan.ForceMax, plan.ForceMaxR}
	}
	points := 2
	if h < span {
		points = int(math.Ceil(span/h)) + 1
	}
	if err := tooMany(points, from, to, tol, s.Interpolation, limit); err != nil {
		return nil, err
	}
	for {
		g := Grid{From: from, To: to, Points: points}
		res, err := Build(p, g, s)
		if err != nil {
			return nil, err
		}
		res.Plan = plan
		hg := g.Step()
		plan.Bound = Tolerance{Energy: be.at(hg, s.Safety*plan.EnergyMax), Force: bf.at(hg, s.Safety*plan.ForceMax)}
		if res.Check.Energy <= tol.Energy && res.Check.Force <= tol.Force {
			return res, nil
		}
		if plan.Refinements == maxRefinements {
			return nil, fmt.Errorf("%w: after %d refinements (%d points) the %s interpolant still misses the accuracy: error %.3g eV at %g Å, %.3g eV/Å at %g Å",
				core.ErrNoConvergence, plan.Refinements, points, s.Interpolation, res.Check.Energy, res.Check.EnergyR, res.Check.Force, res.Check.ForceR)
		}
		// Shrink h by what the measured errors ask for at the bounds'
		// orders, 10 % more, and at least one point more.
		ratio := math.Max(math.Pow(res.Check.Energy/tol.Energy, 1/be.pow), math.Pow(res.Check.Force/tol.Force, 1/bf.pow))
		next := int(math.Ceil(span/(hg/(1.1*ratio)))) + 1
		points = max(next, points+1)
		plan.Refinements++
		if err := tooMany(points, from, to, tol, s.Interpolation, limit); err != nil {
			return nil, err
		}
	}
}

// derivativeMax is a sampled max |V⁽ᵏ⁾| (eV/Åᵏ) and where (Å).
type derivativeMax struct {
	order int
	max   float64
	at    float64
}

// tooMany refuses a grid beyond MaxPoints, naming the derivative that asks
// for it.
func tooMany(points int, from, to float64, tol Tolerance, how Interpolation, d derivativeMax) error {
	if points <= MaxPoints {
		return nil
	}
	hint := "; or use cubic interpolation"
	if how == Cubic {
		hint = ""
	}
	return fmt.Errorf("%w: %g eV and %g eV/Å with %s interpolation from %g to %g Å need %d points (spacing %.3g Å), more than %d: |V⁽%s⁾| reaches %.4g eV/Å%s at r = %g Å (the repulsive wall when that is the start): start the table further out or relax the accuracy%s",
		ErrTooFine, tol.Energy, tol.Force, how, from, to, points, (to-from)/float64(points-1), MaxPoints,
		units.Superscript(d.order), d.max, units.Superscript(d.order), d.at, hint)
}

// scanResult holds max |V⁽ᵏ⁾| over a range and where, k = 0…order.
type scanResult struct {
	max, at []float64
}

// scan finds max |V⁽ᵏ⁾| on [from, to] for k = 0…order: one Taylor call at
// n uniform points, then three zooms of 33 points around the largest
// |V⁽ᵏ⁾| of each order found so far, within one scan spacing of it and
// 16 times narrower each time (one call per zoom).
func scan(p core.Potential, from, to float64, order, n int) (scanResult, error) {
	sr := scanResult{max: make([]float64, order+1), at: make([]float64, order+1)}
	for k := range sr.at {
		sr.at[k] = from
	}
	update := func(xs []float64) error {
		c := make([]float64, (order+1)*len(xs))
		if err := p.Taylor(order, xs, c); err != nil {
			return err
		}
		for k := 0; k <= order; k++ {
			f := core.Factorial(k)
			for i, x := range xs {
				if v := math.Abs(c[i*(order+1)+k]) * f; v > sr.max[k] {
					sr.max[k], sr.at[k] = v, x
				}
			}
		}
		return nil
	}
	h := (to - from) / float64(n-1)
	xs := make([]float64, n)
	for i := range xs {
		xs[i] = from + float64(i)*h
	}
	xs[n-1] = to
	if err := update(xs); err != nil {
		return sr, err
	}
	width := h
	for zoom := 0; zoom < 3; zoom++ {
		zs := make([]float64, 0, 33*(order+1))
		for k := 0; k <= order; k++ {
			lo, hi := math.Max(from, sr.at[k]-width), math.Min(to, sr.at[k]+width)
			for j := 0; j <= 32; j++ {
				zs = append(zs, lo+(hi-lo)*float64(j)/32)
			}
		}
		if err := update(zs); err != nil {
			return sr, err
		}
		width /= 16
	}
	return sr, nil
}
