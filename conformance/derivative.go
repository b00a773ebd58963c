package conformance

import (
	"fmt"
	"math"
	"strings"

	"gonum.org/v1/gonum/diff/fd"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/units"
)

// Finite differences. The derivative of g = V⁽ⁿ⁻¹⁾ at r is estimated by
// gonum's central difference fd.Central, D(h) = [g(r+h) − g(r−h)]/(2h),
// at the steps h_l = h₀/c^l, l = 0, …, levels−1, extrapolated to h → 0 by
// Ridders' Richardson tableau (C. J. F. Ridders, Adv. Eng. Software 4, 75
// (1982); Numerical Recipes §5.7): D(h) = g′ + a₁h² + a₂h⁴ + …, so each
// column of the tableau removes one power of h². The entry with the
// smallest error estimate (the difference to its neighbours in the
// tableau) is the estimate. All sample and stencil points, every order, go
// to the potential in one Taylor call.
const (
	levels   = 12   // tableau size
	stepCon  = 1.4  // c, the ratio of successive steps
	stepInit = 0.02 // h₀ = 0.02·r, at most half the distance to the domain's ends
)

// evaluation holds V⁽ᵏ⁾ = k!·c_k at the sample points and at the stencil
// points around them, k = 0, …, order, from one Taylor call.
type evaluation struct {
	rs    []float64   // sample points, Å
	steps []float64   // steps[i*levels+l]: the exact step h at point i, level l
	vals  [][]float64 // vals[k][i] = V⁽ᵏ⁾(rs[i])
	minus [][]float64 // minus[k][i*levels+l] = V⁽ᵏ⁾(rs[i] − h)
	plus  [][]float64 // plus[k][i*levels+l] = V⁽ᵏ⁾(rs[i] + h)
	errs  []error     // errs[k]: why order k could not be evaluated
	lo    float64     // sampled range, Å
	hi    float64
	how   string // where the range comes from
}

// evaluate samples the potential: Points evenly spaced separations over
// the sampled range, each with its stencil.
func (c *subject) evaluate() *evaluation {
	lo, hi, how := c.sampleRange()
	n := c.s.Points
	ev := &evaluation{lo: lo, hi: hi, how: how, rs: make([]float64, n), steps: make([]float64, n*levels)}
	for i := range ev.rs {
		ev.rs[i] = lo + (hi-lo)*float64(i)/float64(n-1)
	}
	d := c.dom
	offKinks(ev.rs, d.Kinks)
	for i, r := range ev.rs {
		h := stepInit * r
		if d.Min > 0 || r-2*h <= 0 {
			h = math.Min(h, 0.5*(r-math.Max(d.Min, 0)))
		}
		if !math.IsInf(d.Max, 1) {
			h = math.Min(h, 0.5*(d.Max-r))
		}
		for _, k := range d.Kinks {
			h = math.Min(h, 0.5*math.Abs(r-k))
		}
		for l := 0; l < levels; l++ {
			// The exact difference of representable abscissae, so that
			// r ± h are computed without rounding.
			ev.steps[i*levels+l] = (r + h) - r
			h /= stepCon
		}
	}
	ev.vals = make([][]float64, c.order+1)
	ev.minus = make([][]float64, c.order+1)
	ev.plus = make([][]float64, c.order+1)
	ev.errs = make([]error, c.order+1)
	m := n * levels
	xs := make([]float64, n+2*m)
	copy(xs, ev.rs)
	for i, r := range ev.rs {
		for l := 0; l < levels; l++ {
			h := ev.steps[i*levels+l]
			xs[n+i*levels+l] = r - h
			xs[n+m+i*levels+l] = r + h
		}
	}
	c.evalOrders(ev, xs, n, m)
	return ev
}

// kinkGap is the smallest distance, relative to r, of a sample point from a
// kink (Domain.Kinks): a point closer is moved to that distance on its side
// (a point on the kink to the outer side), so that its stencil, kept
// within half the distance to the kink, still has steps large enough for
// the extrapolation.
const kinkGap = 0.005

