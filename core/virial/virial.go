// Package virial computes the second virial coefficient B₂(T) of a gas whose
// molecules interact through a pair potential: classically by quadrature,
// with the first quantum (Wigner–Kirkwood, order ħ²) correction, and the
// Boyle temperature and the temperature of the maximum of B₂.
//
// Conventions. Temperatures are in K, B₂ in cm³/mol, separations in Å,
// energies in eV and the reduced mass μ of the pair in u (CODATA 2018
// constants, package units). The potential is measured from its
// dissociation limit, V(r) − V(∞), so every bounded form can be used.
//
// # Classical B₂
//
//	B₂(T) = −2πN_A ∫₀^∞ (e^{−βV(r)} − 1) r² dr,   β = 1/(k_B T)
//
// (J. O. Hirschfelder, C. F. Curtiss & R. B. Bird, Molecular Theory of Gases
// and Liquids, Wiley 1954, ch. 3). The integral is split into
//
//   - the core r < r_c, where βV ≥ 50 (found on a scan of the repulsive wall
//     from re inward, every scanned point below r_c included): the integrand
//     is −1 to within e^{−50} ≈ 2e-22 and the core gives −r_c³/3 exactly,
//     with the bound e^{−βV(r_c)}·r_c³/3 on what is neglected. The potential
//     is never evaluated below r_c's scan point, so a wall that overflows
//     further in does no harm. The bound assumes that V stays above V(r_c)
//     between the scanned points below r_c (a repulsive wall; checked at the
//     scanned points only);
//   - the panels [r_c, re] and [re, 2re], by Gauss–Legendre rules in r;
//   - the tail r > R = 2re, by Gauss–Legendre rules in u = R/r ∈ (0, 1]:
//     ∫_R^∞ f r² dr = R³ ∫₀¹ f(R/u) u⁻⁴ du. There is no truncation: for a
//     tail V ≈ −C₆r⁻⁶ the integrand is ≈ βC₆R⁻³u² (a polynomial in u), for an
//     exponential tail it vanishes with all its derivatives at u = 0, so the
//     rules converge exponentially on the whole infinite range. A tail that
//     decays as r⁻³ or slower makes B₂ diverge and is refused (its local
//     exponent −r·V′/V is checked at r = 1000·re).
//
// The integrand e^{−βV} − 1 is computed with expm1 where |βV| < ½, so that
// the long-range tail keeps its digits. Each panel doubles its rule, from
// 16 nodes up to Settings.MaxNodes, until two successive rules agree to the
// tolerance relative to the sum of the magnitudes of all contributions
// (B₂ itself passes through zero at the Boyle temperature). All nodes of a
// round of every temperature are evaluated in one batched call per
// derivative order.
//
// The error estimate is the sum over panels of the difference between the
// last two rules (the value reported is the larger rule's, whose error is
// far smaller when the convergence is exponential), the core bound and a
// rounding estimate ε·(16 + 4β·depth)·(sum of magnitudes): the Boltzmann
// factor amplifies the rounding of V by β|V|.
//
// # Buckingham's collapse
//
// A form that turns over at short range (core.Domain.Barrier, Buckingham's
// spurious inner maximum at r_b) falls to −∞ below r_b, and its B₂ integral
// diverges at every temperature. By default the barrier is treated as a
// hard core: the integrand is −1 for r < r_b (Calculator.HardCore reports
// it, and commands must say so); where βV ≥ 50 is reached above r_b the
// treatment changes B₂ by less than e^{−50}. Settings.RefuseCollapse
// refuses such forms instead.
//
// # Quantum correction
//
// The Wigner–Kirkwood expansion of the Slater sum of the pair in powers of
// ħ² (relative motion of reduced mass μ) gives, after an integration by
// parts of the ∇²V term,
//
//	B₂ = B₂^cl + B₂^(1) + O(ħ⁴),
//	B₂^(1) = (π N_A ħ² β³ / (12 μ)) ∫₀^∞ e^{−βV} (dV/dr)² r² dr,
//
// which for like molecules of mass m (μ = m/2) is N_A h²/(24π m (k_BT)³)
// ∫ e^{−βV} V′² r² dr, the form of Hirschfelder, Curtiss & Bird (1954),
// ch. 6 (the first quantum correction to B(T); section number from
// memory). Derivation: the diagonal Slater sum is
// e^{−βV}[1 − (ħ²β²/(12μ))∇²V + (ħ²β³/(24μ))(∇V)² + O(ħ⁴)]; integrated over
// space, ∫ e^{−βV}∇²V = β ∫ e^{−βV}(∇V)², so the ħ² term is
// −(ħ²β³/(24μ)) ∫ e^{−βV}(∇V)² d³r, and B₂ = −(N_A/2) ∫ (W − 1) d³r.
// Exchange (the statistics of identical particles) and the ħ⁴ terms are
// not included: the expansion is for heavy or hot molecules (it fails for
// helium and hydrogen at low temperature). The core contributes at most
// e^{−βV(r_c)}·n·V(r_c)·r_c/β to the integral (n the local power of the
// wall), which is added to the error estimate.
package virial

