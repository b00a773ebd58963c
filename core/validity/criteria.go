package validity

import (
	"errors"
	"fmt"
	"math"
	"sort"

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
	// The periods of the grid energies are computed in blocks, before
	// the scan checks for a violation: up to blockEnd1·E_top, up to
	// blockEnd2·E_top, up to E_top/2, then block energies at a time.
	blockEnd1 = 1e-4
	blockEnd2 = 0.1
	block     = 32
	// refineTol is the relative precision of the refined period limit.
	refineTol = 1e-12
	// refinePoints is the number of energies evaluated together in each
	// round of the refinement of the period limit.
	refinePoints = 8
	// refineRounds bounds the rounds of the refinement.
	refineRounds = 100
	// periodGridSize is the number of energies of the period scan.
	periodGridSize = 276
)

// PotentialRange returns the potential criterion for the truncation of
// order n (2, 3 or 4) of the well w of p, at tolerance s.Tolerance.
//
// On each side, displacements s from s₀ outward are scanned on a
// geometric grid (ratio 1.02; both sides in one p.Taylor call per round:
// up to 10³·s₀, then the rest of the sides not bracketed yet) up to the
// edge of the domain (compression) or 100·re (stretch); the first grid
// point where |V_n − V| > τ·|V − V(re)| and the one before bracket the
// crossing, which core.RootBatch refines to a few ulp, both sides together
// (a call of V and one of V′ per iteration).
//
// Accuracy. For small displacements V_n − V and V − V(re) are differences
// of nearly equal numbers, with rounding ≈ 4ε·(|V(re)| + |V|), a relative
// error ε·|V|/(τ·c₂s²) of the allowed difference (2.5e-4 for Morse at
// τ = 1e-4 and n = 2). There both come instead from the Taylor series at
// re, V − V_n = Σ_{k>n} c_k x^k and V − V(re) = Σ_{k≥2} c_k x^k (w.Series,
// see core.Expansion), wherever its error bound is the smaller one, so the
// scan starts well below the crossing estimated from the first term
// beyond c_n. The uncertainty of the refined crossing is the error bound
// of the criterion over its slope; above resolveTol (1e-6 relative: six significant digits) the
// limit is refused with an error wrapping core.ErrParam that says which
// tolerance would be resolvable. With the series of the built-in forms
// (24 terms) no tolerance in (0, 1) is refused; a form with few
// derivatives can be.
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
	pc := &potCrit{w: w, tr: tr, tol: tol, n: n, ex: core.NewExpansion(w)}
	sides := [2]potentialSide{{dir: -1, name: "compression"}, {dir: +1, name: "stretch"}}
	for k := range sides {
		sides[k].grid(p, pc)
	}
	// The grids in two rounds: up to firstReach times the first
	// displacement (the crossing is expected at about a hundred times
	// it), then the rest of the sides not bracketed yet, laid out only
	// then.
	for round := 0; round < 2; round++ {
		for k := range sides {
			sd := &sides[k]
			if round > 0 && sd.err == nil && !sd.done && !sd.complete {
				sd.extend(sd.ss[len(sd.ss)-1]*scanRatio, math.Inf(1))
			}
			sd.upto = len(sd.ss)
		}
		scanPotential(p, w, sides[:])
		for k := range sides {
			sides[k].bracket(pc)
		}
	}
	crossings(p, pc, sides[:])
	for _, sd := range sides {
		if sd.err != nil {
			return Displacements{}, sd.err
		}
	}
	return Displacements{Compression: sides[0].limit, Stretch: sides[1].limit}, nil
}

// resolveTol is the relative uncertainty of a potential-criterion limit
// above which the limit is refused as not resolvable in float64.
const resolveTol = 1e-6

// potCrit evaluates the potential criterion g = sgn·(V_n − V) − τ·(V − V(re))
// at a displacement x: from the values of V (direct), or from the Taylor
// series at re, V − V_n = Σ_{k>n} c_k x^k and V − V(re) = Σ_{k≥2} c_k x^k
// (core.Expansion), whichever has the smaller error bound. The direct
// difference V_n − V loses digits for small x: its rounding,
// ≈ 4ε·(|V(re)| + |V|), is a relative error ε·|V|/(τ·c₂x²) of the allowed
// difference; the series has none.
type potCrit struct {
	w   core.Well
	tr  *Truncation
	tol float64
	n   int
	ex  core.Expansion
	s0  float64 // the first displacement of the scans (start), once known
}

