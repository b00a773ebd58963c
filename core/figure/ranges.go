package figure

import (
	"errors"
	"fmt"
	"math"

	"github.com/pairwell/pairwell/core"
)

// Default ranges. A potential is shown from where V − V(re) reaches
// compressionRise·D on the compression side (or a little below an inner
// barrier, whichever comes first) to where it reaches stretchRise·D on the
// stretch side, clamped to [stretchMin·re, stretchMax·re]; D is the well
// depth. The energy axis runs from V(re) − belowMin·D to V(re) + aboveMin·D,
// narrowed to the curves actually shown.
const (
	compressionRise = 2.0
	stretchRise     = 0.95
	stretchMin      = 1.5
	stretchMax      = 4.0
	belowMin        = 0.2
	aboveMin        = 2.5
	// barrierMargin is how far below an inner barrier the default range
	// starts, as a fraction of re − r_barrier: enough to show the hatched
	// region where the form is not defined.
	barrierMargin = 0.15
	// barrierWidth is the least width of that region, as a fraction of
	// the range from the barrier to the end of the default range.
	barrierWidth = 0.04
	// unboundedMin and unboundedMax are the default range of a well
	// without a depth (harmonic), in units of re; the energy scale D is
	// then half of V − V(re) at unboundedMin·re.
	unboundedMin = 0.5
	unboundedMax = 2.0
)

// gridPoints is the number of points of a curve against r.
const gridPoints = 601

// view is the default window on the well of one potential.
type view struct {
	re, vre    float64 // equilibrium distance (Å) and V(re) (eV)
	limit      float64 // V(∞) in eV; NaN when unbounded
	depth      float64 // D in eV: the depth, or a scale when unbounded
	bounded    bool
	rmin, rmax float64 // default range of r, Å
	dom        core.Domain
}

// newView returns the default window on the well w of p.
func newView(p core.Potential, w core.Well) (view, error) {
	d := p.Domain()
	v := view{re: w.Re, vre: w.Energy, limit: math.NaN(), bounded: w.Bounded(), dom: d}
	if v.bounded {
		v.limit, v.depth = d.Limit, w.Depth
		if !(v.depth > 0) {
			return view{}, fmt.Errorf("figure: %w: well depth %g eV", core.ErrParam, v.depth)
		}
	} else {
		v.rmin = math.Max(unboundedMin*w.Re, d.Min+1e-3*(w.Re-d.Min))
		v.rmax = math.Min(unboundedMax*w.Re, 0.5*(w.Re+d.Max))
		e, err := core.Value(p, v.rmin)
		if err != nil {
			return view{}, fmt.Errorf("figure: %w", err)
		}
		v.depth = (e - w.Energy) / compressionRise
		if !(v.depth > 0) {
			return view{}, fmt.Errorf("figure: %w: V does not rise from the minimum at r = %g Å", core.ErrParam, v.rmin)
		}
		return v, nil
	}
	lo, err := rise(p, w, compressionRise*v.depth, -1)
	if err != nil {
		return view{}, err
	}
	if math.IsNaN(lo) { // V stays below 2D down to the edge of the domain
		lo = d.Min
		if d.Barrier {
			lo = d.Min - barrierMargin*(w.Re-d.Min)
		}
		lo = math.Max(lo, 0.05*w.Re)
	}
	hi, err := rise(p, w, stretchRise*v.depth, +1)
	if err != nil {
		return view{}, err
	}
	if math.IsNaN(hi) {
		hi = stretchMax * w.Re
	}
	v.rmax = math.Min(math.Max(hi, stretchMin*w.Re), stretchMax*w.Re)
	if !(v.rmax < d.Max) {
		v.rmax = 0.5 * (w.Re + d.Max)
	}
	if d.Barrier && lo < d.Min {
		// Make the excluded region wide enough to see.
		lo = math.Max(math.Min(lo, d.Min-barrierWidth*(v.rmax-d.Min)), 0.05*w.Re)
	}
	v.rmin = lo
	return v, nil
}

// yWindow returns the default energy axis limits of the view.
func (v view) yWindow() (lo, hi float64) {
	return v.vre - belowMin*v.depth, v.vre + aboveMin*v.depth
}

