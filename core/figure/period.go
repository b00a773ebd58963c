package figure

import (
	"errors"
	"fmt"
	"math"
	"runtime"
	"sync"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/motion"
	"github.com/pairwell/pairwell/core/period"
)

// Defaults of Period.
const (
	// DefaultAmplitudes is the number of amplitudes at which the period
	// is measured when PeriodOptions.Amplitudes is empty.
	DefaultAmplitudes = 8
	// DefaultTopFraction is the largest oscillation energy of the default
	// amplitudes, as a fraction of the limit of bound motion (the depth,
	// or an inner barrier when lower): there the Morse period is already
	// 1/√(1 − 0.9) ≈ 3.2 times the harmonic one.
	DefaultTopFraction = 0.9
	// curvePoints is the number of points of the period curves.
	curvePoints = 241
	// nearLimit and maxPeriodRatio bound the runs: an energy within
	// nearLimit (relative) of the limit of bound motion, or an exact
	// period beyond maxPeriodRatio harmonic periods, is refused.
	nearLimit      = 1e-6
	maxPeriodRatio = 1000
)

// PeriodOptions controls Period.
type PeriodOptions struct {
	// Name names the form in the title.
	Name string
	// Mu is the reduced mass in u, > 0.
	Mu float64
	// Amplitudes are starting displacements x0 = r0 − re in Å (at rest;
	// positive stretches, negative compresses). The curves run from 0 to
	// the extreme amplitudes, and measured points are drawn at each of
	// them but those too small to start a motion (0). Empty means DefaultAmplitudes stretches evenly spaced up to
	// the one whose energy is DefaultTopFraction of the limit of bound
	// motion (for an unbounded well, up to re/2).
	Amplitudes []float64
	// EnergyAxis puts the oscillation energy E = V(re + x0) − V(re) in
	// eV on the x axis instead of the amplitude.
	EnergyAxis bool
	// Measure adds the periods measured by integrating the motion with
	// Method (package motion) at each amplitude over Periods periods
	// (zero: motion.DefaultPeriods).
	Measure bool
	Method  motion.Method
	Periods int
}