import (
	"errors"
	"fmt"
	"math"
	"slices"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/internal/gauss"
	"github.com/pairwell/pairwell/core/units"
)

// Defaults of Settings and fixed parameters of the method.
const (
	// DefaultTolerance is the target relative error of B₂ (relative to
	// the sum of the magnitudes of its contributions).
	DefaultTolerance = 1e-10
	// DefaultMaxNodes caps the Gauss–Legendre rule of a panel.
	DefaultMaxNodes = 2048
	// minNodes is the rule a panel starts with.
	minNodes = 16
	// wallExponent is the βV above which the repulsive wall counts as a
	// hard core: e^{−50} ≈ 1.9e-22.
	wallExponent = 50
	// MaxReducedDepth is the largest β·depth accepted: beyond it
	// e^{β·depth} (and its products in the quadrature) come near the
	// float64 range. Such a pair is bound far more than a gas.
	MaxReducedDepth = 600
	// scanChunk and scanMaxPoints shape the wall scan: points
	// r_k = m + (re − m)·2^{−k/8}, k = 1, 2, …, evaluated 64 at a time.
	scanChunk     = 64
	scanMaxPoints = 320
	// tailFactor is R/re, where the tail substitution begins.
	tailFactor = 2
	// farFactor places the check of the tail's decay at farFactor·re.
	farFactor = 1000
	// minTailPower is the smallest local power −r·V′/V accepted at
	// farFactor·re: B₂ converges only for tails faster than r⁻³.
	minTailPower = 3.5
)

// cm3PerMolPerA3 is 1 Å³ per molecule in cm³/mol: N_A·10⁻²⁴.
const cm3PerMolPerA3 = units.Avogadro * 1e-24

// Settings controls the computation. The zero value gives the defaults.
type Settings struct {
	// Tolerance is the target relative error. Zero means
	// DefaultTolerance (1e-10).
	Tolerance float64
	// MaxNodes caps the rule of each panel. Zero means DefaultMaxNodes.
	MaxNodes int
	// RefuseCollapse refuses forms that collapse below an inner barrier
	// (Buckingham) instead of treating the barrier as a hard core.
	RefuseCollapse bool
}

// Point is B₂ at one temperature.
type Point struct {
	// Temperature in K.
	Temperature float64
	// Classical is the classical B₂ in cm³/mol.
	Classical float64
	// QuantumCorrection is the first Wigner–Kirkwood correction B₂^(1)
	// in cm³/mol; NaN without a mass.
	QuantumCorrection float64
	// Total is Classical + QuantumCorrection (Classical without a mass).
	Total float64
	// ErrorEstimate is the estimated absolute numerical error of Total
	// in cm³/mol (quadrature, core bound and rounding; the neglected ħ⁴
	// and exchange terms are a model error and not in it).
	ErrorEstimate float64
	// Slope and Curvature are dB₂^cl/dT in cm³/(mol·K) and d²B₂^cl/dT²
	// in cm³/(mol·K²), on the same nodes; SlopeError is the estimated
	// error of Slope.
	Slope, Curvature, SlopeError float64
	// Core is r_c in Å: below it the integrand is taken as −1 (the hard
	// core at a barrier, or where βV ≥ 50).
	Core float64
	// Nodes is the number of quadrature nodes used.
	Nodes int
}