// offKinks moves the sample points rs away from the kinks, see kinkGap.
// Points on both sides of a kink stay checked, each with stencils on its
// own side.
func offKinks(rs, kinks []float64) {
	for i, r := range rs {
		for _, k := range kinks {
			gap := kinkGap * k
			switch {
			case r >= k && r < k+gap:
				rs[i] = k + gap
			case r < k && r > k-gap:
				rs[i] = k - gap
			}
		}
	}
}

// evalOrders fills ev from one Taylor call of order c.order at the n
// sample points and 2m stencil points xs. When it fails, the orders are
// tried one at a time from 0 (a row of order k is a prefix of the row of
// any higher order), so that the orders below the first failing one are
// still checked.
func (c *subject) evalOrders(ev *evaluation, xs []float64, n, m int) {
	top := c.order
	out, err := c.taylorAll(top, xs)
	if err != nil {
		top = -1
		for k := 0; k <= c.order; k++ {
			o, e := c.taylorAll(k, xs)
			if e != nil {
				for j := k; j <= c.order; j++ {
					ev.errs[j] = e
				}
				break
			}
			out, top = o, k
		}
	}
	for k := 0; k <= top; k++ {
		f := factorial(k)
		v := make([]float64, len(xs))
		for j := range xs {
			v[j] = out[j*(top+1)+k] * f
		}
		ev.vals[k], ev.minus[k], ev.plus[k] = v[:n], v[n:n+m], v[n+m:]
	}
}

// taylorAll evaluates Taylor of order k at xs and checks that every value
// is finite, as the contract requires.
func (c *subject) taylorAll(k int, xs []float64) ([]float64, error) {
	out := make([]float64, (k+1)*len(xs))
	if err := c.p.Taylor(k, xs, out); err != nil {
		return nil, err
	}
	for j, v := range out {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return nil, fmt.Errorf("Taylor returned c_%d = %g at r = %.9g Å without an error", j%(k+1), v, xs[j/(k+1)])
		}
	}
	return out, nil
}

// factorial returns k! (core.Factorial).
func factorial(k int) float64 { return core.Factorial(k) }

// ridders returns the Richardson-extrapolated estimate from the values
// d[l] of a central formula at steps h₀/c^l, and its error estimate.
func ridders(d *[levels]float64) (est, errEst float64) {
	var a [levels][levels]float64
	con2 := stepCon * stepCon
	errEst = math.Inf(1)
	est = d[levels-1]
	a[0][0] = d[0]
	for i := 1; i < levels; i++ {
		a[0][i] = d[i]
		fac := con2
		for j := 1; j <= i; j++ {
			a[j][i] = (a[j-1][i]*fac - a[j-1][i-1]) / (fac - 1)
			fac *= con2
			e := math.Max(math.Abs(a[j][i]-a[j-1][i]), math.Abs(a[j][i]-a[j-1][i-1]))
			if e <= errEst {
				errEst, est = e, a[j][i]
			}
		}
	}
	return est, errEst
}

// finiteDiff returns the Ridders estimate at point i of the derivative of
// order f.Derivative of V⁽ᵏ⁾, from the stencil values of order k, with
// gonum's formula f (whose stencil lies on −1, 0, +1).
func (ev *evaluation) finiteDiff(f fd.Formula, k, i int) (est, errEst float64) {
	var d [levels]float64
	for l := 0; l < levels; l++ {
		j := i*levels + l
		h := ev.steps[j]
		var sum float64
		for _, pt := range f.Stencil {
			switch pt.Loc {
			case -1:
				sum += pt.Coeff * ev.minus[k][j]
			case 0:
				sum += pt.Coeff * ev.vals[k][i]
			case 1:
				sum += pt.Coeff * ev.plus[k][j]
			}
		}
		d[l] = sum / math.Pow(h, float64(f.Derivative))
	}
	return ridders(&d)
}

