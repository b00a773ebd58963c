package formula

import (
	"fmt"
	"math"
	"slices"
	"strings"

	"github.com/pairwell/pairwell/core/jet"
)

// A Program is a compiled formula: a list of scalar instructions computing
// every r-independent sub-expression from the parameters (run once per
// parameter set, by Scalars), and a flat list of jet instructions computing
// V(r) and its Taylor coefficients from r and those scalars (run for each
// block of separations, by Eval).
//
// Compilation folds sub-expressions made of numbers only into constants,
// shares common sub-expressions (the same operation on the same operands is
// computed once; + and · are normalized for commutativity), fuses chains of
// scalar multiples and shifts of a jet into one affine instruction
// s·x + c, turns constant integer powers into binary powering and constant
// powers ½ into square roots, removes unused instructions and assigns jet
// registers by liveness, so that the workspace stays small.
//
// A Program is immutable and safe for concurrent use.
type Program struct {
	src     string
	nparams int
	consts  []constSlot // scalar slots with a value fixed at compile time
	scalars []sop       // scalar instructions, in order
	nscal   int         // number of scalar slots
	code    []jop       // jet instructions, in order
	nregs   int         // number of jet registers
	out     int         // register of the result
}

// constSlot is a scalar slot holding a compile-time constant.
type constSlot struct {
	slot int
	val  float64
}

// sop is a scalar instruction: slots[dst] = op(slots[a], slots[b]).
type sop struct {
	k    kind   // kNeg, kAdd, kSub, kMul, kDiv, kPow or kCall
	fn   string // for kCall
	dst  int
	a, b int
	text string // the sub-expression, for messages
}

// opcode is a jet instruction.
type opcode int

const (
	opVar    opcode = iota // dst = r
	opAffine               // dst = s·a + c   (scalars s, c)
	opAdd                  // dst = a + b
	opSub                  // dst = a − b
	opMul                  // dst = a·b
	opSquare               // dst = a²
	opDiv                  // dst = a/b
	opRDiv                 // dst = s/a       (scalar s)
	opPowInt               // dst = aⁿ        (integer n)
	opPow                  // dst = a^s       (scalar s; binary powering when s is an integer)
	opSqrt
	opExp
	opLog
	opSin
	opCos
	opTanh
	opErf
	opExpLin    // dst = exp a for a linear a
	opPowLin    // dst = a^s for a linear a (scalar s)
	opSquareLin // dst = a² for a linear a
)

var opNames = [...]string{"var", "affine", "add", "sub", "mul", "square", "div", "rdiv", "powint", "pow", "sqrt", "exp", "log", "sin", "cos", "tanh", "erf", "explin", "powlin", "squarelin"}

func (o opcode) String() string { return opNames[o] }

// jop is a jet instruction. a, b and dst are jet values during compilation
// and registers afterwards; s, c are scalar slots.
type jop struct {
	op   opcode
	dst  int
	a, b int
	s, c int
	n    int
}

// skey identifies a scalar operation for sharing.
type skey struct {
	k    kind
	fn   string
	a, b int
}

// value is the result of compiling a sub-expression: a scalar slot or a jet
// value.
type value struct {
	jet  bool
	id   int
	node *node // for messages
}

type compiler struct {
	src      string
	p        *Program
	constVal map[int]float64 // slots with known values
	constIdx map[uint64]int  // value bits → slot
	smemo    map[skey]int    // scalar CSE
	jmemo    map[jop]int     // jet CSE (keys have dst = 0)
	jops     []jop           // jet values in creation order
	lin      []bool          // jet value is linear in r (coefficients ≥ 2 vanish)
	usedPar  []bool
}

// compile compiles the tree n of src with nparams parameters.
func compile(src string, n *node, nparams int) (*Program, []bool, error) {
	c := &compiler{
		src:      src,
		p:        &Program{src: src, nparams: nparams, nscal: nparams},
		constVal: map[int]float64{},
		constIdx: map[uint64]int{},
		smemo:    map[skey]int{},
		jmemo:    map[jop]int{},
		usedPar:  make([]bool, nparams),
	}
	v, err := c.value(n)
	if err != nil {
		return nil, nil, err
	}
	if !v.jet {
		return nil, nil, newError(src, n.pos, n.end, "the formula does not depend on r")
	}
	c.finish(v.id)
	return c.p, c.usedPar, nil
}

