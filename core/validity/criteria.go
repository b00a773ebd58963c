package validity

import (
	"errors"
	"fmt"
	"math"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/period"
	"github.com/pairwell/pairwell/core/units"
)

const (
	// eps is the float64 machine epsilon 2⁻⁵².
	eps = 0x1p-52
	// scanRatio is the ratio of successive displacements of the
	// potential scan: a violation narrower than 2% of its distance from
	// re can be missed.
	scanRatio = 1.02
	// stretchCap is the largest stretch scanned, in units of re.
	stretchCap = 100
	// sweepBlock is the number of grid energies whose periods are
	// computed in parallel before the scan checks for a violation.
	sweepBlock = 32
	// refineTol is the relative precision of the refined period limit.
	refineTol = 1e-12
)

// PotentialRange returns the potential criterion for the truncation of
// order n (2, 3 or 4) of the well w of p, at tolerance s.Tolerance.
//
// On each side, displacements s from s₀ outward are scanned on a
// geometric grid (ratio 1.02, one p.Batch call per side) up to the edge of
// the domain (compression) or 100·re (stretch); the first grid point where
// |V_n − V| > τ·|V − V(re)| and the one before bracket the crossing, which
// core.Root refines to a few ulp. The crossing itself is defined only to
// the rounding of V(r) − V(re): ≈ ε·|V|/(τ·c₂s²) relative, 1e-10 for Morse
// at τ = 1% and n = 2, 2e-7 at τ = 0.1%. The scan starts at
// s₀ = √(100·ε·(|V(re)| + c₂re²)/(τ·c₂)), where the rounding of
// V(r) − V(re) is 1% of the allowed difference; a crossing below s₀ (a
// tolerance too small to resolve in float64, ≲ 1e-4 for n = 2) is an error
// wrapping core.ErrParam.
func PotentialRange(p core.Potential, w core.Well, n int, s Settings) (Displacements, error) {
	if err := checkOrder(n); err != nil {
		return Displacements{}, err
	}
	tol, err := s.tolerance()
	if err != nil {
		return Displacements{}, err
	}
	tr, err := NewTruncation(w, n)
	if err != nil {
		return Displacements{}, err
	}
	var out Displacements
	if out.Compression, err = potentialSide(p, w, tr, tol, -1); err != nil {
		return Displacements{}, err
	}
	if out.Stretch, err = potentialSide(p, w, tr, tol, +1); err != nil {
		return Displacements{}, err
	}
	return out, nil
}

// potentialSide scans one side, dir = −1 (compression) or +1 (stretch).
func potentialSide(p core.Potential, w core.Well, tr *Truncation, tol, dir float64) (float64, error) {
	d := p.Domain()
	re, c2 := w.Re, w.Taylor[2]
	side := "stretch"
	sMax := math.Min(d.Max-re, stretchCap*re)
	if dir < 0 {
		side, sMax = "compression", re-d.Min
	}
	s0 := math.Sqrt(100 * eps * (math.Abs(w.Energy) + c2*re*re) / (tol * c2))
	if !(s0 < sMax) {
		return 0, fmt.Errorf("validity: %w: the %s side of the domain is too short to scan (%g Å)", core.ErrParam, side, sMax)
	}
	var ss []float64
	for x := s0; x < sMax; x *= scanRatio {
		ss = append(ss, x)
	}
	last := ss[len(ss)-1]
	for k := 1; k <= 40; k++ { // approach the edge
		x := sMax - (sMax-last)*math.Ldexp(1, -k)
		if x >= sMax || x <= ss[len(ss)-1] {
			break
		}
		ss = append(ss, x)
	}
	rs := make([]float64, len(ss))
	for i, x := range ss {
		rs[i] = re + dir*x
	}
	vs := make([]float64, len(rs))
	for {
		err := p.Batch(0, rs, vs)
		if err == nil {
			break
		}
		// A point where V is out of range ends the scan there.
		var pe *core.PointError
		if !errors.As(err, &pe) || !errors.Is(err, core.ErrDomain) || pe.Index == 0 {
			return 0, fmt.Errorf("validity: potential criterion, %s side: %w", side, err)
		}
		rs, vs, ss = rs[:pe.Index], vs[:pe.Index], ss[:pe.Index]
	}
	for j, v := range vs {
		x := dir * ss[j]
		diff := tr.eval(0, x) - v
		if math.Abs(diff) <= tol*math.Abs(v-w.Energy) {
			continue
		}
		if j == 0 {
			return 0, fmt.Errorf("validity: %w: on the %s side the tolerance %g is exceeded already at %.3g Å, "+
				"where the rounding of V(r) − V(re) starts to matter: use a larger tolerance", core.ErrParam, side, tol, ss[0])
		}
		sgn := math.Copysign(1, diff)
		var buf [2]float64
		f := func(s float64) (float64, float64, error) {
			x := dir * s
			if err := p.Derivatives(re+x, buf[:]); err != nil {
				return 0, 0, err
			}
			g := sgn*(tr.eval(0, x)-buf[0]) - tol*(buf[0]-w.Energy)
			dg := dir * (sgn*(tr.eval(1, x)-buf[1]) - tol*buf[1])
			return g, dg, nil
		}
		x, err := core.Root(f, ss[j-1], ss[j])
		if err != nil {
			return 0, fmt.Errorf("validity: potential criterion, %s side: %w", side, err)
		}
		return x, nil
	}
	return math.Inf(1), nil
}

