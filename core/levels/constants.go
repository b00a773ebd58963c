package levels

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/mat"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/units"
)

// Spectroscopic constants, all in cm⁻¹, three ways: from the curvature of
// the well (harmonic), from its Taylor coefficients by Dunham's
// perturbation theory, and from the computed levels by least squares.

// HarmonicConstants are the constants of the harmonic, rigid picture.
type HarmonicConstants struct {
	// OmegaE is ωe = √(k/μ)/(2πc), k = V″(re).
	OmegaE float64
	// Be is the rotational constant ħ²/(2μre²) as a wavenumber,
	// h/(8π²cμre²).
	Be float64
}

// Harmonic returns ωe and Be of the well w for the reduced mass mu (u).
func Harmonic(w core.Well, mu float64) HarmonicConstants {
	return HarmonicConstants{
		OmegaE: units.Wavenumber(units.AngularFrequency(w.K, mu)),
		Be:     rotational(w.Re, mu),
	}
}

// rotational returns ħ²/(2μr²) in cm⁻¹.
func rotational(r, mu float64) float64 {
	return hbar2Over2u / mu / (r * r) / units.WavenumberEV
}

// DunhamConstants are the lowest-order results of J. L. Dunham, Phys. Rev.
// 41, 721 (1932), for V = a₀ξ²(1 + a₁ξ + a₂ξ² + …), ξ = (r − re)/re:
//
//	a₀ = c₂re², a₁ = c₃re/c₂, a₂ = c₄re²/c₂  (c_n = V⁽ⁿ⁾(re)/n!),
//	ωexe = −Y₂₀ = −(3Be/2)(a₂ − 5a₁²/4),
//	αe = −Y₁₁ = −(6Be²/ωe)(1 + a₁),
//	Y₀₀ = (Be/8)(3a₂ − 7a₁²/4),
//	De = −Y₀₂ = 4Be³/ωe² (the centrifugal constant).
//
// For a Morse well they give ωexe = ωe²/(4De), the αe of Pekeris and
// Y₀₀ = 0.
type DunhamConstants struct {
	OmegaExe, AlphaE, Y00, CentrifugalDe float64
	A1, A2                               float64 // Dunham's a₁, a₂ (dimensionless)
}

// Dunham returns the perturbative constants of w for the reduced mass mu
// (u). w.Taylor must reach c₄; otherwise the error wraps core.ErrOrder.
func Dunham(w core.Well, mu float64) (DunhamConstants, error) {
	if len(w.Taylor) < 5 {
		return DunhamConstants{}, fmt.Errorf("dunham constants: %w: need the Taylor coefficients up to c₄", core.ErrOrder)
	}
	h := Harmonic(w, mu)
	c2, c3, c4 := w.Taylor[2], w.Taylor[3], w.Taylor[4]
	a1 := c3 * w.Re / c2
	a2 := c4 * w.Re * w.Re / c2
	be, we := h.Be, h.OmegaE
	return DunhamConstants{
		OmegaExe:      -1.5 * be * (a2 - 1.25*a1*a1),
		AlphaE:        -6 * be * be / we * (1 + a1),
		Y00:           be / 8 * (3*a2 - 1.75*a1*a1),
		CentrifugalDe: 4 * be * be * be / (we * we),
		A1:            a1, A2: a2,
	}, nil
}

// FitConstants are the Dunham-expansion constants fitted to levels:
//
//	T(v, J) = Y₀₀ + ωe x − ωexe x² + ωeye x³ + (Be − αe x + γe x²) K
//	          − (D + β x) K² + H K³,
//
// x = v + ½, K = J(J+1), with T the term value E − V(re), by linear least
// squares (QR, gonum) over the levels with v ≤ VMax and J ≤ JMax. The truncation of
// the series at these orders is part of what the constants mean: they
// depend on the levels used.
type FitConstants struct {
	Y00, OmegaE, OmegaExe, OmegaEye float64
	Be, AlphaE, GammaE, D, Beta, H  float64
	VMax, JMax                      int
	Levels                          int     // number of levels fitted
	RMS                             float64 // rms residual, cm⁻¹
}

// FitV and FitJ are the default levels of the fit: v = 0…FitV and
// J = 0…FitJ, the lowest ones, where the truncated expansion is closest
// to converged.
const (
	FitV = 3
	FitJ = 4
)

// FitVMin and FitJMin are the fewest vibrational (v = 0…3) and rotational
// (J = 0…3) levels the fit needs.
const (
	FitVMin = 4
	FitJMin = 4
)

// Fit fits the Dunham expansion to the levels with v ≤ vmax and J ≤ jmax.
// minimum is V(re) in eV. Too few levels (fewer than FitVMin vibrational
// levels at J = 0, or than FitJMin rotational ones for v = 0…2) give an
// error wrapping core.ErrParam.
func Fit(levels []Level, minimum float64, vmax, jmax int) (FitConstants, error) {
	var rows [][]float64
	var rhs []float64
	vs, js := map[int]bool{}, map[int]map[int]bool{}
	usedV, usedJ := 0, 0
	for _, l := range levels {
		if l.V > vmax || l.J > jmax {
			continue
		}
		usedV, usedJ = max(usedV, l.V), max(usedJ, l.J)
		x := float64(l.V) + 0.5
		k := float64(l.J * (l.J + 1))
		rows = append(rows, []float64{1, x, -x * x, x * x * x, k, -x * k, x * x * k, -k * k, -x * k * k, k * k * k})
		rhs = append(rhs, (l.Energy-minimum)/units.WavenumberEV)
		if l.J == 0 {
			vs[l.V] = true
		}
		if js[l.V] == nil {
			js[l.V] = map[int]bool{}
		}
		js[l.V][l.J] = true
	}
	if len(vs) < FitVMin {
		return FitConstants{}, fmt.Errorf("dunham fit: %w: %d vibrational levels at J = 0, at least %d needed", core.ErrParam, len(vs), FitVMin)
	}
	for v := 0; v < 3; v++ {
		if len(js[v]) < FitJMin {
			return FitConstants{}, fmt.Errorf("dunham fit: %w: %d rotational levels for v = %d, at least %d needed", core.ErrParam, len(js[v]), v, FitJMin)
		}
	}
	n, p := len(rows), len(rows[0])
	// Columns scaled to unit norm for the conditioning of the QR solve.
	scale := make([]float64, p)
	for _, r := range rows {
		for j, x := range r {
			scale[j] += x * x
		}
	}
	for j := range scale {
		scale[j] = math.Sqrt(scale[j])
	}
	a := mat.NewDense(n, p, nil)
	for i, r := range rows {
		for j, x := range r {
			a.Set(i, j, x/scale[j])
		}
	}
	b := mat.NewVecDense(n, rhs)
	var qr mat.QR
	qr.Factorize(a)
	var sol mat.VecDense
	if err := qr.SolveVecTo(&sol, false, b); err != nil {
		return FitConstants{}, fmt.Errorf("dunham fit: %w: %v", core.ErrNoConvergence, err)
	}
	c := make([]float64, p)
	for j := range c {
		c[j] = sol.AtVec(j) / scale[j]
	}
	var res mat.VecDense
	res.MulVec(a, &sol)
	res.SubVec(&res, b)
	rms := mat.Norm(&res, 2) / math.Sqrt(float64(n))
	return FitConstants{
		Y00: c[0], OmegaE: c[1], OmegaExe: c[2], OmegaEye: c[3],
		Be: c[4], AlphaE: c[5], GammaE: c[6], D: c[7], Beta: c[8], H: c[9],
		VMax: usedV, JMax: usedJ, Levels: n, RMS: rms,
	}, nil
}
