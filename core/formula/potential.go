package formula

// This file is the formula form's side of the evaluation contract
// (core.Potential): all evaluation of a compiled formula for the analysis
// goes through potential.coeffs.

import (
	"fmt"
	"math"
	"sync"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/jet"
)

// blockPoints is the number of separations evaluated together: the jet
// registers of a block stay in the first-level cache.
const blockPoints = 256

// potential is a formula with one parameter set. It is immutable apart from
// the pool of workspaces, and safe for concurrent use.
type potential struct {
	form *Form
	scal []float64
	dom  core.Domain
	pool sync.Pool // *Workspace
}

func newPotential(f *Form, scal []float64, dom core.Domain) *potential {
	return &potential{form: f, scal: scal, dom: dom}
}

// coeffs calls emit with the normalized Taylor coefficients V⁽ᵏ⁾(r)/k!,
// k = 0…order, of every block of rs: emit(i0, l, c) gets the block starting
// at rs[i0], laid out as l (coefficient k of point i at c[k·l.Points+i]).
// It checks the domain and the finiteness of the coefficients from order
// from to order (those the caller returns) and reports the first failure
// as a *core.PointError wrapping core.ErrDomain.
func (p *potential) coeffs(from, order int, rs []float64, emit func(i0 int, l jet.Layout, c []float64)) error {
	for i, r := range rs {
		if !p.dom.Contains(r) {
			return &core.PointError{Index: i, R: r, Err: core.CheckR(p.dom, r)}
		}
	}
	prog := p.form.f.prog
	w, _ := p.pool.Get().(*Workspace)
	if w == nil {
		w = &Workspace{}
	}
	defer p.pool.Put(w)
	for i0 := 0; i0 < len(rs); i0 += blockPoints {
		blk := rs[i0:min(i0+blockPoints, len(rs))]
		l := jet.Layout{Order: order, Points: len(blk)}
		c := prog.Eval(w, l, p.scal, blk)
		for k := from; k <= order; k++ {
			for i, v := range c[k*l.Points : (k+1)*l.Points] {
				if v-v != 0 { // NaN or ±Inf
					return &core.PointError{Index: i0 + i, R: blk[i], Err: fmt.Errorf("r = %.10g Å: %w: the formula gives %g for its coefficient of order %d there, inside the declared domain %s (declare r_min where the formula is not defined)", blk[i], core.ErrDomain, v, k, p.form.info.Domain)}
				}
			}
		}
		emit(i0, l, c)
	}
	return nil
}

// Taylor stores c_k(r[i]) = V⁽ᵏ⁾(r[i])/k! at dst[i·(n+1)+k], from the
// jets of the compiled formula (coefficient-major per block, transposed
// here into the contract's row-major layout).
func (p *potential) Taylor(n int, r, dst []float64) error {
	if err := core.CheckTaylor(n, MaxOrder, len(r), len(dst)); err != nil {
		return err
	}
	w := n + 1
	return p.coeffs(0, n, r, func(i0 int, l jet.Layout, c []float64) {
		for k := 0; k <= n; k++ {
			for i, v := range c[k*l.Points : (k+1)*l.Points] {
				dst[(i0+i)*w+k] = v
			}
		}
	})
}

// Domain reports where the potential is usable.
func (p *potential) Domain() core.Domain { return p.dom }

// MaxOrder is the highest Taylor order.
func (p *potential) MaxOrder() int { return MaxOrder }

// limitRadii are the separations in Å at which limit looks at V.
var limitRadii = [...]float64{1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12}

