package jet

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// randJet returns m random jets of order n: a_0 in [lo, hi], higher
// coefficients in [−0.3, 0.3] (so that the series converge well beyond
// t = 1 and identities do not cancel large terms; a fixed seed, so the tests are deterministic).
func randJet(rng *rand.Rand, l Layout, lo, hi float64) []float64 {
	a := make([]float64, l.Len())
	for i := range a {
		if i < l.Points {
			a[i] = lo + (hi-lo)*rng.Float64()
		} else {
			a[i] = 0.6*rng.Float64() - 0.3
		}
	}
	return a
}

// assertJets requires |got − want| ≤ tol·max(1, |want|) coefficient by
// coefficient.
func assertJets(t *testing.T, l Layout, got, want []float64, tol float64, what string) {
	t.Helper()
	require.Len(t, got, l.Len())
	for idx := range want {
		k, i := idx/l.Points, idx%l.Points
		assert.InDelta(t, want[idx], got[idx], tol*math.Max(1, math.Abs(want[idx])), "%s: coefficient %d of jet %d", what, k, i)
	}
}

// Property tests: identities of the functions that hold coefficient by
// coefficient for jets of arbitrary (non-linear) arguments. Tolerance 1e-12
// relative to max(1, |c_k|) at order 12: the recurrences compose O(n²)
// roundings of O(1) terms (common practice for such checks).
func TestIdentities(t *testing.T) {
	const tol = 1e-12
	l := Layout{Order: 12, Points: 7}
	rng := rand.New(rand.NewPCG(1, 2))
	tp := NewTape(l.Order, l.Points)
	one := tp.Const(1)
	for trial := 0; trial < 20; trial++ {
		tp.Reset(l.Order, l.Points)
		one = tp.Const(1)
		a := tp.FromCoeffs(randJet(rng, l, 1, 2))
		b := tp.FromCoeffs(randJet(rng, l, -2, -1))
		assertJets(t, l, tp.Exp(tp.Log(a)).c, a.c, tol, "exp(log a) = a")
		assertJets(t, l, tp.Log(tp.Exp(b)).c, b.c, tol, "log(exp b) = b")
		s, c := tp.SinCos(b)
		assertJets(t, l, tp.Add(tp.Square(s), tp.Square(c)).c, one.c, tol, "sin² + cos² = 1")
		// sin(2b) = 2 sin b cos b
		assertJets(t, l, tp.Sin(tp.Scale(b, 2)).c, tp.Scale(tp.Mul(s, c), 2).c, tol, "sin 2b = 2 sin b cos b")
		// tanh b = (e^{2b} − 1)/(e^{2b} + 1)
		e2 := tp.Exp(tp.Scale(b, 2))
		assertJets(t, l, tp.Tanh(b).c, tp.Div(tp.AddConst(e2, -1), tp.AddConst(e2, 1)).c, tol, "tanh")
		// erf is odd
		assertJets(t, l, tp.Erf(tp.Neg(b)).c, tp.Neg(tp.Erf(b)).c, tol, "erf(−b) = −erf(b)")
		assertJets(t, l, tp.Square(tp.Sqrt(a)).c, a.c, tol, "(√a)² = a")
		assertJets(t, l, tp.Pow(a, 0.5).c, tp.Sqrt(a).c, tol, "a^½ = √a")
		assertJets(t, l, tp.Pow(a, -1.5).c, tp.Recip(tp.Mul(a, tp.Sqrt(a))).c, tol, "a^−1.5 = 1/(a√a)")
		assertJets(t, l, tp.Mul(tp.Div(a, b), b).c, a.c, tol, "(a/b)·b = a")
		assertJets(t, l, tp.Mul(tp.Recip(b), b).c, one.c, tol, "(1/b)·b = 1")
		assertJets(t, l, tp.Mul(a, b).c, tp.Mul(b, a).c, tol, "ab = ba")
		assertJets(t, l, tp.Square(b).c, tp.Mul(b, b).c, tol, "b² = b·b")
		for _, n := range []int{-13, -6, -2, 0, 3, 5, 12, 13} {
			assertJets(t, l, tp.PowInt(a, n).c, tp.Pow(a, float64(n)).c, tol, "PowInt = Pow")
		}
		assertJets(t, l, tp.Mul(tp.PowInt(a, 7), tp.PowInt(a, -7)).c, one.c, tol, "a⁷·a⁻⁷ = 1")
		assertJets(t, l, tp.Exp(tp.Add(a, b)).c, tp.Mul(tp.Exp(a), tp.Exp(b)).c, tol, "exp(a+b) = exp a exp b")
		assertJets(t, l, tp.Affine(a, -3, 2).c, tp.AddConst(tp.Scale(a, -3), 2).c, 0, "Affine")
		assertJets(t, l, tp.Sub(a, b).c, tp.Add(a, tp.Neg(b)).c, 0, "a − b = a + (−b)")
	}
}