// eval returns V_n − V, V − V(re) and the error bound of g at x (signed
// displacement), from v = V(re + x).
func (c *potCrit) eval(x, v float64) (diff, e, noise float64) {
	diff, e, noise, _ = c.evalIn(c.ex, x, v)
	return diff, e, noise
}

// evalIn is eval with the series ex (c.ex, or c.ex trimmed for the
// displacements at hand, the scan), also reporting whether the series was
// used.
func (c *potCrit) evalIn(ex core.Expansion, x, v float64) (diff, e, noise float64, series bool) {
	direct := ex.DirectBound(v) * (1 + c.tol)
	rs, rb, es, eb := ex.Sums(x, c.n+1)
	if sb := rb + c.tol*eb; sb < direct {
		return -rs, es, sb, true
	}
	return c.tr.eval(0, x) - v, v - c.w.Energy, direct, false
}

// g returns the criterion with the sign sgn of V_n − V beyond the crossing.
func (c *potCrit) g(sgn, x, v float64) (g, noise float64) {
	diff, e, noise := c.eval(x, v)
	return sgn*diff - c.tol*e, noise
}

// slope returns dg/dx at x from V′ there (dv), or from the series where
// eval uses it: the difference V_n′ − V′ cancels as V_n − V does.
func (c *potCrit) slope(sgn, x, v, dv float64) float64 {
	if _, _, _, series := c.evalIn(c.ex, x, v); series {
		return sgn*-c.ex.Slope(x, c.n+1) - c.tol*c.ex.Slope(x, 2)
	}
	return sgn*(c.tr.eval(1, x)-dv) - c.tol*dv
}

// needed returns the tolerance at which a limit now uncertain by u
// (relative) would be resolved to resolveTol by the direct difference,
// whose uncertainty ε·|V|/(τ·c₂s²) scales like τ^−(n+1)/(n−1) with the
// crossing s ∝ τ^{1/(n−1)}.
func (c *potCrit) needed(u float64) float64 {
	n := float64(c.n)
	return math.Min(c.tol*math.Pow(u/resolveTol, (n-1)/(n+1)), 0.5)
}

// start returns the first displacement of the scan: a hundred times below
// the crossing estimated from the terms beyond c_n, the smallest s with
// |c_k|·s^k = τ·c₂s² for some k > n, where the criterion is at about a
// hundredth of the tolerance and the series at re resolves it (without
// the series, where the direct difference is resolved to the rounding
// s0 of the grid, and below s0).
func (c *potCrit) start(s0 float64) float64 {
	coef := c.w.Series
	if len(c.w.Taylor) > len(coef) {
		coef = c.w.Taylor
	}
	s := math.Inf(1)
	for k := c.n + 1; k < len(coef); k++ {
		if coef[k] != 0 {
			s = math.Min(s, math.Pow(c.tol*coef[2]/math.Abs(coef[k]), 1/float64(k-2)))
		}
	}
	if math.IsInf(s, 1) {
		return s0
	}
	if c.ex.Order() > c.n {
		return 1e-2 * s
	}
	return math.Min(s0, 1e-2*s)
}

// potentialSide is the potential criterion on one side, dir = −1
// (compression) or +1 (stretch).
type potentialSide struct {
	dir      float64
	name     string
	ss, vs   []float64 // displacements scanned and V there (vs up to upto)
	sMax     float64   // the edge of the scan, Å
	complete bool      // ss reaches sMax (or was cut at the domain's edge)
	upto     int       // the end of the part of ss to evaluate next
	checked  int       // the points of vs checked by bracket
	done     bool      // the scan of the side is over
	err      error
	limit    float64
	// The bracket of the crossing: displacements, criterion there, and
	// the sign of V_n − V beyond it.
	lo, hi, glo, ghi, sgn float64
	noise                 float64 // error bound of the criterion at hi
	bracketed             bool
}