// limit finds lim V(r) as r → ∞ numerically from V at 10², 10³, …, 10¹² Å
// (one batched call): converged when the last two values differ by at most
// 10⁻¹⁰·max(1, |V|) eV and the differences do not grow. ok is true with
// lim = +Inf when V grows without bound (the last differences grow and are
// positive), false when V still changes but ever more slowly (a tail too
// slow to decide). V tending to −∞ or not being finite far out is an
// error.
func (p *potential) limit() (lim float64, ok bool, err error) {
	var rs []float64
	for _, r := range limitRadii {
		if p.dom.Contains(r) {
			rs = append(rs, r)
		}
	}
	if len(rs) < 3 {
		return 0, false, nil
	}
	v := make([]float64, len(rs))
	err = p.coeffs(0, 0, rs, func(i0 int, l jet.Layout, c []float64) { copy(v[i0:], c[:l.Points]) })
	n := len(v)
	if err != nil {
		// A formula that overflows far out grows without bound if it was
		// growing before; anything else is a bad form.
		if pe, isPE := err.(*core.PointError); isPE && pe.Index >= 2 {
			i := pe.Index
			return p.growth(v[:i], rs[pe.Index])
		}
		return 0, false, fmt.Errorf("%w: V is not finite far out (%v); declare limit = \"none\" for a form that grows without bound", core.ErrParam, err)
	}
	d1, d0 := math.Abs(v[n-1]-v[n-2]), math.Abs(v[n-2]-v[n-3])
	if d1 <= 1e-10*math.Max(1, math.Abs(v[n-1])) && d1 <= d0 {
		return v[n-1], true, nil
	}
	return p.growth(v, rs[n-1])
}

// growth classifies values that have not converged.
func (p *potential) growth(v []float64, far float64) (float64, bool, error) {
	n := len(v)
	if n < 3 {
		return 0, false, fmt.Errorf("%w: V is not finite at r = %g Å", core.ErrParam, far)
	}
	d1, d0 := v[n-1]-v[n-2], v[n-2]-v[n-3]
	switch {
	case d1 > 0 && d0 > 0 && d1 >= d0:
		return math.Inf(1), true, nil
	case d1 < 0 && d0 < 0 && d1 <= d0:
		return 0, false, fmt.Errorf("%w: V decreases without bound as r → ∞ (V(%g Å) = %g eV): no bound well", core.ErrNoMinimum, far, v[n-1])
	}
	return 0, false, nil
}

// Separations in Å of the scan for an inner maximum (as the well
// analysis scans for the minimum): barrierScan points, logarithmic, from
// the lower end of the domain (at least barrierScanMin) to barrierScanMax.
const (
	barrierScan    = 512
	barrierScanMin = 0.01
	barrierScanMax = 1000.0
)

// innerBarrier looks for a maximum of V below the first minimum — a form
// that turns over at short range and collapses below it, as the exp-6
// forms do — from the sign changes of V′ on a logarithmic scan (one
// batched call), and locates it by bisection on V′ to a few ulp. ok is
// false when there is none, or when the scan cannot be evaluated (the
// well analysis then reports the failure).
func (p *potential) innerBarrier() (rb, vb float64, ok bool) {
	a := math.Max(p.dom.Min*(1+1e-9), barrierScanMin)
	b := math.Min(p.dom.Max, barrierScanMax)
	if !(a < b) {
		return 0, 0, false
	}
	rs := make([]float64, barrierScan)
	ratio := math.Pow(b/a, 1/float64(barrierScan-1))
	x := a
	for i := range rs {
		rs[i] = x
		x *= ratio
	}
	rs[len(rs)-1] = math.Nextafter(b, 0)
	d1 := make([]float64, len(rs))
	if err := p.coeffs(1, 1, rs, func(i0 int, l jet.Layout, c []float64) { copy(d1[i0:], c[l.Points:2*l.Points]) }); err != nil {
		return 0, 0, false
	}
	top := -1
	for i := 1; i < len(rs); i++ {
		if d1[i-1] > 0 && d1[i] < 0 {
			top = i - 1
		}
		if d1[i-1] < 0 && d1[i] > 0 {
			break // the minimum: only a maximum below it counts
		}
	}
	if top < 0 {
		return 0, 0, false
	}
	lo, hi := rs[top], rs[top+1] // V′(lo) > 0 > V′(hi)
	var c [2]float64
	var one [1]float64
	slope := func(r float64) (float64, bool) {
		one[0] = r
		err := p.coeffs(0, 1, one[:], func(_ int, _ jet.Layout, v []float64) { c[0], c[1] = v[0], v[1] })
		return c[1], err == nil
	}
	for range 200 {
		mid := lo + (hi-lo)/2
		if mid <= lo || mid >= hi {
			break
		}
		s, good := slope(mid)
		if !good {
			return 0, 0, false
		}
		if s > 0 {
			lo = mid
		} else {
			hi = mid
		}
	}
	if _, good := slope(lo); !good {
		return 0, 0, false
	}
	return lo, c[0], true
}
