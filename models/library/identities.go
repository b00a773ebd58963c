package library

import (
	"math"

	"github.com/pairwell/pairwell/conformance"
	"github.com/pairwell/pairwell/core"
)

// identities holds, by key, the published identities of each form as a
// function of its parameters (default units, declared order), so that the
// conformance suite (`pairwell check`) verifies them. Tang–Toennies has no
// closed-form minimum and declares none.
var identities = map[string]func(p []float64) []conformance.Identity{
	"mie": func(p []float64) []conformance.Identity {
		eps, sigma, n, m := p[0], p[1], p[2], p[3]
		const src = "G. Mie, Ann. Phys. 316, 657 (1903)"
		return []conformance.Identity{
			{Name: "r_min = σ(n/m)^(1/(n−m))", Quantity: conformance.EquilibriumR, Value: sigma * math.Pow(n/m, 1/(n-m)), Source: src},
			{Name: "V(r_min) = −ε", Quantity: conformance.MinimumEnergy, Value: -eps, Source: src},
			{Name: "V(σ) = 0", Quantity: conformance.ValueAt, R: sigma, Value: 0, Source: src},
		}
	},
	"exp6": func(p []float64) []conformance.Identity {
		eps, rm := p[0], p[1]
		const src = "E. A. Mason, J. Chem. Phys. 22, 169 (1954)"
		return []conformance.Identity{
			{Name: "r_min = r_m", Quantity: conformance.EquilibriumR, Value: rm, Source: src},
			{Name: "V(r_m) = −ε", Quantity: conformance.MinimumEnergy, Value: -eps, Source: src},
		}
	},
	"born-mayer": func(p []float64) []conformance.Identity {
		return []conformance.Identity{{Name: "V(ρ) = A/e", Quantity: conformance.ValueAt, R: p[1], Value: p[0] / math.E,
			Source: "M. Born & J. E. Mayer, Z. Phys. 75, 1 (1932): V = A·exp(−r/ρ)"}}
	},
	"rydberg": func(p []float64) []conformance.Identity {
		de, a, re := p[0], p[1], p[2]
		return wellIdentities(re, de, de*a*a, "V″(re) = De·a²", "R. Rydberg, Z. Phys. 73, 376 (1931)")
	},
	"varshni": func(p []float64) []conformance.Identity {
		de, re, beta := p[0], p[1], p[2]
		k := 1/re + 2*beta*re
		return wellIdentities(re, de, 2*de*k*k, "V″(re) = 2De(1/re + 2β·re)²", "Y. P. Varshni, Rev. Mod. Phys. 29, 664 (1957)")
	},
	"kratzer": func(p []float64) []conformance.Identity {
		de, re := p[0], p[1]
		const src = "A. Kratzer, Z. Phys. 3, 289 (1920)"
		return append(wellIdentities(re, de, 2*de/(re*re), "V″(re) = 2De/re²", src),
			conformance.Identity{Name: "V‴(re) = −12De/re³", Quantity: conformance.DerivativeAtMinimum, Order: 3, Value: -12 * de / (re * re * re), Source: src})
	},
	"poschl-teller": func(p []float64) []conformance.Identity {
		de, a, re := p[0], p[1], p[2]
		return wellIdentities(re, de, 2*de*a*a, "V″(re) = 2De·a²", "G. Pöschl & E. Teller, Z. Phys. 83, 143 (1933)")
	},
	"hulburt-hirschfelder": func(p []float64) []conformance.Identity {
		de, a, re := p[0], p[1], p[2]
		return wellIdentities(re, de, 2*de*a*a, "V″(re) = 2De·a² (the correction is O(x³))", "H. M. Hulburt & J. O. Hirschfelder, J. Chem. Phys. 9, 61 (1941)")
	},
}

// wellIdentities are the identities of a well with its minimum −De at re
// and the curvature k there.
func wellIdentities(re, de, k float64, kName, src string) []conformance.Identity {
	return []conformance.Identity{
		{Name: "r_min = re", Quantity: conformance.EquilibriumR, Value: re, Source: src},
		{Name: "V(re) = −De", Quantity: conformance.MinimumEnergy, Value: -de, Source: src},
		{Name: kName, Quantity: conformance.DerivativeAtMinimum, Order: 2, Value: k, Source: src},
	}
}

// identified is a library potential that declares its published
// identities (conformance.Identifier). It forwards the contract and the
// optional parameter derivatives (core.ParamDerivatives).
type identified struct {
	core.Potential
	ids []conformance.Identity
}

// Identities returns the published identities of the parameter set.
func (p identified) Identities() []conformance.Identity {
	return append([]conformance.Identity(nil), p.ids...)
}

// ParamGradient forwards the wrapped potential's parameter derivatives.
func (p identified) ParamGradient(r, dst []float64) error {
	return core.ParamDerivatives(p.Potential, r, dst)
}

// New builds the potential of a parameter set (formula.Form.New) and, for
// a form with published identities, declares them.
func (f *Form) New(params []float64) (core.Potential, error) {
	p, err := f.Form.New(params)
	if err != nil {
		return nil, err
	}
	ids, ok := identities[f.Info().Key]
	if !ok {
		return p, nil
	}
	return identified{Potential: p, ids: ids(params)}, nil
}
