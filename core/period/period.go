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
	"sort"
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

	// deltaV is the absolute uncertainty of E − U in eV that acts like a
	// shift of E (see conditionFrom).
	deltaV float64
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
	// The same rule on (0, 1), for the split substitution (see
	// integrateSplit).
	x01, w01 []float64
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
		l.x01, l.w01 = make([]float64, l.n), make([]float64, l.n)
		quad.Legendre{}.FixedLocations(l.x01, l.w01, 0, 1)
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
	off, doff  []int
	at         []int
	ser        []bool
	rd, vd     []float64 // nodes of the direct jobs and V there
	gap, noise []float64 // E − U at the nodes and its rounding
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
// elsewhere from the batched values. For small E, where the relative
// rounding of the direct difference, 8ε·(|V(re)| + E)/E, exceeds 1e-13 and
// the Taylor series at re (core.Expansion, from w.Series) is more accurate
// at both turning points, the turning points, the end expansions and
// E − U at every node come from the series instead, without calling p;
// the error is then that of the series (its bound, which includes the
// uncertainty of the coefficients from the location of re, Well.ReError).
//
// Near the top of the well. Just below a maximum of V (an inner barrier)
// the turning point next to it is nearly double: E − U ≈ |V′|y(1 + y/d)
// at the distance y from it with d ≪ r₊ − r₋, and the period grows like
// ln(1/d). Such turning points (d < h/4) are integrated with the
// substitution y = d·sinh²u on each half of the interval (integrateSplit),
// which makes the integrand smooth and carries the logarithm in the length
// of the u interval, so the rules converge exponentially and their
// difference is a true estimate. T(E) itself is ill-conditioned there: the
// rounding of V, δV ≈ 8ε·(2|V(re)| + E), acts like a shift of E and moves
// T by |T′|·δV, without bound as E → E_top (E·T′/T = E/(2(De − E)) for
// Morse). ErrorEstimate includes that term: δV/(E_top − E) up to 0.99·E_top,
// above that |T′|·δV/T with T′ measured by the period at a second energy
// 1e-3·(E_top − E) lower (computed in the same batched calls).
//
// ErrorEstimate is the largest of the difference of the last two rules and
// the rounding estimates (8ε·(|V(re)| + E)/E for the direct evaluation,
// plus the propagated rounding of the direct differences at the nodes),
// plus the conditioning term. On the test grid of Morse, Lennard-Jones and
// Buckingham wells from 0.01 to 0.999999 of the top, against periods
// computed with mpmath at 40 digits (testdata/make_reference.py), it is
// never below the true error (worst ratio error/estimate ≈ 0.75); the
// worst error there is 1.5e-6, at 0.99999 of a barrier only 1.5e-6 eV
// high, where the estimate says 3.1e-6.
//
// Small E. When the rounding estimate exceeds both 1e-12 and the error of
// the perturbative period (of order δ², δ from PerturbativeShift), the
// perturbative period is returned instead, with SmallAmplitude set and
// ErrorEstimate δ²; with the series this happens only for wells whose
// series is too short (forms with few derivatives). T(0) is the harmonic
// period. A well without c₄ is always integrated.
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
	// split is set for a near-double turning point (see
	// integrateSplit): the rule then has two halves of n nodes each.
	split bool
	// series is set when E − U comes from the Taylor series at re
	// (core.Expansion) at every node: small E. lo.at and hi.at are then
	// the displacements x± = r± − re, the nodes are displacements, and
	// the potential is not called.
	series bool
	// noise is the absolute rounding error of E − U at a node evaluated
	// without the end expansions, eV.
	noise float64
	// ev evaluates the series at the nodes of a series job: the series
	// trimmed to the terms that matter between the turning points.
	ev core.Expansion
}

// points returns the number of quadrature nodes of the job for a rule of
// n nodes.
func (jb *job) points(n int) int {
	if jb.split {
		return 2 * n
	}
	return n
}

// nodes stores the nodes of the rule lv of jb in r (displacements for a
// series job).
func (jb *job) nodes(lv *level, r []float64) {
	if jb.split {
		splitNodes(jb, lv, r)
		return
	}
	m := 0.5 * (jb.lo.at + jb.hi.at)
	h := 0.5 * (jb.hi.at - jb.lo.at)
	for k, s := range lv.sin {
		r[k] = m + h*s
	}
}

