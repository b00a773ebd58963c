// Package period computes the period of the classical oscillation of a pair
// (relative coordinate r, reduced mass μ) in the well of a pair potential:
// exactly by quadrature, and perturbatively from the Taylor coefficients of
// the well.
//
// Conventions. The oscillation energy E is measured from the minimum,
// E = V(r) − V(re) ≥ 0, in eV; separations and turning points are in Å,
// masses in u and periods in fs (CODATA 2018 constants, see package units).
// A motion started at rest at displacement x from re has E = V(re + x) − V(re).
//
// The exact period is
//
//	T(E) = √(2μ) ∫ dr / √(E − V(r) + V(re))
//
// between the turning points r₋ < re < r₊ where V(r) − V(re) = E. With
// r = m + h·sin θ, m = (r₊ + r₋)/2, h = (r₊ − r₋)/2, and
// E − V(r) + V(re) = (r₊ − r)(r − r₋)·g(r), the integral becomes
//
//	T(E) = √(2μ) ∫_{−π/2}^{π/2} dθ / √g(r(θ)),
//
// whose integrand is as smooth as V: the square-root singularities at the
// turning points are gone, and Gauss–Legendre quadrature converges
// exponentially.
package period

import (
	"errors"
	"fmt"
	"math"
	"sync"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/units"
	"gonum.org/v1/gonum/integrate/quad"
)

// Defaults of Settings.
const (
	DefaultTolerance = 1e-12
	DefaultMinNodes  = 16
	DefaultMaxNodes  = 4096
)

// Settings controls the quadrature of the exact period. The zero value
// gives the defaults.
type Settings struct {
	// Tolerance is the target relative error of the period. Zero means
	// DefaultTolerance (1e-12).
	Tolerance float64

	// MinNodes is the number of Gauss–Legendre nodes of the first rule;
	// later rules double it. Zero means DefaultMinNodes (16).
	MinNodes int

	// MaxNodes caps the doubling. Zero means DefaultMaxNodes (4096).
	MaxNodes int
}

// resolved returns s with the zero fields replaced by the defaults, or an
// error wrapping core.ErrParam.
func (s Settings) resolved() (Settings, error) {
	if s.Tolerance == 0 {
		s.Tolerance = DefaultTolerance
	}
	if s.MinNodes == 0 {
		s.MinNodes = DefaultMinNodes
	}
	if s.MaxNodes == 0 {
		s.MaxNodes = DefaultMaxNodes
	}
	switch {
	case !(s.Tolerance > 0) || math.IsInf(s.Tolerance, 1):
		return s, fmt.Errorf("period: %w: tolerance %g, must be > 0", core.ErrParam, s.Tolerance)
	case s.MinNodes < 2:
		return s, fmt.Errorf("period: %w: MinNodes %d, must be ≥ 2", core.ErrParam, s.MinNodes)
	case s.MaxNodes < 2*s.MinNodes:
		return s, fmt.Errorf("period: %w: MaxNodes %d, must be ≥ 2·MinNodes = %d", core.ErrParam, s.MaxNodes, 2*s.MinNodes)
	}
	return s, nil
}

// Result is an exact period.
type Result struct {
	// Period is T(E) in fs.
	Period float64

	// ErrorEstimate is the estimated relative error of Period: the
	// larger of the difference between the last two rules (n and 2n
	// nodes) and an estimate of the rounding error, see Integrator.Exact.
	ErrorEstimate float64

	// Inner and Outer are the turning points r₋ and r₊ in Å.
	Inner, Outer float64

	// Compression and Stretch are re − r₋ and r₊ − re in Å, computed
	// without the cancellation of the differences of Inner and Outer
	// with re where they come from the Taylor series at re (see
	// TurningPoints).
	Compression, Stretch float64

	// Nodes is the number of Gauss–Legendre nodes of the rule whose value
	// is returned; 0 for the small-amplitude limit.
	Nodes int

	// SmallAmplitude reports that E was too small for the quadrature to
	// beat the perturbative period, which was returned instead (see
	// Integrator.Exact).
	SmallAmplitude bool
}

