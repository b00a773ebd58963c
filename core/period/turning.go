package period

import (
	"errors"
	"fmt"
	"math"

	"github.com/pairwell/pairwell/core"
)

// maxExpand bounds the outward scan of TurningPoints: 200 points, the
// spacing doubling beyond 2¹⁰ harmonic amplitudes, span far more than any
// float64 separation.
const maxExpand = 200

// Scan grid of the turning points: displacements s₀·2^(k/4), from s₀/2 to
// 2¹⁰·s₀ (k = −4, …, 40), then doubling; the compression side starts at
// s₀/2, the stretch side at s₀ (anharmonic wells are usually softer on the
// stretch side, stiffer on the compression side). The first call scans
// gridCompression and gridStretch points (gridFew on each side when
// solving for few energies: the grid, hence the result, is the same), each
// later call gridLater.
const (
	gridFine        = 45 // points of ratio 2^(1/4)
	gridStretchK0   = 4  // index of the first stretch point, s₀
	gridCompression = 5  // s₀/2 to s₀
	gridStretch     = 5  // s₀ to 1.7·s₀
	gridFew         = 6
	gridLater       = 16
	fewEnergies     = 4
)

// noiseFactor times ε·(|V(re)| + E), about an ulp of V, is the rounding
// error assumed for V(r) − V(re) − E near a turning point.
const noiseFactor = 1

// gridDisp returns the k-th displacement of the scan in units of s₀.
func gridDisp(k int) float64 {
	if k >= gridFine {
		return math.Ldexp(1, 10+k-gridFine+1)
	}
	m := k - 4
	q := 1.0 // 2^((m mod 4)/4)
	switch m & 3 {
	case 1:
		q = 1.189207115002721
	case 2:
		q = 1.414213562373095
	case 3:
		q = 1.6817928305074292
	}
	return math.Ldexp(q, m>>2)
}

// TurningPoints returns the classical turning points r₋ < re < r₊ (Å) of
// the oscillation of energy E (eV, measured from the minimum) in the well w
// of p: the roots of V(r) − V(re) − E on either side of re. For E = 0 both
// are re.
//
// For small E, where the Taylor series of V at re (core.Expansion, from
// w.Series) has a smaller error bound at both turning points than the
// direct difference V(r) − V(re), the turning points are the roots of the
// series instead, found by Newton iterations on it without calling p; the
// direct roots would carry a relative error ≈ ε·|V(re)|/(2E) in r± − re.
//
// Each root is bracketed by a scan outward from re on the grid of
// displacements s₀·2^(k/4) (s₀ = √(E/c₂) the harmonic amplitude), from s₀/2
// on the compression side and from s₀ on the stretch side, the spacing
// doubling beyond 2¹⁰·s₀; then refined by core.RootBatch (Newton
// safeguarded by bisection, from the linear interpolation between the
// bracketing grid points) to a few ulp, sampling instead of stepping where
// V(r) − V(re) − E is within its rounding, ε·(|V(re)| + E). Both sides are
// solved together, in about a dozen p.Taylor calls: one of order 1 (V and
// V′) per scan round and per iteration. Exact and Sweep solve all their
// energies the same way at once, with the same result for each. The
// oscillation is assumed to be in a single well: V increases
// monotonically away from re up to each turning point (V′ is checked at
// every scanned point).
//
// The returned error wraps core.ErrParam for E < 0 or NaN, and
// core.ErrDomain when there is no bound oscillation at E: E at or above the
// well depth (the pair dissociates); E at or above an inner barrier
// (Domain.Barrier, e.g. Buckingham: the pair collapses through the spurious
// inner maximum); V turning over before reaching E on either side (the pair
// escapes over that maximum); or a turning point outside the domain.
func TurningPoints(p core.Potential, w core.Well, E float64) (inner, outer float64, err error) {
	ec := energyCheck{p: p, w: w}
	if err := ec.check(E); err != nil {
		return 0, 0, err
	}
	if E == 0 {
		return w.Re, w.Re, nil
	}
	var (
		in, out, xin, xon [1]float64
		ser               [1]bool
		errs              [1]error
		sc                scratch
		es                = [1]float64{E}
	)
	seriesTurningPoints(p, w, core.NewExpansion(w), es[:], in[:], out[:], xin[:], xon[:], ser[:], errs[:], &sc)
	return in[0], out[0], errs[0]
}

