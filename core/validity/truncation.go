package validity

import (
	"fmt"
	"math"

	"github.com/pairwell/pairwell/core"
)

// MaxTruncationOrder is the highest derivative order a Truncation reports:
// derivatives above its degree are identically 0, and are returned as such.
const MaxTruncationOrder = 100

// Truncation is the truncated Taylor expansion of a well of order N,
//
//	V_N(r) = Σ_{k=0}^{N} c_k (r − re)^k,
//
// with c_k = V⁽ᵏ⁾(re)/k! in eV/Åᵏ from core.Well.Taylor, as a
// core.Potential. N = 2 is the harmonic approximation, N = 3 adds the
// cubic and N = 4 the quartic anharmonicity. It is immutable and safe for
// concurrent use.
//
// Its domain is (0, +Inf): the polynomial is defined at every separation,
// wider than the domain of any pair potential. Domain.Limit is the limit
// of V_N as r → ∞, ±Inf by the sign of c_N; the equilibrium guess is re.
// Its Taylor coefficients are exact: the polynomial shifted to r, and 0
// above order N.
type Truncation struct {
	re float64
	c  []float64 // c_0, …, c_N
}

// NewTruncation returns the Taylor truncation of order n ≥ 2 of the well w,
// which must hold the coefficients up to c_n with c₂ > 0. The error wraps
// core.ErrOrder or core.ErrParam.
func NewTruncation(w core.Well, n int) (*Truncation, error) {
	if n < 2 {
		return nil, fmt.Errorf("validity: %w: truncation order %d, must be ≥ 2", core.ErrOrder, n)
	}
	if len(w.Taylor) <= n {
		return nil, fmt.Errorf("validity: %w: truncation order %d needs Taylor coefficients up to c_%d, the well has up to c_%d (core.WellSettings.Order)",
			core.ErrOrder, n, n, len(w.Taylor)-1)
	}
	if !(w.Taylor[2] > 0) || math.IsInf(w.Taylor[2], 1) {
		return nil, fmt.Errorf("validity: %w: c₂ = %g eV/Å², must be finite and > 0", core.ErrParam, w.Taylor[2])
	}
	c := append([]float64(nil), w.Taylor[:n+1]...)
	c[1] = 0 // V′(re) = 0 by definition of re; drop its rounding
	return &Truncation{re: w.Re, c: c}, nil
}

// Order returns N.
func (t *Truncation) Order() int { return len(t.c) - 1 }

// Re returns the expansion point re in Å.
func (t *Truncation) Re() float64 { return t.re }

// Coefficients returns a copy of c_0, …, c_N (c₁ = 0).
func (t *Truncation) Coefficients() []float64 { return append([]float64(nil), t.c...) }

// Domain is (0, +Inf) with Limit ±Inf (the sign of c_N) and the
// equilibrium guess re.
func (t *Truncation) Domain() core.Domain {
	return core.Domain{Min: 0, Max: math.Inf(1), Limit: math.Copysign(math.Inf(1), t.c[len(t.c)-1]), EquilibriumGuess: t.re}
}

// MaxOrder returns MaxTruncationOrder.
func (t *Truncation) MaxOrder() int { return MaxTruncationOrder }

// eval returns V_N⁽ʲ⁾ at displacement x by Horner's scheme on the
// coefficients c_k·k!/(k−j)!.
func (t *Truncation) eval(j int, x float64) float64 {
	n := len(t.c) - 1
	if j > n {
		return 0
	}
	s := 0.0
	for k := n; k >= j; k-- {
		f := 1.0
		for i := k - j + 1; i <= k; i++ {
			f *= float64(i)
		}
		s = s*x + t.c[k]*f
	}
	return s
}

// Taylor stores the coefficients of V_N about r[i],
//
//	c_j(r) = Σ_{k≥j} C(k, j)·c_k·(r − re)^{k−j},  0 for j > N,
//
// at dst[i·(n+1)+j], by the Taylor shift of the polynomial to r (repeated
// synthetic division, O(N·n) per point).
func (t *Truncation) Taylor(n int, r, dst []float64) error {
	if err := core.CheckTaylor(n, MaxTruncationOrder, len(r), len(dst)); err != nil {
		return fmt.Errorf("taylor truncation: %w", err)
	}
	d := t.Domain()
	N := len(t.c) - 1
	w := n + 1
	var b [MaxTruncationOrder + 1]float64
	for i, x := range r {
		if err := core.CheckR(d, x); err != nil {
			return &core.PointError{Index: i, R: x, Err: fmt.Errorf("taylor truncation: %w", err)}
		}
		h := x - t.re
		copy(b[:], t.c)
		row := dst[i*w : i*w+w]
		for j := range row {
			if j > N {
				row[j] = 0
				continue
			}
			for k := N - 1; k >= j; k-- {
				b[k] += h * b[k+1]
			}
			row[j] = b[j]
		}
	}
	return nil
}

// Barrier returns the lowest maximum of V_N at r > 0: its position in Å and
// its height above the minimum, V_N(r) − c₀, in eV; ok is false when V_N
// has no maximum (N = 2, or N = 4 with c₄ > 0 and 9c₃² < 32c₂c₄). Above
// that energy the motion in V_N is not bound. The critical points are the
// roots of V_N′(x)/x = 2c₂ + 3c₃x + 4c₄x², in closed form.
func (t *Truncation) Barrier() (r, height float64, ok bool) {
	c2, c3, c4 := t.c[2], 0.0, 0.0
	if len(t.c) > 3 {
		c3 = t.c[3]
	}
	if len(t.c) > 4 {
		c4 = t.c[4]
	}
	var xs []float64
	switch {
	case c4 == 0 && c3 != 0:
		xs = append(xs, -2*c2/(3*c3))
	case c4 != 0:
		disc := 9*c3*c3 - 32*c2*c4
		if disc >= 0 {
			// Cancellation-free roots of 4c₄x² + 3c₃x + 2c₂.
			q := -0.5 * (3*c3 + math.Copysign(math.Sqrt(disc), c3))
			if q != 0 {
				xs = append(xs, q/(4*c4), 2*c2/q)
			}
		}
	}
	height = math.Inf(1)
	for _, x := range xs {
		if t.eval(2, x) >= 0 || !(t.re+x > 0) {
			continue // a minimum, or beyond r = 0
		}
		if h := t.eval(0, x) - t.c[0]; h < height {
			r, height, ok = t.re+x, h, true
		}
	}
	return r, height, ok
}

// Well returns the well of V_N: Re, Energy = c₀, Taylor = the coefficients
// padded with zeros to c₄, K = 2c₂. Depth is the escape energy of V_N, the
// height of its lowest maximum (Barrier), and +Inf when it has none.
// Inflection and MaxForce are NaN (not computed).
func (t *Truncation) Well() core.Well {
	taylor := make([]float64, max(len(t.c), 5))
	copy(taylor, t.c)
	w := core.Well{
		Re: t.re, Energy: t.c[0], Taylor: taylor, K: 2 * t.c[2],
		Depth: math.Inf(1), Inflection: math.NaN(), MaxForce: math.NaN(),
	}
	if _, h, ok := t.Barrier(); ok {
		w.Depth = h
	}
	return w
}
