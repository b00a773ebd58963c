package conformance

import (
	"fmt"
	"math"

	"github.com/pairwell/pairwell/core"
)

// checkEquilibrium checks V′(re) = 0 and V″(re) > 0 at the minimum that
// core.Equilibrium finds. |V′(re)|/(V″(re)·re) is the relative shift of
// re that the residual V′ implies; it must not exceed
// EquilibriumTolerance. A form with no minimum that declares none (no
// EquilibriumR identity, no Domain.EquilibriumGuess, no barrier) is skipped.
func (c *subject) checkEquilibrium() Result {
	r := c.result(CheckEquilibrium, "V′(re) = 0, V″(re) > 0")
	r.Tolerance = c.s.EquilibriumTolerance
	if math.IsNaN(c.re) {
		if !c.declaresMinimum() {
			r.Passed, r.Skipped = true, true
			r.Message = fmt.Sprintf("no minimum in the domain (%s) and none declared: not applicable", errString(c.reErr))
			return r
		}
		r.WorstR = c.centre
		r.Message = fmt.Sprintf("the potential declares a minimum (near r = %.9g Å) but V′ has no − to + sign change there: %s",
			c.centre, errString(c.reErr))
		return r
	}
	var d [3]float64
	r.WorstR = c.re
	if err := c.p.Taylor(2, []float64{c.re}, d[:]); err != nil {
		r.Message = fmt.Sprintf("Taylor at re = %.9g Å: %s", c.re, errString(err))
		return r
	}
	d[2] *= 2 // V″ = 2c₂
	r.Error = math.Abs(d[1]) / (math.Abs(d[2]) * c.re)
	if d[1] == 0 {
		r.Error = 0
	}
	switch {
	case !(d[2] > 0):
		r.Message = fmt.Sprintf("at re = %.12g Å V″ = %.6g eV/Å² is not positive: not a minimum", c.re, d[2])
	case !(r.Error <= r.Tolerance):
		r.Message = fmt.Sprintf("at re = %.12g Å V′ = %.6g eV/Å, V″ = %.6g eV/Å²: |V′|/(V″·re) = %.3g > %.3g",
			c.re, d[1], d[2], r.Error, r.Tolerance)
	default:
		r.Passed = true
		r.Message = fmt.Sprintf("re = %.12g Å, V(re) = %.10g eV, V′(re) = %.3g eV/Å, V″(re) = %.10g eV/Å²", c.re, d[0], d[1], d[2])
	}
	if v, ok := c.declaredRe(); ok && math.Abs(v-c.re) > 1e-6*v {
		r.Message += fmt.Sprintf(" (the potential declares re = %.12g Å)", v)
	}
	return r
}

// checkIdentities checks each identity the potential declares. The
// relative error is |got − want|/(|want| + K·reⁿ⁻²·…): for V⁽ⁿ⁾ at the
// minimum the scale is |want| + |V″(re)|·re^(2−n), for energies
// |want| + |V″(re)|·re², so that identities whose value is 0 (V‴ of the
// harmonic form) are measured against the well's natural magnitude; for
// re it is |want|.
func (c *subject) checkIdentities() []Result {
	id, ok := c.p.(Identifier)
	if !ok {
		r := c.result(CheckIdentity, "declared identities")
		r.Passed, r.Skipped = true, true
		r.Message = "the potential declares no identities (conformance.Identifier)"
		return []Result{r}
	}
	ids := id.Identities()
	if len(ids) == 0 {
		r := c.result(CheckIdentity, "declared identities")
		r.Passed, r.Skipped = true, true
		r.Message = "the potential declares an empty list of identities"
		return []Result{r}
	}
	k := math.NaN()
	if re := c.re; !math.IsNaN(re) || !math.IsNaN(c.centre) {
		if math.IsNaN(re) {
			re = c.centre
		}
		if v, err := derivative(c.p, 2, re); err == nil {
			k = math.Abs(v)
		}
	}
	out := make([]Result, 0, len(ids))
	for _, x := range ids {
		out = append(out, c.checkIdentity(x, k))
	}
	return out
}