// pass computes res[i], errs[i] = in.Exact(p, w, mu, energies[i]) for
// every i, with the work of all energies batched: the turning points of all
// in one scan and one Newton iteration at a time (see TurningPoints), the
// Taylor expansions at all turning points in one p.Taylor call, and the
// nodes of each rule for all energies still being integrated in one
// p.Taylor call. Each energy's arithmetic is its own, so that its result
// does not depend on the other energies of the pass.
func (in *Integrator) pass(p core.Potential, w core.Well, mu float64, energies []float64, res []Result, errs []error, sc *scratch) {
	ec := energyCheck{p: p, w: w}
	top := ec.top()
	var shadows []float64
	var of []int
	for i, E := range energies {
		if E > conditionFrom*top && E < top {
			shadows, of = append(shadows, E-shadowStep*(top-E)), append(of, i)
		}
	}
	if len(shadows) == 0 {
		in.passOne(p, w, mu, energies, res, errs, sc, &ec)
		return
	}
	n := len(energies)
	all := append(append(make([]float64, 0, n+len(shadows)), energies...), shadows...)
	ares, aerrs := make([]Result, len(all)), make([]error, len(all))
	in.passOne(p, w, mu, all, ares, aerrs, sc, &ec)
	copy(res, ares[:n])
	copy(errs, aerrs[:n])
	for k, i := range of {
		a, b := res[i], ares[n+k]
		if !(a.Period > 0 && b.Period > 0) || aerrs[n+k] != nil {
			continue
		}
		slope := math.Abs(a.Period-b.Period) / (energies[i] - shadows[k])
		res[i].ErrorEstimate += slope * a.deltaV / a.Period
	}
}

// The conditioning of T(E) near the top of the well. Rounding changes V
// by about δV = 8ε·(2|V(re)| + E_top) (V(re) and V at the turning points,
// each to 4 ulp), which shifts the effective energy by as much; T(E)
// then moves by |T′(E)|·δV, which grows without bound as E approaches the
// top E_top (T′/T = 1/(2(E_top − E)) for Morse, (1/2 + 1/n)/(E_top − E)
// near the top for a −C/rⁿ tail, 1/(2(E_top − E)·ln(…)) below an inner
// barrier). Up to conditionFrom·E_top the error estimate includes
// δV/(E_top − E), a bound on |T′|·δV/T for these shapes (conditionModel).
// Above, where the shapes differ most, pass computes the period at the
// shadow energy E − shadowStep·(E_top − E) too (in the same batched
// calls), estimates T′ by the difference and adds |T′|·δV/T instead.
const (
	conditionFrom = 0.99
	shadowStep    = 1e-3
)

// conditionModel returns dv/(E_top − E), see conditionFrom; 0 when the
// top is unbounded or E above conditionFrom·E_top.
func conditionModel(dv, top, E float64) float64 {
	if !(E <= conditionFrom*top) || math.IsInf(top, 1) {
		return 0
	}
	return dv / (top - E)
}

// passOne is pass without the conditioning term, with the energy check ec.
func (in *Integrator) passOne(p core.Potential, w core.Well, mu float64, energies []float64, res []Result, errs []error, sc *scratch, ec *energyCheck) {
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
	sc.ser = grows(sc.ser, len(es))
	ser := sc.ser
	ex := core.NewExpansion(w)
	seriesTurningPoints(p, w, ex, es, inner, outer, xin, xon, ser, terrs, sc)
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
		if ser[k] {
			jb := job{i: i, E: E, round: 16 * eps, prev: math.NaN(), series: true}
			jb.lo.at, jb.hi.at = xin[k], xon[k]
			_, b1 := ex.Sum(xin[k], 2)
			_, b2 := ex.Sum(xon[k], 2)
			jb.noise = math.Max(b1, b2)
			jb.ev = ex.Trim(math.Max(-xin[k], xon[k]))
			// The series' uncertainty (the coefficients at re as
			// located, see core.Expansion) is systematic, and felt by
			// the end expansions too.
			jb.round += jb.noise/E + conditionModel(jb.noise, ec.top(), E)
			res[i].deltaV = jb.noise
			jobs = append(jobs, jb)
			continue
		}
		dv := 8 * eps * (2*math.Abs(w.Energy) + math.Min(ec.top(), E))
		res[i].deltaV = dv
		round := roundingEstimate(w, E) + conditionModel(dv, ec.top(), E)
		if len(w.Taylor) > 4 {
			if d, err := PerturbativeShift(w, E); err == nil && round > smallRounding && d*d < round && 1+d > 0 {
				res[i].Period, res[i].SmallAmplitude = t0/(1+d), true
				res[i].ErrorEstimate = d*d + 4*eps
				continue
			}
		}
		jb := job{i: i, E: E, round: round, prev: math.NaN(), noise: eps * (math.Abs(w.Energy) + E)}
		jb.lo.at, jb.hi.at = inner[k], outer[k]
		jobs = append(jobs, jb)
	}
	sc.jobs = jobs
	jobs = newEnds(p, w, ex, jobs, res, errs, sc)
	in.quadrature(p, w, ex, mu, jobs, res, errs, sc)
}

