// Package thermal computes the thermal expansion of a bond: the mean
// separation ⟨r⟩_T of the pair at temperature T classically, from the cubic
// Taylor term, and quantum mechanically from vibrational levels; the linear
// expansion coefficient and the root-mean-square displacement.
//
// Conventions. Temperatures in K, separations in Å, energies in eV
// (CODATA 2018 constants, package units). All averages are over the
// vibrational coordinate r alone (one dimension): rotation, and with it the
// centrifugal stretching of the bond and the r² of the three-dimensional
// volume element, is not included, so the three columns describe the same
// thing and can be compared.
//
// # Classical
//
//	⟨f⟩_T = ∫ f(r) e^{−βΔV(r)} dr / ∫ e^{−βΔV(r)} dr,   ΔV = V(r) − V(re), β = 1/(k_BT),
//
// over the bound region r₋ ≤ r ≤ r₊ where ΔV < E_cut = Cutoff·D, D the
// depth, or the height of an inner barrier above V(re) when lower
// (Buckingham); an unbounded well (harmonic) has no cut-off. In one
// dimension the weight of a bounded well does not vanish at long range
// (e^{−βD} per unit length out to infinity), so the average needs the
// cut-off; a temperature is refused unless the population at the cut-off
// is negligible: P_edge = e^{−βE_cut}·(r₊ − r₋)/∫e^{−βΔV}dr, the share of
// a strip as wide as the region at the cut-off's density, must not exceed
// MaxEdgePopulation (1e-6). Averages then depend on the cut-off by less
// than about P_edge·(r₊ − r₋).
//
// Where βE_cut > 80 the integration stops where ΔV first exceeds 80·k_BT
// (found on a geometric scan of ΔV outward from re), which drops less than
// e^{−80} of the weight. The integrals of x = r − re, x², ΔV and x·ΔV with
// weight e^{−βΔV} over [r₋, re] and [re, r₊] are Gauss–Legendre rules of
// 16, 32, … nodes, doubled until two successive rules agree to Tolerance;
// all nodes of a round of every temperature are evaluated in one batched
// call. ⟨r⟩ = re + ⟨x⟩, the expansion coefficient is
// (1/re)·d⟨r⟩/dT = (⟨x·ΔV⟩ − ⟨x⟩⟨ΔV⟩)/(re·k_B·T²) (exact differentiation
// of the Boltzmann average) and the rms displacement √(⟨x²⟩ − ⟨x⟩²) is the
// spread of r about its mean (the σ² of a pair distribution).
//
// # Cubic-term estimate
//
// For ΔV = c₂x² + c₃x³ + …, first-order perturbation theory in c₃ gives
//
//	⟨x⟩ = −3c₃k_BT/(4c₂²)
//
// (C. Kittel, Introduction to Solid State Physics, ch. 5, thermal
// expansion: U = cx² − gx³ − fx⁴ gives ⟨x⟩ = 3gk_BT/(4c²)); its expansion
// coefficient is −3c₃k_B/(4c₂²re) at every T and its rms displacement the
// harmonic √(k_BT/(2c₂)). For Morse, c₂ = De·a², c₃ = −De·a³ and
// ⟨x⟩ = 3k_BT/(4aDe).
//
// # Quantum
//
// Given the bound vibrational levels (J = 0) with their energies E_v and
// expectation values ⟨r⟩_v, ⟨r²⟩_v, the thermal average is the Boltzmann
// average over the levels: ⟨r⟩_T = Σ_v p_v⟨r⟩_v, p_v ∝ e^{−βE_v}, with
// d⟨r⟩/dT = (⟨rE⟩ − ⟨r⟩⟨E⟩)/(k_BT²) and the spread
// √(Σp_v⟨r²⟩_v − ⟨r⟩²). A temperature is refused when the levels above
// E_cut hold more than MaxEdgePopulation of the population.
package thermal

import (
	"fmt"
	"math"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/internal/gauss"
	"github.com/pairwell/pairwell/core/period"
	"github.com/pairwell/pairwell/core/units"
)

// Defaults of Settings and fixed parameters of the method.
const (
	// DefaultCutoff is E_cut as a fraction of the top of the well.
	DefaultCutoff = 0.9
	// DefaultMaxEdgePopulation is the largest population at the cut-off
	// accepted.
	DefaultMaxEdgePopulation = 1e-6
	// DefaultTolerance is the target relative error of the integrals.
	DefaultTolerance = 1e-12
	// DefaultMaxNodes caps the rule of a panel.
	DefaultMaxNodes = 4096
	minNodes        = 16
	// weightExponent is the βΔV beyond which the weight is dropped.
	weightExponent = 80
	// scanStart is the first displacement of the scan, relative to re;
	// the scan steps by 2^(1/4) up to the cut-off (or scanEnd·re).
	scanStart = 1e-7
	scanEnd   = 1e3
)