func (c *subject) checkIdentity(x Identity, k float64) Result {
	r := c.result(CheckIdentity, "identity "+x.Name)
	r.Source, r.Tolerance = x.Source, c.s.IdentityTolerance
	// Without a minimum, quantities at the minimum are taken at the
	// declared equilibrium distance, so that a fault in V′ alone does not
	// fail every identity.
	re, at := c.re, ""
	if math.IsNaN(re) && x.Quantity != ValueAt {
		if x.Quantity == EquilibriumR || math.IsNaN(c.centre) {
			r.Message = fmt.Sprintf("%s: no minimum found: %s", x.Name, errString(c.reErr))
			return r
		}
		re, at = c.centre, fmt.Sprintf(" at the declared re = %.9g Å (no minimum found)", c.centre)
	}
	var (
		got, scale float64
		what       string
		err        error
	)
	switch x.Quantity {
	case EquilibriumR:
		got, scale, what, r.WorstR = re, math.Abs(x.Value), "re", re
	case MinimumEnergy:
		got, err = derivative(c.p, 0, re)
		scale, what, r.WorstR = math.Abs(x.Value)+k*re*re, "V(re)", re
	case DerivativeAtMinimum:
		if x.Order < 0 || x.Order > c.p.MaxOrder() {
			r.Message = fmt.Sprintf("%s: order %d outside 0 to MaxOrder %d", x.Name, x.Order, c.p.MaxOrder())
			return r
		}
		r.Order = x.Order
		got, err = derivative(c.p, x.Order, re)
		scale = math.Abs(x.Value) + k*math.Pow(re, float64(2-x.Order))
		what, r.WorstR = vname(x.Order)+"(re)", re
	case ValueAt:
		got, err = derivative(c.p, 0, x.R)
		scale = math.Abs(x.Value)
		if !math.IsNaN(k) {
			scale += k * c.re * c.re
		}
		what, r.WorstR = fmt.Sprintf("V(%.9g Å)", x.R), x.R
	default:
		r.Message = fmt.Sprintf("%s: unknown quantity %d", x.Name, x.Quantity)
		return r
	}
	if err != nil {
		r.Message = fmt.Sprintf("%s: evaluating %s: %s", x.Name, what, errString(err))
		return r
	}
	diff := math.Abs(got - x.Value)
	switch {
	case diff == 0:
		r.Error = 0
	case scale > 0:
		r.Error = diff / scale
	default:
		r.Error = math.Inf(1)
	}
	if math.IsNaN(r.Error) {
		r.Error = math.Inf(1)
	}
	r.Passed = r.Error <= r.Tolerance
	verdict := "holds"
	if !r.Passed {
		verdict = fmt.Sprintf("fails: relative error %.3g > tolerance %.3g", r.Error, r.Tolerance)
	}
	r.Message = fmt.Sprintf("%s: expected %.15g, got %s = %.15g%s; %s", x.Name, x.Value, what, got, at, verdict)
	if x.Source != "" {
		r.Message += " (source: " + x.Source + ")"
	}
	return r
}

// derivative returns V⁽ⁿ⁾(r) by one Taylor call (core.Derivative).
func derivative(p core.Potential, n int, r float64) (float64, error) {
	return core.Derivative(p, n, r)
}

// checkAsymptote checks the declared dissociation limit: for a finite
// Domain.Limit, |V(f·re) − Limit| ≤ AsymptoteTolerance·depth at
// f = AsymptoteFactor (10⁶ by default: a 1/r tail of coefficient C passes
// only if C/(re·depth) ≤ 1e-6, which Kratzer's 2De·re does not), where depth = Limit − V(re); the message also gives the
// deviation at 50·re. For Limit = +Inf, V must grow along 50·re, 10³·re,
// f·re. The point is kept inside a finite Domain.Max. Without a minimum,
// re is the declared equilibrium distance or the top of the sampled range,
// and the depth is the largest |V − Limit| over the sampled points.
//
// A form that declares a slow tail (Domain.TailPower = p > 0, e.g. the
// Coulomb-like 1/r tail of the Kratzer form) is checked on its tail
// instead (checkTail): no fixed far point shows such a limit to 1e-6.
func (c *subject) checkAsymptote() Result {
	lim := c.dom.Limit
	r := c.result(CheckAsymptote, "V → Domain.Limit")
	ref := c.centre
	if math.IsNaN(ref) {
		ref = c.ev.hi
	}
	clip := func(x float64) float64 {
		if x >= c.dom.Max {
			return c.dom.Max - 1e-9*(c.dom.Max-c.dom.Min)
		}
		return x
	}
	far := clip(c.s.AsymptoteFactor * ref)
	near := clip(50 * ref)
	vs := make([]float64, 3)
	xs := []float64{near, clip(1e3 * ref), far}
	if err := c.p.Taylor(0, xs, vs); err != nil {
		r.Message = fmt.Sprintf("evaluating V at %g, %g and %g Å: %s", xs[0], xs[1], xs[2], errString(err))
		return r
	}
	r.WorstR = far
	switch {
	case math.IsNaN(lim):
		r.Message = "Domain.Limit is NaN; it must be the limit of V as r → ∞ (+Inf for unbounded forms)"
		return r
	case math.IsInf(lim, 0):
		grows := (lim > 0 && vs[0] < vs[1] && vs[1] < vs[2]) || (lim < 0 && vs[0] > vs[1] && vs[1] > vs[2])
		r.Passed = grows
		r.Message = fmt.Sprintf("Limit %g: V(%.4g Å) = %.6g, V(%.4g Å) = %.6g, V(%.4g Å) = %.6g eV", lim, xs[0], vs[0], xs[1], vs[1], xs[2], vs[2])
		if !grows {
			r.Message += ": V does not grow towards the declared limit"
		}
		return r
	}
	if c.dom.TailPower > 0 {
		return c.checkTail(r, ref, clip)
	}
	depth := c.depth()
	how := "the well depth Limit − V(re)"
	if !(lim-c.vre() > 0) {
		how = "the largest |V − Limit| over the sampled points"
	}
	r.Tolerance = c.s.AsymptoteTolerance
	dev := math.Abs(vs[2] - lim)
	r.Error = dev / depth
	if dev == 0 {
		r.Error = 0
	}
	if math.IsNaN(r.Error) {
		r.Error = math.Inf(1)
	}
	r.Passed = r.Error <= r.Tolerance
	r.Message = fmt.Sprintf("|V − Limit|/depth = %.3g at r = %.4g Å (%g·re), %.3g at %.4g Å (50·re); Limit %g eV, depth %.6g eV (%s)",
		r.Error, far, c.s.AsymptoteFactor, math.Abs(vs[0]-lim)/depth, near, lim, depth, how)
	if !r.Passed {
		r.Message = "V does not approach the declared limit: " + r.Message
	}
	return r
}