// orderCheck is the comparison of V⁽ⁿ⁾ with a finite difference.
type orderCheck struct {
	worst    float64 // largest relative error
	worstI   int     // its point
	analytic float64 // V⁽ⁿ⁾ at the worst point
	numeric  float64 // the finite-difference estimate there
	fdErr    float64 // the estimate's own error estimate there
	failing  int     // points beyond the tolerance
	first    int     // first and last failing point
	last     int
	qmin     float64 // range of analytic/numeric over the failing points
	qmax     float64
}

// scaleFloor is the smallest scale, relative to the largest over the
// sampled points, at which a relative error is measured: values below
// double precision of the range's largest (the far, underflowing tail of
// an exponential) are compared in absolute terms.
const scaleFloor = 1e-16

// compare compares V⁽ⁿ⁾ with the derivative of order f.Derivative of
// V⁽ⁿ⁻ᵈ⁾, d = f.Derivative, at every point. The relative error at r is
//
//	|A − D| / (|A| + |V⁽ⁿ⁻ᵈ⁾(r)|/rᵈ + 10⁻¹⁶·max),
//
// A analytic, D finite-difference: the second term, the size V⁽ⁿ⁾ would
// have if V⁽ⁿ⁻ᵈ⁾ varied on the length scale r, keeps zero crossings of
// V⁽ⁿ⁾ from inflating the error; the third, with max the largest of the
// first two terms over the points, keeps underflowing tails from it.
func (ev *evaluation) compare(f fd.Formula, n int, tol float64) orderCheck {
	d := f.Derivative
	scales := make([]float64, len(ev.rs))
	top := 0.0
	for i, r := range ev.rs {
		scales[i] = math.Abs(ev.vals[n][i]) + math.Abs(ev.vals[n-d][i])/math.Pow(r, float64(d))
		top = math.Max(top, scales[i])
	}
	oc := orderCheck{worstI: -1, first: -1, qmin: math.Inf(1), qmax: math.Inf(-1)}
	for i := range ev.rs {
		a := ev.vals[n][i]
		num, fdErr := ev.finiteDiff(f, n-d, i)
		scale := scales[i] + scaleFloor*top
		diff := math.Abs(a - num)
		e := 0.0
		if diff != 0 {
			e = diff / scale // +Inf when the scale is 0
		}
		if math.IsNaN(e) {
			e = math.Inf(1)
		}
		if oc.worstI < 0 || e > oc.worst {
			oc.worst, oc.worstI, oc.analytic, oc.numeric, oc.fdErr = e, i, a, num, fdErr
		}
		if e > tol {
			oc.failing++
			if oc.first < 0 {
				oc.first = i
			}
			oc.last = i
			if math.Abs(num) > tol*scale {
				q := a / num
				oc.qmin, oc.qmax = math.Min(oc.qmin, q), math.Max(oc.qmax, q)
			}
		}
	}
	return oc
}

// pattern describes a failure in which V⁽ⁿ⁾ is a constant multiple of the
// finite-difference value at every failing point, or "".
func (oc orderCheck) pattern(n int) string {
	if oc.failing == 0 || math.IsNaN(oc.qmin) || math.IsNaN(oc.qmax) || math.IsInf(oc.qmin, 0) {
		return ""
	}
	q := 0.5 * (oc.qmin + oc.qmax)
	if oc.qmax-oc.qmin > 1e-6*math.Abs(q) {
		return ""
	}
	if math.Abs(q+1) <= 1e-6 {
		if n == 1 {
			return "V′ has the opposite sign of dV/dr at every failing point: a sign error (the force F = −V′ points the wrong way)"
		}
		return fmt.Sprintf("%s has the opposite sign of the finite difference at every failing point: a sign error", vname(n))
	}
	return fmt.Sprintf("%s is %.9g times the finite difference at every failing point: a wrong factor", vname(n), q)
}

