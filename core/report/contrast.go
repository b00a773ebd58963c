package report

import (
	"math"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/units"
	"github.com/pairwell/pairwell/core/validity"
)

// Contrast relates a form to a reference form, both matched to the same
// target well (see Compare and core.Target): the numbers a comparison of
// the two in words quotes.
type Contrast struct {
	// StiffnessRatio is the form's force constant over the target's,
	// k/k_target: 1 when the form honours the target's k.
	StiffnessRatio float64
	// WavenumberRatio is the form's harmonic wavenumber over the
	// reference's; NaN when either was analysed without a reduced mass.
	WavenumberRatio float64
	// BarrierHeight is the height of the form's inner barrier above its
	// minimum, V(r_b) − V(re) in eV; NaN when it has none.
	BarrierHeight float64
}

// NewContrast compares the analysis of a form with that of the reference
// form ref, both matched to target.
func NewContrast(form, ref Inspect, target core.Target) Contrast {
	c := Contrast{StiffnessRatio: form.K / target.K, WavenumberRatio: math.NaN(), BarrierHeight: math.NaN()}
	if form.Wavenumber != nil && ref.Wavenumber != nil {
		c.WavenumberRatio = *form.Wavenumber / *ref.Wavenumber
	}
	if form.Barrier != nil {
		c.BarrierHeight = form.Barrier.Energy - form.Energy
	}
	return c
}

// Thermal compares the thermal energy at a temperature with the range of
// the period criterion of a truncation (see package validity).
type Thermal struct {
	// Temperature is T in K.
	Temperature float64
	// Energy is k_B·T in eV: the mean energy of a classical vibration at T
	// (½k_B·T kinetic and ½k_B·T potential, by equipartition).
	Energy float64
	// Fraction is Energy over the largest oscillation energy at which
	// the truncation's period holds (0 when that range is unbounded).
	Fraction float64
}

// NewThermal relates the temperature T (K) to the period range of v.
func NewThermal(v validity.Result, T float64) Thermal {
	e := T * units.BoltzmannEV
	return Thermal{Temperature: T, Energy: e, Fraction: e / v.Period.Energy}
}