// timeUnit returns the unit of time of the system (eV, Å, u) in fs,
// √(u·Å²/eV) ≈ 10.18 fs. It is 1/units.AngularFrequency(1, 1), so that
// periods here and in core.NewHarmonic use the same conversion.
func timeUnit() float64 { return 1 / units.AngularFrequency(1, 1) }

// Harmonic returns the harmonic period 2π√(μ/k) in fs of the well w for the
// reduced mass mu in u, with k = 2c₂ = V″(re).
func Harmonic(w core.Well, mu float64) (float64, error) {
	if err := checkWell(w, 2); err != nil {
		return 0, err
	}
	h, err := core.NewHarmonic(2*w.Taylor[2], mu)
	if err != nil {
		return 0, fmt.Errorf("period: %w", err)
	}
	return h.PeriodFs, nil
}

// checkWell checks that w has Taylor coefficients up to order n and c₂ > 0.
func checkWell(w core.Well, n int) error {
	if len(w.Taylor) <= n {
		return fmt.Errorf("period: %w: the well has Taylor coefficients up to c_%d, c_%d needed (core.WellSettings.Order)",
			core.ErrOrder, len(w.Taylor)-1, n)
	}
	if !(w.Taylor[2] > 0) || math.IsInf(w.Taylor[2], 1) {
		return fmt.Errorf("period: %w: c₂ = %g eV/Å², must be finite and > 0 (a minimum)", core.ErrParam, w.Taylor[2])
	}
	return nil
}

// PerturbativeShift returns δ, the relative frequency shift ω/ω₀ − 1 at
// energy E (eV) of second-order Lindstedt–Poincaré theory (Landau &
// Lifshitz, Mechanics, §28). For ẍ + ω₀²x = −αx² − βx³ with α = 3c₃/μ,
// β = 4c₄/μ and ω₀² = k/μ = 2c₂/μ,
//
//	ω = ω₀ + (3β/(8ω₀) − 5α²/(12ω₀³))·A²,  A² = 2E/k,
//
// which in terms of the Taylor coefficients is mass independent:
//
//	δ = (3c₄/(4c₂) − 15c₃²/(16c₂²))·E/c₂.
//
// For Morse (c₂ = De·a², c₃ = −De·a³, c₄ = 7De·a⁴/12) δ = −E/(2De). The well
// needs Taylor coefficients up to c₄.
func PerturbativeShift(w core.Well, E float64) (float64, error) {
	if err := checkWell(w, 4); err != nil {
		return 0, err
	}
	if !(E >= 0) || math.IsInf(E, 1) {
		return 0, fmt.Errorf("period: %w: oscillation energy E = %g eV, must be finite and ≥ 0", core.ErrParam, E)
	}
	c2, c3, c4 := w.Taylor[2], w.Taylor[3], w.Taylor[4]
	return (3*c4/(4*c2) - 15*c3*c3/(16*c2*c2)) * (E / c2), nil
}

// Perturbative returns the period 2π/ω in fs at energy E (eV) of
// second-order Lindstedt–Poincaré theory for the reduced mass mu (u):
// T = T₀/(1 + δ) with T₀ the harmonic period and δ from PerturbativeShift.
// The expansion is in powers of E; it returns an error wrapping
// core.ErrDomain where it predicts ω ≤ 0 (far outside its range).
func Perturbative(w core.Well, mu, E float64) (float64, error) {
	d, err := PerturbativeShift(w, E)
	if err != nil {
		return 0, err
	}
	t0, err := Harmonic(w, mu)
	if err != nil {
		return 0, err
	}
	if !(1+d > 0) {
		return 0, fmt.Errorf("period: %w: the perturbative frequency ω₀(1 %+.3g) is not positive at E = %g eV: far outside the range of the expansion",
			core.ErrDomain, d, E)
	}
	return t0 / (1 + d), nil
}

