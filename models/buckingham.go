package models

import (
	"fmt"
	"math"

	"github.com/pairwell/pairwell/conformance"
	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/units"
)

const (
	buckinghamKey       = "buckingham"
	buckinghamReference = "R. A. Buckingham, Proc. R. Soc. Lond. A 168, 264 (1938)"
)

// Buckingham is the Buckingham (exp-6) model, key "buckingham":
//
//	V(r) = A e^{−r/ρ} − C/r⁶
//
// Parameters, in order: A (eV, > 0), rho (Å, > 0), C (eV·Å⁶, ≥ 0).
//
// The form turns over at short range: V′ vanishes at a spurious inner
// maximum r_b (the barrier) and at the minimum r_e, and V → −∞ as r → 0.
// With f(r) = r⁷V′(r) = 6C − (A/ρ)r⁷e^{−r/ρ}, whose second term peaks at
// r = 7ρ, a minimum exists iff (A/ρ)(7ρ)⁷e⁻⁷ > 6C, and then r_b < 7ρ < r_e.
// New requires a minimum (else an error wrapping core.ErrNoMinimum) and
// sets the domain to (r_b, +Inf) with Barrier true.
type Buckingham struct{}

// Info returns the metadata of the Buckingham form.
func (Buckingham) Info() core.ModelInfo {
	return core.ModelInfo{
		Key:     buckinghamKey,
		Name:    "Buckingham (exp-6)",
		Formula: "V = A exp(−r/rho) − C/r^6",
		Params: []core.Param{
			{Name: "A", Dimension: units.Energy, Constraint: core.Positive, Meaning: "repulsion prefactor"},
			{Name: "rho", Dimension: units.Length, Constraint: core.Positive, Meaning: "repulsion decay length"},
			{Name: "C", Dimension: units.Dispersion, Constraint: core.NonNegative, Meaning: "dispersion coefficient"},
		},
		Domain:    "r above the spurious inner maximum r_b (< 7 rho), below which the form collapses to −∞; V → 0 as r → ∞",
		Reference: buckinghamReference,
		Notes: "The parameter set must have a well: (A/rho)(7 rho)^7 e^−7 > 6C (so C > 0). " +
			"C is the attraction with a minus sign in front (C ≥ 0); some codes use b = 1/rho instead of rho.",
		MaxOrder: MaxOrder,
		Origin:   origin,
	}
}

// New builds a Buckingham potential from (A, rho, C), locating its barrier
// and minimum. A set without a minimum gives an error wrapping
// core.ErrNoMinimum.
func (m Buckingham) New(params []float64) (core.Potential, error) {
	if err := core.CheckParams(m.Info(), params); err != nil {
		return nil, err
	}
	return newBuckingham(params[0], params[1], params[2])
}

// NewBuckingham builds a Buckingham potential with prefactor A (eV), decay
// length rho (Å) and dispersion coefficient C (eV·Å⁶).
func NewBuckingham(A, rho, C float64) (*BuckinghamPotential, error) {
	p, err := Buckingham{}.New([]float64{A, rho, C})
	if err != nil {
		return nil, err
	}
	return p.(*BuckinghamPotential), nil
}

// maxNewton caps the Newton iterations of the root searches. Convergence
// is monotone (see buckinghamRoots) and quadratic except next to a double
// root, where it is linear at worst; 200 is far beyond what is needed.
const maxNewton = 200

// buckinghamRoots returns the zeros xb < 7 < xe of V′, in units of ρ, or
// ok = false if there is no minimum. With x = r/ρ, V′ = 0 is equivalent to
//
//	h(x) = L + 7 ln x − x = 0,  L = ln(Aρ⁶/(6C)),
//
// h is concave with its maximum at x = 7. Newton's method on a concave
// function converges monotonically from the side where h < 0, so xe is
// approached from the right in x and xb from the left in u = ln x (where
// h(u) = L + 7u − eᵘ is also concave), each iteration stopping when the
// step no longer moves towards the root. The logarithms keep everything
// finite for any representable A, ρ, C.
func buckinghamRoots(A, rho, C float64) (xb, xe, hmax float64, ok bool) {
	L := math.Log(A) + 6*math.Log(rho) - math.Log(6*C)
	hmax = L + 7*math.Log(7) - 7
	if !(hmax > 0) {
		return 0, 0, hmax, false
	}
	// Barrier: from u0 = −L/7, where h(u0) = −e^{u0} < 0 and u0 < ln 7 − 1.
	u := -L / 7
	for i := 0; i < maxNewton; i++ {
		eu := math.Exp(u)
		next := u - (L+7*u-eu)/(7-eu)
		if !(next > u) {
			break
		}
		u = next
	}
	// Minimum: from the first x = 14·2ᵏ with h(x) < 0.
	x := 14.0
	for L+7*math.Log(x)-x >= 0 {
		x *= 2
	}
	for i := 0; i < maxNewton; i++ {
		next := x - (L+7*math.Log(x)-x)/(7/x-1)
		if !(next < x) {
			break
		}
		x = next
	}
	return math.Exp(u), x, hmax, true
}