// Period returns the picture of the period of the classical vibration
// against its amplitude (or energy) in the well of p for the reduced mass
// o.Mu.
//
// Series, in order, on a common grid of 241 abscissae from the smallest
// to the largest of 0 and the amplitudes (energies): "exact" (Reference,
// the period by quadrature, period.Integrator.Sweep), "harmonic"
// (Approximation, T0 = 2π√(μ/k) at every point), "perturbative"
// (Approximation, second-order Lindstedt–Poincaré, period.Perturbative;
// left out when the form has no fourth derivative, NaN where the
// expansion predicts no oscillation) and, with o.Measure, "measured"
// (Measured, one point per amplitude). On the amplitude axis x is the
// starting displacement x0 and the energy E = V(re + x0) − V(re); on the
// energy axis x is E.
//
// Errors wrap core.ErrParam (bad options), core.ErrDomain (an amplitude
// outside the domain, at or too near the limit of bound motion) or the
// analysis' errors; a run that fails wraps its error.
func Period(p core.Potential, o PeriodOptions) (*Figure, error) {
	if o.Periods < 0 {
		return nil, fmt.Errorf("figure: %w: %d periods, must be ≥ 0", core.ErrParam, o.Periods)
	}
	w, osc, err := oscillator(p, o.Mu)
	if err != nil {
		return nil, err
	}
	t0 := osc.Harmonic().PeriodFs
	top := osc.MaxEnergy()
	amps := o.Amplitudes
	if len(amps) == 0 {
		xmax := 0.5 * w.Re
		if !math.IsInf(top, 1) {
			st, err := osc.FromEnergy(DefaultTopFraction * top)
			if err != nil {
				return nil, fmt.Errorf("figure: default amplitudes: %w", err)
			}
			xmax = st.X0
		}
		for k := 1; k <= DefaultAmplitudes; k++ {
			amps = append(amps, xmax*float64(k)/DefaultAmplitudes)
		}
	}
	in, err := period.NewIntegrator(period.Settings{})
	if err != nil {
		return nil, err
	}
	var (
		starts []motion.Start
		exacts []period.Result
		lo, hi float64
	)
	for _, a := range amps {
		st, ex, err := start(p, osc, in, a)
		if errors.Is(err, core.ErrParam) && !math.IsNaN(a) && !math.IsInf(a, 0) {
			// A zero amplitude (or one too small for V(re + x0) − V(re)
			// to exceed rounding) has no motion: T = T0, drawn by the
			// curves.
			continue
		}
		if err != nil {
			return nil, err
		}
		starts, exacts = append(starts, st), append(exacts, ex)
		lo, hi = math.Min(lo, a), math.Max(hi, a)
	}
	if len(starts) == 0 {
		return nil, fmt.Errorf("figure: %w: no amplitude with motion: every amplitude is zero or too small to move", core.ErrParam)
	}

	// The grid: amplitudes, or energies, and the energy of each point.
	var xs, es []float64
	if o.EnergyAxis {
		emax := 0.0
		for _, st := range starts {
			emax = math.Max(emax, st.Energy)
		}
		xs = linspace(0, emax, curvePoints)
		es = xs
	} else {
		xs = linspace(lo, hi, curvePoints)
		rs := make([]float64, len(xs))
		for i, x := range xs {
			rs[i] = w.Re + x
		}
		vs := make([]float64, len(xs))
		if err := batchInDomain(p, 0, rs, vs); err != nil {
			return nil, fmt.Errorf("figure: energies of the amplitudes: %w", err)
		}
		es = make([]float64, len(xs))
		ex := core.NewExpansion(w) // the series at re near re, without cancellation
		for i, v := range vs {
			e, _ := ex.Energy(xs[i], v, w.Energy)
			es[i] = math.Max(0, e)
			if xs[i] == 0 {
				es[i] = 0
			}
		}
	}
	exact := make([]float64, len(xs))
	res, errs := in.Sweep(p, w, o.Mu, es, nil)
	for i := range exact {
		exact[i] = math.NaN()
		if errs[i] == nil {
			exact[i] = res[i].Period
		}
	}
	harm := make([]float64, len(xs))
	for i := range harm {
		harm[i] = t0
	}

	what := "amplitude"
	xlabel := "amplitude x0 = r0 − re, released at rest [Å]"
	if o.EnergyAxis {
		what = "oscillation energy"
		xlabel = "oscillation energy E = V(r0) − V(re) [eV]"
	}
	f := &Figure{
		Kind:   "period",
		Title:  fmt.Sprintf("%s, μ = %.4g u: period of the vibration against its %s\nharmonic T0 = 2π/ω0 = %.4g fs; %s", o.Name, o.Mu, what, t0, boundText(osc, w)),
		XLabel: xlabel,
		YLabel: "period T [fs]",
		XMin:   xs[0], XMax: xs[len(xs)-1],
	}
	f.Series = append(f.Series,
		Series{Name: "exact (quadrature)", Role: Reference, X: xs, Y: exact},
		Series{Name: "harmonic 2π/ω0", Role: Approximation, X: xs, Y: harm},
	)
	if len(w.Taylor) > 4 {
		pert := make([]float64, len(xs))
		for i, e := range es {
			pert[i] = math.NaN()
			if t, err := period.Perturbative(w, o.Mu, e); err == nil {
				pert[i] = t
			}
		}
		f.Series = append(f.Series, Series{Name: "perturbative (2nd order)", Role: Approximation, X: xs, Y: pert})
	} else {
		f.Notes = append(f.Notes, fmt.Sprintf("no perturbative period: it needs V⁗(re), and the form has derivatives up to order %d", p.MaxOrder()))
	}
	dlo, dhi := extent(exact, harm)
	if o.Measure {
		mx, my, worst, err := measure(osc, starts, exacts, o)
		if err != nil {
			return nil, err
		}
		if o.EnergyAxis {
			for i, st := range starts {
				mx[i] = st.Energy
			}
		}
		f.Series = append(f.Series, Series{Name: fmt.Sprintf("measured (%s)", o.Method), Role: Measured, X: mx, Y: my})
		f.Notes = append(f.Notes, fmt.Sprintf("measured by %s over %d periods at %d amplitudes: largest |T_measured/T_exact − 1| = %.2g",
			o.Method, periodsOf(o), len(starts), worst))
		mlo, mhi := extent(my)
		dlo, dhi = math.Min(dlo, mlo), math.Max(dhi, mhi)
	}
	if math.IsNaN(dlo) {
		return nil, fmt.Errorf("figure: %w: no period could be computed", core.ErrDomain)
	}
	// Start the axis at 0 unless the empty space below the data would
	// be larger than the data's span.
	// A curve flat to rounding (the harmonic form) is shown from 0.
	if dhi-dlo < 1e-6*dhi {
		f.YMin, f.YMax = 0, 1.1*dhi
	} else {
		f.YMin, f.YMax = fitWindow(0, math.Inf(1), dlo, dhi)
		if dhi-dlo > dlo {
			f.YMin = 0
		}
	}
	if !(f.XMin < f.XMax) {
		return nil, fmt.Errorf("figure: %w: the amplitudes span no range", core.ErrParam)
	}
	return f, nil
}

