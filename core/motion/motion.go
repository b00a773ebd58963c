// Package motion integrates the classical vibration of a pair of atoms in a
// pair potential and measures its period from the trajectory.
//
// The motion is that of the relative coordinate r with reduced mass μ:
//
//	μ r̈ = F(r) = −V′(r).
//
// Units are pairwell's: r in Å, time in fs, velocity in Å/fs, acceleration in
// Å/fs², energy in eV, mass in u. A force of 1 eV/Å on 1 u is an acceleration
// of e/(10⁻¹⁰ m · m_u) = 9.648533212…×10¹⁷ m/s² = 9.648533212…×10⁻³ Å/fs²
// (CODATA 2018 constants from package units); a kinetic energy ½μv² of
// 1 u·Å²/fs² is 103.642696… eV.
//
// A run starts at rest at a turning point, given either as a displacement
// x0 = r0 − re from the equilibrium distance (positive stretches, negative
// compresses) or as an oscillation energy E above V(re) (then r0 is the
// stretch-side turning point). Four integrators are available: Heun
// (explicit trapezoid, order 2), classical Runge–Kutta (order 4), velocity
// Verlet (order 2, symplectic) and the adaptive Dormand–Prince 5(4) pair
// with error control.
//
// The period is measured between successive outer (stretch-side) turning
// points, where the velocity changes sign from + to −. Each is located
// within its step: a cubic Hermite interpolant of v(t) built from v and
// its derivative a at both ends of the step gives a first estimate, which
// is then refined by Newton iterations on the velocity after one partial
// step of the same integrator from the start of the step, so that the
// turning-point times carry the integrator's error and no interpolation
// error.
//
// An Oscillator is immutable and safe for concurrent use; every Run
// allocates its own state. No function panics on bad input.
package motion

import (
	"errors"
	"fmt"
	"math"
	"strings"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/units"
)

// accelUnit is the acceleration in Å/fs² of a force of 1 eV/Å acting on a
// mass of 1 u: e/(10⁻¹⁰ m · m_u) in m/s², times 10¹⁰ Å/m · 10⁻³⁰ s²/fs².
const accelUnit = units.ElectronVolt / (1e-10 * units.Dalton) * 1e-20

// kineticUnit is the energy in eV of 1 u·Å²/fs², m_u · 10⁻²⁰ m² / 10⁻³⁰ s²
// in J divided by e; it is 1/accelUnit.
const kineticUnit = units.Dalton * 1e10 / units.ElectronVolt

// Method is an integrator.
type Method int

// The integrators. The zero value is DormandPrince.
const (
	// DormandPrince is the adaptive explicit Runge–Kutta 5(4) pair of
	// J. R. Dormand and P. J. Prince, J. Comput. Appl. Math. 6, 19 (1980),
	// advancing with the 5th-order solution (local extrapolation), FSAL,
	// with the PI step-size controller of Hairer, Nørsett & Wanner,
	// Solving ODEs I, §II.4 (code DOPRI5). 6 force evaluations per step.
	DormandPrince Method = iota
	// RK4 is the classical fourth-order Runge–Kutta method. 4 force
	// evaluations per step.
	RK4
	// Verlet is velocity Verlet, second order, symplectic and time
	// reversible: the energy error oscillates without secular drift.
	// 1 force evaluation per step.
	Verlet
	// Heun is Heun's method (explicit trapezoid rule: an Euler predictor
	// and a trapezoid corrector), second order. 2 force evaluations per
	// step. It is not symplectic: on an oscillator its energy grows by
	// about (ωh)⁴/4 per step.
	Heun

	numMethods
)

var methodNames = [numMethods]string{
	DormandPrince: "dopri",
	RK4:           "rk4",
	Verlet:        "verlet",
	Heun:          "heun",
}

// Methods returns the integrators in order of increasing accuracy per
// step: Heun, Verlet, RK4, DormandPrince.
func Methods() []Method { return []Method{Heun, Verlet, RK4, DormandPrince} }

// String returns the method's name as accepted by ParseMethod: "heun",
// "rk4", "verlet" or "dopri".
func (m Method) String() string {
	if m < 0 || m >= numMethods {
		return fmt.Sprintf("Method(%d)", int(m))
	}
	return methodNames[m]
}

