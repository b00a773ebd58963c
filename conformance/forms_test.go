package conformance_test

import (
	"fmt"
	"math"
	"sync/atomic"

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
	batchULP    bool    // Batch differs from Derivatives by one ulp at order 2
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

func (p *bmPotential) eval(n int, r float64) float64 {
	v := p.a * math.Pow(-1/p.rho, float64(n)) * math.Exp(-r/p.rho)
	if p.m.noisy && p.calls.Add(1)%3 == 0 {
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

func (p *bmPotential) Derivatives(r float64, dst []float64) error {
	if err := p.check(r); err != nil {
		return err
	}
	if err := core.CheckOrder(len(dst)-1, p.m.maxOrder); err != nil {
		return err
	}
	for k := range dst {
		dst[k] = p.eval(k, r)
	}
	return nil
}

func (p *bmPotential) Batch(n int, r, dst []float64) error {
	if len(r) != len(dst) {
		return fmt.Errorf("%w", core.ErrLength)
	}
	if err := core.CheckOrder(n, p.m.maxOrder); err != nil {
		return err
	}
	for i, x := range r {
		if err := p.check(x); err != nil {
			return &core.PointError{Index: i, R: x, Err: err}
		}
		dst[i] = p.eval(n, x)
		if p.m.batchULP && n == 2 {
			dst[i] = math.Nextafter(dst[i], math.Inf(1))
		}
	}
	return nil
}

// identified adds declared identities and an equilibrium guess to a
// potential, as a plugin declares them through the protocol.
type identified struct {
	core.Potential
	ids   []core.Identity
	guess float64
}

func (p identified) Identities() []core.Identity { return p.ids }
func (p identified) EquilibriumGuess() float64   { return p.guess }

// declaring builds identified potentials from a model.
type declaring struct {
	core.Model
	ids func(params []float64) []core.Identity
}

func (m declaring) New(ps []float64) (core.Potential, error) {
	p, err := m.Model.New(ps)
	if err != nil {
		return nil, err
	}
	g := math.NaN()
	if gs, ok := p.(core.Guesser); ok {
		g = gs.EquilibriumGuess()
	}
	return identified{Potential: p, ids: m.ids(ps), guess: g}, nil
}
