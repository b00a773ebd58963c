package main

import (
	"errors"
	"fmt"

	"github.com/spf13/cobra"

	"github.com/pairwell/pairwell/core/atoms"
	"github.com/pairwell/pairwell/core/report"
	"github.com/pairwell/pairwell/core/units"
)

// massFlags are the --pair and --mu flags that give a reduced mass.
type massFlags struct {
	pair, mu string
	changed  func(name string) bool // whether a flag was given, even empty
}

func (m *massFlags) register(cmd *cobra.Command) {
	m.changed = func(name string) bool { return cmd.Flags().Changed(name) }
	cmd.Flags().StringVar(&m.pair, "pair", "", "atom pair A-B giving the reduced mass, e.g. H-Cl, 1H-35Cl, D-D (standard atomic weights for elements, AME2020 masses for isotopes)")
	cmd.Flags().StringVar(&m.mu, "mu", "", "reduced mass directly, in u unless a unit is given (e.g. 0.98, 0.98u)")
}

// resolve returns the reduced mass; a zero Mu when neither flag is set.
// required makes the absence of both an error.
func (m *massFlags) resolve(required bool) (report.Mass, error) {
	given := func(name string, v string) bool { return v != "" || (m.changed != nil && m.changed(name)) }
	switch {
	case given("pair", m.pair) && given("mu", m.mu):
		return report.Mass{}, usageErr(errors.New("--pair and --mu both given: use one"))
	case given("pair", m.pair):
		if m.pair == "" {
			return report.Mass{}, usageErr(errors.New(`--pair "": give an atom pair A-B, e.g. H-Cl`))
		}
		p, err := atoms.ParsePair(m.pair)
		if err != nil {
			return report.Mass{}, usageErr(fmt.Errorf("--pair: %w", err))
		}
		return report.Mass{Pair: p.A + "-" + p.B, Mu: p.Mu}, nil
	case given("mu", m.mu):
		mu, err := units.Parse(m.mu, units.Mass)
		if err != nil {
			return report.Mass{}, usageErr(fmt.Errorf("--mu: %w", err))
		}
		if err := atoms.CheckReducedMass(mu); err != nil {
			return report.Mass{}, usageErr(fmt.Errorf("--mu %s: %w", m.mu, err))
		}
		return report.Mass{Mu: mu}, nil
	case required:
		return report.Mass{}, usageErr(errors.New("a reduced mass is needed: give --pair A-B (e.g. H-Cl) or --mu M (in u)"))
	}
	return report.Mass{}, nil
}