// checkDerivatives compares V⁽ⁿ⁾ with the finite-difference derivative of
// V⁽ⁿ⁻¹⁾ for n = 1, …, order. When order n fails, V⁽ⁿ⁾ is also compared
// with the second difference of V⁽ⁿ⁻²⁾ (fd.Central2nd) to tell a wrong
// V⁽ⁿ⁾ from a wrong V⁽ⁿ⁻¹⁾: if V⁽ⁿ⁾ agrees with it to a hundredth of the
// first comparison's error, the fault is in V⁽ⁿ⁻¹⁾.
func (c *subject) checkDerivatives() []Result {
	ev := c.ev
	tol := c.s.DerivativeTolerance
	out := make([]Result, 0, c.order)
	failed := make([]bool, c.order+1)
	for n := 1; n <= c.order; n++ {
		r := c.result(CheckDerivative, fmt.Sprintf("%s vs d%s/dr", vname(n), vname(n-1)))
		r.Order, r.Tolerance = n, tol
		if err := firstErr(ev.errs[n], ev.errs[n-1]); err != nil {
			r.Message = fmt.Sprintf("order %d: cannot compare %s with d%s/dr over %.6g to %.6g Å: %s",
				n, vname(n), vname(n-1), ev.lo, ev.hi, errString(err))
			failed[n] = true
			out = append(out, r)
			continue
		}
		oc := ev.compare(fd.Central, n, tol)
		r.Error, r.WorstR = oc.worst, ev.rs[oc.worstI]
		if oc.failing == 0 {
			r.Passed = true
			r.Message = fmt.Sprintf("%d points from %.6g to %.6g Å (%s); worst at r = %.6g Å",
				len(ev.rs), ev.lo, ev.hi, ev.how, r.WorstR)
			out = append(out, r)
			continue
		}
		failed[n] = true
		var b strings.Builder
		fmt.Fprintf(&b, "order %d: at r = %.9g Å %s = %.10g %s but the finite-difference derivative of %s is %.10g (±%.2g): relative error %.3g > tolerance %.3g; %d of %d points fail",
			n, r.WorstR, vname(n), oc.analytic, units.DerivativeUnit(n), vname(n-1), oc.numeric, oc.fdErr, oc.worst, tol, oc.failing, len(ev.rs))
		if oc.failing > 1 {
			fmt.Fprintf(&b, ", from r = %.6g to %.6g Å", ev.rs[oc.first], ev.rs[oc.last])
		}
		if n >= 2 && ev.errs[n-2] == nil {
			d2 := ev.compare(fd.Central2nd, n, tol)
			switch {
			case d2.worst <= 0.01*oc.worst && failed[n-1]:
				fmt.Fprintf(&b, "; %s agrees with the second difference of %s (error %.2g), so the fault is in %s (order %d), not in %s",
					vname(n), vname(n-2), d2.worst, vname(n-1), n-1, vname(n))
			case d2.worst <= 0.01*oc.worst:
				fmt.Fprintf(&b, "; %s agrees with the second difference of %s (error %.2g): %s is suspect",
					vname(n), vname(n-2), d2.worst, vname(n-1))
			case d2.worst >= 0.1*oc.worst:
				fmt.Fprintf(&b, "; %s also disagrees with the second difference of %s (error %.2g), so %s itself is wrong",
					vname(n), vname(n-2), d2.worst, vname(n))
				if p := oc.pattern(n); p != "" {
					b.WriteString("; " + p)
				}
			}
		} else if p := oc.pattern(n); p != "" {
			b.WriteString("; " + p)
		}
		r.Message = b.String()
		out = append(out, r)
	}
	return out
}

func firstErr(errs ...error) error {
	for _, e := range errs {
		if e != nil {
			return e
		}
	}
	return nil
}

// vname names the n-th derivative of V: V, V′, V″, V‴, V⁗, V⁽⁵⁾, …
func vname(n int) string {
	switch n {
	case 0:
		return "V"
	case 1:
		return "V′"
	case 2:
		return "V″"
	case 3:
		return "V‴"
	case 4:
		return "V⁗"
	}
	return "V⁽" + units.Superscript(n) + "⁾"
}
