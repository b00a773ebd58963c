package main

import (
	"errors"
	"fmt"
	"math"
	"runtime"
	"strconv"
	"strings"
	"sync"
	"sync/atomic"

	"github.com/spf13/cobra"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/motion"
	"github.com/pairwell/pairwell/core/period"
	"github.com/pairwell/pairwell/core/report"
	"github.com/pairwell/pairwell/core/units"
)

// periodRow is one row of the period command. JSON keys are a contract;
// values are in eV, Å and fs. A row that has no oscillation carries the
// reason in Error and nulls where there is no value.
type periodRow struct {
	// Amplitude is the displacement from re at the start at rest
	// (+ stretch, − compress); for an --energies row, the stretch-side
	// turning point r₊ − re.
	Amplitude          report.Number  `json:"amplitude_angstrom"`
	Energy             report.Number  `json:"energy_ev"`
	ExactPeriod        report.Number  `json:"exact_period_fs"`
	ExactPeriodError   report.Number  `json:"exact_period_relative_error_estimate"`
	HarmonicPeriod     report.Number  `json:"harmonic_period_fs"`
	PerturbativePeriod report.Number  `json:"perturbative_period_fs"`
	MeasuredPeriod     *report.Number `json:"measured_period_fs,omitempty"`
	Inner              report.Number  `json:"inner_turning_point_angstrom"`
	Outer              report.Number  `json:"outer_turning_point_angstrom"`
	Error              *string        `json:"error"`
}

// maxSweepCount caps the COUNT of a FROM:TO:COUNT range.
const maxSweepCount = 1_000_000

// parseSweep reads a list "V1,V2,..." or a range "FROM:TO:COUNT" (COUNT
// evenly spaced values, both ends included) of values of dimension d, each
// with an optional unit (units.Parse). COUNT is an integer from 1 to
// maxSweepCount; with COUNT = 1, FROM and TO must be equal.
func parseSweep(s string, d units.Dimension) ([]float64, error) {
	s = strings.TrimSpace(s)
	if s == "" {
		return nil, errors.New("empty: give a list V1,V2,... or a range FROM:TO:COUNT")
	}
	if strings.Contains(s, ":") {
		parts := strings.Split(s, ":")
		if len(parts) != 3 {
			return nil, fmt.Errorf("range %q: want FROM:TO:COUNT", s)
		}
		from, err := units.Parse(parts[0], d)
		if err != nil {
			return nil, fmt.Errorf("range %q: FROM: %w", s, err)
		}
		to, err := units.Parse(parts[1], d)
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
		v, err := units.Parse(f, d)
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
		Use:   "period SPEC (--pair A-B | --mu M) (--amplitudes LIST|FROM:TO:COUNT | --energies LIST|FROM:TO:COUNT)",
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
amplitude column is then the stretch-side turning point r₊ − re.

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
			if len(xs)+len(es) == 0 {
				return usageErr(errors.New("give --amplitudes LIST|FROM:TO:COUNT (Å) or --energies LIST|FROM:TO:COUNT (eV)"))
			}
			var meth *motion.Method
			if cmd.Flags().Changed("method") {
				mm, err := motion.ParseMethod(method)
				if err != nil {
					return usageErr(fmt.Errorf("--method: %w", err))
				}
				meth = &mm
			}
			inst, err := e.build(args[0])
			if err != nil {
				return err
			}
			rows, w, err := e.periodRows(inst, m.Mu, xs, es, meth)
			if err != nil {
				return err
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
				if r.Error != nil {
					failed++
				}
			}
			if failed > 0 {
				fmt.Fprintf(e.stderr, "pairwell: %d of %d rows have no period (see their error)\n", failed, len(rows))
			}
			return e.emit(rows, periodTable(rows, meth != nil))
		},
	}
	mass.register(cmd)
	f := cmd.Flags()
	f.StringVar(&amplitudes, "amplitudes", "", "displacements from re at rest, Å unless a unit is given: LIST (0.1,0.2) or FROM:TO:COUNT (-0.2:0.4:7); + stretches, − compresses")
	f.StringVar(&energies, "energies", "", "oscillation energies above V(re), eV unless a unit is given: LIST or FROM:TO:COUNT (e.g. 0.1eV:2eV:5, 300K)")
	f.StringVar(&method, "method", "", "also measure the period from a trajectory: heun, rk4, verlet or dopri")
	return cmd
}