// Calculator computes B₂ of one potential. It holds the scan of the
// repulsive wall and the Gauss–Legendre rules, so reuse it for many
// temperatures. It is safe for concurrent use.
type Calculator struct {
	p     core.Potential
	s     Settings
	limit float64 // V(∞), eV
	re    float64 // Å
	depth float64 // eV
	// hardCore is the barrier position r_b in Å (0 when the form has
	// none) and barrier V(r_b) − V(∞) in eV.
	hardCore, barrier float64
	// scanR are the wall scan points, decreasing from just below re;
	// scanMin[k] = min over j ≥ k of V(scanR[j]) − V(∞); scanPow[k] the
	// local power of the wall there.
	scanR, scanMin, scanPow []float64
	// scanReachesZero means the scan went down to r ≈ 0 with V finite:
	// below the last point the integrand is bounded and the panel may
	// start at r = 0.
	scanReachesZero bool
	rules           []gauss.Rule
	// kinks are Domain.Kinks beyond the wall (a cutoff r_c, the start of
	// a switch): panel ends, so that no rule straddles a jump of V or of
	// a derivative.
	kinks []float64
}

// New prepares the computation of B₂ for p. It returns an error wrapping
// core.ErrParam (bad settings), core.ErrNoMinimum (no well), or
// core.ErrDomain: a form without a finite dissociation limit (harmonic), a
// domain that ends at a finite separation, a tail decaying as r⁻³ or
// slower (B₂ diverges), or a collapse below a barrier with
// RefuseCollapse.
func New(p core.Potential, s Settings) (*Calculator, error) {
	if s.Tolerance == 0 {
		s.Tolerance = DefaultTolerance
	}
	if s.MaxNodes == 0 {
		s.MaxNodes = DefaultMaxNodes
	}
	if !(s.Tolerance > 0 && s.Tolerance < 0.1) {
		return nil, fmt.Errorf("virial: %w: tolerance %g, must be > 0 and < 0.1", core.ErrParam, s.Tolerance)
	}
	if s.MaxNodes < 2*minNodes {
		return nil, fmt.Errorf("virial: %w: MaxNodes %d, must be ≥ %d", core.ErrParam, s.MaxNodes, 2*minNodes)
	}
	d := p.Domain()
	if !d.Bounded() {
		return nil, fmt.Errorf("virial: %w: V grows without bound at long range, so B₂ diverges (it needs V → constant as r → ∞)", core.ErrDomain)
	}
	if !math.IsInf(d.Max, 1) {
		return nil, fmt.Errorf("virial: %w: the form is defined only below %g Å, B₂ needs V out to r → ∞", core.ErrDomain, d.Max)
	}
	if d.Barrier && s.RefuseCollapse {
		return nil, fmt.Errorf("virial: %w: the form collapses to −∞ below its inner barrier at %.6g Å, so B₂ diverges (refused; without the refusal the barrier is treated as a hard core)", core.ErrDomain, d.Min)
	}
	re, err := core.Equilibrium(p)
	if err != nil {
		return nil, fmt.Errorf("virial: %w", err)
	}
	c := &Calculator{p: p, s: s, limit: d.Limit, re: re, kinks: d.Kinks}
	for n := minNodes; n <= s.MaxNodes; n *= 2 {
		c.rules = append(c.rules, gauss.Rule{N: n})
	}
	var v [1]float64
	if err := evaluate(p, d.Limit, []float64{re}, v[:], nil); err != nil {
		return nil, err
	}
	c.depth = -v[0]
	if d.Barrier {
		c.hardCore = d.Min
		c.barrier = d.BarrierEnergy - d.Limit
	}
	if err := c.checkTail(); err != nil {
		return nil, err
	}
	if err := c.scanWall(); err != nil {
		return nil, err
	}
	return c, nil
}

