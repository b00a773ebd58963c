// Package cutoff wraps a pair potential in the cutoff schemes of
// force-field practice, and measures what a cutoff changes (Analyze) and
// what it leaves out (the long-range tail corrections, Tail).
//
// With V the bare potential, r_c the cutoff and r_on the start of a
// switching region, the schemes are, for r < r_c:
//
//	Truncate    V(r)
//	Shift       V(r) − V(r_c)
//	ForceShift  V(r) − V(r_c) − (r − r_c)·V′(r_c)
//	Switch1     S(r)·V(r),  S = 1 − (3x² − 2x³)          (cubic smoothstep, C¹)
//	Switch2     S(r)·V(r),  S = 1 − (10x³ − 15x⁴ + 6x⁵)  (quintic smoothstep, C²)
//
// and 0 for every r ≥ r_c, where x = (r − r_on)/(r_c − r_on), S = 1 for
// r ≤ r_on. The smoothstep polynomials are common practice: the cubic has
// S′ = 0 at both ends of the switching region, the quintic also S″ = 0, so
// that S·V is C¹ respectively C² at r_on and r_c. At r_c itself (and at
// r_on for the switches) the coefficients are those of the side r ≥ r_c
// (r > r_on): one-sided derivatives of the outer piece.
//
// A wrapped potential implements the contract of core exactly: its Taylor
// coefficients c_k(r) = V_cut⁽ᵏ⁾(r)/k! are those of the bare potential
// adjusted at orders 0 and 1 (the shifts), or the Cauchy product of the
// jets of S and V (the switches, see package jet), or zero beyond r_c.
// Units: Å and eV.
package cutoff

import (
	"errors"
	"fmt"
	"math"
	"strconv"
	"strings"
	"sync"

	"github.com/pairwell/pairwell/conformance"
	"github.com/pairwell/pairwell/core"
)

// Scheme is a cutoff scheme. The zero value is Truncate.
type Scheme int

const (
	// Truncate is plain truncation: V for r < r_c, 0 beyond. Energy and
	// force jump at r_c.
	Truncate Scheme = iota
	// Shift is the energy shift V − V(r_c): the energy is continuous at
	// r_c, the force still jumps.
	Shift
	// ForceShift is the force shift V − V(r_c) − (r − r_c)V′(r_c):
	// energy and force are continuous at r_c, V″ jumps.
	ForceShift
	// Switch1 multiplies V by the cubic switch S = 1 − (3x² − 2x³)
	// between r_on and r_c: C¹ (V″ jumps at r_on and r_c).
	Switch1
	// Switch2 multiplies V by the quintic switch
	// S = 1 − (10x³ − 15x⁴ + 6x⁵) between r_on and r_c: C² (V‴ jumps).
	Switch2
)

// Schemes lists every scheme, in the order of the constants.
func Schemes() []Scheme { return []Scheme{Truncate, Shift, ForceShift, Switch1, Switch2} }

// schemeNames are the names of the schemes in specs and reports.
var schemeNames = [...]string{
	Truncate:   "truncate",
	Shift:      "shift",
	ForceShift: "force-shift",
	Switch1:    "switch-c1",
	Switch2:    "switch-c2",
}

// String returns the scheme's name as written in a spec: truncate, shift,
// force-shift, switch-c1, switch-c2.
func (s Scheme) String() string {
	if s < 0 || int(s) >= len(schemeNames) {
		return "scheme(" + strconv.Itoa(int(s)) + ")"
	}
	return schemeNames[s]
}

// Switching reports whether s is one of the switches (it has an r_on).
func (s Scheme) Switching() bool { return s == Switch1 || s == Switch2 }

