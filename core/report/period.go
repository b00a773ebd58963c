package report

import (
	"encoding/json"
	"errors"
	"fmt"
	"math"
	"sync"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/motion"
	"github.com/pairwell/pairwell/core/period"
)

// PeriodRow is the period of the oscillation at one amplitude or energy:
// exact, harmonic, perturbative and, when asked for, measured on a
// trajectory. Values are in eV, Å and fs; NaN (null in JSON) where there is
// no value. A row without an oscillation carries the reason in Err; the
// other rows of a sweep are unaffected.
//
// It encodes as a JSON object with the keys of its fields in order and
// "error", the message of Err or null.
type PeriodRow struct {
	// Amplitude is the displacement from re of a start at rest (+ stretch,
	// − compress); for a row given by its energy, the stretch-side turning
	// point r₊ − re (NaN when there is no oscillation).
	Amplitude Number `json:"amplitude_angstrom"`
	// Energy is the oscillation energy E above V(re); for an amplitude x,
	// E = V(re + x) − V(re).
	Energy Number `json:"energy_ev"`
	// ExactPeriod is T(E) by quadrature (period.Exact) and
	// ExactPeriodError its estimated relative error.
	ExactPeriod      Number `json:"exact_period_fs"`
	ExactPeriodError Number `json:"exact_period_relative_error_estimate"`
	// HarmonicPeriod is 2π√(μ/k), the same in every row.
	HarmonicPeriod Number `json:"harmonic_period_fs"`
	// PerturbativePeriod is the second-order Lindstedt–Poincaré period
	// (period.Perturbative); NaN where the expansion predicts ω ≤ 0 or
	// the form has no c₄.
	PerturbativePeriod Number `json:"perturbative_period_fs"`
	// MeasuredPeriod is nil unless the sweep measured the periods
	// (PeriodSettings.Measure); then it points to the period measured on
	// an integrated trajectory, NaN for a row not measured.
	MeasuredPeriod *Number `json:"measured_period_fs"`
	// Inner and Outer are the turning points r₋ and r₊.
	Inner Number `json:"inner_turning_point_angstrom"`
	Outer Number `json:"outer_turning_point_angstrom"`
	// Err is why the row has no period (the pair dissociates, collapses
	// or leaves the domain), or why its measurement failed: then the
	// exact values are kept and MeasuredPeriod is NaN.
	Err error `json:"-"`
}

// MarshalJSON implements json.Marshaler.
func (r PeriodRow) MarshalJSON() ([]byte, error) {
	type plain PeriodRow
	var msg *string
	if r.Err != nil {
		s := r.Err.Error()
		msg = &s
	}
	return json.Marshal(struct {
		plain
		Error *string `json:"error"`
	}{plain(r), msg})
}

// PeriodHead is what a period sweep is of: the form, its well and the
// reduced mass. The period command's JSON is this object with the key
// "rows", the PeriodRows, after its fields. Method is the integrator of
// the measured periods, null when none were measured.
type PeriodHead struct {
	Model  string  `json:"model"`
	Params Params  `json:"params"`
	Pair   Text    `json:"pair"`
	Mu     float64 `json:"reduced_mass_u"`
	Re     float64 `json:"equilibrium_r_angstrom"`
	Depth  Number  `json:"well_depth_ev"`
	Method Text    `json:"method"`
}

// NewPeriodHead describes the sweep of inst, of well w, with mass m;
// method is empty when the periods were not measured.
func NewPeriodHead(inst core.Instance, w core.Well, m Mass, method string) PeriodHead {
	return PeriodHead{Model: inst.Model.Info().Key, Params: NewParams(inst), Pair: Text(m.Pair), Mu: m.Mu,
		Re: w.Re, Depth: Number(w.Depth), Method: Text(method)}
}

// PeriodSettings controls PeriodSweep. The zero value computes the exact,
// harmonic and perturbative periods only.
type PeriodSettings struct {
	// Measure also measures each period on a trajectory integrated by
	// Method from the row's start (see motion.Oscillator.Run), over
	// motion.DefaultPeriods periods.
	Measure bool
	Method  motion.Method
	// Progress, if not nil, is called after each step with the number of
	// steps done and their total: one step per exact period, one more
	// per measured period. Calls are serialised; keep it cheap.
	Progress func(done, total int)
}

// maxMeasuredRatio caps the exact period, in harmonic periods, of a row
// whose period is measured: longer ones are too close to the top of the
// well to integrate in reasonable time.
const maxMeasuredRatio = 50

