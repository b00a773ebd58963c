package models

import (
	"fmt"
	"math"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/units"
)

const (
	ljKey       = "lennard-jones"
	ljReference = "J. E. Lennard-Jones, Proc. R. Soc. Lond. A 106, 463 (1924)"
)

// ljRmin is 2^{1/6}, the ratio r_min/σ; ljK is 36·2^{2/3}, the ratio
// V″(r_min)σ²/ε.
var (
	ljRmin = math.Sqrt(math.Cbrt(2))
	ljK    = 36 * math.Cbrt(4)
)

// LennardJones is the Lennard-Jones 12-6 model, key "lennard-jones", alias
// "lj":
//
//	V(r) = 4ε[(σ/r)¹² − (σ/r)⁶]
//
// Parameters, in order: epsilon (eV, > 0), sigma (Å, > 0).
type LennardJones struct{}

// Info returns the metadata of the Lennard-Jones 12-6 form.
func (LennardJones) Info() core.ModelInfo {
	return core.ModelInfo{
		Key:     ljKey,
		Aliases: []string{"lj"},
		Name:    "Lennard-Jones 12-6",
		Formula: "V = 4 epsilon[(sigma/r)^12 − (sigma/r)^6]",
		Params: []core.Param{
			{Name: "epsilon", Dimension: units.Energy, Constraint: core.Positive, Meaning: "well depth"},
			{Name: "sigma", Dimension: units.Length, Constraint: core.Positive, Meaning: "separation where V = 0"},
		},
		Domain:    "every r > 0; V → 0 as r → ∞",
		Reference: ljReference,
		Notes: "Minimum at r_min = 2^(1/6) sigma with V(r_min) = −epsilon and V″(r_min) = 72 epsilon/r_min². " +
			"Some codes take r_min (or rm) instead of sigma: sigma = r_min/2^(1/6).",
		MaxOrder: MaxOrder,
		Origin:   origin,
	}
}

// New builds a Lennard-Jones potential from (epsilon, sigma).
func (m LennardJones) New(params []float64) (core.Potential, error) {
	if err := core.CheckParams(m.Info(), params); err != nil {
		return nil, err
	}
	return newLJ(params[0], params[1]), nil
}

// NewLennardJones builds a Lennard-Jones 12-6 potential with well depth
// epsilon (eV) and zero crossing sigma (Å).
func NewLennardJones(epsilon, sigma float64) (*LennardJonesPotential, error) {
	p, err := LennardJones{}.New([]float64{epsilon, sigma})
	if err != nil {
		return nil, err
	}
	return p.(*LennardJonesPotential), nil
}

func newLJ(eps, sigma float64) *LennardJonesPotential {
	return &LennardJonesPotential{eps: eps, sigma: sigma, eps4: 4 * eps}
}

// Match returns (epsilon, sigma) with σ = re/2^{1/6}. The form has two
// parameters, so it honours re and one of Depth and K: given Depth,
// ε = Depth and a note reports the K it implies (72ε/re²) if K was given
// too; given K alone, ε = K·re²/72 = Kσ²/(36·2^{2/3}), with a note.
func (LennardJones) Match(t core.Target) ([]float64, []string, error) {
	if !positive(t.Re) || !(t.Depth >= 0 && finite(t.Depth)) || !(t.K >= 0 && finite(t.K)) || (t.Depth == 0 && t.K == 0) {
		return nil, nil, fmt.Errorf("%s: %w: matching needs re > 0 and De > 0 or k > 0 (got re = %g Å, De = %g eV, k = %g eV/Å²)",
			ljKey, core.ErrParam, t.Re, t.Depth, t.K)
	}
	sigma := t.Re / ljRmin
	var notes []string
	eps := t.Depth
	if t.Depth > 0 {
		if t.K > 0 {
			k := 72 * eps / (t.Re * t.Re)
			notes = append(notes, fmt.Sprintf("k not honoured: Lennard-Jones with this re and De has V″(re) = 72ε/re² = %.6g eV/Å², %+.3g%% from the target %.6g eV/Å²",
				k, 100*(k-t.K)/t.K, t.K))
		}
	} else {
		eps = t.K * t.Re * t.Re / 72
		notes = append(notes, fmt.Sprintf("De not given: ε = k·re²/72 = kσ²/(36·2^(2/3)) = %.6g eV from k", eps))
	}
	return []float64{eps, sigma}, notes, nil
}

// LennardJonesPotential is a Lennard-Jones 12-6 potential. It is immutable
// and safe for concurrent use.
type LennardJonesPotential struct {
	eps, sigma float64
	eps4       float64 // 4ε
}

