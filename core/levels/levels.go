// Package levels computes the quantum vibration–rotation levels of a pair:
// the bound eigenvalues E(v, J) of the radial Schrödinger equation
//
//	−ħ²/(2μ) χ″(r) + [V(r) + ħ²J(J+1)/(2μr²)] χ(r) = E χ(r),  χ(0) = 0,
//
// for a reduced mass μ, with the expectation values ⟨r⟩ and ⟨r²⟩ of each
// level.
//
// Method. The equation is discretised by the Colbert–Miller discrete
// variable representation (D. T. Colbert & W. H. Miller, J. Chem. Phys. 96,
// 1982 (1992)) and the dense symmetric Hamiltonian is diagonalised with
// gonum's LAPACK (tridiagonal reduction, QL eigenvalues, inverse iteration
// for the eigenvectors of the levels wanted). The DVR converges
// exponentially in the grid spacing for smooth potentials: on the H³⁵Cl-like
// Morse well all 28 levels agree with the closed form to 1e-10 cm⁻¹ on
// about 120 points, in under 10 ms (measured, bench_test.go). Cooley's
// Numerov shooting (J. W. Cooley, Math. Comp. 15, 363 (1961)) was not
// implemented: its error falls only as Δr⁴, roughly (kΔr)⁴/240 relative,
// which for 1e-6 cm⁻¹ here means some 10⁴ points per level or Richardson
// extrapolation (an estimate, not a measurement).
//
// The grid is chosen from the well: spacing Δr = π/(β·k_max), with k_max the
// largest local wave number √(2μ(E − V(re)))/ħ of the highest level sought;
// on both sides the grid runs into the classically forbidden region until
// the WKB decay exponent ∫κ dr of that level reaches a set value, or to the
// end of the domain (r → 0, where the radial DVR imposes χ(0) = 0, or an
// inner barrier, where a level whose wave function has not decayed is not a
// bound state and is refused). Beyond the outer turning points the grid is
// stretched by a smooth analytic map (mapped.go), so that the long tails of
// the highest levels cost few points. The grid is then refined — finer
// spacing and longer tails at once — until two successive grids agree to
// the tolerance; the difference of the last two grids (the largest of a
// level's and its neighbours') is the reported accuracy of each level, and
// the levels of the finer grid are returned. Under exponential convergence
// that difference bounds the error of the finer grid from above; the tests
// check it against closed forms.
//
// Units: energy eV (levels on the potential's own energy scale, so
// E − V(re) is the term value), length Å, mass u, and cm⁻¹ for the
// tolerance and accuracies. Constants are CODATA 2018 (package units).
package levels

import (
	"errors"
	"fmt"
	"math"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/units"
)

// Defaults of Settings.
const (
	// DefaultTolerance is the accuracy in cm⁻¹ that the levels are
	// converged to when Settings.Tolerance is zero.
	DefaultTolerance = 1e-6
	// DefaultMaxPoints is the largest grid used when Settings.MaxPoints is
	// zero. The dense Hamiltonian of n points takes 8n² bytes (32 MB at
	// 2000 points; the eigen-solver needs about three times that) and its
	// diagonalisation grows as n³.
	DefaultMaxPoints = 2000
	// MaxJ is the highest rotational quantum number accepted.
	MaxJ = 1000
)

// Settings controls Solve. The zero value asks for every bound vibrational
// level at J = 0 to DefaultTolerance.
type Settings struct {
	// Count is the number of vibrational levels v = 0 … Count−1 wanted at
	// each J. Zero means every bound level; a form that grows without
	// bound (harmonic) has no such limit, and Count must then be positive.
	Count int
	// JMax is the highest rotational quantum number: levels are computed
	// for J = 0 … JMax. Zero means J = 0 only.
	JMax int
	// Tolerance is the accuracy in cm⁻¹ to which every level is converged.
	// Zero means DefaultTolerance.
	Tolerance float64
	// MaxPoints is the largest grid allowed. Zero means DefaultMaxPoints.
	MaxPoints int
	// Well, when not nil, is the well of the potential as core.AnalyzeWell
	// found it (Taylor coefficients to at least c₂), which Solve then does
	// not analyse again — a saving of round trips for a plugin form.
	Well *core.Well
}