// MarshalText implements encoding.TextMarshaler.
func (m Method) MarshalText() ([]byte, error) {
	if m < 0 || m >= numMethods {
		return nil, fmt.Errorf("motion: unknown method %d", int(m))
	}
	return []byte(m.String()), nil
}

// ErrMethod means a method name or value is not one of the integrators.
var ErrMethod = errors.New("unknown integration method")

// ErrTooManySteps is wrapped by the error of a run that exceeds
// Settings.MaxSteps.
var ErrTooManySteps = errors.New("step limit exceeded")

// ParseMethod returns the method named s, case-insensitively: "heun",
// "rk4", "verlet" (or "velocity-verlet"), "dopri" (or "dopri5",
// "dormand-prince").
func ParseMethod(s string) (Method, error) {
	switch strings.ToLower(strings.TrimSpace(s)) {
	case "heun":
		return Heun, nil
	case "rk4", "runge-kutta":
		return RK4, nil
	case "verlet", "velocity-verlet":
		return Verlet, nil
	case "dopri", "dopri5", "dormand-prince":
		return DormandPrince, nil
	}
	return 0, fmt.Errorf("%w %q: allowed: heun, rk4, verlet, dopri", ErrMethod, s)
}

// Default steps per harmonic period T0 = 2π/ω0 of the fixed-step methods,
// chosen by measurement: starting at rest on either side at oscillation
// energies E = 0.001 … 0.5 of the depth (or of the inner barrier, if
// lower) on Morse, Lennard-Jones 12-6 and Buckingham wells (argon-like and
// covalent-bond-like parameters), over 10 periods, the worst relative error
// of the measured period against the exact one (quadrature to 1e-12) was:
//
//	Heun    800 steps  2.5e-5  (target 1e-4; h² error, θ²/6 at E → 0, θ = ω0h)
//	Verlet  600 steps  2.5e-5  (target 1e-4; h² error, θ²/24 at E → 0)
//	RK4     200 steps  1.1e-7  (target 1e-6; h⁴ error)
//
// (re-measured on a grid of E in steps of 0.01 against period.Exact:
// 2.24e-5, 2.35e-5, 1.03e-7; an independent check at 30–70 digits on other
// invented parameter sets found 2.48e-5, 2.49e-5, 1.12e-7: the larger,
// rounded up, is given)
//
// all at E/De = 0.5 on Lennard-Jones (compression start), except Heun's
// harmonic limit. They stay within the targets over 100 periods (Heun
// 7.7e-5, Verlet 2.4e-5, RK4 8.4e-7): the energy of Heun and RK4 drifts,
// and with it the period of an anharmonic well.
const (
	DefaultHeunSteps   = 800
	DefaultVerletSteps = 600
	DefaultRK4Steps    = 200
)

// Default tolerances of DormandPrince. By the same measurement the worst
// relative period error was 3.3e-9 (target 1e-7; 3.08e-9 on our grid,
// 3.27e-9 in the independent check) over 10 periods and
// 2.7e-8 over 100, with 80–160 accepted steps per harmonic period. The
// error follows the tolerance: about 3·RTol for RTol = ATol from 1e-7 to
// 1e-12 (4.5e-12 at 1e-12, the limit of float64 rounding over a run).
const (
	DefaultRTol = 1e-9
	DefaultATol = 1e-9
)

// ValidatedFraction is the largest oscillation energy, as a fraction of
// the limit of bound motion (the depth, or an inner barrier when lower), at
// which the default steps were validated (see DefaultHeunSteps and
// DefaultRTol): above it their period error may exceed Method.Target (on
// Morse at E/De = 0.99 Heun's error is 4.5e-3, dopri's 1.25e-6).
const ValidatedFraction = 0.5

// Target returns the relative period error the default step of m was
// chosen to stay within up to ValidatedFraction: 1e-4 (Heun, Verlet), 1e-6
// (RK4), 1e-7 (DormandPrince).
func (m Method) Target() float64 {
	switch m {
	case Heun, Verlet:
		return 1e-4
	case RK4:
		return 1e-6
	}
	return 1e-7
}

