package motion_test

import (
	"errors"
	"fmt"
	"math"
	"sync"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/motion"
	"github.com/pairwell/pairwell/core/period"
	"github.com/pairwell/pairwell/core/units"
	"github.com/pairwell/pairwell/models"
)

// Test systems. The Morse parameters are HCl-like (De = 4.4 eV,
// a = 1.9 Å⁻¹, re = 1.27 Å, μ = 0.98 u), the Lennard-Jones ones argon-like
// (ε = 120 K·k_B, σ = 3.4 Å, μ = 19.97 u); the "bond" forms are each
// matched to one invented covalent-like well (re = 1.2 Å, De = 4 eV,
// k = 30 eV/Å², μ = 7 u), whose Buckingham form has an inner barrier only
// 0.079 eV above the minimum.
const (
	morseDe, morseA, morseRe, morseMu = 4.4, 1.9, 1.27, 0.98
)

type system struct {
	name string
	p    core.Potential
	mu   float64
}

func morsePot(t testing.TB) core.Potential {
	t.Helper()
	p, err := models.NewMorse(morseDe, morseA, morseRe)
	require.NoError(t, err)
	return p
}

func morse(t testing.TB) *motion.Oscillator {
	t.Helper()
	o, err := motion.New(morsePot(t), morseMu)
	require.NoError(t, err)
	return o
}

func systems(t testing.TB) []system {
	t.Helper()
	mo, err := models.NewMorse(morseDe, morseA, morseRe)
	require.NoError(t, err)
	lj, err := models.NewLennardJones(120*units.BoltzmannEV, 3.4)
	require.NoError(t, err)
	bk, err := models.NewBuckingham(1500, 0.3, 25)
	require.NoError(t, err)
	ss := []system{{"morse", mo, morseMu}, {"lj-argon", lj, 19.97}, {"buckingham", bk, 20}}
	for _, m := range []core.Model{models.Morse{}, models.LennardJones{}, models.Buckingham{}} {
		params, _, err := m.(core.Matcher).Match(core.Target{Re: 1.2, Depth: 4, K: 30})
		require.NoError(t, err)
		p, err := m.New(params)
		require.NoError(t, err)
		ss = append(ss, system{m.Info().Key + "-bond", p, 7})
	}
	return ss
}

// morsePeriod is the closed-form classical period of the Morse oscillator
// (standard result, e.g. Landau & Lifshitz, Mechanics §12 problem 2(c)):
// T(E) = T0/√(1 − E/De), T0 = 2π/ω0, ω0 = √(2De·a²/μ), here with ω0²
// converted from eV/(Å²·u) to fs⁻² with CODATA 2018 constants.
func morsePeriod(e float64) float64 {
	omega0 := math.Sqrt(2 * morseDe * morseA * morseA / morseMu * units.ElectronVolt / (1e-20 * units.Dalton) * 1e-30)
	return 2 * math.Pi / omega0 / math.Sqrt(1-e/morseDe)
}

// target is the required relative period accuracy at the default settings
// (issue 3, item 2).
var target = map[motion.Method]float64{
	motion.Heun:          1e-4,
	motion.Verlet:        1e-4,
	motion.RK4:           1e-6,
	motion.DormandPrince: 1e-7,
}

func TestMorseDefaults(t *testing.T) {
	o := morse(t)
	t0 := o.Harmonic().PeriodFs
	for _, m := range motion.Methods() {
		for _, f := range []float64{0.1, 0.5} {
			t.Run(fmt.Sprintf("%s/E=%gDe", m, f), func(t *testing.T) {
				st, err := o.FromEnergy(f * morseDe)
				require.NoError(t, err)
				r, err := o.Run(st, motion.Settings{Method: m})
				require.NoError(t, err)
				want := morsePeriod(f * morseDe) // closed form, see morsePeriod
				assert.InDelta(t, 0, r.Period/want-1, target[m], "measured %g fs, closed form %g fs", r.Period, want)
				assert.Equal(t, m, r.Method)
				assert.Equal(t, motion.DefaultPeriods, r.PeriodsMeasured)
				assert.Len(t, r.TurningPoints, motion.DefaultPeriods+1)
				assert.Equal(t, 0.0, r.TurningPoints[0], "a stretched start is the first turning point")
				assert.Less(t, r.PeriodSpread, 10*target[m]*want)
				assert.InDelta(t, t0, r.HarmonicPeriod, 1e-12*t0)
				if m != motion.DormandPrince {
					assert.InDelta(t, t0/float64(m.DefaultStepsPerPeriod()), r.TimeStep, 1e-12*r.TimeStep)
					assert.InDelta(t, float64(m.DefaultStepsPerPeriod()), r.StepsPerPeriod, 1e-9)
					assert.Zero(t, r.Rejected)
				}
				assert.InDelta(t, r.Duration, r.TimeStep*float64(r.Steps), 1e-9*r.Duration)
				assert.Greater(t, r.ForceEvals, r.Steps)
				assert.Less(t, r.EnergyDrift, 1e-3)
			})
		}
	}
}

