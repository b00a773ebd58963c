package virial

import (
	"fmt"

	"github.com/pairwell/pairwell/core"
)

// evaluate stores V(r[i]) − limit in v[i] and, when dv is not nil, V′(r[i])
// in dv[i], for every i. It is the only place of the package that evaluates
// the potential: one Taylor call (of order 1 when V′ is wanted) for all the
// points of a round of every temperature together.
func evaluate(p core.Potential, limit float64, r, v, dv []float64) error {
	if dv == nil {
		if err := p.Taylor(0, r, v); err != nil {
			return fmt.Errorf("virial: V: %w", err)
		}
	} else if _, err := core.DerivativePair(p, 0, r, v, dv, nil); err != nil {
		return fmt.Errorf("virial: V, V′: %w", err)
	}
	for i := range v {
		v[i] -= limit
	}
	return nil
}
