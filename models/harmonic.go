package models

import (
	"fmt"
	"math"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/units"
)

const (
	harmonicKey       = "harmonic"
	harmonicReference = "Hooke's law; harmonic oscillator (e.g. G. Herzberg, Spectra of Diatomic Molecules, 1950)"
)

// Harmonic is the harmonic model, key "harmonic":
//
//	V(r) = ½k(r − r0)²
//
// Parameters, in order: k (eV/Å², > 0), r0 (Å, > 0). V″(r0) = k.
type Harmonic struct{}

// Info returns the metadata of the harmonic form.
func (Harmonic) Info() core.ModelInfo {
	return core.ModelInfo{
		Key:     harmonicKey,
		Name:    "Harmonic",
		Formula: "V = ½ k (r − r0)²",
		Params: []core.Param{
			{Name: "k", Dimension: units.ForceConstant, Constraint: core.Positive, Meaning: "force constant V″(r0)"},
			{Name: "r0", Dimension: units.Length, Constraint: core.Positive, Meaning: "equilibrium distance"},
		},
		Domain:    "every r > 0; grows without bound (no dissociation)",
		Reference: harmonicReference,
		Notes:     "V = ½k(r−r0)², so V″(r0) = k; some codes write k(r−r0)² without the ½ — halve their k or double yours",
		MaxOrder:  MaxOrder,
		Origin:    origin,
	}
}

// New builds a harmonic potential from (k, r0).
func (m Harmonic) New(params []float64) (core.Potential, error) {
	if err := core.CheckParams(m.Info(), params); err != nil {
		return nil, err
	}
	return &HarmonicPotential{k: params[0], r0: params[1], halfK: 0.5 * params[0]}, nil
}

// NewHarmonic builds a harmonic potential with force constant k (eV/Å²)
// and equilibrium distance r0 (Å).
func NewHarmonic(k, r0 float64) (*HarmonicPotential, error) {
	p, err := Harmonic{}.New([]float64{k, r0})
	if err != nil {
		return nil, err
	}
	return p.(*HarmonicPotential), nil
}

// Match returns (k, r0) = (K, re). A harmonic well has no finite depth, so
// a target Depth is not honoured (a note says so).
func (Harmonic) Match(t core.Target) ([]float64, []string, error) {
	if !positive(t.Re) || !positive(t.K) {
		return nil, nil, fmt.Errorf("%s: %w: matching needs re > 0 and k > 0 (got re = %g Å, k = %g eV/Å²)",
			harmonicKey, core.ErrParam, t.Re, t.K)
	}
	var notes []string
	if t.Depth != 0 {
		notes = append(notes, fmt.Sprintf("De = %g eV not honoured: the harmonic well grows without bound and has no dissociation limit", t.Depth))
	}
	return []float64{t.K, t.Re}, notes, nil
}

// HarmonicPotential is a harmonic potential. It is immutable and safe for
// concurrent use.
type HarmonicPotential struct {
	k, r0, halfK float64
}

// Params returns (k, r0).
func (p *HarmonicPotential) Params() []float64 { return []float64{p.k, p.r0} }

// Domain is (0, +Inf) with Limit +Inf: the form is unbounded.
func (p *HarmonicPotential) Domain() core.Domain {
	return core.Domain{Min: 0, Max: math.Inf(1), Limit: math.Inf(1)}
}

// MaxOrder returns MaxOrder. Orders ≥ 3 are identically 0.
func (p *HarmonicPotential) MaxOrder() int { return MaxOrder }

// EquilibriumGuess returns r0, the exact minimum.
func (p *HarmonicPotential) EquilibriumGuess() float64 { return p.r0 }

// Identities returns r0, V(r0) = 0 and V″(r0) = k.
func (p *HarmonicPotential) Identities() []core.Identity {
	const src = "harmonic form V = ½k(r − r0)²"
	return []core.Identity{
		{Name: "r_min = r0", Quantity: core.EquilibriumR, Value: p.r0, Source: src},
		{Name: "V(r0) = 0", Quantity: core.MinimumEnergy, Value: 0, Source: src},
		{Name: "V″(r0) = k", Quantity: core.DerivativeAtMinimum, Order: 2, Value: p.k, Source: src},
		{Name: "V‴(r0) = 0", Quantity: core.DerivativeAtMinimum, Order: 3, Value: 0, Source: src},
	}
}

// term returns V⁽ⁿ⁾ at d = r − r0; shared by Derivatives and Batch.
func (p *HarmonicPotential) term(n int, d float64) float64 {
	switch n {
	case 0:
		return p.halfK * d * d
	case 1:
		return p.k * d
	case 2:
		return p.k
	}
	return 0
}

func (p *HarmonicPotential) domainError(r float64) error {
	return fmt.Errorf("%s: %w", harmonicKey, core.CheckR(p.Domain(), r))
}

// Derivatives stores V⁽ᵏ⁾(r) in dst[k], k = 0, …, len(dst)−1.
func (p *HarmonicPotential) Derivatives(r float64, dst []float64) error {
	if !(r > 0 && r <= math.MaxFloat64) {
		return p.domainError(r)
	}
	if len(dst) > MaxOrder+1 {
		return fmt.Errorf("%s: %w", harmonicKey, core.CheckOrder(len(dst)-1, MaxOrder))
	}
	d := r - p.r0
	for k := range dst {
		dst[k] = p.term(k, d)
	}
	if len(dst) > 0 && !finite(dst[0]) {
		return overflowError(harmonicKey, r, 0)
	}
	return nil
}

// Batch stores V⁽ⁿ⁾(r[i]) in dst[i].
func (p *HarmonicPotential) Batch(n int, r, dst []float64) error {
	if len(r) != len(dst) {
		return lengthError(harmonicKey, len(r), len(dst))
	}
	if err := core.CheckOrder(n, MaxOrder); err != nil {
		return fmt.Errorf("%s: %w", harmonicKey, err)
	}
	dst = dst[:len(r)]
	for i, x := range r {
		if !(x > 0 && x <= math.MaxFloat64) {
			return pointError(i, x, p.domainError(x))
		}
		v := p.term(n, x-p.r0)
		if !finite(v) {
			return pointError(i, x, overflowError(harmonicKey, x, n))
		}
		dst[i] = v
	}
	return nil
}