// TestDefaultAccuracy is the measurement behind the default steps and
// tolerances: every method at its defaults, on all test systems, at
// E = 0.01 … 0.5 of the bound-energy limit, starting on either side; the
// reference is quadPeriod (Gauss–Legendre after substitution, checked
// against itself at twice the nodes).
func TestDefaultAccuracy(t *testing.T) {
	if testing.Short() {
		t.Skip("sweep")
	}
	worst := map[motion.Method]float64{}
	for _, s := range systems(t) {
		o, err := motion.New(s.p, s.mu)
		require.NoError(t, err)
		for _, f := range []float64{0.01, 0.1, 0.2, 0.3, 0.4, 0.5} {
			for _, side := range []float64{1, -1} {
				st := startAt(t, o, f*o.MaxEnergy(), side)
				ref := quadPeriod(t, s.p, s.mu, st.Energy, 400)
				require.InDelta(t, 0, ref/quadPeriod(t, s.p, s.mu, st.Energy, 800)-1, 1e-12, "reference converged")
				for _, m := range motion.Methods() {
					r, err := o.Run(st, motion.Settings{Method: m})
					require.NoError(t, err)
					rel := math.Abs(r.Period/ref - 1)
					assert.Less(t, rel, target[m], "%s %s E=%g·Emax side %+g", s.name, m, f, side)
					worst[m] = math.Max(worst[m], rel)
				}
			}
		}
	}
	for _, m := range motion.Methods() {
		t.Logf("%-6s worst relative period error %.2g (target %g)", m, worst[m], target[m])
	}
}

// startAt returns the start at rest at oscillation energy e on the stretch
// (side > 0) or compression side, the latter by bisection on the
// displacement.
func startAt(t *testing.T, o *motion.Oscillator, e, side float64) motion.Start {
	t.Helper()
	if side > 0 {
		st, err := o.FromEnergy(e)
		require.NoError(t, err)
		return st
	}
	lo, hi := 0.0, -math.Sqrt(2*e/o.Well().K)
	for {
		st, err := o.FromDisplacement(hi)
		if err != nil || st.Energy > e {
			break
		}
		lo, hi = hi, 2*hi
	}
	for range 100 {
		mid := 0.5 * (lo + hi)
		if st, err := o.FromDisplacement(mid); err == nil && st.Energy < e {
			lo = mid
		} else {
			hi = mid
		}
	}
	st, err := o.FromDisplacement(lo)
	require.NoError(t, err)
	return st
}

// TestConvergenceOrder measures one period from the stretched start, so
// that the error is the phase error of the method alone; over many periods
// the energy drift of Heun and RK4 (order h³ and h⁵ per period) shifts the
// period of an anharmonic well as well and blurs the ratio.
func TestConvergenceOrder(t *testing.T) {
	o := morse(t)
	e := 0.1 * morseDe
	st, err := o.FromEnergy(e)
	require.NoError(t, err)
	want := morsePeriod(e) // closed form
	for _, c := range []struct {
		m        motion.Method
		n        int     // coarse steps per harmonic period
		ratio    float64 // expected error ratio on halving the step: 2^order
		lo, hi   float64 // accepted range of the ratio
		minError float64 // the coarse error must exceed rounding by far
	}{
		{motion.Heun, 100, 4, 3.5, 4.5, 1e-5},
		{motion.Verlet, 100, 4, 3.5, 4.5, 1e-5},
		{motion.RK4, 40, 16, 14.5, 17.5, 1e-6},
	} {
		t.Run(c.m.String(), func(t *testing.T) {
			var errs [3]float64
			for i := range errs {
				r, err := o.Run(st, motion.Settings{Method: c.m, StepsPerPeriod: c.n << i, Periods: 1})
				require.NoError(t, err)
				errs[i] = r.Period/want - 1
			}
			require.Greater(t, math.Abs(errs[0]), c.minError)
			for i := 1; i < len(errs); i++ {
				ratio := errs[i-1] / errs[i]
				assert.GreaterOrEqual(t, ratio, c.lo, "errors %v", errs)
				assert.LessOrEqual(t, ratio, c.hi, "errors %v", errs)
			}
		})
	}
}