// grid lays out the displacements of the scan of the side.
func (sd *potentialSide) grid(p core.Potential, c *potCrit) {
	d := p.Domain()
	w, tol := c.w, c.tol
	re, c2 := w.Re, w.Taylor[2]
	sd.sMax = math.Min(d.Max-re, stretchCap*re)
	if sd.dir < 0 {
		sd.sMax = re - d.Min
	}
	if c.s0 == 0 {
		c.s0 = c.start(math.Sqrt(100 * eps * (math.Abs(w.Energy) + c2*re*re) / (tol * c2)))
	}
	s0 := c.s0
	if !(s0 < sd.sMax) {
		sd.err = fmt.Errorf("validity: %w: the %s side of the domain is too short to scan (%g Å)", core.ErrParam, sd.name, sd.sMax)
		return
	}
	sd.ss = make([]float64, 0, int(math.Log(math.Min(sd.sMax/s0, firstReach))/math.Log(scanRatio))+42)
	sd.extend(s0, firstReach*s0)
}

// extend continues the grid of the side from x (the next displacement) up
// to below until, or to the edge of the domain (then approached
// geometrically: 40 halvings of the distance at most).
func (sd *potentialSide) extend(x, until float64) {
	for ; x < sd.sMax && x < until; x *= scanRatio {
		sd.ss = append(sd.ss, x)
	}
	if x < sd.sMax {
		return
	}
	sd.complete = true
	last := sd.ss[len(sd.ss)-1]
	for k := 1; k <= 40; k++ { // approach the edge
		x := sd.sMax - (sd.sMax-last)*math.Ldexp(1, -k)
		if x >= sd.sMax || x <= sd.ss[len(sd.ss)-1] {
			break
		}
		sd.ss = append(sd.ss, x)
	}
}

// trimEvery is the number of scan points checked with one trimmed series.
const trimEvery = 32

// firstReach is the ratio of the end of the first round of the scan to
// its start.
const firstReach = 1e3

// active reports whether the side still scans points up to upto.
func (sd *potentialSide) active() bool {
	return sd.err == nil && !sd.done && sd.upto > len(sd.vs)
}

// scanPotential evaluates V at the displacements of every active side from
// len(vs) up to upto, all sides in one p.Taylor call. A point where V is
// out of the domain ends the grid of its side there.
func scanPotential(p core.Potential, w core.Well, sides []potentialSide) {
	total := 0
	for k := range sides {
		if sides[k].active() {
			total += sides[k].upto - len(sides[k].vs)
		}
	}
	rs := make([]float64, 0, total)
	for {
		rs = rs[:0]
		for k := range sides {
			sd := &sides[k]
			if !sd.active() {
				continue
			}
			for _, x := range sd.ss[len(sd.vs):sd.upto] {
				rs = append(rs, w.Re+sd.dir*x)
			}
		}
		if len(rs) == 0 {
			return
		}
		vs := make([]float64, len(rs))
		err := p.Taylor(0, rs, vs)
		if err == nil {
			j := 0
			for k := range sides {
				sd := &sides[k]
				if sd.active() {
					n := sd.upto - len(sd.vs)
					if len(sd.vs) == 0 {
						sd.vs = vs[j : j+n : j+n]
					} else {
						sd.vs = append(sd.vs, vs[j:j+n]...)
					}
					j += n
				}
			}
			return
		}
		var pe *core.PointError
		if !errors.As(err, &pe) || pe.Index < 0 || pe.Index >= len(rs) {
			for k := range sides {
				if sides[k].active() {
					sides[k].err = fmt.Errorf("validity: potential criterion, %s side: %w", sides[k].name, err)
				}
			}
			return
		}
		// The side of the failing point, and its index in its grid.
		k, local := 0, pe.Index
		for ; k < len(sides); k++ {
			if !sides[k].active() {
				continue
			}
			n := sides[k].upto - len(sides[k].vs)
			if local < n {
				break
			}
			local -= n
		}
		sd := &sides[k]
		local += len(sd.vs)
		if !errors.Is(err, core.ErrDomain) || local == 0 {
			sd.err = fmt.Errorf("validity: potential criterion, %s side: %w", sd.name,
				&core.PointError{Index: local, R: pe.R, Err: pe.Err})
			continue
		}
		sd.ss = sd.ss[:local]
		sd.upto, sd.complete = local, true
	}
}