func newBuckingham(A, rho, C float64) (*BuckinghamPotential, error) {
	if C == 0 {
		return nil, fmt.Errorf("%s: %w: C = 0 leaves the purely repulsive A·exp(−r/rho): no well", buckinghamKey, core.ErrNoMinimum)
	}
	xb, xe, hmax, ok := buckinghamRoots(A, rho, C)
	if !ok {
		return nil, fmt.Errorf("%s: %w: the repulsion is too weak for the dispersion, so V′ > 0 everywhere and there is no well: "+
			"(A/rho)(7 rho)^7 e^−7 = %.6g × 6C, must exceed 6C (A = %g eV, rho = %g Å, C = %g eV·Å⁶)",
			buckinghamKey, core.ErrNoMinimum, math.Exp(hmax), A, rho, C)
	}
	p := &BuckinghamPotential{a: A, rho: rho, c: C, mInvRho: -1 / rho}
	// te[k] = (−1/ρ)ᵏ/k!, by te[k] = te[k−1]·(−1/ρ)/k.
	p.te[0] = 1
	for k := 1; k <= MaxOrder; k++ {
		p.te[k] = p.te[k-1] * p.mInvRho / float64(k)
	}
	// The logarithmic h adds rounding of ln terms to the roots; a few
	// Newton steps on V′ itself, kept only while |V′| decreases, bring
	// them to the conditioning of V′ (|V′| ≈ ε·6C/r⁷ at the root).
	p.rb = p.polish(xb * rho)
	p.re = p.polish(xe * rho)
	var c [1]float64
	p.row(p.rb, c[:])
	p.vb = c[0]
	return p, nil
}

// polish refines a zero r of V′ by Newton steps on V′, the step being
// c₁/(2c₂) = V′/V″.
func (p *BuckinghamPotential) polish(r float64) float64 {
	var c [3]float64
	p.row(r, c[:])
	d1 := c[1]
	for i := 0; i < 4 && d1 != 0; i++ {
		next := r - d1/(2*c[2])
		var nc [3]float64
		p.row(next, nc[:])
		if !(math.Abs(nc[1]) < math.Abs(d1)) {
			break
		}
		r, d1, c = next, nc[1], nc
	}
	return r
}

// Match returns (A, rho, C) whose minimum is at re with depth Depth and
// curvature K; all three are required. With u = ρ/re and κ = K·re²/Depth,
// V′(re) = 0 gives A e^{−re/ρ} = 6Cρ/re⁷, then V(re) = −Depth gives
// C = Depth·re⁶/(1 − 6u) and V″(re) = K gives 6κu² − (κ+42)u + 6 = 0. The
// quadratic is 6 at u = 0 and −κ/49 at u = 1/7, so it has exactly one
// root in (0, 1/7), the one that makes re the minimum (re > 7ρ) with
// C > 0; the other root exceeds 1/6 and would need C < 0. Then
// A = 6Cρ/re⁷·e^{re/ρ} = 6·Depth·u/(1 − 6u)·e^{1/u}. A target so stiff
// (κ ≳ 4000) that A overflows is an error wrapping core.ErrParam.
func (Buckingham) Match(t core.Target) ([]float64, []string, error) {
	if !positive(t.Re) || !positive(t.Depth) || !positive(t.K) {
		return nil, nil, fmt.Errorf("%s: %w: matching needs re, De and k, all > 0 (got re = %g Å, De = %g eV, k = %g eV/Å²)",
			buckinghamKey, core.ErrParam, t.Re, t.Depth, t.K)
	}
	kappa := t.K * t.Re * t.Re / t.Depth
	// Smaller root of 6κu² − (κ+42)u + 6 in the cancellation-free form
	// 2c/(b + √(b² − 4ac)); b² − 4ac = (κ−30)² + 864 > 0.
	d := kappa - 30
	u := 12 / (kappa + 42 + math.Sqrt(d*d+864))
	rho := u * t.Re
	C := t.Depth / (1 - 6*u) * math.Pow(t.Re, 6)
	A := 6 * t.Depth * u / (1 - 6*u) * math.Exp(1/u)
	params := []float64{A, rho, C}
	if !finite(A) || !finite(C) || !positive(rho) {
		return nil, nil, fmt.Errorf("%s: %w: target re = %g Å, De = %g eV, k = %g eV/Å² (k·re²/De = %g) needs A = %g, rho = %g, C = %g: out of float64 range",
			buckinghamKey, core.ErrParam, t.Re, t.Depth, t.K, kappa, A, rho, C)
	}
	if _, err := (Buckingham{}).New(params); err != nil {
		return nil, nil, fmt.Errorf("%s: %w: target re = %g Å, De = %g eV, k = %g eV/Å² gives an unusable set: %w",
			buckinghamKey, core.ErrParam, t.Re, t.Depth, t.K, err)
	}
	return params, nil, nil
}

