package motion_test

import (
	"math"
	"testing"

	"github.com/pairwell/pairwell/core/motion"
	"github.com/pairwell/pairwell/core/period"
)

// heun1e8Steps is the step count per harmonic period at which one Heun
// period on the Morse test system at E = 0.1·De is within 1e-8 of the
// closed form (measured: 9.7e-9 relative; 20000 steps give 1.5e-8).
const heun1e8Steps = 25000

// BenchmarkHeunPeriod1e8 measures one period on Morse at E = 0.1·De with
// Heun to 1e-8 relative, for comparison with the cost of the exact period
// by quadrature.
func BenchmarkHeunPeriod1e8(b *testing.B) {
	o := morse(b)
	e := 0.1 * morseDe
	st, err := o.FromEnergy(e)
	if err != nil {
		b.Fatal(err)
	}
	s := motion.Settings{Method: motion.Heun, StepsPerPeriod: heun1e8Steps, Periods: 1}
	var r motion.Result
	for b.Loop() {
		r, err = o.Run(st, s)
		if err != nil {
			b.Fatal(err)
		}
	}
	if rel := math.Abs(r.Period/morsePeriod(e) - 1); rel > 1e-8 {
		b.Fatalf("relative error %g > 1e-8", rel)
	}
	b.ReportMetric(float64(r.ForceEvals), "evals/op")
}

// BenchmarkExactSameCase is the exact period by quadrature (period.Exact at
// tolerance 1e-10) for the case of BenchmarkHeunPeriod1e8; the ratio of the
// two is the cost of measuring a period by trajectory over computing it.
func BenchmarkExactSameCase(b *testing.B) {
	o := morse(b)
	e := 0.1 * morseDe
	in, err := period.NewIntegrator(period.Settings{Tolerance: 1e-10})
	if err != nil {
		b.Fatal(err)
	}
	var r period.Result
	for b.Loop() {
		r, err = in.Exact(morsePot(b), o.Well(), morseMu, e)
		if err != nil {
			b.Fatal(err)
		}
	}
	if rel := math.Abs(r.Period/morsePeriod(e) - 1); rel > 1e-10 {
		b.Fatalf("relative error %g > 1e-10", rel)
	}
}

// BenchmarkDefault runs each method at its defaults (10 periods) on Morse
// at E = 0.5·De.
func BenchmarkDefault(b *testing.B) {
	o := morse(b)
	st, err := o.FromEnergy(0.5 * morseDe)
	if err != nil {
		b.Fatal(err)
	}
	for _, m := range motion.Methods() {
		b.Run(m.String(), func(b *testing.B) {
			var r motion.Result
			for b.Loop() {
				r, err = o.Run(st, motion.Settings{Method: m})
				if err != nil {
					b.Fatal(err)
				}
			}
			b.ReportMetric(float64(r.ForceEvals), "evals/op")
		})
	}
}
