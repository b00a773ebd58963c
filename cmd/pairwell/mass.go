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

// The accepted range of a reduced mass, in u: from below that of an
// electron and a proton (5.4e-4 u) to far above that of any pair of atoms
// (< 150 u). Outside it a value is a typo or an underflow, and numbers
// derived from it (periods, frequencies) would overflow or be meaningless.
const (
	minMu = 1e-4
	maxMu = 1e6
)

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
		if !(mu >= minMu && mu <= maxMu) {
			return report.Mass{}, usageErr(fmt.Errorf("--mu %s: the reduced mass must be from %g u to %g u", m.mu, minMu, maxMu))
		}
		return report.Mass{Mu: mu}, nil
	case required:
		return report.Mass{}, usageErr(errors.New("a reduced mass is needed: give --pair A-B (e.g. H-Cl) or --mu M (in u)"))
	}
	return report.Mass{}, nil
}
