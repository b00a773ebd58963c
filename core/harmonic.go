package core

import (
	"fmt"
	"math"

	"github.com/pairwell/pairwell/core/units"
)

// Harmonic is the small-amplitude vibration of a pair in a well of force
// constant k: ω = √(k/μ).
type Harmonic struct {
	K            float64 // force constant, eV/Å²
	Mu           float64 // reduced mass, u
	Omega        float64 // angular frequency, rad/fs
	Wavenumber   float64 // ω/(2πc), cm⁻¹
	FrequencyTHz float64 // ω/(2π), THz
	PeriodFs     float64 // 2π/ω, fs
}

// NewHarmonic returns the harmonic vibration for force constant k in eV/Å²
// and reduced mass mu in u. Both must be finite and positive.
func NewHarmonic(k, mu float64) (Harmonic, error) {
	if err := Positive.Check("force constant", k); err != nil {
		return Harmonic{}, fmt.Errorf("harmonic frequency: %w", err)
	}
	if err := Positive.Check("reduced mass", mu); err != nil {
		return Harmonic{}, fmt.Errorf("harmonic frequency: %w", err)
	}
	w := units.AngularFrequency(k, mu)
	return Harmonic{
		K:            k,
		Mu:           mu,
		Omega:        w,
		Wavenumber:   units.Wavenumber(w),
		FrequencyTHz: w / (2 * math.Pi) * 1e3,
		PeriodFs:     2 * math.Pi / w,
	}, nil
}