// Settings controls the computation. The zero value gives the defaults.
type Settings struct {
	// Cutoff is E_cut/D, in (0, 1]. Zero means DefaultCutoff (0.9).
	Cutoff float64
	// MaxEdgePopulation is the largest population at the cut-off accepted.
	// Zero means DefaultMaxEdgePopulation (1e-6).
	MaxEdgePopulation float64
	// Tolerance of the quadrature. Zero means DefaultTolerance (1e-12).
	Tolerance float64
	// MaxNodes caps the rule of each panel. Zero means DefaultMaxNodes.
	MaxNodes int
}

// Level is one vibrational level: its energy in eV (on the potential's
// scale) and the expectation values ⟨r⟩ in Å and ⟨r²⟩ in Å².
type Level struct {
	Energy, MeanR, MeanSquareR float64
}

// Point is the thermal expansion at one temperature. Separations are in Å,
// expansion coefficients in 1/K; NaN where a column has no value.
type Point struct {
	Temperature float64
	// Classical ⟨r⟩, its expansion coefficient (1/re)·d⟨r⟩/dT and rms
	// displacement √(⟨r²⟩ − ⟨r⟩²); ClassicalError the estimated error of
	// MeanClassical; EdgePopulation is P_edge (0 without a cut-off).
	MeanClassical, ExpansionClassical, RMSClassical, ClassicalError float64
	EdgePopulation                                                  float64
	// Cubic-term estimate re − 3c₃k_BT/(4c₂²), its coefficient and the
	// harmonic rms displacement √(k_BT/(2c₂)); the first two are NaN for a
	// form without analytic third derivatives (MaxOrder 2).
	MeanCubic, ExpansionCubic, RMSHarmonic float64
	// Quantum Boltzmann average over the levels (NaN without levels);
	// LevelsUsed is how many levels have a population above 1e-300.
	MeanQuantum, ExpansionQuantum, RMSQuantum float64
	LevelsUsed                                int
}

// Expansion computes the thermal expansion of one well. It holds the scan
// of the well and the Gauss–Legendre rules, so reuse it for many
// temperatures. It is safe for concurrent use.
type Expansion struct {
	p    core.Potential
	s    Settings
	w    core.Well
	ecut float64 // E_cut in eV above V(re); +Inf without a cut-off
	// cut turning points (NaN without a cut-off)
	lo, hi float64
	// scans outward from re on each side: displacement |x| and ΔV,
	// truncated at the first point beyond the cut.
	side  [2]scan
	rules []gauss.Rule
}

type scan struct {
	r, dv []float64
}

// New prepares the thermal expansion of the well of p. Errors wrap
// core.ErrParam (bad settings), core.ErrNoMinimum or the errors of the
// well analysis and of period.TurningPoints.
func New(p core.Potential, s Settings) (*Expansion, error) {
	if s.Cutoff == 0 {
		s.Cutoff = DefaultCutoff
	}
	if s.MaxEdgePopulation == 0 {
		s.MaxEdgePopulation = DefaultMaxEdgePopulation
	}
	if s.Tolerance == 0 {
		s.Tolerance = DefaultTolerance
	}
	if s.MaxNodes == 0 {
		s.MaxNodes = DefaultMaxNodes
	}
	switch {
	case !(s.Cutoff > 0 && s.Cutoff <= 1):
		return nil, fmt.Errorf("thermal: %w: cut-off %g, must be in (0, 1]", core.ErrParam, s.Cutoff)
	case !(s.MaxEdgePopulation > 0 && s.MaxEdgePopulation < 1):
		return nil, fmt.Errorf("thermal: %w: largest edge population %g, must be in (0, 1)", core.ErrParam, s.MaxEdgePopulation)
	case !(s.Tolerance > 0 && s.Tolerance < 0.1):
		return nil, fmt.Errorf("thermal: %w: tolerance %g, must be in (0, 0.1)", core.ErrParam, s.Tolerance)
	case s.MaxNodes < 2*minNodes:
		return nil, fmt.Errorf("thermal: %w: MaxNodes %d, must be ≥ %d", core.ErrParam, s.MaxNodes, 2*minNodes)
	}
	order := min(4, p.MaxOrder())
	w, err := core.AnalyzeWell(p, core.WellSettings{Order: max(order, 2)})
	if err != nil {
		return nil, fmt.Errorf("thermal: %w", err)
	}
	e := &Expansion{p: p, s: s, w: w, ecut: math.Inf(1), lo: math.NaN(), hi: math.NaN()}
	for n := minNodes; n <= s.MaxNodes; n *= 2 {
		e.rules = append(e.rules, gauss.Rule{N: n})
	}
	top := w.Depth
	if d := p.Domain(); d.Barrier {
		top = math.Min(top, d.BarrierEnergy-w.Energy)
	}
	if !math.IsInf(top, 1) {
		e.ecut = s.Cutoff * top
		if s.Cutoff == 1 {
			// The turning points at the very top do not exist (Morse's
			// outer one is at infinity): stay a hair below.
			e.ecut = math.Nextafter(top, 0) * (1 - 1e-9)
		}
		if e.lo, e.hi, err = period.TurningPoints(p, w, e.ecut); err != nil {
			return nil, fmt.Errorf("thermal: the bound region (ΔV < %.6g eV): %w", e.ecut, err)
		}
	}
	if err := e.scanWell(); err != nil {
		return nil, err
	}
	return e, nil
}