// energyCheck validates energies against the well and the domain. The
// barrier is looked up once, on first need.
type energyCheck struct {
	p          core.Potential
	w          core.Well
	barrierSet bool
	rb, hb     float64 // the inner barrier and its height above the minimum
	barrierErr error
}

// top returns the lowest energy above the minimum without bound motion:
// the depth, or the inner barrier when lower; +Inf for an unbounded well
// without a barrier (or when the barrier cannot be found).
func (c *energyCheck) top() float64 {
	t := c.w.Depth
	if c.p.Domain().Barrier {
		c.barrier()
		if c.barrierErr == nil {
			t = math.Min(t, c.hb)
		}
	}
	return t
}

// barrier looks up the inner barrier once.
func (c *energyCheck) barrier() {
	if c.barrierSet {
		return
	}
	c.barrierSet = true
	d := c.p.Domain()
	c.rb, c.hb = d.Min, d.BarrierEnergy-c.w.Energy
}

// check validates E.
func (c *energyCheck) check(E float64) error {
	w := c.w
	if len(w.Taylor) < 3 || !(w.Taylor[2] > 0) {
		return fmt.Errorf("period: %w: the well needs Taylor coefficients up to c₂ > 0 (see core.AnalyzeWell)", core.ErrParam)
	}
	if !(E >= 0) || math.IsInf(E, 1) {
		return fmt.Errorf("period: %w: oscillation energy E = %g eV, must be finite and ≥ 0", core.ErrParam, E)
	}
	if w.Bounded() && E >= w.Depth {
		return unbound("E = %.6g eV is at or above the well depth %.6g eV: the pair dissociates, there is no oscillation", E, w.Depth)
	}
	d := c.p.Domain()
	if !d.Barrier {
		return nil
	}
	c.barrier()
	if c.barrierErr != nil {
		return c.barrierErr
	}
	if E >= c.hb {
		return unbound("E = %.6g eV is at or above the inner barrier (%.6g eV above the minimum, at r = %.6g Å): "+
			"the pair collapses through the spurious inner maximum of the form, there is no oscillation", E, c.hb, c.rb)
	}
	return nil
}

// Stages of a side in turningPoints.
const (
	scanning = iota
	bracketed
	turnedOver
	failed
)

// side is the search for one turning point: energy E, direction dir (+1
// stretch, −1 compression).
type side struct {
	E, dir, s0 float64
	stage      int
	err        error
	// The last scanned point below E: r, U − E there and V′ (NaN at re).
	lo, flo, dlo float64
	// The first point at or above E (bracketed), or where V′ turned
	// (turnedOver): r, U − E and V′.
	hi, fhi, dhi float64
	// Scan state: points generated, the last one, halvings towards the
	// edge of the domain, and why the scan ends when no point is left.
	k, halvings int
	last        float64
	end         error
	root        float64
}

// k0 is the index of the first scan point of s.
func (s *side) k0() int {
	if s.dir > 0 {
		return gridStretchK0
	}
	return 0
}

func (s *side) name() string {
	if s.dir > 0 {
		return "stretch"
	}
	return "compression"
}

// turningPoints computes the turning points of every energy in Es, all
// checked and > 0, into inner, outer and errs, in a few p.Taylor calls for
// all of them. The result of each energy depends on that energy alone.
func turningPoints(p core.Potential, w core.Well, Es, inner, outer []float64, errs []error, sc *scratch) {
	sc.sides = grows(sc.sides, 2*len(Es))
	sides := sc.sides
	for i, E := range Es {
		s0 := math.Sqrt(E / w.Taylor[2])
		sides[2*i] = side{E: E, dir: +1, s0: s0, lo: w.Re, flo: -E, dlo: math.NaN(), last: w.Re, k: gridStretchK0}
		sides[2*i+1] = side{E: E, dir: -1, s0: s0, lo: w.Re, flo: -E, dlo: math.NaN(), last: w.Re}
	}
	scan(p, w, sides, sc)
	maxima(p, w, sides)
	refine(p, w, sides, sc)
	for i := range Es {
		out, in := &sides[2*i], &sides[2*i+1]
		outer[i], inner[i], errs[i] = out.root, in.root, nil
		switch {
		case out.stage == failed:
			errs[i] = out.err
		case in.stage == failed:
			errs[i] = in.err
		}
	}
}

