package main

import (
	"fmt"
	"io"

	"github.com/spf13/cobra"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/internal/fileio"
	"github.com/pairwell/pairwell/models"
)

// env is the state one invocation of pairwell shares between its commands.
type env struct {
	stdout, stderr io.Writer // escape terminal controls (terminal.go)
	term           io.Writer // the raw stderr, for the progress bar
	format         string
	registry       *core.Registry
	files          *fileio.Run // the inputs of the run and its temporary files
	closers        []func()
	interrupts     interrupts // what a signal must still do, see signals.go
	// failedPlugins are the plugins found through the plugin path that
	// failed to start (a warning, see plugins.go).
	failedPlugins []error
}

// newEnv makes the state of one invocation. What it prints goes through
// cleanWriter (terminal.go); only the progress bar draws on the raw stderr.
func newEnv(stdout, stderr io.Writer) *env {
	return &env{stdout: &cleanWriter{w: stdout}, stderr: &cleanWriter{w: stderr}, term: stderr,
		registry: models.NewRegistry(), files: &fileio.Run{}}
}

// close releases what the invocation started (plugin processes).
func (e *env) close() {
	for i := len(e.closers) - 1; i >= 0; i-- {
		e.closers[i]()
	}
	e.closers = nil
}

func newRootCmd(e *env) *cobra.Command {
	var loadPlugins func() error // see plugins.go
	root := &cobra.Command{
		Use:   "pairwell",
		Short: "Find, characterise and compare the wells of interatomic pair potentials",
		Long: `pairwell finds the well of a pair potential V(r) — equilibrium distance, depth,
Taylor coefficients c_n = V⁽ⁿ⁾(re)/n!, force constant and, for a given atom pair,
the harmonic frequency — and says how far the harmonic picture holds.

A potential is named by a spec KEY:NAME=VALUE[UNIT],...  for example
  morse:De=4.4,a=1.9,re=1.27        lj:epsilon=120K,sigma=3.4
A bare number is in the parameter's default unit ("pairwell models" lists them).

Units: energy eV, length Å, mass u, time fs, wavenumber cm⁻¹ (CODATA 2018).
Exit codes: 0 success; 1 a computation, plugin or file operation failed (for
check and baseline verify also: a check failed); 2 bad input.

pairwell evaluates classical model potentials. A model is not a validated force
field: do not base production or safety decisions on its numbers alone.`,
		SilenceUsage:  true,
		SilenceErrors: true,
		PersistentPreRunE: func(cmd *cobra.Command, args []string) error {
			switch e.format {
			case "table", "json", "csv":
				return loadPlugins()
			}
			return usageErr(fmt.Errorf("--format %q: allowed: table, json, csv", e.format))
		},
	}
	root.PersistentFlags().StringVar(&e.format, "format", "table", "output format: table, json or csv")
	loadPlugins = registerPlugins(root, e)
	root.SetFlagErrorFunc(func(cmd *cobra.Command, err error) error {
		return usageErr(fmt.Errorf("%s: %w (see %s --help)", cmd.Name(), err, cmd.CommandPath()))
	})
	root.AddCommand(
		newModelsCmd(e),
		newInspectCmd(e),
		newDemoCmd(e),
		newCompareCmd(e),
		newMotionCmd(e),
		newPeriodCmd(e),
		newValidityCmd(e),
		newCheckCmd(e),
		newBaselineCmd(e),
		newPlotCmd(e),
	)
	return root
}
