package report

import (
	"math"
	"testing"

	"github.com/stretchr/testify/assert"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/validity"
)

func TestContrast(t *testing.T) {
	ptr := func(v float64) *float64 { return &v }
	target := core.Target{Re: 1.2, Depth: 4, K: 30}
	ref := Inspect{K: 30, Wavenumber: ptr(400)}
	tests := []struct {
		name                    string
		form                    Inspect
		stiffness, wave, height float64 // NaN: not defined
	}{
		// Lennard-Jones matched to re and De: k = 72·De/re² (V″(re) of
		// ε[(re/r)¹² − 2(re/r)⁶]: (156 − 84)ε/re², by differentiation),
		// 200 eV/Å² here, 6.67× the target's.
		{"stiffer", Inspect{K: 72 * 4 / 1.44, Wavenumber: ptr(1000)}, 200.0 / 30, 2.5, math.NaN()},
		{"no mass", Inspect{K: 30}, 1, math.NaN(), math.NaN()},
		{"barrier", Inspect{K: 30, Wavenumber: ptr(400), Energy: -4, Barrier: &Barrier{R: 0.5, Energy: -3.921}}, 1, 1, 0.079},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			c := NewContrast(tt.form, ref, target)
			for _, v := range []struct {
				what      string
				got, want float64
			}{
				{"stiffness ratio", c.StiffnessRatio, tt.stiffness},
				{"wavenumber ratio", c.WavenumberRatio, tt.wave},
				{"barrier height", c.BarrierHeight, tt.height},
			} {
				if math.IsNaN(v.want) {
					assert.True(t, math.IsNaN(v.got), "%s: %g", v.what, v.got)
					continue
				}
				assert.InEpsilon(t, v.want, v.got, 1e-12, v.what)
			}
		})
	}
}

func TestThermal(t *testing.T) {
	tests := []struct {
		name     string
		limit    float64 // eV, energy of the period range
		fraction float64
	}{
		// k_B = 8.617333262e-5 eV/K (CODATA 2018): k_B·300 K = 0.025852 eV.
		{"bounded", 0.1, 0.2585199979},
		{"unbounded", math.Inf(1), 0},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			th := NewThermal(validity.Result{Period: validity.EnergyRange{Energy: tt.limit}}, 300)
			assert.Equal(t, 300.0, th.Temperature)
			assert.InEpsilon(t, 300*8.617333262e-5, th.Energy, 1e-9)
			assert.InDelta(t, tt.fraction, th.Fraction, 1e-9)
		})
	}
}
