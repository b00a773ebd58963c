package report

import (
	"encoding/json"
	"errors"
	"fmt"
	"math"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/levels"
	"github.com/pairwell/pairwell/core/period"
	"github.com/pairwell/pairwell/core/units"
	"github.com/pairwell/pairwell/core/validity"
)

// LevelsCaution is the caution printed with quantum levels.
const LevelsCaution = "Caution: these are levels of a model potential, not measured or validated spectroscopic data; do not base safety decisions on them."

// ConstantsTolerance is the relative difference between the perturbative
// constants and those fitted to the levels above which Levels says so.
const ConstantsTolerance = 0.02

// Levels is the quantum vibration–rotation spectrum of one form for one
// reduced mass (package levels) and what it says: term values, binding
// energies, the zero-point energy, D0, spectroscopic constants three ways
// and the validity of the harmonic picture. Values are in cm⁻¹ (with eV
// where the key says so), Å and u; a value that does not exist (a
// fundamental with one level) is null, one that is unbounded (a binding
// energy, the number of bound levels or D0 of an unbounded form)
// "Infinity".
type Levels struct {
	Model  string  `json:"model"`
	Params Params  `json:"params"`
	Pair   Text    `json:"pair"`
	Mu     float64 `json:"reduced_mass_u"`
	Re     float64 `json:"equilibrium_r_angstrom"`
	Depth  Number  `json:"well_depth_ev"`

	Levels []LevelRow `json:"levels"`

	ZPE           float64  `json:"zero_point_energy_per_cm"`
	ZPEeV         float64  `json:"zero_point_energy_ev"`
	Fundamental   *float64 `json:"fundamental_per_cm"`
	FirstOvertone *float64 `json:"first_overtone_per_cm"`
	// BoundLevels is the number of bound vibrational levels at J = 0
	// (nil for an unbounded form); Unresolved counts those found bound
	// but too close to the limit to converge (left out of Levels).
	BoundLevels *int     `json:"bound_levels"`
	Unresolved  int      `json:"unresolved_levels"`
	D0          *float64 `json:"d0_ev"`

	Harmonic     HarmonicConstants      `json:"harmonic"`
	Perturbative *PerturbativeConstants `json:"perturbative"`
	FromLevels   *FittedConstants       `json:"from_levels"`

	Accuracy         float64          `json:"error_estimate_per_cm"`
	Tolerance        float64          `json:"tolerance_per_cm"`
	HarmonicValidity HarmonicValidity `json:"harmonic_validity"`
	Grid             LevelGrid        `json:"grid"`
	Notes            []string         `json:"notes"`
	Caution          string           `json:"caution"`
}

// LevelRow is one level.
type LevelRow struct {
	V int `json:"v"`
	J int `json:"j"`
	// TermValue is E − V(re).
	TermValue   float64 `json:"term_value_per_cm"`
	TermValueEV float64 `json:"term_value_ev"`
	// Binding is the dissociation limit minus E; nil for an unbounded
	// form.
	Binding   *float64 `json:"binding_energy_per_cm"`
	BindingEV *float64 `json:"binding_energy_ev"`
	MeanR     float64  `json:"mean_r_angstrom"`
	// RMS is the rms displacement from re, √⟨(r − re)²⟩.
	RMS      float64 `json:"rms_displacement_angstrom"`
	Accuracy float64 `json:"error_estimate_per_cm"`
	// Spacing is E(v+1, J) − E(v, J), nil for the highest level shown;
	// ClassicalSpacing is h/T(E) at the midpoint E of the two (J = 0
	// only), the classical period's correspondence value.
	Spacing          *float64 `json:"spacing_per_cm"`
	ClassicalSpacing *float64 `json:"classical_spacing_per_cm"`
}

// HarmonicConstants are ωe from V″(re) and Be from re.
type HarmonicConstants struct {
	OmegaE float64 `json:"omega_e_per_cm"`
	Be     float64 `json:"b_e_per_cm"`
}

// PerturbativeConstants are Dunham's (1932) from the Taylor coefficients.
type PerturbativeConstants struct {
	OmegaExe      float64 `json:"omega_e_x_e_per_cm"`
	AlphaE        float64 `json:"alpha_e_per_cm"`
	Y00           float64 `json:"y00_per_cm"`
	CentrifugalDe float64 `json:"centrifugal_d_e_per_cm"`
}

