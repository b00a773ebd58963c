package validity_test

import (
	"fmt"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/validity"
	"github.com/pairwell/pairwell/models"
)

// How far the harmonic picture holds for a Morse well (parameters
// invented, HCl-sized), at the default tolerance of 1 %: the displacements
// within which |V₂ − V| ≤ 1 % of V − V(re), and the energy up to which the
// harmonic period is within 1 % of the exact one. To leading order the
// potential criterion holds while |c₃x/c₂| = a·|x| ≤ 0.01, x ≈ 0.0053 Å
// (common practice: the first neglected term of the series).
func ExampleAnalyze() {
	p, err := models.NewMorse(4.6, 1.87, 1.27)
	if err != nil {
		fmt.Println(err)
		return
	}
	w, err := core.AnalyzeWell(p, core.WellSettings{})
	if err != nil {
		fmt.Println(err)
		return
	}
	r, err := validity.Analyze(p, w, 2, validity.Settings{})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("potential: compression %.4f Å, stretch %.4f Å\n", r.Potential.Compression, r.Potential.Stretch)
	fmt.Printf("period: up to %.4f eV (%.4f of the depth, %.0f K)\n", r.Period.Energy, r.Period.DepthFraction, r.Period.Temperature)
	// Output:
	// potential: compression 0.0054 Å, stretch 0.0053 Å
	// period: up to 0.0915 eV (0.0199 of the depth, 1062 K)
}