// Well returns the analysed well.
func (e *Expansion) Well() core.Well { return e.w }

// Cut returns E_cut in eV above V(re) and the bound region [lo, hi] in Å
// (+Inf and NaN, NaN for an unbounded well).
func (e *Expansion) Cut() (ecut, lo, hi float64) { return e.ecut, e.lo, e.hi }

// scanWell evaluates ΔV on the displacements re·scanStart·2^(k/4) on both
// sides (one batched call), each side truncated at the cut.
func (e *Expansion) scanWell() error {
	re := e.w.Re
	d := e.p.Domain()
	var r []float64
	var owner []int
	for s, sign := range []float64{-1, 1} {
		limit := e.lo
		if sign > 0 {
			limit = e.hi
		}
		for x := scanStart * re; x <= scanEnd*re; x *= math.Pow(2, 0.25) {
			rr := re + sign*x
			if !math.IsNaN(limit) && sign*(rr-limit) >= 0 {
				break
			}
			if !d.Contains(rr) {
				break
			}
			r, owner = append(r, rr), append(owner, s)
		}
	}
	dv := make([]float64, len(r))
	if err := evaluate(e.p, e.w.Energy, r, dv); err != nil {
		return err
	}
	for i := range r {
		sd := &e.side[owner[i]]
		sd.r, sd.dv = append(sd.r, r[i]), append(sd.dv, dv[i])
	}
	return nil
}

// limit returns the end of the integration on one side (0 compression, 1
// stretch) for β: the cut turning point, or the first scan point where ΔV
// exceeds 80/β (ΔV checked to grow monotonically up to there).
func (e *Expansion) limit(side int, beta float64) (float64, error) {
	sd := e.side[side]
	th := weightExponent / beta
	if th < e.ecut {
		prev := 0.0
		for i, v := range sd.dv {
			if v < prev {
				return 0, fmt.Errorf("thermal: %w: V − V(re) decreases at r = %.6g Å inside the well: not a single well", core.ErrDomain, sd.r[i])
			}
			prev = v
			if v >= th {
				return sd.r[i], nil
			}
		}
	}
	if side == 0 && !math.IsNaN(e.lo) {
		return e.lo, nil
	}
	if side == 1 && !math.IsNaN(e.hi) {
		return e.hi, nil
	}
	return 0, fmt.Errorf("thermal: %w: at k_BT = %.4g eV the weight e^{−ΔV/k_BT} is not negligible out to %g·re: temperature too high for this well",
		core.ErrDomain, 1/beta, scanEnd)
}

// sums are the weighted sums of a panel (weight e^{−βΔV}): s0 = ∫1,
// s1 = ∫x, a1 = ∫|x|, s2 = ∫x², se = ∫βΔV, sxe = ∫x·βΔV, axe = ∫|x|βΔV.
type sums struct{ s0, s1, a1, s2, se, sxe, axe float64 }

type panel struct {
	t         int
	a, b      float64
	level     int
	done      bool
	cur, prev sums
	valid     bool
}