// PeriodRange returns the period criterion for the truncation of order n
// (2, 3 or 4) of the well w of p, at tolerance s.Tolerance.
//
// The energies scanned are fractions of the top of the well, E_top: the
// depth, or the inner barrier when lower (Buckingham); for an unbounded
// well, the energy at which a turning point reaches the edge of the domain
// or 100·re. The grid is geometric from 1e-8·E_top to E_top/2 (ratio 1.1)
// and then approaches E_top geometrically to within 1e-9·E_top; the periods
// are computed by period.Sweep in parallel blocks of 32 energies, stopping
// at the first block with a violation (the ratio is mass independent, so
// μ = 1 u is used). The first failing energy and the one
// before bracket the limit, which bisection refines to 1e-12 relative; the
// largest energy known to pass is returned. The limit depends on the
// precision of the periods (1e-12 by default): |R(E)| = |T_n/T − 1| is
// known to ≈ 1e-12, so E is resolved to ≈ 1e-12/(τ·dlnR/dlnE) relative.
func PeriodRange(p core.Potential, w core.Well, n int, s Settings) (EnergyRange, error) {
	if err := checkOrder(n); err != nil {
		return EnergyRange{}, err
	}
	tol, err := s.tolerance()
	if err != nil {
		return EnergyRange{}, err
	}
	tr, err := NewTruncation(w, n)
	if err != nil {
		return EnergyRange{}, err
	}
	in, err := period.NewIntegrator(s.Period)
	if err != nil {
		return EnergyRange{}, err
	}
	c := &periodCriterion{p: p, w: w, n: n, tol: tol, tr: tr, wn: tr.Well(), in: in}
	if c.t0, err = period.Harmonic(w, 1); err != nil {
		return EnergyRange{}, err
	}
	top, err := topEnergy(p, w)
	if err != nil {
		return EnergyRange{}, err
	}
	var fr []float64
	for f := 1e-8; f < 0.5; f *= 1.1 {
		fr = append(fr, f)
	}
	for g := 0.5; g > 1e-9; g *= 0.8 {
		fr = append(fr, 1-g)
	}
	energies := make([]float64, len(fr))
	for i, f := range fr {
		energies[i] = f * top
	}
	lo := 0.0
	for start := 0; start < len(energies); start += sweepBlock {
		block := energies[start:min(start+sweepBlock, len(energies))]
		ts, terrs := in.Sweep(p, w, 1, block, nil)
		tns := make([]period.Result, len(block))
		tnerrs := make([]error, len(block))
		if n > 2 {
			tns, tnerrs = in.Sweep(tr, c.wn, 1, block, nil)
		}
		for i, E := range block {
			ok, end, err := c.judge(E, ts[i], terrs[i], tns[i], tnerrs[i])
			if err != nil {
				return EnergyRange{}, err
			}
			if end {
				return c.describe(math.Inf(1))
			}
			if !ok {
				E, err := c.refine(lo, E)
				if err != nil {
					return EnergyRange{}, err
				}
				return c.describe(E)
			}
			lo = E
		}
	}
	return c.describe(math.Inf(1))
}