// HardCore reports the radius r_b in Å and the barrier height V(r_b) − V(∞)
// in eV below which the integrand is taken as −1 because the form collapses
// there; ok is false for forms without an inner barrier.
func (c *Calculator) HardCore() (r, v float64, ok bool) {
	return c.hardCore, c.barrier, c.hardCore > 0
}

// Equilibrium returns re in Å and the depth V(∞) − V(re) in eV.
func (c *Calculator) Equilibrium() (re, depth float64) { return c.re, c.depth }

// checkTail refuses tails that decay as r⁻³ or slower.
func (c *Calculator) checkTail() error {
	r := []float64{farFactor * c.re}
	var v, dv [1]float64
	if err := evaluate(c.p, c.limit, r, v[:], dv[:]); err != nil {
		return err
	}
	if v[0] == 0 {
		return nil
	}
	n := r[0] * math.Abs(dv[0]) / math.Abs(v[0])
	if !(n >= minTailPower) {
		return fmt.Errorf("virial: %w: V − V(∞) decays as r^−%.3g at r = %g Å; B₂ diverges unless it falls faster than r⁻³", core.ErrDomain, n, r[0])
	}
	return nil
}

// scanWall scans V on the repulsive side, r_k = m + (re − m)·2^{−k/8}, in
// chunks of scanChunk points, until V − V(∞) exceeds 10⁶ times the depth,
// the domain's floor is approached to 2⁻⁴⁰ of re − m, or the form fails to
// evaluate (an overflow further in).
func (c *Calculator) scanWall() error {
	m := math.Max(c.p.Domain().Min, 0)
	var rs, vs []float64
	big := 1e6 * math.Max(c.depth, math.SmallestNonzeroFloat64)
	for k0 := 1; k0 <= scanMaxPoints; k0 += scanChunk {
		r := make([]float64, 0, scanChunk)
		for k := k0; k < k0+scanChunk && k <= scanMaxPoints; k++ {
			r = append(r, m+(c.re-m)*math.Exp2(-float64(k)/8))
		}
		v := make([]float64, len(r))
		err := evaluate(c.p, c.limit, r, v, nil)
		var pe *core.PointError
		if errors.As(err, &pe) && pe.Index > 0 && pe.Index < len(r) {
			// Keep the points before the failure: evaluate them again.
			r, v = r[:pe.Index], v[:pe.Index]
			err = evaluate(c.p, c.limit, r, v, nil)
		}
		if err != nil {
			if len(rs) == 0 && errors.As(err, &pe) {
				return err
			}
			break
		}
		rs, vs = append(rs, r...), append(vs, v...)
		if v[len(v)-1] > big || len(r) < scanChunk {
			break
		}
		if k0+scanChunk > scanMaxPoints {
			c.scanReachesZero = m == 0
		}
	}
	c.scanR = rs
	c.scanMin = make([]float64, len(vs))
	c.scanPow = make([]float64, len(vs))
	lo := math.Inf(1)
	for k := len(vs) - 1; k >= 0; k-- {
		lo = math.Min(lo, vs[k])
		c.scanMin[k] = lo
	}
	for k := range vs {
		// Local power −d ln V/d ln r from the neighbours (at least 1,
		// doubled to stay on the safe side of a steepening wall).
		j := min(k+1, len(vs)-1)
		i := max(j-1, 0)
		n := 12.0
		if i != j && vs[i] > 0 && vs[j] > 0 {
			n = math.Log(vs[j]/vs[i]) / math.Log(rs[i]/rs[j])
		}
		c.scanPow[k] = 2 * math.Max(n, 1)
	}
	return nil
}