// periodRows computes the rows for amplitudes xs and energies es.
func (e *env) periodRows(inst core.Instance, mu float64, xs, es []float64, meth *motion.Method) ([]periodRow, core.Well, error) {
	p := inst.Potential
	key := inst.Model.Info().Key
	w, err := core.AnalyzeWell(p, core.WellSettings{Order: min(4, p.MaxOrder())})
	if err != nil {
		return nil, core.Well{}, computeErr(fmt.Errorf("%s: %w", key, err))
	}
	t0, err := period.Harmonic(w, mu)
	if err != nil {
		return nil, core.Well{}, computeErr(fmt.Errorf("%s: %w", key, err))
	}
	n := len(xs) + len(es)
	rows := make([]periodRow, n)
	energy := make([]float64, n)
	rowErr := make([]error, n)
	amplitudeEnergies(p, w, xs, energy, rowErr)
	copy(energy[len(xs):], es)

	// The exact periods of the rows that have an energy, on all cores.
	var idx []int
	var todo []float64
	for i := range rows {
		if rowErr[i] == nil {
			idx = append(idx, i)
			todo = append(todo, energy[i])
		}
	}
	steps := len(todo)
	if meth != nil {
		steps *= 2
	}
	step, done := e.progress(steps, "periods")
	defer done()
	res, errs := period.Sweep(p, w, mu, todo, period.Settings{}, func(int, int) { step() })
	exact := make([]period.Result, n)
	for k, i := range idx {
		exact[i] = res[k]
		if errs[k] != nil {
			rowErr[i] = errs[k]
		}
	}
	nan := report.Number(math.NaN())
	for i := range rows {
		r := &rows[i]
		*r = periodRow{Amplitude: nan, Energy: nan, ExactPeriod: nan, ExactPeriodError: nan,
			HarmonicPeriod: report.Number(t0), PerturbativePeriod: nan, Inner: nan, Outer: nan}
		if i < len(xs) {
			r.Amplitude = report.Number(xs[i])
		}
		if !math.IsNaN(energy[i]) {
			r.Energy = report.Number(energy[i])
		}
		if rowErr[i] != nil {
			msg := rowErr[i].Error()
			r.Error = &msg
			continue
		}
		if t, err := period.Perturbative(w, mu, energy[i]); err == nil {
			r.PerturbativePeriod = report.Number(t) // null where ω ≤ 0 or c₄ is unknown
		}
		x := exact[i]
		r.ExactPeriod, r.ExactPeriodError = report.Number(x.Period), report.Number(x.ErrorEstimate)
		r.Inner, r.Outer = report.Number(x.Inner), report.Number(x.Outer)
		if i >= len(xs) {
			r.Amplitude = report.Number(x.Outer - w.Re)
		}
	}
	if meth != nil {
		if err := measurePeriods(p, w, mu, *meth, rows, xs, energy, exact, rowErr, step); err != nil {
			return nil, core.Well{}, computeErr(fmt.Errorf("%s: %w", key, err))
		}
	}
	return rows, w, nil
}

