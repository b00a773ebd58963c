package jet

import (
	"fmt"
	"math"
)

// Layout describes Points jets of order Order stored in one slice,
// coefficient-major: coefficient k (k = 0…Order) of jet i (i = 0…Points−1)
// is at index k·Points + i, and the slice has Len() = (Order+1)·Points
// elements. Row k, the slice s[k·Points:(k+1)·Points], holds coefficient k
// of every jet.
//
// The methods of Layout are the allocation-free layer of the package. In
// each, a, b are operands and dst the result; all must have length Len(),
// otherwise the method panics (a programming error, as in gonum/floats).
// Unless a method says otherwise, dst must not share memory with an
// operand: the recurrences read lower coefficients of the result while
// writing higher ones. The linear methods (Copy, Add, Sub, Neg, Scale,
// AddConst, Affine) work in place.
type Layout struct {
	Order  int // highest coefficient index n ≥ 0
	Points int // number of jets m ≥ 1
}

// Len returns (Order+1)·Points, the length of a slice holding the jets.
func (l Layout) Len() int { return (l.Order + 1) * l.Points }

// check panics unless l is valid and every slice has length l.Len().
func (l Layout) check(s ...[]float64) {
	if l.Order < 0 || l.Points < 1 {
		panic(fmt.Sprintf("jet: invalid layout order %d, points %d", l.Order, l.Points))
	}
	n := l.Len()
	for _, x := range s {
		if len(x) != n {
			panic(fmt.Sprintf("jet: slice length %d, layout (order %d, %d points) needs %d", len(x), l.Order, l.Points, n))
		}
	}
}

// checkWork panics unless work holds at least k·l.Len() elements.
func (l Layout) checkWork(work []float64, k int) {
	if len(work) < k*l.Len() {
		panic(fmt.Sprintf("jet: workspace length %d, need %d", len(work), k*l.Len()))
	}
}

// row returns coefficient k of every jet in s.
func (l Layout) row(s []float64, k int) []float64 {
	return s[k*l.Points : (k+1)*l.Points : (k+1)*l.Points]
}

// Const sets every jet in dst to the constant c: [c, 0, …, 0].
func (l Layout) Const(dst []float64, c float64) {
	l.check(dst)
	d0 := l.row(dst, 0)
	for i := range d0 {
		d0[i] = c
	}
	clear(dst[l.Points:])
}

// Var sets jet i of dst to the independent variable at x[i]:
// [x[i], 1, 0, …, 0]. len(x) must be Points.
func (l Layout) Var(dst, x []float64) {
	l.check(dst)
	if len(x) != l.Points {
		panic(fmt.Sprintf("jet: %d points, layout has %d", len(x), l.Points))
	}
	copy(dst, x)
	if l.Order == 0 {
		return
	}
	d1 := l.row(dst, 1)
	for i := range d1 {
		d1[i] = 1
	}
	clear(dst[2*l.Points:])
}

// Copy sets dst = a.
func (l Layout) Copy(dst, a []float64) {
	l.check(dst, a)
	copy(dst, a)
}

// Add sets dst = a + b: c_k = a_k + b_k. dst may be a or b.
func (l Layout) Add(dst, a, b []float64) {
	l.check(dst, a, b)
	b = b[:len(a)]
	dst = dst[:len(a)]
	for i := range a {
		dst[i] = a[i] + b[i]
	}
}

// Sub sets dst = a − b: c_k = a_k − b_k. dst may be a or b.
func (l Layout) Sub(dst, a, b []float64) {
	l.check(dst, a, b)
	b = b[:len(a)]
	dst = dst[:len(a)]
	for i := range a {
		dst[i] = a[i] - b[i]
	}
}

// Neg sets dst = −a: c_k = −a_k. dst may be a.
func (l Layout) Neg(dst, a []float64) {
	l.check(dst, a)
	dst = dst[:len(a)]
	for i := range a {
		dst[i] = -a[i]
	}
}

