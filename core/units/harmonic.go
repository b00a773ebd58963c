package units

import "math"

// AngularFrequency returns the harmonic angular frequency ω = √(k/μ) in rad/fs
// for a force constant k in eV/Å² and a (reduced) mass μ in u.
//
// 1 eV/(Å²·u) corresponds to ω² = e/(10⁻²⁰ m² · m_u) s⁻², so that
// ω ≈ 0.0982269 rad/fs for k = 1 eV/Å² and μ = 1 u.
// The result is NaN if k/μ < 0 or either argument is NaN, and +Inf if μ = 0 and k > 0;
// callers should validate their inputs.
func AngularFrequency(k, mu float64) float64 {
	return math.Sqrt(k / mu * omega2Unit)
}

// Wavenumber converts an angular frequency ω in rad/fs to a wavenumber
// ν̃ = ω/(2πc) in cm⁻¹, with c in cm/fs.
func Wavenumber(omega float64) float64 {
	return omega / (2 * math.Pi * lightCmPerFs)
}

// AngularFromWavenumber converts a wavenumber ν̃ in cm⁻¹ to an angular frequency
// ω = 2πcν̃ in rad/fs. It is the inverse of Wavenumber.
func AngularFromWavenumber(nu float64) float64 {
	return nu * (2 * math.Pi * lightCmPerFs)
}
