package fit

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/interp"

	"github.com/pairwell/pairwell/core"
)

// splineHalfWidth is the number of points on each side of the lowest one
// that the spline of EstimateWell passes through: enough for a cubic to
// follow the well, few enough that the steep wall far inside does not
// distort it (common practice).
const splineHalfWidth = 4

// EstimateWell estimates the well of the data for starting a fit: re and
// k = V″(re) from a not-a-knot cubic spline (gonum/interp) through the
// lowest point and up to splineHalfWidth neighbours on each side, re where
// the spline's slope vanishes next to the lowest point and k its second
// derivative there; Depth = zero − S(re), the spline's value measured from
// the energy zero (eV). With three points a parabola stands in for the
// spline. It returns an error wrapping core.ErrNoMinimum when the lowest
// point is the first or the last (no interior minimum), when the estimated
// curvature is not positive, or when the well does not lie below zero
// (Depth ≤ 0; pass zero = +Inf to leave the depth out).
func EstimateWell(d Data, zero float64) (core.Target, error) {
	n := len(d.R)
	imin := 0
	for i, e := range d.E {
		if e < d.E[imin] {
			imin = i
		}
	}
	if imin == 0 || imin == n-1 {
		return core.Target{}, fmt.Errorf("%w: the lowest energy is at the %s point, r = %g Å: the data do not enclose a minimum", core.ErrNoMinimum, map[bool]string{true: "first", false: "last"}[imin == 0], d.R[imin])
	}
	lo, hi := max(0, imin-splineHalfWidth), min(n, imin+splineHalfWidth+1)
	xs, ys := d.R[lo:hi], d.E[lo:hi]
	var s interface {
		Predict(float64) float64
		PredictDerivative(float64) float64
	}
	if len(xs) >= 4 {
		var nak interp.NotAKnotCubic
		if err := nak.Fit(xs, ys); err != nil {
			return core.Target{}, fmt.Errorf("%w: spline through the points near the minimum: %v", core.ErrNoMinimum, err)
		}
		s = &nak
	} else {
		s = parabola(xs, ys)
	}
	a, b := d.R[imin-1], d.R[imin+1]
	slope := func(x float64) (float64, float64, error) {
		h := 1e-6 * (b - a)
		return s.PredictDerivative(x), (s.PredictDerivative(x+h) - s.PredictDerivative(x-h)) / (2 * h), nil
	}
	re := d.R[imin]
	if s.PredictDerivative(a) < 0 && s.PredictDerivative(b) > 0 {
		if r, err := core.Root(slope, a, b); err == nil {
			re = r
		}
	}
	_, k, _ := slope(re)
	if !(k > 0) {
		return core.Target{}, fmt.Errorf("%w: the curvature of the data at their minimum (r ≈ %g Å) is not positive", core.ErrNoMinimum, re)
	}
	t := core.Target{Re: re, K: k}
	if !math.IsInf(zero, 1) {
		t.Depth = zero - s.Predict(re)
		if !(t.Depth > 0) {
			return core.Target{}, fmt.Errorf("%w: the data's minimum (%g eV at r ≈ %g Å) does not lie below their energy zero (%g eV)", core.ErrNoMinimum, s.Predict(re), re, zero)
		}
	}
	return t, nil
}

// quadratic is the parabola through three points.
type quadratic struct{ x0, c0, c1, c2 float64 }

func parabola(x, y []float64) quadratic {
	// Newton form through (x0,y0), (x1,y1), (x2,y2).
	d01 := (y[1] - y[0]) / (x[1] - x[0])
	d12 := (y[2] - y[1]) / (x[2] - x[1])
	c2 := (d12 - d01) / (x[2] - x[0])
	// y = y0 + d01 (t − x0) + c2 (t − x0)(t − x1)
	return quadratic{x0: x[0], c0: y[0], c1: d01 - c2*(x[1]-x[0]), c2: c2}
}

func (q quadratic) Predict(t float64) float64 {
	u := t - q.x0
	return q.c0 + u*(q.c1+u*q.c2)
}

func (q quadratic) PredictDerivative(t float64) float64 { return q.c1 + 2*q.c2*(t-q.x0) }