// Integrator computes exact periods. It holds the Gauss–Legendre rules,
// computed once per node count on first use, and the buffers of its
// computations, so reuse one Integrator for many periods. It is safe for
// concurrent use and must not be copied.
type Integrator struct {
	s      Settings
	levels []level // rules of MinNodes·2^j nodes, up to MaxNodes

	// The buffers of passes not in use, kept for the next ones (a
	// sync.Pool would drop them at every garbage collection).
	mu   sync.Mutex
	free []*scratch
}

// level is a Gauss–Legendre rule on θ ∈ (−π/2, π/2), stored as sin θ and
// the weights.
type level struct {
	once sync.Once
	n    int
	sin  []float64
	w    []float64
}

func (l *level) init() {
	l.once.Do(func() {
		x := make([]float64, l.n)
		l.w = make([]float64, l.n)
		quad.Legendre{}.FixedLocations(x, l.w, -math.Pi/2, math.Pi/2)
		for i, t := range x {
			x[i] = math.Sin(t)
		}
		l.sin = x
	})
}

// NewIntegrator returns an integrator with settings s. It returns an error
// wrapping core.ErrParam for invalid settings.
func NewIntegrator(s Settings) (*Integrator, error) {
	s, err := s.resolved()
	if err != nil {
		return nil, err
	}
	in := &Integrator{s: s}
	for n := s.MinNodes; n <= s.MaxNodes; n *= 2 {
		in.levels = append(in.levels, level{n: n})
	}
	return in, nil
}

// Settings returns the settings of the integrator with the defaults filled
// in.
func (in *Integrator) Settings() Settings { return in.s }

// scratch holds the buffers of a pass, reused by the next.
type scratch struct {
	r, v, dv   []float64 // scan points, turning points, nodes; V, V′ there
	c          []float64 // Taylor coefficients of a pair call
	owner      []int
	sides      []side
	probs      []core.RootProblem
	rs         []float64
	errs       []error
	idx        []int
	es, in, on []float64
	xin, xon   []float64
	terrs      []error
	jobs       []job
	roots      core.RootWorkspace
}

// Exact returns the exact period T(E) in fs of the oscillation of energy E
// (eV, from the minimum) in the well w of p, for the reduced mass mu (u).
// See Integrator.Exact.
func Exact(p core.Potential, w core.Well, mu, E float64, s Settings) (Result, error) {
	in, err := NewIntegrator(s)
	if err != nil {
		return Result{}, err
	}
	return in.Exact(p, w, mu, E)
}

// Exact returns the exact period T(E) in fs of the oscillation of energy E
// (eV, from the minimum) in the well w of p, for the reduced mass mu (u).
//
// The turning points come from TurningPoints; the integral (see the package
// documentation) is evaluated by Gauss–Legendre rules of n = MinNodes,
// 2·MinNodes, … nodes, all V values of a rule in one p.Taylor call, until
// two successive rules agree to the tolerance. The value of the larger rule
// is returned, with the relative difference as its error estimate (a
// pessimistic one: the convergence is exponential).
//
// Accuracy. E − V(r) + V(re) is a difference of nearly equal numbers near
// the turning points (and, for small E, everywhere): V is known only to an
// absolute ε·|V|. Within a short distance of each turning point the
// integrand therefore comes from the Taylor expansion of V there (orders up
// to 5, from one p.Taylor call for all the turning points of a sweep),
// which has no cancellation;
// elsewhere from the batched values. The remaining rounding error comes
// from the location of the turning points; measured on the Morse closed form
// it is a few 1e-15 for 0.1 ≤ E/De ≤ 0.9, ≈ 2e-14 at E = 0.01·De, ≈ 3e-13
// at 1e-4·De and ≈ 1e-12 at 1e-8·De. ErrorEstimate is never below an estimate of it,
// 16ε·√((|V(re)| + E)/E) plus the propagated error of the direct
// differences, and the doubling stops once two rules agree to that level.
// Close to the top of the well T(E) is ill-conditioned
// (E·T′/T = E/(2(De − E)) for Morse), which no quadrature can cure.
//
// Small E. When the rounding estimate exceeds both 1e-12 and the error of
// the perturbative period (of order δ², δ from PerturbativeShift), the
// perturbative period is returned instead, with SmallAmplitude set and
// ErrorEstimate δ²; for Morse this happens below E ≈ 3e-6·De, where both
// errors are ≈ 1e-12. T(0) is the harmonic period. A well without c₄ is
// always integrated.
//
// Errors wrap core.ErrParam (E < 0, μ ≤ 0), core.ErrDomain (no bound motion
// at E, see TurningPoints) or core.ErrNoConvergence (MaxNodes reached:
// the Result is still filled in, with its error estimate).
func (in *Integrator) Exact(p core.Potential, w core.Well, mu, E float64) (Result, error) {
	var (
		res  [1]Result
		errs [1]error
		es   = [1]float64{E}
	)
	sc := in.getScratch()
	in.pass(p, w, mu, es[:], res[:], errs[:], sc)
	in.putScratch(sc)
	return res[0], errs[0]
}

