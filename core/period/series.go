package period

import (
	"math"

	"github.com/pairwell/pairwell/core"
)

// AmplitudeSeries is the exact period as a power series in the energy,
// for small oscillations:
//
//	T(E)/T₀ = Σ_{m=0}^{K} A_m ε^m,  ε = E/c₂ (Å²),  A₀ = 1,
//
// with T₀ = 2π√(μ/k) the harmonic period (k = 2c₂), from the Taylor
// coefficients c_k of the well at re (Well.Series, or Well.Taylor when
// longer; c₁ = 0). It is mass independent.
//
// Derivation (the classical inversion of the period, e.g. Landau &
// Lifshitz, Mechanics, §12, written out as series): with
// V(re + x) − V(re) = c₂x²·f(x), f = 1 + u, u(x) = Σ_{k≥1} (c_{k+2}/c₂)x^k,
// the variable z = x√f(x) has z² = (V − V(re))/c₂, and its inverse
// x(z) = Σ h_n z^n gives
//
//	T(E) = √(2μ/c₂) ∫_{−π/2}^{π/2} x′(√ε sin φ) dφ = T₀ Σ_m (2m+1)·h_{2m+1}·C(2m,m)/4^m · ε^m,
//
// the odd powers of sin φ integrating to zero and ∫ sin^{2m} = π·C(2m,m)/4^m.
// By Lagrange inversion h_n = [x^{n−1}] f(x)^{−n/2}/n, so
//
//	A_m = C(2m,m)/4^m · [x^{2m}] f(x)^{−(2m+1)/2},
//
// each coefficient by J. C. P. Miller's recurrence for a power of a series
// (Knuth, TAOCP vol. 2, §4.7). With M the highest order of the c_k, the
// A_m are exact up to K = ⌊(M − 2)/2⌋ (11 for the 24 terms of
// core.SeriesOrder). For Morse, A_m = C(2m,m)/4^m·a^{2m}: T = T₀/√(1 − E/De).
//
// Error bound (Ratio). Beyond K the coefficients are assumed to decay at
// least like those observed: |A_m| ≤ ρ^m with ρ 1.25 times the largest
// |A_m|^{1/m} of the last four non-zero ones, so the remainder is at most
// (ρε)^{K+1}/(1 − ρε) where ρε < 1/2 (+Inf beyond). The same assumption as
// core.Expansion: it fails for a form whose higher derivatives grow
// suddenly. To it are added the rounding of the recurrences, bounded by
// 4ε(2m+2) times the series with |u_k| in place of u_k (which majorises
// every partial sum), and the propagated uncertainty of the c_k themselves
// (4 ulp, and (k+1)|c_{k+1}|·Well.ReError from the location of re, as in
// core.Expansion), by the same majorant. A series with fewer than four
// terms (K < 3) has no bound (+Inf).
//
// An AmplitudeSeries is immutable; the zero value has no terms and an
// infinite bound.
type AmplitudeSeries struct {
	a    []float64 // A_0, …, A_K
	da   []float64 // the error bound of each A_m (rounding and the c_k)
	c2   float64   // eV/Å²
	rho  float64   // ρ, 1/Å²
	tail bool      // whether ρ bounds a remainder (K ≥ 3)
}

// seriesMinTerms is the smallest K for which the series has a bound.
const seriesMinTerms = 3