// rise returns the separation on the side dir (−1 compression, +1
// stretch) of re where V(r) − V(re) first reaches e, or NaN when it does
// not before the edge of the domain (compression) or stretchMax·re
// (stretch). The side is scanned on a geometric grid of displacements in
// one Batch call and the crossing refined by core.Root.
func rise(p core.Potential, w core.Well, e float64, dir float64) (float64, error) {
	d := p.Domain()
	re := w.Re
	end := re - d.Min
	if dir > 0 {
		end = math.Min(d.Max-re, (stretchMax-1)*re)
	}
	var rs []float64
	for s := 1e-3 * re; s < end; s *= 1.03 {
		rs = append(rs, re+dir*s)
	}
	last := 0.0
	if len(rs) > 0 {
		last = math.Abs(rs[len(rs)-1] - re)
	}
	for k := 1; k <= 30; k++ { // approach the edge
		r := re + dir*(end-(end-last)*math.Ldexp(1, -k))
		if !d.Contains(r) {
			break
		}
		rs = append(rs, r)
	}
	if len(rs) == 0 {
		return math.NaN(), nil
	}
	vs := make([]float64, len(rs))
	if err := batchInDomain(p, 0, rs, vs); err != nil {
		return 0, fmt.Errorf("figure: scanning the %s side: %w", sideName(dir), err)
	}
	prev := re
	for i, v := range vs {
		if math.IsNaN(v) {
			break
		}
		if v-w.Energy >= e {
			var c [2]float64 // V and V′ (c₀ and c₁)
			rr := make([]float64, 1)
			r, err := core.Root(func(r float64) (float64, float64, error) {
				rr[0] = r
				if err := p.Taylor(1, rr, c[:]); err != nil {
					return 0, 0, err
				}
				return c[0] - w.Energy - e, c[1], nil
			}, prev, rs[i])
			if err != nil {
				return 0, fmt.Errorf("figure: V − V(re) = %g eV on the %s side: %w", e, sideName(dir), err)
			}
			return r, nil
		}
		prev = rs[i]
	}
	return math.NaN(), nil
}

func sideName(dir float64) string {
	if dir < 0 {
		return "compression"
	}
	return "stretch"
}

// batchInDomain evaluates V⁽ⁿ⁾ at the points of rs inside the domain of p
// in one Taylor call and stores NaN at the others.
func batchInDomain(p core.Potential, n int, rs, dst []float64) error {
	d := p.Domain()
	var (
		in []float64
		at []int
	)
	for i, r := range rs {
		dst[i] = math.NaN()
		if d.Contains(r) {
			in = append(in, r)
			at = append(at, i)
		}
	}
	if len(in) == 0 {
		return nil
	}
	vs := make([]float64, len(in))
	if _, err := core.DerivativeBatch(p, n, in, vs, nil); err != nil {
		var pe *core.PointError
		if errors.As(err, &pe) {
			return fmt.Errorf("V at r = %g Å: %w", pe.R, err)
		}
		return err
	}
	for j, v := range vs {
		dst[at[j]] = v
	}
	return nil
}

// linspace returns n ≥ 2 evenly spaced values from a to b.
func linspace(a, b float64, n int) []float64 {
	out := make([]float64, n)
	for i := range out {
		out[i] = a + (b-a)*float64(i)/float64(n-1)
	}
	out[n-1] = b
	return out
}

// extent returns the smallest and largest finite values of the ys, or
// NaN, NaN when there are none.
func extent(ys ...[]float64) (lo, hi float64) {
	lo, hi = math.Inf(1), math.Inf(-1)
	for _, y := range ys {
		for _, v := range y {
			if math.IsNaN(v) || math.IsInf(v, 0) {
				continue
			}
			lo, hi = math.Min(lo, v), math.Max(hi, v)
		}
	}
	if lo > hi {
		return math.NaN(), math.NaN()
	}
	return lo, hi
}

// fitWindow narrows the default window [lo, hi] to the extent [dlo, dhi]
// of the data shown, with a margin of 8 % of the data's span on each side.
func fitWindow(lo, hi, dlo, dhi float64) (float64, float64) {
	if math.IsNaN(dlo) || !(dhi > dlo) {
		return lo, hi
	}
	m := 0.08 * (dhi - dlo)
	return math.Max(lo, dlo-m), math.Min(hi, dhi+m)
}

// checkRange validates a separation range [rmin, rmax] given by the user
// against the domain d: it must be finite, rmin > 0, rmin < rmax, and
// overlap the domain. The error wraps core.ErrParam or core.ErrDomain.
func checkRange(rmin, rmax float64, d core.Domain) error {
	switch {
	case anyNaN(rmin, rmax):
		return fmt.Errorf("figure: %w: range %g to %g Å is not finite", core.ErrParam, rmin, rmax)
	case !(rmin > 0):
		return fmt.Errorf("figure: %w: range starts at r = %g Å, must be > 0", core.ErrParam, rmin)
	case !(rmin < rmax):
		return fmt.Errorf("figure: %w: empty range %g to %g Å: the start must be below the end", core.ErrParam, rmin, rmax)
	case !(rmax > d.Min) || !(rmin < d.Max):
		return fmt.Errorf("figure: %w: range %g to %g Å lies outside the domain of the form (%g Å, %g Å)", core.ErrDomain, rmin, rmax, d.Min, d.Max)
	}
	return nil
}
