package main

import (
	"fmt"
	"io"
	"strings"

	"github.com/spf13/cobra"
	"github.com/spf13/pflag"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/fileio"
	"github.com/pairwell/pairwell/core/suggest"
	"github.com/pairwell/pairwell/models"
	"github.com/pairwell/pairwell/models/library"
)

// env is the state one invocation of pairwell shares between its commands.
type env struct {
	stdout, stderr io.Writer // escape terminal controls (terminal.go)
	term           io.Writer // the raw stderr, for the progress bar
	format         string
	energy         energyChoice // --energy-unit, see flags.go
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
	var loadForms func() error   // see forms.go
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
			warnDeprecated(cmd.Flags(), e.stderr)
			f, err := choice("format", e.format, formats)
			if err != nil {
				return usageErr(err)
			}
			e.format = f
			if err := e.readEnergyUnit(); err != nil {
				return err
			}
			if err := library.Register(e.registry); err != nil {
				return failErr(err) // the embedded library is tested: a broken binary
			}
			if err := loadPlugins(); err != nil {
				return err
			}
			return loadForms()
		},
	}
	root.PersistentFlags().StringVar(&e.format, "format", "table", "output format: table, json or csv")
	loadPlugins = registerPlugins(root, e)
	loadForms = registerForms(root, e)
	root.DisableSuggestions = true // unknownCommand suggests
	root.SetFlagErrorFunc(func(cmd *cobra.Command, err error) error {
		// "plot taylr -o a.png": the mistyped kind, not the flag, is wrong.
		if args := cmd.Flags().Args(); cmd.HasAvailableSubCommands() && len(args) > 0 {
			return unknownCommand(cmd, args[0])
		}
		hint := ""
		if name, ok := strings.CutPrefix(err.Error(), "unknown flag: --"); ok {
			var names []string
			visit := func(f *pflag.Flag) {
				if !f.Hidden {
					names = append(names, "--"+f.Name)
				}
			}
			cmd.Flags().VisitAll(visit)
			cmd.InheritedFlags().VisitAll(visit)
			hint = suggest.Hint("--"+name, names)
		}
		return usageErr(fmt.Errorf("%s: %w%s (see %s --help)", cmd.Name(), err, hint, cmd.CommandPath()))
	})
	root.AddCommand(
		newModelsCmd(e),
		newInspectCmd(e),
		newDemoCmd(e),
		newCompareCmd(e),
		newMotionCmd(e),
		newPeriodCmd(e),
		newValidityCmd(e),
		newLevelsCmd(e),
		newCheckCmd(e),
		newBaselineCmd(e),
		newPlotCmd(e),
		newFitCmd(e),
		newVirialCmd(e),
		newExpansionCmd(e),
		newMixCmd(e),
		newCutoffCmd(e),
		newTableCmd(e),
		newVersionCmd(e),
	)
	root.Version = toolVersion()
	root.SetVersionTemplate("{{.Version}}\n")
	return root
}

// unknownCommand is the error for name, not a subcommand of cmd, with its
// near misses.
func unknownCommand(cmd *cobra.Command, name string) error {
	var names []string
	for _, c := range cmd.Commands() {
		if c.IsAvailableCommand() {
			names = append(names, c.Name())
		}
	}
	return usageErr(fmt.Errorf("unknown command %q for %q%s; commands: %s (see %s --help)",
		name, cmd.CommandPath(), suggest.Hint(name, names), strings.Join(names, ", "), cmd.CommandPath()))
}