// Scale sets dst = s·a for a scalar s: c_k = s·a_k. dst may be a.
func (l Layout) Scale(dst, a []float64, s float64) {
	l.check(dst, a)
	dst = dst[:len(a)]
	for i := range a {
		dst[i] = s * a[i]
	}
}

// AddConst sets dst = a + c for a scalar c: c_0 = a_0 + c, c_k = a_k for
// k ≥ 1. dst may be a.
func (l Layout) AddConst(dst, a []float64, c float64) {
	l.check(dst, a)
	m := l.Points
	d0, a0 := dst[:m], a[:m]
	for i := range a0 {
		d0[i] = a0[i] + c
	}
	copy(dst[m:], a[m:])
}

// Affine sets dst = s·a + c for scalars s and c: c_0 = s·a_0 + c,
// c_k = s·a_k for k ≥ 1. dst may be a.
func (l Layout) Affine(dst, a []float64, s, c float64) {
	l.check(dst, a)
	m := l.Points
	d0, a0 := dst[:m], a[:m]
	for i := range a0 {
		d0[i] = s*a0[i] + c
	}
	ah, dh := a[m:], dst[m:]
	dh = dh[:len(ah)]
	for i := range ah {
		dh[i] = s * ah[i]
	}
}

// Mul sets dst = a·b by the Cauchy product
//
//	c_k = Σ_{j=0}^{k} a_j b_{k−j}.
func (l Layout) Mul(dst, a, b []float64) {
	l.check(dst, a, b)
	for k := 0; k <= l.Order; k++ {
		dk := l.row(dst, k)
		a0, bk := l.row(a, 0), l.row(b, k)
		for i := range dk {
			dk[i] = a0[i] * bk[i]
		}
		for j := 1; j <= k; j++ {
			aj, bkj := l.row(a, j), l.row(b, k-j)
			for i := range dk {
				dk[i] += aj[i] * bkj[i]
			}
		}
	}
}

// Square sets dst = a², the Cauchy product with its symmetry used:
//
//	c_k = 2 Σ_{j<k−j} a_j a_{k−j} + [k even] a_{k/2}².
func (l Layout) Square(dst, a []float64) {
	l.check(dst, a)
	if l.Order >= 2 && l.Order <= 4 {
		l.squareSmall(dst, a)
		return
	}
	for k := 0; k <= l.Order; k++ {
		dk := l.row(dst, k)
		if k%2 == 0 {
			h := l.row(a, k/2)
			if k == 0 {
				for i := range dk {
					dk[i] = h[i] * h[i]
				}
				continue
			}
			clear(dk)
			for j := 0; 2*j < k; j++ {
				aj, akj := l.row(a, j), l.row(a, k-j)
				for i := range dk {
					dk[i] += aj[i] * akj[i]
				}
			}
			for i := range dk {
				dk[i] = 2*dk[i] + h[i]*h[i]
			}
			continue
		}
		clear(dk)
		for j := 0; 2*j < k; j++ {
			aj, akj := l.row(a, j), l.row(a, k-j)
			for i := range dk {
				dk[i] += aj[i] * akj[i]
			}
		}
		for i := range dk {
			dk[i] *= 2
		}
	}
}

