// Package validity says how far from the minimum the truncated Taylor
// expansion of a well, V_n(r) = Σ_{k=0}^{n} c_k (r − re)^k for n = 2
// (harmonic), 3 (cubic) or 4 (quartic), still describes the real potential
// V, by two criteria at a relative tolerance τ (default 1%).
//
// Potential criterion: on each side of re (compression r < re, stretch
// r > re), the largest displacement s such that for every displacement up
// to s,
//
//	|V_n(r) − V(r)| ≤ τ·|V(r) − V(re)|.
//
// Period criterion: the largest oscillation energy E (from the minimum)
// such that for every energy up to E,
//
//	|T_n(E)/T(E) − 1| ≤ τ,
//
// where T is the exact period in V and T_n that in V_n (package period);
// for n = 2, T_n is the harmonic period 2π√(μ/k). An energy at which V_n
// has no bound motion (the cubic above its own maximum) counts as a
// violation. The ratio T_n/T does not depend on the reduced mass, so
// neither does the criterion. The range is reported as E in eV, as a
// fraction of the well depth, as the temperature E/k_B and as the turning
// points of the real potential at E.
//
// A range that is never violated is +Inf: the harmonic form at n = 2, for
// which the truncation is exact. Units: eV, Å, K.
package validity

import (
	"fmt"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/period"
)

// DefaultTolerance is the relative tolerance of the criteria when
// Settings.Tolerance is zero: 1%.
const DefaultTolerance = 0.01

// Settings controls the criteria. The zero value gives the defaults.
type Settings struct {
	// Tolerance is τ, the relative tolerance of both criteria, in
	// (0, 1). Zero means DefaultTolerance (0.01).
	Tolerance float64

	// Period controls the quadrature of the periods; the zero value
	// gives its defaults (relative accuracy 1e-12).
	Period period.Settings
}

func (s Settings) tolerance() (float64, error) {
	tol := s.Tolerance
	if tol == 0 {
		tol = DefaultTolerance
	}
	if !(tol > 0 && tol < 1) {
		return 0, fmt.Errorf("validity: %w: tolerance %g, must be in (0, 1)", core.ErrParam, tol)
	}
	return tol, nil
}

// Displacements is a range of the potential criterion: the largest
// compression (re − r) and stretch (r − re) in Å within which the
// criterion holds; +Inf on a side where it holds up to the edge of the
// domain (r → 0 or the Buckingham barrier on the compression side, 100·re
// on the stretch side).
type Displacements struct {
	Compression, Stretch float64
}

// EnergyRange is a range of the period criterion.
type EnergyRange struct {
	// Energy is the largest oscillation energy in eV, from the minimum;
	// +Inf when the criterion holds at every energy with bound motion.
	Energy float64
	// DepthFraction is Energy divided by the well depth; NaN for an
	// unbounded well.
	DepthFraction float64
	// Temperature is Energy/k_B in K.
	Temperature float64
	// Compression and Stretch are the distances re − r₋ and r₊ − re in
	// Å of the turning points of the real potential at Energy.
	Compression, Stretch float64
}

// Result holds both criteria for one order and tolerance.
type Result struct {
	Order     int
	Tolerance float64
	Potential Displacements
	Period    EnergyRange
}

// Analyze returns both criteria for the truncation of order n (2, 3 or 4)
// of the well w of p. See PotentialRange and PeriodRange.
func Analyze(p core.Potential, w core.Well, n int, s Settings) (Result, error) {
	tol, err := s.tolerance()
	if err != nil {
		return Result{}, err
	}
	d, err := PotentialRange(p, w, n, s)
	if err != nil {
		return Result{}, err
	}
	e, err := PeriodRange(p, w, n, s)
	if err != nil {
		return Result{}, err
	}
	return Result{Order: n, Tolerance: tol, Potential: d, Period: e}, nil
}

func checkOrder(n int) error {
	if n < 2 || n > 4 {
		return fmt.Errorf("validity: %w: order %d, must be 2, 3 or 4", core.ErrOrder, n)
	}
	return nil
}
