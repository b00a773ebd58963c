package main

import (
	"errors"
	"fmt"
	"os"

	"github.com/spf13/cobra"

	"github.com/pairwell/pairwell/core/report"
	"github.com/pairwell/pairwell/core/units"
	"github.com/pairwell/pairwell/core/virial"
)

// parseTemperatures reads --temperatures: a list or FROM:TO:COUNT of
// temperatures with units (units.ParseTemperature: K, degC, or an energy
// as k_B·T).
func parseTemperatures(s string) ([]float64, error) {
	ts, err := parseSweepWith(s, units.ParseTemperature)
	if err != nil {
		return nil, err
	}
	for _, T := range ts {
		if !(T > 0) {
			return nil, fmt.Errorf("%q: temperature %g K is not above absolute zero", s, T)
		}
	}
	return ts, nil
}

// readDataFile reads a --data file (see readB2Data): exit 1 when it
// cannot be read, 2 when its content is bad.
func readDataFile(path string) ([]report.Measurement, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, failErr(fmt.Errorf("--data: %w", err))
	}
	defer f.Close()
	data, err := readB2Data(f)
	if err != nil {
		return nil, usageErr(fmt.Errorf("--data %s: %w", path, err))
	}
	return data, nil
}

func newVirialCmd(e *env) *cobra.Command {
	var (
		mass           massFlags
		temps, data    string
		refuseCollapse bool
	)
	cmd := &cobra.Command{
		Use:   "virial SPEC [--pair A-B | --mu M] --temperatures LIST|FROM:TO:COUNT [--data FILE.csv] [--refuse-collapse]",
		Short: "Second virial coefficient B₂(T): classical, ħ² correction, Boyle temperature, comparison with data",
		Long: `virial computes the second virial coefficient of a gas whose molecules interact
through the pair potential SPEC,

  B₂(T) = −2πN_A ∫₀^∞ (e^{−V(r)/k_BT} − 1) r² dr     (V measured from V(∞)),

by Gauss–Legendre quadrature to 1e-10 relative, with an error estimate (repulsive
core below 50 k_BT taken as a hard core with a bound on what that drops; the tail
mapped onto a finite interval, no truncation). With a mass (--pair or --mu) the
first quantum correction (Wigner–Kirkwood, order ħ²; Hirschfelder, Curtiss &
Bird 1954, ch. 6) is added:

  B₂⁽¹⁾ = (π N_A ħ² / (12 μ (k_BT)³)) ∫₀^∞ e^{−V/k_BT} V′² r² dr.

It also reports the Boyle temperature (B₂ = 0) and the temperature of the
maximum of B₂, both of the classical B₂. A form that collapses below an inner
barrier (Buckingham) has no finite B₂: the barrier is treated as a hard core
and the output says so; --refuse-collapse refuses such forms instead.

--data FILE.csv compares with measurements: a header row with units in
brackets, "T [K],B2 [cm3/mol]" and optionally ",uncertainty [cm3/mol]" (K or
degC; cm3/mol, dm3/mol = L/mol or m3/mol), then one row per point; lines
starting with # are comments. The output adds each deviation (computed −
measured) and their RMS.

Temperatures: a list (100,200K,25degC,0.05eV) or FROM:TO:COUNT, in K unless a
unit is given (degC, or an energy read as k_B·T). JSON is in K and cm³/mol.`,
		Example: `  pairwell virial lj:epsilon=119.8K,sigma=3.405 --pair Ar-Ar --temperatures 100:1000:10
  pairwell virial lj:epsilon=119.8K,sigma=3.405 --temperatures 0degC,100degC --format json
  pairwell virial buckingham:A=1500,rho=0.3,C=25 --temperatures 300,1000
  pairwell virial lj:epsilon=119.8K,sigma=3.405 --pair Ar-Ar --data b2.csv`,
		Args: exactArgs(1, "SPEC"),
		RunE: func(cmd *cobra.Command, args []string) error {
			m, err := mass.resolve(false)
			if err != nil {
				return err
			}
			var ts []float64
			if cmd.Flags().Changed("temperatures") {
				if ts, err = parseTemperatures(temps); err != nil {
					return usageErr(fmt.Errorf("--temperatures: %w", err))
				}
			}
			set := report.VirialSettings{Virial: virial.Settings{RefuseCollapse: refuseCollapse}}
			if data != "" {
				if set.Data, err = readDataFile(data); err != nil {
					return err
				}
				set.DataFile = data
			}
			if len(ts) == 0 && len(set.Data) == 0 {
				return usageErr(errors.New("give --temperatures LIST|FROM:TO:COUNT (K unless a unit is given) or --data FILE.csv"))
			}
			inst, err := e.build(args[0])
			if err != nil {
				return err
			}
			v, err := report.NewVirial(inst, m.Mu, ts, set)
			if err != nil {
				return computeErr(err)
			}
			v.Pair = report.Text(m.Pair)
			if e.format == "table" {
				fmt.Fprintf(e.stdout, "%s (%s): Boyle temperature %s K, maximum of B₂ at %s K (classical)\n",
					v.Model, v.Params, num(float64(v.Boyle)), num(float64(v.MaxB2)))
			}
			if err := e.emitRecords(v, "rows,data.rows", virialTable(v)); err != nil {
				return err
			}
			if e.format == "table" {
				if v.Data != nil {
					fmt.Fprintf(e.stdout, "RMS deviation from %s: %s cm³/mol over %d points\n", v.Data.File, num(float64(v.Data.RMSDeviation)), len(v.Data.Rows))
				}
				for _, n := range v.Notes {
					fmt.Fprintln(e.stdout, "Note: "+n)
				}
				fmt.Fprintln(e.stdout, v.Caution)
			} else if e.format == "csv" {
				for _, n := range v.Notes {
					fmt.Fprintln(e.stderr, "pairwell: note: "+n)
				}
			}
			return nil
		},
	}
	mass.register(cmd)
	f := cmd.Flags()
	f.StringVar(&temps, "temperatures", "", "temperatures, K unless a unit is given: LIST (100,300K,25degC,0.05eV) or FROM:TO:COUNT (100:1000:10)")
	f.StringVar(&data, "data", "", "CSV of measured (T, B2[, uncertainty]) with units in the header, to compare with")
	f.BoolVar(&refuseCollapse, "refuse-collapse", false, "refuse forms that collapse below an inner barrier (Buckingham) instead of treating the barrier as a hard core")
	return cmd
}