// squareSmall is Square for orders 2…4, one point at a time with the same
// operations in the same order (so the same bits) as the general loop.
func (l Layout) squareSmall(dst, a []float64) {
	m := l.Points
	a0, a1, a2 := a[:m], a[m:2*m], a[2*m:3*m]
	d0, d1, d2 := dst[:m], dst[m:2*m], dst[2*m:3*m]
	switch l.Order {
	case 2:
		for i := range d0 {
			x0, x1, x2 := a0[i], a1[i], a2[i]
			d0[i] = x0 * x0
			d1[i] = 2 * (x0 * x1)
			d2[i] = 2*(x0*x2) + x1*x1
		}
	case 3:
		a3, d3 := a[3*m:4*m], dst[3*m:4*m]
		for i := range d0 {
			x0, x1, x2, x3 := a0[i], a1[i], a2[i], a3[i]
			d0[i] = x0 * x0
			d1[i] = 2 * (x0 * x1)
			d2[i] = 2*(x0*x2) + x1*x1
			d3[i] = 2 * (x0*x3 + x1*x2)
		}
	case 4:
		a3, d3 := a[3*m:4*m], dst[3*m:4*m]
		a4, d4 := a[4*m:5*m], dst[4*m:5*m]
		for i := range d0 {
			x0, x1, x2, x3, x4 := a0[i], a1[i], a2[i], a3[i], a4[i]
			d0[i] = x0 * x0
			d1[i] = 2 * (x0 * x1)
			d2[i] = 2*(x0*x2) + x1*x1
			d3[i] = 2 * (x0*x3 + x1*x2)
			d4[i] = 2*(x0*x4+x1*x3) + x2*x2
		}
	}
}

// Div sets dst = a/b, from a = b·c:
//
//	c_k = (a_k − Σ_{j=1}^{k} b_j c_{k−j}) / b_0.
//
// dst may be a (not b).
func (l Layout) Div(dst, a, b []float64) {
	l.check(dst, a, b)
	b0 := l.row(b, 0)
	for k := 0; k <= l.Order; k++ {
		dk, ak := l.row(dst, k), l.row(a, k)
		copy(dk, ak)
		for j := 1; j <= k; j++ {
			bj, ckj := l.row(b, j), l.row(dst, k-j)
			for i := range dk {
				dk[i] -= bj[i] * ckj[i]
			}
		}
		for i := range dk {
			dk[i] /= b0[i]
		}
	}
}

// Recip sets dst = 1/a, from a·c = 1:
//
//	c_0 = 1/a_0,  c_k = −(Σ_{j=1}^{k} a_j c_{k−j}) / a_0.
func (l Layout) Recip(dst, a []float64) {
	l.check(dst, a)
	a0, d0 := l.row(a, 0), l.row(dst, 0)
	for i := range d0 {
		d0[i] = 1 / a0[i]
	}
	for k := 1; k <= l.Order; k++ {
		dk := l.row(dst, k)
		clear(dk)
		for j := 1; j <= k; j++ {
			aj, ckj := l.row(a, j), l.row(dst, k-j)
			for i := range dk {
				dk[i] += aj[i] * ckj[i]
			}
		}
		for i := range dk {
			dk[i] = -dk[i] / a0[i]
		}
	}
}

// Sqrt sets dst = √a, from c² = a:
//
//	c_0 = √a_0,  c_k = (a_k − Σ_{j=1}^{k−1} c_j c_{k−j}) / (2 c_0).
//
// At a_0 = 0 the coefficients of order ≥ 1 are ±Inf or NaN.
func (l Layout) Sqrt(dst, a []float64) {
	l.check(dst, a)
	a0, d0 := l.row(a, 0), l.row(dst, 0)
	for i := range d0 {
		d0[i] = math.Sqrt(a0[i])
	}
	for k := 1; k <= l.Order; k++ {
		dk, ak := l.row(dst, k), l.row(a, k)
		copy(dk, ak)
		for j := 1; j < k; j++ {
			cj, ckj := l.row(dst, j), l.row(dst, k-j)
			for i := range dk {
				dk[i] -= cj[i] * ckj[i]
			}
		}
		for i := range dk {
			dk[i] /= 2 * d0[i]
		}
	}
}

