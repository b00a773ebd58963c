package models

import (
	"fmt"
	"math"

	"github.com/pairwell/pairwell/conformance"
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

// Domain is (0, +Inf) with Limit +Inf: the form is unbounded. The minimum
// is at r0.
func (p *HarmonicPotential) Domain() core.Domain {
	return core.Domain{Min: 0, Max: math.Inf(1), Limit: math.Inf(1), EquilibriumGuess: p.r0}
}

// MaxOrder returns MaxOrder. Coefficients of order ≥ 3 are identically 0.
func (p *HarmonicPotential) MaxOrder() int { return MaxOrder }

// Identities returns r0, V(r0) = 0 and V″(r0) = k.
func (p *HarmonicPotential) Identities() []conformance.Identity {
	const src = "harmonic form V = ½k(r − r0)²"
	return []conformance.Identity{
		{Name: "r_min = r0", Quantity: conformance.EquilibriumR, Value: p.r0, Source: src},
		{Name: "V(r0) = 0", Quantity: conformance.MinimumEnergy, Value: 0, Source: src},
		{Name: "V″(r0) = k", Quantity: conformance.DerivativeAtMinimum, Order: 2, Value: p.k, Source: src},
		{Name: "V‴(r0) = 0", Quantity: conformance.DerivativeAtMinimum, Order: 3, Value: 0, Source: src},
	}
}

func (p *HarmonicPotential) domainError(r float64) error {
	return fmt.Errorf("%s: %w", harmonicKey, core.CheckR(p.Domain(), r))
}

// Taylor stores c_k(r[i]) at dst[i·(n+1)+k]: with d = r − r0,
// c_0 = ½k·d², c_1 = k·d, c_2 = ½k and c_k = 0 for k ≥ 3.
func (p *HarmonicPotential) Taylor(n int, r, dst []float64) error {
	if err := core.CheckTaylor(n, MaxOrder, len(r), len(dst)); err != nil {
		return fmt.Errorf("%s: %w", harmonicKey, err)
	}
	w := n + 1
	for i, x := range r {
		if !(x > 0 && x <= math.MaxFloat64) {
			return pointError(i, x, p.domainError(x))
		}
		d := x - p.r0
		row := dst[i*w : i*w+w]
		row[0] = p.halfK * d * d
		if !finite(row[0]) {
			return pointError(i, x, firstOverflow(harmonicKey, x, row[:1]))
		}
		if w > 1 {
			row[1] = p.k * d
		}
		if w > 2 {
			row[2] = p.halfK
			clear(row[3:])
		}
	}
	return nil
}
