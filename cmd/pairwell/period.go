package main

import (
	"errors"
	"fmt"
	"math"
	"strconv"
	"strings"

	"github.com/spf13/cobra"

	"github.com/pairwell/pairwell/core/motion"
	"github.com/pairwell/pairwell/core/report"
	"github.com/pairwell/pairwell/core/units"
)

// maxSweepCount caps the COUNT of a FROM:TO:COUNT range, and maxSweepRows
// the rows of a sweep (amplitudes and energies together, lists included):
// a row is about 1 KB of JSON and one quadrature, so 10⁵ rows are about
// 100 MB of output and minutes of work.
const (
	maxSweepCount = 100_000
	maxSweepRows  = 100_000
)

// parseSweep reads a list "V1,V2,..." or a range "FROM:TO:COUNT" (COUNT
// evenly spaced values, both ends included) of values of dimension d, each
// with an optional unit (units.Parse). COUNT is an integer from 1 to
// maxSweepCount; with COUNT = 1, FROM and TO must be equal.
func parseSweep(s string, d units.Dimension) ([]float64, error) {
	return parseSweepWith(s, func(v string) (float64, error) { return units.Parse(v, d) })
}

// parseSweepWith is parseSweep with each value read by parse.
func parseSweepWith(s string, parse func(string) (float64, error)) ([]float64, error) {
	s = strings.TrimSpace(s)
	if s == "" {
		return nil, errors.New("empty: give a list V1,V2,... or a range FROM:TO:COUNT")
	}
	if strings.Contains(s, ":") {
		parts := strings.Split(s, ":")
		if len(parts) != 3 {
			return nil, fmt.Errorf("range %q: want FROM:TO:COUNT", s)
		}
		from, err := parse(parts[0])
		if err != nil {
			return nil, fmt.Errorf("range %q: FROM: %w", s, err)
		}
		to, err := parse(parts[1])
		if err != nil {
			return nil, fmt.Errorf("range %q: TO: %w", s, err)
		}
		n, err := strconv.Atoi(strings.TrimSpace(parts[2]))
		if err != nil || n < 1 || n > maxSweepCount {
			return nil, fmt.Errorf("range %q: COUNT must be an integer from 1 to %d", s, maxSweepCount)
		}
		if n == 1 {
			if from != to {
				return nil, fmt.Errorf("range %q: COUNT 1 needs FROM = TO", s)
			}
			return []float64{from}, nil
		}
		out := make([]float64, n)
		for i := range out {
			t := float64(i) / float64(n-1)
			out[i] = from*(1-t) + to*t
			if math.IsInf(out[i], 0) {
				return nil, fmt.Errorf("range %q: values overflow", s)
			}
		}
		return out, nil
	}
	var out []float64
	for _, f := range strings.Split(s, ",") {
		v, err := parse(f)
		if err != nil {
			return nil, fmt.Errorf("list %q: %w", s, err)
		}
		out = append(out, v)
	}
	return out, nil
}

