package core

import (
	"errors"
	"fmt"
	"math"
)

// WellSettings controls AnalyzeWell. The zero value is ready to use.
type WellSettings struct {
	// Order is the highest Taylor coefficient reported. Zero means 4.
	Order int
}

// Well is the minimum of a potential and its neighbourhood.
type Well struct {
	// Re is the equilibrium distance in Å, where V′(Re) = 0 and V″(Re) > 0,
	// located to a few ulp.
	Re float64
	// Energy is V(Re) in eV.
	Energy float64
	// Depth is Domain.Limit − V(Re) in eV, +Inf for a potential that grows
	// without bound.
	Depth float64
	// Taylor holds c_n = V⁽ⁿ⁾(Re)/n! in eV/Åⁿ for n = 0, …, Order, so that
	// V(Re + x) ≈ Σ c_n xⁿ. Taylor[0] = Energy and Taylor[1] = 0 to
	// rounding.
	Taylor []float64
	// Series holds c_n = V⁽ⁿ⁾(Re)/n! for n = 0, …, M with M =
	// min(SeriesOrder, MaxOrder) (shorter where a coefficient is not
	// finite), for the series of small displacements (see Expansion); it
	// comes from the same evaluation as Taylor, which it extends. It may
	// be nil in a Well built by hand: Expansion then uses Taylor.
	Series []float64
	// ReError is the uncertainty of Re in Å set by the rounding of V′:
	// the largest deviation of V′ from a straight line at 16 points
	// within 2¹¹ ulp of Re, divided by V″(Re), plus an ulp of Re. A
	// Taylor coefficient at Re is uncertain by about (k+1)|c_{k+1}|·ReError
	// (see Expansion).
	ReError float64
	// K is the force constant V″(Re) in eV/Å² (Hooke's law k).
	K float64
	// Inflection is the stretch-side inflection point in Å, where V″
	// changes sign beyond Re and the restoring force is largest; NaN when
	// V″ stays positive from Re out to about 2·10⁴·Re or the end of the
	// domain (harmonic).
	Inflection float64
	// MaxForce is the largest restoring force on the stretch side,
	// V′(Inflection), in eV/Å; NaN when there is no inflection.
	MaxForce float64
}

// Bounded reports whether the well has a finite depth.
func (w Well) Bounded() bool { return !math.IsInf(w.Depth, 1) }

// AnalyzeWell finds the minimum of p and describes it. It returns an error
// wrapping ErrNoMinimum when p has none in its domain and ErrNoConvergence
// when the root finder fails.
func AnalyzeWell(p Potential, s WellSettings) (Well, error) {
	order := s.Order
	if order == 0 {
		order = 4
	}
	if order < 2 {
		return Well{}, fmt.Errorf("taylor order %d: %w (at least 2)", order, ErrOrder)
	}
	if order > p.MaxOrder() {
		return Well{}, fmt.Errorf("taylor order %d: %w (this form has analytic derivatives up to %d)", order, ErrOrder, p.MaxOrder())
	}
	re, err := Equilibrium(p)
	if err != nil {
		return Well{}, err
	}
	series := make([]float64, max(order, min(SeriesOrder, p.MaxOrder()))+1)
	if err := one(p, len(series)-1, re, series); err != nil {
		// The series beyond the requested order is a bonus: when one of
		// its coefficients overflows, keep the requested ones only.
		if len(series) == order+1 || one(p, order, re, series[:order+1]) != nil {
			return Well{}, fmt.Errorf("taylor coefficients at r = %g Å: %w", re, err)
		}
		series = series[:order+1]
	}
	w := Well{Re: re, Taylor: series[: order+1 : order+1], Series: series}
	w.Energy = w.Taylor[0]
	w.K = 2 * w.Taylor[2] // V″(re) = 2c₂
	if w.ReError, err = reError(p, re, w.K); err != nil {
		return Well{}, err
	}
	d := p.Domain()
	w.Depth = math.Inf(1)
	if d.Bounded() {
		w.Depth = d.Limit - w.Energy
	}
	w.Inflection, w.MaxForce, err = inflection(p, re)
	if err != nil {
		return Well{}, err
	}
	return w, nil
}