// maxEnergyError returns max |E − E0| over the samples with t in [from, to).
func maxEnergyError(tr []motion.Sample, e0, from, to float64) float64 {
	var m float64
	for _, s := range tr {
		if s.T >= from && s.T < to {
			m = math.Max(m, math.Abs(s.E-e0))
		}
	}
	return m
}

// TestVerletBoundedEnergy runs 1000 periods and compares the largest
// energy error of the first and the last 100 periods: bounded (ratio near
// 1) for velocity Verlet; Heun, not symplectic, serves as the control that
// the comparison detects a secular drift.
func TestVerletBoundedEnergy(t *testing.T) {
	if testing.Short() {
		t.Skip("1000 periods")
	}
	o := morse(t)
	st, err := o.FromEnergy(0.3 * morseDe)
	require.NoError(t, err)
	for _, c := range []struct {
		m          motion.Method
		bounded    bool
		ratioBound float64
	}{
		{motion.Verlet, true, 1.2},
		{motion.Heun, false, 5},
	} {
		t.Run(c.m.String(), func(t *testing.T) {
			r, err := o.Run(st, motion.Settings{Method: c.m, StepsPerPeriod: 100, Periods: 1000, Record: 1})
			require.NoError(t, err)
			tp := r.TurningPoints
			first := maxEnergyError(r.Trajectory, st.Energy, tp[0], tp[100])
			last := maxEnergyError(r.Trajectory, st.Energy, tp[900], tp[1000])
			t.Logf("%s: max |ΔE|/E first 100 periods %.3g, last 100 %.3g", c.m, first/st.Energy, last/st.Energy)
			if c.bounded {
				assert.Less(t, last/first, c.ratioBound)
				assert.Greater(t, last/first, 1/c.ratioBound)
				assert.Less(t, r.EnergyDrift, 2*first/st.Energy, "the whole run stays within the first 100 periods' error")
			} else {
				assert.Greater(t, last/first, c.ratioBound)
			}
		})
	}
}

// TestDormandPrinceVsQuadrature checks the measured period of the adaptive
// integrator at tight tolerance against two quadratures of the exact
// period, period.Exact and the test's own quadPeriod (gonum Gauss–Legendre
// after the substitution r = m + h·sin θ), to 1e-8 on the Lennard-Jones and
// Buckingham wells.
func TestDormandPrinceVsQuadrature(t *testing.T) {
	for _, s := range systems(t) {
		if s.name == "morse" || s.name == "morse-bond" {
			continue
		}
		o, err := motion.New(s.p, s.mu)
		require.NoError(t, err)
		for _, f := range []float64{0.05, 0.3, 0.6, 0.9} {
			t.Run(fmt.Sprintf("%s/E=%g·Emax", s.name, f), func(t *testing.T) {
				st, err := o.FromEnergy(f * o.MaxEnergy())
				require.NoError(t, err)
				r, err := o.Run(st, motion.Settings{RTol: 1e-12, ATol: 1e-12, Periods: 3})
				require.NoError(t, err)
				ex, err := period.Exact(s.p, o.Well(), s.mu, st.Energy, period.Settings{})
				require.NoError(t, err)
				assert.InDelta(t, 0, r.Period/ex.Period-1, 1e-8, "measured %.15g fs, period.Exact %.15g fs", r.Period, ex.Period)
				ref := quadPeriod(t, s.p, s.mu, st.Energy, 600)
				assert.InDelta(t, 0, ref/ex.Period-1, 1e-11, "the two quadratures agree")
				assert.InDelta(t, 0, r.Period/ref-1, 1e-8, "measured %.15g fs, quadPeriod %.15g fs", r.Period, ref)
			})
		}
	}
}

