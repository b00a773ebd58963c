package main

import (
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"math"
	"strconv"

	"github.com/spf13/cobra"

	"github.com/pairwell/pairwell/core/motion"
	"github.com/pairwell/pairwell/core/report"
	"github.com/pairwell/pairwell/core/units"
)

func newMotionCmd(e *env) *cobra.Command {
	var (
		mass                      massFlags
		amplitude, energy, method string
		trajectory                string
		stepsPerPeriod, periods   int
		rtol, atol                float64
	)
	cmd := &cobra.Command{
		Use:   "motion SPEC (--pair A-B | --mu M) (--amplitude X | --energy E)",
		Short: "Integrate the classical vibration and measure its period against the exact one",
		Long: `motion integrates the classical vibration of the pair in the well of SPEC,
μ r̈ = −V′(r), starting at rest at r0 = re + X (--amplitude; positive stretches,
negative compresses) or at the stretch-side turning point of the oscillation
energy E above V(re) (--energy). It measures the period between successive
outer (stretch-side) turning points, located within a step by cubic Hermite
interpolation of v(t) refined by Newton iterations on partial steps, and
compares it with the exact period T(E) = √(2μ)∫dr/√(E − V + V(re)) by
quadrature, the harmonic period 2π/ω0 and the second-order perturbative
(Lindstedt–Poincaré) period.

Integrators (--method):
  heun    Heun / explicit trapezoid, order 2        default ` + strconv.Itoa(motion.DefaultHeunSteps) + ` steps per harmonic period
  verlet  velocity Verlet, order 2, symplectic      default ` + strconv.Itoa(motion.DefaultVerletSteps) + ` steps per harmonic period
  rk4     classical Runge–Kutta, order 4            default ` + strconv.Itoa(motion.DefaultRK4Steps) + ` steps per harmonic period
  dopri   adaptive Dormand–Prince 5(4) (default)    default --rtol ` + fmt.Sprint(motion.DefaultRTol) + `, --atol ` + fmt.Sprint(motion.DefaultATol) + `
At the defaults the measured period is within 1e-4 of the exact one for heun
and verlet, 1e-6 for rk4 and 1e-7 for dopri, at energies up to half the depth
(measured on Morse, Lennard-Jones and Buckingham wells over 10 periods).

relative_energy_drift is max |E(t) − E0|/E0 over the steps, where
E(t) = ½μv² + V(r) − V(re) and E0 is the oscillation energy. --trajectory writes
every step as CSV: t_fs, r_angstrom, x_angstrom (r − re), v_angstrom_per_fs and
energy_ev (= E(t)).

JSON values are in eV, Å, u and fs, whatever the input units.`,
		Example: `  pairwell motion morse:De=4.6,a=1.87,re=1.27 --pair H-Cl --amplitude 0.2
  pairwell motion morse:De=4.6,a=1.87,re=1.27 --pair H-Cl --energy 2.3eV --method verlet --format json
  pairwell motion lj:epsilon=120K,sigma=3.4 --pair Ar-Ar --amplitude -0.3 --method rk4 --periods 20
  pairwell motion buckingham:A=1500,rho=0.3,C=25 --mu 20 --energy 20K --trajectory run.csv`,
		Args: exactArgs(1, "SPEC"),
		RunE: func(cmd *cobra.Command, args []string) error {
			amplitudeSet := cmd.Flags().Changed("amplitude")
			energyIsUsed := cmd.Flags().Changed("energy")
			m, err := mass.resolve(true)
			if err != nil {
				return err
			}
			switch {
			case amplitudeSet && energyIsUsed:
				return usageErr(errors.New("--amplitude and --energy both given: use one"))
			case !amplitudeSet && !energyIsUsed:
				return usageErr(errors.New("a start is needed: give --amplitude X (Å; positive stretches, negative compresses) or --energy E (eV above the minimum)"))
			}
			set := motion.Settings{Periods: periods, StepsPerPeriod: stepsPerPeriod, RTol: rtol, ATol: atol}
			if set.Method, err = motion.ParseMethod(method); err != nil {
				return usageErr(fmt.Errorf("--method: %w", err))
			}
			if err := checkMotionFlags(cmd, set); err != nil {
				return err
			}
			set.MaxSteps = maxSteps
			if trajectory != "" {
				if err := e.checkOutput("--trajectory", trajectory); err != nil {
					return err
				}
				set.Record = 1
				set.MaxSteps = maxTrajectorySteps
			}
			if err := checkStepBudget(set, trajectory != ""); err != nil {
				return err
			}
			inst, err := e.build(args[0])
			if err != nil {
				return err
			}
			flag, value := "--amplitude", amplitude
			var start report.MotionStart
			if amplitudeSet {
				start.Amplitude, err = units.Parse(amplitude, units.Length)
			} else {
				flag, value = "--energy", energy
				start.ByEnergy = true
				start.Energy, err = units.Parse(energy, units.Energy)
			}
			if err != nil {
				return usageErr(fmt.Errorf("%s: %w", flag, err))
			}
			r, tr, err := report.NewMotion(inst, m, start, set)
			var se *report.StartError
			switch {
			case errors.As(err, &se):
				return usageErr(fmt.Errorf("%s %s: %w", flag, value, se.Err))
			case errors.Is(err, report.ErrTooLong):
				return usageErr(err)
			case errors.Is(err, motion.ErrTooManySteps):
				return usageErr(fmt.Errorf("%w: the limit is %d steps (%d with --trajectory); ask for fewer --periods, fewer --steps-per-period or a larger --rtol", err, maxSteps, maxTrajectorySteps))
			case err != nil:
				return computeErr(err)
			}
			if trajectory != "" {
				if err := e.writeOutput("--trajectory", trajectory, func(w io.Writer) error { return writeTrajectory(w, tr) }); err != nil {
					return err
				}
				r.Trajectory, r.TrajectorySamples = report.Text(trajectory), len(tr)
			}
			return e.emit(r, motionTable(r))
		},
	}
	mass.register(cmd)
	e.energyUnitFlag(cmd, tableEnergies)
	f := cmd.Flags()
	f.StringVar(&amplitude, "amplitude", "", "starting displacement r0 − re at rest, in Å unless a unit is given (e.g. 0.2, -0.1, 20pm); positive stretches, negative compresses")
	f.StringVar(&energy, "energy", "", "oscillation energy above V(re), in eV unless a unit is given (e.g. 0.5, 300K, 1000cm-1); starts at the stretch-side turning point")
	methodVar(f, &method)
	f.IntVar(&stepsPerPeriod, "steps-per-period", 0, fmt.Sprintf("fixed steps per harmonic period 2π/ω0 (heun, rk4, verlet; 0: heun %d, verlet %d, rk4 %d)",
		motion.DefaultHeunSteps, motion.DefaultVerletSteps, motion.DefaultRK4Steps))
	f.IntVar(&periods, "periods", motion.DefaultPeriods, "number of full periods to measure")
	f.Float64Var(&rtol, "rtol", 0, fmt.Sprintf("relative tolerance of dopri (0: %g)", motion.DefaultRTol))
	f.Float64Var(&atol, "atol", 0, fmt.Sprintf("absolute tolerance of dopri, relative to the amplitude (0: %g)", motion.DefaultATol))
	f.StringVar(&trajectory, "trajectory", "", "write every step to this CSV file (t_fs, r_angstrom, x_angstrom, v_angstrom_per_fs, energy_ev)")
	return cmd
}

