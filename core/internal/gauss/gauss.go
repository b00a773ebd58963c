// Package gauss holds Gauss–Legendre rules built once on first use and
// shared by the quadratures of core (nodes and weights from gonum's
// quad.Legendre).
package gauss

import (
	"sync"

	"gonum.org/v1/gonum/integrate/quad"
)

// Rule is the N-point Gauss–Legendre rule on [−1, 1]. Its nodes and
// weights are computed on the first call of Nodes and then shared; a Rule
// is safe for concurrent use and must not be copied after first use.
type Rule struct {
	N    int
	once sync.Once
	x, w []float64
}

// Nodes returns the nodes x and weights w of the rule (read-only).
func (r *Rule) Nodes() (x, w []float64) {
	r.once.Do(func() {
		r.x = make([]float64, r.N)
		r.w = make([]float64, r.N)
		quad.Legendre{}.FixedLocations(r.x, r.w, -1, 1)
	})
	return r.x, r.w
}
