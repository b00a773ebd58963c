package report

import (
	"fmt"
	"math"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/levels"
	"github.com/pairwell/pairwell/core/thermal"
	"github.com/pairwell/pairwell/core/units"
)

// ExpansionRow is the thermal expansion of the bond at one temperature.
// Separations are in Å, coefficients in 1/K; NaN (null) where a column has
// no value.
type ExpansionRow struct {
	Temperature Number `json:"temperature_k"`
	// MeanClassical, MeanCubic and MeanQuantum are ⟨r⟩: classical
	// Boltzmann average over the bound region, cubic-term estimate
	// re − 3c₃k_BT/(4c₂²), and Boltzmann average of ⟨r⟩_v over the levels.
	MeanClassical Number `json:"mean_r_classical_angstrom"`
	MeanCubic     Number `json:"mean_r_cubic_estimate_angstrom"`
	MeanQuantum   Number `json:"mean_r_quantum_angstrom"`
	// Expansion is the classical (1/re)·d⟨r⟩/dT; the cubic and quantum
	// ones follow.
	Expansion        Number `json:"expansion_coefficient_classical_per_k"`
	ExpansionCubic   Number `json:"expansion_coefficient_cubic_per_k"`
	ExpansionQuantum Number `json:"expansion_coefficient_quantum_per_k"`
	// RMS is the classical √(⟨r²⟩ − ⟨r⟩²); the harmonic √(k_BT/k) and the
	// quantum one follow.
	RMS         Number `json:"rms_displacement_classical_angstrom"`
	RMSHarmonic Number `json:"rms_displacement_harmonic_angstrom"`
	RMSQuantum  Number `json:"rms_displacement_quantum_angstrom"`
	// ClassicalError is the estimated error of MeanClassical, cut-off
	// dependence included; EdgePopulation the population at the cut-off.
	ClassicalError Number `json:"mean_r_classical_error_estimate_angstrom"`
	EdgePopulation Number `json:"edge_population"`
}

// Expansion is the result of the expansion command.
type Expansion struct {
	Model  string `json:"model"`
	Params Params `json:"params"`
	// Pair is the atom pair of the mass, empty (null) when the mass was
	// given directly.
	Pair Text   `json:"pair"`
	Mu   Number `json:"reduced_mass_u"`
	Re   Number `json:"equilibrium_r_angstrom"`
	// Cutoff is E_cut, the top of the bound region above V(re) in eV,
	// and Region its ends in Å; NaN (null) for an unbounded well.
	Cutoff Number    `json:"cutoff_energy_ev"`
	Region [2]Number `json:"bound_region_angstrom"`
	// Levels is the number of vibrational levels averaged over; 0 when
	// the quantum column is missing.
	Levels  int            `json:"quantum_levels"`
	Rows    []ExpansionRow `json:"rows"`
	Notes   []string       `json:"notes"`
	Caution string         `json:"caution"`
}

// ExpansionSettings controls NewExpansion.
type ExpansionSettings struct {
	Thermal thermal.Settings
	// Levels solves the J = 0 vibrational levels of a potential for the
	// reduced mass mu (u), enough of them for temperatures up to tmax (K);
	// nil leaves the quantum column out. SolveLevels is the usual one.
	Levels func(p core.Potential, mu, tmax float64) ([]thermal.Level, error)
}

// maxUnboundedLevels caps the levels solved for an unbounded well.
const maxUnboundedLevels = 400

// SolveLevels returns the J = 0 vibrational levels of p for the reduced
// mass mu (u) by levels.Solve: every bound level of a bounded well; for an
// unbounded one (harmonic) the levels up to 60·k_B·tmax above the
// harmonic zero point (at most 400; thermal refuses temperatures at which
// the highest one is populated).
func SolveLevels(p core.Potential, mu, tmax float64) ([]thermal.Level, error) {
	set := levels.Settings{}
	if !p.Domain().Bounded() {
		w, err := core.AnalyzeWell(p, core.WellSettings{Order: 2})
		if err != nil {
			return nil, err
		}
		hw := units.HbarEVfs * units.AngularFrequency(w.K, mu)
		set.Count = min(maxUnboundedLevels, int(60*units.BoltzmannEV*tmax/hw)+2)
	}
	res, err := levels.Solve(p, mu, set)
	if err != nil {
		return nil, err
	}
	out := make([]thermal.Level, 0, len(res.Levels))
	for _, l := range res.Levels {
		if l.J == 0 {
			out = append(out, thermal.Level{Energy: l.Energy, MeanR: l.MeanR, MeanSquareR: l.MeanSquareR})
		}
	}
	return out, nil
}

// NewExpansion computes the thermal expansion of the bond of inst for the
// reduced mass mu (u) at the temperatures (K). Errors are those of package
// thermal and of the level solver.
func NewExpansion(inst core.Instance, mu float64, temps []float64, s ExpansionSettings) (Expansion, error) {
	e, err := thermal.New(inst.Potential, s.Thermal)
	if err != nil {
		return Expansion{}, err
	}
	w := e.Well()
	ecut, lo, hi := e.Cut()
	out := Expansion{Model: inst.Model.Info().Key, Params: NewParams(inst), Mu: Number(mu), Re: Number(w.Re),
		Cutoff: Number(ecut), Region: [2]Number{Number(lo), Number(hi)}, Caution: Caution}
	out.Notes = append(out.Notes, "all columns are for the vibration alone (one dimension, J = 0): rotation and centrifugal stretching are not included")
	if !math.IsInf(ecut, 1) {
		out.Notes = append(out.Notes, fmt.Sprintf("classical averages over the bound region %.6g Å < r < %.6g Å, where V − V(re) < %.6g eV; temperatures at which the population at its edge exceeds %.2g are refused",
			lo, hi, ecut, edgeLimit(s.Thermal)))
	}
	var lv []thermal.Level
	if s.Levels != nil {
		tmax := 0.0
		for _, T := range temps {
			tmax = math.Max(tmax, T)
		}
		if lv, err = s.Levels(inst.Potential, mu, tmax); err != nil {
			return Expansion{}, fmt.Errorf("vibrational levels: %w", err)
		}
		out.Levels = len(lv)
	} else {
		out.Notes = append(out.Notes, "the quantum column is not available in this build (no level solver)")
	}
	pts, err := e.Points(temps, lv)
	if err != nil {
		return Expansion{}, err
	}
	for _, p := range pts {
		out.Rows = append(out.Rows, ExpansionRow{
			Temperature: Number(p.Temperature), MeanClassical: Number(p.MeanClassical), MeanCubic: Number(p.MeanCubic),
			MeanQuantum: Number(p.MeanQuantum), Expansion: Number(p.ExpansionClassical), ExpansionCubic: Number(p.ExpansionCubic),
			ExpansionQuantum: Number(p.ExpansionQuantum), RMS: Number(p.RMSClassical), RMSHarmonic: Number(p.RMSHarmonic),
			RMSQuantum: Number(p.RMSQuantum), ClassicalError: Number(p.ClassicalError), EdgePopulation: Number(p.EdgePopulation),
		})
	}
	return out, nil
}

func edgeLimit(s thermal.Settings) float64 {
	if s.MaxEdgePopulation == 0 {
		return thermal.DefaultMaxEdgePopulation
	}
	return s.MaxEdgePopulation
}

// WellOf analyses the well of inst (Taylor coefficients up to order 2,
// and 4 when the form has them), for the default ranges of pictures.
func WellOf(inst core.Instance) (core.Well, error) { return wellOf(inst, 2) }