// bracket checks the newly evaluated points of the side for the first grid
// point where the criterion fails and the one before; at the end of the
// grid without one, the limit is +Inf.
func (sd *potentialSide) bracket(c *potCrit) {
	if sd.err != nil || sd.done {
		return
	}
	sd.limit = math.Inf(1)
	var ex core.Expansion
	for j := sd.checked; j < len(sd.vs); j++ {
		if (j-sd.checked)%trimEvery == 0 {
			// The series without the terms below its rounding up to
			// the last displacement of the next trimEvery: the same
			// values and bounds to a relative ε, fewer terms.
			ex = c.ex.TrimTo(sd.ss[min(j+trimEvery, len(sd.vs))-1], c.n+1)
		}
		v := sd.vs[j]
		x := sd.dir * sd.ss[j]
		diff, e, _, _ := c.evalIn(ex, x, v)
		if math.Abs(diff) <= c.tol*math.Abs(e) {
			continue
		}
		if diff, e, _ = c.eval(x, v); math.Abs(diff) <= c.tol*math.Abs(e) {
			continue // a tie within rounding: the full series decides
		}
		sd.done = true
		if j == 0 {
			// The crossing lies below the first displacement scanned,
			// where even the better of the two methods leaves it
			// uncertain by more than u ≈ noise/((n−1)·τ·E).
			_, _, noise := c.eval(x, v)
			u := noise / (float64(c.n-1) * c.tol * math.Abs(e))
			sd.err = fmt.Errorf("validity: %w: the potential criterion at tolerance %g cannot be resolved in float64 on the %s side: "+
				"it fails already at %.3g Å, the first displacement scanned, where the rounding of V − V_%d leaves a crossing uncertain by %.1g (relative) "+
				"and the form's Taylor series (up to c_%d) does not reach; a tolerance of at least about %.1g is resolvable",
				core.ErrParam, c.tol, sd.name, sd.ss[0], c.n, u, c.ex.Order(), c.needed(u))
			return
		}
		sd.sgn = math.Copysign(1, diff)
		sd.lo, sd.hi = sd.ss[j-1], sd.ss[j]
		sd.glo, _ = c.g(sd.sgn, sd.dir*sd.lo, sd.vs[j-1])
		sd.ghi, sd.noise = c.g(sd.sgn, x, v)
		sd.bracketed = true
		return
	}
	sd.checked = len(sd.vs)
	if len(sd.vs) == len(sd.ss) {
		sd.done = true
	}
}