// Params returns (epsilon, sigma).
func (p *LennardJonesPotential) Params() []float64 { return []float64{p.eps, p.sigma} }

// Domain is (0, +Inf) with dissociation limit 0.
func (p *LennardJonesPotential) Domain() core.Domain {
	return core.Domain{Min: 0, Max: math.Inf(1), Limit: 0}
}

// MaxOrder returns MaxOrder.
func (p *LennardJonesPotential) MaxOrder() int { return MaxOrder }

// EquilibriumGuess returns r_min = 2^{1/6}σ, the exact minimum.
func (p *LennardJonesPotential) EquilibriumGuess() float64 { return ljRmin * p.sigma }

// Identities returns r_min = 2^{1/6}σ, V(r_min) = −ε and
// V″(r_min) = 36·2^{2/3}ε/σ².
func (p *LennardJonesPotential) Identities() []core.Identity {
	const src = "Lennard-Jones 12-6 closed forms (standard result; " + ljReference + ")"
	return []core.Identity{
		{Name: "r_min = 2^(1/6) σ", Quantity: core.EquilibriumR, Value: ljRmin * p.sigma, Source: src},
		{Name: "V(r_min) = −ε", Quantity: core.MinimumEnergy, Value: -p.eps, Source: src},
		{Name: "V″(r_min) = 36·2^(2/3) ε/σ²", Quantity: core.DerivativeAtMinimum, Order: 2, Value: ljK * p.eps / (p.sigma * p.sigma), Source: src},
	}
}

// start returns 1/r and the order-0 terms 4ε(σ/r)¹² and 4ε(σ/r)⁶. Order n
// is (rising12[n]·t12 − rising6[n]·t6)·r⁻ⁿ, with r⁻ⁿ built by repeated
// multiplication identically in Derivatives and Batch; the float64
// conversions forbid fused multiply-adds, which could differ between paths.
func (p *LennardJonesPotential) start(r float64) (inv, t12, t6 float64) {
	inv = 1 / r
	s := p.sigma * inv
	s2 := s * s
	s6 := s2 * s2 * s2
	t6 = p.eps4 * s6
	t12 = t6 * s6
	return inv, t12, t6
}

// ljTerm returns V⁽ⁿ⁾ = (c12·t12 − c6·t6)·pn given c12 = rising12[n],
// c6 = rising6[n] and pn = r⁻ⁿ. Both Derivatives and Batch use it.
func ljTerm(c12, c6, t12, t6, pn float64) float64 {
	return (float64(c12*t12) - float64(c6*t6)) * pn
}

func (p *LennardJonesPotential) domainError(r float64) error {
	return fmt.Errorf("%s: %w", ljKey, core.CheckR(p.Domain(), r))
}

// Derivatives stores V⁽ᵏ⁾(r) in dst[k], k = 0, …, len(dst)−1.
func (p *LennardJonesPotential) Derivatives(r float64, dst []float64) error {
	if !(r > 0 && r <= math.MaxFloat64) {
		return p.domainError(r)
	}
	if len(dst) > MaxOrder+1 {
		return fmt.Errorf("%s: %w", ljKey, core.CheckOrder(len(dst)-1, MaxOrder))
	}
	inv, t12, t6 := p.start(r)
	pk, acc := 1.0, 0.0
	for k := range dst {
		v := ljTerm(rising12[k], rising6[k], t12, t6, pk)
		dst[k] = v
		acc += v - v
		pk *= inv
	}
	if acc != 0 {
		return firstOverflow(ljKey, r, dst)
	}
	return nil
}

// Batch stores V⁽ⁿ⁾(r[i]) in dst[i].
func (p *LennardJonesPotential) Batch(n int, r, dst []float64) error {
	if len(r) != len(dst) {
		return lengthError(ljKey, len(r), len(dst))
	}
	if err := core.CheckOrder(n, MaxOrder); err != nil {
		return fmt.Errorf("%s: %w", ljKey, err)
	}
	dst = dst[:len(r)]
	c12, c6 := rising12[n], rising6[n]
	for i, x := range r {
		if !(x > 0 && x <= math.MaxFloat64) {
			return pointError(i, x, p.domainError(x))
		}
		inv, t12, t6 := p.start(x)
		pn := 1.0
		for k := 0; k < n; k++ {
			pn *= inv
		}
		v := ljTerm(c12, c6, t12, t6, pn)
		if !finite(v) {
			return pointError(i, x, overflowError(ljKey, x, n))
		}
		dst[i] = v
	}
	return nil
}
