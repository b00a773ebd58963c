package report

import (
	"fmt"
	"math"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/units"
	"github.com/pairwell/pairwell/core/virial"
)

// VirialRow is B₂ at one temperature, in cm³/mol.
type VirialRow struct {
	Temperature Number `json:"temperature_k"`
	// B2 is the classical B₂ plus the quantum correction (the classical
	// B₂ alone without a mass).
	B2        Number `json:"b2_cm3_per_mol"`
	Classical Number `json:"b2_classical_cm3_per_mol"`
	// Quantum is the first Wigner–Kirkwood correction; NaN (null)
	// without a mass.
	Quantum Number `json:"b2_quantum_correction_cm3_per_mol"`
	// ErrorEstimate is the estimated numerical error of B2 (see
	// virial.Point.ErrorEstimate).
	ErrorEstimate Number `json:"error_estimate_cm3_per_mol"`
}

// VirialDataRow compares B₂ with one measured (T, B₂[, uncertainty]).
type VirialDataRow struct {
	Temperature Number `json:"temperature_k"`
	Measured    Number `json:"measured_b2_cm3_per_mol"`
	// Uncertainty is the stated uncertainty of the measurement; NaN
	// (null) when the file gives none.
	Uncertainty Number `json:"measured_uncertainty_cm3_per_mol"`
	B2          Number `json:"b2_cm3_per_mol"`
	// Deviation is B2 − Measured.
	Deviation Number `json:"deviation_cm3_per_mol"`
}

// VirialData is the comparison with a data file.
type VirialData struct {
	File string          `json:"file"`
	Rows []VirialDataRow `json:"rows"`
	// RMSDeviation is √(Σ deviation²/n).
	RMSDeviation Number `json:"rms_deviation_cm3_per_mol"`
}

// Virial is the result of the virial command.
type Virial struct {
	Model  string `json:"model"`
	Params Params `json:"params"`
	// Pair is the atom pair of the mass, empty (null) when the mass was
	// given directly or not at all.
	Pair Text `json:"pair"`
	// Mu is the reduced mass in u; NaN (null) without one.
	Mu Number `json:"reduced_mass_u"`
	// HardCore is the radius in Å below which the integrand was taken as
	// −1 because the form collapses there (Buckingham); NaN (null) when
	// the form has no inner barrier.
	HardCore Number `json:"hard_core_angstrom"`
	// Boyle and MaxB2 are the Boyle temperature and the temperature of
	// the maximum of the classical B₂ in K; NaN (null) when there is none
	// in the searched range (see virial.Calculator.Characteristic).
	Boyle      Number `json:"boyle_temperature_k"`
	BoyleError Number `json:"boyle_temperature_error_estimate_k"`
	MaxB2      Number `json:"max_b2_temperature_k"`
	MaxB2Error Number `json:"max_b2_temperature_error_estimate_k"`
	// SearchLow and SearchHigh bound the search of Boyle and MaxB2.
	SearchLow  Number      `json:"search_low_k"`
	SearchHigh Number      `json:"search_high_k"`
	Rows       []VirialRow `json:"rows"`
	Data       *VirialData `json:"data"`
	Notes      []string    `json:"notes"`
	Caution    string      `json:"caution"`
	// Points are the full results behind Rows, then behind Data.Rows.
	Points []virial.Point `json:"-"`
}

// Caution is the usual caution printed with temperature observables.
const Caution = "Caution: classical model potentials, not validated force fields: do not base production or safety decisions on these numbers alone."

// Measurement is one measured B₂: T in K, B₂ and its uncertainty in
// cm³/mol (NaN when not given).
type Measurement struct {
	Temperature, B2, Uncertainty float64
}

// VirialSettings controls NewVirial.
type VirialSettings struct {
	Virial virial.Settings
	// Data are measurements to compare with, from DataFile.
	Data     []Measurement
	DataFile string
}