// NewAmplitudeSeries returns the period series of the well w (see
// AmplitudeSeries). It needs c₂ > 0; otherwise, or with fewer than the
// coefficients up to c₈, the series has no bound.
func NewAmplitudeSeries(w core.Well) AmplitudeSeries {
	c := w.Series
	if len(w.Taylor) > len(c) {
		c = w.Taylor
	}
	m := len(c) - 1
	for m > 2 && (math.IsNaN(c[m]) || math.IsInf(c[m], 0)) {
		m--
	}
	if m < 2 || !(c[2] > 0) || math.IsInf(c[2], 1) {
		return AmplitudeSeries{}
	}
	c2 := c[2]
	K := (m - 2) / 2
	n := 2 * K // the highest power of x needed, [x^{2K}]
	// u_k = c_{k+2}/c₂, k = 1…n; |u_k| and |u_k| + du_k for the majorants.
	var ubuf, abuf, pbuf [core.SeriesOrder + 1]float64
	u, ua, up := ubuf[:0], abuf[:0], pbuf[:0]
	if n+1 > len(ubuf) {
		u, ua, up = make([]float64, 0, n+1), make([]float64, 0, n+1), make([]float64, 0, n+1)
	}
	dc := func(j int) float64 { // the uncertainty of c_j
		d := 4 * eps * math.Abs(c[j])
		if j+1 <= m {
			d += float64(j+1) * math.Abs(c[j+1]) * w.ReError
		}
		return d
	}
	rel2 := dc(2) / c2
	u, ua, up = append(u, 0), append(ua, 0), append(up, 0)
	for k := 1; k <= n; k++ {
		uk := c[k+2] / c2
		u = append(u, uk)
		ua = append(ua, math.Abs(uk))
		up = append(up, math.Abs(uk)+dc(k+2)/c2+math.Abs(uk)*rel2)
	}
	s := AmplitudeSeries{a: make([]float64, K+1), da: make([]float64, K+1), c2: c2}
	var fbuf [3][core.SeriesOrder + 1]float64
	f := [3][]float64{fbuf[0][:], fbuf[1][:], fbuf[2][:]}
	if n+1 > len(f[0]) {
		f = [3][]float64{make([]float64, n+1), make([]float64, n+1), make([]float64, n+1)}
	}
	// The majorants: (1 − Σ|u_k|x^k)^α has the absolute values of the
	// coefficients of (1 + u)^α, for α < 0.
	series := [3][]float64{u, ua, up}
	signs := [3]float64{1, -1, -1}
	binom := 1.0 // C(2m,m)/4^m
	for mm := 0; mm <= K; mm++ {
		if mm > 0 {
			binom *= float64(2*mm-1) / float64(2*mm)
		}
		c := powerCoefs(series, signs, -float64(2*mm+1)/2, 2*mm, f)
		am, hat, hatp := binom*c[0], binom*c[1], binom*c[2]
		s.a[mm] = am
		s.da[mm] = 4*eps*float64(2*mm+2)*hat + math.Max(hatp-hat, 0)
	}
	s.a[0], s.da[0] = 1, 0
	if K >= seriesMinTerms {
		s.tail = true
		for mm, seen := K, 0; mm >= 1 && seen < 4; mm-- {
			if s.a[mm] != 0 {
				s.rho = math.Max(s.rho, math.Pow(math.Abs(s.a[mm]), 1/float64(mm)))
				seen++
			}
		}
		s.rho *= 1.25
	}
	return s
}

// powerCoefs returns [x^n] (1 + sgn_i·Σ_{k≥1} u_{i,k} x^k)^α for the three
// series u_i, by Miller's recurrence F_0 = 1,
// F_j = (sgn/j)·Σ_{k=1}^{j} ((α+1)k − j)·u_k·F_{j−k}, with F as scratch
// (each longer than n).
func powerCoefs(u [3][]float64, sgn [3]float64, alpha float64, n int, F [3][]float64) [3]float64 {
	F[0][0], F[1][0], F[2][0] = 1, 1, 1
	for j := 1; j <= n; j++ {
		var s0, s1, s2 float64
		for k := 1; k <= j; k++ {
			w := (alpha+1)*float64(k) - float64(j)
			s0 += w * u[0][k] * F[0][j-k]
			s1 += w * u[1][k] * F[1][j-k]
			s2 += w * u[2][k] * F[2][j-k]
		}
		jf := float64(j)
		F[0][j], F[1][j], F[2][j] = sgn[0]*s0/jf, sgn[1]*s1/jf, sgn[2]*s2/jf
	}
	return [3]float64{F[0][n], F[1][n], F[2][n]}
}

// Terms returns K + 1, the number of coefficients A_0…A_K (0 for the zero
// value).
func (s AmplitudeSeries) Terms() int { return len(s.a) }

// Ratio returns T(E)/T₀ at the oscillation energy E ≥ 0 (eV, from the
// minimum) and a bound on its absolute error (see AmplitudeSeries); the
// bound is +Inf where the series has no bound or does not converge fast
// enough (ρε ≥ 1/2).
func (s AmplitudeSeries) Ratio(E float64) (ratio, bound float64) {
	if !s.tail || !(E >= 0) {
		return math.NaN(), math.Inf(1)
	}
	x := E / s.c2
	q := s.rho * x
	if !(q < 0.5) {
		return math.NaN(), math.Inf(1)
	}
	K := len(s.a) - 1
	var abs, dev float64
	for m := K; m >= 0; m-- {
		ratio = ratio*x + s.a[m]
		abs = abs*x + math.Abs(s.a[m])
		dev = dev*x + s.da[m]
	}
	return ratio, math.Pow(q, float64(K+1))/(1-q) + 4*eps*abs + dev
}
