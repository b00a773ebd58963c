package report

import (
	"errors"
	"fmt"
	"math"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/motion"
	"github.com/pairwell/pairwell/core/period"
)

// Motion is an integrated vibration and its measured period, compared with
// the exact, harmonic and perturbative periods. JSON keys are a contract;
// values are in eV, Å, u and fs.
type Motion struct {
	Model  string  `json:"model"`
	Params Params  `json:"params"`
	Pair   Text    `json:"pair"`
	Mu     float64 `json:"reduced_mass_u"`
	Method string  `json:"method"`
	Re     float64 `json:"equilibrium_r_angstrom"`
	// Amplitude is the starting displacement x0 = r0 − re (negative when
	// compressed); for a start by energy, the stretch-side turning point.
	Amplitude float64 `json:"amplitude_angstrom"`
	R0        float64 `json:"start_r_angstrom"`
	Energy    float64 `json:"energy_ev"`
	// DepthFraction is E over the well depth V(∞) − V(re); NaN (null)
	// for an unbounded well.
	DepthFraction Number `json:"depth_fraction"`
	// BoundFraction is E over the limit of bound motion (the depth, or
	// an inner barrier when lower); 0 for an unbounded well. It decides
	// the note on the validated range of the default step.
	BoundFraction float64 `json:"-"`

	MeasuredPeriod   float64 `json:"measured_period_fs"`
	ExactPeriod      float64 `json:"exact_period_fs"`
	ExactPeriodError float64 `json:"exact_period_relative_error_estimate"`
	// MeasuredError is MeasuredPeriod/ExactPeriod − 1.
	MeasuredError  float64 `json:"measured_relative_error"`
	HarmonicPeriod float64 `json:"harmonic_period_fs"`
	// PerturbativePeriod is NaN (null) where the expansion breaks down
	// or c₄ is unknown.
	PerturbativePeriod Number  `json:"perturbative_period_fs"`
	PeriodSpread       float64 `json:"period_spread_fs"`
	PeriodsMeasured    int     `json:"periods_measured"`
	InnerTurningPoint  float64 `json:"inner_turning_point_angstrom"`
	OuterTurningPoint  float64 `json:"outer_turning_point_angstrom"`
	// RelativeEnergyDrift and FinalEnergyError are null when they are at
	// or below RelativeEnergyFloor, the rounding floor of the energies
	// (motion.Result.EnergyFloor): then they measure rounding, not the
	// integrator.
	RelativeEnergyDrift Number  `json:"relative_energy_drift"`
	FinalEnergyError    Number  `json:"final_relative_energy_error"`
	RelativeEnergyFloor float64 `json:"relative_energy_rounding_floor"`
	// Notes are remarks on the accuracy of the run, e.g. an energy above
	// the range in which the default step was validated.
	Notes []string `json:"notes"`

	TimeStep       float64 `json:"time_step_fs"`
	StepsPerPeriod float64 `json:"steps_per_period"`
	Steps          int     `json:"steps"`
	Rejected       int     `json:"rejected_steps"`
	ForceEvals     int     `json:"force_evaluations"`
	Duration       float64 `json:"duration_fs"`
	// RTol and ATol are the tolerances used by Dormand–Prince; nil for
	// the fixed-step methods.
	RTol *float64 `json:"rtol"`
	ATol *float64 `json:"atol"`

	// Trajectory and TrajectorySamples name the file the trajectory was
	// written to and its length; set by the caller that writes it (null
	// and 0 without one).
	Trajectory        Text `json:"trajectory_file"`
	TrajectorySamples int  `json:"trajectory_samples"`
}

// MotionStart is the start of a motion: at rest at r0 = re + Amplitude (Å;
// positive stretches, negative compresses) or, when ByEnergy, at the
// stretch-side turning point of the oscillation energy Energy (eV above
// V(re)).
type MotionStart struct {
	Amplitude float64
	Energy    float64
	ByEnergy  bool
}

// StartError is the error of NewMotion when the start is not an
// oscillation in the well: zero or non-finite, outside the domain, or at
// or above the limit of bound motion. Err wraps core.ErrParam or
// core.ErrDomain.
type StartError struct{ Err error }

func (e *StartError) Error() string { return e.Err.Error() }
func (e *StartError) Unwrap() error { return e.Err }

// ErrTooLong is wrapped by the error of NewMotion when the period is out
// of reach of an integration: the energy is within a relative 1e-6 of the
// limit of bound motion, or the exact period exceeds 1000 harmonic
// periods. For Morse both mean E/De > 1 − 10⁻⁶, where T = T₀/√(1 − E/De)
// exceeds 1000·T₀.
var ErrTooLong = errors.New("period too long to integrate")

const (
	nearLimit      = 1e-6
	maxPeriodRatio = 1000
)

// tooLongError is an ErrTooLong with its message.
type tooLongError struct{ msg string }

func (e *tooLongError) Error() string { return e.msg }
func (e *tooLongError) Unwrap() error { return ErrTooLong }