// Formula describes the cut form in words and symbols.
func (s Scheme) Formula() string {
	switch s {
	case Truncate:
		return "V(r) for r < rc, 0 beyond"
	case Shift:
		return "V(r) − V(rc) for r < rc, 0 beyond"
	case ForceShift:
		return "V(r) − V(rc) − (r − rc)V′(rc) for r < rc, 0 beyond"
	case Switch1:
		return "S(r)V(r), S = 1 for r ≤ on, 1 − (3x² − 2x³) with x = (r − on)/(rc − on) up to rc, 0 beyond"
	case Switch2:
		return "S(r)V(r), S = 1 for r ≤ on, 1 − (10x³ − 15x⁴ + 6x⁵) with x = (r − on)/(rc − on) up to rc, 0 beyond"
	}
	return s.String()
}

// ParseScheme reads a scheme name (ignoring case).
func ParseScheme(name string) (Scheme, error) {
	for _, s := range Schemes() {
		if strings.EqualFold(strings.TrimSpace(name), s.String()) {
			return s, nil
		}
	}
	return 0, fmt.Errorf("%w: unknown cutoff scheme %q; schemes: %s", ErrSettings, name, strings.Join(schemeNames[:], ", "))
}

// DefaultSwitchOnFraction is r_on/r_c when Settings.SwitchOn is zero: the
// switching region is the outer tenth of the range (our choice, within
// common practice).
const DefaultSwitchOnFraction = 0.9

// Settings describe a cut form.
type Settings struct {
	// Scheme; the zero value is Truncate.
	Scheme Scheme
	// Cutoff is r_c in Å. It must be finite, positive, inside the bare
	// form's domain and beyond its minimum; zero is an error.
	Cutoff float64
	// SwitchOn is r_on in Å, the start of the switching region of
	// Switch1 and Switch2, in (domain minimum, r_c); zero means
	// DefaultSwitchOnFraction·r_c. It must be zero for the other schemes.
	SwitchOn float64
}

// ErrSettings means the settings of a cutoff are invalid. It is returned
// wrapped together with core.ErrParam.
var ErrSettings = errors.New("invalid cutoff")

// resolved returns s with the default r_on filled in, after the checks that
// do not need the potential.
func (s Settings) resolved() (Settings, error) {
	bad := func(format string, args ...any) (Settings, error) {
		return Settings{}, fmt.Errorf("%w: %w: "+format, append([]any{core.ErrParam, ErrSettings}, args...)...)
	}
	if s.Scheme < 0 || int(s.Scheme) >= len(schemeNames) {
		return bad("unknown scheme %d", int(s.Scheme))
	}
	if !(s.Cutoff > 0) || math.IsInf(s.Cutoff, 0) {
		return bad("r_c = %g Å: must be a finite length > 0", s.Cutoff)
	}
	if !s.Scheme.Switching() {
		if s.SwitchOn != 0 {
			return bad("r_on = %g Å: only the switches (switch-c1, switch-c2) have a switching region, %s has none", s.SwitchOn, s.Scheme)
		}
		return s, nil
	}
	if s.SwitchOn == 0 {
		s.SwitchOn = DefaultSwitchOnFraction * s.Cutoff
	}
	if !(s.SwitchOn > 0) || math.IsInf(s.SwitchOn, 0) {
		return bad("r_on = %g Å: must be a finite length > 0", s.SwitchOn)
	}
	if s.SwitchOn >= s.Cutoff {
		return bad("r_on = %g Å ≥ r_c = %g Å: the switching region must start before the cutoff", s.SwitchOn, s.Cutoff)
	}
	return s, nil
}

// Suffix returns the cutoff as written after '@' in a spec, e.g.
// "cut=force-shift,rc=8" or "cut=switch-c2,on=7,rc=8" (lengths in Å).
func (s Settings) Suffix() string {
	g := func(v float64) string { return strconv.FormatFloat(v, 'g', -1, 64) }
	out := "cut=" + s.Scheme.String()
	if s.Scheme.Switching() && s.SwitchOn != 0 {
		out += ",on=" + g(s.SwitchOn)
	}
	return out + ",rc=" + g(s.Cutoff)
}