// BuckinghamPotential is a Buckingham potential with a well. It is
// immutable and safe for concurrent use.
type BuckinghamPotential struct {
	a, rho, c float64
	mInvRho   float64 // −1/ρ
	rb, vb    float64 // barrier position and height
	re        float64 // minimum position
	// te[k] = (−1/ρ)ᵏ/k!, k = 0…MaxOrder.
	te [MaxOrder + 1]float64
}

// Params returns (A, rho, C).
func (p *BuckinghamPotential) Params() []float64 { return []float64{p.a, p.rho, p.c} }

// Domain is (r_b, +Inf) with Barrier true, BarrierEnergy V(r_b) and
// dissociation limit 0; the minimum r_e, the zero of V′ beyond 7ρ, is
// located to machine precision by New. Below r_b the form collapses to −∞.
func (p *BuckinghamPotential) Domain() core.Domain {
	return core.Domain{Min: p.rb, Max: math.Inf(1), Barrier: true, BarrierEnergy: p.vb, Limit: 0, EquilibriumGuess: p.re}
}

// MaxOrder returns MaxOrder.
func (p *BuckinghamPotential) MaxOrder() int { return MaxOrder }

// Identities returns r_e and, from V′(r_e) = 0 (A e^{−r_e/ρ} = 6Cρ/r_e⁷),
// V(r_e) = (C/r_e⁶)(6ρ/r_e − 1) and V″(r_e) = (6C/r_e⁷)(1/ρ − 7/r_e).
func (p *BuckinghamPotential) Identities() []conformance.Identity {
	const src = buckinghamReference + "; closed forms from V′(re) = 0"
	re, c, rho := p.re, p.c, p.rho
	re6 := re * re * re * re * re * re
	return []conformance.Identity{
		{Name: "r_e: zero of 6C − (A/ρ)r⁷e^{−r/ρ} beyond 7ρ", Quantity: conformance.EquilibriumR, Value: re, Source: src},
		{Name: "V(r_e) = (C/r_e⁶)(6ρ/r_e − 1)", Quantity: conformance.MinimumEnergy, Value: c / re6 * (6*rho/re - 1), Source: src},
		{Name: "V″(r_e) = (6C/r_e⁷)(1/ρ − 7/r_e)", Quantity: conformance.DerivativeAtMinimum, Order: 2, Value: 6 * c / (re6 * re) * (1/rho - 7/re), Source: src},
	}
}

// row stores c_0 … c_{len(row)−1} at r without checks: with
// e = A·e^{−r/ρ} and d = C/r⁶,
//
//	c_k = te[k]·e − binom6[k]·d·r⁻ᵏ,
//
// te[k] = (−1/ρ)ᵏ/k! and binom6[k] = (−1)ᵏ C(k+5, k), so that V and V′ are
// the products the closed form writes, (A·e^{−r/ρ})·(−1/ρ) − (−6·C/r⁶)/r.
// It returns NaN unless every coefficient is finite, 0 otherwise.
func (p *BuckinghamPotential) row(r float64, row []float64) float64 {
	inv := 1 / r
	i2 := inv * inv
	e := p.a * exp(r*p.mInvRho)
	d := p.c * (i2 * i2 * i2)
	te, b6 := p.te[:len(row)], binom6[:len(row)]
	pk, acc := 1.0, 0.0
	for k := range row {
		v := te[k]*e - b6[k]*d*pk
		row[k] = v
		acc += v - v
		pk *= inv
	}
	return acc
}

func (p *BuckinghamPotential) domainError(r float64) error {
	return fmt.Errorf("%s: %w", buckinghamKey, core.CheckR(p.Domain(), r))
}

// Taylor stores c_k(r[i]) = V⁽ᵏ⁾(r[i])/k! at dst[i·(n+1)+k] (see row).
func (p *BuckinghamPotential) Taylor(n int, r, dst []float64) error {
	if err := core.CheckTaylor(n, MaxOrder, len(r), len(dst)); err != nil {
		return fmt.Errorf("%s: %w", buckinghamKey, err)
	}
	w := n + 1
	for i, x := range r {
		if !(x > p.rb && x <= math.MaxFloat64) {
			return pointError(i, x, p.domainError(x))
		}
		row := dst[i*w : i*w+w]
		if p.row(x, row) != 0 {
			return pointError(i, x, firstOverflow(buckinghamKey, x, row))
		}
	}
	return nil
}