// Points computes the thermal expansion at every temperature of temps (K)
// from the classical and cubic pictures and, when levels is not empty,
// from the levels (J = 0 vibrational levels of the well, in any order).
// Errors wrap core.ErrParam (a temperature ≤ 0 or not finite),
// core.ErrDomain (the population at the cut-off is not negligible, or the
// temperature is too high for the well) or core.ErrNoConvergence; the
// error names the first failing temperature.
func (e *Expansion) Points(temps []float64, levels []Level) ([]Point, error) {
	var panels []panel
	betas := make([]float64, len(temps))
	for i, T := range temps {
		if !(T > 0) || math.IsInf(T, 1) {
			return nil, fmt.Errorf("thermal: %w: temperature %g K, must be finite and > 0", core.ErrParam, T)
		}
		betas[i] = 1 / (units.BoltzmannEV * T)
		lo, err := e.limit(0, betas[i])
		if err != nil {
			return nil, fmt.Errorf("at %.6g K: %w", T, err)
		}
		hi, err := e.limit(1, betas[i])
		if err != nil {
			return nil, fmt.Errorf("at %.6g K: %w", T, err)
		}
		panels = append(panels, panel{t: i, a: lo, b: e.w.Re}, panel{t: i, a: e.w.Re, b: hi})
	}
	if err := e.integrate(temps, betas, panels); err != nil {
		return nil, err
	}
	out := make([]Point, len(temps))
	// A form without a third derivative has no cubic-term estimate (NaN).
	c2, c3 := e.w.Taylor[2], math.NaN()
	if len(e.w.Taylor) > 3 {
		c3 = e.w.Taylor[3]
	}
	eps := math.Nextafter(1, 2) - 1
	for i, T := range temps {
		a, b := panels[2*i], panels[2*i+1]
		var s, d sums
		for _, pn := range []panel{a, b} {
			s = add(s, pn.cur)
			d = add(d, diffs(pn.cur, pn.prev))
		}
		beta := betas[i]
		mx := s.s1 / s.s0
		mx2 := s.s2 / s.s0
		me := s.se / s.s0
		cov := s.sxe/s.s0 - mx*me
		p := Point{
			Temperature:        T,
			MeanClassical:      e.w.Re + mx,
			ExpansionClassical: cov / T / e.w.Re,
			RMSClassical:       math.Sqrt(math.Max(mx2-mx*mx, 0)),
			MeanCubic:          e.w.Re - 3*c3/(beta*4*c2*c2),
			ExpansionCubic:     -3*c3*units.BoltzmannEV/(4*c2*c2*e.w.Re) + 0, // + 0: no −0 for c₃ = 0
			RMSHarmonic:        math.Sqrt(1 / (beta * 2 * c2)),
			MeanQuantum:        math.NaN(),
			ExpansionQuantum:   math.NaN(),
			RMSQuantum:         math.NaN(),
		}
		// Error of ⟨x⟩ = s1/s0: the quadrature differences, and the
		// rounding of ΔV (ε·|V(re)| absolute, times β, on a weight
		// whose first moment is at most ⟨|x|⟩).
		round := eps * (math.Abs(e.w.Energy) + 1/beta) * beta * 8
		p.ClassicalError = (d.s1+math.Abs(mx)*d.s0)/s.s0 + round*s.a1/s.s0 + 4*eps*e.w.Re
		if !math.IsInf(e.ecut, 1) {
			p.EdgePopulation = math.Exp(-beta*e.ecut) * (e.hi - e.lo) / s.s0
			if p.EdgePopulation > e.s.MaxEdgePopulation {
				return nil, fmt.Errorf("thermal: %w: at %.6g K the population at the cut-off of the bound region (ΔV = %.4g eV, %.3g k_BT) is %.2g, more than %.2g: the pair is near dissociation (or the barrier) and ⟨r⟩ depends on where the well is cut; give a lower temperature",
					core.ErrDomain, T, e.ecut, beta*e.ecut, p.EdgePopulation, e.s.MaxEdgePopulation)
			}
		}
		// Where the well is cut changes ⟨r⟩ by about P_edge·(r₊ − r₋).
		p.ClassicalError += p.EdgePopulation * (e.hi - e.lo)
		if len(levels) > 0 {
			if err := e.quantum(&p, beta, levels); err != nil {
				return nil, fmt.Errorf("at %.6g K: %w", T, err)
			}
		}
		out[i] = p
	}
	return out, nil
}

