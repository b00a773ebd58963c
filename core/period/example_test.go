package period_test

import (
	"fmt"
	"math"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/atoms"
	"github.com/pairwell/pairwell/core/period"
	"github.com/pairwell/pairwell/core/units"
	"github.com/pairwell/pairwell/models"
)

// An exact period by quadrature, for a Morse potential (parameters
// invented, HCl-sized) and the ¹H³⁵Cl reduced mass, at 1 eV above the
// minimum. The Morse closed form T(E) = (2π/a)·√(μ/(2(De − E)))
// (e.g. Landau & Lifshitz, Mechanics, §12 problem) agrees to the digits
// printed, and so do the turning points re − ln(1 ± √(E/De))/a.
func ExampleExact() {
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
	pair, err := atoms.ParsePair("1H-35Cl")
	if err != nil {
		fmt.Println(err)
		return
	}
	const E = 1.0 // eV above the minimum
	r, err := period.Exact(p, w, pair.Mu, E, period.Settings{})
	if err != nil {
		fmt.Println(err)
		return
	}
	// The closed form in the system eV, Å, u; 1/units.AngularFrequency(1, 1)
	// is its unit of time in fs.
	closed := 2 * math.Pi / 1.87 * math.Sqrt(pair.Mu/(2*(4.6-E))) / units.AngularFrequency(1, 1)
	fmt.Printf("T = %.9f fs (closed form %.9f fs)\n", r.Period, closed)
	fmt.Printf("turning points %.6f Å and %.6f Å\n", r.Inner, r.Outer)
	fmt.Println("estimated relative error below 1e-12:", r.ErrorEstimate < 1e-12)
	// Output:
	// T = 12.617232324 fs (closed form 12.617232324 fs)
	// turning points 1.065342 Å and 1.605739 Å
	// estimated relative error below 1e-12: true
}
