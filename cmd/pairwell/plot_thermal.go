package main

import (
	"errors"
	"math"

	"github.com/spf13/cobra"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/figure"
	"github.com/pairwell/pairwell/core/report"
	"github.com/pairwell/pairwell/core/units"
)

// thermalPlotPoints is the number of temperatures of a B₂ or ⟨r⟩ curve.
const thermalPlotPoints = 200

// plotTemperatures returns thermalPlotPoints temperatures from lo to hi
// (K), spaced geometrically.
func plotTemperatures(lo, hi float64) []float64 {
	out := make([]float64, thermalPlotPoints)
	for i := range out {
		out[i] = lo * math.Pow(hi/lo, float64(i)/float64(thermalPlotPoints-1))
	}
	return out
}

// curveRange returns the range of the curve: that of --temperatures when
// given, else of the data, else the default.
func curveRange(cmd *cobra.Command, temps string, data []report.Measurement, defLo, defHi float64) (lo, hi float64, err error) {
	if cmd.Flags().Changed("temperatures") {
		ts, err := parseTemperatures(temps)
		if err != nil {
			return 0, 0, usageErr(errors.New("--temperatures: " + err.Error()))
		}
		lo, hi = math.Inf(1), 0
		for _, T := range ts {
			lo, hi = math.Min(lo, T), math.Max(hi, T)
		}
		if !(lo < hi) {
			return 0, 0, usageErr(errors.New("--temperatures: a curve needs at least two different temperatures"))
		}
		return lo, hi, nil
	}
	if len(data) > 0 {
		lo, hi = math.Inf(1), 0
		for _, m := range data {
			lo, hi = math.Min(lo, m.Temperature), math.Max(hi, m.Temperature)
		}
		if lo < hi {
			return lo / 1.1, hi * 1.1, nil
		}
	}
	return defLo, defHi, nil
}

func newPlotVirialCmd(e *env) *cobra.Command {
	var (
		fp          formPlot
		temps, data string
	)
	cmd := &cobra.Command{
		Use:   "virial SPEC [--pair A-B | --mu M] [--temperatures LIST|FROM:TO:COUNT] [--data FILE.csv] -o FILE",
		Short: "Draw B₂(T): classical, with the ħ² correction, and measured points",
		Long: `virial draws the second virial coefficient of SPEC against temperature (see
"pairwell virial"): the classical B₂ (black), with a mass also B₂ with the ħ²
correction, the measured points of --data, and a dotted line at the Boyle
temperature. The curve spans the smallest to the largest of --temperatures (200
points); without them the range of the data, or depth/(3k_B) to 30·depth/k_B.`,
		Example: `  pairwell plot virial lj:epsilon=119.8K,sigma=3.405 --pair Ar-Ar --temperatures 80:1000:2 -o b2.png
  pairwell plot virial lj:epsilon=119.8K,sigma=3.405 --data b2.csv -o b2.svg`,
		Args: exactArgs(1, "SPEC"),
		RunE: func(cmd *cobra.Command, args []string) error {
			var set report.VirialSettings
			return fp.draw(e, args[0], false, func(report.Mass) (err error) {
				if data != "" {
					if set.Data, err = readDataFile(data); err != nil {
						return err
					}
					set.DataFile = data
				}
				return nil
			}, func(inst core.Instance, m report.Mass, name string) (*figure.Figure, error) {
				w, err := report.WellOf(inst)
				if err != nil {
					return nil, err
				}
				unit := w.Depth / units.BoltzmannEV
				lo, hi, err := curveRange(cmd, temps, set.Data, unit/3, 30*unit)
				if err != nil {
					return nil, err
				}
				v, err := report.NewVirial(inst, m.Mu, plotTemperatures(lo, hi), set)
				if err != nil {
					return nil, err
				}
				o := figure.VirialOptions{Name: name, Boyle: float64(v.Boyle), DataFile: data}
				for _, p := range v.Points[:len(v.Rows)] {
					o.T, o.Classical = append(o.T, p.Temperature), append(o.Classical, p.Classical)
					if m.Mu > 0 {
						o.Total = append(o.Total, p.Total)
					}
				}
				for _, d := range set.Data {
					o.DataT, o.DataB2 = append(o.DataT, d.Temperature), append(o.DataB2, d.B2)
				}
				f, err := figure.Virial(o)
				if err != nil {
					return nil, err
				}
				f.Notes = append(f.Notes, v.Notes...)
				return f, nil
			})
		},
	}
	fp.register(e, cmd)
	cmd.Flags().StringVar(&temps, "temperatures", "", "range of the curve: the smallest to the largest of LIST or FROM:TO:COUNT, K unless a unit is given")
	cmd.Flags().StringVar(&data, "data", "", "CSV of measured (T, B2[, uncertainty]) with units in the header, drawn as points")
	return cmd
}

func newPlotExpansionCmd(e *env) *cobra.Command {
	var (
		fp    formPlot
		temps string
	)
	cmd := &cobra.Command{
		Use:   "expansion SPEC (--pair A-B | --mu M) [--temperatures LIST|FROM:TO:COUNT] -o FILE",
		Short: "Draw ⟨r⟩(T): classical, cubic-term estimate and quantum",
		Long: `expansion draws the mean bond length against temperature (see "pairwell
expansion"): the classical average (black), the cubic-term estimate, the quantum
average over the levels (when available) and re. The curve spans the smallest
to the largest of --temperatures (200 points); by default 1 K to depth/(20 k_B).`,
		Example: `  pairwell plot expansion morse:De=4.6,a=1.87,re=1.27 --pair H-Cl -o expansion.png`,
		Args:    exactArgs(1, "SPEC"),
		RunE: func(cmd *cobra.Command, args []string) error {
			return fp.draw(e, args[0], true, nil, func(inst core.Instance, m report.Mass, name string) (*figure.Figure, error) {
				w, err := report.WellOf(inst)
				if err != nil {
					return nil, err
				}
				hiDef := 3000.0
				if w.Bounded() {
					hiDef = w.Depth / units.BoltzmannEV / 20
				}
				lo, hi, err := curveRange(cmd, temps, nil, math.Min(1, hiDef/100), hiDef)
				if err != nil {
					return nil, err
				}
				x, err := report.NewExpansion(inst, m.Mu, plotTemperatures(lo, hi), expansionSettings())
				if err != nil {
					return nil, err
				}
				o := figure.ExpansionOptions{Name: name, Re: float64(x.Re)}
				for _, r := range x.Rows {
					o.T = append(o.T, float64(r.Temperature))
					o.Classical = append(o.Classical, float64(r.MeanClassical))
					o.Cubic = append(o.Cubic, float64(r.MeanCubic))
					o.Quantum = append(o.Quantum, float64(r.MeanQuantum))
				}
				f, err := figure.Expansion(o)
				if err != nil {
					return nil, err
				}
				f.Notes = append(f.Notes, x.Notes...)
				return f, nil
			})
		},
	}
	fp.register(e, cmd)
	cmd.Flags().StringVar(&temps, "temperatures", "", "range of the curve: the smallest to the largest of LIST or FROM:TO:COUNT, K unless a unit is given")
	return cmd
}