// Level is one bound level.
type Level struct {
	// V and J are the vibrational and rotational quantum numbers.
	V, J int
	// Energy is the eigenvalue in eV on the potential's own energy scale:
	// Energy − V(re) is the term value, Limit − Energy the binding energy.
	Energy float64
	// MeanR is ⟨r⟩ in Å and MeanSquareR ⟨r²⟩ in Å², so that
	// √(MeanSquareR − MeanR²) is the rms displacement.
	MeanR, MeanSquareR float64
	// Accuracy is the estimated error of Energy in cm⁻¹, and
	// MeanRAccuracy that of MeanR in Å: the differences between the two
	// finest grids (the largest of this level's and its neighbours').
	Accuracy      float64
	MeanRAccuracy float64
}

// Result holds the levels and the grid they were computed on.
type Result struct {
	// Levels is ordered by J, then v.
	Levels []Level
	// Mu is the reduced mass in u.
	Mu float64
	// Re is the equilibrium distance in Å and Minimum = V(re) in eV.
	Re, Minimum float64
	// Ceiling is the energy in eV below which levels are bound: the
	// dissociation limit, or the inner barrier's energy when that is lower
	// (Barrier true); +Inf for a form that grows without bound.
	Ceiling float64
	Barrier bool
	// BoundLevels is the number of bound vibrational levels at J = 0 in
	// Levels when Count is zero, −1 otherwise. Levels found bound but not
	// converged are counted in Unresolved instead, and a level bound so
	// weakly that its wave function outgrows every grid allowed is in
	// neither: BoundLevels + Unresolved is a lower bound.
	BoundLevels int
	// Unresolved is the number of levels, just below the ceiling, that the
	// largest grid allowed found bound but could not converge to the
	// tolerance; they are left out of Levels (Count zero only).
	Unresolved int
	// Accuracy is the largest Level.Accuracy in cm⁻¹.
	Accuracy float64
	// Points, Spacing (Å), RMin and RMax (Å) describe the final grid;
	// Spacing is that in the well, the smallest (the grid is stretched
	// beyond the outer turning points, see the package documentation).
	Points     int
	Spacing    float64
	RMin, RMax float64
	// Tolerance is the tolerance used, cm⁻¹.
	Tolerance float64
	// Grids is the number of grids diagonalised; Tail the WKB decay
	// exponent ∫κ dr at which the final grid's ends were placed.
	Grids int
	Tail  float64
}

// hbar2Over2u is ħ²/(2·1 u) in eV·Å².
const hbar2Over2u = units.ReducedPlanck * units.ReducedPlanck / (2 * units.Dalton * 1e-20) / units.ElectronVolt

// Numerical choices of the grid (tested by the convergence of the levels,
// not assumed): the first grid has β = firstBeta and tails of firstTail;
// each refinement multiplies β by betaStep and adds tailStep to the tails.
const (
	firstBeta = 1.6
	betaStep  = 1.2
	firstTail = 16.0
	tailStep  = 3.0
	// minTail is the decay exponent a level needs at both grid ends to
	// count as held by the grid.
	minTail = 12.0
	// probeFactor is the size of the uniform probe of the potential from
	// which a stretched grid is made, relative to the grid limit (it
	// costs only potential values).
	probeFactor = 64
	// maxRefinements bounds the refinement loop.
	maxRefinements = 12
)