// TestHarmonic checks the unit conversions on the harmonic form, whose
// period 2π/√(k/μ) does not depend on the amplitude.
func TestHarmonic(t *testing.T) {
	p, err := models.NewHarmonic(30, 1.2)
	require.NoError(t, err)
	o, err := motion.New(p, 7)
	require.NoError(t, err)
	// ω² = k/μ · e/(10⁻²⁰ m²·m_u) in s⁻², 10⁻³⁰ s²/fs² (CODATA 2018).
	want := 2 * math.Pi / math.Sqrt(30.0/7*units.ElectronVolt/(1e-20*units.Dalton)*1e-30)
	assert.Equal(t, math.Inf(1), o.MaxEnergy())
	for _, x0 := range []float64{0.01, -0.5, 1} {
		st, err := o.FromDisplacement(x0)
		require.NoError(t, err)
		assert.InDelta(t, 15*x0*x0, st.Energy, 1e-12*st.Energy, "E = ½kx0²")
		r, err := o.Run(st, motion.Settings{RTol: 1e-12, ATol: 1e-12})
		require.NoError(t, err)
		assert.InDelta(t, 0, r.Period/want-1, 1e-10)
		assert.Less(t, r.EnergyDrift, 1e-10)
	}
}

func TestFromEnergy(t *testing.T) {
	o := morse(t)
	for _, f := range []float64{1e-6, 0.1, 0.5, 0.99} {
		st, err := o.FromEnergy(f * morseDe)
		require.NoError(t, err)
		// Morse stretch turning point x+ = −ln(1 − √(E/De))/a (closed form).
		want := -math.Log(1-math.Sqrt(f)) / morseA
		// V(r) − V(re) − E cancels to about one ulp of De; x ∝ √E.
		tol := 1e-13 + 2*1e-16*morseDe/st.Energy
		assert.InDelta(t, want, st.X0, tol*want, "E/De = %g", f)
		assert.InDelta(t, morseRe+st.X0, st.R0, 1e-15)
		assert.Equal(t, f*morseDe, st.Energy)
	}
}

func TestCompressedStart(t *testing.T) {
	o := morse(t)
	// Compression turning point x− = −ln(1 + √(E/De))/a (closed form).
	e := 0.3 * morseDe
	x := -math.Log(1+math.Sqrt(0.3)) / morseA
	st, err := o.FromDisplacement(x)
	require.NoError(t, err)
	assert.InDelta(t, e, st.Energy, 1e-13)
	r, err := o.Run(st, motion.Settings{Periods: 4})
	require.NoError(t, err)
	assert.InDelta(t, 0, r.Period/morsePeriod(st.Energy)-1, 1e-7)
	// The first outer turning point comes half a period after the start.
	assert.InDelta(t, 0.5*r.Period, r.TurningPoints[0], 1e-6*r.Period)
	assert.Equal(t, 4, r.PeriodsMeasured)
}

func TestRecord(t *testing.T) {
	o := morse(t)
	st, err := o.FromEnergy(0.2 * morseDe)
	require.NoError(t, err)
	r, err := o.Run(st, motion.Settings{Method: motion.RK4, Periods: 2, Record: 10})
	require.NoError(t, err)
	require.Len(t, r.Trajectory, 1+r.Steps/10)
	s0 := r.Trajectory[0]
	assert.Equal(t, motion.Sample{T: 0, R: st.R0, X: st.X0, V: 0, E: s0.E}, s0)
	assert.InDelta(t, st.Energy, s0.E, 1e-14)
	for i, s := range r.Trajectory {
		assert.InDelta(t, st.Energy, s.E, 1e-6*st.Energy)
		assert.InDelta(t, s.R-morseRe, s.X, 1e-14)
		if i > 0 {
			assert.InDelta(t, 10*r.TimeStep, s.T-r.Trajectory[i-1].T, 1e-9)
		}
	}
	r, err = o.Run(st, motion.Settings{Method: motion.RK4, Periods: 2})
	require.NoError(t, err)
	assert.Nil(t, r.Trajectory)
}

// TestConcurrent runs one oscillator from several goroutines; results must
// be identical to a serial run (no shared mutable state, deterministic).
func TestConcurrent(t *testing.T) {
	o := morse(t)
	st, err := o.FromEnergy(0.4 * morseDe)
	require.NoError(t, err)
	want := make(map[motion.Method]motion.Result)
	for _, m := range motion.Methods() {
		want[m], err = o.Run(st, motion.Settings{Method: m, Periods: 2})
		require.NoError(t, err)
	}
	var wg sync.WaitGroup
	got := make([]motion.Result, 16)
	errs := make([]error, 16)
	for i := range got {
		wg.Go(func() {
			got[i], errs[i] = o.Run(st, motion.Settings{Method: motion.Methods()[i%4], Periods: 2})
		})
	}
	wg.Wait()
	for i, r := range got {
		require.NoError(t, errs[i])
		assert.Equal(t, want[r.Method], r)
	}
}