// vre returns V(re), NaN without a minimum or when it cannot be evaluated.
func (c *subject) vre() float64 {
	if math.IsNaN(c.re) {
		return math.NaN()
	}
	v, err := derivative(c.p, 0, c.re)
	if err != nil {
		return math.NaN()
	}
	return v
}

// depth is the scale of the asymptote checks: the well depth Limit − V(re),
// or without a well the largest |V − Limit| over the sampled points.
func (c *subject) depth() float64 {
	lim := c.dom.Limit
	if d := lim - c.vre(); d > 0 {
		return d
	}
	depth := 0.0
	if c.ev.vals[0] != nil {
		for _, v := range c.ev.vals[0] {
			depth = math.Max(depth, math.Abs(v-lim))
		}
	}
	return depth
}

// checkTail checks a declared slow tail V − Limit ≈ C·r^−p (p =
// Domain.TailPower): the tail amplitude A(R) = (V(R) − Limit)·(R/re)^p must
// be the same at R₁ = f·re and R₂ = 10·f·re (f = AsymptoteFactor) to
// AsymptoteTolerance relative to |A(R₂)|. A wrong Limit makes A grow as
// R^p and a wrong power makes it change by 10^(p−q) between the points, so
// both fail; a V that equals Limit at both points passes. The amplitude of
// a tail with corrections of relative size b·re/R drifts by about b·re/R₁
// (Kratzer: 4.5e-7 at the default factor 10⁶).
func (c *subject) checkTail(r Result, ref float64, clip func(float64) float64) Result {
	lim, p := c.dom.Limit, c.dom.TailPower
	xs := []float64{clip(c.s.AsymptoteFactor * ref), clip(10 * c.s.AsymptoteFactor * ref)}
	r.Name = fmt.Sprintf("V → Domain.Limit as r^-%g (declared tail)", p)
	r.WorstR = xs[1]
	r.Tolerance = c.s.AsymptoteTolerance
	if xs[0] >= xs[1] {
		r.Message = fmt.Sprintf("the domain ends at %g Å, below %g·re: a declared tail cannot be checked", c.dom.Max, 10*c.s.AsymptoteFactor)
		return r
	}
	vs := make([]float64, 2)
	if err := c.p.Taylor(0, xs, vs); err != nil {
		r.Message = fmt.Sprintf("evaluating V at %g and %g Å: %s", xs[0], xs[1], errString(err))
		return r
	}
	a1 := (vs[0] - lim) * math.Pow(xs[0]/ref, p)
	a2 := (vs[1] - lim) * math.Pow(xs[1]/ref, p)
	switch {
	case a1 == a2:
		r.Error = 0
	default:
		r.Error = math.Abs(a1-a2) / math.Abs(a2)
	}
	if math.IsNaN(r.Error) {
		r.Error = math.Inf(1)
	}
	r.Passed = r.Error <= r.Tolerance
	r.Message = fmt.Sprintf("tail amplitude (V − Limit)·(r/re)^%g = %.9g eV at %.4g Å, %.9g eV at %.4g Å: relative change %.3g; Limit %g eV, depth %.6g eV",
		p, a1, xs[0], a2, xs[1], r.Error, lim, c.depth())
	if !r.Passed {
		r.Message = "V does not approach the declared limit as the declared power of r: " + r.Message
	}
	return r
}