// Exp sets dst = exp(a), from c′ = a′·c:
//
//	c_0 = exp(a_0),  c_k = (1/k) Σ_{j=1}^{k} j a_j c_{k−j}.
func (l Layout) Exp(dst, a []float64) {
	l.check(dst, a)
	a0, d0 := l.row(a, 0), l.row(dst, 0)
	for i := range d0 {
		d0[i] = math.Exp(a0[i])
	}
	for k := 1; k <= l.Order; k++ {
		dk := l.row(dst, k)
		a1 := l.row(a, 1)
		ckj := l.row(dst, k-1)
		f := 1 / float64(k)
		for i := range dk {
			dk[i] = f * a1[i] * ckj[i]
		}
		for j := 2; j <= k; j++ {
			aj, ckj := l.row(a, j), l.row(dst, k-j)
			f := float64(j) / float64(k)
			for i := range dk {
				dk[i] += f * aj[i] * ckj[i]
			}
		}
	}
}

// Log sets dst = ln a, from a·c′ = a′:
//
//	c_0 = ln a_0,  c_k = (a_k − (1/k) Σ_{j=1}^{k−1} j c_j a_{k−j}) / a_0.
//
// a_0 ≤ 0 gives NaN or −Inf, as math.Log does.
func (l Layout) Log(dst, a []float64) {
	l.check(dst, a)
	a0, d0 := l.row(a, 0), l.row(dst, 0)
	for i := range d0 {
		d0[i] = math.Log(a0[i])
	}
	for k := 1; k <= l.Order; k++ {
		dk, ak := l.row(dst, k), l.row(a, k)
		clear(dk)
		for j := 1; j < k; j++ {
			cj, akj := l.row(dst, j), l.row(a, k-j)
			f := float64(j) / float64(k)
			for i := range dk {
				dk[i] += f * cj[i] * akj[i]
			}
		}
		for i := range dk {
			dk[i] = (ak[i] - dk[i]) / a0[i]
		}
	}
}

// Pow sets dst = a^p for a real exponent p, from a·c′ = p·a′·c:
//
//	c_0 = a_0^p,  c_k = (1/(k a_0)) Σ_{j=0}^{k−1} (p(k−j) − j) a_{k−j} c_j.
//
// It needs a_0 ≠ 0 (a_0 > 0 unless p is an integer); at a_0 = 0 the
// coefficients of order ≥ 1 are ±Inf or NaN. Use PowInt for integer
// exponents: it also holds at a_0 = 0.
func (l Layout) Pow(dst, a []float64, p float64) {
	l.check(dst, a)
	a0, d0 := l.row(a, 0), l.row(dst, 0)
	for i := range d0 {
		d0[i] = math.Pow(a0[i], p)
	}
	for k := 1; k <= l.Order; k++ {
		dk := l.row(dst, k)
		clear(dk)
		for j := 0; j < k; j++ {
			akj, cj := l.row(a, k-j), l.row(dst, j)
			f := p*float64(k-j) - float64(j)
			for i := range dk {
				dk[i] += f * akj[i] * cj[i]
			}
		}
		fk := float64(k)
		for i := range dk {
			dk[i] /= fk * a0[i]
		}
	}
}

// PowInt sets dst = aⁿ for an integer n by binary powering: left to right
// over the bits of |n|, square, and multiply by the base where the bit is
// set (Square and Mul above). For n < 0 the base is 1/a (Recip), which keeps
// the accuracy of the linear case better than inverting aⁿ. It holds at
// a_0 = 0 for n ≥ 0 and costs about 2·log₂|n| products. work must hold at
// least 2·Len() elements.
func (l Layout) PowInt(dst, a []float64, n int, work []float64) {
	l.check(dst, a)
	l.checkWork(work, 2)
	switch n {
	case 0:
		l.Const(dst, 1)
		return
	case 1:
		copy(dst, a)
		return
	case 2:
		l.Square(dst, a)
		return
	case -1:
		l.Recip(dst, a)
		return
	}
	u := uint64(n)
	base := a
	if n < 0 {
		u = uint64(-n)
		l.Recip(dst, a)
		base = dst
	}
	ln := l.Len()
	x, y := work[:ln:ln], work[ln:2*ln:2*ln]
	copy(x, base)
	top := 63
	for u>>uint(top)&1 == 0 {
		top--
	}
	for bit := top - 1; bit >= 0; bit-- {
		l.Square(y, x)
		x, y = y, x
		if u>>uint(bit)&1 == 1 {
			l.Mul(y, x, base)
			x, y = y, x
		}
	}
	copy(dst, x)
}