func TestParseMethod(t *testing.T) {
	for _, c := range []struct {
		in   string
		want motion.Method
	}{
		{"heun", motion.Heun}, {"RK4", motion.RK4}, {" verlet ", motion.Verlet},
		{"velocity-verlet", motion.Verlet}, {"dopri", motion.DormandPrince}, {"dopri5", motion.DormandPrince},
	} {
		m, err := motion.ParseMethod(c.in)
		require.NoError(t, err, c.in)
		assert.Equal(t, c.want, m)
	}
	for _, m := range motion.Methods() {
		back, err := motion.ParseMethod(m.String())
		require.NoError(t, err)
		assert.Equal(t, m, back)
	}
	_, err := motion.ParseMethod("euler")
	assert.ErrorIs(t, err, motion.ErrMethod)
	assert.Equal(t, "Method(9)", motion.Method(9).String())
	var zero motion.Settings
	assert.Equal(t, motion.DormandPrince, zero.Method, "the zero value is Dormand–Prince")
}

func TestErrors(t *testing.T) {
	o := morse(t)
	bp, err := models.NewBuckingham(1500, 0.3, 25)
	require.NoError(t, err)
	bk, err := motion.New(bp, 20)
	require.NoError(t, err)
	rb := bp.Domain().Min
	bond := systems(t)[5] // Buckingham matched to the bond: barrier below the depth
	require.Equal(t, "buckingham-bond", bond.name)
	bb, err := motion.New(bond.p, bond.mu)
	require.NoError(t, err)
	require.Less(t, bb.MaxEnergy(), bb.Well().Depth)

	for _, c := range []struct {
		name string
		run  func() error
		is   error
		msg  string
	}{
		{"nil potential", func() error { _, err := motion.New(nil, 1); return err }, core.ErrParam, "nil potential"},
		{"zero mass", func() error { _, err := motion.New(bp, 0); return err }, core.ErrParam, "reduced mass"},
		{"NaN displacement", func() error { _, err := o.FromDisplacement(math.NaN()); return err }, core.ErrParam, "not finite"},
		{"zero displacement", func() error { _, err := o.FromDisplacement(0); return err }, core.ErrParam, "zero displacement"},
		{"tiny displacement", func() error { _, err := o.FromDisplacement(1e-17); return err }, core.ErrParam, "too small"},
		{"r ≤ 0", func() error { _, err := o.FromDisplacement(-morseRe); return err }, core.ErrDomain, "outside the domain"},
		{"compressed beyond the depth", func() error { _, err := o.FromDisplacement(-0.5); return err }, core.ErrDomain, "dissociates"},
		{"energy at the depth", func() error { _, err := o.FromEnergy(morseDe); return err }, core.ErrDomain, "dissociates"},
		{"negative energy", func() error { _, err := o.FromEnergy(-1); return err }, core.ErrParam, "must be finite and > 0"},
		{"zero energy", func() error { _, err := o.FromEnergy(0); return err }, core.ErrParam, "must be finite and > 0"},
		{"infinite energy", func() error { _, err := o.FromEnergy(math.Inf(1)); return err }, core.ErrParam, "must be finite"},
		{"below the Buckingham barrier", func() error { _, err := bk.FromDisplacement(rb - bk.Well().Re - 0.01); return err }, core.ErrDomain, "collapses"},
		{"over the Buckingham barrier", func() error { _, err := bb.FromEnergy(1.01 * bb.MaxEnergy()); return err }, core.ErrDomain, "collapses"},
		{"negative periods", func() error {
			st, _ := o.FromEnergy(1)
			_, err := o.Run(st, motion.Settings{Periods: -1})
			return err
		}, core.ErrParam, "periods"},
		{"negative rtol", func() error {
			st, _ := o.FromEnergy(1)
			_, err := o.Run(st, motion.Settings{RTol: -1})
			return err
		}, core.ErrParam, "rtol"},
		{"bad method", func() error {
			st, _ := o.FromEnergy(1)
			_, err := o.Run(st, motion.Settings{Method: 7})
			return err
		}, motion.ErrMethod, "7"},
		{"zero start", func() error { _, err := o.Run(motion.Start{}, motion.Settings{}); return err }, core.ErrParam, "FromDisplacement"},
		{"start beyond the depth", func() error {
			_, err := o.Run(motion.Start{X0: 1, R0: 2.27, Energy: 5}, motion.Settings{})
			return err
		}, core.ErrDomain, "dissociates"},
		{"max time too short", func() error {
			st, _ := o.FromEnergy(1)
			_, err := o.Run(st, motion.Settings{MaxTime: 5})
			return err
		}, core.ErrNoConvergence, "turning points"},
		{"energy driven over the barrier", func() error {
			st, _ := bb.FromEnergy(0.9 * bb.MaxEnergy())
			_, err := bb.Run(st, motion.Settings{Method: motion.Heun, StepsPerPeriod: 3})
			return err
		}, core.ErrNoConvergence, "too large"},
		{"step over the barrier", func() error {
			st, _ := bb.FromEnergy(0.9 * bb.MaxEnergy())
			_, err := bb.Run(st, motion.Settings{Method: motion.Verlet, StepsPerPeriod: 2})
			return err
		}, core.ErrDomain, "left the domain"},
	} {
		t.Run(c.name, func(t *testing.T) {
			err := c.run()
			require.Error(t, err)
			assert.True(t, errors.Is(err, c.is), "%v does not wrap %v", err, c.is)
			assert.Contains(t, err.Error(), c.msg)
		})
	}
}

