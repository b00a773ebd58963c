package models

import (
	"fmt"
	"math"

	"github.com/pairwell/pairwell/conformance"
	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/units"
)

const (
	morseKey       = "morse"
	morseReference = "P. M. Morse, Phys. Rev. 34, 57 (1929)"
)

// Morse is the Morse model, key "morse":
//
//	V(r) = De[(1 − e^{−a(r−re)})² − 1]
//
// with the zero of energy at dissociation, so V(re) = −De. Parameters, in
// order: De (eV, > 0), a (1/Å, > 0), re (Å, > 0).
type Morse struct{}

// Info returns the metadata of the Morse form.
func (Morse) Info() core.ModelInfo {
	return core.ModelInfo{
		Key:     morseKey,
		Name:    "Morse",
		Formula: "V = De[(1 − exp(−a(r − re)))² − 1]",
		Params: []core.Param{
			{Name: "De", Dimension: units.Energy, Constraint: core.Positive, Meaning: "well depth V(∞) − V(re)"},
			{Name: "a", Dimension: units.InverseLength, Constraint: core.Positive, Meaning: "range parameter (inverse width of the well)"},
			{Name: "re", Dimension: units.Length, Constraint: core.Positive, Meaning: "equilibrium distance"},
		},
		Domain:    "every r > 0; V → 0 as r → ∞",
		Reference: morseReference,
		Notes: "Energy zero at dissociation: V(re) = −De, V″(re) = 2De·a². " +
			"Some codes write De(1 − e^{−a(r−re)})² with the zero at the minimum; subtract De from theirs to compare.",
		MaxOrder: MaxOrder,
		Origin:   origin,
	}
}

// New builds a Morse potential from (De, a, re).
func (m Morse) New(params []float64) (core.Potential, error) {
	if err := core.CheckParams(m.Info(), params); err != nil {
		return nil, err
	}
	return newMorse(params[0], params[1], params[2]), nil
}

// NewMorse builds a Morse potential with depth De (eV), range a (1/Å) and
// equilibrium distance re (Å).
func NewMorse(De, a, re float64) (*MorsePotential, error) {
	p, err := Morse{}.New([]float64{De, a, re})
	if err != nil {
		return nil, err
	}
	return p.(*MorsePotential), nil
}

func newMorse(De, a, re float64) *MorsePotential {
	p := &MorsePotential{de: De, a: a, re: re}
	// t2[k] = De(−2a)ᵏ/k!, t1[k] = 2De(−a)ᵏ/k!, by the recurrence
	// t[k] = t[k−1]·(−m·a)/k: bounded in k, no factorial or power overflows.
	p.t2[0], p.t1[0] = De, 2*De
	for k := 1; k <= MaxOrder; k++ {
		p.t2[k] = p.t2[k-1] * (-2 * a) / float64(k)
		p.t1[k] = p.t1[k-1] * -a / float64(k)
	}
	return p
}

// Match returns (De, a, re) with the target's re, depth De = Depth and
// a = √(K/(2De)), so that V″(re) = K exactly. All three of re, Depth and K
// must be given.
func (Morse) Match(t core.Target) ([]float64, []string, error) {
	if !positive(t.Re) || !positive(t.Depth) || !positive(t.K) {
		return nil, nil, fmt.Errorf("%s: %w: matching needs re, De and k, all > 0 (got re = %g Å, De = %g eV, k = %g eV/Å²)",
			morseKey, core.ErrParam, t.Re, t.Depth, t.K)
	}
	return []float64{t.Depth, math.Sqrt(t.K / (2 * t.Depth)), t.Re}, nil, nil
}

// MorseFromSpectroscopic returns the Morse parameters (De, a, re), in eV,
// 1/Å and Å, of a diatomic with harmonic wavenumber omegaE = ωe (cm⁻¹),
// anharmonicity constant omegaExe = ωe·xe (cm⁻¹), equilibrium distance re (Å)
// and reduced mass mu (u). It uses the Morse relations (Morse 1929; Herzberg,
// Spectra of Diatomic Molecules, 1950)
//
//	De = ωe²/(4ωe·xe),  k = μω²,  a = √(k/(2De)),
//
// with ω = 2πc·ωe and 1 cm⁻¹ = h·c·100 cm/m = units.WavenumberEV eV.
// Note that De here is the depth measured from the minimum, not the
// spectroscopic D0 = De − ½ωe + ¼ωe·xe.
func MorseFromSpectroscopic(omegaE, omegaExe, re, mu float64) ([]float64, error) {
	for _, v := range []struct {
		name string
		v    float64
	}{{"omegaE", omegaE}, {"omegaExe", omegaExe}, {"re", re}, {"mu", mu}} {
		if err := core.Positive.Check(v.name, v.v); err != nil {
			return nil, fmt.Errorf("%s: spectroscopic constants: %w", morseKey, err)
		}
	}
	De := omegaE * omegaE / (4 * omegaExe) * units.WavenumberEV
	omega := units.AngularFromWavenumber(omegaE)
	k := mu * omega * omega / omega2PerForceConstant
	a := math.Sqrt(k / (2 * De))
	params := []float64{De, a, re}
	if err := core.CheckParams(Morse{}.Info(), params); err != nil {
		return nil, err
	}
	return params, nil
}

