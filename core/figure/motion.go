package figure

import (
	"fmt"
	"math"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/motion"
	"github.com/pairwell/pairwell/core/period"
)

// harmonicPoints is the number of points per harmonic period of the
// harmonic motion drawn by Motion.
const harmonicPoints = 200

// MotionOptions controls Motion.
type MotionOptions struct {
	// Name names the form in the title.
	Name string
	// Mu is the reduced mass in u, > 0.
	Mu float64
	// Amplitude is the starting displacement x0 = r0 − re in Å, at rest
	// (positive stretches, negative compresses).
	Amplitude float64
	// Method is the integrator (zero: Dormand–Prince).
	Method motion.Method
	// Periods is the number of periods integrated, measured between
	// stretch-side turning points; zero means motion.DefaultPeriods, as for "pairwell motion".
	Periods int
}

// Motion returns the picture of the displacement x(t) = r(t) − re of the
// vibration started at rest at x0 = o.Amplitude, integrated with o.Method
// (motion.Oscillator.Run, every accepted step recorded), against the
// harmonic motion x0·cos(ω0 t), ω0 = √(k/μ), over the same time.
//
// Series: "integrated (METHOD)" (Reference, t in fs and x in Å at every
// step) and "harmonic x0·cos(ω0 t)" (Approximation, 200 points per
// harmonic period). The time axis is the run's duration; the displacement
// axis is fitted to both curves.
//
// Errors wrap core.ErrParam (bad options), core.ErrDomain (an amplitude
// outside the domain, at or too near the limit of bound motion) or the
// run's errors.
func Motion(p core.Potential, o MotionOptions) (*Figure, error) {
	if o.Periods < 0 {
		return nil, fmt.Errorf("figure: %w: %d periods, must be ≥ 0", core.ErrParam, o.Periods)
	}
	periods := o.Periods
	if periods == 0 {
		periods = motion.DefaultPeriods
	}
	w, osc, err := oscillator(p, o.Mu)
	if err != nil {
		return nil, err
	}
	in, err := period.NewIntegrator(period.Settings{})
	if err != nil {
		return nil, err
	}
	st, ex, err := start(p, osc, in, o.Amplitude)
	if err != nil {
		return nil, err
	}
	h := osc.Harmonic()
	set := motion.Settings{Method: o.Method, Periods: periods, Record: 1}
	set.MaxTime = max(100*float64(periods+1)*h.PeriodFs, 2*float64(periods+1)*ex.Period)
	res, err := osc.Run(st, set)
	if err != nil {
		return nil, fmt.Errorf("figure: %s run: %w", o.Method, err)
	}
	ts := make([]float64, len(res.Trajectory))
	xs := make([]float64, len(res.Trajectory))
	for i, s := range res.Trajectory {
		ts[i], xs[i] = s.T, s.X
	}
	n := max(2, int(math.Ceil(res.Duration/h.PeriodFs*harmonicPoints))+1)
	ht := linspace(0, res.Duration, n)
	hx := make([]float64, n)
	for i, t := range ht {
		hx[i] = st.X0 * math.Cos(h.Omega*t)
	}

	energy := fmt.Sprintf("E = %.4g eV", st.Energy)
	switch lim := osc.MaxEnergy(); {
	case math.IsInf(lim, 1):
	case lim < w.Depth:
		energy += fmt.Sprintf(", %.3g %% of the inner barrier", 100*st.Energy/lim)
	default:
		energy += fmt.Sprintf(", %.3g %% of the depth", 100*st.Energy/lim)
	}
	f := &Figure{
		Kind: "motion",
		Title: fmt.Sprintf("%s, μ = %.4g u: released at rest at x0 = %.4g Å, %s\nperiod: measured %.5g fs, exact %.5g fs, harmonic T0 = %.5g fs",
			o.Name, o.Mu, st.X0, energy, res.Period, ex.Period, h.PeriodFs),
		XLabel: "time t [fs]",
		YLabel: "displacement x = r − re [Å]",
		XMin:   0, XMax: res.Duration,
		Series: []Series{
			{Name: fmt.Sprintf("integrated (%s)", o.Method), Role: Reference, X: ts, Y: xs},
			{Name: "harmonic x0·cos(ω0 t)", Role: Approximation, X: ht, Y: hx},
		},
		Notes: []string{fmt.Sprintf("turning points of the exact motion: r = %.6g Å and %.6g Å (re = %.6g Å); %d periods measured, relative energy drift %.2g",
			ex.Inner, ex.Outer, w.Re, res.PeriodsMeasured, res.EnergyDrift)},
	}
	dlo, dhi := extent(xs, hx)
	m := 0.08 * (dhi - dlo)
	f.YMin, f.YMax = dlo-m, dhi+m
	if !(f.XMax > 0) {
		return nil, fmt.Errorf("figure: %w: the run lasted no time", core.ErrNoConvergence)
	}
	return f, nil
}
