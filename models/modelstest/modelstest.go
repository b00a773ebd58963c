// Package modelstest provides the built-in forms, with their wells, as
// fixtures for tests of the analysis built on them.
package modelstest

import (
	"testing"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/models"
)

// Form is a built-in potential with its analysed well.
type Form struct {
	Name string
	P    core.Potential
	W    core.Well
}

// NewForm builds m with params and analyses its well, failing t on error.
func NewForm(t testing.TB, name string, m core.Model, params []float64) Form {
	t.Helper()
	p, err := m.New(params)
	if err != nil {
		t.Fatalf("%s: %v", name, err)
	}
	w, err := core.AnalyzeWell(p, core.WellSettings{})
	if err != nil {
		t.Fatalf("%s: %v", name, err)
	}
	return Form{name, p, w}
}

// Forms returns the four built-in forms at illustrative parameters (not
// fitted to data): Morse (De = 4.4 eV, a = 1.9/Å, re = 1.27 Å), an
// argon-like Lennard-Jones (ε = 0.0104 eV, σ = 3.4 Å), Buckingham matched
// to an invented bond (re = 1.2 Å, De = 4 eV, k = 30 eV/Å²) and harmonic
// (k = 30 eV/Å², r0 = 1.2 Å).
func Forms(t testing.TB) []Form {
	t.Helper()
	bk, _, err := models.Buckingham{}.Match(core.Target{Re: 1.2, Depth: 4, K: 30})
	if err != nil {
		t.Fatal(err)
	}
	return []Form{
		NewForm(t, "morse", models.Morse{}, []float64{4.4, 1.9, 1.27}),
		NewForm(t, "lj", models.LennardJones{}, []float64{0.0104, 3.4}),
		NewForm(t, "buckingham", models.Buckingham{}, bk),
		NewForm(t, "harmonic", models.Harmonic{}, []float64{30, 1.2}),
	}
}