// konst returns the slot of a constant.
func (c *compiler) konst(x float64) int {
	bits := math.Float64bits(x)
	if s, ok := c.constIdx[bits]; ok {
		return s
	}
	s := c.p.nscal
	c.p.nscal++
	c.constIdx[bits] = s
	c.constVal[s] = x
	c.p.consts = append(c.p.consts, constSlot{slot: s, val: x})
	return s
}

func (c *compiler) isConst(s int, x float64) bool {
	v, ok := c.constVal[s]
	return ok && v == x
}

// scalar returns the slot of op(a, b), folding constants and sharing
// repeated operations.
func (c *compiler) scalar(k kind, fn string, a, b int, n *node) int {
	va, oka := c.constVal[a]
	vb, okb := c.constVal[b]
	if k == kNeg || k == kCall {
		okb, b = true, -1
	}
	if oka && okb {
		var x float64
		switch k {
		case kNeg:
			x = -va
		case kCall:
			x = call1(fn, va)
		default:
			x = arith(k, va, vb)
		}
		if !math.IsNaN(x) && !math.IsInf(x, 0) {
			return c.konst(x)
		}
	}
	if (k == kAdd || k == kMul) && a > b {
		a, b = b, a
	}
	key := skey{k, fn, a, b}
	if s, ok := c.smemo[key]; ok {
		return s
	}
	s := c.p.nscal
	c.p.nscal++
	text := ""
	if n != nil {
		text = snippet(c.src[n.pos:n.end])
	}
	c.p.scalars = append(c.p.scalars, sop{k: k, fn: fn, dst: s, a: a, b: b, text: text})
	c.smemo[key] = s
	return s
}

// emit returns the jet value of an instruction, sharing repeated ones.
func (c *compiler) emit(o jop) int {
	if o.op == opAdd || o.op == opMul {
		if o.a > o.b {
			o.a, o.b = o.b, o.a
		}
	}
	// Operations on a linear jet have cheaper recurrences.
	if o.a >= 0 && c.lin[o.a] {
		switch o.op {
		case opExp:
			o.op = opExpLin
		case opSquare:
			o.op = opSquareLin
		case opPowInt:
			if o.n < 0 {
				o.op, o.s, o.n = opPowLin, c.konst(float64(o.n)), 0
			}
		case opPow:
			o.op = opPowLin
		}
	}
	key := o
	key.dst = 0
	if id, ok := c.jmemo[key]; ok {
		return id
	}
	id := len(c.jops)
	o.dst = id
	c.jops = append(c.jops, o)
	c.jmemo[key] = id
	lin := false
	switch o.op {
	case opVar:
		lin = true
	case opAffine:
		lin = c.lin[o.a]
	case opAdd, opSub:
		lin = c.lin[o.a] && c.lin[o.b]
	}
	c.lin = append(c.lin, lin)
	return id
}

// unary returns the instruction op on jet value a.
func (c *compiler) unary(op opcode, a int) int { return c.emit(jop{op: op, a: a, b: -1, s: -1, c: -1}) }

// binary returns the instruction op on jet values a and b.
func (c *compiler) binary(op opcode, a, b int) int {
	return c.emit(jop{op: op, a: a, b: b, s: -1, c: -1})
}

// affine returns s·a + c for jet value a and scalar slots s, c, fusing
// an affine a.
func (c *compiler) affine(a, s, k int) int {
	if c.isConst(s, 1) && c.isConst(k, 0) {
		return a
	}
	if in := c.jops[a]; in.op == opAffine {
		// s·(s1·x + c1) + k = (s·s1)·x + (s·c1 + k)
		s2 := c.scalar(kMul, "", s, in.s, nil)
		k2 := c.scalar(kAdd, "", c.scalar(kMul, "", s, in.c, nil), k, nil)
		return c.affine(in.a, s2, k2)
	}
	return c.emit(jop{op: opAffine, a: a, b: -1, s: s, c: k})
}

// powInt returns aⁿ. Powers of s/x and s·x become sⁿ·x⁻ⁿ and sⁿ·xⁿ, so
// that a power of the variable keeps its cheap linear recurrence.
func (c *compiler) powInt(a, n int) int {
	switch in := c.jops[a]; {
	case in.op == opRDiv:
		sn := c.scalar(kPow, "", in.s, c.konst(float64(n)), nil)
		return c.affine(c.powInt(in.a, -n), sn, c.konst(0))
	case in.op == opAffine && c.isConst(in.c, 0) && n != 1:
		sn := c.scalar(kPow, "", in.s, c.konst(float64(n)), nil)
		return c.affine(c.powInt(in.a, n), sn, c.konst(0))
	}
	switch n {
	case 1:
		return a
	case 2:
		return c.unary(opSquare, a)
	}
	return c.emit(jop{op: opPowInt, a: a, b: -1, s: -1, c: -1, n: n})
}