// Solve returns the bound levels of the pair of reduced mass mu (u) in the
// well of p: for J = 0 … s.JMax, the lowest s.Count vibrational levels, or
// every bound one when s.Count is zero, each converged to s.Tolerance.
// Bound means below the ceiling: at J > 0 the quasi-bound levels above the
// dissociation limit, held only by the centrifugal barrier, are not
// returned.
//
// Errors wrap core.ErrParam for invalid settings, for a form without bound
// (harmonic) with Count zero, for a request beyond the bound levels (more
// levels than the well holds, or levels above an inner barrier, which are
// not bound states) and for a well too shallow to hold a level; a grid that
// would exceed MaxPoints also wraps core.ErrParam. A well that cannot be
// analysed wraps the error of core.AnalyzeWell; levels that do not converge
// within the grid limit wrap core.ErrNoConvergence.
func Solve(p core.Potential, mu float64, s Settings) (*Result, error) {
	if err := core.Positive.Check("reduced mass", mu); err != nil {
		return nil, fmt.Errorf("levels: %w", err)
	}
	if s.Count < 0 {
		return nil, fmt.Errorf("levels: %w: level count %d is negative", core.ErrParam, s.Count)
	}
	if s.JMax < 0 || s.JMax > MaxJ {
		return nil, fmt.Errorf("levels: %w: J max %d outside 0…%d", core.ErrParam, s.JMax, MaxJ)
	}
	tol := s.Tolerance
	if tol == 0 {
		tol = DefaultTolerance
	}
	if !(tol > 0) || math.IsInf(tol, 1) {
		return nil, fmt.Errorf("levels: %w: tolerance %g cm⁻¹ must be finite and > 0", core.ErrParam, s.Tolerance)
	}
	maxPoints := s.MaxPoints
	if maxPoints == 0 {
		maxPoints = DefaultMaxPoints
	}
	if maxPoints < 16 {
		return nil, fmt.Errorf("levels: %w: grid limit %d points is below 16", core.ErrParam, s.MaxPoints)
	}
	var w core.Well
	if s.Well != nil {
		w = *s.Well
		if len(w.Taylor) < 3 || !(w.K > 0) {
			return nil, fmt.Errorf("levels: %w: the well given has no force constant", core.ErrParam)
		}
	} else {
		var err error
		if w, err = core.AnalyzeWell(p, core.WellSettings{Order: 2}); err != nil {
			return nil, fmt.Errorf("levels: %w", err)
		}
	}
	top, barrier, err := ceiling(p)
	if err != nil {
		return nil, fmt.Errorf("levels: %w", err)
	}
	if s.Count == 0 && math.IsInf(top, 1) {
		return nil, fmt.Errorf("levels: %w: the form grows without bound and has infinitely many levels: ask for a number of levels", core.ErrParam)
	}
	sv := &solver{
		p: p, mu: mu, c: hbar2Over2u / mu, re: w.Re, vmin: w.Energy, k: w.K,
		top: top, barrier: barrier,
		count: s.Count, jmax: s.JMax, tol: tol * units.WavenumberEV, maxPoints: maxPoints,
	}
	res, err := sv.run()
	if err != nil {
		return nil, fmt.Errorf("levels: %w", err)
	}
	res.Tolerance = tol
	return res, nil
}

// solver carries one Solve.
type solver struct {
	p           core.Potential
	mu, c       float64 // u; ħ²/(2μ) in eV·Å²
	re, vmin, k float64
	top         float64 // ceiling, eV
	barrier     bool
	count, jmax int
	tol         float64 // eV
	maxPoints   int
	grids       int // grids diagonalised
	// capped means the grid could not follow the highest levels further
	// out (Count zero): levels it does not hold are left out as
	// unresolved.
	capped bool
}

// spectrum is the wanted levels of every J on one grid.
type spectrum struct {
	g          *grid
	beta, tail float64
	e          [][]float64 // e[J][v], eV
	mom        [][]vecLevel
	// excess reports a wanted level that the grid does not hold (its
	// tail reaches the outer end), or fewer than Count levels; eHigh is
	// the highest such level's energy.
	excess bool
	eHigh  float64
	// short reports fewer than Count levels below the ceiling at some J.
	short bool
	// unheld counts, at J = 0, bound levels left out because the grid
	// does not hold them (capped only).
	unheld int
}

type vecLevel struct{ meanR, meanR2 float64 }

// spacing returns the grid spacing for levels up to energy e and factor β.
func (sv *solver) spacing(e, beta float64) float64 {
	kmax := math.Sqrt((e - sv.vmin) / sv.c)
	return math.Pi / (beta * kmax)
}