// PowInt at a_0 = 0, where the real-power recurrence divides by zero:
// (t)^n = tⁿ exactly.
func TestPowIntAtZero(t *testing.T) {
	l := Layout{Order: 8, Points: 1}
	tp := NewTape(l.Order, l.Points)
	x := tp.Var([]float64{0})
	for n := 0; n <= 10; n++ {
		got := tp.PowInt(x, n).Coeffs()
		for k := 0; k <= l.Order; k++ {
			want := 0.0
			if k == n {
				want = 1
			}
			assert.Equal(t, want, got[k], "t^%d coefficient %d", n, k)
		}
	}
	// (1 − e^{−t})² at t = 0: 0, 0, 1, −1, 7/12 (series of e^{−t}: common
	// practice).
	e := tp.Exp(tp.Neg(x))
	sq := tp.PowInt(tp.AddConst(tp.Neg(e), 1), 2).Coeffs()
	assert.InDeltaSlice(t, []float64{0, 0, 1, -1, 7.0 / 12}, sq[:5], 1e-15)
}

// Functions outside their domain give non-finite coefficients, like math.
func TestDomainGivesNaN(t *testing.T) {
	tp := NewTape(3, 2)
	x := tp.Var([]float64{-1, 0})
	for name, j := range map[string]Jet{
		"log":  tp.Log(x),
		"sqrt": tp.Sqrt(x),
		"pow":  tp.Pow(x, 0.5),
	} {
		for i := 0; i < 2; i++ {
			bad := false
			for k := 0; k <= 3; k++ {
				v := j.Coeff(k, i)
				bad = bad || math.IsNaN(v) || math.IsInf(v, 0)
			}
			assert.True(t, bad, "%s at x = %g", name, x.Coeff(0, i))
		}
	}
	r := tp.Recip(x)
	assert.True(t, math.IsInf(r.Coeff(0, 1), 1))
}

// The order-0 layout is plain function evaluation.
func TestOrderZero(t *testing.T) {
	tp := NewTape(0, 3)
	xs := []float64{0.3, 1.1, 2.5}
	x := tp.Var(xs)
	for i, v := range xs {
		assert.Equal(t, math.Exp(v), tp.Exp(x).Coeff(0, i))
		assert.Equal(t, math.Tanh(v), tp.Tanh(x).Coeff(0, i))
		assert.Equal(t, math.Erf(v), tp.Erf(x).Coeff(0, i))
		assert.Equal(t, math.Sin(v), tp.Sin(x).Coeff(0, i))
		assert.InDelta(t, math.Pow(v, -6), tp.PowInt(x, -6).Coeff(0, i), 1e-15*math.Pow(v, -6))
	}
}

// Morse through the tape against its closed-form coefficients
// c_k = De·(−a)ᵏ(2ᵏ e^{−2a(r−re)} − 2 e^{−a(r−re)})/k! for k ≥ 1 (from
// V = De(1 − e^{−a(r−re)})² − De, Morse 1929), orders 0–40 at re, where
// c_k = De(−a)ᵏ(2ᵏ − 2)/k! (issue 9).
func TestMorse(t *testing.T) {
	const De, a, re = 4.6, 1.87, 1.27
	const order = 40
	rs := []float64{0.8, re, 1.9, 4}
	tp := NewTape(order, len(rs))
	r := tp.Var(rs)
	e := tp.Exp(tp.Affine(r, -a, a*re))
	v := tp.AddConst(tp.Scale(tp.Square(tp.AddConst(tp.Neg(e), 1)), De), -De)
	for i, x := range rs {
		y := math.Exp(-a * (x - re))
		assert.InDelta(t, De*(1-y)*(1-y)-De, v.Coeff(0, i), 1e-14*De)
		f := 1.0 // (−a)ᵏ/k!
		for k := 1; k <= order; k++ {
			f *= -a / float64(k)
			want := De * f * (math.Pow(2, float64(k))*y*y - 2*y)
			assert.InDelta(t, want, v.Coeff(k, i), 1e-12*math.Abs(De*f*(math.Pow(2, float64(k))*y*y+2*y)), "order %d at r = %g", k, x)
		}
	}
}