// value compiles n.
func (c *compiler) value(n *node) (value, error) {
	switch n.kind {
	case kNum:
		return value{id: c.konst(n.val), node: n}, nil
	case kVar:
		return value{jet: true, id: c.emit(jop{op: opVar, a: -1, b: -1, s: -1, c: -1}), node: n}, nil
	case kParam:
		c.usedPar[n.idx] = true
		return value{id: n.idx, node: n}, nil
	case kNeg:
		x, err := c.value(n.args[0])
		if err != nil {
			return value{}, err
		}
		if !x.jet {
			return value{id: c.scalar(kNeg, "", x.id, -1, n), node: n}, nil
		}
		return value{jet: true, id: c.affine(x.id, c.konst(-1), c.konst(0)), node: n}, nil
	case kCall:
		x, err := c.value(n.args[0])
		if err != nil {
			return value{}, err
		}
		if !x.jet {
			return value{id: c.scalar(kCall, n.fn, x.id, -1, n), node: n}, nil
		}
		op := map[string]opcode{"exp": opExp, "log": opLog, "sqrt": opSqrt, "sin": opSin, "cos": opCos, "tanh": opTanh, "erf": opErf}[n.fn]
		return value{jet: true, id: c.unary(op, x.id), node: n}, nil
	}
	x, err := c.value(n.args[0])
	if err != nil {
		return value{}, err
	}
	y, err := c.value(n.args[1])
	if err != nil {
		return value{}, err
	}
	if !x.jet && !y.jet {
		return value{id: c.scalar(n.kind, "", x.id, y.id, n), node: n}, nil
	}
	j := func(id int) (value, error) { return value{jet: true, id: id, node: n}, nil }
	zero, one := c.konst(0), c.konst(1)
	switch n.kind {
	case kAdd:
		switch {
		case x.jet && y.jet:
			return j(c.binary(opAdd, x.id, y.id))
		case x.jet:
			return j(c.affine(x.id, one, y.id))
		default:
			return j(c.affine(y.id, one, x.id))
		}
	case kSub:
		switch {
		case x.jet && y.jet:
			return j(c.binary(opSub, x.id, y.id))
		case x.jet:
			return j(c.affine(x.id, one, c.scalar(kNeg, "", y.id, -1, y.node)))
		default:
			return j(c.affine(y.id, c.konst(-1), x.id))
		}
	case kMul:
		switch {
		case x.jet && y.jet:
			if x.id == y.id {
				return j(c.unary(opSquare, x.id))
			}
			return j(c.binary(opMul, x.id, y.id))
		case x.jet:
			return j(c.affine(x.id, y.id, zero))
		default:
			return j(c.affine(y.id, x.id, zero))
		}
	case kDiv:
		switch {
		case x.jet && y.jet:
			if in := c.jops[y.id]; in.op == opPowInt || in.op == opSquare || in.op == opSquareLin {
				n := in.n
				if in.op == opSquare || in.op == opSquareLin {
					n = 2
				}
				return j(c.binary(opMul, x.id, c.powInt(in.a, -n)))
			}
			return j(c.binary(opDiv, x.id, y.id))
		case x.jet:
			return j(c.affine(x.id, c.scalar(kDiv, "", one, y.id, y.node), zero))
		default:
			if in := c.jops[y.id]; in.op == opPowInt {
				// s/xⁿ = s·x⁻ⁿ: binary powering of 1/x is more accurate
				// than the reciprocal of xⁿ.
				return j(c.affine(c.powInt(in.a, -in.n), x.id, zero))
			}
			if in := c.jops[y.id]; in.op == opSquare || in.op == opSquareLin {
				return j(c.affine(c.powInt(in.a, -2), x.id, zero))
			}
			return j(c.emit(jop{op: opRDiv, a: y.id, b: -1, s: x.id, c: -1}))
		}
	case kPow:
		switch {
		case x.jet && !y.jet:
			if p, ok := c.constVal[y.id]; ok {
				switch {
				case p == 1:
					return x, nil
				case p == 0.5:
					return j(c.unary(opSqrt, x.id))
				case p == math.Trunc(p) && math.Abs(p) <= 1<<20:
					return j(c.powInt(x.id, int(p)))
				}
			}
			return j(c.emit(jop{op: opPow, a: x.id, b: -1, s: y.id, c: -1}))
		case !x.jet:
			// s^y = exp(y·ln s)
			ls := c.scalar(kCall, "log", x.id, -1, x.node)
			return j(c.unary(opExp, c.affine(y.id, ls, zero)))
		default:
			// x^y = exp(y·ln x)
			return j(c.unary(opExp, c.binary(opMul, y.id, c.unary(opLog, x.id))))
		}
	}
	return value{}, newError(c.src, n.pos, n.end, "internal error: unknown node")
}