// DefaultPeriods is the number of periods measured when Settings.Periods is 0.
const DefaultPeriods = 10

// DefaultStepsPerPeriod returns the default number of steps per harmonic
// period of a fixed-step method, or 0 for DormandPrince, which adapts its
// step.
func (m Method) DefaultStepsPerPeriod() int {
	switch m {
	case Heun:
		return DefaultHeunSteps
	case Verlet:
		return DefaultVerletSteps
	case RK4:
		return DefaultRK4Steps
	}
	return 0
}

// Settings controls Run. The zero value runs Dormand–Prince at its default
// tolerances over DefaultPeriods periods, recording no trajectory.
type Settings struct {
	// Method is the integrator; the zero value is DormandPrince.
	Method Method

	// StepsPerPeriod sets the step of the fixed-step methods,
	// h = T0/StepsPerPeriod with T0 = 2π/ω0 the harmonic period. For
	// DormandPrince it sets only the first trial step (zero: T0/50). Zero
	// means Method.DefaultStepsPerPeriod(); negative is an error.
	StepsPerPeriod int

	// Periods is the number of full periods to measure; zero means
	// DefaultPeriods, negative is an error. A run that starts at the
	// stretch-side turning point lasts about Periods periods; one that
	// starts compressed lasts half a period more.
	Periods int

	// RTol and ATol are the relative and absolute tolerances of
	// DormandPrince; zero means DefaultRTol and DefaultATol, negative is
	// an error. They apply to the state scaled by the starting
	// displacement L = |x0|: a step is accepted when the RMS over (x, v)
	// of err_i/(ATol·s_i + RTol·max(|y_i|, |y_i,new|)) is at most 1, with
	// s_x = L and s_v = ω0·L. Ignored by the fixed-step methods.
	RTol, ATol float64

	// MaxTime bounds the integrated time in fs; zero means
	// 100·(Periods+1)·T0, enough for periods up to 100 times the harmonic
	// one (Morse at E/De = 0.9999). A run that reaches it without the
	// requested turning points fails with an error wrapping
	// core.ErrNoConvergence.
	MaxTime float64

	// Record, when positive, keeps the start and every Record-th accepted
	// step in Result.Trajectory (1 keeps every step). Zero keeps none.
	Record int

	// MaxSteps, when positive, bounds the number of accepted steps (and
	// with it the time and the memory of a recorded trajectory): a run
	// that needs more fails with an error wrapping ErrTooManySteps. Zero
	// means no bound.
	MaxSteps int
}

// Start is the initial condition of a run: at rest at r0 = re + x0.
type Start struct {
	// X0 is the displacement r0 − re in Å: positive stretches, negative
	// compresses.
	X0 float64
	// R0 is the starting separation in Å.
	R0 float64
	// Energy is the oscillation energy V(r0) − V(re) in eV.
	Energy float64
}

// Sample is one recorded point of a trajectory.
type Sample struct {
	T float64 // time, fs
	R float64 // separation, Å
	X float64 // displacement r − re, Å
	V float64 // velocity dr/dt, Å/fs
	// E is the energy E_kin + V(r) − V(re) in eV, with E_kin = ½μv²; it
	// is constant (= Start.Energy) in the exact motion.
	E float64
}

