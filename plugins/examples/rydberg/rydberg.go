package main

import (
	"fmt"
	"math"

	"github.com/pairwell/pairwell/conformance"
	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/units"
)

const (
	key       = "rydberg"
	reference = "R. Rydberg, Z. Phys. 73, 376 (1931)"
	// maxOrder is the highest Taylor order served. The closed form holds
	// at every order; values that overflow float64 are reported as domain
	// errors.
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
// by induction: d/dx[(p + a·x)e^{−a·x}] = −a(p − 1 + a·x)e^{−a·x}; the
// potential serves the normalized Taylor coefficients c_n = V⁽ⁿ⁾/n!,
// derived by hand. (The mie example shows the other style: V written once
// over jets, every order derived automatically.)
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

// Domain is (0, +Inf) with dissociation limit 0; the minimum is at re.
func (p *Potential) Domain() core.Domain {
	return core.Domain{Min: 0, Max: math.Inf(1), Limit: 0, EquilibriumGuess: p.re}
}

// MaxOrder returns the highest Taylor order served.
func (p *Potential) MaxOrder() int { return maxOrder }

// Identities returns re, V(re) = −De and V⁽ⁿ⁾(re) = De(−a)ⁿ(n − 1) for
// n = 2, 3, 4 (Rydberg 1931; the general term is the closed form above at
// x = 0).
func (p *Potential) Identities() []conformance.Identity {
	de, a := p.de, p.a
	return []conformance.Identity{
		{Name: "r_min = re", Quantity: conformance.EquilibriumR, Value: p.re, Source: reference},
		{Name: "V(re) = −De", Quantity: conformance.MinimumEnergy, Value: -de, Source: reference},
		{Name: "V″(re) = De·a²", Quantity: conformance.DerivativeAtMinimum, Order: 2, Value: de * a * a, Source: reference},
		{Name: "V‴(re) = −2De·a³", Quantity: conformance.DerivativeAtMinimum, Order: 3, Value: -2 * de * a * a * a, Source: reference},
		{Name: "V⁗(re) = 3De·a⁴", Quantity: conformance.DerivativeAtMinimum, Order: 4, Value: 3 * de * a * a * a * a, Source: reference},
	}
}

// Taylor stores c_k(r[i]) = V⁽ᵏ⁾(r[i])/k! at dst[i·(n+1)+k]: with
// x = r − re and q_k = −De(−a)ᵏ/k! (q_k = q_{k−1}·(−a)/k),
//
//	c_k = q_k·(1 − k + a·x)·e^{−a·x}.
func (p *Potential) Taylor(n int, r, dst []float64) error {
	if err := core.CheckTaylor(n, maxOrder, len(r), len(dst)); err != nil {
		return fmt.Errorf("%s: %w", key, err)
	}
	w := n + 1
	for i, x := range r {
		if !(x > 0 && x <= math.MaxFloat64) {
			return &core.PointError{Index: i, R: x, Err: fmt.Errorf("%s: %w", key, core.CheckR(p.Domain(), x))}
		}
		ax := p.a * (x - p.re)
		e := math.Exp(-ax)
		q := -p.de
		for k := 0; k <= n; k++ {
			if k > 0 {
				q *= -p.a / float64(k)
			}
			v := q * (float64(1-k) + ax) * e
			if v-v != 0 {
				return &core.PointError{Index: i, R: x, Err: fmt.Errorf("%s: %w", key, core.OverflowError(x, k))}
			}
			dst[i*w+k] = v
		}
	}
	return nil
}