// Model is a model whose potentials are cut by one cutoff: a form, like
// the bare one, for every command. Its parameters are those of the bare
// model.
//
// Capabilities: Exampler (conformance) is forwarded. Matcher is
// deliberately not implemented: the analytic match of the bare form puts
// the bare well at the target, not the cut one (a shift moves the depth
// by V(r_c), a force shift also re and k), so forwarding it would return
// parameters that miss the target without saying so. Commands then treat
// the cut form as one without a match (fit needs a start). Nor is
// core.SetEvaluator: the bare model's batched evaluation of many sets would
// skip the checks each set's cut needs (r_c beyond that set's minimum, a
// minimum left), which only New makes; core.EvaluateSets falls back to New
// and Taylor per set, which makes them.
type Model struct {
	inner core.Model
	s     Settings
}

// Wrap returns m cut by s. The settings are checked here as far as they do
// not depend on the parameters; Model.New checks the rest (r_c beyond the
// minimum, inside the domain). Errors wrap core.ErrParam and ErrSettings.
func Wrap(m core.Model, s Settings) (*Model, error) {
	rs, err := s.resolved()
	if err != nil {
		return nil, fmt.Errorf("%s: %w", m.Info().Key, err)
	}
	return &Model{inner: m, s: rs}, nil
}

// Inner returns the bare model.
func (m *Model) Inner() core.Model { return m.inner }

// Settings returns the cutoff, with the default r_on filled in.
func (m *Model) Settings() Settings { return m.s }

// Info returns the bare model's metadata with the cutoff in the key
// (KEY@cut=SCHEME,…,rc=R), the name, the formula and the notes.
func (m *Model) Info() core.ModelInfo {
	i := m.inner.Info()
	i.Params = append([]core.Param(nil), i.Params...)
	i.Aliases = nil
	i.Key += "@" + m.s.Suffix()
	i.Name += ", " + m.s.Scheme.String() + " at rc = " + strconv.FormatFloat(m.s.Cutoff, 'g', -1, 64) + " Å"
	i.Formula = m.s.Scheme.Formula() + "; bare V: " + i.Formula
	i.Domain = "as the bare form; V = 0 for r ≥ rc"
	note := "Cut form (" + m.s.Scheme.String() + "): V, V′, … are those of the bare form changed as the formula says; beyond rc everything is 0."
	if i.Notes != "" {
		note += " Bare form: " + i.Notes
	}
	i.Notes = note
	return i
}

// New builds the bare potential for params and cuts it.
func (m *Model) New(params []float64) (core.Potential, error) {
	p, err := m.inner.New(params)
	if err != nil {
		return nil, err
	}
	c, err := New(p, m.s)
	if err != nil {
		return nil, fmt.Errorf("%s: %w", m.inner.Info().Key, err)
	}
	return c, nil
}

// Example forwards conformance.Representative of the bare model (its
// Example, or the built-in illustrative set); nil when it has none.
func (m *Model) Example() []float64 {
	ps, _ := conformance.Representative(m.inner)
	return ps
}

// Potential is a cut potential. It is immutable and safe for concurrent
// use. Beyond r_c its coefficients are zero; each Taylor call makes one
// Taylor call of the bare potential (two when the bare form refuses a point
// beyond r_c).
//
// Capabilities: Taylor, Domain (Limit 0, the barrier energy of the cut
// form, its minimum as guess, Kinks at r_on and r_c) and MaxOrder are
// forwarded; so is core.ParamGradient (∂V/∂p), through
// core.ParamDerivatives, except for ForceShift, whose gradient needs
// ∂V′(r_c)/∂p, which the bare gradient does not give (it reports
// core.ErrUnsupported, and a fit uses central differences). The declared
// identities (conformance.Identifier) are not forwarded: they are
// identities of the bare form, not of the cut one.
type Potential struct {
	inner    core.Potential
	s        Settings
	vc, dvc  float64 // V(r_c) in eV, V′(r_c) in eV/Å
	re       float64 // minimum of the bare form, Å; 0 when it has none
	dom      core.Domain
	maxOrder int
	// The switch, in x = (r − r_on)·h, h = 1/(r_c − r_on); mult[j] the
	// constant factor of s_j (see switchJet).
	h    float64
	mult [maxDegree + 1]float64
	bufs sync.Pool // *buffers for calls with points beyond r_c
}