// wall returns r_c for inverse temperature beta (1/eV): the largest scan
// point at and below which V − V(∞) ≥ 50/β, with vc the smallest V − V(∞)
// at or below it and pow the local power there; or the hard core, or 0.
func (c *Calculator) wall(beta float64) (rc, vc, pow float64, err error) {
	th := wallExponent / beta
	// scanMin is non-decreasing in k: find the first k with scanMin ≥ th.
	lo, hi := 0, len(c.scanMin)
	for lo < hi {
		mid := (lo + hi) / 2
		if c.scanMin[mid] >= th {
			hi = mid
		} else {
			lo = mid + 1
		}
	}
	if lo < len(c.scanMin) && (c.hardCore == 0 || c.scanR[lo] > c.hardCore) {
		return c.scanR[lo], c.scanMin[lo], c.scanPow[lo], nil
	}
	switch {
	case c.hardCore > 0:
		return c.hardCore, math.Inf(1), 0, nil
	case c.scanReachesZero:
		return 0, math.Inf(1), 0, nil
	}
	return 0, 0, 0, fmt.Errorf("virial: %w: at k_BT = %.4g eV the repulsive wall does not reach 50·k_BT where the form can be evaluated (down to %.4g Å): temperature too high for this form",
		core.ErrDomain, 1/beta, c.scanR[len(c.scanR)-1])
}

// panel is one quadrature panel of one temperature.
type panel struct {
	t          int     // index of the temperature
	a, b       float64 // ends in r; tail: a = R, b = +Inf
	tail       bool
	level      int
	done       bool
	prev, cur  sums
	prevValid  bool
	roundsUsed int
}

// sums are the weighted sums of a panel: s0 = ∫f r², a0 = ∫|f| r²,
// s1 = ∫e·βV r², a1 = ∫ e·|βV| r², s2 = ∫ e·((βV)² − 2βV) r²,
// sq = ∫ e·V′² r² (e = e^{−βV}, f = e − 1).
type sums struct {
	s0, a0, s1, a1, s2, sq float64
}

// temp is the state of one temperature.
type temp struct {
	T, beta   float64
	rc        float64
	coreBound float64 // bound on ∫_0^rc e^{−βV} r² dr
	qcore     float64 // bound on ∫_0^rc e^{−βV} V′² r² dr
	nodes     int
	err       error
	// panels[p0:p1] are this temperature's.
	p0, p1 int
}

// Points computes B₂ at every temperature of temps (K). mu is the reduced
// mass in u for the quantum correction, 0 for none. Errors wrap
// core.ErrParam (a temperature ≤ 0, NaN or infinite; μ < 0 or NaN),
// core.ErrDomain (a temperature so low that β·depth > MaxReducedDepth, or
// so high that the wall is not resolved) or core.ErrNoConvergence (a panel
// reached MaxNodes); the error names the first failing temperature.
func (c *Calculator) Points(temps []float64, mu float64) ([]Point, error) {
	if !(mu >= 0) || math.IsInf(mu, 1) {
		return nil, fmt.Errorf("virial: %w: reduced mass %g u, must be ≥ 0 (0: no quantum correction)", core.ErrParam, mu)
	}
	ts := make([]temp, len(temps))
	var panels []panel
	for i, T := range temps {
		if !(T > 0) || math.IsInf(T, 1) {
			return nil, fmt.Errorf("virial: %w: temperature %g K, must be finite and > 0", core.ErrParam, T)
		}
		beta := 1 / (units.BoltzmannEV * T)
		if beta*c.depth > MaxReducedDepth {
			return nil, fmt.Errorf("virial: %w: at %.6g K the well depth is %.4g k_BT (more than %d): e^{depth/k_BT} is out of range and the pairs are bound, not a gas; give a higher temperature",
				core.ErrDomain, T, beta*c.depth, MaxReducedDepth)
		}
		rc, vc, pow, err := c.wall(beta)
		if err != nil {
			return nil, fmt.Errorf("at %.6g K: %w", T, err)
		}
		if math.IsInf(vc, 1) && c.hardCore > 0 && mu > 0 {
			return nil, fmt.Errorf("virial: %w: at %.6g K the inner barrier (%.4g k_BT) is within reach, so the hard core put in its place decides B₂, and the ħ² correction of a hard core is not defined: give a lower temperature or no mass",
				core.ErrDomain, T, beta*c.barrier)
		}
		tp := temp{T: T, beta: beta, rc: rc}
		if !math.IsInf(vc, 1) {
			tp.coreBound = math.Exp(-beta*vc) * rc * rc * rc / 3
			tp.qcore = math.Exp(-beta*vc) * pow * vc * rc / beta
		}
		tp.p0 = len(panels)
		panels = c.appendPanels(panels, i, rc)
		tp.p1 = len(panels)
		ts[i] = tp
	}
	if err := c.integrate(ts, panels, mu > 0); err != nil {
		return nil, err
	}
	return c.assemble(ts, panels, mu)
}