// virialTable lays out the rows at --temperatures, then the data points
// with their measured values and deviations.
func virialTable(v report.Virial) *table {
	t := &table{cols: []column{{Title: "T", Unit: "K"}, {Title: "B2", Unit: "cm³/mol"}, {Title: "B2 classical", Unit: "cm³/mol"},
		{Title: "B2 quantum correction", Unit: "cm³/mol"}, {Title: "error estimate", Unit: "cm³/mol"}}}
	if v.Data != nil {
		t.cols = append(t.cols, column{Title: "measured B2", Unit: "cm³/mol"}, column{Title: "uncertainty", Unit: "cm³/mol"},
			column{Title: "deviation", Unit: "cm³/mol"})
	}
	for _, r := range v.Rows {
		cells := []string{num(float64(r.Temperature)), num(float64(r.B2)), num(float64(r.Classical)), num(float64(r.Quantum)), num(float64(r.ErrorEstimate))}
		if v.Data != nil {
			cells = append(cells, "—", "—", "—")
		}
		t.add(cells...)
	}
	if v.Data != nil {
		pts := v.Points[len(v.Rows):]
		for i, r := range v.Data.Rows {
			p := pts[i]
			t.add(num(float64(r.Temperature)), num(float64(r.B2)), num(p.Classical), num(p.QuantumCorrection), num(p.ErrorEstimate),
				num(float64(r.Measured)), num(float64(r.Uncertainty)), num(float64(r.Deviation)))
		}
	}
	return t
}