// New cuts p by s. Errors wrap core.ErrParam and ErrSettings: r_c ≤ 0,
// r_on ≥ r_c, r_c (or r_on) outside the domain of p, r_c at or before the
// minimum of p (inside its repulsive wall), r_on for a scheme without a
// switch, and a cut that leaves no minimum (core.ErrNoMinimum). A p
// without a minimum is accepted (there is no wall to check).
func New(p core.Potential, s Settings) (*Potential, error) {
	s, err := s.resolved()
	if err != nil {
		return nil, err
	}
	bad := func(format string, args ...any) (*Potential, error) {
		return nil, fmt.Errorf("%w: %w: "+format, append([]any{core.ErrParam, ErrSettings}, args...)...)
	}
	dom := p.Domain()
	if !dom.Contains(s.Cutoff) {
		return bad("r_c = %g Å lies outside the domain (%g Å, %g Å) of the form", s.Cutoff, dom.Min, dom.Max)
	}
	if s.Scheme.Switching() && !(s.SwitchOn > dom.Min) {
		return bad("r_on = %g Å lies at or below the domain minimum %g Å of the form", s.SwitchOn, dom.Min)
	}
	c := &Potential{inner: p, s: s, dom: dom, maxOrder: p.MaxOrder()}
	re, err := core.Equilibrium(p)
	switch {
	case err == nil:
		if s.Cutoff <= re {
			return bad("r_c = %g Å lies inside the repulsive wall, at or before the minimum re = %.10g Å of the bare form: a cutoff must lie beyond the well", s.Cutoff, re)
		}
		c.re = re
		c.dom.EquilibriumGuess = re
	case errors.Is(err, core.ErrNoMinimum):
	default:
		return nil, fmt.Errorf("locating the minimum of the bare form: %w", err)
	}
	var at [2]float64
	if c.maxOrder >= 1 {
		err = p.Taylor(1, []float64{s.Cutoff}, at[:])
	} else {
		err = p.Taylor(0, []float64{s.Cutoff}, at[:1])
	}
	if err != nil {
		return nil, fmt.Errorf("evaluating the bare form at r_c: %w", err)
	}
	if s.Scheme == ForceShift && c.maxOrder < 1 {
		return bad("force-shift needs V′, the form has no derivatives (MaxOrder 0)")
	}
	c.vc, c.dvc = at[0], at[1]
	if s.Scheme.Switching() {
		h := 1 / (s.Cutoff - s.SwitchOn)
		c.h = h
		if s.Scheme == Switch1 {
			c.mult = [maxDegree + 1]float64{1, -6 * h, h * h, 2 * h * h * h}
		} else {
			c.mult = [maxDegree + 1]float64{1, -30 * h, -30 * h * h, h * h * h, h * h * h * h, -6 * h * h * h * h * h}
		}
	}
	c.dom.Limit = 0
	if dom.Barrier {
		c.dom.BarrierEnergy = c.inside(dom.Min, dom.BarrierEnergy)
	}
	c.dom.Kinks = c.Kinks()
	if c.re != 0 {
		// A cut too close to the well removes it: the force shift of a
		// form whose V′ still grows at r_c (before its inflection point)
		// has V′_cut < 0 everywhere below r_c.
		cre, err := core.Equilibrium(c)
		if err != nil {
			return nil, fmt.Errorf("%w: %w: the %s form at r_c = %g Å has no minimum of its own (the bare minimum is at %.10g Å): %w",
				core.ErrNoMinimum, ErrSettings, s.Scheme, s.Cutoff, c.re, err)
		}
		c.dom.EquilibriumGuess = cre
	}
	return c, nil
}