// amplitudeEnergies sets energy[i] = V(re + xs[i]) − V(re), with one Batch
// call over the separations inside the domain; a row outside it, or whose
// value the potential cannot give, gets its error in rowErr[i] and NaN.
func amplitudeEnergies(p core.Potential, w core.Well, xs []float64, energy []float64, rowErr []error) {
	d := p.Domain()
	var idx []int
	var rs []float64
	for i, x := range xs {
		energy[i] = math.NaN()
		r := w.Re + x
		if err := core.CheckR(d, r); err != nil || math.IsNaN(x) {
			rowErr[i] = fmt.Errorf("amplitude %g Å puts r = %g Å outside the domain: %w", x, r, core.CheckR(d, r))
			continue
		}
		idx = append(idx, i)
		rs = append(rs, r)
	}
	vs := make([]float64, len(rs))
	if err := p.Batch(0, rs, vs); err != nil {
		// Some point failed (e.g. V overflows): take them one by one.
		for k, r := range rs {
			v, err := core.Value(p, r)
			if err != nil {
				rowErr[idx[k]] = fmt.Errorf("amplitude %g Å: %w", xs[idx[k]], err)
				continue
			}
			vs[k] = v
		}
	}
	for k, i := range idx {
		if rowErr[i] == nil {
			energy[i] = max(vs[k]-w.Energy, 0)
		}
	}
}

// maxMeasuredRatio caps the exact period, in harmonic periods, of a row
// whose period is measured: longer ones are too close to the top of the
// well to integrate in reasonable time.
const maxMeasuredRatio = 50

// measurePeriods fills MeasuredPeriod by integrating the trajectories of
// the rows without an error, on all cores, in any order (results are
// stored by row). A row whose measurement fails keeps its exact values and
// gets the reason in Error; the measured value is then null.
func measurePeriods(p core.Potential, w core.Well, mu float64, meth motion.Method,
	rows []periodRow, xs, energy []float64, exact []period.Result, rowErr []error, step func()) error {
	o, err := motion.NewFromWell(p, w, mu)
	if err != nil {
		return err
	}
	t0 := o.Harmonic().PeriodFs
	var next atomic.Int64
	var wg sync.WaitGroup
	for range min(runtime.GOMAXPROCS(0), len(rows)) {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for {
				i := int(next.Add(1)) - 1
				if i >= len(rows) {
					return
				}
				if rowErr[i] != nil {
					continue
				}
				nan := report.Number(math.NaN())
				rows[i].MeasuredPeriod = &nan
				t, err := measureRow(o, meth, i, xs, energy[i], exact[i].Period, t0)
				step()
				if err != nil {
					msg := "measured period: " + err.Error()
					rows[i].Error = &msg
					continue
				}
				v := report.Number(t)
				rows[i].MeasuredPeriod = &v
			}
		}()
	}
	wg.Wait()
	for i := range rows {
		if rows[i].MeasuredPeriod == nil {
			nan := report.Number(math.NaN())
			rows[i].MeasuredPeriod = &nan
		}
	}
	return nil
}

// measureRow integrates one row: from rest at amplitude xs[i] for an
// amplitude row, else from the stretch-side turning point of energy E.
func measureRow(o *motion.Oscillator, meth motion.Method, i int, xs []float64, E, exact, t0 float64) (float64, error) {
	if E == 0 {
		return 0, errors.New("zero amplitude: the pair stays at rest at re")
	}
	if exact > maxMeasuredRatio*t0 {
		return 0, fmt.Errorf("not integrated: the period is %.4g harmonic periods (too close to the top of the well)", exact/t0)
	}
	var st motion.Start
	var err error
	if i < len(xs) {
		st, err = o.FromDisplacement(xs[i])
	} else {
		st, err = o.FromEnergy(E)
	}
	if err != nil {
		return 0, err
	}
	set := motion.Settings{Method: meth}
	periods := motion.DefaultPeriods
	set.MaxTime = max(100*float64(periods+1)*t0, 2*float64(periods+1)*exact)
	res, err := o.Run(st, set)
	if err != nil {
		return 0, err
	}
	return res.Period, nil
}

// periodTable lays out the rows, one per amplitude, units in the headers.
func periodTable(rows []periodRow, measured bool) *table {
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
		if r.Error != nil {
			msg = *r.Error
		}
		t.add(append(cells, msg)...)
	}
	return t
}
