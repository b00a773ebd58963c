package fit

import (
	"fmt"
	"math"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/units"
)

// Data is reference data for a fit: energies E(rᵢ) of a scan, optionally
// forces and weights. Points are in order of increasing r.
type Data struct {
	// R holds the separations in Å, strictly increasing.
	R []float64
	// E holds the energies in eV, absolute or relative: Settings.Offset
	// says where their zero lies.
	E []float64
	// F holds the forces −dE/dr in eV/Å; nil when the data have none.
	F []float64
	// W holds per-point weights (≥ 0) given with the data; nil when none.
	// They are used when Settings.Weights.Scheme is FileWeights, or is
	// DefaultWeights and W is not nil.
	W []float64
}

// Validate checks lengths, order and finiteness; every error wraps
// core.ErrParam and names the point (1-based).
func (d Data) Validate() error {
	n := len(d.R)
	if n == 0 {
		return fmt.Errorf("%w: no data points", core.ErrParam)
	}
	if len(d.E) != n || (d.F != nil && len(d.F) != n) || (d.W != nil && len(d.W) != n) {
		return fmt.Errorf("%w: data columns differ in length", core.ErrParam)
	}
	for i := range d.R {
		ok := d.R[i] > 0 && !math.IsInf(d.R[i], 0) && finite(d.E[i])
		if d.F != nil {
			ok = ok && finite(d.F[i])
		}
		if d.W != nil {
			ok = ok && finite(d.W[i]) && d.W[i] >= 0
		}
		if !ok {
			return fmt.Errorf("%w: point %d: r must be finite and > 0, E (and F) finite, a weight finite and ≥ 0", core.ErrParam, i+1)
		}
		if i > 0 && !(d.R[i] > d.R[i-1]) {
			return fmt.Errorf("%w: point %d: r = %g Å does not increase (previous %g Å)", core.ErrParam, i+1, d.R[i], d.R[i-1])
		}
	}
	return nil
}

func finite(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }

// OffsetMode says where the zero of the data's energies lies.
type OffsetMode int

const (
	// OffsetAuto takes the energy at the largest r as the zero (the
	// dissociation limit of a scan that reaches far enough). The zero
	// value.
	OffsetAuto OffsetMode = iota
	// OffsetFit fits the energy zero as an extra parameter.
	OffsetFit
	// OffsetValue takes Offset.Value (eV) as the zero.
	OffsetValue
)

// Offset is the energy zero of the data: a model's energies are compared
// with E − zero. A form without a dissociation limit (Domain().Limit
// infinite, such as harmonic) has its zero at its minimum instead, so its
// offset is always fitted.
type Offset struct {
	Mode  OffsetMode
	Value float64 // eV, for OffsetValue
}

// WeightScheme selects the weight of each point.
type WeightScheme int

const (
	// DefaultWeights uses the data's own weights when it has them,
	// otherwise uniform weights. The zero value.
	DefaultWeights WeightScheme = iota
	// Uniform gives every point weight 1.
	Uniform
	// Boltzmann gives point i the weight exp(−(Eᵢ − E_min)/(k_B·T)).
	Boltzmann
	// Window gives weight 1 to points with Eᵢ − E_min ≤ W and drops the
	// others (weight 0).
	Window
	// FileWeights uses Data.W.
	FileWeights
)

// Weights selects the weight of each point of the energy residuals.
type Weights struct {
	Scheme WeightScheme
	// T is the temperature in K of Boltzmann weights (> 0).
	T float64
	// Window is the energy window W in eV of Window weights (> 0).
	Window float64
}

// weights returns the weight of every point, and an error wrapping
// core.ErrParam for an invalid scheme.
func (w Weights) weights(d Data) ([]float64, error) {
	n := len(d.R)
	out := make([]float64, n)
	emin := math.Inf(1)
	for _, e := range d.E {
		emin = math.Min(emin, e)
	}
	switch w.Scheme {
	case DefaultWeights, Uniform, FileWeights:
		if w.Scheme != Uniform && d.W != nil {
			copy(out, d.W)
			break
		}
		if w.Scheme == FileWeights {
			return nil, fmt.Errorf("%w: weights from the data requested, but the data have no weight column", core.ErrParam)
		}
		for i := range out {
			out[i] = 1
		}
	case Boltzmann:
		if !(w.T > 0) || math.IsInf(w.T, 0) {
			return nil, fmt.Errorf("%w: Boltzmann weights need a temperature > 0 K, got %g K", core.ErrParam, w.T)
		}
		kT := units.BoltzmannEV * w.T
		for i, e := range d.E {
			out[i] = math.Exp(-(e - emin) / kT)
		}
	case Window:
		if !(w.Window > 0) || math.IsInf(w.Window, 0) {
			return nil, fmt.Errorf("%w: an energy window must be > 0 eV, got %g eV", core.ErrParam, w.Window)
		}
		for i, e := range d.E {
			if e-emin <= w.Window {
				out[i] = 1
			}
		}
	default:
		return nil, fmt.Errorf("%w: unknown weight scheme %d", core.ErrParam, w.Scheme)
	}
	return out, nil
}
