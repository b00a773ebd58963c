package sdk

import (
	"fmt"
	"math"
	"sync"

	"github.com/pairwell/pairwell/conformance"
	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/jet"
)

// DefaultMaxOrder is the MaxOrder of a Form whose Info leaves it 0: every
// order up to it comes from the jets, exactly up to rounding.
const DefaultMaxOrder = 40

// expMask selects the exponent bits of a float64.
const expMask = 0x7ff0000000000000

// blockPoints is the number of separations a Form evaluates per tape: the
// jets of a block stay in the first-level cache.
const blockPoints = 256

// Form is a complete form written once, as V over jets: write V(r) as a Go
// function of the jet of r (package core/jet), give the metadata, and Form
// does the rest of the contract — parameter and domain checks, orders and
// batching, the normalized Taylor coefficients c_k = V⁽ᵏ⁾/k! of every order
// up to MaxOrder by Taylor-mode automatic differentiation. A Form is a
// core.Model and a core.Matcher; serve it with Serve like any model:
//
//	sdk.Serve("1.0.0", sdk.Form{Meta: info, V: func(t *jet.Tape, r jet.Jet, p []float64) jet.Jet {
//		y := t.Exp(t.Affine(r, -p[1], p[1]*p[2]))  // y = e^{−a(r − re)}
//		return t.Mul(y, t.Affine(y, p[0], -2*p[0])) // De·y(y − 2), Morse
//	}})
//
// Only V is required. Evaluation does not allocate after the first calls
// (tapes are reused per potential), and the potentials are safe for
// concurrent use provided V is (it must depend on its arguments only).
type Form struct {
	// Meta is the metadata, as for any model (see core.ModelInfo), which
	// Info returns. A zero MaxOrder means DefaultMaxOrder. Origin and
	// Version are set by the host.
	Meta core.ModelInfo

	// V returns the jet of V(r) in eV for the jet r of the separations
	// (Å), with t the tape to compute on and p the parameters in the
	// order and default units of Meta.Params. It is called with blocks of
	// up to 256 points, at the order the caller asks for; it must build
	// its result from r, constants and the tape's operations only.
	V func(t *jet.Tape, r jet.Jet, p []float64) jet.Jet

	// Check, optional, rejects parameter sets beyond the constraints of
	// Meta.Params (core.CheckParams runs first), with an error wrapping
	// core.ErrParam or core.ErrNoMinimum.
	Check func(p []float64) error

	// DomainOf, optional, returns the domain of a parameter set: where V is
	// usable, its limit at r → ∞, the closed-form minimum
	// (EquilibriumGuess) and an inner barrier if any. Nil means every
	// r > 0 with V → 0 as r → ∞ and no guess.
	DomainOf func(p []float64) core.Domain

	// IdentitiesOf, optional, returns the published identities of a
	// parameter set, checked by "pairwell check" (see
	// conformance.Identity).
	IdentitiesOf func(p []float64) []conformance.Identity

	// MatchTarget, optional, derives parameters from a target well (see
	// core.Matcher). Nil: Match reports core.ErrUnsupported.
	MatchTarget func(t core.Target) ([]float64, []string, error)
}

// Info returns Meta with the default MaxOrder filled in.
func (f Form) Info() core.ModelInfo {
	info := f.Meta
	if info.MaxOrder == 0 {
		info.MaxOrder = DefaultMaxOrder
	}
	return info
}

// New checks params (core.CheckParams, then Check) and returns the
// potential of the set.
func (f Form) New(params []float64) (core.Potential, error) {
	info := f.Info()
	if f.V == nil {
		return nil, fmt.Errorf("%s: the form has no V", info.Key)
	}
	if err := core.CheckParams(info, params); err != nil {
		return nil, err
	}
	if f.Check != nil {
		if err := f.Check(params); err != nil {
			return nil, fmt.Errorf("%s: %w", info.Key, err)
		}
	}
	p := &formPotential{f: f, key: info.Key, max: info.MaxOrder, params: append([]float64(nil), params...)}
	p.dom = core.Domain{Max: math.Inf(1)}
	if f.DomainOf != nil {
		p.dom = f.DomainOf(p.params)
	}
	if !(p.dom.Min < p.dom.Max) || p.dom.Min < 0 || math.IsNaN(p.dom.Limit) {
		return nil, fmt.Errorf("%s: %w: domain (%g Å, %g Å) with limit %g eV", info.Key, core.ErrParam, p.dom.Min, p.dom.Max, p.dom.Limit)
	}
	return p, nil
}

