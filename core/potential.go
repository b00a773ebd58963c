// Package core defines pairwell's pair-potential contract and the well
// analysis built on it.
//
// Units throughout: energy in eV, length in Å, mass in u (dalton), time in fs,
// wavenumber in cm⁻¹; derived quantities combine these (the n-th derivative of
// a potential is in eV/Åⁿ, a force constant in eV/Å²). Constants are CODATA
// 2018, see package units.
package core

import (
	"errors"
	"fmt"
	"math"
)

// Potential is a pair potential V(r) between two atoms a distance r apart,
// with analytic derivatives of every order up to MaxOrder.
//
// V is in eV, r in Å and the n-th derivative dⁿV/drⁿ in eV/Åⁿ. Implementations
// must be safe for concurrent use by multiple goroutines and deterministic:
// the same r and order always give the same bits, whichever method is used.
type Potential interface {
	// Derivatives stores V⁽ᵏ⁾(r) in dst[k] for k = 0, …, len(dst)−1.
	// It returns an error wrapping ErrDomain if r lies outside Domain,
	// or ErrOrder if len(dst)−1 exceeds MaxOrder.
	Derivatives(r float64, dst []float64) error

	// Batch stores V⁽ⁿ⁾(r[i]) in dst[i] for every i. len(dst) must equal
	// len(r); the caller owns both slices. This is the path for many points
	// at once and the one that must be used in hot loops: a potential may
	// live in another process, where a call costs a round trip. On error
	// the contents of dst are unspecified; a failure at a particular point
	// is reported as a *PointError.
	Batch(n int, r, dst []float64) error

	// Domain reports where the potential is usable.
	Domain() Domain

	// MaxOrder is the highest derivative order the potential evaluates
	// analytically.
	MaxOrder() int
}

// Domain describes the separations at which a potential is usable and its
// behaviour at long range.
type Domain struct {
	// Min is the smallest usable separation in Å, excluded. It is 0 for
	// forms defined for every r > 0. For a form that turns over at short
	// range (Buckingham) it is the position of the spurious inner maximum
	// and Barrier is true: below Min the form collapses to −∞ and is not
	// a physical model.
	Min float64

	// Max is the largest usable separation in Å, excluded (+Inf for forms
	// defined at every r > Min).
	Max float64

	// Barrier reports that Min is an inner maximum of V, so that V(Min)
	// bounds the energies at which motion in the well stays bound.
	Barrier bool

	// Limit is lim V(r) as r → ∞ in eV, the dissociation limit. It is
	// +Inf for forms that grow without bound (harmonic).
	Limit float64
}

// Contains reports whether r lies in the open interval (Min, Max).
func (d Domain) Contains(r float64) bool {
	return r > d.Min && r < d.Max
}

// Bounded reports whether the potential has a finite dissociation limit.
func (d Domain) Bounded() bool {
	return !math.IsInf(d.Limit, 0) && !math.IsNaN(d.Limit)
}

// Errors reported by potentials and the analysis on top of them. Returned
// errors wrap these so callers can test with errors.Is.
var (
	// ErrDomain means a separation is outside the potential's domain
	// (r ≤ 0, NaN, ±Inf, or beyond a barrier).
	ErrDomain = errors.New("separation outside the domain")
	// ErrOrder means a derivative order is negative or beyond MaxOrder.
	ErrOrder = errors.New("derivative order not supported")
	// ErrNoMinimum means the potential has no minimum in its domain.
	ErrNoMinimum = errors.New("no minimum")
	// ErrNoConvergence means an iterative method did not reach its
	// tolerance.
	ErrNoConvergence = errors.New("did not converge")
	// ErrParam means a parameter set is invalid.
	ErrParam = errors.New("invalid parameter")
	// ErrLength means slices passed to Batch differ in length.
	ErrLength = errors.New("slice lengths differ")
)

// PointError is the error of a batched evaluation at one point.
type PointError struct {
	Index int     // index into the r slice
	R     float64 // separation in Å
	Err   error
}

func (e *PointError) Error() string {
	return fmt.Sprintf("at r[%d] = %g Å: %v", e.Index, e.R, e.Err)
}

func (e *PointError) Unwrap() error { return e.Err }

// CheckR returns an error wrapping ErrDomain unless r lies in d. It is a
// helper for implementations.
func CheckR(d Domain, r float64) error {
	if !d.Contains(r) {
		if d.Barrier {
			return fmt.Errorf("r = %.10g Å: %w (%.10g Å, %g Å): below %.10g Å the form turns over and collapses", r, ErrDomain, d.Min, d.Max, d.Min)
		}
		return fmt.Errorf("r = %.10g Å: %w (%.10g Å, %g Å)", r, ErrDomain, d.Min, d.Max)
	}
	return nil
}

// CheckOrder returns an error wrapping ErrOrder unless 0 ≤ n ≤ max.
func CheckOrder(n, max int) error {
	if n < 0 || n > max {
		return fmt.Errorf("order %d: %w (0 to %d)", n, ErrOrder, max)
	}
	return nil
}

// Value returns V(r) in eV. It is a convenience over Derivatives.
func Value(p Potential, r float64) (float64, error) {
	var d [1]float64
	err := p.Derivatives(r, d[:])
	return d[0], err
}

// Derivative returns V⁽ⁿ⁾(r) in eV/Åⁿ. It is a convenience over Batch.
func Derivative(p Potential, n int, r float64) (float64, error) {
	var rr, d [1]float64
	rr[0] = r
	err := p.Batch(n, rr[:], d[:])
	return d[0], err
}