func newPeriodCmd(e *env) *cobra.Command {
	var (
		mass                 massFlags
		amplitudes, energies string
		method               string
	)
	cmd := &cobra.Command{
		Use:   "period SPEC (--pair A-B | --mu M) [--amplitudes LIST|FROM:TO:COUNT] [--energies LIST|FROM:TO:COUNT]",
		Short: "Tabulate the vibration period against amplitude: exact, harmonic, perturbative (and measured)",
		Long: `period computes, for each amplitude (or energy), the period of the classical
vibration of the pair in the well of SPEC:

  exact         T(E) = √(2μ) ∫ dr/√(E − V(r) + V(re)) between the turning points,
                by Gauss–Legendre quadrature after r = mid + half·sin θ removes the
                end-point singularities, to 1e-12 relative (the error estimate
                is reported)
  harmonic      2π√(μ/k), k = V″(re), the same at every amplitude
  perturbative  second-order Lindstedt–Poincaré (Landau & Lifshitz, Mechanics
                §28): T₀/(1 + δ), δ = (3c₄/(4c₂) − 15c₃²/(16c₂²))·E/c₂
  measured      with --method: integrated trajectory (see "pairwell motion")

An amplitude x is a start at rest at r = re + x (positive stretches, negative
compresses; Å unless a unit is given), so E = V(re + x) − V(re). --energies
gives E directly (eV unless a unit is given, e.g. 300K, 1000cm-1); its
amplitude column is then the stretch-side turning point r₊ − re. At least
one of --amplitudes and --energies is needed; with both, the amplitude rows
come first.

Values: a comma list (0.05,0.1,20pm) or FROM:TO:COUNT, evenly spaced with both
ends included (-0.2:0.4:7). A row beyond the well (the pair dissociates, or
collapses through a Buckingham barrier, or leaves the domain) gets its own
error; the other rows are still computed. The rows are computed on all cores
and printed in input order.

JSON values are in eV, Å, u and fs, whatever the input units.`,
		Example: `  pairwell period morse:De=4.6,a=1.87,re=1.27 --pair H-Cl --amplitudes 0.05:0.5:10
  pairwell period lj:epsilon=120K,sigma=3.4 --pair Ar-Ar --amplitudes=-0.3,-0.1,0.1,0.5 --format json
  pairwell period morse:De=4.6,a=1.87,re=1.27 --pair H-Cl --energies 0.1eV:4eV:5 --method rk4`,
		Args: exactArgs(1, "SPEC"),
		RunE: func(cmd *cobra.Command, args []string) error {
			m, err := mass.resolve(true)
			if err != nil {
				return err
			}
			var xs, es []float64
			if cmd.Flags().Changed("amplitudes") {
				if xs, err = parseSweep(amplitudes, units.Length); err != nil {
					return usageErr(fmt.Errorf("--amplitudes: %w", err))
				}
			}
			if cmd.Flags().Changed("energies") {
				if es, err = parseSweep(energies, units.Energy); err != nil {
					return usageErr(fmt.Errorf("--energies: %w", err))
				}
			}
			if n := len(xs) + len(es); n > maxSweepRows {
				return usageErr(fmt.Errorf("%d amplitudes and energies: the limit is %d rows", n, maxSweepRows))
			}
			if len(xs)+len(es) == 0 {
				return usageErr(errors.New("give --amplitudes LIST|FROM:TO:COUNT (Å) or --energies LIST|FROM:TO:COUNT (eV)"))
			}
			set := report.PeriodSettings{}
			if cmd.Flags().Changed("method") {
				if set.Method, err = motion.ParseMethod(method); err != nil {
					return usageErr(fmt.Errorf("--method: %w", err))
				}
				set.Measure = true
			}
			inst, err := e.build(args[0])
			if err != nil {
				return err
			}
			progress, finish := e.sweepProgress("periods")
			set.Progress = progress
			rows, w, err := report.PeriodSweep(inst, m.Mu, xs, es, set)
			finish()
			if err != nil {
				return computeErr(err)
			}
			if e.format == "table" {
				info := inst.Model.Info()
				depth := "unbounded"
				if w.Bounded() {
					depth = num(w.Depth) + " eV"
				}
				pair := ""
				if m.Pair != "" {
					pair = " (" + m.Pair + ")"
				}
				fmt.Fprintf(e.stdout, "%s (%s): re = %s Å, depth %s, μ = %s u%s\n",
					info.Key, report.NewParams(inst), num(w.Re), depth, num(m.Mu), pair)
			}
			failed := 0
			for _, r := range rows {
				if r.Err != nil {
					failed++
				}
			}
			if failed > 0 {
				fmt.Fprintf(e.stderr, "pairwell: %d of %d rows have no period (see their error)\n", failed, len(rows))
			}
			if err := emitRows(e, report.NewPeriodHead(inst, w, m, measuredMethod(set)), rows, func() *table { return periodTable(rows, set.Measure) }); err != nil {
				return err
			}
			errs := make([]error, len(rows))
			for i, r := range rows {
				errs[i] = r.Err
			}
			return pluginRowFailure(errs)
		},
	}
	mass.register(cmd)
	e.energyUnitFlag(cmd, tableEnergies)
	f := cmd.Flags()
	f.StringVar(&amplitudes, "amplitudes", "", "displacements from re at rest, Å unless a unit is given: LIST (0.1,0.2) or FROM:TO:COUNT (-0.2:0.4:7); + stretches, − compresses")
	f.StringVar(&energies, "energies", "", "oscillation energies above V(re), eV unless a unit is given: LIST or FROM:TO:COUNT (e.g. 0.1eV:2eV:5, 300K)")
	f.StringVar(&method, "method", "", "also measure the period from a trajectory: heun, rk4, verlet or dopri")
	return cmd
}

// sweepProgress returns a progress callback of the form func(done, total
// int), as report.PeriodSweep takes, that draws a bar of what on stderr
// from its first call, and finish, to be called once at the end. The
// callback must not be called concurrently.
func (e *env) sweepProgress(what string) (progress func(done, total int), finish func()) {
	var step func()
	stop := func() {}
	progress = func(_, total int) {
		if step == nil {
			step, stop = e.progress(total, what)
		}
		step()
	}
	return progress, func() { stop() }
}

// periodTable lays out the rows, one per amplitude, units in the headers.
func periodTable(rows []report.PeriodRow, measured bool) *table {
	cols := []column{{Title: "amplitude", Unit: "Å"}, {Title: "energy", Unit: "eV"}, {Title: "exact period", Unit: "fs"},
		{Title: "harmonic period", Unit: "fs"}, {Title: "perturbative period", Unit: "fs"}}
	if measured {
		cols = append(cols, column{Title: "measured period", Unit: "fs"})
	}
	cols = append(cols, column{Title: "error"})
	t := &table{cols: cols}
	for _, r := range rows {
		cells := []string{num(float64(r.Amplitude)), num(float64(r.Energy)), num(float64(r.ExactPeriod)),
			num(float64(r.HarmonicPeriod)), num(float64(r.PerturbativePeriod))}
		if measured {
			v := math.NaN()
			if r.MeasuredPeriod != nil {
				v = float64(*r.MeasuredPeriod)
			}
			cells = append(cells, num(v))
		}
		msg := ""
		if r.Err != nil {
			msg = r.Err.Error()
		}
		t.add(append(cells, msg)...)
	}
	return t
}

// measuredMethod is the integrator of the measured periods, "" when none
// were measured.
func measuredMethod(s report.PeriodSettings) string {
	if !s.Measure {
		return ""
	}
	return s.Method.String()
}
