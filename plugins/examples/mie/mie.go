package main

import (
	"fmt"
	"math"

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

// Domain is (0, +Inf) with dissociation limit 0.
func (p *Potential) Domain() core.Domain {
	return core.Domain{Min: 0, Max: math.Inf(1), Limit: 0}
}

// MaxOrder returns the highest derivative order served.
func (p *Potential) MaxOrder() int { return maxOrder }

// EquilibriumGuess returns r_min, the exact minimum.
func (p *Potential) EquilibriumGuess() float64 { return p.rmin }

// Identities returns r_min = σ(n/m)^{1/(n−m)}, V(r_min) = −ε,
// V″(r_min) = n·m·ε/r_min² and V(σ) = 0, all of which follow from the form
// (Mie 1903): V′(r_min) = 0 gives n(σ/r_min)ⁿ = m(σ/r_min)ᵐ.
func (p *Potential) Identities() []core.Identity {
	return []core.Identity{
		{Name: "r_min = σ(n/m)^(1/(n−m))", Quantity: core.EquilibriumR, Value: p.rmin, Source: reference},
		{Name: "V(r_min) = −ε", Quantity: core.MinimumEnergy, Value: -p.eps, Source: reference},
		{Name: "V″(r_min) = n·m·ε/r_min²", Quantity: core.DerivativeAtMinimum, Order: 2, Value: p.n * p.m * p.eps / (p.rmin * p.rmin), Source: reference},
		{Name: "V(σ) = 0", Quantity: core.ValueAt, R: p.sigma, Value: 0, Source: reference},
	}
}

// start returns the order-0 terms C·ε(σ/r)ⁿ and C·ε(σ/r)ᵐ.
func (p *Potential) start(r float64) (tn, tm float64) {
	s := p.sigma / r
	return float64(p.ce * math.Pow(s, p.n)), float64(p.ce * math.Pow(s, p.m))
}

// step raises the order of the terms from k to k + 1: dᵏ⁺¹ = −(p + k)/r·dᵏ
// for each power. Derivatives and Batch both use it, so they give the
// same bits; the float64 conversions forbid fused multiply-adds.
func (p *Potential) step(tn, tm float64, k int, r float64) (float64, float64) {
	fk := float64(k)
	return float64(-tn * float64(p.n+fk) / r), float64(-tm * float64(p.m+fk) / r)
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
	tn, tm := p.start(r)
	for k := range dst {
		v := tn - tm
		if v-v != 0 {
			return overflow(r, k)
		}
		dst[k] = v
		tn, tm = p.step(tn, tm, k, r)
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
	for i, x := range r {
		if err := p.check(x); err != nil {
			return &core.PointError{Index: i, R: x, Err: err}
		}
		tn, tm := p.start(x)
		for k := 0; k < n; k++ {
			tn, tm = p.step(tn, tm, k, x)
		}
		v := tn - tm
		if v-v != 0 {
			return &core.PointError{Index: i, R: x, Err: overflow(x, n)}
		}
		dst[i] = v
	}
	return nil
}