// crossings refines the bracketed crossings of all sides together, and
// refuses a crossing that rounding leaves uncertain by more than
// resolveTol.
func crossings(p core.Potential, c *potCrit, sides []potentialSide) {
	w := c.w
	var (
		probs []core.RootProblem
		which []*potentialSide
	)
	for k := range sides {
		sd := &sides[k]
		if sd.err != nil || !sd.bracketed {
			continue
		}
		probs = append(probs, core.RootProblem{Lo: sd.lo, Hi: sd.hi, FLo: sd.glo, FHi: sd.ghi,
			Start: sd.lo - sd.glo*(sd.hi-sd.lo)/(sd.ghi-sd.glo), Noise: sd.noise})
		which = append(which, sd)
	}
	if len(probs) == 0 {
		return
	}
	roots := make([]float64, len(probs))
	errs := make([]error, len(probs))
	var rs, dv, work []float64
	core.RootBatch(func(idx []int, x, fx, dfx []float64) error {
		rs = rs[:0]
		for k, i := range idx {
			rs = append(rs, w.Re+which[i].dir*x[k])
		}
		dv = append(dv[:0], make([]float64, len(dfx))...)
		var err error
		if work, err = core.DerivativePair(p, 0, rs, fx, dv, work); err != nil {
			return err
		}
		for k, i := range idx {
			sd := which[i]
			xx := sd.dir * x[k]
			v := fx[k]
			fx[k], _ = c.g(sd.sgn, xx, v)
			if k < len(dfx) {
				dfx[k] = sd.dir * c.slope(sd.sgn, xx, v, dv[k])
			}
		}
		return nil
	}, probs, roots, errs)
	// The uncertainty of each crossing: the bound of g over its slope.
	var xs, v, d1 []float64
	for k, sd := range which {
		if errs[k] == nil {
			xs = append(xs, w.Re+sd.dir*roots[k])
		}
	}
	v, d1 = make([]float64, len(xs)), make([]float64, len(xs))
	_, verr := core.DerivativePair(p, 0, xs, v, d1, nil)
	j := 0
	for k, sd := range which {
		if errs[k] != nil {
			sd.err = fmt.Errorf("validity: potential criterion, %s side: %w", sd.name, errs[k])
			continue
		}
		s := roots[k]
		sd.limit = s
		if verr != nil {
			sd.err = fmt.Errorf("validity: potential criterion, %s side: %w", sd.name, verr)
			continue
		}
		xx := sd.dir * s
		_, noise := c.g(sd.sgn, xx, v[j])
		slope := math.Abs(c.slope(sd.sgn, xx, v[j], d1[j]))
		j++
		if u := noise / (slope * s); !(u <= resolveTol) {
			need := c.needed(u)
			sd.err = fmt.Errorf("validity: %w: the potential criterion at tolerance %g cannot be resolved in float64 on the %s side: "+
				"the crossing at %.4g Å is uncertain by %.1g (relative) from the rounding of V − V_%d, more than %g; "+
				"the form's Taylor series (up to c_%d) does not reach it either; a tolerance of about %.1g or more is resolvable",
				core.ErrParam, c.tol, sd.name, s, u, c.n, resolveTol, c.ex.Order(), need)
		}
	}
}

// PeriodRange returns the period criterion for the truncation of order n
// (2, 3 or 4) of the well w of p, at tolerance s.Tolerance.
//
// The energies scanned are fractions of the top of the well, E_top: the
// depth, or the inner barrier when lower (Buckingham); for an unbounded
// well, the energy at which a turning point reaches the edge of the domain
// or 100·re. The grid is geometric from 1e-8·E_top to E_top/2 (ratio 1.1)
// and then approaches E_top geometrically to within 1e-9·E_top; the periods
// are computed by period.Sweep (batched passes over many energies) in
// blocks — the grid below 1e-4·E_top, up to E_top/10, up to E_top/2, then
// 32 energies at a time — stopping at the first block with a violation (the ratio is mass independent, so
// μ = 1 u is used). The first failing energy and the one before bracket
// the limit, which is refined to 1e-12 relative by rounds of 8 energies
// computed together: spread around the root of the inverse interpolation
// of |T_n/T − 1| − τ through the nearest energies on either side, over a
// width of twice its estimated error, or spread evenly over the bracket
// when that fails to halve it; each round keeps the first failing energy
// and the passing one before it. The largest energy known to pass is
// returned. The limit depends on the precision of the periods (1e-12 by
// default): |R(E)| = |T_n/T − 1| is known to ≈ 1e-12, so E is resolved to
// ≈ 1e-12/(τ·dlnR/dlnE) relative.
//
// Small energies. Where the bound of the amplitude series of the period
// (period.AmplitudeSeries, T/T₀ as a power series in E from the Taylor
// coefficients at re) is at most a tenth of the quadrature's tolerance,
// the periods come from it instead, without quadrature or potential calls
// (in practice for the harmonic truncation, n = 2: a V_n of order n > 2 is
// built from c₀…c₄ only, too few terms for the series to have a bound, so
// its periods come from the quadrature);
// energies are then judged one at a time, and the scan stops at the first
// failure. The limits agree with those of the quadrature alone to 1e-9
// relative (TestPeriodSeriesAgrees; 4e-11 at worst on the built-ins); the
// turning points at a limit found so are solved by period.TurningPoints.
func PeriodRange(p core.Potential, w core.Well, n int, s Settings) (EnergyRange, error) {
	return periodRange(p, w, n, s, true)
}