// oscillator analyses the well of p to order 4 (or the form's MaxOrder)
// and prepares the motion of the reduced mass mu.
func oscillator(p core.Potential, mu float64) (core.Well, *motion.Oscillator, error) {
	if err := core.Positive.Check("reduced mass", mu); err != nil {
		return core.Well{}, nil, fmt.Errorf("figure: %w", err)
	}
	w, err := core.AnalyzeWell(p, core.WellSettings{Order: min(4, p.MaxOrder())})
	if err != nil {
		return core.Well{}, nil, fmt.Errorf("figure: %w", err)
	}
	osc, err := motion.NewFromWell(p, w, mu)
	if err != nil {
		return core.Well{}, nil, fmt.Errorf("figure: %w", err)
	}
	return w, osc, nil
}

// start returns the start at rest at displacement x0 and the exact period
// of its motion, refusing energies too near the limit of bound motion,
// where the period diverges and an integration would not end.
func start(p core.Potential, osc *motion.Oscillator, in *period.Integrator, x0 float64) (motion.Start, period.Result, error) {
	st, err := osc.FromDisplacement(x0)
	if err != nil {
		return motion.Start{}, period.Result{}, fmt.Errorf("figure: amplitude %g Å: %w", x0, err)
	}
	tooLong := func(detail string) error {
		return fmt.Errorf("figure: %w: amplitude %g Å: E = %.6g eV is too close to the limit of bound motion (%.6g eV): %s",
			core.ErrDomain, x0, st.Energy, osc.MaxEnergy(), detail)
	}
	if lim := osc.MaxEnergy(); st.Energy > (1-nearLimit)*lim {
		return motion.Start{}, period.Result{}, tooLong("the period diverges there")
	}
	ex, err := in.Exact(p, osc.Well(), osc.Mu(), st.Energy)
	if err != nil && !errors.Is(err, core.ErrNoConvergence) {
		return motion.Start{}, period.Result{}, fmt.Errorf("figure: amplitude %g Å: exact period: %w", x0, err)
	}
	if ratio := ex.Period / osc.Harmonic().PeriodFs; ratio > maxPeriodRatio {
		return motion.Start{}, period.Result{}, tooLong(fmt.Sprintf("the period is %.4g harmonic periods", ratio))
	}
	return st, ex, nil
}

// periodsOf returns the number of periods a run measures.
func periodsOf(o PeriodOptions) int {
	if o.Periods == 0 {
		return motion.DefaultPeriods
	}
	return o.Periods
}

// measure runs the integrator from every start, in parallel, and returns
// the amplitudes, the measured periods and the largest relative deviation
// from the exact periods.
func measure(osc *motion.Oscillator, starts []motion.Start, exact []period.Result, o PeriodOptions) (xs, ts []float64, worst float64, err error) {
	n := len(starts)
	xs, ts = make([]float64, n), make([]float64, n)
	errs := make([]error, n)
	var wg sync.WaitGroup
	sem := make(chan struct{}, max(1, runtime.GOMAXPROCS(0)))
	for i := range starts {
		wg.Add(1)
		go func() {
			defer wg.Done()
			sem <- struct{}{}
			defer func() { <-sem }()
			st := starts[i]
			set := motion.Settings{Method: o.Method, Periods: periodsOf(o)}
			t0 := osc.Harmonic().PeriodFs
			// Room for the periods, the half period of a compressed
			// start and a lengthening of the period by the energy drift.
			set.MaxTime = max(100*float64(set.Periods+1)*t0, 2*float64(set.Periods+1)*exact[i].Period)
			res, err := osc.Run(st, set)
			if err != nil {
				errs[i] = fmt.Errorf("figure: %s run at amplitude %g Å: %w", o.Method, st.X0, err)
				return
			}
			xs[i], ts[i] = st.X0, res.Period
		}()
	}
	wg.Wait()
	if err := errors.Join(errs...); err != nil {
		return nil, nil, 0, err
	}
	for i := range ts {
		worst = math.Max(worst, math.Abs(ts[i]/exact[i].Period-1))
	}
	return xs, ts, worst, nil
}

// boundText says up to which energy the motion is bound.
func boundText(osc *motion.Oscillator, w core.Well) string {
	lim := osc.MaxEnergy()
	switch {
	case math.IsInf(lim, 1):
		return "the well has no top"
	case lim < w.Depth:
		return fmt.Sprintf("bound below the inner barrier, %.4g eV above the minimum", lim)
	}
	return fmt.Sprintf("bound below the depth, %.4g eV", lim)
}