// omega2PerForceConstant is ω² in (rad/fs)² of k/μ = 1 eV/(Å²·u), the
// factor units.AngularFrequency applies: e/(10⁻²⁰ m² · m_u) s⁻² × 10⁻³⁰ s²/fs².
const omega2PerForceConstant = units.ElectronVolt / (1e-20 * units.Dalton) * 1e-30

// MorseSpectroscopic is the inverse of MorseFromSpectroscopic: the harmonic
// wavenumber ωe = √(2De·a²/μ)/(2πc) and the anharmonicity ωe·xe = ωe²/(4De),
// both in cm⁻¹, of a Morse well of depth De (eV) and range a (1/Å) for a
// reduced mass mu (u). Invalid inputs give NaN or ±Inf.
func MorseSpectroscopic(De, a, mu float64) (omegaE, omegaExe float64) {
	omegaE = units.Wavenumber(units.AngularFrequency(2*De*a*a, mu))
	omegaExe = omegaE * omegaE / (4 * (De / units.WavenumberEV))
	return omegaE, omegaExe
}

// MorsePotential is a Morse potential. It is immutable and safe for
// concurrent use.
type MorsePotential struct {
	de, a, re float64
	// t2 and t1 hold De(−2a)ᵏ/k! and 2De(−a)ᵏ/k!, k = 0…MaxOrder, so that
	// c_k(r) = t2[k]·y² − t1[k]·y with y = e^{−a(r−re)}.
	t2, t1 [MaxOrder + 1]float64
}

// Params returns (De, a, re).
func (p *MorsePotential) Params() []float64 { return []float64{p.de, p.a, p.re} }

// Domain is (0, +Inf) with dissociation limit 0; the minimum is at re.
func (p *MorsePotential) Domain() core.Domain {
	return core.Domain{Min: 0, Max: math.Inf(1), Limit: 0, EquilibriumGuess: p.re}
}

// MaxOrder returns MaxOrder.
func (p *MorsePotential) MaxOrder() int { return MaxOrder }

// Identities returns re, V(re) = −De and V⁽ⁿ⁾(re) = De(−a)ⁿ(2ⁿ − 2) for
// n = 2, 3, 4 (Taylor coefficients cₙ = De(−a)ⁿ(2ⁿ − 2)/n!).
func (p *MorsePotential) Identities() []conformance.Identity {
	de, a := p.de, p.a
	return []conformance.Identity{
		{Name: "r_min = re", Quantity: conformance.EquilibriumR, Value: p.re, Source: morseReference},
		{Name: "V(re) = −De", Quantity: conformance.MinimumEnergy, Value: -de, Source: morseReference},
		{Name: "V″(re) = 2De·a²", Quantity: conformance.DerivativeAtMinimum, Order: 2, Value: 2 * de * a * a, Source: morseReference},
		{Name: "V‴(re) = −6De·a³", Quantity: conformance.DerivativeAtMinimum, Order: 3, Value: -6 * de * a * a * a, Source: morseReference},
		{Name: "V⁗(re) = 14De·a⁴", Quantity: conformance.DerivativeAtMinimum, Order: 4, Value: 14 * de * a * a * a * a, Source: morseReference},
	}
}

func (p *MorsePotential) domainError(r float64) error {
	return fmt.Errorf("%s: %w", morseKey, core.CheckR(p.Domain(), r))
}

// Taylor stores c_k(r[i]) = V⁽ᵏ⁾(r[i])/k! at dst[i·(n+1)+k]. With
// y = e^{−a(r−re)}, V = De(y² − 2y) and dᵏyᵐ/drᵏ = (−ma)ᵏyᵐ, so
//
//	c_k = De(−2a)ᵏ/k!·y² − 2De(−a)ᵏ/k!·y,
//
// one exponential per point and two products per coefficient.
func (p *MorsePotential) Taylor(n int, r, dst []float64) error {
	if err := core.CheckTaylor(n, MaxOrder, len(r), len(dst)); err != nil {
		return fmt.Errorf("%s: %w", morseKey, err)
	}
	w := n + 1
	t2, t1 := p.t2[:w], p.t1[:w]
	for i, x := range r {
		if !(x > 0 && x <= math.MaxFloat64) {
			return pointError(i, x, p.domainError(x))
		}
		y := exp(p.a * (p.re - x))
		y2 := y * y
		row := dst[i*w : i*w+w]
		acc := 0.0
		for k := range row {
			v := t2[k]*y2 - t1[k]*y
			row[k] = v
			acc += v - v
		}
		if acc != 0 { // NaN unless every coefficient is finite
			return pointError(i, x, firstOverflow(morseKey, x, row))
		}
	}
	return nil
}