// quantum fills the quantum columns of p from the levels.
func (e *Expansion) quantum(p *Point, beta float64, levels []Level) error {
	e0 := math.Inf(1)
	for _, l := range levels {
		e0 = math.Min(e0, l.Energy)
	}
	var z, zr, zr2, ze, zre, ztop, wtop float64
	used := 0
	etop := math.Inf(-1)
	for _, l := range levels {
		if l.Energy > etop {
			etop, wtop = l.Energy, math.Exp(-beta*(l.Energy-e0))
		}
		de := l.Energy - e0
		w := math.Exp(-beta * de)
		if w > 1e-300 {
			used++
		}
		z += w
		zr += w * (l.MeanR - e.w.Re)
		zr2 += w * l.MeanSquareR
		ze += w * beta * de
		zre += w * beta * de * (l.MeanR - e.w.Re)
		if l.Energy-e.w.Energy > e.ecut {
			ztop += w
		}
	}
	if ztop/z > e.s.MaxEdgePopulation {
		return fmt.Errorf("thermal: %w: the levels above the cut-off (%.4g eV above the minimum) hold %.2g of the population, more than %.2g: give a lower temperature",
			core.ErrDomain, e.ecut, ztop/z, e.s.MaxEdgePopulation)
	}
	if math.IsInf(e.ecut, 1) && wtop/z > e.s.MaxEdgePopulation {
		return fmt.Errorf("thermal: %w: the highest of the %d levels given holds %.2g of the population, more than %.2g: more levels are needed at this temperature",
			core.ErrDomain, len(levels), wtop/z, e.s.MaxEdgePopulation)
	}
	mx := zr / z
	p.MeanQuantum = e.w.Re + mx
	p.ExpansionQuantum = (zre/z - mx*ze/z) / p.Temperature / e.w.Re
	mr := p.MeanQuantum
	p.RMSQuantum = math.Sqrt(math.Max(zr2/z-mr*mr, 0))
	p.LevelsUsed = used
	return nil
}

// integrate runs the rounds of all panels, one batched call per round.
func (e *Expansion) integrate(temps, betas []float64, panels []panel) error {
	re := e.w.Re
	var r, wts, dv []float64
	var owner []int
	for {
		r, wts, owner = r[:0], wts[:0], owner[:0]
		for k := range panels {
			pn := &panels[k]
			if pn.done {
				continue
			}
			if pn.level >= len(e.rules) {
				return fmt.Errorf("thermal: at %.6g K: %w: the quadrature did not reach the tolerance %g with %d nodes",
					temps[pn.t], core.ErrNoConvergence, e.s.Tolerance, e.rules[len(e.rules)-1].N)
			}
			rx, rw := e.rules[pn.level].Nodes()
			h := (pn.b - pn.a) / 2
			for i, x := range rx {
				r = append(r, pn.a+h*(x+1))
				wts = append(wts, math.Abs(h)*rw[i])
				owner = append(owner, k)
			}
		}
		if len(r) == 0 {
			return nil
		}
		if cap(dv) < len(r) {
			dv = make([]float64, len(r))
		}
		dv = dv[:len(r)]
		if err := evaluate(e.p, e.w.Energy, r, dv); err != nil {
			return err
		}
		for k := range panels {
			if !panels[k].done {
				panels[k].cur = sums{}
			}
		}
		for i := range r {
			pn := &panels[owner[i]]
			bv := betas[pn.t] * dv[i]
			w := wts[i] * math.Exp(-bv)
			x := r[i] - re
			s := &pn.cur
			s.s0 += w
			s.s1 += w * x
			s.a1 += w * math.Abs(x)
			s.s2 += w * x * x
			s.se += w * bv
			s.sxe += w * x * bv
			s.axe += w * math.Abs(x) * bv
		}
		tol := e.s.Tolerance
		for k := 0; k < len(panels); k += 2 {
			pair := panels[k : k+2]
			tot := add(pair[0].cur, pair[1].cur)
			for j := range pair {
				pn := &pair[j]
				if pn.done {
					continue
				}
				if pn.valid {
					d := diffs(pn.cur, pn.prev)
					// ⟨x⟩ = s1/s0 to tol·⟨|x|⟩, and the covariance to
					// tol relative to its absolute terms.
					if d.s0 <= tol*tot.s0 && d.s1 <= tol*tot.a1 && d.s2 <= tol*tot.s2 && d.sxe <= tol*(tot.axe+tot.a1) {
						pn.done = true
						continue
					}
				}
				pn.prev, pn.valid = pn.cur, true
				pn.level++
			}
		}
	}
}

func add(a, b sums) sums {
	return sums{a.s0 + b.s0, a.s1 + b.s1, a.a1 + b.a1, a.s2 + b.s2, a.se + b.se, a.sxe + b.sxe, a.axe + b.axe}
}

func diffs(a, b sums) sums {
	return sums{math.Abs(a.s0 - b.s0), math.Abs(a.s1 - b.s1), math.Abs(a.a1 - b.a1), math.Abs(a.s2 - b.s2),
		math.Abs(a.se - b.se), math.Abs(a.sxe - b.sxe), math.Abs(a.axe - b.axe)}
}
