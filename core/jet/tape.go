package jet

import "fmt"

// Jet is a block of jets of one Tape: Points jets of order Order, one per
// evaluation point, laid out as described by Layout. A Jet is a view into
// memory owned by its Tape and stays valid until the Tape's next Reset.
type Jet struct {
	c   []float64
	l   Layout
	lin bool // linear in the variable: coefficients of order ≥ 2 vanish
}

// Layout returns the jet's layout.
func (j Jet) Layout() Layout { return j.l }

// Coeff returns coefficient k of the jet at point i: f⁽ᵏ⁾(x_i)/k!.
func (j Jet) Coeff(k, i int) float64 { return j.c[k*j.l.Points+i] }

// Coeffs returns the coefficients, coefficient-major (see Layout). The slice
// aliases the tape's memory: copy it to keep it past the next Reset.
func (j Jet) Coeffs() []float64 { return j.c }

// chunkMin is the smallest chunk a Tape allocates, in float64s.
const chunkMin = 4096

// Tape is a workspace for jet arithmetic at a fixed Layout. Its methods
// return new jets computed from their operands with the recurrences of the
// Layout methods of the same name (or, for Exp, Square, Pow and negative
// PowInt of a jet the tape knows to be linear in the variable — Var, Const
// and their sums and affine maps — the Linear versions); operands are never modified, so a Jet
// may be used any number of times. A Tape hands out memory from chunks
// that it keeps across Reset, so that evaluating the same function again
// after Reset allocates nothing. The zero Tape is not usable: call NewTape.
// A Tape is not safe for concurrent use.
type Tape struct {
	l      Layout
	chunks [][]float64
	cur    int // index of the chunk in use
	off    int // first free element of chunks[cur]
}

// NewTape returns a tape for jets of the given order at the given number of
// points. It panics if order < 0 or points < 1.
func NewTape(order, points int) *Tape {
	t := &Tape{}
	t.Reset(order, points)
	return t
}

// Reset releases every jet of the tape and sets its layout; memory is kept
// for reuse. Jets obtained before Reset must not be used after it.
func (t *Tape) Reset(order, points int) {
	l := Layout{Order: order, Points: points}
	l.check()
	t.l = l
	t.cur, t.off = 0, 0
}

// Layout returns the tape's layout.
func (t *Tape) Layout() Layout { return t.l }

// alloc returns a fresh slice of t.l.Len() elements; its contents are
// unspecified.
func (t *Tape) alloc() []float64 { return t.allocN(t.l.Len()) }

// allocN returns n consecutive elements.
func (t *Tape) allocN(n int) []float64 {
	for t.cur < len(t.chunks) {
		c := t.chunks[t.cur]
		if t.off+n <= len(c) {
			s := c[t.off : t.off+n : t.off+n]
			t.off += n
			return s
		}
		t.cur++
		t.off = 0
	}
	size := max(chunkMin, 16*n)
	if k := len(t.chunks); k > 0 {
		size = max(size, 2*len(t.chunks[k-1]))
	}
	t.chunks = append(t.chunks, make([]float64, size))
	t.cur = len(t.chunks) - 1
	t.off = n
	return t.chunks[t.cur][:n:n]
}

// newJet returns a jet with fresh memory.
func (t *Tape) newJet() Jet { return Jet{c: t.alloc(), l: t.l} }

// own panics unless j has the tape's layout (a jet of another tape or of
// the tape before a Reset to another layout).
func (t *Tape) own(j ...Jet) {
	for _, x := range j {
		if x.l != t.l || len(x.c) != t.l.Len() {
			panic(fmt.Sprintf("jet: jet of layout %+v used on a tape of layout %+v", x.l, t.l))
		}
	}
}

// Var returns the independent variable at the points x: jet i is
// [x[i], 1, 0, …]. len(x) must equal the tape's Points.
func (t *Tape) Var(x []float64) Jet {
	j := t.newJet()
	t.l.Var(j.c, x)
	j.lin = true
	return j
}

// Const returns the constant c at every point: [c, 0, …, 0].
func (t *Tape) Const(c float64) Jet {
	j := t.newJet()
	t.l.Const(j.c, c)
	j.lin = true
	return j
}

// FromCoeffs returns a jet holding a copy of c, laid out as described by
// Layout (len(c) must be the layout's Len).
func (t *Tape) FromCoeffs(c []float64) Jet {
	j := t.newJet()
	t.l.Copy(j.c, c)
	return j
}

// Add returns a + b (Layout.Add).
func (t *Tape) Add(a, b Jet) Jet {
	t.own(a, b)
	j := t.newJet()
	t.l.Add(j.c, a.c, b.c)
	j.lin = a.lin && b.lin
	return j
}