// run finds the extent of the grid, then refines it.
func (sv *solver) run() (*Result, error) {
	hw := units.HbarEVfs * units.AngularFrequency(sv.k, sv.mu) // ħω, eV
	rot := sv.c * float64(sv.jmax*(sv.jmax+1)) / (sv.re * sv.re)
	// eSpace is the energy whose local wave number fixes the spacing,
	// eTail the energy whose tails fix the extent.
	var eSpace, eTail float64
	if sv.count > 0 {
		eTail = sv.vmin + 1.2*hw*(float64(sv.count)+0.5) + rot
		if eTail >= sv.top {
			eTail = sv.vmin + 0.999*(sv.top-sv.vmin)
		}
		eSpace = eTail
	} else {
		// A bound level (E below the ceiling) has a local kinetic
		// energy E − V − ħ²J(J+1)/(2μr²) below top − V(re) at every J.
		eSpace = sv.top
		eTail = sv.vmin + 0.9*(sv.top-sv.vmin)
	}
	eSpace = math.Min(eSpace, sv.top)
	// Extent: raise eTail until every wanted level of the first grid is
	// held by it. When all bound levels are wanted (or a bounded well
	// shows fewer than Count), the grid is set up for levels up to the
	// ceiling, and the extent may use half the point budget, leaving room
	// for the refinements.
	all := sv.count == 0
	var sp *spectrum
	for it := 0; ; it++ {
		budget := sv.maxPoints
		if all {
			budget = sv.maxPoints / 2
		}
		g, err := sv.grid(firstBeta, firstTail, eSpace, eTail, budget)
		if errors.Is(err, errTooLarge) && all && sp != nil {
			sv.capped = true
			if sp, err = sv.levels(sp.g, firstBeta, firstTail); err != nil {
				return nil, err
			}
			break
		}
		if err != nil {
			return nil, sv.gridErr(err)
		}
		if sp, err = sv.levels(g, firstBeta, firstTail); err != nil {
			return nil, err
		}
		if sp.short && !all && !math.IsInf(sv.top, 1) {
			all = true
			eSpace = sv.top
			eTail = math.Max(eTail, sv.vmin+0.9*(sv.top-sv.vmin))
			continue
		}
		if !sp.excess && (!sp.short || all) {
			break
		}
		if it == 40 {
			return nil, fmt.Errorf("%w: no grid holds the levels asked for", core.ErrNoConvergence)
		}
		next := sp.eHigh
		if !(next > eTail) {
			if math.IsInf(sv.top, 1) {
				next = eTail + hw
			} else {
				next = eTail + 0.5*(sv.top-eTail)
			}
		}
		eTail = next
		if !all {
			eSpace = math.Max(eSpace, eTail)
		}
	}
	if err := sv.checkCount(sp); err != nil {
		return nil, err
	}
	// Refinement: finer spacing and longer tails at once, until two
	// successive grids agree.
	prev := sp
	var before *spectrum // the grid before prev
	var last [][]float64 // differences between prev and before
	for it := 0; ; it++ {
		beta, tail := prev.beta*betaStep, prev.tail+tailStep
		var next *spectrum
		g, err := sv.grid(beta, tail, eSpace, eTail, sv.maxPoints)
		if err == nil {
			next, err = sv.levels(g, beta, tail)
		}
		if err != nil && !errors.Is(err, errTooLarge) {
			return nil, err
		}
		if err != nil || it == maxRefinements {
			// No finer grid: the levels converged on the last two
			// grids are kept if the others are only the highest ones
			// of every J (barely bound, all bound levels wanted).
			if keep, ok := sv.converged(prev, last); ok {
				return sv.finish(prev, before, last, keep)
			}
			worst := math.Inf(1)
			if last != nil {
				worst = maxOf(last)
			}
			why := fmt.Sprintf("a finer grid would need more than %d points", sv.maxPoints)
			if err == nil {
				why = fmt.Sprintf("after %d refinements", it)
			}
			return nil, fmt.Errorf("%w: the levels differ by up to %.3g cm⁻¹ between the last two grids (tolerance %g cm⁻¹), and %s",
				core.ErrNoConvergence, worst/units.WavenumberEV, sv.tol/units.WavenumberEV, why)
		}
		diffs, same := compare(prev, next)
		if same && maxOf(diffs) <= sv.tol {
			return sv.finish(next, prev, diffs, nil)
		}
		if !same && sv.count == 0 && it >= 1 {
			// The levels common to both grids agree, but the number of
			// levels bound just below the ceiling depends on the grid:
			// those are left out as unresolved.
			keep := make([]int, len(diffs))
			ok := true
			for j := range diffs {
				keep[j] = min(len(prev.e[j]), len(next.e[j]))
				for v := 0; v < keep[j]; v++ {
					ok = ok && diffs[j][v] <= sv.tol
				}
			}
			if ok && keep[0] > 0 {
				return sv.finish(next, prev, diffs, keep)
			}
		}
		before, prev, last = prev, next, diffs
	}
}

