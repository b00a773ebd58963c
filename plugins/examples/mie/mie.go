package main

import (
	"fmt"
	"math"

	"github.com/pairwell/pairwell/conformance"
	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/jet"
	"github.com/pairwell/pairwell/core/units"
	"github.com/pairwell/pairwell/plugins/sdk"
)

const (
	key       = "mie"
	reference = "G. Mie, Ann. Phys. (Leipzig) 316, 657 (1903)"
	// maxOrder is the highest Taylor order served: every order comes
	// from the jets; values that overflow float64 are reported as domain
	// errors.
	maxOrder = 100
)

// Mie is the Mie n-m form, written once over jets (package core/jet):
//
//	V(r) = C·ε[(σ/r)ⁿ − (σ/r)ᵐ],  C = n/(n − m)·(n/m)^{m/(n−m)},
//
// whose prefactor C makes the well depth ε. Parameters, in order: epsilon
// (eV, > 0), sigma (Å, > 0), n and m (dimensionless, n > m > 0). The
// minimum lies at r_min = σ(n/m)^{1/(n−m)} with V(r_min) = −ε and
// V″(r_min) = n·m·ε/r_min²; V(σ) = 0. Lennard-Jones 12-6 is n = 12, m = 6
// (C = 4). V below is the whole model: sdk.Form derives the Taylor
// coefficients of every order from it, checks and batches. (The rydberg
// example shows the other style, coefficients derived by hand.)
func Mie() sdk.Form { return mie }

var mie = sdk.Form{
	Meta: info(),
	V: func(t *jet.Tape, r jet.Jet, p []float64) jet.Jet {
		s := t.Scale(t.Recip(r), p[1]) // σ/r
		return t.Scale(t.Sub(t.Pow(s, p[2]), t.Pow(s, p[3])), prefactor(p)*p[0])
	},
	Check: func(p []float64) error {
		if !(p[2] > p[3]) {
			return fmt.Errorf("%w: n = %g, m = %g: the repulsive exponent n must exceed m", core.ErrParam, p[2], p[3])
		}
		if c, r := prefactor(p), rmin(p); c-c != 0 || r-r != 0 || !(r > 0) {
			return fmt.Errorf("%w: n = %g, m = %g give no representable well", core.ErrParam, p[2], p[3])
		}
		return nil
	},
	DomainOf: func(p []float64) core.Domain {
		return core.Domain{Max: math.Inf(1), EquilibriumGuess: rmin(p)}
	},
	IdentitiesOf: identities,
}

// prefactor returns C = n/(n − m)·(n/m)^{m/(n−m)} of p = (ε, σ, n, m).
func prefactor(p []float64) float64 {
	return p[2] / (p[2] - p[3]) * math.Pow(p[2]/p[3], p[3]/(p[2]-p[3]))
}

// rmin returns the minimum r_min = σ(n/m)^{1/(n−m)} of p, in Å.
func rmin(p []float64) float64 { return p[1] * math.Pow(p[2]/p[3], 1/(p[2]-p[3])) }

// info returns the metadata of the form.
func info() core.ModelInfo {
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

// identities returns r_min = σ(n/m)^{1/(n−m)}, V(r_min) = −ε,
// V″(r_min) = n·m·ε/r_min² and V(σ) = 0, all of which follow from the form
// (Mie 1903): V′(r_min) = 0 gives n(σ/r_min)ⁿ = m(σ/r_min)ᵐ.
func identities(p []float64) []conformance.Identity {
	eps, sigma, n, m, r := p[0], p[1], p[2], p[3], rmin(p)
	return []conformance.Identity{
		{Name: "r_min = σ(n/m)^(1/(n−m))", Quantity: conformance.EquilibriumR, Value: r, Source: reference},
		{Name: "V(r_min) = −ε", Quantity: conformance.MinimumEnergy, Value: -eps, Source: reference},
		{Name: "V″(r_min) = n·m·ε/r_min²", Quantity: conformance.DerivativeAtMinimum, Order: 2, Value: n * m * eps / (r * r), Source: reference},
		{Name: "V(σ) = 0", Quantity: conformance.ValueAt, R: sigma, Value: 0, Source: reference},
	}
}
