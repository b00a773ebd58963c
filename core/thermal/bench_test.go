package thermal

import (
	"testing"

	"github.com/pairwell/pairwell/core/levels"
)

// BenchmarkExpansion100 is the thermal expansion of the HCl-like Morse bond
// at 100 temperatures from 10 K to 2500 K, including the quantum column:
// every bound J = 0 level solved (levels.Solve) and the classical
// quadrature, New included.
func BenchmarkExpansion100(b *testing.B) {
	p := morse(b)
	ts := make([]float64, 100)
	for i := range ts {
		ts[i] = 10 + 24.9*float64(i)
	}
	for b.Loop() {
		res, err := levels.Solve(p, 0.9797, levels.Settings{})
		if err != nil {
			b.Fatal(err)
		}
		lv := make([]Level, len(res.Levels))
		for i, l := range res.Levels {
			lv[i] = Level{Energy: l.Energy, MeanR: l.MeanR, MeanSquareR: l.MeanSquareR}
		}
		e, err := New(p, Settings{})
		if err != nil {
			b.Fatal(err)
		}
		if _, err := e.Points(ts, lv); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkClassical100 is the classical and cubic columns alone.
func BenchmarkClassical100(b *testing.B) {
	p := morse(b)
	ts := make([]float64, 100)
	for i := range ts {
		ts[i] = 10 + 24.9*float64(i)
	}
	for b.Loop() {
		e, err := New(p, Settings{})
		if err != nil {
			b.Fatal(err)
		}
		if _, err := e.Points(ts, nil); err != nil {
			b.Fatal(err)
		}
	}
}