// After one evaluation, Reset and the same evaluation allocate nothing.
func TestTapeNoAllocAfterWarmup(t *testing.T) {
	rs := make([]float64, 64)
	for i := range rs {
		rs[i] = 1 + 0.01*float64(i)
	}
	tp := NewTape(6, len(rs))
	f := func() {
		tp.Reset(6, len(rs))
		r := tp.Var(rs)
		x := tp.Erf(tp.Tanh(tp.Div(tp.Sin(r), tp.PowInt(r, -6))))
		_ = tp.Add(tp.Pow(tp.Exp(tp.Log(r)), 1.5), tp.Sqrt(tp.Cos(x)))
	}
	f()
	assert.Zero(t, testing.AllocsPerRun(20, f))
}

func TestLayoutPanicsOnLength(t *testing.T) {
	l := Layout{Order: 2, Points: 3}
	assert.Panics(t, func() { l.Exp(make([]float64, 9), make([]float64, 8)) })
	assert.Panics(t, func() { l.Tanh(make([]float64, 9), make([]float64, 9), make([]float64, 3)) })
	assert.Panics(t, func() { NewTape(-1, 1) })
	t1, t2 := NewTape(2, 3), NewTape(3, 3)
	assert.Panics(t, func() { t2.Exp(t1.Const(1)) })
}

// The linear-operand methods agree with the general ones on linear jets
// (several points at once, including a_0 = 0 for the square).
func TestLinearMethods(t *testing.T) {
	for _, order := range []int{0, 1, 2, 3, 12} {
		l := Layout{Order: order, Points: 4}
		a := make([]float64, l.Len())
		l.Var(a, []float64{0.5, 1.3, 2, 7})
		l.Affine(a, a, -1.7, 2.2) // a linear jet with slope −1.7
		g, h := make([]float64, l.Len()), make([]float64, l.Len())
		l.Exp(g, a)
		l.ExpLinear(h, a)
		assertJets(t, l, h, g, 1e-15, "ExpLinear")
		for _, p := range []float64{-12, -6, -1.5, 0.5, 3, 7} {
			b := make([]float64, l.Len())
			l.Var(b, []float64{0.5, 1.3, 2, 7})
			l.Pow(g, b, p)
			l.PowLinear(h, b, p)
			assertJets(t, l, h, g, 1e-14, "PowLinear")
		}
		l.Var(a, []float64{0, 1.3, -2, 7})
		l.Square(g, a)
		l.SquareLinear(h, a)
		assert.Equal(t, g, h, "SquareLinear order %d", order)
	}
}

// Square at orders 2–4 (a separate loop) gives the bits of the general
// loop at higher orders: coefficient k does not depend on the order.
func TestSquareSameBitsAtEveryOrder(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 4))
	big := Layout{Order: 8, Points: 5}
	a := randJet(rng, big, -2, 2)
	want := make([]float64, big.Len())
	big.Square(want, a)
	for order := 0; order <= 7; order++ {
		l := Layout{Order: order, Points: 5}
		got := make([]float64, l.Len())
		l.Square(got, a[:l.Len()])
		assert.Equal(t, want[:l.Len()], got, "order %d", order)
	}
}

// The tape takes the linear recurrences for jets it knows to be linear;
// they agree with the general ones.
func TestTapeLinear(t *testing.T) {
	xs := []float64{0.7, 1.3, 2.9}
	tp := NewTape(10, len(xs))
	l := tp.Layout()
	x := tp.Var(xs)
	u := tp.Affine(tp.Sub(x, tp.Scale(x, 0.25)), -1.5, 4) // linear
	gen := make([]float64, l.Len())
	work := make([]float64, 2*l.Len())
	l.Exp(gen, u.Coeffs())
	assertJets(t, l, tp.Exp(u).Coeffs(), gen, 1e-15, "Exp")
	l.Square(gen, u.Coeffs())
	assertJets(t, l, tp.Square(u).Coeffs(), gen, 1e-15, "Square")
	l.PowInt(gen, x.Coeffs(), -6, work)
	assertJets(t, l, tp.PowInt(x, -6).Coeffs(), gen, 1e-14, "PowInt")
	l.Pow(gen, x.Coeffs(), 1.5)
	assertJets(t, l, tp.Pow(x, 1.5).Coeffs(), gen, 1e-14, "Pow")
	// A product is not linear: Exp of it takes the general recurrence.
	sq := tp.Mul(x, x)
	l.Exp(gen, sq.Coeffs())
	assert.Equal(t, gen, tp.Exp(sq).Coeffs())
}