// quadrature integrates every job with the rules of in, all nodes of a
// rule in one p.Taylor call (none for series jobs), until two successive
// rules agree (see Exact).
func (in *Integrator) quadrature(p core.Potential, w core.Well, ex core.Expansion, mu float64, jobs []job, res []Result, errs []error, sc *scratch) {
	scale := math.Sqrt(2*mu) * timeUnit()
	for j := range in.levels {
		if len(jobs) == 0 {
			return
		}
		lv := &in.levels[j]
		lv.init()
		n := lv.n
		sc.off = grows(sc.off, len(jobs)+1)
		off := sc.off
		for a := range jobs {
			off[a+1] = off[a] + jobs[a].points(n)
		}
		total := off[len(jobs)]
		sc.r, sc.v = grow(sc.r, total), grow(sc.v, total)
		sc.gap, sc.noise = grow(sc.gap, total), grow(sc.noise, total)
		// The potential at the nodes of the direct jobs, in one call.
		sc.rd, sc.vd, sc.at = sc.rd[:0], grow(sc.vd, 0), sc.at[:0]
		for a := range jobs {
			jb := &jobs[a]
			r := sc.r[off[a]:off[a+1]]
			jb.nodes(lv, r)
			if !jb.series {
				sc.rd = append(sc.rd, r...)
				sc.at = append(sc.at, a)
			}
		}
		var dropped map[int]bool
		if len(sc.rd) > 0 {
			sc.vd = grow(sc.vd, len(sc.rd))
			// doff[b] is the offset of the b-th direct job in rd.
			sc.doff = grows(sc.doff, len(sc.at)+1)
			for b, a := range sc.at {
				sc.doff[b+1] = sc.doff[b] + jobs[a].points(n)
			}
			doff := sc.doff
			group := func(k int) int {
				return sort.Search(len(sc.at), func(b int) bool { return doff[b+1] > k })
			}
			err := batchGroups(p, 0, sc.rd, sc.vd, group, func(b int, pe *core.PointError) {
				if dropped == nil {
					dropped = make(map[int]bool)
				}
				a := sc.at[b]
				dropped[a] = true
				i := jobs[a].i
				res[i], errs[i] = Result{}, fmt.Errorf("period: potential at the quadrature nodes: %w", pe)
			})
			if err != nil {
				if dropped == nil {
					dropped = make(map[int]bool)
				}
				for _, a := range sc.at {
					if !dropped[a] {
						dropped[a] = true
						res[jobs[a].i], errs[jobs[a].i] = Result{}, fmt.Errorf("period: potential at the quadrature nodes: %w", err)
					}
				}
			}
			for b, a := range sc.at {
				if dropped[a] {
					continue
				}
				top := jobs[a].E + w.Energy // V at the turning points
				gap, noise := sc.gap[off[a]:off[a+1]], sc.noise[off[a]:off[a+1]]
				for k, v := range sc.vd[doff[b]:doff[b+1]] {
					gap[k], noise[k] = top-v, jobs[a].noise
				}
			}
		}
		next := jobs[:0]
		for a := range jobs {
			if dropped[a] {
				continue
			}
			jb := jobs[a]
			i := jb.i
			r := sc.r[off[a]:off[a+1]]
			gap, noise := sc.gap[off[a]:off[a+1]], sc.noise[off[a]:off[a+1]]
			if jb.series {
				// The bound of the series grows with |x|: that at
				// the turning points covers every node.
				for k, x := range r {
					gap[k], noise[k] = jb.E-jb.ev.Value(x), jb.noise
				}
			}
			integ := integrate
			if jb.split {
				integ = integrateSplit
			}
			t, nodeRound, err := integ(jb.E, &jb.lo, &jb.hi, lv, r, gap, noise)
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
// quadrature from the values of V that does not depend on the rule:
// 16ε + 8ε·(|V(re)| + E)/E. The turning points are located to the
// rounding of V(r) − V(re) = E, and V(re) itself is rounded (each value of
// V to about 2 ulp, absolute error ≈ 4ε·(|V(re)| + E) on each side),
// which acts like a shift of E by as much: relative to E, and amplified by
// E·T′/T, which is O(1) away from the top of the well (the top is covered
// by the conditioning term, see pass). On the test grid (mpmath references
// for Morse, Lennard-Jones and Buckingham) it bounds the observed errors of
// the direct evaluation; small energies are integrated from the series
// instead, where it does not apply.
func roundingEstimate(w core.Well, E float64) float64 {
	return 16*eps + 8*eps*(math.Abs(w.Energy)+E)/E
}

// endExpansion is the Taylor expansion of V at a turning point, for
// evaluating E − U(r) near it without cancellation.
type endExpansion struct {
	at    float64    // the turning point, Å
	d     [8]float64 // c_j(at) = V⁽ʲ⁾(at)/j! for j = 0, …, order
	order int        // highest term used
	reach float64    // nodes closer than this use the expansion, Å
	scale float64    // d of the split substitution y = d·sinh²u, Å
}

// splitRatio is the ratio d/h below which a turning point counts as
// near-double (see doubleScale) and the period is integrated by
// integrateSplit.
const splitRatio = 0.25

// doubleScale returns d = |V′|/(−V″/2) at the turning point when V″ < 0
// there, else +Inf. With y the distance from the turning point into the
// interval, E − U ≈ |V′|·y·(1 + y/d): the continuation of E − U has a
// second root at the distance d outside the interval. A d small against
// the interval is a near-double turning point — E just below a maximum of
// V (an inner barrier) — where the integrand 1/√(E − U) ≈ 1/√(|V′|y(1 + y/d))
// varies on the scale d and the period grows like ln(1/d).
func (e *endExpansion) doubleScale() float64 {
	if !(e.d[2] < 0) {
		return math.Inf(1)
	}
	return math.Abs(e.d[1]) / -e.d[2]
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
func newEnds(p core.Potential, w core.Well, ex core.Expansion, jobs []job, res []Result, errs []error, sc *scratch) []job {
	if len(jobs) == 0 {
		return jobs
	}
	top := min(maxEndOrder, p.MaxOrder())
	var dropped map[int]error
	failEnd := func(a int, err error) {
		if dropped == nil {
			dropped = make(map[int]error)
		}
		if _, ok := dropped[a]; !ok {
			dropped[a] = err
		}
	}
	// The ends of the direct jobs, by index into jobs.
	ends := sc.at[:0]
	for a := range jobs {
		if !jobs[a].series {
			ends = append(ends, 2*a, 2*a+1)
		}
	}
	sc.at = ends
	end := func(k int) *endExpansion {
		if k%2 == 0 {
			return &jobs[k/2].lo
		}
		return &jobs[k/2].hi
	}
	if n := len(ends); n > 0 {
		sc.r, sc.v = grow(sc.r, n), grow(sc.v, n*(top+1))
		r, v := sc.r, sc.v
		for q, k := range ends {
			r[q] = end(k).at
		}
		err := batchGroups(p, top, r, v, func(q int) int { return ends[q] / 2 }, func(a int, pe *core.PointError) {
			failEnd(a, fmt.Errorf("period: derivatives at the turning point %g Å: %w", pe.R, pe.Err))
		})
		if err != nil {
			for _, k := range ends {
				failEnd(k/2, fmt.Errorf("period: derivatives at the turning points: %w", err))
			}
		} else {
			for q, k := range ends {
				copy(end(k).d[:top+1], v[q*(top+1):(q+1)*(top+1)])
			}
		}
	}
	out := jobs[:0]
	for a, jb := range jobs {
		if err, ok := dropped[a]; ok {
			res[jb.i], errs[jb.i] = Result{}, err
			continue
		}
		lo, hi := &jb.lo, &jb.hi
		jtop := top
		if jb.series {
			// The expansions at the ends from the series itself.
			jtop = min(maxEndOrder, ex.Order())
			for _, e := range []*endExpansion{lo, hi} {
				ex.Shift(e.at, e.d[:jtop+1])
				e.order = jtop - 1
			}
		} else {
			lo.order, hi.order = top-1, top-1
		}
		vs := 2 * jb.noise
		h := 0.5 * (hi.at - lo.at)
		last := math.Max(math.Abs(lo.d[jtop]), math.Abs(hi.d[jtop]))
		reach := h
		if jtop >= 2 && last > 0 {
			reach = math.Min(h, math.Pow(vs/last, 1/float64(jtop)))
		}
		if jtop < 2 {
			reach = 0
		}
		lo.reach, hi.reach = reach, reach
		jb.split = false
		if jtop >= 2 {
			dlo, dhi := lo.doubleScale(), hi.doubleScale()
			if math.Min(dlo, dhi) < splitRatio*h {
				jb.split = true
				lo.scale, hi.scale = math.Min(dlo, h), math.Min(dhi, h)
			}
		}
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
// units where the period is √(2μ) times it, from the nodes r, E − U(r)
// there (gaps) and its rounding error (noise).
//
// The integrand √((r₊ − r)(r − r₋)/(E − U(r))) is evaluated at the rounded
// nodes r themselves, with the distances to the turning points computed
// from them, so that it is a smooth function of r sampled at slightly
// shifted points rather than a ratio of inconsistent small numbers. Near
// the turning points E − U(r) comes from the expansions lo and hi.
func integrate(E float64, lo, hi *endExpansion, lv *level, rs, gaps, noise []float64) (sum, round float64, err error) {
	inner, outer := lo.at, hi.at
	for k, r := range rs {
		dp, dm := outer-r, r-inner
		var f float64
		switch {
		case dp <= dm && dp < hi.reach:
			f = math.Sqrt(dm / hi.slope(dp, true))
		case dm < dp && dm < lo.reach:
			f = math.Sqrt(dp / lo.slope(dm, false))
		default:
			den := gaps[k]
			f = math.Sqrt(dp * dm / den)
			round += lv.w[k] * f * noise[k] / den
		}
		if !(f < math.Inf(1)) {
			return 0, 0, unbound("E − V(r) + V(re) ≤ 0 between the turning points at E = %g eV: "+
				"the motion is not confined to a single well", E)
		}
		sum += lv.w[k] * f
	}
	return sum, round / sum, nil
}

// splitNodes lays out the nodes of the split rule of jb (see
// integrateSplit) in r: the n nodes of the inner half, then the n of the
// outer half.
func splitNodes(jb *job, lv *level, r []float64) {
	n := lv.n
	h := 0.5 * (jb.hi.at - jb.lo.at)
	for half, e := range []*endExpansion{&jb.lo, &jb.hi} {
		d := e.scale
		umax := math.Asinh(math.Sqrt(h / d))
		sgn := 1.0
		if half == 1 {
			sgn = -1
		}
		for k, x := range lv.x01 {
			sh := math.Sinh(umax * x)
			r[half*n+k] = e.at + sgn*d*sh*sh
		}
	}
}

// integrateSplit is integrate for a near-double turning point. The
// interval is split at its midpoint m; on each half the distance from the
// turning point is y = d·sinh²u, u ∈ (0, asinh√(h/d)), with d the scale of
// that end (doubleScale, at most h), so that
//
//	∫ dr/√(E − U) = ∫ 2√d·cosh u / √s(y) du,  s(y) = (E − U)/y,
//
// and for E − U ≈ |V′|y(1 + y/d) the integrand is the constant 2√(d/|V′|):
// the logarithmic growth of the period as E approaches the maximum is
// carried by the length of the u interval, which the Gauss–Legendre rule
// integrates exactly, instead of by a near-singularity next to the end of
// the θ interval, which would stall its convergence (and fool the
// comparison of successive rules). s(y) comes from the expansion of V at
// the turning point within its reach, else from the values of V.
func integrateSplit(E float64, lo, hi *endExpansion, lv *level, rs, gaps, noise []float64) (sum, round float64, err error) {
	n := lv.n
	h := 0.5 * (hi.at - lo.at)
	for half, e := range []*endExpansion{lo, hi} {
		d := e.scale
		umax := math.Asinh(math.Sqrt(h / d))
		outer := half == 1
		sqd := 2 * math.Sqrt(d)
		var part, pr float64
		for k, x := range lv.x01 {
			r := rs[half*n+k]
			y := r - e.at
			if outer {
				y = e.at - r
			}
			var sl float64
			direct := y >= e.reach
			if direct {
				sl = gaps[half*n+k] / y
			} else {
				sl = e.slope(y, outer)
			}
			f := sqd * math.Cosh(umax*x) / math.Sqrt(sl)
			if !(f < math.Inf(1)) {
				return 0, 0, unbound("E − V(r) + V(re) ≤ 0 between the turning points at E = %g eV: "+
					"the motion is not confined to a single well", E)
			}
			part += lv.w01[k] * f
			if direct {
				pr += lv.w01[k] * f * noise[half*n+k] / (sl * y)
			}
		}
		sum += umax * part
		round += umax * pr
	}
	return sum, round / sum, nil
}
