package conformance_test

import (
	"github.com/pairwell/pairwell/core"
)

// faulty wraps a potential and corrupts its derivative of one order,
// consistently in Derivatives and Batch, the way a hand-coded form with a
// wrong derivative behaves.
type faulty struct {
	core.Potential
	order int
	bug   func(r, v float64) float64
}

func (f faulty) Derivatives(r float64, dst []float64) error {
	if err := f.Potential.Derivatives(r, dst); err != nil {
		return err
	}
	if f.order < len(dst) {
		dst[f.order] = f.bug(r, dst[f.order])
	}
	return nil
}

func (f faulty) Batch(n int, r, dst []float64) error {
	if err := f.Potential.Batch(n, r, dst); err != nil {
		return err
	}
	if n == f.order {
		for i := range dst {
			dst[i] = f.bug(r[i], dst[i])
		}
	}
	return nil
}

// faultyModel builds faulty potentials from a real model.
type faultyModel struct {
	core.Model
	order int
	bug   func(r, v float64) float64
}

func (m faultyModel) New(params []float64) (core.Potential, error) {
	p, err := m.Model.New(params)
	if err != nil {
		return nil, err
	}
	return faulty{Potential: p, order: m.order, bug: m.bug}, nil
}
