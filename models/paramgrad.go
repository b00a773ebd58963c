package models

import (
	"math"

	"github.com/pairwell/pairwell/core"
)

// Derivatives of the built-in forms with respect to their parameters, the
// optional core.ParamGradient: ∂V(r[i])/∂pⱼ in dst[i·P+j], row-major, in the
// order and default units of each form's parameters. They let a fit use an
// analytic Jacobian instead of central differences. Each checks the domain
// as Taylor does.

// gradCheck checks the lengths and the domain of every r (r > min).
func gradCheck(key string, r, dst []float64, np int, min float64, domain func(float64) error) error {
	if err := core.CheckParamGradient(key, np, r, dst); err != nil {
		return err
	}
	for i, x := range r {
		if !(x > min && x <= math.MaxFloat64) {
			return pointError(i, x, domain(x))
		}
	}
	return nil
}

// ParamGradient stores (∂V/∂De, ∂V/∂a, ∂V/∂re) at each r: with
// y = e^{−a(r−re)} and V = De(y² − 2y),
//
//	∂V/∂De = y² − 2y,  ∂V/∂a = −2De(y − 1)y(r − re),  ∂V/∂re = 2De·a(y − 1)y.
func (p *MorsePotential) ParamGradient(r, dst []float64) error {
	if err := gradCheck(morseKey, r, dst, 3, 0, p.domainError); err != nil {
		return err
	}
	for i, x := range r {
		y := exp(p.a * (p.re - x))
		t := 2 * p.de * (y - 1) * y
		g := dst[3*i : 3*i+3]
		g[0] = y*y - 2*y
		g[1] = -t * (x - p.re)
		g[2] = t * p.a
	}
	return nil
}

// ParamGradient stores (∂V/∂ε, ∂V/∂σ) at each r: with s = σ/r and
// V = 4ε(s¹² − s⁶),
//
//	∂V/∂ε = 4(s¹² − s⁶),  ∂V/∂σ = 4ε(12s¹² − 6s⁶)/σ.
func (p *LennardJonesPotential) ParamGradient(r, dst []float64) error {
	if err := gradCheck(ljKey, r, dst, 2, 0, p.domainError); err != nil {
		return err
	}
	for i, x := range r {
		s := p.sigma / x
		s6 := s * s * s
		s6 *= s6
		s12 := s6 * s6
		dst[2*i] = 4 * (s12 - s6)
		dst[2*i+1] = p.eps4 * (12*s12 - 6*s6) / p.sigma
	}
	return nil
}

// ParamGradient stores (∂V/∂k, ∂V/∂r0) at each r: V = ½k(r − r0)²,
//
//	∂V/∂k = ½(r − r0)²,  ∂V/∂r0 = −k(r − r0).
func (p *HarmonicPotential) ParamGradient(r, dst []float64) error {
	if err := gradCheck(harmonicKey, r, dst, 2, 0, p.domainError); err != nil {
		return err
	}
	for i, x := range r {
		d := x - p.r0
		dst[2*i] = 0.5 * d * d
		dst[2*i+1] = -p.k * d
	}
	return nil
}

// ParamGradient stores (∂V/∂A, ∂V/∂ρ, ∂V/∂C) at each r beyond the barrier:
// V = A·e^{−r/ρ} − C/r⁶,
//
//	∂V/∂A = e^{−r/ρ},  ∂V/∂ρ = A·e^{−r/ρ}·r/ρ²,  ∂V/∂C = −1/r⁶.
func (p *BuckinghamPotential) ParamGradient(r, dst []float64) error {
	if err := gradCheck(buckinghamKey, r, dst, 3, p.rb, p.domainError); err != nil {
		return err
	}
	for i, x := range r {
		e := exp(x * p.mInvRho)
		x3 := x * x * x
		g := dst[3*i : 3*i+3]
		g[0] = e
		g[1] = p.a * e * x / (p.rho * p.rho)
		g[2] = -1 / (x3 * x3)
	}
	return nil
}