// Result is a run and the period measured from it.
type Result struct {
	Method Method
	Start  Start
	// HarmonicPeriod is T0 = 2π/ω0 in fs, ω0 = √(k/μ).
	HarmonicPeriod float64

	// TimeStep is the step in fs; for DormandPrince the mean accepted
	// step, Duration/Steps.
	TimeStep float64
	// StepsPerPeriod is HarmonicPeriod/TimeStep (for DormandPrince the
	// mean accepted steps per harmonic period).
	StepsPerPeriod float64
	// MinStep and MaxStep are the smallest and largest accepted steps in
	// fs (both TimeStep for the fixed-step methods).
	MinStep, MaxStep float64
	// Steps is the number of accepted steps, Rejected the number of
	// rejected trial steps (DormandPrince only).
	Steps, Rejected int
	// ForceEvals is the number of potential evaluations, including the
	// ones spent locating turning points.
	ForceEvals int
	// Duration is the integrated time in fs.
	Duration float64

	// TurningPoints are the times in fs of the outer (stretch-side)
	// turning points used, including t = 0 when the run starts stretched.
	TurningPoints []float64
	// Period is the mean measured period in fs, (t_n − t_0)/n over the n
	// periods between the n+1 turning points.
	Period float64
	// PeriodSpread is the sample standard deviation in fs of the n
	// individual periods t_i − t_{i−1} (zero when n = 1).
	PeriodSpread float64
	// PeriodsMeasured is n.
	PeriodsMeasured int

	// EnergyDrift is max_k |E_k − E_0| / E_0 over the accepted steps,
	// where E_k = E_kin + V(r_k) − V(re) and E_0 = V(r0) − V(re) is the
	// oscillation energy (relative to it because V(re) is arbitrary).
	EnergyDrift float64
	// FinalEnergyError is (E_end − E_0)/E_0, signed, at the last step.
	FinalEnergyError float64
	// EnergyFloor is the relative rounding floor of E_k − E_0: a bound
	// on the rounding of the energies themselves (V(r) − V(re) from the
	// Taylor series at re where that is more accurate, see
	// core.Expansion, else the direct difference, whose rounding
	// ≈ 8ε·|V(re)| dominates small E_0). EnergyDrift and
	// FinalEnergyError at or below it are rounding, not integration
	// error.
	EnergyFloor float64

	// Trajectory holds the recorded samples when Settings.Record > 0.
	Trajectory []Sample
}

// Oscillator is a pair of reduced mass μ vibrating in a potential well.
// It is immutable and safe for concurrent use.
type Oscillator struct {
	p        core.Potential
	mu       float64
	well     core.Well
	harmonic core.Harmonic
	// maxEnergy is the smallest energy above V(re) at which motion is
	// unbounded: the depth, or the inner barrier when it is lower.
	maxEnergy float64
	barrier   bool    // maxEnergy is set by the inner barrier
	rBarrier  float64 // position of the inner barrier, Å
}

// New prepares the motion of a pair of reduced mass mu (u) in p. It finds
// the well (core.AnalyzeWell) and the harmonic frequency. Errors wrap
// core.ErrParam (bad mass), core.ErrNoMinimum or the analysis' errors.
func New(p core.Potential, mu float64) (*Oscillator, error) {
	if p == nil {
		return nil, fmt.Errorf("motion: %w: nil potential", core.ErrParam)
	}
	w, err := core.AnalyzeWell(p, core.WellSettings{Order: 2})
	if err != nil {
		return nil, fmt.Errorf("motion: %w", err)
	}
	return NewFromWell(p, w, mu)
}

// NewFromWell is New with the well of p already analysed (by
// core.AnalyzeWell, any order ≥ 2), for callers that need it anyway.
func NewFromWell(p core.Potential, w core.Well, mu float64) (*Oscillator, error) {
	if p == nil {
		return nil, fmt.Errorf("motion: %w: nil potential", core.ErrParam)
	}
	if err := core.Positive.Check("reduced mass", mu); err != nil {
		return nil, fmt.Errorf("motion: %w", err)
	}
	h, err := core.NewHarmonic(w.K, mu)
	if err != nil {
		return nil, fmt.Errorf("motion: %w", err)
	}
	o := &Oscillator{p: p, mu: mu, well: w, harmonic: h, maxEnergy: w.Depth}
	if d := p.Domain(); d.Barrier {
		if eb := d.BarrierEnergy - w.Energy; eb < o.maxEnergy {
			o.maxEnergy, o.barrier, o.rBarrier = eb, true, d.Min
		}
	}
	return o, nil
}

// Well returns the analysed well.
func (o *Oscillator) Well() core.Well { return o.well }

// Harmonic returns the harmonic vibration ω0 = √(k/μ).
func (o *Oscillator) Harmonic() core.Harmonic { return o.harmonic }

// Mu returns the reduced mass in u.
func (o *Oscillator) Mu() float64 { return o.mu }

// MaxEnergy returns the oscillation energy in eV above V(re) at and beyond
// which the motion is not bound: the well depth (the pair dissociates) or,
// when lower, the height of an inner barrier (the pair collapses).
func (o *Oscillator) MaxEnergy() float64 { return o.maxEnergy }