// periodRange is PeriodRange; without series, every period comes from the
// quadrature (for the tests).
func periodRange(p core.Potential, w core.Well, n int, s Settings, series bool) (EnergyRange, error) {
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
	c := &periodCriterion{p: p, w: w, n: n, tol: tol, tr: tr, wn: tr.Well(), in: in,
		ser: period.NewAmplitudeSeries(w), serTol: seriesShare * in.Settings().Tolerance}
	if n > 2 {
		c.sern = period.NewAmplitudeSeries(c.wn)
	}
	if !series {
		c.serTol = math.Inf(-1)
	}
	if c.t0, err = period.Harmonic(w, 1); err != nil {
		return EnergyRange{}, err
	}
	top, err := topEnergy(p, w)
	if err != nil {
		return EnergyRange{}, err
	}
	c.top = top
	energies := make([]float64, 0, periodGridSize)
	var ends []int // of the blocks below E_top/2
	for f := 1e-8; f < 0.5; f *= 1.1 {
		if (len(ends) == 0 && f >= blockEnd1) || (len(ends) == 1 && f >= blockEnd2) {
			ends = append(ends, len(energies))
		}
		energies = append(energies, f*top)
	}
	for g := 0.5; g > 1e-9; g *= 0.8 {
		energies = append(energies, (1-g)*top)
	}
	c.buf = make([]sample, 0, ends[0]+1) // the largest block
	// E = 0 passes, with both turning points at re.
	best := sample{inner: w.Re, outer: w.Re, g: -tol}
	known := make([]point, 0, len(energies)+refinePoints*8)
	for start := 0; start < len(energies); {
		end := min(start+block, len(energies))
		if len(ends) > 0 {
			end, ends = ends[0], ends[1:]
		}
		ss, err := c.evaluate(energies[start:end])
		if err != nil {
			return EnergyRange{}, err
		}
		known = appendPoints(known, ss)
		for _, sm := range ss {
			if sm.err != nil {
				return EnergyRange{}, sm.err
			}
			if sm.end {
				return c.describe(sample{E: math.Inf(1)})
			}
			if !sm.ok {
				lim, err := c.refine(best, sm, known)
				if err != nil {
					return EnergyRange{}, err
				}
				return c.describe(lim)
			}
			best = sm
		}
		start = end
	}
	return c.describe(sample{E: math.Inf(1)})
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
	top float64 // E_top, eV
	// The period series of V and of V_n (n > 2), used at the energies
	// where their bound is at most serTol (see evaluate).
	ser, sern period.AmplitudeSeries
	serTol    float64
	// buf holds the samples of evaluate, reused by the next call: its
	// result is valid until then.
	buf []sample
}

// seriesShare is the bound of the period series, as a fraction of the
// tolerance of the quadrature, below which the series replaces it.
const seriesShare = 0.1

// sample is the criterion at one energy.
type sample struct {
	E       float64
	ok, end bool    // see judge
	g       float64 // |R(E)| − τ; NaN when T_n is undefined
	// inner and outer are the turning points of the real potential at E,
	// Å (not known when the periods came from the amplitude series).
	inner, outer float64
	err          error
	// series reports that the periods came from the amplitude series.
	series bool
}

// evaluate computes the criterion at the energies, which increase: from
// the amplitude series (period.AmplitudeSeries) of V and V_n as long as
// their bounds are at most serTol (for n > 2 the bound of V_n's series is
// infinite and every period comes from the sweep) (a hundred times cheaper than a
// quadrature, and no potential call), then, for the energies left, by one
// period.Sweep per potential. A failure found by the series ends the
// samples returned there: the callers stop at the first failure.
func (c *periodCriterion) evaluate(energies []float64) ([]sample, error) {
	ss := c.buf[:0]
	defer func() { c.buf = ss[:0] }()
	for len(energies) > 0 {
		sm, ok := c.fromSeries(energies[0])
		if !ok {
			break
		}
		ss = append(ss, sm)
		energies = energies[1:]
		if !sm.ok {
			return ss, nil
		}
	}
	if len(energies) == 0 {
		return ss, nil
	}
	ss, err := c.sweep(ss, energies)
	return ss, err
}