// getScratch returns buffers for a pass.
func (in *Integrator) getScratch() *scratch {
	in.mu.Lock()
	defer in.mu.Unlock()
	if n := len(in.free); n > 0 {
		sc := in.free[n-1]
		in.free = in.free[:n-1]
		return sc
	}
	return new(scratch)
}

// putScratch keeps the buffers sc for a later pass.
func (in *Integrator) putScratch(sc *scratch) {
	in.mu.Lock()
	in.free = append(in.free, sc)
	in.mu.Unlock()
}

// job is the quadrature of one energy of a pass.
type job struct {
	i      int // index of the energy in the pass
	E      float64
	lo, hi endExpansion
	round  float64 // the rule-independent rounding estimate
	prev   float64 // the period of the previous rule
}

// pass computes res[i], errs[i] = in.Exact(p, w, mu, energies[i]) for
// every i, with the work of all energies batched: the turning points of all
// in one scan and one Newton iteration at a time (see TurningPoints), the
// Taylor expansions at all turning points in one p.Taylor call, and the
// nodes of each rule for all energies still being integrated in one
// p.Taylor call. Each energy's arithmetic is its own, so that its result
// does not depend on the other energies of the pass.
func (in *Integrator) pass(p core.Potential, w core.Well, mu float64, energies []float64, res []Result, errs []error, sc *scratch) {
	for i := range res {
		res[i], errs[i] = Result{}, nil
	}
	fail := func(err error) {
		for i := range errs {
			errs[i] = err
		}
	}
	if err := checkWell(w, 2); err != nil {
		fail(err)
		return
	}
	if err := core.Positive.Check("reduced mass", mu); err != nil {
		fail(fmt.Errorf("period: %w", err))
		return
	}
	t0, err := Harmonic(w, mu)
	if err != nil {
		fail(err)
		return
	}
	ec := energyCheck{p: p, w: w}
	idx, es := sc.idx[:0], sc.es[:0]
	for i, E := range energies {
		if err := ec.check(E); err != nil {
			errs[i] = err
			continue
		}
		if E == 0 {
			res[i] = Result{Inner: w.Re, Outer: w.Re, Period: t0, SmallAmplitude: true}
			continue
		}
		idx, es = append(idx, i), append(es, E)
	}
	sc.idx, sc.es = idx, es
	if len(es) == 0 {
		return
	}
	sc.in, sc.on, sc.terrs = grow(sc.in, len(es)), grow(sc.on, len(es)), grows(sc.terrs, len(es))
	inner, outer, terrs := sc.in, sc.on, sc.terrs
	sc.xin, sc.xon = grow(sc.xin, len(es)), grow(sc.xon, len(es))
	xin, xon := sc.xin, sc.xon
	seriesTurningPoints(p, w, es, inner, outer, xin, xon, terrs, sc)
	if cap(sc.jobs) < len(es) {
		sc.jobs = make([]job, 0, len(es))
	}
	jobs := sc.jobs[:0]
	for k, i := range idx {
		if terrs[k] != nil {
			errs[i] = terrs[k]
			continue
		}
		E := es[k]
		res[i] = Result{Inner: inner[k], Outer: outer[k], Compression: -xin[k], Stretch: xon[k]}
		round := roundingEstimate(w, E)
		if len(w.Taylor) > 4 {
			if d, err := PerturbativeShift(w, E); err == nil && round > smallRounding && d*d < round && 1+d > 0 {
				res[i].Period, res[i].SmallAmplitude = t0/(1+d), true
				res[i].ErrorEstimate = d*d + 4*eps
				continue
			}
		}
		jb := job{i: i, E: E, round: round, prev: math.NaN()}
		jb.lo.at, jb.hi.at = inner[k], outer[k]
		jobs = append(jobs, jb)
	}
	sc.jobs = jobs
	jobs = newEnds(p, w, jobs, res, errs, sc)
	in.quadrature(p, w, mu, jobs, res, errs, sc)
}

