package conformance

import (
	"errors"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"
	"time"

	"github.com/pairwell/pairwell/core"
)

// Case is one parameter set of a model to check.
type Case struct {
	// Name labels the results (Result.Subject); empty means Label of
	// the instance.
	Name string
	// Instance holds the model, the parameter set and its potential.
	Instance core.Instance
}

// Label returns the spec of an instance in default units, such as
// "morse:De=4.6,a=1.87,re=1.27"; it can be given back to pairwell.
func Label(inst core.Instance) string {
	return label(inst.Model.Info(), inst.Params)
}

func label(info core.ModelInfo, params []float64) string {
	parts := make([]string, len(params))
	for i, v := range params {
		name := fmt.Sprintf("p%d", i+1)
		if i < len(info.Params) {
			name = info.Params[i].Name
		}
		parts[i] = name + "=" + strconv.FormatFloat(v, 'g', -1, 64)
	}
	return info.Key + ":" + strings.Join(parts, ",")
}

// Run checks model m at each parameter set (in the default units of
// m.Info().Params) and returns one Result per check and set. A set that
// m.New rejects gives a failed CheckBuild result and is not checked
// further. Potentials Run creates are closed when they implement
// io.Closer. The error is non-nil only for invalid settings (wrapping
// core.ErrParam); failures of the form are results, not errors.
func Run(m core.Model, params [][]float64, s Settings) (Report, error) {
	s, err := s.resolved()
	if err != nil {
		return Report{}, err
	}
	if m == nil {
		return Report{}, fmt.Errorf("conformance: %w: nil model", core.ErrParam)
	}
	info := m.Info()
	var rep Report
	for _, ps := range params {
		subject := label(info, ps)
		start := time.Now()
		pot, err := m.New(ps)
		if err != nil {
			rep.Results = append(rep.Results, Result{
				Subject: subject, Model: info.Key, Check: CheckBuild, Name: "parameter set accepted by New",
				Error: math.NaN(), Tolerance: math.NaN(), WorstR: math.NaN(),
				Message:  fmt.Sprintf("New rejected the parameter set under test: %v", err),
				Duration: time.Since(start),
			})
			continue
		}
		inst := core.Instance{Model: m, Params: append([]float64(nil), ps...), Potential: pot}
		rep.Results = append(rep.Results, runCase(subject, inst, s)...)
		closePotential(pot)
	}
	return rep, nil
}

// RunCases checks each case's potential and model and returns one Result
// per check and case. The caller keeps ownership of the potentials. The
// error is non-nil only for invalid settings or a case without a model
// or potential (wrapping core.ErrParam).
func RunCases(cases []Case, s Settings) (Report, error) {
	s, err := s.resolved()
	if err != nil {
		return Report{}, err
	}
	for i, c := range cases {
		if c.Instance.Model == nil || c.Instance.Potential == nil {
			return Report{}, fmt.Errorf("conformance: %w: case %d (%q) has no model or potential", core.ErrParam, i+1, c.Name)
		}
	}
	var rep Report
	for _, c := range cases {
		name := c.Name
		if name == "" {
			name = Label(c.Instance)
		}
		rep.Results = append(rep.Results, runCase(name, c.Instance, s)...)
	}
	return rep, nil
}

// RunInstances is RunCases for instances labelled by Label.
func RunInstances(insts []core.Instance, s Settings) (Report, error) {
	cases := make([]Case, len(insts))
	for i, inst := range insts {
		cases[i] = Case{Instance: inst}
	}
	return RunCases(cases, s)
}

// closePotential releases a potential that holds resources (a plugin's).
func closePotential(p core.Potential) {
	if c, ok := p.(io.Closer); ok {
		_ = c.Close()
	}
}

// subject is the state of the checks of one case.
type subject struct {
	name  string
	inst  core.Instance
	info  core.ModelInfo
	p     core.Potential
	dom   core.Domain
	s     Settings
	order int // highest order checked: min(s.MaxOrder, p.MaxOrder())

	re     float64 // minimum from core.Equilibrium; NaN if not found
	reErr  error   // why re is NaN
	centre float64 // re, or the declared equilibrium distance; NaN if none
	from   string  // where the sampled range comes from, for messages

	ev *evaluation
}

func (c *subject) result(check, name string) Result {
	return Result{Subject: c.name, Model: c.info.Key, Check: check, Name: name,
		Error: math.NaN(), Tolerance: math.NaN(), WorstR: math.NaN()}
}

// runCase runs every check on one case.
func runCase(name string, inst core.Instance, s Settings) []Result {
	p := inst.Potential
	c := &subject{name: name, inst: inst, info: inst.Model.Info(), p: p, dom: p.Domain(), s: s}
	c.order = min(s.MaxOrder, p.MaxOrder())
	var out []Result
	timed := func(f func() []Result) {
		start := time.Now()
		rs := f()
		d := time.Since(start) / time.Duration(max(len(rs), 1))
		for i := range rs {
			rs[i].Duration = d
		}
		out = append(out, rs...)
	}
	timed(func() []Result { return []Result{c.checkMaxOrder()} })
	timed(func() []Result {
		c.locate()
		c.ev = c.evaluate()
		return c.checkDerivatives()
	})
	timed(func() []Result { return []Result{c.checkBatch()} })
	timed(func() []Result { return []Result{c.checkDeterminism()} })
	timed(func() []Result { return []Result{c.checkConcurrency()} })
	timed(func() []Result { return []Result{c.checkEquilibrium()} })
	timed(c.checkIdentities)
	timed(func() []Result { return []Result{c.checkInvalidParams()} })
	timed(func() []Result { return []Result{c.checkInvalidR()} })
	timed(func() []Result { return []Result{c.checkInvalidOrder()} })
	timed(func() []Result { return []Result{c.checkAsymptote()} })
	return out
}