// Equilibrium returns the position in Å of the minimum of p: the root of V′
// where V′ changes sign from negative to positive. It brackets the root
// (around Domain().EquilibriumGuess when the form gives one, else by a logarithmic scan of
// the domain), then refines it by Newton steps on V′ with V″, falling back to
// bisection whenever a step leaves the bracket or fails to halve it. The
// result is accurate to a few ulp.
func Equilibrium(p Potential) (float64, error) {
	lo, hi, err := bracketMinimum(p)
	if err != nil {
		return 0, err
	}
	re, err := solve(p, 1, lo, hi)
	if err != nil {
		return 0, err
	}
	var c [3]float64
	if err := one(p, 2, re, c[:]); err != nil {
		return 0, fmt.Errorf("at the minimum r = %g Å: %w", re, err)
	}
	if !(c[2] > 0) {
		return 0, fmt.Errorf("%w: V′(%g Å) = 0 but V″ = %g is not positive", ErrNoMinimum, re, 2*c[2])
	}
	return re, nil
}

// scanPoints is the number of points of the logarithmic scan used when a
// potential gives no guess.
const scanPoints = 512

// scanRange is the span of separations in Å scanned when a domain is
// unbounded: [scanMin, scanMax].
const (
	scanMin = 0.01
	scanMax = 1000.0
)

// bracketMinimum returns lo < hi with V′(lo) < 0 < V′(hi).
func bracketMinimum(p Potential) (lo, hi float64, err error) {
	d := p.Domain()
	if g := d.EquilibriumGuess; g != 0 {
		if lo, hi, ok := bracketAround(p, g); ok {
			return lo, hi, nil
		}
	}
	a := math.Max(d.Min, scanMin)
	if d.Min > 0 {
		a = d.Min * (1 + 1e-9)
	}
	b := math.Min(d.Max, scanMax)
	if !(a < b) {
		return 0, 0, fmt.Errorf("%w: empty domain (%g Å, %g Å)", ErrNoMinimum, d.Min, d.Max)
	}
	rs := make([]float64, scanPoints)
	ratio := math.Pow(b/a, 1/float64(scanPoints-1))
	x := a
	for i := range rs {
		rs[i] = x
		x *= ratio
	}
	rs[len(rs)-1] = math.Nextafter(b, 0)
	f := make([]float64, scanPoints)
	if _, err := DerivativeBatch(p, 1, rs, f, nil); err != nil {
		return 0, 0, fmt.Errorf("scanning for the minimum: %w", err)
	}
	// A sign change needs V′ > 0 on the right: a V′ that is exactly zero
	// in a tail where it underflows is not a minimum.
	for i := 1; i < len(rs); i++ {
		if f[i-1] < 0 && f[i] > 0 {
			return rs[i-1], rs[i], nil
		}
	}
	return 0, 0, fmt.Errorf("%w: V′ does not change sign from − to + between %g Å and %g Å", ErrNoMinimum, a, b)
}

// bracketAround expands a bracket geometrically around the guess g.
func bracketAround(p Potential, g float64) (lo, hi float64, ok bool) {
	d := p.Domain()
	if !d.Contains(g) {
		return 0, 0, false
	}
	var c [2]float64
	fp := func(r float64) (float64, bool) {
		if err := one(p, 1, r, c[:]); err != nil {
			return 0, false
		}
		return c[1], true
	}
	lo, hi = g, g
	step := 1e-6 * g
	flo, ok1 := fp(lo)
	fhi := flo
	if !ok1 {
		return 0, 0, false
	}
	for i := 0; i < 64 && !(flo < 0 && fhi > 0); i++ {
		if flo >= 0 {
			lo = math.Max(lo-step, 0.5*(lo+d.Min))
			if flo, ok1 = fp(lo); !ok1 {
				return 0, 0, false
			}
		}
		if fhi <= 0 {
			hi = math.Min(hi+step, 0.5*(hi+d.Max))
			if fhi, ok1 = fp(hi); !ok1 {
				return 0, 0, false
			}
		}
		step *= 4
	}
	return lo, hi, flo < 0 && fhi > 0
}