// fromSeries is the criterion at E from the amplitude series, and whether
// their bounds allowed it.
func (c *periodCriterion) fromSeries(E float64) (sample, bool) {
	if !(E < c.top) {
		return sample{}, false
	}
	r, b := c.ser.Ratio(E) // T/T₀
	if !(b <= c.serTol) {
		return sample{}, false
	}
	rn := 1.0 // T_n/T₀
	if c.n > 2 {
		var bn float64
		if rn, bn = c.sern.Ratio(E); !(E < c.wn.Depth) || !(bn <= c.serTol) {
			return sample{}, false
		}
	}
	R := math.Abs(rn/r - 1)
	return sample{E: E, ok: R <= c.tol, g: R - c.tol, series: true}, true
}

// sweep appends the criterion at every energy to ss, by one period.Sweep
// per potential.
func (c *periodCriterion) sweep(ss []sample, energies []float64) ([]sample, error) {
	ts, terrs := c.in.Sweep(c.p, c.w, 1, energies, nil)
	var (
		tns    []period.Result
		tnerrs []error
	)
	if c.n > 2 {
		tns, tnerrs = c.in.Sweep(c.tr, c.wn, 1, energies, nil)
	}
	for i, E := range energies {
		var tn period.Result
		var tnerr error
		if c.n > 2 {
			tn, tnerr = tns[i], tnerrs[i]
		}
		sm := sample{E: E, inner: ts[i].Inner, outer: ts[i].Outer}
		sm.ok, sm.end, sm.g, sm.err = c.judge(E, ts[i], terrs[i], tn, tnerr)
		ss = append(ss, sm)
	}
	return ss, nil
}

// judge classifies one energy from its periods: ok when the criterion
// holds; end when the real potential has no bound motion there (the scan
// is over). g is |R| − τ, NaN when R is undefined.
func (c *periodCriterion) judge(E float64, t period.Result, terr error, tn period.Result, tnerr error) (ok, end bool, g float64, err error) {
	if terr != nil {
		if errors.Is(terr, core.ErrDomain) {
			return false, true, math.NaN(), nil
		}
		if !errors.Is(terr, core.ErrNoConvergence) || t.ErrorEstimate > c.tol/100 {
			return false, false, math.NaN(), fmt.Errorf("validity: period at E = %g eV: %w", E, terr)
		}
	}
	tnp := c.t0
	if c.n > 2 {
		if tnerr != nil {
			if errors.Is(tnerr, core.ErrDomain) {
				return false, false, math.NaN(), nil // no bound motion in V_n
			}
			if !errors.Is(tnerr, core.ErrNoConvergence) || tn.ErrorEstimate > c.tol/100 {
				return false, false, math.NaN(), fmt.Errorf("validity: period of the order-%d truncation at E = %g eV: %w", c.n, E, tnerr)
			}
		}
		tnp = tn.Period
	}
	r := math.Abs(tnp/t.Period - 1)
	return r <= c.tol, false, r - c.tol, nil
}

// refine narrows the bracket between a (passes) and b (fails) to refineTol
// relative and returns the largest energy found to pass. known are the
// energies evaluated so far, for the interpolation.
func (c *periodCriterion) refine(a, b sample, known []point) (sample, error) {
	section := false
	for round := 0; round < refineRounds && b.E-a.E > refineTol*b.E; round++ {
		es := make([]float64, 0, refinePoints)
		if est, ok := estimate(a, b, known); ok && !section {
			// Offsets growing geometrically from refineTol/2 to the
			// far end of the bracket, on either side of est.
			far := math.Max(est-a.E, b.E-est)
			near := 0.5 * refineTol * b.E
			ratio := math.Pow(far/near, 1/float64(refinePoints/2-1))
			for k := refinePoints/2 - 1; k >= 0; k-- {
				if E := est - near*math.Pow(ratio, float64(k)); E > a.E {
					es = append(es, E)
				}
			}
			for k := 0; k < refinePoints/2; k++ {
				if E := est + near*math.Pow(ratio, float64(k)); E < b.E {
					es = append(es, E)
				}
			}
		} else {
			for k := 1; k <= refinePoints; k++ {
				if E := a.E + (b.E-a.E)*float64(k)/(refinePoints+1); E > a.E && E < b.E && (len(es) == 0 || E > es[len(es)-1]) {
					es = append(es, E)
				}
			}
		}
		if len(es) == 0 {
			break
		}
		ss, err := c.evaluate(es)
		if err != nil {
			return sample{}, err
		}
		width := b.E - a.E
		for _, sm := range ss {
			if sm.err != nil {
				return sample{}, sm.err
			}
			if sm.ok && !sm.end {
				a = sm
				continue
			}
			b = sm
			break
		}
		known = appendPoints(known, ss)
		section = b.E-a.E > 0.5*width
	}
	return a, nil
}