// finish keeps the jet instructions the result needs and assigns
// registers by liveness.
func (c *compiler) finish(out int) {
	live := make([]bool, len(c.jops))
	live[out] = true
	for i := out; i >= 0; i-- {
		if !live[i] {
			continue
		}
		o := c.jops[i]
		for _, a := range []int{o.a, o.b} {
			if a >= 0 {
				live[a] = true
			}
		}
	}
	lastUse := make([]int, len(c.jops))
	for i := range lastUse {
		lastUse[i] = -1
	}
	for i, o := range c.jops {
		if !live[i] {
			continue
		}
		for _, a := range []int{o.a, o.b} {
			if a >= 0 {
				lastUse[a] = i
			}
		}
	}
	reg := make([]int, len(c.jops))
	var free []int
	for i, o := range c.jops {
		if !live[i] {
			continue
		}
		var r int
		if len(free) > 0 {
			r, free = free[len(free)-1], free[:len(free)-1]
		} else {
			r = c.p.nregs
			c.p.nregs++
		}
		reg[i] = r
		for _, a := range []int{o.a, o.b} {
			if a >= 0 {
				o2 := a
				if lastUse[o2] == i && !slices.Contains(free, reg[o2]) {
					free = append(free, reg[o2])
				}
			}
		}
		o.dst = r
		if o.a >= 0 {
			o.a = reg[o.a]
		}
		if o.b >= 0 {
			o.b = reg[o.b]
		}
		c.p.code = append(c.p.code, o)
	}
	c.p.out = reg[out]
	// Scalars: keep only those the jet code or other kept scalars need.
	need := make([]bool, c.p.nscal)
	for _, o := range c.p.code {
		for _, s := range []int{o.s, o.c} {
			if s >= 0 {
				need[s] = true
			}
		}
	}
	for i := len(c.p.scalars) - 1; i >= 0; i-- {
		o := c.p.scalars[i]
		if !need[o.dst] {
			continue
		}
		for _, s := range []int{o.a, o.b} {
			if s >= 0 {
				need[s] = true
			}
		}
	}
	kept := c.p.scalars[:0]
	for _, o := range c.p.scalars {
		if need[o.dst] {
			kept = append(kept, o)
		}
	}
	c.p.scalars = kept
}

// arith applies a binary operation to numbers.
func arith(k kind, x, y float64) float64 {
	switch k {
	case kAdd:
		return x + y
	case kSub:
		return x - y
	case kMul:
		return x * y
	case kDiv:
		return x / y
	case kPow:
		return math.Pow(x, y)
	}
	return math.NaN()
}

// call1 applies a function of the language to a number.
func call1(fn string, x float64) float64 {
	switch fn {
	case "exp":
		return math.Exp(x)
	case "log":
		return math.Log(x)
	case "sqrt":
		return math.Sqrt(x)
	case "sin":
		return math.Sin(x)
	case "cos":
		return math.Cos(x)
	case "tanh":
		return math.Tanh(x)
	case "erf":
		return math.Erf(x)
	}
	return math.NaN()
}

// Scalars computes the scalar slots of the program for a parameter set
// (in the default units). It returns an error naming the sub-expression
// when one is not finite (e.g. log of a negative parameter).
func (p *Program) Scalars(params []float64) ([]float64, error) {
	if len(params) != p.nparams {
		return nil, fmt.Errorf("%d parameters, want %d", len(params), p.nparams)
	}
	s := make([]float64, p.nscal)
	copy(s, params)
	for _, k := range p.consts {
		s[k.slot] = k.val
	}
	for _, o := range p.scalars {
		var x float64
		switch o.k {
		case kNeg:
			x = -s[o.a]
		case kCall:
			x = call1(o.fn, s[o.a])
		default:
			x = arith(o.k, s[o.a], s[o.b])
		}
		if math.IsNaN(x) || math.IsInf(x, 0) {
			what := o.text
			if what == "" {
				what = "a constant part of the formula"
			} else {
				what = "'" + what + "'"
			}
			return nil, fmt.Errorf("%s is %g for these parameters", what, x)
		}
		s[o.dst] = x
	}
	return s, nil
}

