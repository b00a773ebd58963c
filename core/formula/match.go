package formula

import (
	"errors"
	"fmt"
	"math"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/fit"
	"github.com/pairwell/pairwell/core/jet"
)

// Match derives a parameter set whose well has the target's re, depth and
// force constant (core.Matcher), numerically, since a formula has no
// closed-form match: it solves the well conditions at r = re
//
//	V′(re)·re/E = 0,  (V(∞) − V(re))/Depth − 1 = 0,  V″(re)/K − 1 = 0,
//
// (E = Depth, or K·re² without a depth; the depth condition only for a
// form with a dissociation limit and a target depth; the curvature only
// for a target K; with fewer parameters than conditions the curvature,
// then the depth, is given up and the note says by how much it misses) by least squares in the parameters (fit.Minimize;
// logarithms for constrained ones), from dimensional starts: a parameter
// of dimension energyᵉ·lengthˡ starts at Depthᵉ·reˡ (K·re² standing in
// for an energy without a depth), a dimensionless one at 1, then at the
// variations of matchStarts. With more parameters than conditions the
// problem is padded with zero residuals: the engine's damped steps, from
// the singular value decomposition of the Jacobian, then move only within
// the span the conditions constrain, which picks one set of the family
// near the start. The first start whose solution meets every condition to
// matchTol and whose well's minimum is re (core.Equilibrium, to 1e-6
// relative) wins. Notes say what was not honoured. Re must be given
// (> 0); a target none of the starts reaches is an error wrapping
// core.ErrParam.
func (f *Form) Match(t core.Target) ([]float64, []string, error) {
	key := f.info.Key
	if !(t.Re > 0) || t.Depth < 0 || t.K < 0 || math.IsInf(t.Re+t.Depth+t.K, 0) {
		return nil, nil, fmt.Errorf("%s: %w: matching needs re > 0 and, when given, depth and k > 0 (got re = %g Å, depth = %g eV, k = %g eV/Å²)", key, core.ErrParam, t.Re, t.Depth, t.K)
	}
	var notes []string
	depth := t.Depth > 0 && !f.noLimit
	if t.Depth > 0 && f.noLimit {
		notes = append(notes, "the form has no dissociation limit: the depth is not matched")
	}
	escale := t.Depth
	if !(escale > 0) {
		escale = t.K * t.Re * t.Re
	}
	if !(escale > 0) {
		return nil, nil, fmt.Errorf("%s: %w: matching needs a depth or a force constant besides re", key, core.ErrParam)
	}
	np := len(f.info.Params)
	useK := t.K > 0
	// With fewer parameters than conditions, k and then the depth are
	// given up (and noted), as the built-in Lennard-Jones match does.
	conds := 1
	if depth {
		conds++
	}
	if useK {
		conds++
	}
	droppedK := conds > np && useK
	if droppedK {
		useK, conds = false, conds-1
	}
	droppedDepth := conds > np && depth
	if droppedDepth {
		depth, conds = false, conds-1
	}
	nres := max(conds, np) // rows beyond the conditions stay zero
	logp := make([]bool, np)
	for j, q := range f.info.Params {
		logp[j] = q.Constraint == core.Positive || q.Constraint == core.NonNegative
	}
	params := func(theta []float64) []float64 {
		out := make([]float64, np)
		for j, v := range theta {
			out[j] = v
			if logp[j] {
				out[j] = math.Exp(v)
			}
		}
		return out
	}
	w := f.f.prog.NewWorkspace(jet.Layout{Order: 2, Points: 1})
	var lastErr error
	for _, st := range matchStarts {
		theta0 := make([]float64, np)
		dimless := 0
		for j, q := range f.info.Params {
			e, l, _, _, _ := q.Dimension.Exponents()
			v := math.Pow(escale, float64(e)) * math.Pow(t.Re, float64(l))
			if e == 0 && l == 0 {
				v = st.dimensionless[dimless%len(st.dimensionless)]
				dimless++
			} else if l < 0 {
				v *= math.Pow(st.scale, float64(-l))
			}
			theta0[j] = v
			if logp[j] {
				theta0[j] = math.Log(v)
			}
		}
		res := func(theta, dst []float64) error {
			p := params(theta)
			if err := core.CheckParams(f.info, p); err != nil {
				return fmt.Errorf("%w: %w", fit.ErrInfeasible, err)
			}
			c, lim, err := f.wellAt(w, p, t.Re, depth)
			if err != nil {
				return fmt.Errorf("%w: %w", fit.ErrInfeasible, err)
			}
			k := 0
			dst[k] = c[1] * t.Re / escale
			k++
			if depth {
				dst[k] = (lim-c[0])/t.Depth - 1
				k++
			}
			if useK {
				dst[k] = 2*c[2]/t.K - 1
				k++
			}
			clear(dst[k:])
			return nil
		}
		lm, err := fit.Minimize(fit.Problem{N: nres, P: np, Residuals: res}, theta0, fit.LMSettings{MaxIter: 100})
		if err != nil {
			lastErr = err
			continue
		}
		r := make([]float64, nres)
		if err := res(lm.Theta, r); err != nil {
			lastErr = err
			continue
		}
		worst := 0.0
		for _, v := range r[:conds] {
			worst = math.Max(worst, math.Abs(v))
		}
		p := params(lm.Theta)
		pot, err := f.New(p)
		if err != nil {
			lastErr = err
			continue
		}
		re, err := core.Equilibrium(pot)
		if err != nil || math.Abs(re-t.Re) > 1e-6*t.Re {
			lastErr = fmt.Errorf("the solution's minimum is not at re (%v)", err)
			continue
		}
		if worst > matchTol {
			lastErr = fmt.Errorf("the well conditions are met only to %.2g", worst)
			continue
		}
		if droppedK || droppedDepth {
			c, lim, err := f.wellAt(w, p, t.Re, !f.noLimit)
			if err == nil && droppedDepth && t.Depth > 0 {
				notes = append(notes, fmt.Sprintf("depth not honoured: with %d parameters the form's depth at this re is %.6g eV (%+.3g%% from the target %g eV)", np, lim-c[0], 100*((lim-c[0])/t.Depth-1), t.Depth))
			}
			if err == nil && droppedK {
				notes = append(notes, fmt.Sprintf("k not honoured: with %d parameters the form's V″(re) is %.6g eV/Å² (%+.3g%% from the target %g eV/Å²)", np, 2*c[2], 100*(2*c[2]/t.K-1), t.K))
			}
		}
		return p, notes, nil
	}
	return nil, nil, fmt.Errorf("%s: %w: no parameter set found whose well has re = %g Å, depth = %g eV, k = %g eV/Å² (last attempt: %v)", key, core.ErrParam, t.Re, t.Depth, t.K, lastErr)
}

