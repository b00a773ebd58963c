package models

import (
	"fmt"
	"math"

	"github.com/pairwell/pairwell/conformance"
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

// Domain is (0, +Inf) with dissociation limit 0; the minimum is at
// r_min = 2^{1/6}σ.
func (p *LennardJonesPotential) Domain() core.Domain {
	return core.Domain{Min: 0, Max: math.Inf(1), Limit: 0, EquilibriumGuess: ljRmin * p.sigma}
}

// MaxOrder returns MaxOrder.
func (p *LennardJonesPotential) MaxOrder() int { return MaxOrder }

// Identities returns r_min = 2^{1/6}σ, V(r_min) = −ε and
// V″(r_min) = 36·2^{2/3}ε/σ².
func (p *LennardJonesPotential) Identities() []conformance.Identity {
	const src = "Lennard-Jones 12-6 closed forms (standard result; " + ljReference + ")"
	return []conformance.Identity{
		{Name: "r_min = 2^(1/6) σ", Quantity: conformance.EquilibriumR, Value: ljRmin * p.sigma, Source: src},
		{Name: "V(r_min) = −ε", Quantity: conformance.MinimumEnergy, Value: -p.eps, Source: src},
		{Name: "V″(r_min) = 36·2^(2/3) ε/σ²", Quantity: conformance.DerivativeAtMinimum, Order: 2, Value: ljK * p.eps / (p.sigma * p.sigma), Source: src},
	}
}

func (p *LennardJonesPotential) domainError(r float64) error {
	return fmt.Errorf("%s: %w", ljKey, core.CheckR(p.Domain(), r))
}

// Taylor stores c_k(r[i]) = V⁽ᵏ⁾(r[i])/k! at dst[i·(n+1)+k]: with
// t12 = 4ε(σ/r)¹² and t6 = 4ε(σ/r)⁶,
//
//	c_k = (binom12[k]·t12 − binom6[k]·t6)·r⁻ᵏ,
//
// binomM[k] = (−1)ᵏ C(m+k−1, k) and r⁻ᵏ by repeated multiplication.
func (p *LennardJonesPotential) Taylor(n int, r, dst []float64) error {
	if err := core.CheckTaylor(n, MaxOrder, len(r), len(dst)); err != nil {
		return fmt.Errorf("%s: %w", ljKey, err)
	}
	w := n + 1
	b12, b6 := binom12[:w], binom6[:w]
	for i, x := range r {
		if !(x > 0 && x <= math.MaxFloat64) {
			return pointError(i, x, p.domainError(x))
		}
		inv := 1 / x
		s := p.sigma * inv
		s2 := s * s
		s6 := s2 * s2 * s2
		t6 := p.eps4 * s6
		t12 := t6 * s6
		row := dst[i*w : i*w+w]
		pk, acc := 1.0, 0.0
		for k := range row {
			v := (b12[k]*t12 - b6[k]*t6) * pk
			row[k] = v
			acc += v - v
			pk *= inv
		}
		if acc != 0 { // NaN unless every coefficient is finite
			return pointError(i, x, firstOverflow(ljKey, x, row))
		}
	}
	return nil
}