// solve finds the root in [lo, hi] of V⁽ⁿ⁾, which has opposite signs at the
// two ends, by Newton steps with V⁽ⁿ⁺¹⁾ safeguarded by bisection. When
// V⁽ⁿ⁺¹⁾ is beyond p.MaxOrder(), every step is a bisection. It works on
// c_n ∝ V⁽ⁿ⁾, whose Newton step is c_n/((n+1)c_{n+1}).
func solve(p Potential, n int, lo, hi float64) (float64, error) {
	top := min(n+1, p.MaxOrder())
	c := make([]float64, top+1)
	x, err := Root(func(r float64) (float64, float64, error) {
		if err := one(p, top, r, c); err != nil {
			return 0, 0, err
		}
		if top == n {
			return c[n], math.NaN(), nil // Root bisects on a NaN step
		}
		return c[n], float64(n+1) * c[n+1], nil
	}, lo, hi)
	if err != nil {
		return 0, fmt.Errorf("root of V⁽%d⁾: %w", n, err)
	}
	return x, nil
}

// inflection finds the first r > re where V″ changes sign from + to −, by a
// geometric scan outward from re (one batched call) and solve on V″.
func inflection(p Potential, re float64) (r, force float64, err error) {
	// re·(1 + 1e-4·1.5^k), k < 48, reaches about 2e4·re; the sign change
	// is then located to a few ulp by solve.
	const points = 48
	d := p.Domain()
	var rbuf, fbuf [points]float64
	rs := rbuf[:0]
	step := 1e-4 * re
	for k := 0; k < points; k++ {
		x := re + step
		if x >= d.Max {
			break
		}
		rs = append(rs, x)
		step *= 1.5
	}
	f := fbuf[:len(rs)]
	if _, err := DerivativeBatch(p, 2, rs, f, nil); err != nil {
		return 0, 0, fmt.Errorf("scanning for the inflection point: %w", err)
	}
	prev := re
	for i, v := range f {
		if v < 0 {
			r, err := solve(p, 2, prev, rs[i])
			if err != nil {
				if errors.Is(err, ErrNoConvergence) {
					return 0, 0, fmt.Errorf("inflection point: %w", err)
				}
				return 0, 0, err
			}
			force, err := Derivative(p, 1, r)
			return r, force, err
		}
		prev = rs[i]
	}
	return math.NaN(), math.NaN(), nil
}

// reError estimates the uncertainty of the minimum re from the rounding of
// V′ (see Well.ReError), with one batched call.
func reError(p Potential, re, k float64) (float64, error) {
	const n = 16
	var rs, xs, v [n]float64
	var c [2 * n]float64
	step := 128 * ulp(re)
	for j := range n {
		x := float64(j-n/2) * step
		if j >= n/2 {
			x += step
		}
		rs[j] = re + x
		xs[j] = rs[j] - re
	}
	if err := p.Taylor(1, rs[:], c[:]); err != nil {
		return 0, fmt.Errorf("rounding of V′ at the minimum: %w", err)
	}
	for j := range n {
		v[j] = c[2*j+1] // V′ = c₁
	}
	// Least-squares line through (x, V′).
	var sx, sy, sxx, sxy float64
	for j := range n {
		sx += xs[j]
		sy += v[j]
		sxx += xs[j] * xs[j]
		sxy += xs[j] * v[j]
	}
	den := n*sxx - sx*sx
	b := (n*sxy - sx*sy) / den
	a := (sy - b*sx) / n
	dev := 0.0
	for j := range n {
		dev = math.Max(dev, math.Abs(v[j]-a-b*xs[j]))
	}
	return dev/k + ulp(re), nil
}