// fail ends the search of s with err.
func (s *side) fail(err error) {
	s.stage, s.err = failed, err
}

// pointErr classifies an error of p at a scanned point of s.
func (s *side) pointErr(err error) error {
	if errors.Is(err, core.ErrDomain) {
		return unbound("no %s turning point at E = %.6g eV: %v", s.name(), s.E, err)
	}
	return fmt.Errorf("period: %s turning point: %w", s.name(), err)
}

// next appends the scan points of the next call of s to r, at most m, and
// returns r. It sets s.end when the scan cannot go further.
func (s *side) next(d core.Domain, re float64, r []float64, m int) []float64 {
	edge := d.Max
	if s.dir < 0 {
		edge = d.Min
	}
	for ; m > 0 && s.end == nil; m-- {
		if s.k-s.k0() >= maxExpand {
			s.end = fmt.Errorf("period: %w: no %s turning point at E = %.6g eV within %d expansions", core.ErrNoConvergence, s.name(), s.E, maxExpand)
			break
		}
		x := re + s.dir*s.s0*gridDisp(s.k)
		if s.halvings > 0 || !d.Contains(x) {
			// Approach the edge geometrically, giving up when V
			// stays below E to within 2⁻⁶⁰ of the distance.
			x = 0.5 * (s.last + edge)
			s.halvings++
			if x == s.last || !d.Contains(x) || s.halvings > 60 {
				s.end = unbound("no %s turning point at E = %.6g eV: V − V(re) stays below E up to the edge of the domain (%g Å, %g Å)",
					s.name(), s.E, d.Min, d.Max)
				break
			}
		}
		s.k++
		s.last = x
		r = append(r, x)
	}
	return r
}

// scan brackets the turning point of every side: the scan points of all
// sides go into one Taylor call of order 1 (V and V′) per round.
func scan(p core.Potential, w core.Well, sides []side, sc *scratch) {
	d := p.Domain()
	r, owner, v, dv := sc.r[:0], sc.owner[:0], sc.v, sc.dv
	defer func() { sc.r, sc.owner, sc.v, sc.dv = r, owner, v, dv }()
	for round := 0; ; round++ {
		chunk := func(s *side) int {
			switch {
			case round > 0:
				return gridLater
			case len(sides) <= 2*fewEnergies:
				return gridFew
			case s.dir > 0:
				return gridStretch
			}
			return gridCompression
		}
		total := 0
		for q := range sides {
			if sides[q].stage == scanning {
				total += chunk(&sides[q])
			}
		}
		if cap(r) < total {
			r, owner = make([]float64, 0, total), make([]int, 0, total)
		}
		r, owner = r[:0], owner[:0]
		for q := range sides {
			s := &sides[q]
			if s.stage != scanning {
				continue
			}
			m := chunk(s)
			n0 := len(r)
			r = s.next(d, w.Re, r, m)
			for range len(r) - n0 {
				owner = append(owner, q)
			}
			if len(r) == n0 {
				s.fail(s.end)
			}
		}
		if len(r) == 0 {
			return
		}
		v, dv = grow(v, len(r)), grow(dv, len(r))
		for {
			var err error
			sc.c, err = core.DerivativePair(p, 0, r, v, dv, sc.c)
			if err == nil {
				break
			}
			var pe *core.PointError
			if !errors.As(err, &pe) || pe.Index < 0 || pe.Index >= len(r) {
				for _, q := range owner {
					if sides[q].stage == scanning {
						sides[q].fail(sides[q].pointErr(err))
					}
				}
				return
			}
			// The scan of that side stops at the failing point.
			q := owner[pe.Index]
			sides[q].end = sides[q].pointErr(pe.Err)
			k := 0
			for j := range r {
				if owner[j] == q && j >= pe.Index {
					continue
				}
				r[k], owner[k] = r[j], owner[j]
				k++
			}
			r, owner, v, dv = r[:k], owner[:k], v[:k], dv[:k]
			if k == 0 {
				break
			}
		}
		for j := 0; j < len(r); j++ {
			s := &sides[owner[j]]
			if s.stage != scanning {
				continue
			}
			u := v[j] - w.Energy - s.E
			switch {
			case u >= 0:
				s.stage, s.hi, s.fhi, s.dhi = bracketed, r[j], u, dv[j]
			case dv[j]*s.dir <= 0:
				// V has turned over between lo and r: the turning
				// point lies before the maximum if that is above E.
				s.stage, s.hi, s.fhi, s.dhi = turnedOver, r[j], u, dv[j]
			default:
				s.lo, s.flo, s.dlo = r[j], u, dv[j]
			}
		}
	}
}

