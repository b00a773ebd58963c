package main

import (
	"fmt"

	"github.com/spf13/cobra"

	"github.com/pairwell/pairwell/core/figure"
)

func newPlotFitCmd(e *env) *cobra.Command {
	var (
		out plotOutput
		o   fitFlags
	)
	cmd := &cobra.Command{
		Use:   "fit DATA.csv [--form KEY ...] [fit options] -o FILE",
		Short: "Draw reference data with the fitted forms and their residuals",
		Long: `fit fits the forms to DATA.csv exactly as "pairwell fit" does (same options)
and draws the data as points with every fitted form overlaid, energies
measured from the data's lowest point, and below it a panel of the residuals
fit − data at the data's points, each form in the same style in both panels.
Forms that could not be fitted are left out, with a note.`,
		Example: `  pairwell plot fit scan.csv -o fit.png
  pairwell plot fit scan.csv --form morse --form buckingham --offset fit -o fit.svg`,
		Args: func(cmd *cobra.Command, args []string) error {
			if len(args) != 1 {
				return usageErr(fmt.Errorf("plot fit needs one DATA.csv file, got %d arguments (see %s --help)", len(args), cmd.CommandPath()))
			}
			return nil
		},
		RunE: func(cmd *cobra.Command, args []string) error {
			if err := out.check(e); err != nil {
				return err
			}
			run, err := o.run(e, args[0])
			if err != nil {
				return err
			}
			f, err := fitFigure(run)
			if err != nil {
				return err
			}
			return e.writePlot(f, &out)
		},
	}
	out.register(e, cmd)
	o.register(cmd)
	return cmd
}

// fitFigure draws the fits of run in rank order.
func fitFigure(run *fitRun) (*figure.Figure, error) {
	var curves []figure.FitCurve
	var notes []string
	for _, f := range run.fits {
		if f.Error != "" {
			notes = append(notes, fmt.Sprintf("%s left out: %s", f.Model, f.Error))
			continue
		}
		in := findInput(run.inputs, f.Name)
		curves = append(curves, figure.FitCurve{Name: f.Model, Potential: in.Result.Instance.Potential, Zero: in.Result.Zero})
	}
	fig, err := figure.Fit(run.data.R, run.data.E, curves)
	if err != nil {
		return nil, computeErr(err)
	}
	fig.Title = "Fits to " + run.path
	fig.Notes = append(fig.Notes, notes...)
	return fig, nil
}