// checkMaxOrder checks that the form declares enough analytic orders and
// that the potential agrees with its model's metadata.
func (c *subject) checkMaxOrder() Result {
	r := c.result(CheckMaxOrder, fmt.Sprintf("MaxOrder ≥ %d", RequiredOrder))
	got := c.p.MaxOrder()
	switch {
	case got < RequiredOrder:
		r.Message = fmt.Sprintf("MaxOrder is %d: pairwell's well analysis needs V⁽ⁿ⁾ up to n = %d (c₃, c₄)", got, RequiredOrder)
	case got != c.info.MaxOrder:
		r.Message = fmt.Sprintf("the potential's MaxOrder() = %d differs from ModelInfo.MaxOrder = %d", got, c.info.MaxOrder)
	default:
		r.Passed = true
		r.Message = fmt.Sprintf("MaxOrder %d; orders 1 to %d checked", got, c.order)
	}
	return r
}

// locate finds the minimum with core.Equilibrium and the centre of the
// sampled range: the equilibrium distance the potential declares (an
// EquilibriumR identity, then Domain.EquilibriumGuess), which does not depend on
// the derivatives under test, else the minimum found.
func (c *subject) locate() {
	c.re, c.centre = math.NaN(), math.NaN()
	re, err := core.Equilibrium(c.p)
	switch {
	case err != nil:
		c.reErr = err
	case !c.dom.Contains(re):
		c.reErr = fmt.Errorf("%w: minimum at %g Å outside the domain", core.ErrNoMinimum, re)
	default:
		// Only a proper minimum counts: in an underflowing tail V′ is
		// exactly 0 and the root finder can stop there, where V″ = 0 too
		// (a purely repulsive exponential, or a V′ with the wrong sign).
		k, err := derivative(c.p, 2, re)
		switch {
		case err != nil:
			c.reErr = fmt.Errorf("V″ at the minimum r = %g Å: %w", re, err)
		case !(k > 0) || math.IsInf(k, 1):
			c.reErr = fmt.Errorf("%w: core.Equilibrium stopped at r = %.9g Å, where V″ = %g is not positive", core.ErrNoMinimum, re, k)
		default:
			c.re, c.centre, c.from = re, re, "the minimum"
		}
	}
	if v, ok := c.declaredRe(); ok {
		c.centre, c.from = v, "the declared equilibrium distance"
	}
}

// declaredRe returns the equilibrium distance the potential declares.
func (c *subject) declaredRe() (float64, bool) {
	if id, ok := c.p.(Identifier); ok {
		for _, x := range id.Identities() {
			if x.Quantity == EquilibriumR && c.dom.Contains(x.Value) {
				return x.Value, true
			}
		}
	}
	if v := c.dom.EquilibriumGuess; v != 0 && c.dom.Contains(v) {
		return v, true
	}
	return 0, false
}

// declaresMinimum reports whether the potential says it has a minimum.
func (c *subject) declaresMinimum() bool {
	_, ok := c.declaredRe()
	return ok || c.dom.Barrier
}

// sampleRange returns the separations, in Å, over which derivatives are
// sampled, and a description of where it comes from.
func (c *subject) sampleRange() (lo, hi float64, how string) {
	s := c.s
	switch {
	case s.RMin != 0:
		lo, hi, how = s.RMin, s.RMax, "the range set in Settings"
	case !math.IsNaN(c.centre):
		lo, hi = s.RangeLo*c.centre, s.RangeHi*c.centre
		how = fmt.Sprintf("%g·re to %g·re, re = %.6g Å from %s", s.RangeLo, s.RangeHi, c.centre, c.from)
	default:
		lo, hi, how = DefaultFallbackMin, DefaultFallbackMax, "the fallback range for a form without a minimum"
	}
	d := c.dom
	if d.Min > 0 {
		ref := hi
		if !math.IsNaN(c.centre) {
			ref = c.centre
		}
		lo = math.Max(lo, d.Min+0.05*(ref-d.Min))
	}
	if !math.IsInf(d.Max, 1) {
		hi = math.Min(hi, d.Max-0.05*(d.Max-lo))
	}
	if !(lo < hi) || !d.Contains(lo) || !d.Contains(hi) {
		// A domain too narrow for the range: use its interior.
		a, b := math.Max(d.Min, 0), d.Max
		if math.IsInf(b, 1) {
			b = a + 10
		}
		lo, hi = a+0.05*(b-a), a+0.95*(b-a)
		how += " (clipped into the domain)"
	}
	return lo, hi, how
}

// errString formats an error on one line.
func errString(err error) string {
	return strings.Join(strings.Fields(err.Error()), " ")
}

// isAny reports whether err wraps one of targets.
func isAny(err error, targets ...error) bool {
	for _, t := range targets {
		if errors.Is(err, t) {
			return true
		}
	}
	return false
}
