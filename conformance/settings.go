package conformance

import (
	"fmt"
	"math"

	"github.com/pairwell/pairwell/core"
)

// Defaults of Settings, used where a field is zero.
const (
	// DefaultPoints is the number of separations at which derivatives
	// are compared with finite differences.
	DefaultPoints = 64
	// MaxPoints bounds Points: the checks keep arrays of Points ×
	// (MaxOrder + 1) values per stencil, and 10⁴ separations already
	// resolve any feature of a pair potential.
	MaxPoints = 10_000
	// DefaultMaxOrder is the highest derivative order checked, when the
	// form claims that many.
	DefaultMaxOrder = 8
	// DefaultRangeLo and DefaultRangeHi bound the sampled separations in
	// multiples of the equilibrium distance re: [0.8·re, 3·re].
	DefaultRangeLo = 0.8
	DefaultRangeHi = 3.0
	// DefaultFallbackMin and DefaultFallbackMax bound the sampled
	// separations in Å for a form with no minimum and no declared
	// equilibrium distance: [0.5 Å, 5 Å], typical interatomic
	// separations.
	DefaultFallbackMin = 0.5
	DefaultFallbackMax = 5.0
	// DefaultDerivativeTolerance is the largest relative difference
	// allowed between an analytic derivative and its finite-difference
	// estimate (see the package documentation for the scale).
	DefaultDerivativeTolerance = 1e-7
	// DefaultEquilibriumTolerance bounds |V′(re)|/(V″(re)·re), the
	// relative shift of re implied by a residual V′.
	DefaultEquilibriumTolerance = 1e-10
	// DefaultIdentityTolerance is the relative tolerance of declared
	// identities.
	DefaultIdentityTolerance = 1e-9
	// DefaultAsymptoteFactor places the asymptote check at 10⁶·re.
	DefaultAsymptoteFactor = 1e6
	// DefaultAsymptoteTolerance bounds |V(r) − Limit| at the asymptote
	// check, relative to the well depth.
	DefaultAsymptoteTolerance = 1e-6
	// DefaultGoroutines is the number of goroutines evaluating at once
	// in the concurrency check.
	DefaultGoroutines = 8
	// RequiredOrder is the lowest MaxOrder a form may declare: pairwell's
	// well analysis reports the Taylor coefficients c₃ and c₄ by
	// default.
	RequiredOrder = 4
)

// Settings controls a conformance run. The zero value gives the defaults;
// every field's zero value is documented beside it.
type Settings struct {
	// Points is the number of separations, evenly spaced over the
	// sampled range, at which derivatives are checked. Zero means
	// DefaultPoints (64); at least 8.
	Points int

	// MaxOrder is the highest derivative order checked; a form that
	// claims fewer orders is checked up to its own MaxOrder. Zero means
	// DefaultMaxOrder (8).
	MaxOrder int

	// RangeLo and RangeHi bound the sampled separations as multiples of
	// the equilibrium distance re; the range is clipped into the domain
	// (at least 5% of the way from Domain.Min to re, and inside
	// Domain.Max). Zero means DefaultRangeLo (0.8) and DefaultRangeHi (3).
	RangeLo, RangeHi float64

	// RMin and RMax, in Å, override the sampled range when both are
	// set. Zero means the range follows from re, or for a form without
	// a minimum, [DefaultFallbackMin, DefaultFallbackMax] = [0.5, 5] Å.
	RMin, RMax float64

	// DerivativeTolerance is the tolerance of the finite-difference
	// comparison. Zero means DefaultDerivativeTolerance (1e-7).
	DerivativeTolerance float64

	// EquilibriumTolerance bounds |V′(re)|/(V″(re)·re). Zero means
	// DefaultEquilibriumTolerance (1e-10).
	EquilibriumTolerance float64

	// IdentityTolerance is the relative tolerance of declared
	// identities. Zero means DefaultIdentityTolerance (1e-9).
	IdentityTolerance float64

	// AsymptoteFactor places the asymptote check at AsymptoteFactor·re
	// (or just inside a finite Domain.Max). Zero means
	// DefaultAsymptoteFactor (10⁶).
	AsymptoteFactor float64

	// AsymptoteTolerance bounds |V − Domain.Limit| there, relative to
	// the well depth. Zero means DefaultAsymptoteTolerance (1e-6).
	AsymptoteTolerance float64

	// Goroutines is the number of goroutines of the concurrency check.
	// Zero means DefaultGoroutines (8).
	Goroutines int
}

// resolved returns s with zero fields replaced by the defaults, or an
// error wrapping core.ErrParam for a setting out of range.
func (s Settings) resolved() (Settings, error) {
	def := func(v *float64, d float64) {
		if *v == 0 {
			*v = d
		}
	}
	if s.Points == 0 {
		s.Points = DefaultPoints
	}
	if s.MaxOrder == 0 {
		s.MaxOrder = DefaultMaxOrder
	}
	if s.Goroutines == 0 {
		s.Goroutines = DefaultGoroutines
	}
	def(&s.RangeLo, DefaultRangeLo)
	def(&s.RangeHi, DefaultRangeHi)
	def(&s.DerivativeTolerance, DefaultDerivativeTolerance)
	def(&s.EquilibriumTolerance, DefaultEquilibriumTolerance)
	def(&s.IdentityTolerance, DefaultIdentityTolerance)
	def(&s.AsymptoteFactor, DefaultAsymptoteFactor)
	def(&s.AsymptoteTolerance, DefaultAsymptoteTolerance)
	bad := func(format string, a ...any) (Settings, error) {
		return s, fmt.Errorf("conformance settings: %w: "+format, append([]any{core.ErrParam}, a...)...)
	}
	pos := func(v float64) bool { return v > 0 && !math.IsInf(v, 1) }
	switch {
	case s.Points < 8 || s.Points > MaxPoints:
		return bad("Points %d, must be from 8 to %d", s.Points, MaxPoints)
	case s.MaxOrder < 1:
		return bad("MaxOrder %d, must be at least 1", s.MaxOrder)
	case s.Goroutines < 1:
		return bad("Goroutines %d, must be at least 1", s.Goroutines)
	case !pos(s.RangeLo) || !pos(s.RangeHi) || !(s.RangeLo < s.RangeHi):
		return bad("range [%g, %g]·re, must satisfy 0 < RangeLo < RangeHi", s.RangeLo, s.RangeHi)
	case (s.RMin != 0 || s.RMax != 0) && !(pos(s.RMin) && pos(s.RMax) && s.RMin < s.RMax):
		return bad("range [%g, %g] Å, must satisfy 0 < RMin < RMax", s.RMin, s.RMax)
	case !pos(s.DerivativeTolerance):
		return bad("DerivativeTolerance %g, must be > 0", s.DerivativeTolerance)
	case !pos(s.EquilibriumTolerance):
		return bad("EquilibriumTolerance %g, must be > 0", s.EquilibriumTolerance)
	case !pos(s.IdentityTolerance):
		return bad("IdentityTolerance %g, must be > 0", s.IdentityTolerance)
	case !pos(s.AsymptoteFactor) || s.AsymptoteFactor <= 1:
		return bad("AsymptoteFactor %g, must be > 1", s.AsymptoteFactor)
	case !pos(s.AsymptoteTolerance):
		return bad("AsymptoteTolerance %g, must be > 0", s.AsymptoteTolerance)
	}
	return s, nil
}