// matchTol is the largest relative mismatch of a well condition that
// Match accepts as solved.
const matchTol = 1e-9

// matchStarts are the dimensional starts of Match in order: scale
// multiplies the start of a parameter with an inverse length in its
// dimension (a range parameter a ∝ 1/re starts at scale/re, one in 1/Å²
// at scale²/re²), and the dimensionless parameters take the values in
// turn.
var matchStarts = []struct {
	scale         float64
	dimensionless []float64
}{
	{1, []float64{1}},
	{2, []float64{1}},
	{1, []float64{12, 6, 4, 2}},
	{2, []float64{12, 6, 4, 2}},
	{0.5, []float64{1}},
	{4, []float64{6, 12, 2, 4}},
	{0.25, []float64{2, 1, 0.5}},
}

// wellAt returns c₀, c₁, c₂ of the potential of params at r and, with
// limit, V(∞) (declared or found numerically), without the barrier search
// of New; w is the workspace of the evaluation at r.
func (f *Form) wellAt(w *Workspace, params []float64, r float64, limit bool) ([3]float64, float64, error) {
	var c [3]float64
	p, err := f.base(params)
	if err != nil {
		return c, 0, err
	}
	if !p.dom.Contains(r) {
		return c, 0, core.CheckR(p.dom, r)
	}
	v := f.f.prog.Eval(w, jet.Layout{Order: 2, Points: 1}, p.scal, []float64{r})
	c = [3]float64{v[0], v[1], v[2]}
	if c[0]-c[0] != 0 || c[1]-c[1] != 0 || c[2]-c[2] != 0 {
		return c, 0, fmt.Errorf("%w: the formula is not finite at r = %g Å", core.ErrDomain, r)
	}
	if !limit {
		return c, 0, nil
	}
	if f.limit != nil {
		v, err := f.limit.Eval(params)
		if err != nil {
			return c, 0, fmt.Errorf("%w: limit: %v", core.ErrParam, err)
		}
		return c, v, nil
	}
	lim, ok, err := p.limit()
	switch {
	case err != nil:
		return c, 0, err
	case !ok || math.IsInf(lim, 0):
		return c, 0, errors.New("no finite dissociation limit for this parameter set")
	}
	return c, lim, nil
}