// SinCos sets s = sin a and c = cos a together, from s′ = a′·c and
// c′ = −a′·s:
//
//	s_0 = sin a_0,  s_k = (1/k) Σ_{j=1}^{k} j a_j c_{k−j},
//	c_0 = cos a_0,  c_k = −(1/k) Σ_{j=1}^{k} j a_j s_{k−j}.
//
// s and c must be distinct and not share memory with a.
func (l Layout) SinCos(s, c, a []float64) {
	l.check(s, c, a)
	a0, s0, c0 := l.row(a, 0), l.row(s, 0), l.row(c, 0)
	for i := range a0 {
		s0[i], c0[i] = math.Sincos(a0[i])
	}
	for k := 1; k <= l.Order; k++ {
		sk, ck := l.row(s, k), l.row(c, k)
		clear(sk)
		clear(ck)
		for j := 1; j <= k; j++ {
			aj, skj, ckj := l.row(a, j), l.row(s, k-j), l.row(c, k-j)
			f := float64(j) / float64(k)
			for i := range sk {
				fa := f * aj[i]
				sk[i] += fa * ckj[i]
				ck[i] -= fa * skj[i]
			}
		}
	}
}

// Sin sets dst = sin a by SinCos; work must hold at least Len() elements
// (it receives cos a).
func (l Layout) Sin(dst, a, work []float64) {
	l.checkWork(work, 1)
	l.SinCos(dst, work[:l.Len()], a)
}

// Cos sets dst = cos a by SinCos; work must hold at least Len() elements
// (it receives sin a).
func (l Layout) Cos(dst, a, work []float64) {
	l.checkWork(work, 1)
	l.SinCos(work[:l.Len()], dst, a)
}

// Tanh sets dst = tanh a, from c′ = a′·u with u = 1 − c² = sech² a:
//
//	c_0 = tanh a_0,  c_k = (1/k) Σ_{j=1}^{k} j a_j u_{k−j},
//	u_0 = 1/cosh² a_0,  u_k = −Σ_{j=0}^{k} c_j c_{k−j}.
//
// u_0 is computed from cosh, not as 1 − c_0², so that it keeps its relative
// accuracy where tanh a_0 is close to ±1. work must hold at least Len()
// elements (it receives u).
func (l Layout) Tanh(dst, a, work []float64) {
	l.check(dst, a)
	l.checkWork(work, 1)
	u := work[:l.Len()]
	a0, d0, u0 := l.row(a, 0), l.row(dst, 0), l.row(u, 0)
	for i := range a0 {
		d0[i] = math.Tanh(a0[i])
		ch := math.Cosh(a0[i])
		u0[i] = 1 / (ch * ch)
	}
	for k := 1; k <= l.Order; k++ {
		dk := l.row(dst, k)
		clear(dk)
		for j := 1; j <= k; j++ {
			aj, ukj := l.row(a, j), l.row(u, k-j)
			f := float64(j) / float64(k)
			for i := range dk {
				dk[i] += f * aj[i] * ukj[i]
			}
		}
		if k == l.Order {
			break
		}
		uk := l.row(u, k)
		clear(uk)
		for j := 0; j <= k; j++ {
			cj, ckj := l.row(dst, j), l.row(dst, k-j)
			for i := range uk {
				uk[i] -= cj[i] * ckj[i]
			}
		}
	}
}

