package conformance_test

import (
	"github.com/pairwell/pairwell/core"
)

// faulty wraps a potential and corrupts its coefficient of one order, the
// way a hand-coded form with a wrong derivative behaves (bug receives r
// and c_order and is linear in the latter, so that it corrupts V⁽ᵒʳᵈᵉʳ⁾ the
// same way).
type faulty struct {
	core.Potential
	order int
	bug   func(r, v float64) float64
}

func (f faulty) Taylor(n int, r, dst []float64) error {
	if err := f.Potential.Taylor(n, r, dst); err != nil {
		return err
	}
	if f.order <= n {
		for i := range r {
			dst[i*(n+1)+f.order] = f.bug(r[i], dst[i*(n+1)+f.order])
		}
	}
	return nil
}

// faultyModel builds faulty potentials from a real model.
type faultyModel struct {
	core.Model
	order int
	bug   func(r, v float64) float64
	// hideGuess drops Domain.EquilibriumGuess, so that the potential
	// declares no minimum.
	hideGuess bool
}

// noGuess is a potential whose domain gives no equilibrium guess.
type noGuess struct{ core.Potential }

func (p noGuess) Domain() core.Domain {
	d := p.Potential.Domain()
	d.EquilibriumGuess = 0
	return d
}

func (m faultyModel) New(params []float64) (core.Potential, error) {
	p, err := m.Model.New(params)
	if err != nil {
		return nil, err
	}
	p = faulty{Potential: p, order: m.order, bug: m.bug}
	if m.hideGuess {
		p = noGuess{p}
	}
	return p, nil
}