// Sub returns a − b (Layout.Sub).
func (t *Tape) Sub(a, b Jet) Jet {
	t.own(a, b)
	j := t.newJet()
	t.l.Sub(j.c, a.c, b.c)
	j.lin = a.lin && b.lin
	return j
}

// Neg returns −a (Layout.Neg).
func (t *Tape) Neg(a Jet) Jet {
	t.own(a)
	j := t.newJet()
	t.l.Neg(j.c, a.c)
	j.lin = a.lin
	return j
}

// Scale returns s·a for a scalar s (Layout.Scale).
func (t *Tape) Scale(a Jet, s float64) Jet {
	t.own(a)
	j := t.newJet()
	t.l.Scale(j.c, a.c, s)
	j.lin = a.lin
	return j
}

// AddConst returns a + c for a scalar c (Layout.AddConst).
func (t *Tape) AddConst(a Jet, c float64) Jet {
	t.own(a)
	j := t.newJet()
	t.l.AddConst(j.c, a.c, c)
	j.lin = a.lin
	return j
}

// Affine returns s·a + c for scalars s and c (Layout.Affine).
func (t *Tape) Affine(a Jet, s, c float64) Jet {
	t.own(a)
	j := t.newJet()
	t.l.Affine(j.c, a.c, s, c)
	j.lin = a.lin
	return j
}

// Mul returns a·b (Layout.Mul).
func (t *Tape) Mul(a, b Jet) Jet {
	t.own(a, b)
	j := t.newJet()
	t.l.Mul(j.c, a.c, b.c)
	return j
}

// Square returns a² (Layout.Square).
func (t *Tape) Square(a Jet) Jet {
	t.own(a)
	j := t.newJet()
	if a.lin {
		t.l.SquareLinear(j.c, a.c)
	} else {
		t.l.Square(j.c, a.c)
	}
	return j
}

// Div returns a/b (Layout.Div).
func (t *Tape) Div(a, b Jet) Jet {
	t.own(a, b)
	j := t.newJet()
	t.l.Div(j.c, a.c, b.c)
	return j
}

// Recip returns 1/a (Layout.Recip).
func (t *Tape) Recip(a Jet) Jet {
	t.own(a)
	j := t.newJet()
	t.l.Recip(j.c, a.c)
	return j
}

// Sqrt returns √a (Layout.Sqrt).
func (t *Tape) Sqrt(a Jet) Jet {
	t.own(a)
	j := t.newJet()
	t.l.Sqrt(j.c, a.c)
	return j
}

// Exp returns exp a (Layout.Exp).
func (t *Tape) Exp(a Jet) Jet {
	t.own(a)
	j := t.newJet()
	if a.lin {
		t.l.ExpLinear(j.c, a.c)
	} else {
		t.l.Exp(j.c, a.c)
	}
	return j
}

// Log returns ln a (Layout.Log).
func (t *Tape) Log(a Jet) Jet {
	t.own(a)
	j := t.newJet()
	t.l.Log(j.c, a.c)
	return j
}

// Pow returns a^p for a real exponent p (Layout.Pow; needs a_0 ≠ 0).
func (t *Tape) Pow(a Jet, p float64) Jet {
	t.own(a)
	j := t.newJet()
	if a.lin {
		t.l.PowLinear(j.c, a.c, p)
	} else {
		t.l.Pow(j.c, a.c, p)
	}
	return j
}

// PowInt returns aⁿ for an integer n (Layout.PowInt).
func (t *Tape) PowInt(a Jet, n int) Jet {
	t.own(a)
	j := t.newJet()
	if a.lin && n < 0 {
		t.l.PowLinear(j.c, a.c, float64(n))
	} else {
		t.l.PowInt(j.c, a.c, n, t.allocN(2*t.l.Len()))
	}
	return j
}

// Sin returns sin a (Layout.SinCos).
func (t *Tape) Sin(a Jet) Jet {
	s, _ := t.SinCos(a)
	return s
}

// Cos returns cos a (Layout.SinCos).
func (t *Tape) Cos(a Jet) Jet {
	_, c := t.SinCos(a)
	return c
}

// SinCos returns sin a and cos a, computed together (Layout.SinCos).
func (t *Tape) SinCos(a Jet) (sin, cos Jet) {
	t.own(a)
	s, c := t.newJet(), t.newJet()
	t.l.SinCos(s.c, c.c, a.c)
	return s, c
}

// Tanh returns tanh a (Layout.Tanh).
func (t *Tape) Tanh(a Jet) Jet {
	t.own(a)
	j := t.newJet()
	t.l.Tanh(j.c, a.c, t.alloc())
	return j
}

// Erf returns erf a (Layout.Erf).
func (t *Tape) Erf(a Jet) Jet {
	t.own(a)
	j := t.newJet()
	t.l.Erf(j.c, a.c, t.allocN(2*t.l.Len()))
	return j
}
