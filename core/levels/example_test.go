package levels_test

import (
	"fmt"

	"github.com/pairwell/pairwell/core/atoms"
	"github.com/pairwell/pairwell/core/levels"
	"github.com/pairwell/pairwell/core/units"
	"github.com/pairwell/pairwell/models"
)

// Vibrational levels of a Morse well (parameters invented, HCl-sized) for
// ¹H³⁵Cl. The Morse closed form (Morse 1929) E_v − V(re) = ω(v + ½) −
// ωx(v + ½)², with ω = a·√(2De/μ)·ħ and ωx = ω²/(4De), gives the first
// spacing ω − 2ωx to the digits printed.
func ExampleSolve() {
	p, err := models.NewMorse(4.6, 1.87, 1.27)
	if err != nil {
		fmt.Println(err)
		return
	}
	pair, err := atoms.ParsePair("1H-35Cl")
	if err != nil {
		fmt.Println(err)
		return
	}
	r, err := levels.Solve(p, pair.Mu, levels.Settings{Count: 2})
	if err != nil {
		fmt.Println(err)
		return
	}
	omega := units.Wavenumber(units.AngularFrequency(2*4.6*1.87*1.87, pair.Mu)) // ω in cm⁻¹
	omegaX := omega * omega / (4 * 4.6 / units.WavenumberEV)                    // ωx in cm⁻¹
	spacing := (r.Levels[1].Energy - r.Levels[0].Energy) / units.WavenumberEV
	fmt.Printf("v=0→1: %.2f cm⁻¹ (closed form %.2f cm⁻¹)\n", spacing, omega-2*omegaX)
	// Output:
	// v=0→1: 2868.07 cm⁻¹ (closed form 2868.07 cm⁻¹)
}