// NewVirial computes B₂ of inst at the temperatures (K), with the
// quantum correction when mu > 0, its Boyle temperature and maximum, and
// the comparison with s.Data. Errors are those of package virial.
func NewVirial(inst core.Instance, mu float64, temps []float64, s VirialSettings) (Virial, error) {
	c, err := virial.New(inst.Potential, s.Virial)
	if err != nil {
		return Virial{}, err
	}
	out := Virial{Model: inst.Model.Info().Key, Params: NewParams(inst), Mu: Number(math.NaN()), Rows: []VirialRow{},
		HardCore: Number(math.NaN()), Caution: Caution}
	if mu > 0 {
		out.Mu = Number(mu)
	}
	if rb, vb, ok := c.HardCore(); ok {
		out.HardCore = Number(rb)
		out.Notes = append(out.Notes, fmt.Sprintf("the form collapses to −∞ below its inner barrier at %.6g Å (%.4g eV above the dissociation limit), where B₂ diverges: the barrier is treated as a hard core (the integrand is −1 below it); --refuse-collapse refuses such forms instead", rb, vb))
	}
	pts, err := c.Points(temps, mu)
	if err != nil {
		return Virial{}, err
	}
	out.Points = pts
	for _, p := range pts {
		out.Rows = append(out.Rows, VirialRow{Temperature: Number(p.Temperature), B2: Number(p.Total),
			Classical: Number(p.Classical), Quantum: Number(p.QuantumCorrection), ErrorEstimate: Number(p.ErrorEstimate)})
	}
	ch, err := c.Characteristic()
	if err != nil {
		return Virial{}, err
	}
	out.Boyle, out.BoyleError = Number(ch.Boyle), Number(ch.BoyleError)
	out.MaxB2, out.MaxB2Error = Number(ch.Max), Number(ch.MaxError)
	out.SearchLow, out.SearchHigh = Number(ch.Low), Number(ch.High)
	if math.IsNaN(ch.Boyle) {
		out.Notes = append(out.Notes, fmt.Sprintf("B₂ does not change sign between %.4g K and %.4g K: no Boyle temperature there", ch.Low, ch.High))
	}
	if math.IsNaN(ch.Max) {
		out.Notes = append(out.Notes, fmt.Sprintf("B₂ has no maximum between %.4g K and %.4g K", ch.Low, ch.High))
	}
	if mu > 0 {
		out.Notes = append(out.Notes, "the Boyle temperature and the maximum are those of the classical B₂")
		// The size of B₂ is judged against |B₂^cl| and the volume
		// (2π/3)N_A·re³ (B₂^cl passes through zero at the Boyle
		// temperature).
		re, _ := c.Equilibrium()
		b0 := 2 * math.Pi / 3 * units.Avogadro * 1e-24 * re * re * re
		for _, p := range pts {
			if s := math.Max(math.Abs(p.Classical), b0); math.Abs(p.QuantumCorrection) > 0.1*s {
				out.Notes = append(out.Notes, fmt.Sprintf("at %.6g K the ħ² correction is %.0f%% of max(|B₂ classical|, ⅔πN_A·re³): the expansion in ħ² is not reliable there (higher orders and exchange are left out)",
					p.Temperature, 100*math.Abs(p.QuantumCorrection)/s))
				break
			}
		}
	}
	if len(s.Data) > 0 {
		ts := make([]float64, len(s.Data))
		for i, m := range s.Data {
			ts[i] = m.Temperature
		}
		dp, err := c.Points(ts, mu)
		if err != nil {
			return Virial{}, fmt.Errorf("data %s: %w", s.DataFile, err)
		}
		out.Points = append(out.Points, dp...)
		d := &VirialData{File: s.DataFile}
		sum := 0.0
		for i, m := range s.Data {
			dev := dp[i].Total - m.B2
			sum += dev * dev
			d.Rows = append(d.Rows, VirialDataRow{Temperature: Number(m.Temperature), Measured: Number(m.B2),
				Uncertainty: Number(m.Uncertainty), B2: Number(dp[i].Total), Deviation: Number(dev)})
		}
		d.RMSDeviation = Number(math.Sqrt(sum / float64(len(s.Data))))
		out.Data = d
	}
	return out, nil
}

// BoyleTemperature returns the Boyle temperature in K of a bounded form's
// classical B₂ (Buckingham's barrier a hard core), NaN when it has none in
// the searched range (see virial.Calculator.Boyle), for compare.
func BoyleTemperature(p core.Potential) (virial.Temperatures, error) {
	c, err := virial.New(p, virial.Settings{})
	if err != nil {
		return virial.Temperatures{Boyle: math.NaN()}, err
	}
	ch, err := c.Boyle()
	if err != nil {
		return virial.Temperatures{Boyle: math.NaN()}, err
	}
	return ch, nil
}