// checkEnergy returns an error wrapping core.ErrDomain when oscillation
// energy e (eV above V(re)) gives no bound motion.
func (o *Oscillator) checkEnergy(e float64, what string) error {
	if e < o.maxEnergy {
		return nil
	}
	if o.barrier {
		return fmt.Errorf("%w: %s gives an oscillation energy of %.6g eV, at or above the inner barrier (%.6g eV above V(re), at r = %.6g Å): the pair crosses it and collapses, there is no oscillation",
			core.ErrDomain, what, e, o.maxEnergy, o.rBarrier)
	}
	return fmt.Errorf("%w: %s gives an oscillation energy of %.6g eV, at or above the well depth %.6g eV: the pair dissociates, there is no oscillation",
		core.ErrDomain, what, e, o.maxEnergy)
}

// FromDisplacement returns the start at rest at r0 = re + x0 (Å; positive
// stretches, negative compresses). Its energy V(r0) − V(re) comes from the
// Taylor series at re where that is more accurate than the difference
// (core.Expansion.Energy). It is an error wrapping core.ErrDomain
// when r0 is outside the potential's domain or the energy V(r0) − V(re)
// reaches the depth or an inner barrier, and core.ErrParam when x0 is not
// finite or so small that re + x0 rounds to re.
func (o *Oscillator) FromDisplacement(x0 float64) (Start, error) {
	what := fmt.Sprintf("displacement %g Å", x0)
	if math.IsNaN(x0) || math.IsInf(x0, 0) {
		return Start{}, fmt.Errorf("motion: %w: %s is not finite", core.ErrParam, what)
	}
	if x0 == 0 {
		return Start{}, fmt.Errorf("motion: %w: zero displacement, the pair stays at rest at re", core.ErrParam)
	}
	r0 := o.well.Re + x0
	if err := core.CheckR(o.p.Domain(), r0); err != nil {
		return Start{}, fmt.Errorf("motion: %s from re = %g Å: %w", what, o.well.Re, err)
	}
	v, err := core.Value(o.p, r0)
	if err != nil {
		return Start{}, fmt.Errorf("motion: %s: %w", what, err)
	}
	e, _ := core.NewExpansion(o.well).Energy(x0, v, o.well.Energy)
	if r0 == o.well.Re || !(e > 0) {
		return Start{}, fmt.Errorf("motion: %w: %s is too small: re + x0 rounds to re = %g Å", core.ErrParam, what, o.well.Re)
	}
	if err := o.checkEnergy(e, what); err != nil {
		return Start{}, fmt.Errorf("motion: %w", err)
	}
	return Start{X0: x0, R0: r0, Energy: e}, nil
}

// FromEnergy returns the start at rest at the stretch-side turning point
// of oscillation energy e (eV above V(re)): the root r0 > re of
// V(r) − V(re) − e, bracketed by doubling the harmonic estimate √(2e/k)
// and refined by core.Root; for small e, where the Taylor series at re is
// more accurate, the root of the series (core.Expansion.Displacement). It
// is an error wrapping core.ErrParam unless
// e > 0 is finite, and core.ErrDomain when e reaches the depth or an inner
// barrier.
func (o *Oscillator) FromEnergy(e float64) (Start, error) {
	what := fmt.Sprintf("energy %g eV", e)
	if !(e > 0) || math.IsInf(e, 1) {
		return Start{}, fmt.Errorf("motion: %w: %s: the oscillation energy must be finite and > 0", core.ErrParam, what)
	}
	if err := o.checkEnergy(e, what); err != nil {
		return Start{}, fmt.Errorf("motion: %w", err)
	}
	re, v0 := o.well.Re, o.well.Energy
	if x, ok := core.NewExpansion(o.well).Displacement(e, +1); ok {
		return Start{X0: x, R0: re + x, Energy: e}, nil
	}
	var buf [2]float64 // V and V′ (c₀ and c₁)
	rr := make([]float64, 1)
	g := func(r float64) (float64, float64, error) {
		rr[0] = r
		if err := o.p.Taylor(1, rr, buf[:]); err != nil {
			return 0, 0, err
		}
		return buf[0] - v0 - e, buf[1], nil
	}
	d := o.p.Domain()
	lo, hi := re, re
	x := math.Sqrt(2 * e / o.well.K)
	found := false
	for i := 0; i < 200 && !found; i++ {
		hi = re + x
		if hi >= d.Max {
			hi = 0.5 * (lo + d.Max)
		}
		gh, _, err := g(hi)
		if err != nil {
			return Start{}, fmt.Errorf("motion: turning point of %s: %w", what, err)
		}
		if gh >= 0 {
			found = true
			break
		}
		lo = hi
		x *= 2
	}
	if !found {
		return Start{}, fmt.Errorf("motion: %w: no stretch-side turning point found for %s below r = %g Å", core.ErrNoConvergence, what, hi)
	}
	r0, err := core.Root(g, lo, hi)
	if err != nil {
		return Start{}, fmt.Errorf("motion: turning point of %s: %w", what, err)
	}
	return Start{X0: r0 - re, R0: r0, Energy: e}, nil
}

