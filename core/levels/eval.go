package levels

import (
	"fmt"
	"math"

	"github.com/pairwell/pairwell/core"
)

// This file holds every evaluation of the potential made by the package, so
// that a change of the evaluation contract touches only these few lines.

// sample stores V(r[i]) in eV in v[i] for every i, in one batched call (a
// potential may live in another process).
func sample(p core.Potential, r, v []float64) error {
	if err := p.Taylor(0, r, v); err != nil {
		return fmt.Errorf("potential on the grid: %w", err)
	}
	return nil
}

// ceiling returns the highest energy in eV at which motion in the well of p
// stays bound: the dissociation limit, or the energy of an inner barrier
// (Buckingham) when that is lower; +Inf for a form that grows without bound.
// barrier reports that the ceiling is the barrier's.
func ceiling(p core.Potential) (e float64, barrier bool, err error) {
	d := p.Domain()
	e = math.Inf(1)
	if d.Bounded() {
		e = d.Limit
	}
	if !d.Barrier {
		return e, false, nil
	}
	if vb := d.BarrierEnergy; vb < e {
		return vb, true, nil
	}
	return e, false, nil
}