// estimate returns the root of the inverse interpolation of g(E) through
// the samples nearest the bracket (a, b), up to two on either side. ok is
// false when g is undefined at a or b or the root falls outside the
// bracket.
func estimate(a, b sample, known []point) (est float64, ok bool) {
	if !(a.g <= 0) || !(b.g > 0) {
		return 0, false
	}
	left := []point{{a.E, a.g}}
	right := []point{{b.E, b.g}}
	for _, pt := range known {
		switch {
		case pt.E < a.E && (len(left) < 2 || pt.E > left[1].E):
			left = append(left[:1], pt)
		case pt.E > b.E && (len(right) < 2 || pt.E < right[1].E):
			right = append(right[:1], pt)
		}
	}
	pts := append(left, right...)
	// Order by distance from the bracket: a and b first.
	sort.SliceStable(pts, func(i, j int) bool { return dist(pts[i].E, a.E, b.E) < dist(pts[j].E, a.E, b.E) })
	est = neville(pts, 0)
	if !(est > a.E && est < b.E) {
		// A higher-degree fit can overshoot: fall back to the secant.
		est = neville(pts[:2], 0)
	}
	return est, est > a.E && est < b.E
}

// point is an energy with a defined criterion g there.
type point struct{ E, g float64 }

// appendPoints appends the samples of ss where g is defined to known.
func appendPoints(known []point, ss []sample) []point {
	for _, sm := range ss {
		if !math.IsNaN(sm.g) {
			known = append(known, point{sm.E, sm.g})
		}
	}
	return known
}

// dist is the distance of E from the interval [a, b].
func dist(E, a, b float64) float64 {
	switch {
	case E < a:
		return a - E
	case E > b:
		return E - b
	}
	return 0
}

// neville evaluates at g the polynomial through the points (g_i, E_i).
func neville(pts []point, g float64) float64 {
	var p [4]float64
	n := min(len(pts), len(p))
	for i := range n {
		p[i] = pts[i].E
	}
	for m := 1; m < n; m++ {
		for i := 0; i < n-m; i++ {
			gi, gj := pts[i].g, pts[i+m].g
			p[i] = ((g-gj)*p[i] + (gi-g)*p[i+1]) / (gi - gj)
		}
	}
	return p[0]
}

// describe fills in an EnergyRange for the limit lim: its energy, and the
// turning points of its period (solved here when the period came from the
// series).
func (c *periodCriterion) describe(lim sample) (EnergyRange, error) {
	E := lim.E
	r := EnergyRange{Energy: E, DepthFraction: math.NaN(), Temperature: E / units.BoltzmannEV,
		Compression: math.Inf(1), Stretch: math.Inf(1)}
	if c.w.Bounded() {
		r.DepthFraction = E / c.w.Depth
	}
	if math.IsInf(E, 1) {
		return r, nil
	}
	inner, outer := lim.inner, lim.outer
	if lim.series {
		var err error
		if inner, outer, err = period.TurningPoints(c.p, c.w, E); err != nil {
			return EnergyRange{}, fmt.Errorf("validity: turning points at the period limit: %w", err)
		}
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
		top = math.Min(top, d.BarrierEnergy-w.Energy)
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