// Erf sets dst = erf a, from c′ = a′·g with g = (2/√π) exp(−a²):
//
//	c_0 = erf a_0,  c_k = (1/k) Σ_{j=1}^{k} j a_j g_{k−j},
//
// where g is the jet of (2/√π) exp(−a²) by Square and Exp. work must hold
// at least 2·Len() elements.
func (l Layout) Erf(dst, a, work []float64) {
	l.check(dst, a)
	l.checkWork(work, 2)
	ln := l.Len()
	q, g := work[:ln:ln], work[ln:2*ln:2*ln]
	l.Square(q, a)
	l.Neg(q, q)
	l.Exp(g, q)
	l.Scale(g, g, 2/math.SqrtPi)
	a0, d0 := l.row(a, 0), l.row(dst, 0)
	for i := range a0 {
		d0[i] = math.Erf(a0[i])
	}
	for k := 1; k <= l.Order; k++ {
		dk := l.row(dst, k)
		clear(dk)
		for j := 1; j <= k; j++ {
			aj, gkj := l.row(a, j), l.row(g, k-j)
			f := float64(j) / float64(k)
			for i := range dk {
				dk[i] += f * aj[i] * gkj[i]
			}
		}
	}
}

// The methods below are faster versions for a linear operand, a jet with
// a_k = 0 for k ≥ 2 (such as the variable x or an affine function of it);
// they do not check that it is linear.

// ExpLinear sets dst = exp(a) for a linear jet a, from c′ = a_1·c:
//
//	c_0 = exp(a_0),  c_k = a_1 c_{k−1} / k.
func (l Layout) ExpLinear(dst, a []float64) {
	l.check(dst, a)
	a0, d0 := l.row(a, 0), l.row(dst, 0)
	for i := range d0 {
		d0[i] = math.Exp(a0[i])
	}
	if l.Order == 0 {
		return
	}
	a1 := l.row(a, 1)
	for k := 1; k <= l.Order; k++ {
		dk, dp := l.row(dst, k), l.row(dst, k-1)
		f := 1 / float64(k)
		for i := range dk {
			dk[i] = f * a1[i] * dp[i]
		}
	}
}

// PowLinear sets dst = a^p for a linear jet a with a_0 ≠ 0, by the
// binomial series of (a_0 + a_1 t)^p:
//
//	c_0 = a_0^p,  c_k = c_{k−1} · (p − k + 1)/k · a_1/a_0.
//
// For an integer p ≥ 0 the coefficients beyond order p are exactly 0.
func (l Layout) PowLinear(dst, a []float64, p float64) {
	l.check(dst, a)
	m := l.Points
	a0, d0 := l.row(a, 0), l.row(dst, 0)
	if l.Order == 0 {
		for i := range d0 {
			d0[i] = math.Pow(a0[i], p)
		}
		return
	}
	a1 := l.row(a, 1)
	for i := range d0 {
		c := math.Pow(a0[i], p)
		d0[i] = c
		q := a1[i] / a0[i]
		for k := 1; k <= l.Order; k++ {
			c *= (p - float64(k-1)) / float64(k) * q
			dst[k*m+i] = c
		}
	}
}

// SquareLinear sets dst = a² for a linear jet a: c_0 = a_0², c_1 = 2a_0a_1,
// c_2 = a_1², c_k = 0 for k ≥ 3.
func (l Layout) SquareLinear(dst, a []float64) {
	l.check(dst, a)
	a0, d0 := l.row(a, 0), l.row(dst, 0)
	for i := range d0 {
		d0[i] = a0[i] * a0[i]
	}
	if l.Order == 0 {
		return
	}
	a1, d1 := l.row(a, 1), l.row(dst, 1)
	for i := range d1 {
		d1[i] = 2 * a0[i] * a1[i]
	}
	if l.Order == 1 {
		return
	}
	d2 := l.row(dst, 2)
	for i := range d2 {
		d2[i] = a1[i] * a1[i]
	}
	clear(dst[3*l.Points:])
}
