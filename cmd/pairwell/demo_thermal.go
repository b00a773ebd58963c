package main

import (
	"bytes"
	_ "embed"
	"fmt"
	"math"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/figure"
	"github.com/pairwell/pairwell/core/report"
)

// demoGasCSV is the demo's INVENTED B₂ data of an invented argon-like gas
// (see the comment lines of the file).
//
//go:embed demodata/invented-b2.csv
var demoGasCSV []byte

// demoGasName names the data in the demo's output.
const demoGasName = "invented-b2.csv"

// demoGasSpec is the demo's invented argon-like gas: Lennard-Jones with
// round numbers of the size of argon's (ε/k_B = 120 K, σ = 3.4 Å), not
// fitted to any data.
const demoGasSpec = "lj:epsilon=120K,sigma=3.4"

// demoExpansionTemperatures (K) are the rows of the demo's expansion table.
var demoExpansionTemperatures = []float64{10, 300, 1000, 1500, 2000}

// demoTemperature is the demo's temperature section.
type demoTemperature struct {
	// Expansion is the thermal expansion of the demo bond (its Morse form).
	Expansion report.Expansion `json:"expansion"`
	// Gas is B₂ of the invented gas against its invented data.
	Gas demoGas `json:"gas"`
}

// demoGas is B₂ of the invented gas.
type demoGas struct {
	Invented    bool          `json:"invented"`
	Description string        `json:"description"`
	Virial      report.Virial `json:"virial"`
}

// demoTemperatureSection computes the temperature section: the Morse form
// of the demo bond (src) and the invented gas.
func demoTemperatureSection(e *env, src core.Instance) (*demoTemperature, error) {
	x, err := report.NewExpansion(src, demoBond.mu, demoExpansionTemperatures, expansionSettings())
	if err != nil {
		return nil, computeErr(fmt.Errorf("demo expansion: %w", err))
	}
	v, err := demoGasVirial(e)
	if err != nil {
		return nil, err
	}
	return &demoTemperature{Expansion: x, Gas: demoGas{
		Invented: true,
		Description: "An INVENTED argon-like gas (Lennard-Jones, ε/k_B = 120 K, σ = 3.4 Å, round numbers not fitted to data) " +
			"compared with INVENTED B₂ values written down near its curve with made-up offsets; not measurements of any gas.",
		Virial: v,
	}}, nil
}

// demoGasVirial is B₂ of the invented gas at the temperatures of its
// invented data, compared with them (argon's reduced mass for the ħ² term).
func demoGasVirial(e *env) (report.Virial, error) {
	data, err := readB2Data(bytes.NewReader(demoGasCSV))
	if err != nil {
		return report.Virial{}, failErr(fmt.Errorf("demo: %s: %w", demoGasName, err))
	}
	inst, err := e.build(demoGasSpec)
	if err != nil {
		return report.Virial{}, err
	}
	m, err := (&massFlags{pair: "Ar-Ar"}).resolve(true)
	if err != nil {
		return report.Virial{}, err
	}
	v, err := report.NewVirial(inst, m.Mu, nil, report.VirialSettings{Data: data, DataFile: demoGasName})
	if err != nil {
		return report.Virial{}, computeErr(fmt.Errorf("demo gas: %w", err))
	}
	v.Pair = report.Text(m.Pair)
	return v, nil
}

func writeDemoTemperature(w tableWriter, r demoReport) error {
	t := r.Temperature
	if t == nil {
		return nil
	}
	x := t.Expansion
	fmt.Fprintf(w, "\n== The bond warms up (%s, pairwell expansion --mu %g)\n", x.Model, demoBond.mu)
	if err := w.table(expansionTable(x)); err != nil {
		return err
	}
	first, last := x.Rows[0], x.Rows[len(x.Rows)-1]
	s := fmt.Sprintf("The cubic term makes the well asymmetric, so the mean bond length grows with temperature: classically by %.3g Å "+
		"from %g K to %g K (expansion coefficient %.3g/K at %g K), and the cubic-term estimate −3c₃k_BT/(4c₂²) follows it "+
		"at low temperature (%.3g against %.3g Å at %g K).",
		float64(last.MeanClassical-first.MeanClassical), float64(first.Temperature), float64(last.Temperature),
		float64(first.Expansion), float64(first.Temperature),
		float64(first.MeanCubic)-float64(x.Re), float64(first.MeanClassical)-float64(x.Re), float64(first.Temperature))
	if q := float64(first.MeanQuantum); !math.IsNaN(q) {
		alpha := fmt.Sprintf("%.2g/K", float64(first.ExpansionQuantum))
		if float64(first.ExpansionQuantum) < 1e-20 {
			alpha = "below 1e-20/K"
		}
		s += fmt.Sprintf(" Quantum mechanically the bond is %.3g Å longer than re already at %g K (zero-point motion) and its expansion "+
			"is frozen out (%s) until k_BT nears ħω.", q-float64(x.Re), float64(first.Temperature), alpha)
	}
	fmt.Fprintln(w, wrap(s, 88))

	v := t.Gas.Virial
	fmt.Fprintf(w, "\n== An INVENTED gas against INVENTED B₂ data (pairwell virial %s --pair Ar-Ar --data %s)\n", demoGasSpec, demoGasName)
	if err := w.table(virialTable(v)); err != nil {
		return err
	}
	s = fmt.Sprintf("%s The Boyle temperature of the model is %.4g K and its B₂ peaks at %.4g K; the RMS deviation from the invented "+
		"points is %.3g cm³/mol.", t.Gas.Description, float64(v.Boyle), float64(v.MaxB2), float64(v.Data.RMSDeviation))
	_, err := fmt.Fprintln(w, wrap(s, 88))
	return err
}

// demoTemperaturePictures are the pictures of the temperature section.
func demoTemperaturePictures(e *env, src core.Instance, name string) []demoPicture {
	return []demoPicture{
		{"expansion.png", fmt.Sprintf("%s mean bond length against temperature: classical, cubic-term estimate, quantum", name), func() (*figure.Figure, error) {
			ts := plotTemperatures(1, 2000)
			x, err := report.NewExpansion(src, demoBond.mu, ts, expansionSettings())
			if err != nil {
				return nil, err
			}
			o := figure.ExpansionOptions{Name: name, Re: float64(x.Re)}
			for _, r := range x.Rows {
				o.T, o.Classical = append(o.T, float64(r.Temperature)), append(o.Classical, float64(r.MeanClassical))
				o.Cubic, o.Quantum = append(o.Cubic, float64(r.MeanCubic)), append(o.Quantum, float64(r.MeanQuantum))
			}
			return figure.Expansion(o)
		}},
		{"virial.png", "B₂ of the invented gas with its invented data points", func() (*figure.Figure, error) {
			data, err := readB2Data(bytes.NewReader(demoGasCSV))
			if err != nil {
				return nil, err
			}
			inst, err := e.build(demoGasSpec)
			if err != nil {
				return nil, err
			}
			v, err := report.NewVirial(inst, 0, plotTemperatures(120, 800), report.VirialSettings{})
			if err != nil {
				return nil, err
			}
			o := figure.VirialOptions{Name: "invented argon-like gas", Boyle: float64(v.Boyle), DataFile: demoGasName + " (INVENTED)"}
			for _, p := range v.Points {
				o.T, o.Classical = append(o.T, p.Temperature), append(o.Classical, p.Classical)
			}
			for _, d := range data {
				o.DataT, o.DataB2 = append(o.DataT, d.Temperature), append(o.DataB2, d.B2)
			}
			return figure.Virial(o)
		}},
	}
}
