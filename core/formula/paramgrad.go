package formula

import (
	"fmt"
	"math"
	"sync"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/jet"
)

// This file gives formula forms analytic parameter derivatives
// (core.ParamGradient): each ∂V/∂pⱼ is differentiated symbolically from
// the syntax tree once per form and compiled like V itself, so that a fit
// evaluates P programs of order 0 at its points instead of building 2P
// perturbed potentials.

// gradient is the compiled ∂V/∂pⱼ of a form, one entry per parameter: a
// program of r, or (prog nil) an expression of the parameters alone
// (constant nil: zero).
type gradient struct {
	progs    []*Program
	constant []*node
	pools    []sync.Pool // *Workspace per program
}

// grad compiles the parameter derivatives once; nil when one cannot be
// compiled (the form then has no analytic gradient).
func (f *Form) grad() *gradient {
	f.gradOnce.Do(func() {
		g := &gradient{progs: make([]*Program, len(f.info.Params)), constant: make([]*node, len(f.info.Params)), pools: make([]sync.Pool, len(f.info.Params))}
		for j := range f.info.Params {
			d := deriv(f.f.tree, j)
			switch {
			case d == nil:
			case findVar(d) == nil:
				g.constant[j] = d
			default:
				p, _, err := compile(f.f.Text, d, len(f.info.Params))
				if err != nil {
					return
				}
				g.progs[j] = p
			}
		}
		f.gradient = g
	})
	return f.gradient
}

// ParamGradient stores ∂V(r[i])/∂pⱼ in dst[i·P+j] (core.ParamGradient),
// from the symbolic derivatives of the formula compiled like V. A
// separation outside the domain is a *core.PointError wrapping
// core.ErrDomain, as for Taylor, and so is a derivative that is not finite
// there.
func (p *potential) ParamGradient(r, dst []float64) error {
	f := p.form
	np := len(f.info.Params)
	if err := core.CheckParamGradient(f.info.Key, np, r, dst); err != nil {
		return err
	}
	g := f.grad()
	if g == nil {
		return fmt.Errorf("%s: parameter derivatives: %w", f.info.Key, core.ErrUnsupported)
	}
	for i, x := range r {
		if !p.dom.Contains(x) {
			return &core.PointError{Index: i, R: x, Err: core.CheckR(p.dom, x)}
		}
	}
	params := p.scal[:np]
	for j := 0; j < np; j++ {
		if g.progs[j] == nil {
			v := 0.0
			if g.constant[j] != nil {
				v = evalTree(g.constant[j], params)
			}
			for i := range r {
				dst[i*np+j] = v
			}
			continue
		}
		prog := g.progs[j]
		scal, err := prog.Scalars(params)
		if err != nil {
			return fmt.Errorf("%s: ∂V/∂%s: %w: %v", f.info.Key, f.info.Params[j].Name, core.ErrParam, err)
		}
		w, _ := g.pools[j].Get().(*Workspace)
		if w == nil {
			w = &Workspace{}
		}
		for i0 := 0; i0 < len(r); i0 += blockPoints {
			blk := r[i0:min(i0+blockPoints, len(r))]
			c := prog.Eval(w, jet.Layout{Order: 0, Points: len(blk)}, scal, blk)
			for i, v := range c[:len(blk)] {
				dst[(i0+i)*np+j] = v
			}
		}
		g.pools[j].Put(w)
	}
	for k, v := range dst {
		if v-v != 0 {
			i := k / np
			return &core.PointError{Index: i, R: r[i], Err: fmt.Errorf("r = %.10g Å: %w: ∂V/∂%s is %g there", r[i], core.ErrDomain, f.info.Params[k%np].Name, v)}
		}
	}
	return nil
}

// deriv returns the tree of ∂n/∂pⱼ, nil for zero, simplified where an
// operand is zero or one (the compiler folds what remains constant).
func deriv(n *node, j int) *node {
	switch n.kind {
	case kNum, kVar:
		return nil
	case kParam:
		if n.idx == j {
			return num(1, n)
		}
		return nil
	case kNeg:
		return neg(deriv(n.args[0], j), n)
	case kCall:
		a := n.args[0]
		da := deriv(a, j)
		if da == nil {
			return nil
		}
		var outer *node // d fn(a)/da
		switch n.fn {
		case "exp":
			outer = n
		case "log":
			outer = bin(kDiv, num(1, n), a, n)
		case "sqrt":
			outer = bin(kDiv, num(0.5, n), n, n)
		case "sin":
			outer = call("cos", a, n)
		case "cos":
			outer = neg(call("sin", a, n), n)
		case "tanh":
			outer = bin(kSub, num(1, n), bin(kMul, n, n, n), n)
		case "erf":
			outer = bin(kMul, num(2/math.SqrtPi, n), call("exp", neg(bin(kMul, a, a, n), n), n), n)
		default:
			return &node{kind: kNum, val: math.NaN(), pos: n.pos, end: n.end}
		}
		return mul(outer, da, n)
	}
	a, b := n.args[0], n.args[1]
	da, db := deriv(a, j), deriv(b, j)
	switch n.kind {
	case kAdd:
		return add(da, db, n)
	case kSub:
		return sub(da, db, n)
	case kMul:
		return add(mul(da, b, n), mul(a, db, n), n)
	case kDiv:
		// (da·b − a·db)/b² = da/b − (a/b)·db/b
		return sub(div(da, b, n), div(mul(n, db, n), b, n), n)
	case kPow:
		// ∂(aᵇ) = b·a^(b−1)·da + aᵇ·log(a)·db
		var t1, t2 *node
		if da != nil {
			t1 = mul(mul(b, bin(kPow, a, sub(b, num(1, n), n), n), n), da, n)
		}
		if db != nil {
			t2 = mul(mul(n, call("log", a, n), n), db, n)
		}
		return add(t1, t2, n)
	}
	return &node{kind: kNum, val: math.NaN(), pos: n.pos, end: n.end}
}

// The tree builders below treat nil as zero; at marks the source span of
// the new node (for messages).

func num(v float64, at *node) *node { return &node{kind: kNum, val: v, pos: at.pos, end: at.end} }

func isNum(n *node, v float64) bool { return n != nil && n.kind == kNum && n.val == v }

func bin(k kind, a, b, at *node) *node {
	return &node{kind: k, args: []*node{a, b}, pos: at.pos, end: at.end}
}

func call(fn string, a, at *node) *node {
	return &node{kind: kCall, fn: fn, args: []*node{a}, pos: at.pos, end: at.end}
}

func neg(a, at *node) *node {
	if a == nil {
		return nil
	}
	return &node{kind: kNeg, args: []*node{a}, pos: at.pos, end: at.end}
}

func add(a, b, at *node) *node {
	switch {
	case a == nil:
		return b
	case b == nil:
		return a
	}
	return bin(kAdd, a, b, at)
}

func sub(a, b, at *node) *node {
	switch {
	case b == nil:
		return a
	case a == nil:
		return neg(b, at)
	}
	return bin(kSub, a, b, at)
}

func mul(a, b, at *node) *node {
	switch {
	case a == nil || b == nil:
		return nil
	case isNum(a, 1):
		return b
	case isNum(b, 1):
		return a
	}
	return bin(kMul, a, b, at)
}

func div(a, b, at *node) *node {
	if a == nil {
		return nil
	}
	return bin(kDiv, a, b, at)
}