// periodCriterion evaluates R(E) = T_n(E)/T(E) − 1.
type periodCriterion struct {
	p   core.Potential
	w   core.Well
	n   int
	tol float64
	tr  *Truncation
	wn  core.Well
	in  *period.Integrator
	t0  float64 // harmonic period for μ = 1 u
}

// judge classifies one energy from its periods: ok when the criterion
// holds; end when the real potential has no bound motion there (the scan
// is over).
func (c *periodCriterion) judge(E float64, t period.Result, terr error, tn period.Result, tnerr error) (ok, end bool, err error) {
	if terr != nil {
		if errors.Is(terr, core.ErrDomain) {
			return false, true, nil
		}
		if !errors.Is(terr, core.ErrNoConvergence) || t.ErrorEstimate > c.tol/100 {
			return false, false, fmt.Errorf("validity: period at E = %g eV: %w", E, terr)
		}
	}
	tnp := c.t0
	if c.n > 2 {
		if tnerr != nil {
			if errors.Is(tnerr, core.ErrDomain) {
				return false, false, nil // no bound motion in V_n
			}
			if !errors.Is(tnerr, core.ErrNoConvergence) || tn.ErrorEstimate > c.tol/100 {
				return false, false, fmt.Errorf("validity: period of the order-%d truncation at E = %g eV: %w", c.n, E, tnerr)
			}
		}
		tnp = tn.Period
	}
	return math.Abs(tnp/t.Period-1) <= c.tol, false, nil
}

// at evaluates the criterion at one energy.
func (c *periodCriterion) at(E float64) (ok, end bool, err error) {
	t, terr := c.in.Exact(c.p, c.w, 1, E)
	var tn period.Result
	var tnerr error
	if c.n > 2 {
		tn, tnerr = c.in.Exact(c.tr, c.wn, 1, E)
	}
	return c.judge(E, t, terr, tn, tnerr)
}

// refine bisects between lo (passes) and hi (fails) and returns the
// largest energy found to pass.
func (c *periodCriterion) refine(lo, hi float64) (float64, error) {
	for i := 0; i < 200 && hi-lo > refineTol*hi; i++ {
		mid := 0.5 * (lo + hi)
		ok, end, err := c.at(mid)
		if err != nil {
			return 0, err
		}
		if ok && !end {
			lo = mid
		} else {
			hi = mid
		}
	}
	return lo, nil
}

// describe fills in an EnergyRange for the limit E.
func (c *periodCriterion) describe(E float64) (EnergyRange, error) {
	r := EnergyRange{Energy: E, DepthFraction: math.NaN(), Temperature: E / units.BoltzmannEV,
		Compression: math.Inf(1), Stretch: math.Inf(1)}
	if c.w.Bounded() {
		r.DepthFraction = E / c.w.Depth
	}
	if math.IsInf(E, 1) {
		return r, nil
	}
	inner, outer, err := period.TurningPoints(c.p, c.w, E)
	if err != nil {
		return EnergyRange{}, fmt.Errorf("validity: turning points at the period limit: %w", err)
	}
	r.Compression, r.Stretch = c.w.Re-inner, outer-c.w.Re
	return r, nil
}

// topEnergy returns the highest energy above the minimum at which the
// motion can be bound: the depth, or the inner barrier when lower; for an
// unbounded well, V − V(re) at the edge of the domain on the compression
// side or at 100·re on the stretch side, whichever is lower.
func topEnergy(p core.Potential, w core.Well) (float64, error) {
	d := p.Domain()
	top := math.Inf(1)
	if w.Bounded() {
		top = w.Depth
	}
	if d.Barrier {
		if t, ok := p.(core.Turnover); ok {
			_, vb := t.Barrier()
			top = math.Min(top, vb-w.Energy)
		}
	}
	if !math.IsInf(top, 1) {
		return top, nil
	}
	re := w.Re
	for _, r := range []float64{d.Min + 1e-9*(re-d.Min), math.Min(re+stretchCap*re, 0.5*(re+d.Max))} {
		if v, err := core.Value(p, r); err == nil {
			top = math.Min(top, v-w.Energy)
		}
	}
	if math.IsInf(top, 1) || !(top > 0) {
		return 0, fmt.Errorf("validity: %w: cannot find the energy range of the unbounded well", core.ErrDomain)
	}
	return top, nil
}