// Match derives parameters from a target well with MatchTarget, or
// reports core.ErrUnsupported when the form has none.
func (f Form) Match(t core.Target) ([]float64, []string, error) {
	if f.MatchTarget == nil {
		return nil, nil, fmt.Errorf("%s: matching a target well: %w", f.Meta.Key, core.ErrUnsupported)
	}
	return f.MatchTarget(t)
}

// formPotential is the potential of a Form for one parameter set. It is
// immutable apart from its pool of tapes, and safe for concurrent use.
type formPotential struct {
	f      Form
	key    string
	max    int
	params []float64
	dom    core.Domain
	tapes  sync.Pool // *jet.Tape
}

// Domain returns the domain of the parameter set.
func (p *formPotential) Domain() core.Domain { return p.dom }

// MaxOrder returns the form's MaxOrder.
func (p *formPotential) MaxOrder() int { return p.max }

// Identities returns the form's identities for the parameter set, none
// when it declares none.
func (p *formPotential) Identities() []conformance.Identity {
	if p.f.IdentitiesOf == nil {
		return nil
	}
	return p.f.IdentitiesOf(p.params)
}

// Taylor stores c_k(r[i]) = V⁽ᵏ⁾(r[i])/k! at dst[i·(n+1)+k]: the jet of V
// from V at the jet [r, 1, 0, …] of each separation, blocks of up to 256
// points per tape, transposed from the jets' coefficient-major layout into
// the contract's row-major one. A point outside the domain, or one where
// a coefficient is not finite (an overflow, or V undefined there), fails
// with a *core.PointError wrapping core.ErrDomain.
func (p *formPotential) Taylor(n int, r, dst []float64) error {
	if err := core.CheckTaylor(n, p.max, len(r), len(dst)); err != nil {
		return fmt.Errorf("%s: %w", p.key, err)
	}
	if len(r) == 0 {
		return nil
	}
	t, _ := p.tapes.Get().(*jet.Tape)
	if t == nil {
		t = jet.NewTape(n, min(len(r), blockPoints))
	}
	defer p.tapes.Put(t)
	w := n + 1
	for i0 := 0; i0 < len(r); i0 += blockPoints {
		blk := r[i0:min(i0+blockPoints, len(r))]
		np := len(blk)
		t.Reset(n, np)
		c := p.f.V(t, t.Var(blk), p.params).Coeffs()
		// A value is ±Inf or NaN when its exponent bits are all set, that
		// is when e = bits&expMask ^ expMask is 0, and then e − 1 has its
		// top bit set: a branch-free integer test. The domain is checked
		// in the same pass (V at a point outside it is discarded).
		var flag uint64
		bad := false
		for i, x := range blk {
			if !p.dom.Contains(x) {
				bad = true
			}
			row := dst[(i0+i)*w : (i0+i+1)*w]
			for k := range row {
				v := c[k*np+i]
				row[k] = v
				flag |= (math.Float64bits(v)&expMask ^ expMask) - 1
			}
		}
		if bad || flag>>63 != 0 {
			return p.pointError(i0, blk, dst[i0*w:(i0+np)*w], w)
		}
	}
	return nil
}

// pointError returns the error of the first point of the block blk
// (starting at index i0 of the call) that is outside the domain or has a
// coefficient that is not finite; rows holds the block's rows of w values.
func (p *formPotential) pointError(i0 int, blk, rows []float64, w int) error {
	for i, x := range blk {
		if !p.dom.Contains(x) {
			return &core.PointError{Index: i0 + i, R: x, Err: fmt.Errorf("%s: %w", p.key, core.CheckR(p.dom, x))}
		}
		for k, v := range rows[i*w : (i+1)*w] {
			switch {
			case math.IsNaN(v):
				return &core.PointError{Index: i0 + i, R: x, Err: fmt.Errorf("%s: r = %g Å: %w: V is not defined there (c_%d is NaN)", p.key, x, core.ErrDomain, k)}
			case math.IsInf(v, 0):
				return &core.PointError{Index: i0 + i, R: x, Err: fmt.Errorf("%s: %w", p.key, core.OverflowError(x, k))}
			}
		}
	}
	return nil
}