// appendPanels appends the panels of temperature t from the wall end rc:
// [rc, re], [re, R] and the tail [R, ∞) with R = tailFactor·re, each split
// at the kinks of the form; a kink beyond R moves the start of the tail
// there.
func (c *Calculator) appendPanels(panels []panel, t int, rc float64) []panel {
	R := tailFactor * c.re
	ends := []float64{c.re, R}
	for _, k := range c.kinks {
		if k > rc && k != c.re && k != R {
			ends = append(ends, k)
			R = math.Max(R, k)
		}
	}
	slices.Sort(ends)
	a := rc
	for _, b := range ends {
		panels = append(panels, panel{t: t, a: a, b: b})
		a = b
	}
	return append(panels, panel{t: t, a: R, b: math.Inf(1), tail: true})
}

// integrate runs the rounds of all panels: each round evaluates the nodes
// of every panel not yet converged in one batched call per order.
func (c *Calculator) integrate(ts []temp, panels []panel, quantum bool) error {
	var r, wts, v, dv []float64
	var owner []int
	for {
		r, wts, owner = r[:0], wts[:0], owner[:0]
		for k := range panels {
			pn := &panels[k]
			if pn.done {
				continue
			}
			if pn.level >= len(c.rules) {
				t := ts[pn.t]
				return fmt.Errorf("virial: at %.6g K: %w: the quadrature did not reach the tolerance %g with %d nodes per panel",
					t.T, core.ErrNoConvergence, c.s.Tolerance, c.rules[len(c.rules)-1].N)
			}
			rx, rw := c.rules[pn.level].Nodes()
			for i, x := range rx {
				var rr, ww float64
				if pn.tail {
					u := (x + 1) / 2
					rr = pn.a / u
					ww = rw[i] / 2 * pn.a * pn.a * pn.a / (u * u * u * u)
				} else {
					h := (pn.b - pn.a) / 2
					rr = pn.a + h*(x+1)
					ww = h * rw[i] * rr * rr
				}
				r, wts, owner = append(r, rr), append(wts, ww), append(owner, k)
			}
		}
		if len(r) == 0 {
			return nil
		}
		v = grow(v, len(r))
		if quantum {
			dv = grow(dv, len(r))
		} else {
			dv = nil
		}
		if err := evaluate(c.p, c.limit, r, v, dv); err != nil {
			return err
		}
		for k := range panels {
			if !panels[k].done {
				panels[k].cur = sums{}
			}
		}
		for i := range r {
			pn := &panels[owner[i]]
			beta := ts[pn.t].beta
			bv := beta * v[i]
			e := math.Exp(-bv)
			f := e - 1
			if math.Abs(bv) < 0.5 {
				f = math.Expm1(-bv)
			}
			w := wts[i]
			s := &pn.cur
			s.s0 += w * f
			s.a0 += w * math.Abs(f)
			s.s1 += w * e * bv
			s.a1 += w * e * math.Abs(bv)
			s.s2 += w * e * (bv*bv - 2*bv)
			if dv != nil {
				s.sq += w * e * dv[i] * dv[i]
			}
		}
		for k := range panels {
			pn := &panels[k]
			if !pn.done {
				ts[pn.t].nodes += c.rules[pn.level].N
			}
		}
		c.checkRound(ts, panels, quantum)
	}
}

