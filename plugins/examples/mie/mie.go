package main

import (
	"fmt"
	"math"

	"github.com/pairwell/pairwell/conformance"
	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/units"
)

const (
	key       = "mie"
	reference = "G. Mie, Ann. Phys. (Leipzig) 316, 657 (1903)"
	// maxOrder is the highest derivative order served. The closed form
	// holds at every order; values that overflow float64 are reported as
	// domain errors.
	maxOrder = 100
)

// Mie is the Mie n-m form
//
//	V(r) = C·ε[(σ/r)ⁿ − (σ/r)ᵐ],  C = n/(n − m)·(n/m)^{m/(n−m)},
//
// whose prefactor C makes the well depth ε. Parameters, in order: epsilon
// (eV, > 0), sigma (Å, > 0), n and m (dimensionless, n > m > 0). The
// minimum lies at r_min = σ(n/m)^{1/(n−m)} with V(r_min) = −ε and
// V″(r_min) = n·m·ε/r_min²; V(σ) = 0. Lennard-Jones 12-6 is n = 12, m = 6
// (C = 4). The derivatives of every order follow from
//
//	dᵏ/drᵏ r^{−p} = (−1)ᵏ p(p + 1)…(p + k − 1) r^{−p−k}.
type Mie struct{}

// Info returns the metadata of the form.
func (Mie) Info() core.ModelInfo {
	return core.ModelInfo{
		Key:     key,
		Name:    "Mie n-m",
		Formula: "V = C·epsilon[(sigma/r)^n − (sigma/r)^m], C = n/(n − m)·(n/m)^(m/(n − m))",
		Params: []core.Param{
			{Name: "epsilon", Dimension: units.Energy, Constraint: core.Positive, Meaning: "well depth V(∞) − V(r_min)"},
			{Name: "sigma", Dimension: units.Length, Constraint: core.Positive, Meaning: "separation where V = 0"},
			{Name: "n", Dimension: units.Dimensionless, Constraint: core.Positive, Meaning: "repulsive exponent, n > m"},
			{Name: "m", Dimension: units.Dimensionless, Constraint: core.Positive, Meaning: "attractive exponent"},
		},
		Domain:    "every r > 0; V → 0 as r → ∞",
		Reference: reference,
		Notes:     "Needs n > m. Minimum −epsilon at r_min = sigma·(n/m)^(1/(n − m)); n = 12, m = 6 is Lennard-Jones 12-6.",
		MaxOrder:  maxOrder,
	}
}

// New builds the potential of (epsilon, sigma, n, m).
func (f Mie) New(params []float64) (core.Potential, error) {
	if err := core.CheckParams(f.Info(), params); err != nil {
		return nil, err
	}
	eps, sigma, n, m := params[0], params[1], params[2], params[3]
	if !(n > m) {
		return nil, fmt.Errorf("%s: %w: n = %g, m = %g: the repulsive exponent n must exceed m", key, core.ErrParam, n, m)
	}
	c := n / (n - m) * math.Pow(n/m, m/(n-m))
	p := &Potential{eps: eps, sigma: sigma, n: n, m: m, ce: c * eps, rmin: sigma * math.Pow(n/m, 1/(n-m))}
	if p.ce-p.ce != 0 || p.rmin-p.rmin != 0 || !(p.rmin > 0) {
		return nil, fmt.Errorf("%s: %w: n = %g, m = %g give no representable well", key, core.ErrParam, n, m)
	}
	return p, nil
}

// Potential is a Mie potential. It is immutable and safe for concurrent
// use.
type Potential struct {
	eps, sigma, n, m float64
	ce               float64 // C·ε
	rmin             float64
}

// Domain is (0, +Inf) with dissociation limit 0; the minimum is at r_min.
func (p *Potential) Domain() core.Domain {
	return core.Domain{Min: 0, Max: math.Inf(1), Limit: 0, EquilibriumGuess: p.rmin}
}

// MaxOrder returns the highest Taylor order served.
func (p *Potential) MaxOrder() int { return maxOrder }

// Identities returns r_min = σ(n/m)^{1/(n−m)}, V(r_min) = −ε,
// V″(r_min) = n·m·ε/r_min² and V(σ) = 0, all of which follow from the form
// (Mie 1903): V′(r_min) = 0 gives n(σ/r_min)ⁿ = m(σ/r_min)ᵐ.
func (p *Potential) Identities() []conformance.Identity {
	return []conformance.Identity{
		{Name: "r_min = σ(n/m)^(1/(n−m))", Quantity: conformance.EquilibriumR, Value: p.rmin, Source: reference},
		{Name: "V(r_min) = −ε", Quantity: conformance.MinimumEnergy, Value: -p.eps, Source: reference},
		{Name: "V″(r_min) = n·m·ε/r_min²", Quantity: conformance.DerivativeAtMinimum, Order: 2, Value: p.n * p.m * p.eps / (p.rmin * p.rmin), Source: reference},
		{Name: "V(σ) = 0", Quantity: conformance.ValueAt, R: p.sigma, Value: 0, Source: reference},
	}
}

// Taylor stores c_k(r[i]) = V⁽ᵏ⁾(r[i])/k! at dst[i·(n+1)+k]: each power
// t = C·ε(σ/r)ᵖ has normalized coefficients t_{k+1} = −t_k·(p + k)/((k+1)r).
func (p *Potential) Taylor(n int, r, dst []float64) error {
	if err := core.CheckTaylor(n, maxOrder, len(r), len(dst)); err != nil {
		return fmt.Errorf("%s: %w", key, err)
	}
	w := n + 1
	for i, x := range r {
		if !(x > 0 && x <= math.MaxFloat64) {
			return &core.PointError{Index: i, R: x, Err: fmt.Errorf("%s: %w", key, core.CheckR(p.Domain(), x))}
		}
		s := p.sigma / x
		tn, tm := p.ce*math.Pow(s, p.n), p.ce*math.Pow(s, p.m)
		for k := 0; k <= n; k++ {
			v := tn - tm
			if v-v != 0 {
				return &core.PointError{Index: i, R: x, Err: fmt.Errorf("%s: %w", key, core.OverflowError(x, k))}
			}
			dst[i*w+k] = v
			fk := float64(k)
			tn, tm = -tn*(p.n+fk)/((fk+1)*x), -tm*(p.m+fk)/((fk+1)*x)
		}
	}
	return nil
}
