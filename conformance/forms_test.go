package conformance_test

import (
	"math"
	"sync/atomic"

	"github.com/pairwell/pairwell/conformance"
	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/units"
)

// bornMayer is the purely repulsive Born–Mayer form V = A e^{−r/ρ}
// (M. Born and J. E. Mayer, Z. Phys. 75, 1 (1932)), with
// V⁽ⁿ⁾ = A(−1/ρ)ⁿ e^{−r/ρ}: a form without a minimum. Its knobs make it
// misbehave on purpose.
type bornMayer struct {
	maxOrder    int
	acceptNaN   bool    // New accepts NaN parameters
	acceptZeroR bool    // r = 0 evaluates instead of failing
	limit       float64 // declared Domain.Limit
	noisy       bool    // every call perturbs the last bit differently
	singleULP   bool    // a single-point call differs by one ulp at order 2
}

func (m bornMayer) Info() core.ModelInfo {
	return core.ModelInfo{
		Key: "born-mayer", Name: "Born–Mayer (test form)", Formula: "A exp(−r/rho)",
		Params: []core.Param{
			{Name: "A", Dimension: units.Energy, Constraint: core.Positive},
			{Name: "rho", Dimension: units.Length, Constraint: core.Positive},
		},
		MaxOrder: m.maxOrder, Origin: "test",
	}
}

func (m bornMayer) New(ps []float64) (core.Potential, error) {
	if m.acceptNaN && len(ps) == 2 && (math.IsNaN(ps[0]) || math.IsNaN(ps[1])) {
		return &bmPotential{m: m, a: ps[0], rho: ps[1]}, nil
	}
	if err := core.CheckParams(m.Info(), ps); err != nil {
		return nil, err
	}
	return &bmPotential{m: m, a: ps[0], rho: ps[1]}, nil
}

type bmPotential struct {
	m      bornMayer
	a, rho float64
	calls  atomic.Int64
}

func (p *bmPotential) Domain() core.Domain {
	return core.Domain{Min: 0, Max: math.Inf(1), Limit: p.m.limit}
}

func (p *bmPotential) MaxOrder() int { return p.m.maxOrder }

// eval returns c_n = A(−1/ρ)ⁿ/n!·e^{−r/ρ}.
func (p *bmPotential) eval(n int, r float64) float64 {
	v := p.a * math.Pow(-1/p.rho, float64(n)) / core.Factorial(n) * math.Exp(-r/p.rho)
	if p.m.noisy && p.calls.Add(1)%7 == 0 {
		v = math.Nextafter(v, math.Inf(1))
	}
	return v
}

func (p *bmPotential) check(r float64) error {
	if r == 0 && p.m.acceptZeroR {
		return nil
	}
	return core.CheckR(p.Domain(), r)
}

func (p *bmPotential) Taylor(n int, r, dst []float64) error {
	if err := core.CheckTaylor(n, p.m.maxOrder, len(r), len(dst)); err != nil {
		return err
	}
	for i, x := range r {
		if err := p.check(x); err != nil {
			return &core.PointError{Index: i, R: x, Err: err}
		}
		for k := 0; k <= n; k++ {
			dst[i*(n+1)+k] = p.eval(k, x)
		}
		if p.m.singleULP && len(r) == 1 && n >= 2 {
			dst[2] = math.Nextafter(dst[2], math.Inf(1))
		}
	}
	return nil
}

// identified adds declared identities and an equilibrium guess to a
// potential, as a plugin declares them through the protocol.
type identified struct {
	core.Potential
	ids   []conformance.Identity
	guess float64
}

func (p identified) Identities() []conformance.Identity { return p.ids }

func (p identified) Domain() core.Domain {
	d := p.Potential.Domain()
	d.EquilibriumGuess = p.guess
	return d
}

// declaring builds identified potentials from a model.
type declaring struct {
	core.Model
	ids func(params []float64) []conformance.Identity
}

func (m declaring) New(ps []float64) (core.Potential, error) {
	p, err := m.Model.New(ps)
	if err != nil {
		return nil, err
	}
	return identified{Potential: p, ids: m.ids(ps), guess: p.Domain().EquilibriumGuess}, nil
}