// Workspace is the memory Eval needs for one layout; reuse it across calls
// (one per goroutine).
type Workspace struct {
	l    jet.Layout
	regs [][]float64
	work []float64
	buf  []float64
}

// NewWorkspace returns a workspace for p at the given layout.
func (p *Program) NewWorkspace(l jet.Layout) *Workspace {
	w := &Workspace{}
	p.reset(w, l)
	return w
}

// reset sizes w for the layout l, reusing its memory when it is large
// enough.
func (p *Program) reset(w *Workspace, l jet.Layout) {
	n := l.Len()
	need := (p.nregs + 2) * n
	if cap(w.buf) < need {
		w.buf = make([]float64, need)
	}
	w.buf = w.buf[:need]
	if cap(w.regs) < p.nregs {
		w.regs = make([][]float64, p.nregs)
	}
	w.regs = w.regs[:p.nregs]
	for i := range w.regs {
		w.regs[i] = w.buf[i*n : (i+1)*n : (i+1)*n]
	}
	w.work = w.buf[p.nregs*n:]
	w.l = l
}

// Eval runs the jet code at the separations rs (len(rs) = l.Points) with
// the scalars of one parameter set and returns the jets of V, laid out as
// l (coefficient k of point i at k·Points + i). The result aliases w and
// is valid until w is used again.
func (p *Program) Eval(w *Workspace, l jet.Layout, scalars, rs []float64) []float64 {
	if w.l != l || len(w.regs) != p.nregs {
		p.reset(w, l)
	}
	R := w.regs
	for _, o := range p.code {
		d := R[o.dst]
		switch o.op {
		case opVar:
			l.Var(d, rs)
		case opAffine:
			s, c := scalars[o.s], scalars[o.c]
			switch {
			case c == 0:
				l.Scale(d, R[o.a], s)
			case s == 1:
				l.AddConst(d, R[o.a], c)
			default:
				l.Affine(d, R[o.a], s, c)
			}
		case opAdd:
			l.Add(d, R[o.a], R[o.b])
		case opSub:
			l.Sub(d, R[o.a], R[o.b])
		case opMul:
			l.Mul(d, R[o.a], R[o.b])
		case opSquare:
			l.Square(d, R[o.a])
		case opDiv:
			l.Div(d, R[o.a], R[o.b])
		case opRDiv:
			l.Recip(d, R[o.a])
			if s := scalars[o.s]; s != 1 {
				l.Scale(d, d, s)
			}
		case opPowInt:
			l.PowInt(d, R[o.a], o.n, w.work)
		case opPow:
			if s := scalars[o.s]; s == math.Trunc(s) && math.Abs(s) <= 1<<20 {
				l.PowInt(d, R[o.a], int(s), w.work)
			} else {
				l.Pow(d, R[o.a], s)
			}
		case opSqrt:
			l.Sqrt(d, R[o.a])
		case opExp:
			l.Exp(d, R[o.a])
		case opLog:
			l.Log(d, R[o.a])
		case opSin:
			l.Sin(d, R[o.a], w.work)
		case opCos:
			l.Cos(d, R[o.a], w.work)
		case opTanh:
			l.Tanh(d, R[o.a], w.work)
		case opErf:
			l.Erf(d, R[o.a], w.work)
		case opExpLin:
			l.ExpLinear(d, R[o.a])
		case opPowLin:
			l.PowLinear(d, R[o.a], scalars[o.s])
		case opSquareLin:
			l.SquareLinear(d, R[o.a])
		}
	}
	return R[p.out]
}

// String lists the instructions, one per line, for tests and debugging.
func (p *Program) String() string {
	var b strings.Builder
	fmt.Fprintf(&b, "%d scalar ops, %d jet ops, %d registers\n", len(p.scalars), len(p.code), p.nregs)
	for _, o := range p.code {
		fmt.Fprintf(&b, "r%d = %s", o.dst, o.op)
		if o.a >= 0 {
			fmt.Fprintf(&b, " r%d", o.a)
		}
		if o.b >= 0 {
			fmt.Fprintf(&b, " r%d", o.b)
		}
		if o.s >= 0 {
			fmt.Fprintf(&b, " s%d", o.s)
		}
		if o.c >= 0 {
			fmt.Fprintf(&b, " s%d", o.c)
		}
		if o.op == opPowInt {
			fmt.Fprintf(&b, " %d", o.n)
		}
		b.WriteByte('\n')
	}
	return b.String()
}
