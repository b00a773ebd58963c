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
// given by its Taylor expansion about every separation:
//
//	V(r + h) = Σ_k c_k(r) hᵏ,  c_k(r) = V⁽ᵏ⁾(r)/k!,
//
// with the normalized coefficients c_k in eV/Åᵏ known analytically up to
// k = MaxOrder. Normalized coefficients stay finite at orders where the raw
// derivatives V⁽ᵏ⁾ = k!·c_k overflow (a Morse c_k is bounded in k).
//
// Taylor is the one evaluation method: many separations at once, every
// order up to n at each. Value, Force, Derivative and DerivativeBatch are
// helpers over it. Implementations must be safe for concurrent use by
// multiple goroutines and deterministic: the same r and n always give the
// same bits, and a row of order n is the first n+1 values of the row of any
// higher order at the same r.
type Potential interface {
	// Taylor stores c_k(r[i]) = V⁽ᵏ⁾(r[i])/k! at dst[i·(n+1)+k] for every
	// i and k = 0, …, n: row-major, one row of n+1 coefficients per point.
	// The caller owns both slices; len(dst) must be (n+1)·len(r), else the
	// error wraps ErrLength; n outside 0…MaxOrder gives ErrOrder. This is
	// the path hot loops must use with many points per call: a potential
	// may live in another process, where a call costs a round trip. A
	// point outside Domain, or one whose coefficients overflow float64, is
	// reported as a *PointError wrapping ErrDomain; on error the contents
	// of dst are unspecified. Every value stored on success is finite.
	Taylor(n int, r, dst []float64) error

	// Domain reports where the potential is usable and what is known about
	// its well.
	Domain() Domain

	// MaxOrder is the highest Taylor order the potential evaluates
	// analytically.
	MaxOrder() int
}

// Domain describes the separations at which a potential is usable, its
// behaviour at long range and, where the form knows it, where its minimum
// lies. It is plain data, so a wrapper of a potential forwards all of it by
// forwarding Domain.
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

	// Barrier reports that Min is an inner maximum of V, so that
	// BarrierEnergy bounds the energies at which motion in the well stays
	// bound.
	Barrier bool

	// BarrierEnergy is V(Min) in eV when Barrier is true, the top of the
	// inner maximum; 0 otherwise.
	BarrierEnergy float64

	// Limit is lim V(r) as r → ∞ in eV, the dissociation limit. It is
	// +Inf for forms that grow without bound (harmonic).
	Limit float64

	// TailPower p > 0 declares that V approaches a finite Limit as a power
	// law, V − Limit ≈ C·r^−p, too slowly for V at one far point to show
	// the limit — a Coulomb-like 1/r tail (p = 1) as in the Kratzer form.
	// 0 means not declared: the approach is fast (exponential, or r^−6 and
	// faster). It documents the form and tells the conformance suite to
	// check the tail's power instead of the value at one far point; no
	// analysis depends on it. Plugins (protocol 2) cannot declare it.
	TailPower float64

	// EquilibriumGuess is an estimate in Å of the position of the minimum,
	// typically the closed form of the model; the well analysis starts its
	// bracket there and still verifies it. 0 means no estimate.
	EquilibriumGuess float64

	// Kinks lists separations in Å, in increasing order, at which V or
	// one of its derivatives is not continuous (a cutoff r_c, the start
	// r_on of a switch); at a kink the coefficients are those of the
	// outer side. Finite-difference stencils must not straddle one. Nil
	// for a form smooth over its whole domain.
	Kinks []float64
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
	// ErrLength means the slices passed to Taylor do not fit each other:
	// len(dst) ≠ (n+1)·len(r).
	ErrLength = errors.New("slice lengths do not fit")
	// ErrUnsupported means a model or potential does not offer an
	// optional capability (Matcher, ParamGradient); see Match and
	// ParamDerivatives.
	ErrUnsupported = errors.New("not supported by this form")
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

// CheckTaylor checks the arguments of a Taylor call: 0 ≤ n ≤ max (else
// ErrOrder) and nd = (n+1)·nr (else ErrLength), for nr separations and a
// destination of nd values; max is a MaxOrder, ≥ 0. It is a helper for
// implementations, cheap enough to be inlined.
func CheckTaylor(n, max, nr, nd int) error {
	if uint(n) <= uint(max) && nd == (n+1)*nr {
		return nil // the fast path, small enough to be inlined
	}
	return taylorArgsError(n, max, nr, nd)
}

func taylorArgsError(n, max, nr, nd int) error {
	if err := CheckOrder(n, max); err != nil {
		return err
	}
	return fmt.Errorf("%w: %d separations at order %d need %d values, dst has %d", ErrLength, nr, n, (n+1)*nr, nd)
}

// OverflowError is the error of an implementation whose coefficient c_k at
// r does not fit a float64; it wraps ErrDomain.
func OverflowError(r float64, k int) error {
	return fmt.Errorf("r = %g Å: %w: c_%d = V⁽%d⁾/%d! overflows float64", r, ErrDomain, k, k, k)
}

// maxFactorial is the largest n with n! finite in float64.
const maxFactorial = 170

// factorials[n] is n! for n = 0, …, 170, exact up to 22! and correctly
// rounded products beyond.
var factorials = func() *[maxFactorial + 1]float64 {
	var t [maxFactorial + 1]float64
	t[0] = 1
	for n := 1; n <= maxFactorial; n++ {
		t[n] = t[n-1] * float64(n)
	}
	return &t
}()

