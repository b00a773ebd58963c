package conformance_test

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/pairwell/pairwell/conformance"
	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/models"
)

// TestBuiltinsRandomParameters runs the suite over parameter sets drawn
// log-uniformly over wide ranges (Buckingham through Match, so that the
// set has a well): no false failures, and finite-difference errors at
// least 10⁴ below the tolerance.
func TestBuiltinsRandomParameters(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	lu := func(lo, hi float64) float64 {
		return math.Exp(math.Log(lo) + rng.Float64()*(math.Log(hi)-math.Log(lo)))
	}
	for i := 0; i < 200; i++ {
		var m core.Model
		var ps []float64
		switch i % 4 {
		case 0:
			m, ps = models.Morse{}, []float64{lu(1e-3, 20), lu(0.3, 10), lu(0.5, 6)}
		case 1:
			m, ps = models.LennardJones{}, []float64{lu(1e-4, 5), lu(0.5, 8)}
		case 2:
			// via match to guarantee a well
			re, d := lu(1, 5), lu(1e-3, 5)
			k := d / (re * re) * lu(50, 2000)
			var err error
			ps, _, err = models.Buckingham{}.Match(core.Target{Re: re, Depth: d, K: k})
			if err != nil {
				continue
			}
			m = models.Buckingham{}
		case 3:
			m, ps = models.Harmonic{}, []float64{lu(1e-2, 1e3), lu(0.3, 6)}
		}
		rep, err := conformance.Run(m, [][]float64{ps}, conformance.Settings{})
		if err != nil {
			t.Fatal(err)
		}
		for _, r := range rep.Results {
			if !r.Passed {
				t.Errorf("%s", r)
			}
			if r.Check == conformance.CheckDerivative && r.Error > r.Tolerance/1e4 {
				t.Errorf("small margin: %s", r)
			}
		}
	}
}