// Inner returns the bare potential.
func (p *Potential) Inner() core.Potential { return p.inner }

// Settings returns the cutoff, with the default r_on filled in.
func (p *Potential) Settings() Settings { return p.s }

// AtCutoff returns V(r_c) in eV and V′(r_c) in eV/Å of the bare form.
func (p *Potential) AtCutoff() (v, dv float64) { return p.vc, p.dvc }

// Kinks returns the separations in Å where the cut form is not smooth:
// r_on (switches) and r_c.
func (p *Potential) Kinks() []float64 {
	if p.s.Scheme.Switching() {
		return []float64{p.s.SwitchOn, p.s.Cutoff}
	}
	return []float64{p.s.Cutoff}
}

// Domain returns the bare domain with Limit 0 (the cut form vanishes
// beyond r_c), the barrier energy of the cut form, the bare minimum as the
// equilibrium guess and Kinks at r_on and r_c.
func (p *Potential) Domain() core.Domain {
	d := p.dom
	d.Kinks = append([]float64(nil), d.Kinks...)
	return d
}

// MaxOrder is the bare form's.
func (p *Potential) MaxOrder() int { return p.maxOrder }

// inside is the cut energy at r < r_c of a bare value v, for the schemes
// whose order-0 change needs no jet (every scheme but the switches beyond
// r_on).
func (p *Potential) inside(r, v float64) float64 {
	switch p.s.Scheme {
	case Shift:
		return v - p.vc
	case ForceShift:
		return v - (p.vc + (r-p.s.Cutoff)*p.dvc)
	}
	if p.s.Scheme.Switching() && r > p.s.SwitchOn {
		return v * p.switchValue(r)
	}
	return v
}

// switchValue returns S(r) for r_on < r < r_c: s_0 of switchLow3, the
// same S that Taylor multiplies by.
func (p *Potential) switchValue(r float64) float64 {
	s0, _, _ := p.switchLow3((r - p.s.SwitchOn) * p.h)
	return s0
}

// buffers is the scratch of a call with points beyond r_c.
type buffers struct {
	r, dst []float64
	idx    []int
}

// Taylor stores the coefficients of the cut form (see the package
// documentation): one Taylor call of the bare form for all points, whose
// rows at and beyond r_c are then zeroed; if the bare form refuses a point
// there, the points below r_c are evaluated by a second call of their own.
// NaN, ±Inf and points outside the domain are errors (*core.PointError
// wrapping core.ErrDomain).
func (p *Potential) Taylor(n int, r, dst []float64) error {
	if err := core.CheckTaylor(n, p.maxOrder, len(r), len(dst)); err != nil {
		return err
	}
	// One call of the bare form for every point; the rows at and beyond
	// r_c are zeroed by apply. A point there that the bare form refuses
	// (beyond its domain, NaN) makes the call fail: then the points below
	// r_c are evaluated alone, and the others checked, by gathered.
	if err := p.inner.Taylor(n, r, dst); err != nil {
		if err := p.gathered(n, r, dst); err != nil {
			return err
		}
	}
	p.apply(n, r, dst)
	return nil
}