// checkRound marks the panels whose last two rules agree.
func (c *Calculator) checkRound(ts []temp, panels []panel, quantum bool) {
	for _, t := range ts {
		group := panels[t.p0:t.p1]
		scale := t.rc * t.rc * t.rc / 3
		scale1, scaleq := 0.0, 0.0
		for _, pn := range group {
			scale += pn.cur.a0
			scale1 += pn.cur.a1
			scaleq += pn.cur.sq
		}
		tol := c.s.Tolerance / float64(len(group))
		for k := range group {
			pn := &group[k]
			if pn.done {
				continue
			}
			if pn.prevValid {
				d := diff(pn.cur, pn.prev)
				if d.s0 <= tol*scale && d.s1 <= tol*scale1 && (!quantum || d.sq <= tol*scaleq) {
					pn.done = true
					continue
				}
			}
			pn.prev, pn.prevValid = pn.cur, true
			pn.level++
		}
	}
}

// diff returns the absolute differences of the sums.
func diff(a, b sums) sums {
	return sums{
		s0: math.Abs(a.s0 - b.s0), a0: math.Abs(a.a0 - b.a0), s1: math.Abs(a.s1 - b.s1),
		a1: math.Abs(a.a1 - b.a1), s2: math.Abs(a.s2 - b.s2), sq: math.Abs(a.sq - b.sq),
	}
}

// assemble turns the converged sums into points.
func (c *Calculator) assemble(ts []temp, panels []panel, mu float64) ([]Point, error) {
	eps := math.Nextafter(1, 2) - 1
	out := make([]Point, len(ts))
	for _, t := range ts {
		group := panels[t.p0:t.p1]
		I := -t.rc * t.rc * t.rc / 3
		scale := -I
		var s1, s2, sq, scaleq, scale1, errI, errQ, err1 float64
		for _, pn := range group {
			I += pn.cur.s0
			scale += pn.cur.a0
			s1 += pn.cur.s1
			s2 += pn.cur.s2
			sq += pn.cur.sq
			scaleq += pn.cur.sq
			scale1 += pn.cur.a1
			d := diff(pn.cur, pn.prev)
			errI += d.s0
			err1 += d.s1
			errQ += d.sq
		}
		round := eps * (16 + 4*t.beta*math.Max(c.depth, 0))
		errI += t.coreBound + round*scale
		K := 2 * math.Pi * cm3PerMolPerA3
		p := Point{
			Temperature:       t.T,
			Classical:         -K * I,
			QuantumCorrection: math.NaN(),
			Slope:             -K * s1 / t.T,
			Curvature:         -K * s2 / (t.T * t.T),
			SlopeError:        K * (err1 + round*scale1) / t.T,
			Core:              t.rc,
			Nodes:             t.nodes,
		}
		p.Total = p.Classical
		p.ErrorEstimate = K * errI
		if mu > 0 {
			wk := wignerKirkwood(mu, t.beta)
			p.QuantumCorrection = K * wk * sq
			p.Total += p.QuantumCorrection
			p.ErrorEstimate += K * wk * (errQ + t.qcore + round*scaleq)
		}
		out[group[0].t] = p
	}
	return out, nil
}

// wignerKirkwood returns ħ²β³/(24μ) in Å²/eV² for the reduced mass mu (u)
// and β (1/eV): the coefficient of −∫ e^{−βV}(∇V)² d³r in the ħ² term of
// the Slater sum, so that B₂^(1) = 2πN_A·wignerKirkwood·∫e^{−βV}V′²r²dr.
func wignerKirkwood(mu, beta float64) float64 {
	// ħ²/μ in eV·Å²: (eV·fs)² / (u in eV·fs²/Å²).
	const uInEVfs2PerA2 = units.Dalton * 1e10 / units.ElectronVolt
	h2mu := units.HbarEVfs * units.HbarEVfs / (mu * uInEVfs2PerA2)
	return h2mu * beta * beta * beta / 24
}

func grow(s []float64, n int) []float64 {
	if cap(s) < n {
		return make([]float64, n)
	}
	return s[:n]
}