// Bounds on the length of a run, so that a typo cannot start a run that
// never ends or exhausts memory: 10⁸ steps take about a minute; a recorded
// trajectory of 10⁶ steps is about 60 MB in memory and 80 MB of CSV.
const (
	maxPeriods         = 100_000
	maxStepsPerPeriod  = 10_000_000
	maxSteps           = 100_000_000
	maxTrajectorySteps = 1_000_000
)

// checkStepBudget refuses, before any work, a fixed-step run whose
// periods × steps per period exceed the step limit (an anharmonic period
// longer than the harmonic one needs more; the integrator stops at the
// limit).
func checkStepBudget(s motion.Settings, recording bool) error {
	if s.Method == motion.DormandPrince {
		return nil
	}
	spp := s.StepsPerPeriod
	if spp == 0 {
		spp = s.Method.DefaultStepsPerPeriod()
	}
	periods := s.Periods
	if periods == 0 {
		periods = motion.DefaultPeriods
	}
	if total := int64(periods) * int64(spp); total > int64(s.MaxSteps) {
		what := ""
		if recording {
			what = " with --trajectory"
		}
		return usageErr(fmt.Errorf("--periods %d × --steps-per-period %d = %d steps: the limit%s is %d", periods, spp, total, what, s.MaxSteps))
	}
	return nil
}

