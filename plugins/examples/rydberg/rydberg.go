package main

import (
	"fmt"
	"math"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/units"
)

const (
	key       = "rydberg"
	reference = "R. Rydberg, Z. Phys. 73, 376 (1931)"
	// maxOrder is the highest derivative order served. The closed form
	// holds at every order; values that overflow float64 are reported as
	// domain errors.
	maxOrder = 100
)

// Rydberg is the Rydberg form
//
//	V(r) = −De(1 + a(r − re))e^{−a(r − re)}
//
// with the zero of energy at dissociation, so V(re) = −De and
// V″(re) = De·a². Parameters, in order: De (eV, > 0), a (1/Å, > 0),
// re (Å, > 0). With x = r − re its derivatives are, for every n ≥ 0,
//
//	V⁽ⁿ⁾(r) = −De(−a)ⁿ(1 − n + a·x)e^{−a·x},
//
// by induction: d/dx[(p + a·x)e^{−a·x}] = −a(p − 1 + a·x)e^{−a·x}.
type Rydberg struct{}

// Info returns the metadata of the form.
func (Rydberg) Info() core.ModelInfo {
	return core.ModelInfo{
		Key:     key,
		Name:    "Rydberg",
		Formula: "V = −De(1 + a(r − re))exp(−a(r − re))",
		Params: []core.Param{
			{Name: "De", Dimension: units.Energy, Constraint: core.Positive, Meaning: "well depth V(∞) − V(re)"},
			{Name: "a", Dimension: units.InverseLength, Constraint: core.Positive, Meaning: "range parameter, a = √(k/De)"},
			{Name: "re", Dimension: units.Length, Constraint: core.Positive, Meaning: "equilibrium distance"},
		},
		Domain:    "every r > 0; V → 0 as r → ∞",
		Reference: reference,
		Notes:     "Energy zero at dissociation: V(re) = −De, V″(re) = De·a² (half the Morse value for the same a).",
		MaxOrder:  maxOrder,
	}
}

// New builds the potential of (De, a, re).
func (m Rydberg) New(params []float64) (core.Potential, error) {
	if err := core.CheckParams(m.Info(), params); err != nil {
		return nil, err
	}
	return &Potential{de: params[0], a: params[1], re: params[2]}, nil
}

// Match returns (De, a, re) = (Depth, √(K/Depth), Re): the Rydberg well
// honours all three quantities exactly.
func (Rydberg) Match(t core.Target) ([]float64, []string, error) {
	if !(t.Re > 0 && t.Depth > 0 && t.K > 0) || math.IsInf(t.Re+t.Depth+t.K, 0) {
		return nil, nil, fmt.Errorf("%s: %w: matching needs re, De and k, all finite and > 0 (got re = %g Å, De = %g eV, k = %g eV/Å²)",
			key, core.ErrParam, t.Re, t.Depth, t.K)
	}
	return []float64{t.Depth, math.Sqrt(t.K / t.Depth), t.Re}, nil, nil
}

// Potential is a Rydberg potential. It is immutable and safe for
// concurrent use.
type Potential struct {
	de, a, re float64
}

// Domain is (0, +Inf) with dissociation limit 0.
func (p *Potential) Domain() core.Domain {
	return core.Domain{Min: 0, Max: math.Inf(1), Limit: 0}
}

// MaxOrder returns the highest derivative order served.
func (p *Potential) MaxOrder() int { return maxOrder }

// EquilibriumGuess returns re, the exact minimum.
func (p *Potential) EquilibriumGuess() float64 { return p.re }

// Identities returns re, V(re) = −De and V⁽ⁿ⁾(re) = De(−a)ⁿ(n − 1) for
// n = 2, 3, 4 (Rydberg 1931; the general term is the closed form above at
// x = 0).
func (p *Potential) Identities() []core.Identity {
	de, a := p.de, p.a
	return []core.Identity{
		{Name: "r_min = re", Quantity: core.EquilibriumR, Value: p.re, Source: reference},
		{Name: "V(re) = −De", Quantity: core.MinimumEnergy, Value: -de, Source: reference},
		{Name: "V″(re) = De·a²", Quantity: core.DerivativeAtMinimum, Order: 2, Value: de * a * a, Source: reference},
		{Name: "V‴(re) = −2De·a³", Quantity: core.DerivativeAtMinimum, Order: 3, Value: -2 * de * a * a * a, Source: reference},
		{Name: "V⁗(re) = 3De·a⁴", Quantity: core.DerivativeAtMinimum, Order: 4, Value: 3 * de * a * a * a * a, Source: reference},
	}
}

// term returns V⁽ⁿ⁾ from c = −De(−a)ⁿ, ax = a(r − re) and e = e^{−ax}.
// Derivatives and Batch both use it, with c built by the same repeated
// multiplication, so they give the same bits; the float64 conversions
// forbid fused multiply-adds.
func term(c float64, n int, ax, e float64) float64 {
	return float64(float64(c*float64(float64(1-n)+ax)) * e)
}

func (p *Potential) check(r float64) error {
	if !(r > 0 && r <= math.MaxFloat64) {
		return fmt.Errorf("%s: %w", key, core.CheckR(p.Domain(), r))
	}
	return nil
}

func overflow(r float64, n int) error {
	return fmt.Errorf("%s: r = %g Å: %w: V⁽%d⁾ overflows float64", key, r, core.ErrDomain, n)
}

// Derivatives stores V⁽ᵏ⁾(r) in dst[k], k = 0, …, len(dst)−1.
func (p *Potential) Derivatives(r float64, dst []float64) error {
	if err := p.check(r); err != nil {
		return err
	}
	if len(dst) > maxOrder+1 {
		return fmt.Errorf("%s: %w", key, core.CheckOrder(len(dst)-1, maxOrder))
	}
	ax := float64(p.a * (r - p.re))
	e := math.Exp(-ax)
	c := -p.de
	for k := range dst {
		v := term(c, k, ax, e)
		if v-v != 0 {
			return overflow(r, k)
		}
		dst[k] = v
		c = float64(c * -p.a)
	}
	return nil
}

// Batch stores V⁽ⁿ⁾(r[i]) in dst[i].
func (p *Potential) Batch(n int, r, dst []float64) error {
	if len(r) != len(dst) {
		return fmt.Errorf("%s: %w: len(r) = %d, len(dst) = %d", key, core.ErrLength, len(r), len(dst))
	}
	if err := core.CheckOrder(n, maxOrder); err != nil {
		return fmt.Errorf("%s: %w", key, err)
	}
	c := -p.de
	for k := 0; k < n; k++ {
		c = float64(c * -p.a)
	}
	for i, x := range r {
		if err := p.check(x); err != nil {
			return &core.PointError{Index: i, R: x, Err: err}
		}
		ax := float64(p.a * (x - p.re))
		v := term(c, n, ax, math.Exp(-ax))
		if v-v != 0 {
			return &core.PointError{Index: i, R: x, Err: overflow(x, n)}
		}
		dst[i] = v
	}
	return nil
}