// FittedConstants are those of the Dunham expansion fitted to the levels
// v = 0…VMax, J = 0…JMax.
type FittedConstants struct {
	OmegaE   float64 `json:"omega_e_per_cm"`
	OmegaExe float64 `json:"omega_e_x_e_per_cm"`
	OmegaEye float64 `json:"omega_e_y_e_per_cm"`
	Be       float64 `json:"b_e_per_cm"`
	AlphaE   float64 `json:"alpha_e_per_cm"`
	GammaE   float64 `json:"gamma_e_per_cm"`
	D        float64 `json:"centrifugal_d_per_cm"`
	Y00      float64 `json:"y00_per_cm"`
	VMax     int     `json:"v_max"`
	JMax     int     `json:"j_max"`
	RMS      float64 `json:"rms_residual_per_cm"`
}

// HarmonicValidity says how far up the ladder the harmonic picture holds.
type HarmonicValidity struct {
	// Tolerance is the relative tolerance on the spacing.
	Tolerance float64 `json:"tolerance"`
	// HighestV is the highest v such that every spacing E(v′+1) − E(v′),
	// v′ ≤ v, at J = 0 is within Tolerance of ħω; nil when even the
	// fundamental is not.
	HighestV *int `json:"highest_v"`
	// QuantumEnergy is the term value of level HighestV+1, the top of the
	// range where the spacings hold; nil with HighestV.
	QuantumEnergy *float64 `json:"quantum_energy_per_cm"`
	// ClassicalEnergy is the period criterion of validity (order 2, same
	// tolerance) as an energy above V(re); "Infinity" when never violated.
	ClassicalEnergy Number `json:"classical_energy_per_cm"`
	// BelowZeroPoint reports that ClassicalEnergy is below the zero-point
	// energy.
	BelowZeroPoint bool `json:"classical_range_below_zero_point"`
}

// orUnbounded is v, or "Infinity" for nil: a quantity that is nil only
// because the form is unbounded.
func orUnbounded[T int | float64](v *T) any {
	if v == nil {
		return Unbounded
	}
	return *v
}

// MarshalJSON implements json.Marshaler: the binding energies of a level
// of an unbounded form are "Infinity".
func (r LevelRow) MarshalJSON() ([]byte, error) {
	type plain LevelRow
	return json.Marshal(struct {
		plain
		Binding   any `json:"binding_energy_per_cm"`
		BindingEV any `json:"binding_energy_ev"`
	}{plain(r), orUnbounded(r.Binding), orUnbounded(r.BindingEV)})
}

// MarshalJSON implements json.Marshaler: bound_levels and d0_ev of an
// unbounded form are "Infinity".
func (r Levels) MarshalJSON() ([]byte, error) {
	type plain Levels
	return json.Marshal(struct {
		plain
		BoundLevels any `json:"bound_levels"`
		D0          any `json:"d0_ev"`
	}{plain(r), orUnbounded(r.BoundLevels), orUnbounded(r.D0)})
}

// LevelGrid describes the grid of the levels.
type LevelGrid struct {
	Points  int     `json:"points"`
	RMin    float64 `json:"r_min_angstrom"`
	RMax    float64 `json:"r_max_angstrom"`
	Spacing float64 `json:"spacing_in_well_angstrom"`
}

// LevelsSettings selects the levels shown.
type LevelsSettings struct {
	// VMax is the highest v shown; −1 means every bound level (an error
	// for an unbounded form).
	VMax int
	// JMax is the highest J shown (0 … levels.MaxJ).
	JMax int
	// Tolerance is the accuracy of the levels in cm⁻¹; 0 means
	// levels.DefaultTolerance.
	Tolerance float64
}