// NewMotion integrates the classical vibration μ r̈ = −V′(r) of the pair of
// reduced mass m.Mu (u) in the well of inst from start, with s (s.MaxTime
// is set from the exact period), and compares the measured period with the
// exact, harmonic and perturbative ones. It returns the trajectory that
// s.Record asks for.
//
// The error is a *StartError for a start that is not an oscillation,
// wraps ErrTooLong when the period is out of reach, and is prefixed with
// the model key otherwise.
func NewMotion(inst core.Instance, m Mass, start MotionStart, s motion.Settings) (Motion, []motion.Sample, error) {
	p := inst.Potential
	key := inst.Model.Info().Key
	w, err := wellOf(inst, 0)
	if err != nil {
		return Motion{}, nil, err
	}
	o, err := motion.NewFromWell(p, w, m.Mu)
	if err != nil {
		return Motion{}, nil, fmt.Errorf("%s: %w", key, err)
	}
	var st motion.Start
	if start.ByEnergy {
		st, err = o.FromEnergy(start.Energy)
	} else {
		st, err = o.FromDisplacement(start.Amplitude)
	}
	if err != nil {
		return Motion{}, nil, &StartError{err}
	}
	t0 := o.Harmonic().PeriodFs
	lim := o.MaxEnergy()
	tooLong := func(detail string) error {
		return &tooLongError{fmt.Sprintf("%s: E = %.6g eV is too close to the limit of bound motion (%.6g eV): %s, too long to integrate; choose a smaller amplitude or energy",
			key, st.Energy, lim, detail)}
	}
	if st.Energy > (1-nearLimit)*lim {
		return Motion{}, nil, tooLong(fmt.Sprintf("E/limit = 1 − %.2g, the period diverges there", 1-st.Energy/lim))
	}
	ex, err := period.Exact(p, w, m.Mu, st.Energy, period.Settings{})
	if err != nil {
		return Motion{}, nil, fmt.Errorf("%s: exact period: %w", key, err)
	}
	if ratio := ex.Period / t0; ratio > maxPeriodRatio {
		return Motion{}, nil, tooLong(fmt.Sprintf("the period is %.4g fs, %.4g harmonic periods", ex.Period, ratio))
	}
	periods := s.Periods
	if periods == 0 {
		periods = motion.DefaultPeriods
	}
	s.MaxTime = maxTime(periods, t0, ex.Period)
	res, err := o.Run(st, s)
	if err != nil {
		return Motion{}, nil, fmt.Errorf("%s: %w", key, err)
	}
	pert := math.NaN()
	if t, err := period.Perturbative(w, m.Mu, st.Energy); err == nil {
		pert = t
	}
	r := Motion{
		Model:               key,
		Params:              NewParams(inst),
		Pair:                Text(m.Pair),
		Mu:                  m.Mu,
		Method:              res.Method.String(),
		Re:                  w.Re,
		Amplitude:           st.X0,
		R0:                  st.R0,
		Energy:              st.Energy,
		MeasuredPeriod:      res.Period,
		ExactPeriod:         ex.Period,
		ExactPeriodError:    ex.ErrorEstimate,
		MeasuredError:       res.Period/ex.Period - 1,
		HarmonicPeriod:      res.HarmonicPeriod,
		PerturbativePeriod:  Number(pert),
		PeriodSpread:        res.PeriodSpread,
		PeriodsMeasured:     res.PeriodsMeasured,
		InnerTurningPoint:   ex.Inner,
		OuterTurningPoint:   ex.Outer,
		RelativeEnergyDrift: aboveFloor(res.EnergyDrift, res.EnergyFloor),
		FinalEnergyError:    aboveFloor(res.FinalEnergyError, res.EnergyFloor),
		RelativeEnergyFloor: res.EnergyFloor,
		TimeStep:            res.TimeStep,
		StepsPerPeriod:      res.StepsPerPeriod,
		Steps:               res.Steps,
		Rejected:            res.Rejected,
		ForceEvals:          res.ForceEvals,
		Duration:            res.Duration,
	}
	r.DepthFraction = Number(math.NaN())
	if w.Bounded() {
		r.DepthFraction = Number(st.Energy / w.Depth)
	}
	if !math.IsInf(lim, 1) {
		r.BoundFraction = st.Energy / lim
	}
	if r.BoundFraction > motion.ValidatedFraction && s.StepsPerPeriod == 0 && s.RTol == 0 && s.ATol == 0 {
		r.Notes = append(r.Notes, fmt.Sprintf("E is %.3g of the limit of bound motion, above the %.2g up to which the default step of %s was validated "+
			"(period error target %.0e): that accuracy is not guaranteed here; compare with a finer step (%s)",
			r.BoundFraction, motion.ValidatedFraction, res.Method, res.Method.Target(), finer(res.Method)))
	}
	if math.IsNaN(float64(r.RelativeEnergyDrift)) {
		r.Notes = append(r.Notes, fmt.Sprintf("the energy error is below the rounding floor of the energies (%.2g relative): it is not resolved", res.EnergyFloor))
	}
	if res.Method == motion.DormandPrince {
		rt, at := s.RTol, s.ATol
		if rt == 0 {
			rt = motion.DefaultRTol
		}
		if at == 0 {
			at = motion.DefaultATol
		}
		r.RTol, r.ATol = &rt, &at
	}
	if r.Notes == nil {
		r.Notes = []string{}
	}
	return r, res.Trajectory, nil
}

// aboveFloor returns v, or NaN (null) when |v| is at or below the rounding
// floor.
func aboveFloor(v, floor float64) Number {
	if math.Abs(v) <= floor {
		return Number(math.NaN())
	}
	return Number(v)
}

// finer names the option that refines the step of m.
func finer(m motion.Method) string {
	if m == motion.DormandPrince {
		return "--rtol, --atol"
	}
	return "--steps-per-period"
}