// Factorial returns n! as a float64: exact for n ≤ 22, +Inf for n > 170
// and NaN for n < 0. It converts a Taylor coefficient to a derivative,
// V⁽ⁿ⁾ = n!·c_n.
func Factorial(n int) float64 {
	switch {
	case n < 0:
		return math.NaN()
	case n > maxFactorial:
		return math.Inf(1)
	}
	return factorials[n]
}

// one evaluates the coefficients c_0…c_n of p at one separation r into
// c, which must hold n+1 values.
func one(p Potential, n int, r float64, c []float64) error {
	rr := [1]float64{r}
	err := p.Taylor(n, rr[:], c)
	var pe *PointError
	if errors.As(err, &pe) && pe.Err != nil {
		return pe.Err // the single point needs no index
	}
	return err
}

// Value returns V(r) in eV, from one Taylor call of order 0.
func Value(p Potential, r float64) (float64, error) {
	var c [1]float64
	err := one(p, 0, r, c[:])
	return c[0], err
}

// Force returns the force along r, F = −V′(r), in eV/Å: positive when the
// pair is pushed apart.
func Force(p Potential, r float64) (float64, error) {
	var c [2]float64
	if err := one(p, 1, r, c[:]); err != nil {
		return 0, err
	}
	return -c[1], nil
}

// Derivative returns V⁽ⁿ⁾(r) = n!·c_n(r) in eV/Åⁿ, from one Taylor call of
// order n. A derivative that overflows float64 although c_n does not is an
// error wrapping ErrDomain.
func Derivative(p Potential, n int, r float64) (float64, error) {
	if err := CheckOrder(n, p.MaxOrder()); err != nil {
		return 0, err
	}
	var buf [8]float64
	c := buf[:0]
	if n < len(buf) {
		c = buf[:n+1]
	} else {
		c = make([]float64, n+1)
	}
	if err := one(p, n, r, c); err != nil {
		return 0, err
	}
	return toDerivative(n, r, c[n])
}

// toDerivative returns n!·c, or an error if it overflows.
func toDerivative(n int, r, c float64) (float64, error) {
	if c == 0 {
		return 0, nil
	}
	v := c * Factorial(n)
	if math.IsInf(v, 0) || math.IsNaN(v) {
		return 0, fmt.Errorf("r = %g Å: %w: V⁽%d⁾ = %d!·c_%d overflows float64", r, ErrDomain, n, n, n)
	}
	return v, nil
}

// DerivativeBatch stores V⁽ⁿ⁾(r[i]) in eV/Åⁿ in dst[i] for every i, from
// one Taylor call of order n: for callers that need one order at many
// points. len(dst) must equal len(r) (else ErrLength). work is scratch for
// the (n+1)·len(r) coefficients: it is used when its capacity suffices and
// replaced by a new slice otherwise; DerivativeBatch returns it for reuse
// (pass nil to let it allocate). At order 0 dst itself is the scratch.
func DerivativeBatch(p Potential, n int, r, dst, work []float64) ([]float64, error) {
	if len(r) != len(dst) {
		return work, fmt.Errorf("%w: len(r) = %d, len(dst) = %d", ErrLength, len(r), len(dst))
	}
	if n == 0 {
		return work, p.Taylor(0, r, dst)
	}
	if err := CheckOrder(n, p.MaxOrder()); err != nil {
		return work, err
	}
	m := (n + 1) * len(r)
	if cap(work) < m {
		work = make([]float64, m)
	}
	work = work[:m]
	if err := p.Taylor(n, r, work); err != nil {
		return work, err
	}
	f := Factorial(n)
	for i := range dst {
		c := work[i*(n+1)+n]
		v := c * f
		if v-v != 0 { // ±Inf or NaN
			var err error
			if v, err = toDerivative(n, r[i], c); err != nil {
				return work, &PointError{Index: i, R: r[i], Err: err}
			}
		}
		dst[i] = v
	}
	return work, nil
}

// DerivativePair stores V⁽ʲ⁾(r[i]) in a[i] for every i and V⁽ʲ⁺¹⁾(r[i]) in
// b[i] for i < len(b) (b may be shorter than r, or empty), from one Taylor
// call of order j+1: V and V′ for j = 0, V′ and V″ for j = 1, as scans and
// batched root solves need them. len(a) must equal len(r) and len(b) must
// not exceed it (else ErrLength). work is scratch as for DerivativeBatch.
func DerivativePair(p Potential, j int, r, a, b, work []float64) ([]float64, error) {
	if len(a) != len(r) || len(b) > len(r) {
		return work, fmt.Errorf("%w: len(r) = %d, len(a) = %d, len(b) = %d", ErrLength, len(r), len(a), len(b))
	}
	if err := CheckOrder(j+1, p.MaxOrder()); err != nil {
		return work, err
	}
	w := j + 2
	m := w * len(r)
	if cap(work) < m {
		work = make([]float64, m)
	}
	work = work[:m]
	if err := p.Taylor(j+1, r, work); err != nil {
		return work, err
	}
	fa, fb := Factorial(j), Factorial(j+1)
	for i := range a {
		a[i] = work[i*w+j] * fa
	}
	for i := range b {
		b[i] = work[i*w+j+1] * fb
	}
	for i, x := range r {
		var err error
		if a[i]-a[i] != 0 { // ±Inf or NaN
			a[i], err = toDerivative(j, x, work[i*w+j])
		}
		if err == nil && i < len(b) && b[i]-b[i] != 0 {
			b[i], err = toDerivative(j+1, x, work[i*w+j+1])
		}
		if err != nil {
			return work, &PointError{Index: i, R: x, Err: err}
		}
	}
	return work, nil
}