// quadrature integrates every job with the rules of in, all nodes of a
// rule in one p.Taylor call, until two successive rules agree (see Exact).
func (in *Integrator) quadrature(p core.Potential, w core.Well, mu float64, jobs []job, res []Result, errs []error, sc *scratch) {
	scale := math.Sqrt(2*mu) * timeUnit()
	for j := range in.levels {
		if len(jobs) == 0 {
			return
		}
		lv := &in.levels[j]
		lv.init()
		n := lv.n
		sc.r, sc.v = grow(sc.r, n*len(jobs)), grow(sc.v, n*len(jobs))
		for a := range jobs {
			jb := &jobs[a]
			m := 0.5 * (jb.lo.at + jb.hi.at)
			h := 0.5 * (jb.hi.at - jb.lo.at)
			r := sc.r[a*n : (a+1)*n]
			for k, s := range lv.sin {
				r[k] = m + h*s
			}
		}
		var dropped map[int]bool
		err := batchGroups(p, 0, sc.r, sc.v, func(k int) int { return k / n }, func(a int, pe *core.PointError) {
			if dropped == nil {
				dropped = make(map[int]bool)
			}
			dropped[a] = true
			i := jobs[a].i
			res[i], errs[i] = Result{}, fmt.Errorf("period: potential at the quadrature nodes: %w", pe)
		})
		if err != nil {
			for a, jb := range jobs {
				if !dropped[a] {
					res[jb.i], errs[jb.i] = Result{}, fmt.Errorf("period: potential at the quadrature nodes: %w", err)
				}
			}
			return
		}
		next := jobs[:0]
		for a := range jobs {
			if dropped[a] {
				continue
			}
			jb := jobs[a]
			i := jb.i
			t, nodeRound, err := integrate(w, jb.E, &jb.lo, &jb.hi, lv, sc.r[a*n:(a+1)*n], sc.v[a*n:(a+1)*n])
			if err != nil {
				res[i], errs[i] = Result{}, err
				continue
			}
			round := math.Max(jb.round, nodeRound)
			t *= scale
			res[i].Period, res[i].Nodes = t, n
			if j > 0 {
				res[i].ErrorEstimate = math.Max(math.Abs(t-jb.prev)/t, round)
				if res[i].ErrorEstimate <= math.Max(in.s.Tolerance, round) {
					continue
				}
			}
			jb.prev = t
			next = append(next, jb)
		}
		jobs = next
	}
	for _, jb := range jobs {
		r := res[jb.i]
		errs[jb.i] = fmt.Errorf("period: %w: at E = %g eV the rules of %d and %d nodes differ by %.2g (relative), tolerance %g",
			core.ErrNoConvergence, jb.E, r.Nodes/2, r.Nodes, r.ErrorEstimate, in.s.Tolerance)
	}
}

