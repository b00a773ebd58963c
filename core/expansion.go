package core

import "math"

// SeriesOrder is the highest order of the Taylor coefficients that
// AnalyzeWell keeps in Well.Series (and fewer when the form's MaxOrder is
// lower). 24 terms resolve V(re + x) − V(re) to rounding out to where the
// direct difference takes over, for every built-in form (see Expansion).
const SeriesOrder = 24

// Expansion is the Taylor series of a potential about its minimum,
//
//	V(re + x) − V(re) = Σ_{k=2}^{M} c_k x^k + R_M(x),  c_k = V⁽ᵏ⁾(re)/k!,
//
// for displacements x (Å) too small for the direct difference of two
// values of V, whose absolute rounding error ≈ ε·|V(re)| is a relative
// error ε·|V(re)|/(c₂x²) that grows without bound as x → 0 (ε = 2⁻⁵²).
// c₁ is taken as 0 (re is the minimum). The coefficients are those of
// Well.Series, or of Well.Taylor when that is longer.
//
// Error bound. The remainder is bounded under the assumption that the
// coefficients beyond M decay at least like those observed:
// |c_k| ≤ c₂·β^{k−2} for k > M, with β 1.25 times the largest
// (|c_k|/c₂)^{1/(k−2)} of the last four coefficients. Then, with q = β|x| < 1,
//
//	|R_M(x)| ≤ c₂x²·q^{M−1}/(1 − q),
//
// and the rounding of the sum by Horner's scheme is bounded by
// 4ε·Σ|c_k x^k| (the c_k themselves carrying a few ulp). The coefficients
// are those at re as located, which is uncertain by δ = Well.ReError (the
// rounding of V′ there): c_k moves by (k+1)c_{k+1}δ, which adds
// δ·Σ(k+1)|c_{k+1}x^k| to the bound (the shift of c₁, 2c₂δ, is not
// counted: it moves the origin of x, not the energy of a given E). The direct
// difference is charged 4ε·(|V(re)| + |V(re + x)|): each value of V within
// 2 ulp. Energy uses whichever of the two has the smaller bound; this is
// the switch point, and its bound is returned with the value. The bound of
// the series is checked in the tests against the Morse closed form
// E(x) = De·expm1(−ax)² and against values computed with mpmath at 40
// digits for Lennard-Jones and Buckingham.
//
// An Expansion is immutable; the zero value has no terms and always defers
// to the direct difference.
type Expansion struct {
	c    []float64 // c_0, …, c_M with c_1 = 0
	ca   []float64 // |c_k|
	cs   []float64 // (k+1)·|c_{k+1}| for k < M, 0 for k = M
	m    int       // M of the remainder bound: that of the full series, also when trimmed
	v0   float64   // |V(re)|
	beta float64   // the decay rate β of the coefficients, 1/Å
	dre  float64   // the uncertainty of re, Å (Well.ReError)
}

// NewExpansion returns the expansion of the well w: its coefficients come
// from w.Series, or w.Taylor when that is longer, and need c₂ > 0.
func NewExpansion(w Well) Expansion {
	c := w.Series
	if len(w.Taylor) > len(c) {
		c = w.Taylor
	}
	if len(c) < 3 || !(c[2] > 0) || math.IsInf(c[2], 1) {
		return Expansion{}
	}
	c = append([]float64(nil), c...)
	c[1] = 0
	m := len(c) - 1
	for m > 2 && (math.IsNaN(c[m]) || math.IsInf(c[m], 0)) {
		m-- // defensive: AnalyzeWell keeps only finite coefficients
	}
	c = c[:m+1]
	beta := 0.0
	if m < 3 {
		// Nothing is known beyond c₂: no bound on the remainder.
		beta = math.Inf(1)
	}
	for k := max(3, m-3); k <= m; k++ {
		if c[k] != 0 {
			beta = math.Max(beta, math.Pow(math.Abs(c[k])/c[2], 1/float64(k-2)))
		}
	}
	ca, cs := make([]float64, m+1), make([]float64, m+1)
	for k := range ca {
		ca[k] = math.Abs(c[k])
		if k < m {
			cs[k] = float64(k+1) * math.Abs(c[k+1]) // cs[M] stays 0, unused
		}
	}
	return Expansion{c: c, ca: ca, cs: cs, m: m, v0: math.Abs(w.Energy), beta: 1.25 * beta, dre: w.ReError}
}