// converged returns, for every J, the number of lowest levels of sp whose
// differences are within the tolerance, when every level beyond them is
// above them (the highest levels of each J) and all bound levels are
// wanted.
func (sv *solver) converged(sp *spectrum, diffs [][]float64) ([]int, bool) {
	if sv.count != 0 || diffs == nil {
		return nil, false
	}
	keep := make([]int, len(diffs))
	for j, d := range diffs {
		for keep[j] < len(d) && d[keep[j]] <= sv.tol {
			keep[j]++
		}
		for _, x := range d[keep[j]:] {
			if x <= sv.tol {
				return nil, false // a converged level above one that is not
			}
		}
	}
	if keep[0] == 0 {
		return nil, false
	}
	return keep, true
}

// maxOf returns the largest of the differences.
func maxOf(diffs [][]float64) float64 {
	worst := 0.0
	for _, d := range diffs {
		for _, x := range d {
			worst = math.Max(worst, x)
		}
	}
	return worst
}

// gridErr explains errTooLarge.
func (sv *solver) gridErr(err error) error {
	if errors.Is(err, errTooLarge) {
		return fmt.Errorf("%w: the grid would need more than %d points (the limit)", core.ErrParam, sv.maxPoints)
	}
	return err
}

// grid builds the grid of factor β and tails tail for levels up to eSpace
// (spacing) and eTail (extent).
func (sv *solver) grid(beta, tail, eSpace, eTail float64, maxPoints int) (*grid, error) {
	g, err := build(sv.p, sv.c, sv.re, eTail, sv.spacing(eSpace, beta), tail, probeFactor*maxPoints)
	if err != nil {
		return nil, err
	}
	if err := g.remap(sv.p, sv.c, sv.re, eSpace, eTail, beta); err != nil {
		return nil, err
	}
	if len(g.r) > maxPoints {
		return nil, errTooLarge
	}
	return g, nil
}

// levels diagonalises g for every J and keeps the wanted levels.
func (sv *solver) levels(g *grid, beta, tail float64) (*spectrum, error) {
	sp := &spectrum{g: g, beta: beta, tail: tail, e: make([][]float64, sv.jmax+1), eHigh: math.Inf(-1)}
	sp.mom = make([][]vecLevel, sv.jmax+1)
	want := func(vals []float64) int {
		n := countBelow(vals, sv.top)
		if sv.count > 0 {
			n = min(n, sv.count)
		}
		return n
	}
	sv.grids++
	for j := 0; j <= sv.jmax; j++ {
		if j > 0 && sv.count == 0 && len(sp.e[j-1]) == 0 {
			// E(v, J) rises with J: no level at J − 1, none above.
			break
		}
		vals, vecs, err := g.eigen(sv.c, j, want)
		if err != nil {
			return nil, err
		}
		for v, e := range vals {
			if sv.count > 0 && v >= sv.count {
				break
			}
			if !(e < sv.top) {
				break
			}
			in, out := g.tails(sv.c, j, e)
			if g.wall && in < minTail {
				// The wave function reaches the inner end of the
				// domain: above or too close to the barrier, not a
				// bound state.
				break
			}
			if out < minTail {
				if sv.capped {
					if j == 0 {
						sp.unheld = countBelow(vals[v:], sv.top)
					}
					break
				}
				sp.excess = true
				sp.eHigh = math.Max(sp.eHigh, e)
			}
			sp.e[j] = append(sp.e[j], e)
			sp.mom[j] = append(sp.mom[j], moments(g, vecs[v]))
		}
		if sv.count > 0 && len(sp.e[j]) < sv.count {
			sp.short = true
		}
	}
	return sp, nil
}

// countBelow returns the number of values below top.
func countBelow(vals []float64, top float64) int {
	n := 0
	for _, e := range vals {
		if e < top {
			n++
		}
	}
	return n
}