// withDefaults validates s and fills its zero values.
func (s Settings) withDefaults(t0 float64) (Settings, error) {
	if s.Method < 0 || s.Method >= numMethods {
		return s, fmt.Errorf("motion: %w: %d", ErrMethod, int(s.Method))
	}
	if s.StepsPerPeriod < 0 {
		return s, fmt.Errorf("motion: %w: steps per period %d, must be ≥ 0", core.ErrParam, s.StepsPerPeriod)
	}
	if s.Periods < 0 {
		return s, fmt.Errorf("motion: %w: periods %d, must be ≥ 0", core.ErrParam, s.Periods)
	}
	for _, t := range []struct {
		name string
		v    float64
	}{{"rtol", s.RTol}, {"atol", s.ATol}, {"max time", s.MaxTime}} {
		if err := core.NonNegative.Check(t.name, t.v); err != nil {
			return s, fmt.Errorf("motion: %w", err)
		}
	}
	if s.Record < 0 {
		return s, fmt.Errorf("motion: %w: record %d, must be ≥ 0", core.ErrParam, s.Record)
	}
	if s.MaxSteps < 0 {
		return s, fmt.Errorf("motion: %w: max steps %d, must be ≥ 0", core.ErrParam, s.MaxSteps)
	}
	if s.StepsPerPeriod == 0 {
		s.StepsPerPeriod = s.Method.DefaultStepsPerPeriod()
		if s.Method == DormandPrince {
			s.StepsPerPeriod = 50
		}
	}
	if s.Periods == 0 {
		s.Periods = DefaultPeriods
	}
	if s.RTol == 0 {
		s.RTol = DefaultRTol
	}
	if s.ATol == 0 {
		s.ATol = DefaultATol
	}
	if s.MaxTime == 0 {
		s.MaxTime = 100 * float64(s.Periods+1) * t0
	}
	return s, nil
}

// Run integrates the motion from st, at rest, until Settings.Periods full
// periods between outer turning points have been measured, and returns the
// measured period and the run's statistics. st must come from
// FromDisplacement or FromEnergy of the same oscillator (Run checks that
// R0 is in the domain and below the energy limit).
//
// Errors wrap core.ErrParam (bad settings or start), core.ErrDomain (the
// trajectory leaves the domain, which a fixed step too large for the well
// can cause) or core.ErrNoConvergence (no turning points within
// Settings.MaxTime, the numerical energy drifting up to the depth or the
// barrier, or the adaptive step underflowing).
func (o *Oscillator) Run(st Start, s Settings) (Result, error) {
	t0 := o.harmonic.PeriodFs
	s, err := s.withDefaults(t0)
	if err != nil {
		return Result{}, err
	}
	if !(st.X0 != 0) || math.IsInf(st.X0, 0) || !(st.Energy > 0) {
		return Result{}, fmt.Errorf("motion: %w: start X0 = %g Å, E = %g eV: build it with FromDisplacement or FromEnergy", core.ErrParam, st.X0, st.Energy)
	}
	if err := o.checkEnergy(st.Energy, "the start"); err != nil {
		return Result{}, fmt.Errorf("motion: %w", err)
	}
	in := newIntegrator(o, s, math.Abs(st.X0))
	return in.run(st)
}