// maxima locates, for every side where V turned over, the maximum of V
// between lo and hi (a root of V′, by core.RootBatch on V′ and V″), and
// brackets the turning point below it when the maximum is above E.
func maxima(p core.Potential, w core.Well, sides []side) {
	var qs []int
	for q := range sides {
		if sides[q].stage == turnedOver {
			qs = append(qs, q)
		}
	}
	if len(qs) == 0 {
		return
	}
	if p.MaxOrder() < 2 {
		for _, q := range qs {
			s := &sides[q]
			s.fail(fmt.Errorf("period: %s turning point: %w: locating a maximum of V needs V″ (this form has derivatives up to %d)",
				s.name(), core.ErrOrder, p.MaxOrder()))
		}
		return
	}
	// V′ at re, where the scan did not evaluate it.
	var atRe []float64
	for _, q := range qs {
		if math.IsNaN(sides[q].dlo) {
			atRe = append(atRe, sides[q].lo)
		}
	}
	if len(atRe) > 0 {
		dre := make([]float64, len(atRe))
		if _, err := core.DerivativeBatch(p, 1, atRe, dre, nil); err != nil {
			for _, q := range qs {
				sides[q].fail(fmt.Errorf("period: %s turning point: %w", sides[q].name(), err))
			}
			return
		}
		k := 0
		for _, q := range qs {
			if math.IsNaN(sides[q].dlo) {
				sides[q].dlo = dre[k]
				k++
			}
		}
	}
	probs := make([]core.RootProblem, len(qs))
	for k, q := range qs {
		s := &sides[q]
		probs[k] = core.RootProblem{Lo: s.lo, Hi: s.hi, FLo: s.dlo, FHi: s.dhi, Start: math.NaN()}
	}
	rm := make([]float64, len(qs))
	errs := make([]error, len(qs))
	var buf []float64
	core.RootBatch(func(idx []int, x, fx, dfx []float64) (err error) {
		buf, err = core.DerivativePair(p, 1, x, fx, dfx, buf)
		return err
	}, probs, rm, errs)
	var found []float64
	for k := range qs {
		if errs[k] == nil {
			found = append(found, rm[k])
		}
	}
	vm := make([]float64, len(found))
	verr := p.Taylor(0, found, vm)
	j := 0
	for k, q := range qs {
		s := &sides[q]
		if errs[k] != nil {
			s.fail(fmt.Errorf("period: %s turning point: %w", s.name(), errs[k]))
			continue
		}
		j++
		if verr != nil {
			s.fail(fmt.Errorf("period: %s turning point: %w", s.name(), verr))
			continue
		}
		hm := vm[j-1] - w.Energy
		if !(hm > s.E) {
			s.fail(unbound("on the %s side V turns over at r = %.6g Å, %.6g eV above the minimum, below E = %.6g eV: "+
				"the pair escapes over that maximum, there is no oscillation", s.name(), rm[k], hm, s.E))
			continue
		}
		s.stage, s.hi, s.fhi = bracketed, rm[k], hm-s.E
	}
}