// Order returns M, the highest order of the series (0 for the zero value).
func (e Expansion) Order() int {
	if len(e.c) == 0 {
		return 0
	}
	return len(e.c) - 1
}

// Sum returns Σ_{k=from}^{M} c_k x^k (from ≥ 2) and a bound on its error
// as a value of Σ_{k≥from} c_k x^k: the remainder bound plus the
// rounding bound (see Expansion). The bound is +Inf where the series does
// not converge fast enough (q ≥ 1/2) or the expansion has no terms.
func (e Expansion) Sum(x float64, from int) (s, bound float64) {
	s, bound, _, _ = e.sums(x, from, true)
	return s, bound
}

// Sums returns Sum(x, from) and Sum(x, 2) together, from one pass of
// Horner's scheme over the coefficients (the partial sum from c_from on is
// a stage of the full one), with the same values as the two calls. The
// sums are not computed where the bound is +Inf (q ≥ 1/2): there s and s2
// are 0 (Sum returns them only with an infinite bound).
func (e Expansion) Sums(x float64, from int) (s, bound, s2, bound2 float64) {
	return e.sums(x, from, false)
}

// sums is Sums; with always, the sums are computed also where the bound
// is +Inf.
func (e Expansion) sums(x float64, from int, always bool) (s, bound, s2, bound2 float64) {
	m := len(e.c) - 1
	if m < 2 || max(from, 2) > m {
		return 0, math.Inf(1), 0, math.Inf(1)
	}
	from = max(from, 2)
	q := e.beta * math.Abs(x)
	tail := 0.0
	if e.beta > 0 {
		if !(q < 0.5) {
			if !always {
				return 0, math.Inf(1), 0, math.Inf(1)
			}
			tail = math.Inf(1)
		} else {
			tail = e.c[2] * x * x * ipow(q, e.m-1) / (1 - q)
		}
	}
	ax := math.Abs(x)
	c, ca, cs := e.c[:m+1], e.ca[:m+1], e.cs[:m+1]
	s, abs, shift := c[m], ca[m], 0.0
	for k := m - 1; k >= from; k-- {
		s = s*x + c[k]
		abs = abs*ax + ca[k]
		shift = shift*ax + cs[k]
	}
	sf, absf, shiftf := s, abs, shift
	for k := from - 1; k >= 2; k-- {
		s = s*x + c[k]
		abs = abs*ax + ca[k]
		shift = shift*ax + cs[k]
	}
	xf := ipow(x, from)
	x2 := x * x
	sf *= xf
	absf *= math.Abs(xf)
	shiftf *= math.Abs(xf) * e.dre
	s *= x2
	abs *= x2
	shift *= x2 * e.dre
	return sf, tail + 4*eps*absf + shiftf, s, tail + 4*eps*abs + shift
}

// DirectBound is the bound 4ε·(|V(re)| + |v|) on the rounding error of
// the direct difference v − V(re), v = V(re + x).
func (e Expansion) DirectBound(v float64) float64 {
	return 4 * eps * (e.v0 + math.Abs(v))
}

// Energy returns V(re + x) − V(re) in eV and a bound on its error: the
// series when its bound is below that of the direct difference v − v0,
// v = V(re + x) and v0 = V(re) (pass NaN for v when it is not known; then
// the series is always used, with its bound), else the direct difference.
func (e Expansion) Energy(x, v, v0 float64) (E, bound float64) {
	s, sb := e.Sum(x, 2)
	if math.IsNaN(v) {
		return s, sb
	}
	if db := e.DirectBound(v); db <= sb {
		return v - v0, db
	}
	return s, sb
}

// UseSeries reports whether at displacement x the series is more accurate
// than a direct difference with V(re + x) ≈ V(re) + c₂x², and returns the
// series' value and bound there.
func (e Expansion) UseSeries(x float64) (ok bool, s, bound float64) {
	s, bound = e.Sum(x, 2)
	if math.IsInf(bound, 1) {
		return false, s, bound
	}
	v := e.v0 + math.Abs(s)
	return bound < e.DirectBound(v), s, bound
}