// checkMotionFlags rejects flags that do not apply to the method or are out
// of range.
func checkMotionFlags(cmd *cobra.Command, s motion.Settings) error {
	changed := cmd.Flags().Changed
	if s.Method == motion.DormandPrince {
		if changed("steps-per-period") {
			return usageErr(errors.New("--steps-per-period applies to the fixed-step methods heun, rk4 and verlet; dopri adapts its step (set --rtol/--atol)"))
		}
	} else if changed("rtol") || changed("atol") {
		return usageErr(fmt.Errorf("--rtol and --atol apply to --method dopri only; %s takes a fixed step (set --steps-per-period)", s.Method))
	}
	switch {
	case s.Periods < 1 || s.Periods > maxPeriods:
		return usageErr(fmt.Errorf("--periods %d: must be from 1 to %d", s.Periods, maxPeriods))
	case s.StepsPerPeriod < 0 || (changed("steps-per-period") && (s.StepsPerPeriod < 4 || s.StepsPerPeriod > maxStepsPerPeriod)):
		return usageErr(fmt.Errorf("--steps-per-period %d: must be from 4 to %d", s.StepsPerPeriod, maxStepsPerPeriod))
	case changed("rtol") && !(s.RTol > 0 && s.RTol < 1):
		return usageErr(fmt.Errorf("--rtol %g: must be in (0, 1)", s.RTol))
	case changed("atol") && !(s.ATol > 0 && s.ATol < 1):
		return usageErr(fmt.Errorf("--atol %g: must be in (0, 1)", s.ATol))
	}
	return nil
}

// motionTable lays out a motion report as quantity, value, unit rows.
func motionTable(r report.Motion) *table {
	t := quantityTable(r.Model, r.Params)
	if r.Pair != "" {
		t.add("pair", string(r.Pair), "")
	}
	t.add("reduced mass μ", num(r.Mu), "u")
	t.add("method", r.Method, "")
	t.add("equilibrium distance re", num(r.Re), "Å")
	t.add("amplitude x0 = r0 − re", num(r.Amplitude), "Å")
	t.add("oscillation energy E", num(r.Energy), "eV")
	if d := float64(r.DepthFraction); !math.IsNaN(d) {
		t.add("E / well depth", num(d), "")
	}
	t.add("turning points r₋, r₊", num(r.InnerTurningPoint)+", "+num(r.OuterTurningPoint), "Å")
	t.add("measured period", num(r.MeasuredPeriod), "fs")
	t.add("exact period (quadrature)", num(r.ExactPeriod), "fs")
	t.add("measured / exact − 1", fmt.Sprintf("%.3g", r.MeasuredError), "")
	t.add("harmonic period 2π/ω0", num(r.HarmonicPeriod), "fs")
	t.add("perturbative period (2nd order)", num(float64(r.PerturbativePeriod)), "fs")
	t.add("period spread (std. dev.)", fmt.Sprintf("%.3g", r.PeriodSpread), "fs")
	t.add("periods measured", strconv.Itoa(r.PeriodsMeasured), "")
	if d := float64(r.RelativeEnergyDrift); math.IsNaN(d) {
		t.add("relative energy drift (max)", fmt.Sprintf("below the rounding floor (%.2g)", r.RelativeEnergyFloor), "")
	} else {
		t.add("relative energy drift (max)", fmt.Sprintf("%.3g", d), "")
	}
	if r.RTol != nil {
		t.add("tolerances rtol, atol", fmt.Sprintf("%g, %g", *r.RTol, *r.ATol), "")
		t.add("mean time step", num(r.TimeStep), "fs")
		t.add("mean steps per harmonic period", fmt.Sprintf("%.1f", r.StepsPerPeriod), "")
		t.add("steps accepted, rejected", fmt.Sprintf("%d, %d", r.Steps, r.Rejected), "")
	} else {
		t.add("time step", num(r.TimeStep), "fs")
		t.add("steps per harmonic period", fmt.Sprintf("%.0f", r.StepsPerPeriod), "")
		t.add("steps", strconv.Itoa(r.Steps), "")
	}
	t.add("force evaluations", strconv.Itoa(r.ForceEvals), "")
	t.add("integrated time", num(r.Duration), "fs")
	for _, n := range r.Notes {
		t.add("note", n, "")
	}
	if r.Trajectory != "" {
		t.add("trajectory file", fmt.Sprintf("%s (%d samples)", r.Trajectory, r.TrajectorySamples), "")
	}
	return t
}

// writeTrajectory writes the samples as CSV.
func writeTrajectory(out io.Writer, tr []motion.Sample) error {
	w := csv.NewWriter(out)
	if err := w.Write([]string{"t_fs", "r_angstrom", "x_angstrom", "v_angstrom_per_fs", "energy_ev"}); err != nil {
		return err
	}
	g := func(v float64) string { return strconv.FormatFloat(v, 'g', -1, 64) }
	for _, s := range tr {
		if err := w.Write([]string{g(s.T), g(s.R), g(s.X), g(s.V), g(s.E)}); err != nil {
			return err
		}
	}
	w.Flush()
	return w.Error()
}