// gathered evaluates the bare form at the points below r_c only, and
// zeroes the rows of the others.
func (p *Potential) gathered(n int, r, dst []float64) error {
	w := n + 1
	b, _ := p.bufs.Get().(*buffers)
	if b == nil {
		b = &buffers{}
	}
	defer p.bufs.Put(b)
	b.r, b.idx = b.r[:0], b.idx[:0]
	for i, x := range r {
		if x < p.s.Cutoff {
			b.r, b.idx = append(b.r, x), append(b.idx, i)
			continue
		}
		if !(x < p.dom.Max) || math.IsInf(x, 0) {
			return &core.PointError{Index: i, R: x, Err: core.CheckR(p.dom, x)}
		}
		clear(dst[i*w : (i+1)*w])
	}
	if len(b.r) == 0 {
		return nil
	}
	if m := w * len(b.r); cap(b.dst) < m {
		b.dst = make([]float64, m)
	}
	b.dst = b.dst[:w*len(b.r)]
	if err := p.inner.Taylor(n, b.r, b.dst); err != nil {
		var pe *core.PointError
		if errors.As(err, &pe) && pe.Index >= 0 && pe.Index < len(b.idx) {
			return &core.PointError{Index: b.idx[pe.Index], R: pe.R, Err: pe.Err}
		}
		return err
	}
	for j, i := range b.idx {
		copy(dst[i*w:(i+1)*w], b.dst[j*w:(j+1)*w])
	}
	return nil
}

// apply turns the bare rows of the points below r_c into the cut ones and
// zeroes the others. The loops are written out per scheme: they run over
// every point of every call.
func (p *Potential) apply(n int, r, dst []float64) {
	w := n + 1
	rc, vc, dvc := p.s.Cutoff, p.vc, p.dvc
	switch p.s.Scheme {
	case Truncate:
		for i, x := range r {
			if !(x < rc) {
				clear(dst[i*w : i*w+w])
			}
		}
	case Shift:
		for i, x := range r {
			if x < rc {
				dst[i*w] -= vc
			} else {
				clear(dst[i*w : i*w+w])
			}
		}
	case ForceShift:
		for i, x := range r {
			switch {
			case !(x < rc):
				clear(dst[i*w : i*w+w])
			case n == 0:
				dst[i] -= vc + (x-rc)*dvc
			default:
				row := dst[i*w : i*w+2 : i*w+2]
				row[0] -= vc + (x-rc)*dvc
				row[1] -= dvc
			}
		}
	case Switch1:
		p.switchAll(n, r, dst, false)
	case Switch2:
		p.switchAll(n, r, dst, true)
	}
}

// switchAll replaces the row of every point of r in (r_on, r_c) by its
// product with the jet of the switch, and zeroes those at and beyond r_c: the work of switchJet and
// switchProduct written out in one loop, with the coefficients in
// registers (this loop is what a switch costs). The expressions of s_0,
// s_1, s_2 are those of switchLow3.
func (p *Potential) switchAll(n int, r, dst []float64, quintic bool) {
	on, rc, h := p.s.SwitchOn, p.s.Cutoff, p.h
	m1, m2, m3, m4, m5 := p.mult[1], p.mult[2], p.mult[3], p.mult[4], p.mult[5]
	w := n + 1
	beyond := false
	for i, x := range r {
		if !(x > on) {
			continue
		}
		if !(x < rc) {
			beyond = true
			continue
		}
		t := (x - on) * h
		u := 1 - t
		t2 := t * t
		var s0, s1, s2, s3, s4, s5 float64
		if quintic {
			s0, s1, s2 = 1-t2*t*((10-15*t)+6*t2), m1*(t2*(u*u)), m2*((t*u)*(1-2*t))
			s3, s4, s5 = m3*(-10+60*(t*u)), m4*(15-30*t), m5
		} else {
			s0, s1, s2 = 1-t2*(3-2*t), m1*(t*u), m2*(6*t-3)
			s3 = m3
		}
		v := dst[i*w : i*w+w : i*w+w]
		for k := n; k >= 5; k-- {
			q := v[k-5 : k+1 : k+1]
			v[k] = (s0*q[5] + s1*q[4]) + (s2*q[3] + s3*q[2]) + (s4*q[1] + s5*q[0])
		}
		// The low orders from registers: the loop above left them bare.
		if n >= 4 {
			a := v[:5:5]
			a0, a1, a2, a3, a4 := a[0], a[1], a[2], a[3], a[4]
			a[4] = (s0*a4 + s1*a3) + (s2*a2 + s3*a1) + s4*a0
			a[3] = (s0*a3 + s1*a2) + (s2*a1 + s3*a0)
			a[2] = (s0*a2 + s1*a1) + s2*a0
			a[1] = s0*a1 + s1*a0
			a[0] = s0 * a0
			continue
		}
		switch n {
		case 3:
			v[3] = (s0*v[3] + s1*v[2]) + (s2*v[1] + s3*v[0])
			fallthrough
		case 2:
			v[2] = (s0*v[2] + s1*v[1]) + s2*v[0]
			fallthrough
		case 1:
			v[1] = s0*v[1] + s1*v[0]
			fallthrough
		default:
			v[0] = s0 * v[0]
		}
	}
	if beyond {
		for i, x := range r {
			if !(x < rc) {
				clear(dst[i*w : i*w+w])
			}
		}
	}
}