// refine solves every bracketed side by core.RootBatch on V − V(re) − E
// with V′, starting from the linear interpolation between the ends.
func refine(p core.Potential, w core.Well, sides []side, sc *scratch) {
	qs := sc.owner[:0]
	for q := range sides {
		if sides[q].stage == bracketed {
			qs = append(qs, q)
		}
	}
	sc.owner = qs
	if len(qs) == 0 {
		return
	}
	sc.probs = grows(sc.probs, len(qs))
	probs := sc.probs
	for k, q := range qs {
		s := &sides[q]
		start := s.lo - s.flo*(s.hi-s.lo)/(s.fhi-s.flo)
		probs[k] = core.RootProblem{Lo: s.lo, Hi: s.hi, FLo: s.flo, FHi: s.fhi, Start: start,
			Noise: noiseFactor * eps * (math.Abs(w.Energy) + s.E)}
	}
	sc.rs, sc.errs = grows(sc.rs, len(qs)), grows(sc.errs, len(qs))
	roots, errs := sc.rs, sc.errs
	sc.roots.Solve(func(idx []int, x, fx, dfx []float64) error {
		var err error
		if sc.c, err = core.DerivativePair(p, 0, x, fx, dfx, sc.c); err != nil {
			return err
		}
		for k, i := range idx {
			fx[k] = fx[k] - w.Energy - sides[qs[i]].E
		}
		return nil
	}, probs, roots, errs)
	for k, q := range qs {
		s := &sides[q]
		if errs[k] != nil {
			s.fail(fmt.Errorf("period: %s turning point at E = %g eV: %w", s.name(), s.E, errs[k]))
			continue
		}
		s.root = roots[k]
	}
}

// grow returns s resized to n, reusing its storage when large enough (the
// contents are then unspecified).
func grow(s []float64, n int) []float64 {
	if cap(s) < n {
		return make([]float64, n)
	}
	return s[:n]
}

// grows returns s resized to n, zeroed, reusing its storage when large
// enough.
func grows[T any](s []T, n int) []T {
	if cap(s) < n {
		return make([]T, n, n+n/4)
	}
	s = s[:n]
	clear(s)
	return s
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

// seriesBelow is the relative rounding error of the direct evaluation
// (roundingEstimate) above which an energy is solved and integrated from
// the Taylor series at re, when that is more accurate: below it the direct
// evaluation is as good to the 1e-13 level, and faster.
const seriesBelow = 1e-13

// seriesTurningPoints computes the turning points of every energy in Es
// (all checked and > 0) into inner and outer, and the displacements
// xin = r₋ − re < 0 and xon = r₊ − re > 0; ser[i] reports that both
// came from the series ex. Where the Taylor series at re
// is more accurate than solving V(r) − V(re) = E directly (small E, see
// core.Expansion.Displacement) both come from Newton iterations on the
// series, with no potential call; the other energies are solved by
// turningPoints, in one batched solve.
func seriesTurningPoints(p core.Potential, w core.Well, ex core.Expansion, Es, inner, outer, xin, xon []float64, ser []bool, errs []error, sc *scratch) {
	var rest []int
	for i, E := range Es {
		ser[i] = false
		if roundingEstimate(w, E) <= seriesBelow {
			rest = append(rest, i) // the direct solve is as good
			continue
		}
		xo, oko := ex.Displacement(E, +1)
		xi, oki := ex.Displacement(E, -1)
		if oko && oki {
			xin[i], xon[i] = xi, xo
			inner[i], outer[i], errs[i] = w.Re+xi, w.Re+xo, nil
			ser[i] = true
			continue
		}
		rest = append(rest, i)
	}
	if len(rest) == 0 {
		return
	}
	if len(rest) == len(Es) {
		turningPoints(p, w, Es, inner, outer, errs, sc)
		for i := range Es {
			xin[i], xon[i] = inner[i]-w.Re, outer[i]-w.Re
		}
		return
	}
	es := make([]float64, len(rest))
	in, on := make([]float64, len(rest)), make([]float64, len(rest))
	terrs := make([]error, len(rest))
	for k, i := range rest {
		es[k] = Es[i]
	}
	turningPoints(p, w, es, in, on, terrs, sc)
	for k, i := range rest {
		inner[i], outer[i], errs[i] = in[k], on[k], terrs[k]
		xin[i], xon[i] = in[k]-w.Re, on[k]-w.Re
	}
}