// TestNearBarrier runs Dormand–Prince close to the Buckingham barrier,
// where trial steps may leave the domain and must be rejected, not fail.
func TestNearBarrier(t *testing.T) {
	bond := systems(t)[5]
	o, err := motion.New(bond.p, bond.mu)
	require.NoError(t, err)
	st, err := o.FromEnergy(0.99 * o.MaxEnergy())
	require.NoError(t, err)
	r, err := o.Run(st, motion.Settings{Periods: 3})
	require.NoError(t, err)
	ref := quadPeriod(t, bond.p, bond.mu, st.Energy, 800)
	assert.InDelta(t, 0, r.Period/ref-1, 1e-6)
}

// TestMaxSteps: a run that needs more steps than Settings.MaxSteps fails
// with ErrTooManySteps, for fixed and adaptive steps; one within it is
// unchanged.
func TestMaxSteps(t *testing.T) {
	o := morse(t)
	st, err := o.FromEnergy(0.1 * morseDe)
	require.NoError(t, err)
	for _, m := range motion.Methods() {
		full, err := o.Run(st, motion.Settings{Method: m, Periods: 2, Record: 1})
		require.NoError(t, err)
		_, err = o.Run(st, motion.Settings{Method: m, Periods: 2, Record: 1, MaxSteps: full.Steps - 1})
		assert.ErrorIs(t, err, motion.ErrTooManySteps, m.String())
		r, err := o.Run(st, motion.Settings{Method: m, Periods: 2, Record: 1, MaxSteps: full.Steps})
		require.NoError(t, err, m.String())
		assert.Equal(t, full.Period, r.Period)
		assert.Len(t, r.Trajectory, full.Steps+1)
	}
	_, err = o.Run(st, motion.Settings{MaxSteps: -1})
	assert.ErrorIs(t, err, core.ErrParam)
}

// TestEnergyFloor: at a tiny energy the energy of the steps comes from the
// Taylor series at re, so the rounding floor stays small and the energy
// error of the integrator is resolved; with only c₂ known (no series), the
// floor is that of V(r) − V(re), ≈ 8ε·De/E, and the error lies below it.
func TestEnergyFloor(t *testing.T) {
	o := morse(t)
	st, err := o.FromEnergy(1e-12)
	require.NoError(t, err)
	res, err := o.Run(st, motion.Settings{Method: motion.RK4})
	require.NoError(t, err)
	assert.Less(t, res.EnergyFloor, 1e-13)
	assert.Greater(t, res.EnergyDrift, res.EnergyFloor)

	w := o.Well()
	w.Series, w.Taylor = nil, w.Taylor[:3]
	bare, err := motion.NewFromWell(morsePot(t), w, morseMu)
	require.NoError(t, err)
	st, err = bare.FromEnergy(1e-12)
	require.NoError(t, err)
	res, err = bare.Run(st, motion.Settings{Method: motion.DormandPrince})
	require.NoError(t, err)
	// 8ε·De/E = 8·2.2e-16·4.4/1e-12 ≈ 7.8e-3, counted twice.
	assert.Greater(t, res.EnergyFloor, 1e-3)
	assert.LessOrEqual(t, res.EnergyDrift, res.EnergyFloor)
}