// Piece stores in dst (n+1 values) the coefficients c_0…c_n at r of the
// outermost piece of the cut form below r_c — the one on (r_on, r_c) for
// the switches, on (domain minimum, r_c) for the others — continued to r
// itself: Piece at r_c gives the limits from below at the cutoff (the jumps
// are minus these), Piece at r_on those from above at the start of a
// switch. r must lie in the bare domain.
func (p *Potential) Piece(n int, r float64, dst []float64) error {
	if err := core.CheckTaylor(n, p.maxOrder, 1, len(dst)); err != nil {
		return err
	}
	if err := p.inner.Taylor(n, []float64{r}, dst); err != nil {
		return err
	}
	switch p.s.Scheme {
	case Shift:
		dst[0] -= p.vc
	case ForceShift:
		dst[0] -= p.vc + (r-p.s.Cutoff)*p.dvc
		if n >= 1 {
			dst[1] -= p.dvc
		}
	case Switch1, Switch2:
		p.switchRow(n, r, dst)
	}
	return nil
}

// maxDegree is the degree of the quintic switch.
const maxDegree = 5

// switchRow replaces the jet v (c_0…c_n of V at r) by the jet of S·V, the
// Cauchy product c_k = Σ_{j=0}^{min(k,5)} s_j v_{k−j} (jet.Layout.Mul
// truncated at the degree of S, whose higher coefficients vanish; the
// cubic has s_4 = s_5 = 0). The coefficients s_j = hʲS⁽ʲ⁾(x)/j! of S at r
// are written out (see switchJet). The product is formed in place from the
// top order down: c_k reads v_0…v_k only, which are still bare. Written
// out term by term: it runs for every point of the switching region.
func (p *Potential) switchRow(n int, r float64, v []float64) {
	var s [maxDegree + 1]float64
	p.switchJet(r, &s)
	switchProduct(n, &s, v)
}

// switchProduct replaces the jet v of order n by its product with the jet
// s of a polynomial of degree ≤ 5, in place from the top order down.
func switchProduct(n int, s *[maxDegree + 1]float64, v []float64) {
	s0, s1, s2, s3, s4, s5 := s[0], s[1], s[2], s[3], s[4], s[5]
	v = v[:n+1]
	for k := n; k >= 5; k-- {
		w := v[k-5 : k+1 : k+1]
		v[k] = (s0*w[5] + s1*w[4]) + (s2*w[3] + s3*w[2]) + (s4*w[1] + s5*w[0])
	}
	switch min(n, 4) {
	case 4:
		v[4] = (s0*v[4] + s1*v[3]) + (s2*v[2] + s3*v[1]) + s4*v[0]
		fallthrough
	case 3:
		v[3] = (s0*v[3] + s1*v[2]) + (s2*v[1] + s3*v[0])
		fallthrough
	case 2:
		v[2] = (s0*v[2] + s1*v[1]) + s2*v[0]
		fallthrough
	case 1:
		v[1] = s0*v[1] + s1*v[0]
		fallthrough
	default:
		v[0] = s0 * v[0]
	}
}