// Displacement returns the displacement x (Å) on the side dir (+1
// stretch, −1 compression) where the series equals E > 0, by Newton
// iterations on the series from the harmonic estimate dir·√(E/c₂), and
// whether the series is more accurate there than a direct solve of
// V(re + x) − V(re) = E (see UseSeries). It returns ok = false when the
// iteration does not settle within 50 steps or leaves the range where the
// series converges.
func (e Expansion) Displacement(E, dir float64) (x float64, ok bool) {
	if len(e.c) < 3 || !(E > 0) {
		return 0, false
	}
	x = dir * math.Sqrt(E/e.c[2])
	for range 50 {
		if e.beta > 0 && !(e.beta*math.Abs(x) < 0.5) {
			return 0, false
		}
		f, df := e.poly(x)
		f -= E
		if !(df*dir > 0) {
			return 0, false
		}
		step := f / df
		x -= step
		if math.Abs(step) <= 2*eps*math.Abs(x) {
			use, _, _ := e.UseSeries(x)
			return x, use
		}
	}
	return 0, false
}

// Shift stores in dst[j], j = 0, …, len(dst)−1, the normalized Taylor
// coefficients about the displacement x0 of the series S(x) = Σ_{k≥2} c_k x^k
// (the energy above the minimum): dst[j] = S⁽ʲ⁾(x0)/j!, by repeated
// synthetic division (Horner's scheme), with no cancellation against
// V(re). Orders beyond M are 0.
func (e Expansion) Shift(x0 float64, dst []float64) {
	clear(dst)
	m := len(e.c) - 1
	if m < 2 {
		return
	}
	var buf [SeriesOrder + 1]float64
	a := buf[:0]
	if m > SeriesOrder {
		a = make([]float64, 0, m+1)
	}
	a = append(a, e.c...)
	a[0] = 0
	for j := 0; j < len(dst) && j <= m; j++ {
		for k := m - 1; k >= j; k-- {
			a[k] += x0 * a[k+1]
		}
		dst[j] = a[j]
	}
}

// Slope returns d/dx Σ_{k=from}^{M} c_k x^k = Σ k·c_k x^{k−1} (from ≥ 2).
func (e Expansion) Slope(x float64, from int) float64 {
	m := len(e.c) - 1
	from = max(from, 2)
	if from > m {
		return 0
	}
	d := 0.0
	for k := m; k >= from; k-- {
		d = d*x + float64(k)*e.c[k]
	}
	return d * ipow(x, from-1)
}

// Value returns Σ_{k≥2} c_k x^k alone, without its bound (see Sum).
func (e Expansion) Value(x float64) float64 {
	f, _ := e.poly(x)
	return f
}

// Trim returns the expansion without the terms beyond the order m where,
// at every |x| ≤ xmax, the dropped terms together are below ε·c₂x²
// (|c_k|·xmax^{k−2} summed over k > m, against ε·c₂): it evaluates faster
// at small displacements and to the same precision. Its remainder bound
// stays that of the full series (the dropped terms are within the
// rounding bound), so Sum and Sums give the same bounds to a relative ε.
func (e Expansion) Trim(xmax float64) Expansion { return e.TrimTo(xmax, 2) }

// TrimTo is Trim keeping at least the terms up to c_keep.
func (e Expansion) TrimTo(xmax float64, keep int) Expansion {
	m := len(e.c) - 1
	if m < 3 {
		return e
	}
	xmax = math.Abs(xmax)
	drop, p := 0.0, ipow(xmax, m-2)
	for m > 2 && m > keep {
		drop += math.Abs(e.c[m]) * p
		if !(drop <= eps*e.c[2]) {
			break
		}
		m--
		if xmax > 0 {
			p /= xmax
		}
	}
	if m == len(e.c)-1 {
		return e
	}
	t := e
	t.c, t.ca, t.cs = e.c[:m+1], e.ca[:m+1], e.cs[:m+1]
	return t
}

// ipow returns x^n for n ≥ 0 by repeated squaring.
func ipow(x float64, n int) float64 {
	r := 1.0
	for ; n > 0; n >>= 1 {
		if n&1 == 1 {
			r *= x
		}
		x *= x
	}
	return r
}

// poly returns Σ_{k≥2} c_k x^k and its derivative.
func (e Expansion) poly(x float64) (f, df float64) {
	for k := len(e.c) - 1; k >= 2; k-- {
		df = df*x + f
		f = f*x + e.c[k]
	}
	// f = Σ c_k x^{k−2}, df = d/dx of it; scale to the full sum.
	return f * x * x, df*x*x + 2*x*f
}

// eps is the float64 machine epsilon 2⁻⁵².
const eps = 0x1p-52
