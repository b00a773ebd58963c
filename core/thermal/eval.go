package thermal

import (
	"fmt"

	"github.com/pairwell/pairwell/core"
)

// evaluate stores V(r[i]) − base in dv[i] for every i. It is the only place
// of the package that evaluates the potential: one batched call for all the
// points of a scan or of a round of every temperature.
func evaluate(p core.Potential, base float64, r, dv []float64) error {
	if err := p.Taylor(0, r, dv); err != nil {
		return fmt.Errorf("thermal: V: %w", err)
	}
	for i := range dv {
		dv[i] -= base
	}
	return nil
}
