package main

import (
	"errors"
	"fmt"

	"github.com/spf13/cobra"

	"github.com/pairwell/pairwell/core/report"
)

func newExpansionCmd(e *env) *cobra.Command {
	var (
		mass  massFlags
		temps string
	)
	cmd := &cobra.Command{
		Use:   "expansion SPEC (--pair A-B | --mu M) --temperatures LIST|FROM:TO:COUNT",
		Short: "Thermal expansion of a bond: classical, cubic-term and quantum ⟨r⟩(T), expansion coefficient, rms displacement",
		Long: `expansion computes the mean bond length ⟨r⟩ of the pair at each temperature
three ways, side by side, with the linear expansion coefficient (1/re)·d⟨r⟩/dT
and the rms displacement √(⟨r²⟩ − ⟨r⟩²) of each:

  classical  Boltzmann average ∫ r e^{−ΔV/k_BT} dr / ∫ e^{−ΔV/k_BT} dr over the
             bound region, where ΔV = V − V(re) < 0.9·depth (or 0.9 of an inner
             barrier); temperatures at which the population at the edge of the
             region exceeds 1e-6 are refused
  cubic      the first-order estimate ⟨r⟩ = re − 3c₃k_BT/(4c₂²) from the cubic
             Taylor term (Kittel, Introduction to Solid State Physics, ch. 5);
             its rms displacement is the harmonic √(k_BT/k)
  quantum    the Boltzmann average of ⟨r⟩_v over the vibrational levels (J = 0)

All three are for the vibration alone (rotation and centrifugal stretching are
not included). The cubic estimate is the low-temperature limit of the classical
average; the classical picture misses the zero-point motion and the freezing
out of the expansion below ħω/k_B, which the quantum column shows.

Temperatures: a list or FROM:TO:COUNT, in K unless a unit is given (degC, or an
energy read as k_B·T). JSON is in K, Å and 1/K.`,
		Example: `  pairwell expansion morse:De=4.6,a=1.87,re=1.27 --pair H-Cl --temperatures 100:3000:30
  pairwell expansion lj:epsilon=119.8K,sigma=3.405 --pair Ar-Ar --temperatures 1,5,10 --format json`,
		Args: exactArgs(1, "SPEC"),
		RunE: func(cmd *cobra.Command, args []string) error {
			m, err := mass.resolve(true)
			if err != nil {
				return err
			}
			if !cmd.Flags().Changed("temperatures") {
				return usageErr(errors.New("give --temperatures LIST|FROM:TO:COUNT (K unless a unit is given)"))
			}
			ts, err := parseTemperatures(temps)
			if err != nil {
				return usageErr(fmt.Errorf("--temperatures: %w", err))
			}
			inst, err := e.build(args[0])
			if err != nil {
				return err
			}
			x, err := report.NewExpansion(inst, m.Mu, ts, expansionSettings())
			if err != nil {
				return computeErr(err)
			}
			x.Pair = report.Text(m.Pair)
			if e.format == "table" {
				fmt.Fprintf(e.stdout, "%s (%s): re = %s Å, μ = %s u\n", x.Model, x.Params, num(float64(x.Re)), num(float64(x.Mu)))
			}
			if err := e.emitRecords(x, "rows", expansionTable(x)); err != nil {
				return err
			}
			switch e.format {
			case "table":
				for _, n := range x.Notes {
					fmt.Fprintln(e.stdout, "Note: "+n)
				}
				fmt.Fprintln(e.stdout, x.Caution)
			case "csv":
				for _, n := range x.Notes {
					fmt.Fprintln(e.stderr, "pairwell: note: "+n)
				}
			}
			return nil
		},
	}
	mass.register(cmd)
	cmd.Flags().StringVar(&temps, "temperatures", "", "temperatures, K unless a unit is given: LIST (100,300K,25degC) or FROM:TO:COUNT (100:3000:30)")
	return cmd
}

// expansionSettings are the settings of the expansion command and its
// picture.
func expansionSettings() report.ExpansionSettings {
	return report.ExpansionSettings{Levels: report.SolveLevels}
}

// expansionTable lays out the rows, units in the headers.
func expansionTable(x report.Expansion) *table {
	t := &table{cols: []column{{Title: "T", Unit: "K"},
		{Title: "<r> classical", Unit: "Å"}, {Title: "<r> cubic", Unit: "Å"}, {Title: "<r> quantum", Unit: "Å"},
		{Title: "alpha classical", Unit: "1/K"}, {Title: "alpha cubic", Unit: "1/K"}, {Title: "alpha quantum", Unit: "1/K"},
		{Title: "rms classical", Unit: "Å"}, {Title: "rms harmonic", Unit: "Å"}, {Title: "rms quantum", Unit: "Å"}}}
	for _, r := range x.Rows {
		t.add(num(float64(r.Temperature)), num(float64(r.MeanClassical)), num(float64(r.MeanCubic)), num(float64(r.MeanQuantum)),
			num(float64(r.Expansion)), num(float64(r.ExpansionCubic)), num(float64(r.ExpansionQuantum)),
			num(float64(r.RMS)), num(float64(r.RMSHarmonic)), num(float64(r.RMSQuantum)))
	}
	return t
}
