package core_test

import (
	"fmt"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/models"
)

// The well analysis of a Morse potential (parameters invented, HCl-sized).
// The closed forms (Morse 1929) are re, De, k = 2De·a² = 32.17148 eV/Å²
// and c₃ = −De·a³ = −30.0803338 eV/Å³; the inflection point lies at
// re + ln 2/a = 1.640667 Å, where the restoring force is De·a/2 = 4.301 eV/Å.
func ExampleAnalyzeWell() {
	p, err := models.NewMorse(4.6, 1.87, 1.27)
	if err != nil {
		fmt.Println(err)
		return
	}
	w, err := core.AnalyzeWell(p, core.WellSettings{Order: 4})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("re = %.6f Å, V(re) = %.6f eV, depth = %.6f eV\n", w.Re, w.Energy, w.Depth)
	fmt.Printf("k = %.5f eV/Å², c3 = %.7f eV/Å³\n", w.K, w.Taylor[3])
	fmt.Printf("inflection at %.6f Å, max restoring force %.4f eV/Å\n", w.Inflection, w.MaxForce)
	// Output:
	// re = 1.270000 Å, V(re) = -4.600000 eV, depth = 4.600000 eV
	// k = 32.17148 eV/Å², c3 = -30.0803338 eV/Å³
	// inflection at 1.640667 Å, max restoring force 4.3010 eV/Å
}