// NewLevels computes the spectrum of inst for the reduced mass m.Mu (> 0).
// Errors are prefixed with the model key; they wrap core.ErrParam for
// requests beyond the bound levels.
func NewLevels(inst core.Instance, m Mass, s LevelsSettings) (Levels, error) {
	key := inst.Model.Info().Key
	fail := func(err error) (Levels, error) { return Levels{}, fmt.Errorf("%s: %w", key, err) }
	if !(m.Mu > 0) {
		return fail(fmt.Errorf("%w: a reduced mass is needed", core.ErrParam))
	}
	p := inst.Potential
	d := p.Domain()
	if s.VMax < -1 {
		return fail(fmt.Errorf("%w: v max %d is negative", core.ErrParam, s.VMax))
	}
	if !d.Bounded() && s.VMax < 0 {
		return fail(fmt.Errorf("%w: the form grows without bound and has infinitely many levels: give the highest v (--v-max)", core.ErrParam))
	}
	w, err := wellOf(inst, 4)
	if err != nil {
		return Levels{}, err
	}
	ls := levels.Settings{JMax: s.JMax, Tolerance: s.Tolerance}
	if !d.Bounded() {
		ls.Count = s.VMax + 1
	}
	res, err := levels.Solve(p, m.Mu, ls)
	if err != nil {
		return fail(err)
	}
	if d.Bounded() && s.VMax >= res.BoundLevels {
		return fail(fmt.Errorf("%w: v max %d, but the well holds %d bound levels at J = 0 (v = 0…%d)", core.ErrParam, s.VMax, res.BoundLevels, res.BoundLevels-1))
	}
	r := Levels{
		Model: key, Params: NewParams(inst), Pair: Text(m.Pair), Mu: m.Mu, Re: w.Re, Depth: Number(w.Depth),
		Accuracy: res.Accuracy, Tolerance: res.Tolerance, Caution: LevelsCaution,
		Grid: LevelGrid{Points: res.Points, RMin: res.RMin, RMax: res.RMax, Spacing: res.Spacing},
	}
	byJ := map[int][]levels.Level{}
	for _, l := range res.Levels {
		if s.VMax >= 0 && l.V > s.VMax {
			continue
		}
		byJ[l.J] = append(byJ[l.J], l)
	}
	j0 := byJ[0]
	if len(j0) == 0 {
		return fail(fmt.Errorf("%w: no level at J = 0", core.ErrNoConvergence))
	}
	cm := func(e float64) float64 { return e / units.WavenumberEV }
	r.ZPEeV = j0[0].Energy - w.Energy
	r.ZPE = cm(r.ZPEeV)
	if len(j0) > 1 {
		f := cm(j0[1].Energy - j0[0].Energy)
		r.Fundamental = &f
	}
	if len(j0) > 2 {
		f := cm(j0[2].Energy - j0[0].Energy)
		r.FirstOvertone = &f
	}
	if d.Bounded() {
		n := res.BoundLevels
		r.BoundLevels = &n
		r.Unresolved = res.Unresolved
		d0 := d.Limit - j0[0].Energy
		r.D0 = &d0
	}
	// Classical spacings h/T(E) at the midpoints of the J = 0 levels.
	mids := make([]float64, 0, len(j0))
	for v := 0; v+1 < len(j0); v++ {
		mids = append(mids, 0.5*(j0[v].Energy+j0[v+1].Energy)-w.Energy)
	}
	periods, perrs := period.Sweep(p, w, m.Mu, mids, period.Settings{}, nil)
	for j := 0; j <= s.JMax; j++ {
		row := byJ[j]
		for v, l := range row {
			lr := LevelRow{
				V: l.V, J: l.J, TermValue: cm(l.Energy - w.Energy), TermValueEV: l.Energy - w.Energy,
				MeanR: l.MeanR, Accuracy: l.Accuracy,
				RMS: math.Sqrt(math.Max(l.MeanSquareR-2*w.Re*l.MeanR+w.Re*w.Re, 0)),
			}
			if d.Bounded() {
				b := d.Limit - l.Energy
				bc := cm(b)
				lr.BindingEV, lr.Binding = &b, &bc
			}
			if v+1 < len(row) {
				sp := cm(row[v+1].Energy - l.Energy)
				lr.Spacing = &sp
				if j == 0 && perrs[v] == nil && periods[v].Period > 0 {
					// h/T as a wavenumber: 1/(c·T).
					cs := 1 / (periods[v].Period * 1e-15 * units.SpeedOfLight * 100)
					lr.ClassicalSpacing = &cs
				}
			}
			r.Levels = append(r.Levels, lr)
		}
	}
	// Constants three ways.
	h := levels.Harmonic(w, m.Mu)
	r.Harmonic = HarmonicConstants{OmegaE: h.OmegaE, Be: h.Be}
	if dc, err := levels.Dunham(w, m.Mu); err == nil {
		r.Perturbative = &PerturbativeConstants{OmegaExe: dc.OmegaExe, AlphaE: dc.AlphaE, Y00: dc.Y00, CentrifugalDe: dc.CentrifugalDe}
	} else {
		r.Notes = append(r.Notes, "No perturbative constants: the form has no analytic fourth derivative.")
	}
	fc, err := fitLevels(p, m.Mu, res, s.Tolerance)
	switch {
	case err == nil:
		r.FromLevels = &fc
		r.Notes = append(r.Notes, r.constantNotes()...)
	case errors.Is(err, core.ErrParam):
		r.Notes = append(r.Notes, fmt.Sprintf("No constants from the levels: %v.", err))
	default:
		return fail(err)
	}
	// Validity of the harmonic picture.
	hw := cm(units.HbarEVfs * units.AngularFrequency(w.K, m.Mu))
	r.HarmonicValidity = HarmonicValidity{Tolerance: validity.DefaultTolerance}
	for v := 0; v+1 < len(j0); v++ {
		if math.Abs(cm(j0[v+1].Energy-j0[v].Energy)-hw) > validity.DefaultTolerance*hw {
			break
		}
		hv, e := v, cm(j0[v+1].Energy-w.Energy)
		r.HarmonicValidity.HighestV, r.HarmonicValidity.QuantumEnergy = &hv, &e
	}
	vr, err := validity.Analyze(p, w, 2, validity.Settings{})
	if err != nil {
		return fail(err)
	}
	ce := cm(vr.Period.Energy)
	r.HarmonicValidity.ClassicalEnergy = Number(ce)
	if ce < r.ZPE {
		r.HarmonicValidity.BelowZeroPoint = true
		r.Notes = append(r.Notes, fmt.Sprintf("The classical harmonic range (period within %g%% up to %.4g cm⁻¹) is below the zero-point energy (%.4g cm⁻¹): the classical harmonic picture misses even the ground state.",
			100*validity.DefaultTolerance, ce, r.ZPE))
	}
	if r.Unresolved > 0 {
		r.Notes = append(r.Notes, fmt.Sprintf("%d more bound level(s) just below the dissociation limit could not be converged on the largest grid allowed and are left out.", r.Unresolved))
	}
	if r.Notes == nil {
		r.Notes = []string{}
	}
	return r, nil
}