// moments returns ⟨r⟩ and ⟨r²⟩ of the eigenvector vec: in the DVR,
// Σ_k c_k² f(r_k) / Σ_k c_k².
func moments(g *grid, vec []float64) vecLevel {
	var m1, m2, norm float64
	for k, r := range g.r {
		c := vec[k]
		c2 := c * c
		norm += c2
		m1 += c2 * r
		m2 += c2 * r * r
	}
	return vecLevel{m1 / norm, m2 / norm}
}

// checkCount refuses requests beyond the bound levels.
func (sv *solver) checkCount(sp *spectrum) error {
	if len(sp.e[0]) == 0 {
		below := ""
		if sv.barrier {
			below = " below its inner barrier"
		}
		return fmt.Errorf("%w: the well (%.6g cm⁻¹ deep%s) is too shallow to hold a bound level for μ = %g u", core.ErrParam, (sv.top-sv.vmin)/units.WavenumberEV, below, sv.mu)
	}
	if sv.count == 0 {
		return nil
	}
	for j, e := range sp.e {
		if len(e) < sv.count {
			what := "below the dissociation limit"
			if sv.barrier {
				what = "below the inner barrier (levels above it are not bound states)"
			}
			return fmt.Errorf("%w: %d vibrational levels asked for at J = %d, but the well holds only %d %s", core.ErrParam, sv.count, j, len(e), what)
		}
	}
	return nil
}

// compare returns the differences in eV between the levels of b and those
// of a (+Inf for a level of b with no counterpart in a), and whether both
// have the same number of levels at every J.
func compare(a, b *spectrum) (diffs [][]float64, same bool) {
	same = true
	diffs = make([][]float64, len(b.e))
	for j := range b.e {
		diffs[j] = make([]float64, len(b.e[j]))
		for v, e := range b.e[j] {
			d := math.Inf(1)
			if v < len(a.e[j]) {
				d = math.Abs(e - a.e[j][v])
			}
			diffs[j][v] = d
		}
		same = same && len(a.e[j]) == len(b.e[j])
	}
	return diffs, same
}

// finish assembles the result from the levels of sp, with the differences
// from the previous grid as their accuracy: diffs for the energies, and
// prev for ⟨r⟩. With keep, only the lowest keep[J] of each J are kept.
func (sv *solver) finish(sp, prev *spectrum, diffs [][]float64, keep []int) (*Result, error) {
	g := sp.g
	res := &Result{
		Mu: sv.mu, Re: sv.re, Minimum: sv.vmin, Ceiling: sv.top, Barrier: sv.barrier,
		BoundLevels: -1, Points: len(g.r), Spacing: g.dx, RMin: g.r[0], RMax: g.r[len(g.r)-1],
		Grids: sv.grids, Tail: sp.tail,
	}
	// A single difference can vanish by accident where the error changes
	// sign from level to level: each estimate is the largest of the
	// level's and its neighbours'.
	near := func(d []float64, v int) float64 {
		x := d[v]
		if v > 0 {
			x = math.Max(x, d[v-1])
		}
		if v+1 < len(d) {
			x = math.Max(x, d[v+1])
		}
		return x
	}
	for j := range sp.e {
		n := len(sp.e[j])
		if keep != nil {
			n = min(n, keep[j])
		}
		dr := make([]float64, n)
		for v := range dr {
			dr[v] = math.Inf(1)
			if v < len(prev.mom[j]) {
				dr[v] = math.Abs(sp.mom[j][v].meanR - prev.mom[j][v].meanR)
			}
		}
		for v := 0; v < n; v++ {
			acc := near(diffs[j][:n], v) / units.WavenumberEV
			res.Levels = append(res.Levels, Level{
				V: v, J: j, Energy: sp.e[j][v],
				MeanR: sp.mom[j][v].meanR, MeanSquareR: sp.mom[j][v].meanR2,
				Accuracy: acc, MeanRAccuracy: near(dr, v),
			})
			res.Accuracy = math.Max(res.Accuracy, acc)
		}
		if j == 0 && sv.count == 0 {
			res.BoundLevels = n
			res.Unresolved = sp.unheld + len(sp.e[0]) - n
		}
	}
	if res.BoundLevels == 0 {
		return nil, fmt.Errorf("%w: no level converged at J = 0: the only level(s) the grids show lie so close to the dissociation limit that grids of up to %d points do not agree on them",
			core.ErrNoConvergence, sv.maxPoints)
	}
	return res, nil
}