// switchJet stores the Taylor coefficients s_j = hʲS⁽ʲ⁾(x)/j! of the switch
// at r (x = (r − r_on)h) in s, zero beyond the degree of S. By hand from S = 1 − (3x² − 2x³): s = (S, −6hx(1 − x),
// h²(6x − 3), 2h³); from S = 1 − (10x³ − 15x⁴ + 6x⁵): s = (S,
// −30hx²(1 − x)², −30h²x(1 − x)(1 − 2x), h³(−10 + 60x − 60x²),
// h⁴(15 − 30x), −6h⁵). TestSwitchAgainstJets checks them against jets of
// the polynomial.
func (p *Potential) switchJet(r float64, s *[maxDegree + 1]float64) {
	t := (r - p.s.SwitchOn) * p.h
	s[0], s[1], s[2] = p.switchLow3(t)
	m := &p.mult
	if p.s.Scheme == Switch1 {
		s[3] = m[3]
		return
	}
	s[3] = m[3] * (-10 + 60*t*(1-t))
	s[4] = m[4] * (15 - 30*t)
	s[5] = m[5]
}

// switchLow3 returns s_0, s_1, s_2 of the switch at x = t (see switchJet),
// written for short dependency chains, as in switchAll.
func (p *Potential) switchLow3(t float64) (s0, s1, s2 float64) {
	u := 1 - t
	t2 := t * t
	m := &p.mult
	if p.s.Scheme == Switch1 {
		return 1 - t2*(3-2*t), m[1] * (t * u), m[2] * (6*t - 3)
	}
	return 1 - t2*t*((10-15*t)+6*t2), m[1] * (t2 * (u * u)), m[2] * ((t * u) * (1 - 2*t))
}

// ParamGradient stores ∂V_cut(r[i])/∂pⱼ in dst[i·P+j]: the bare gradient g
// for Truncate below r_c, g(r) − g(r_c) for Shift, S(r)·g(r) for the
// switches (S does not depend on the parameters), 0 beyond r_c. It
// reports core.ErrUnsupported for ForceShift and for a bare potential
// without a gradient.
func (p *Potential) ParamGradient(r, dst []float64) error {
	if p.s.Scheme == ForceShift {
		return fmt.Errorf("%w: the force shift's ∂V/∂p needs ∂V′(r_c)/∂p, which the bare form's parameter gradient does not give", core.ErrUnsupported)
	}
	if len(r) == 0 {
		return core.ParamDerivatives(p.inner, r, dst)
	}
	if len(dst)%len(r) != 0 {
		return fmt.Errorf("%w: %d separations, dst has %d values", core.ErrLength, len(r), len(dst))
	}
	np := len(dst) / len(r)
	rc := p.s.Cutoff
	xs := make([]float64, len(r), len(r)+1)
	for i, x := range r {
		xs[i] = x
		if !(x < rc) && x < p.dom.Max && !math.IsInf(x, 0) {
			xs[i] = p.re // any point of the domain; the row is zeroed
			if xs[i] == 0 {
				xs[i] = 0.5 * (p.dom.Min + rc)
			}
		}
	}
	xs = append(xs, rc)
	g := make([]float64, np*len(xs))
	if err := core.ParamDerivatives(p.inner, xs, g); err != nil {
		return err
	}
	gc := g[len(r)*np:]
	for i, x := range r {
		row, out := g[i*np:(i+1)*np], dst[i*np:(i+1)*np]
		switch {
		case !(x < rc):
			clear(out)
		case p.s.Scheme == Shift:
			for j := range out {
				out[j] = row[j] - gc[j]
			}
		case p.s.Scheme.Switching() && x > p.s.SwitchOn:
			sv := p.switchValue(x)
			for j := range out {
				out[j] = sv * row[j]
			}
		default:
			copy(out, row)
		}
	}
	return nil
}