// fitLevels fits the Dunham expansion to the lowest levels v = 0…FitV,
// J = 0…FitJ (fewer v when the well holds fewer at J = FitJ).
func fitLevels(p core.Potential, mu float64, all *levels.Result, tol float64) (FittedConstants, error) {
	count := levels.FitV + 1
	if all.BoundLevels >= 0 {
		count = min(count, all.BoundLevels)
	}
	var (
		res *levels.Result
		err error
	)
	for ; count >= levels.FitVMin; count-- {
		res, err = levels.Solve(p, mu, levels.Settings{Count: count, JMax: levels.FitJ, Tolerance: tol})
		if !errors.Is(err, core.ErrParam) {
			break
		}
	}
	if count < levels.FitVMin {
		return FittedConstants{}, fmt.Errorf("%w: fewer than %d vibrational levels bound up to J = %d", core.ErrParam, levels.FitVMin, levels.FitJ)
	}
	if err != nil {
		return FittedConstants{}, err
	}
	f, err := levels.Fit(res.Levels, res.Minimum, levels.FitV, levels.FitJ)
	if err != nil {
		return FittedConstants{}, err
	}
	return FittedConstants{
		OmegaE: f.OmegaE, OmegaExe: f.OmegaExe, OmegaEye: f.OmegaEye, Be: f.Be, AlphaE: f.AlphaE,
		GammaE: f.GammaE, D: f.D, Y00: f.Y00, VMax: f.VMax, JMax: f.JMax, RMS: f.RMS,
	}, nil
}

// constantNotes names the constants on which the perturbative and the
// fitted values differ by more than ConstantsTolerance.
func (r Levels) constantNotes() []string {
	pc, fc := r.Perturbative, r.FromLevels
	if pc == nil || fc == nil {
		return nil
	}
	var notes []string
	for _, c := range []struct {
		name        string
		pert, fromL float64
	}{{"ωexe", pc.OmegaExe, fc.OmegaExe}, {"αe", pc.AlphaE, fc.AlphaE}, {"De (centrifugal)", pc.CentrifugalDe, fc.D}} {
		if d := math.Abs(c.pert - c.fromL); d > ConstantsTolerance*math.Abs(c.fromL) {
			notes = append(notes, fmt.Sprintf("%s: perturbative %.6g cm⁻¹, from the levels %.6g cm⁻¹ — they differ by more than %g%%: the well is too anharmonic for second-order perturbation theory.",
				c.name, c.pert, c.fromL, 100*ConstantsTolerance))
		}
	}
	return notes
}