// PeriodSweep tabulates the period of the classical oscillation of the
// pair of reduced mass mu (u) in the well of inst: one row per amplitude
// (Å, a start at rest at re + x), then one per energy (eV above V(re)), in
// input order. The exact periods, and the measured ones, are computed on
// all cores; potentials must be safe for concurrent use, as core.Potential
// requires.
//
// A row without an oscillation gets its own error and the others are
// still computed. The error is non-nil only when the well or the harmonic
// period cannot be found (it is prefixed with the model key); the well is
// returned with the rows.
func PeriodSweep(inst core.Instance, mu float64, amplitudes, energies []float64, s PeriodSettings) ([]PeriodRow, core.Well, error) {
	p := inst.Potential
	key := inst.Model.Info().Key
	w, err := wellOf(inst, 0)
	if err != nil {
		return nil, core.Well{}, err
	}
	t0, err := period.Harmonic(w, mu)
	if err != nil {
		return nil, core.Well{}, fmt.Errorf("%s: %w", key, err)
	}
	n := len(amplitudes) + len(energies)
	rows := make([]PeriodRow, n)
	energy := make([]float64, n)
	rowErr := make([]error, n)
	amplitudeEnergies(p, w, amplitudes, energy, rowErr)
	copy(energy[len(amplitudes):], energies)

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
	if s.Measure {
		steps *= 2
	}
	prog := newCounter(steps, s.Progress)
	res, errs := period.Sweep(p, w, mu, todo, period.Settings{}, func(int, int) { prog.step() })
	exact := make([]period.Result, n)
	for k, i := range idx {
		exact[i] = res[k]
		if errs[k] != nil {
			rowErr[i] = errs[k]
		}
	}
	nan := Number(math.NaN())
	for i := range rows {
		r := &rows[i]
		*r = PeriodRow{Amplitude: nan, Energy: nan, ExactPeriod: nan, ExactPeriodError: nan,
			HarmonicPeriod: Number(t0), PerturbativePeriod: nan, Inner: nan, Outer: nan, Err: rowErr[i]}
		if i < len(amplitudes) {
			r.Amplitude = Number(amplitudes[i])
		}
		if !math.IsNaN(energy[i]) {
			r.Energy = Number(energy[i])
		}
		if r.Err != nil {
			continue
		}
		if t, err := period.Perturbative(w, mu, energy[i]); err == nil {
			r.PerturbativePeriod = Number(t) // NaN where ω ≤ 0 or c₄ is unknown
		}
		x := exact[i]
		r.ExactPeriod, r.ExactPeriodError = Number(x.Period), Number(x.ErrorEstimate)
		r.Inner, r.Outer = Number(x.Inner), Number(x.Outer)
		if i >= len(amplitudes) {
			r.Amplitude = Number(x.Stretch)
		}
	}
	if s.Measure {
		starts := sweepStarts{amplitudes: amplitudes, energy: energy, exact: exact}
		if err := measurePeriods(p, w, mu, s.Method, rows, starts, prog.step); err != nil {
			return nil, core.Well{}, fmt.Errorf("%s: %w", key, err)
		}
	}
	return rows, w, nil
}

