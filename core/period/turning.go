package period

import (
	"errors"
	"fmt"
	"math"

	"github.com/pairwell/pairwell/core"
)

// maxExpand bounds the geometric bracket expansion of TurningPoints: with
// the step doubling each time, 200 steps span far more than any float64
// separation.
const maxExpand = 200

// TurningPoints returns the classical turning points r₋ < re < r₊ (Å) of
// the oscillation of energy E (eV, measured from the minimum) in the well w
// of p: the roots of V(r) − V(re) − E on either side of re. For E = 0 both
// are re.
//
// Each root is bracketed by a geometric expansion outward from re, starting
// at the harmonic amplitude √(E/c₂), then refined by core.Root (Newton
// safeguarded by bisection) to a few ulp. The oscillation is assumed to be
// in a single well: V increases monotonically away from re up to each
// turning point.
//
// The returned error wraps core.ErrParam for E < 0 or NaN, and
// core.ErrDomain when there is no bound oscillation at E: E at or above the
// well depth (the pair dissociates); E at or above an inner barrier
// (Domain.Barrier, e.g. Buckingham: the pair collapses through the spurious
// inner maximum); V turning over before reaching E on either side (the pair
// escapes over that maximum); or a turning point outside the domain.
func TurningPoints(p core.Potential, w core.Well, E float64) (inner, outer float64, err error) {
	if err := checkEnergy(p, w, E); err != nil {
		return 0, 0, err
	}
	if E == 0 {
		return w.Re, w.Re, nil
	}
	s0 := math.Sqrt(E / w.Taylor[2])
	outer, err = turningPoint(p, w, E, s0, +1)
	if err != nil {
		return 0, 0, err
	}
	inner, err = turningPoint(p, w, E, s0, -1)
	if err != nil {
		return 0, 0, err
	}
	return inner, outer, nil
}

// checkEnergy validates E against the well and the domain.
func checkEnergy(p core.Potential, w core.Well, E float64) error {
	if len(w.Taylor) < 3 || !(w.Taylor[2] > 0) {
		return fmt.Errorf("period: %w: the well needs Taylor coefficients up to c₂ > 0 (see core.AnalyzeWell)", core.ErrParam)
	}
	if !(E >= 0) || math.IsInf(E, 1) {
		return fmt.Errorf("period: %w: oscillation energy E = %g eV, must be finite and ≥ 0", core.ErrParam, E)
	}
	if w.Bounded() && E >= w.Depth {
		return unbound("E = %.6g eV is at or above the well depth %.6g eV: the pair dissociates, there is no oscillation", E, w.Depth)
	}
	d := p.Domain()
	if d.Barrier {
		rb, vb := d.Min, math.NaN()
		if t, ok := p.(core.Turnover); ok {
			rb, vb = t.Barrier()
		}
		if math.IsNaN(vb) {
			v, err := core.Value(p, math.Nextafter(d.Min, math.Inf(1)))
			if err != nil {
				return fmt.Errorf("period: energy at the inner barrier: %w", err)
			}
			vb = v
		}
		if hb := vb - w.Energy; E >= hb {
			return unbound("E = %.6g eV is at or above the inner barrier (%.6g eV above the minimum, at r = %.6g Å): "+
				"the pair collapses through the spurious inner maximum of the form, there is no oscillation", E, hb, rb)
		}
	}
	return nil
}

// turningPoint finds the root of U(r) − E on the side dir (+1 stretch,
// −1 compression) of re, where U(r) = V(r) − V(re).
func turningPoint(p core.Potential, w core.Well, E, s0 float64, dir float64) (float64, error) {
	d := p.Domain()
	side := "stretch"
	edge := d.Max
	if dir < 0 {
		side, edge = "compression", d.Min
	}
	var buf [2]float64
	f := func(r float64) (u, du float64, err error) {
		if err := p.Derivatives(r, buf[:]); err != nil {
			return 0, 0, err
		}
		return buf[0] - w.Energy - E, buf[1], nil
	}
	lo := w.Re // f(lo) = −E < 0
	step := 1.25 * s0
	halvings := 0
	for i := 0; i < maxExpand; i++ {
		r := w.Re + dir*step
		if !d.Contains(r) {
			// Approach the edge geometrically, giving up when
			// V stays below E to within 2⁻⁶⁰ of the distance.
			r = 0.5 * (lo + edge)
			halvings++
			if r == lo || !d.Contains(r) || halvings > 60 {
				return 0, unbound("no %s turning point at E = %.6g eV: V − V(re) stays below E up to the edge of the domain (%g Å, %g Å)",
					side, E, d.Min, d.Max)
			}
		}
		u, du, err := f(r)
		if err != nil {
			if errors.Is(err, core.ErrDomain) {
				return 0, unbound("no %s turning point at E = %.6g eV: %v", side, E, err)
			}
			return 0, fmt.Errorf("period: %s turning point: %w", side, err)
		}
		if u >= 0 {
			x, err := core.Root(f, lo, r)
			if err != nil {
				return 0, fmt.Errorf("period: %s turning point at E = %g eV: %w", side, E, err)
			}
			return x, nil
		}
		if du*dir <= 0 {
			// V has turned over between lo and r: the turning point
			// lies before the maximum if that is above E.
			rm, hm, err := maximum(p, w, lo, r)
			if err != nil {
				return 0, fmt.Errorf("period: %s turning point: %w", side, err)
			}
			if !(hm > E) {
				return 0, unbound("on the %s side V turns over at r = %.6g Å, %.6g eV above the minimum, below E = %.6g eV: "+
					"the pair escapes over that maximum, there is no oscillation", side, rm, hm, E)
			}
			x, err := core.Root(f, lo, rm)
			if err != nil {
				return 0, fmt.Errorf("period: %s turning point at E = %g eV: %w", side, E, err)
			}
			return x, nil
		}
		lo = r
		step *= 2
	}
	return 0, fmt.Errorf("period: %w: no %s turning point at E = %.6g eV within %d expansions", core.ErrNoConvergence, side, E, maxExpand)
}

// maximum locates the maximum of V between a and b, where V′ changes sign,
// and returns it with its height above the minimum.
func maximum(p core.Potential, w core.Well, a, b float64) (r, h float64, err error) {
	if p.MaxOrder() < 2 {
		return 0, 0, fmt.Errorf("%w: locating a maximum of V needs V″ (this form has derivatives up to %d)", core.ErrOrder, p.MaxOrder())
	}
	var buf [3]float64
	r, err = core.Root(func(x float64) (float64, float64, error) {
		if err := p.Derivatives(x, buf[:]); err != nil {
			return 0, 0, err
		}
		return buf[1], buf[2], nil
	}, a, b)
	if err != nil {
		return 0, 0, err
	}
	v, err := core.Value(p, r)
	if err != nil {
		return 0, 0, err
	}
	return r, v - w.Energy, nil
}

// unboundError is an oscillation energy without bound motion. It wraps
// core.ErrDomain while reading as its own message.
type unboundError struct{ msg string }

func (e *unboundError) Error() string { return e.msg }
func (e *unboundError) Unwrap() error { return core.ErrDomain }

// unbound returns an *unboundError with a formatted message.
func unbound(format string, args ...any) error {
	return &unboundError{fmt.Sprintf(format, args...)}
}