// batchGroups stores the Taylor coefficients c_0…c_n of V at r[k] in
// v[k·(n+1) : (k+1)·(n+1)], where point k belongs to the group group(k),
// with one Taylor call. When p reports a *core.PointError, the group of
// that point is dropped, reported to drop with the index of the point
// within its group, and the other points are evaluated again. Any other
// error is returned.
func batchGroups(p core.Potential, n int, r, v []float64, group func(k int) int, drop func(g int, pe *core.PointError)) error {
	w := n + 1
	v = v[:w*len(r)]
	err := p.Taylor(n, r, v)
	if err == nil {
		return nil
	}
	pos := make([]int, len(r))
	for k := range pos {
		pos[k] = k
	}
	rr := append([]float64(nil), r...)
	vv := make([]float64, len(v))
	for {
		var pe *core.PointError
		if !errors.As(err, &pe) || pe.Index < 0 || pe.Index >= len(rr) {
			return err
		}
		bad := group(pos[pe.Index])
		within := 0
		for k := 0; k < pe.Index; k++ {
			if group(pos[k]) == bad {
				within++
			}
		}
		drop(bad, &core.PointError{Index: within, R: pe.R, Err: pe.Err})
		k := 0
		for j := range rr {
			if group(pos[j]) != bad {
				rr[k], pos[k] = rr[j], pos[j]
				k++
			}
		}
		rr, pos, vv = rr[:k], pos[:k], vv[:w*k]
		if k == 0 {
			return nil
		}
		if err = p.Taylor(n, rr, vv); err == nil {
			for j, k := range pos {
				copy(v[k*w:(k+1)*w], vv[j*w:(j+1)*w])
			}
			return nil
		}
	}
}

// smallRounding is the rounding estimate below which Exact always
// integrates: the perturbative period replaces the quadrature only where
// the latter is genuinely limited by rounding, not merely where δ happens
// to vanish (c₃ = c₄ = 0 with higher terms present).
const smallRounding = 1e-12

// eps is the float64 machine epsilon 2⁻⁵².
const eps = 0x1p-52

// roundingEstimate returns the part of the relative rounding error of the
// quadrature that does not depend on the rule: 16ε·√((|V(re)| + E)/E). It
// comes from the turning points, located to the rounding of
// V(r) − V(re) = E (absolute error ≈ ε·(|V(re)| + E)); the coefficient and
// the square root were calibrated on the Morse closed form for
// 1e-12 ≤ E/De ≤ 1 and bound the observed errors there (below that, Exact
// returns the perturbative period).
func roundingEstimate(w core.Well, E float64) float64 {
	return 16 * eps * math.Sqrt((math.Abs(w.Energy)+E)/E)
}

// endExpansion is the Taylor expansion of V at a turning point, for
// evaluating E − U(r) near it without cancellation.
type endExpansion struct {
	at    float64    // the turning point, Å
	d     [8]float64 // c_j(at) = V⁽ʲ⁾(at)/j! for j = 0, …, order
	order int        // highest term used
	reach float64    // nodes closer than this use the expansion, Å
}

// maxEndOrder is the highest derivative order used at the turning points:
// terms up to maxEndOrder−1, the last one estimating the truncation.
const maxEndOrder = 6