// amplitudeEnergies sets energy[i] = V(re + xs[i]) − V(re), with one Batch
// call over the separations inside the domain, or from the Taylor series
// at re where that is more accurate (core.Expansion.Energy); a row outside it, or whose
// value the potential cannot give, gets its error in rowErr[i] and NaN.
func amplitudeEnergies(p core.Potential, w core.Well, xs []float64, energy []float64, rowErr []error) {
	d := p.Domain()
	var idx []int
	var rs []float64
	for i, x := range xs {
		energy[i] = math.NaN()
		r := w.Re + x
		if err := core.CheckR(d, r); err != nil {
			rowErr[i] = fmt.Errorf("amplitude %g Å: %w", x, err)
			continue
		}
		idx = append(idx, i)
		rs = append(rs, r)
	}
	vs := make([]float64, len(rs))
	if err := p.Taylor(0, rs, vs); err != nil {
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
	ex := core.NewExpansion(w)
	for k, i := range idx {
		if rowErr[i] == nil {
			e, _ := ex.Energy(xs[i], vs[k], w.Energy)
			energy[i] = max(e, 0)
		}
	}
}

// sweepStarts are the inputs of the rows of a sweep: the amplitude rows
// come first, then the energy rows; energy and exact are indexed by row.
type sweepStarts struct {
	amplitudes []float64
	energy     []float64
	exact      []period.Result
}

// measurePeriods sets MeasuredPeriod by integrating the trajectories of
// the rows without an error, on all cores, in any order (results are
// stored by row), calling step after each. A row whose measurement fails
// keeps its exact values and gets the reason in Err; the measured value
// is then NaN.
func measurePeriods(p core.Potential, w core.Well, mu float64, meth motion.Method, rows []PeriodRow, in sweepStarts, step func()) error {
	o, err := motion.NewFromWell(p, w, mu)
	if err != nil {
		return err
	}
	t0 := o.Harmonic().PeriodFs
	measured := make([]float64, len(rows))
	forEach(0, len(rows), func(i int) {
		measured[i] = math.NaN()
		if rows[i].Err != nil {
			return
		}
		t, err := measureRow(o, meth, i, in, t0)
		step()
		if err != nil {
			rows[i].Err = fmt.Errorf("measured period: %w", err)
			return
		}
		measured[i] = t
	})
	for i := range rows {
		v := Number(measured[i])
		rows[i].MeasuredPeriod = &v
	}
	return nil
}

// measureRow integrates row i: from rest at its amplitude for an
// amplitude row, else from the stretch-side turning point of its energy.
func measureRow(o *motion.Oscillator, meth motion.Method, i int, in sweepStarts, t0 float64) (float64, error) {
	E, exact := in.energy[i], in.exact[i].Period
	if E == 0 {
		return 0, errors.New("zero amplitude: the pair stays at rest at re")
	}
	if exact > maxMeasuredRatio*t0 {
		return 0, fmt.Errorf("not integrated: the period is %.4g harmonic periods (too close to the top of the well)", exact/t0)
	}
	var st motion.Start
	var err error
	if i < len(in.amplitudes) {
		st, err = o.FromDisplacement(in.amplitudes[i])
	} else {
		st, err = o.FromEnergy(E)
	}
	if err != nil {
		return 0, err
	}
	set := motion.Settings{Method: meth, MaxTime: maxTime(motion.DefaultPeriods, t0, exact)}
	res, err := o.Run(st, set)
	if err != nil {
		return 0, err
	}
	return res.Period, nil
}

// maxTime is the time (fs) a run measuring periods periods may take, given
// the harmonic period t0 and the exact one: room for the periods, the half
// period of a compressed start and the lengthening of the period by the
// energy drift of a coarse step.
func maxTime(periods int, t0, exact float64) float64 {
	return max(100*float64(periods+1)*t0, 2*float64(periods+1)*exact)
}

// counter calls a progress callback with serialised, increasing counts.
type counter struct {
	mu       sync.Mutex
	done, n  int
	progress func(done, total int)
}

func newCounter(total int, progress func(done, total int)) *counter {
	return &counter{n: total, progress: progress}
}

// step counts one step done; it is safe for concurrent use.
func (c *counter) step() {
	if c.progress == nil {
		return
	}
	c.mu.Lock()
	defer c.mu.Unlock()
	c.done++
	c.progress(c.done, c.n)
}

// PeriodTable is a short period-against-amplitude table of one form, with
// the energies as fractions of the well depth. Values are in eV, Å and fs.
type PeriodTable struct {
	Name string           `json:"name"`
	Rows []PeriodTableRow `json:"rows"`
}

// PeriodTableRow is one amplitude of a PeriodTable; keys as in PeriodRow.
type PeriodTableRow struct {
	// Amplitude is the stretch x of a start at rest at re + x.
	Amplitude float64 `json:"amplitude_angstrom"`
	// Energy is E = V(re + x) − V(re) and DepthFraction E/De.
	Energy        float64 `json:"energy_ev"`
	DepthFraction float64 `json:"depth_fraction"`
	Exact         Number  `json:"exact_period_fs"`
	Harmonic      float64 `json:"harmonic_period_fs"`
	Perturbative  Number  `json:"perturbative_period_fs"`
	// Error is why the row has no exact period; empty when it has one.
	Error Text `json:"error"`
}

// NewPeriodTable tabulates, with PeriodSweep, the exact, harmonic and
// perturbative periods of inst, named name, for the reduced mass mu (u) at
// the amplitudes (Å). It is an error for an amplitude to have no
// oscillation energy (outside the domain).
func NewPeriodTable(name string, inst core.Instance, mu float64, amplitudes []float64) (PeriodTable, error) {
	rows, w, err := PeriodSweep(inst, mu, amplitudes, nil, PeriodSettings{})
	if err != nil {
		return PeriodTable{}, err
	}
	t := PeriodTable{Name: name, Rows: make([]PeriodTableRow, len(rows))}
	for i, r := range rows {
		e := float64(r.Energy)
		if math.IsNaN(e) {
			return PeriodTable{}, r.Err
		}
		t.Rows[i] = PeriodTableRow{
			Amplitude: amplitudes[i], Energy: e, DepthFraction: e / w.Depth,
			Exact: r.ExactPeriod, Harmonic: float64(r.HarmonicPeriod), Perturbative: r.PerturbativePeriod,
		}
		if r.Err != nil {
			t.Rows[i].Error = Text(r.Err.Error())
		}
	}
	return t, nil
}

// PeriodRatio is the exact period over the harmonic one, T/T₀.
func (r PeriodTableRow) PeriodRatio() float64 { return float64(r.Exact) / r.Harmonic }

// Lengthening is the relative lengthening of the exact period over the
// harmonic one, T/T₀ − 1.
func (r PeriodTableRow) Lengthening() float64 { return r.PeriodRatio() - 1 }

// PerturbativeError is the relative error of the perturbative period,
// T_pert/T − 1.
func (r PeriodTableRow) PerturbativeError() float64 {
	return float64(r.Perturbative)/float64(r.Exact) - 1
}

// PerturbativeReach returns the last row without an error whose
// perturbative period is within the relative tolerance tol of the exact
// one, and false when there is none.
func (t PeriodTable) PerturbativeReach(tol float64) (PeriodTableRow, bool) {
	best := -1
	for i, r := range t.Rows {
		if r.Error == "" && math.Abs(r.PerturbativeError()) <= tol {
			best = i
		}
	}
	if best < 0 {
		return PeriodTableRow{}, false
	}
	return t.Rows[best], true
}
