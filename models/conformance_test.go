package models_test

import (
	"testing"

	"github.com/pairwell/pairwell/conformance"
	"github.com/pairwell/pairwell/models"
)

// TestConformance runs the conformance suite on every built-in form: at its
// representative parameter set and at stiff, soft and extreme ones
// (invented values). Every built-in form must pass it.
func TestConformance(t *testing.T) {
	extra := map[string][][]float64{
		"morse": {
			{4.6, 1.87, 1.27}, // De eV, a 1/Å, re Å: an HCl-like bond
			{0.01, 0.5, 4},    // shallow and wide
			{10, 5, 1},        // deep and stiff
		},
		"lennard-jones": {
			{0.0104, 3.4}, // epsilon eV (≈ 120 K), sigma Å: argon-like
			{0.5, 1.1},
			{1e-4, 10},
		},
		"buckingham": {
			{1500, 0.3, 25},
			{1000, 0.2, 1},
			{1, 0.5, 0.15}, // barrier close to the minimum
		},
		"harmonic": {
			{30, 1.2},
			{0.1, 3},
		},
	}
	for _, m := range models.Builtin() {
		key := m.Info().Key
		t.Run(key, func(t *testing.T) {
			sets, ok := extra[key]
			if !ok {
				t.Fatalf("no parameter sets for the built-in form %q: add some here", key)
			}
			conformance.Test(t, m)
			conformance.Test(t, m, sets...)
		})
	}
}
