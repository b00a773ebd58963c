package main

import (
	"fmt"

	"github.com/spf13/cobra"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/report"
)

// demoBond is the invented bond of the demo: no real molecule has these
// numbers; they are round values of the size of a light covalent bond.
var demoBond = struct {
	target core.Target
	mu     float64
}{core.Target{Re: 1.20, Depth: 4.00, K: 30.0}, 7.0}

func newDemoCmd(e *env) *cobra.Command {
	return &cobra.Command{
		Use:   "demo",
		Short: "Run the main job on built-in demo data (an invented bond)",
		Long: `demo matches every built-in form to one invented bond (re = 1.20 Å,
De = 4.00 eV, k = 30.0 eV/Å², μ = 7.00 u — made-up numbers, not a real molecule)
and inspects each: equilibrium, depth, Taylor coefficients, force constant and
harmonic frequency.`,
		Args: exactArgs(0, "no arguments"),
		RunE: func(cmd *cobra.Command, args []string) error {
			var all []report.Inspect
			m := report.Mass{Mu: demoBond.mu}
			if e.format == "table" {
				t := demoBond.target
				fmt.Fprintf(e.stdout, "pairwell demo — an INVENTED bond, not a real molecule: re = %g Å, De = %g eV, k = %g eV/Å², μ = %g u.\n", t.Re, t.Depth, t.K, demoBond.mu)
				fmt.Fprintln(e.stdout, "Each built-in form is matched to it and inspected. Classical model potentials, not a validated force field.")
			}
			for _, model := range e.registry.Models() {
				matcher, ok := model.(core.Matcher)
				if !ok {
					continue
				}
				info := model.Info()
				params, notes, err := matcher.Match(demoBond.target)
				if err != nil {
					return computeErr(fmt.Errorf("matching %s to the demo bond: %w", info.Key, err))
				}
				pot, err := model.New(params)
				if err != nil {
					return computeErr(fmt.Errorf("demo %s: %w", info.Key, err))
				}
				r, err := report.NewInspect(info.Key, core.Instance{Model: model, Params: params, Potential: pot}, 4, m)
				if err != nil {
					return computeErr(err)
				}
				all = append(all, r)
				if e.format == "table" {
					fmt.Fprintf(e.stdout, "\n== %s (%s)\n", info.Name, r.Params)
					for _, n := range notes {
						fmt.Fprintf(e.stdout, "note: %s\n", n)
					}
					if err := writeTable(e.stdout, inspectTable(r)); err != nil {
						return failErr(err)
					}
				}
			}
			if e.format == "table" {
				return nil
			}
			t := &table{cols: []column{{Title: "model"}, {Title: "re", Unit: "Å"}, {Title: "depth", Unit: "eV"}, {Title: "k", Unit: "eV/Å²"}, {Title: "wavenumber", Unit: "cm⁻¹"}}}
			for _, r := range all {
				t.add(r.Model, num(r.Re), num(float64(r.Depth)), num(r.K), num(*r.Wavenumber))
			}
			return e.emit(all, t)
		},
	}
}