// newEnds fills in the expansions of V at the turning points of every job
// and returns the jobs that have them (the others get their error in
// errs). Within a distance d of a turning point r±, E − U(r) = V(r±) − V(r)
// (the turning point is where U = E) is evaluated as
// −Σ_{j=1}^{K} V⁽ʲ⁾(r±)tʲ/j!, t = r − r±, which has relative rounding error
// ε, instead of the direct difference, whose absolute error ε·|V| is a
// relative error ε·|V|/(|V′|·d) that grows without bound as d → 0. The
// reach is where the truncation error |V⁽ᴷ⁺¹⁾|d^{K+1}/(K+1)! equals the
// direct difference's rounding error 2ε·|V|, capped at the half-width h of
// the interval. The coefficients come from one p.Taylor call for all
// turning points.
func newEnds(p core.Potential, w core.Well, jobs []job, res []Result, errs []error, sc *scratch) []job {
	if len(jobs) == 0 {
		return jobs
	}
	top := min(maxEndOrder, p.MaxOrder())
	end := func(k int) *endExpansion {
		if k%2 == 0 {
			return &jobs[k/2].lo
		}
		return &jobs[k/2].hi
	}
	n := 2 * len(jobs)
	var dropped map[int]error
	failEnd := func(a int, err error) {
		if dropped == nil {
			dropped = make(map[int]error)
		}
		if _, ok := dropped[a]; !ok {
			dropped[a] = err
		}
	}
	sc.r, sc.v = grow(sc.r, n), grow(sc.v, n*(top+1))
	r, v := sc.r, sc.v
	for k := range n {
		r[k] = end(k).at
	}
	err := batchGroups(p, top, r, v, func(k int) int { return k / 2 }, func(a int, pe *core.PointError) {
		failEnd(a, fmt.Errorf("period: derivatives at the turning point %g Å: %w", pe.R, pe.Err))
	})
	if err != nil {
		for a := range jobs {
			failEnd(a, fmt.Errorf("period: derivatives at the turning points: %w", err))
		}
	} else {
		for k := range n {
			copy(end(k).d[:top+1], v[k*(top+1):(k+1)*(top+1)])
		}
	}
	out := jobs[:0]
	for a, jb := range jobs {
		if err, ok := dropped[a]; ok {
			res[jb.i], errs[jb.i] = Result{}, err
			continue
		}
		lo, hi := &jb.lo, &jb.hi
		lo.order, hi.order = top-1, top-1
		vs := 2 * eps * (math.Abs(w.Energy) + jb.E)
		h := 0.5 * (hi.at - lo.at)
		last := math.Max(math.Abs(lo.d[top]), math.Abs(hi.d[top]))
		reach := h
		if top >= 2 && last > 0 {
			reach = math.Min(h, math.Pow(vs/last, 1/float64(top)))
		}
		if top < 2 {
			reach = 0
		}
		lo.reach, hi.reach = reach, reach
		out = append(out, jb)
	}
	return out
}

// slope returns (E − U(r))/d at the distance d ≥ 0 inside the interval
// from the turning point: −Σ_{j=1}^{K} V⁽ʲ⁾(r±)tʲ/(j!·d) with t = −d at the
// outer and t = d at the inner turning point. It is finite as d → 0, where
// it tends to |V′(r±)|.
func (e *endExpansion) slope(d float64, outer bool) float64 {
	t := d
	if outer {
		t = -d
	}
	s := 0.0
	for j := e.order; j >= 1; j-- {
		s = s*t + e.d[j]
	}
	if outer {
		return s
	}
	return -s
}

// integrate returns ∫ dθ/√g(r(θ)) over (−π/2, π/2) with the rule lv, in
// units where the period is √(2μ) times it, from the nodes r and V there.
//
// The integrand √((r₊ − r)(r − r₋)/(E − U(r))) is evaluated at the rounded
// nodes r themselves, with the distances to the turning points computed
// from them, so that it is a smooth function of r sampled at slightly
// shifted points rather than a ratio of inconsistent small numbers. Near
// the turning points E − U(r) comes from the expansions lo and hi.
func integrate(w core.Well, E float64, lo, hi *endExpansion, lv *level, rs, vs []float64) (sum, round float64, err error) {
	inner, outer := lo.at, hi.at
	top := E + w.Energy // V at the turning points
	noise := eps * (math.Abs(w.Energy) + E)
	for k, r := range rs {
		dp, dm := outer-r, r-inner
		var f float64
		switch {
		case dp <= dm && dp < hi.reach:
			f = math.Sqrt(dm / hi.slope(dp, true))
		case dm < dp && dm < lo.reach:
			f = math.Sqrt(dp / lo.slope(dm, false))
		default:
			den := top - vs[k]
			f = math.Sqrt(dp * dm / den)
			round += lv.w[k] * f * noise / den
		}
		if !(f < math.Inf(1)) {
			return 0, 0, unbound("E − V(r) + V(re) ≤ 0 at r = %g Å between the turning points %g Å and %g Å at E = %g eV: "+
				"the motion is not confined to a single well", r, inner, outer, E)
		}
		sum += lv.w[k] * f
	}
	return sum, round / sum, nil
}
