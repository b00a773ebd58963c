package main

import (
	"fmt"

	"github.com/spf13/cobra"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/figure"
	"github.com/pairwell/pairwell/core/report"
)

func newPlotLevelsCmd(e *env) *cobra.Command {
	var (
		fp       formPlot
		vmax     int
		accuracy string
	)
	cmd := &cobra.Command{
		Use:   "levels SPEC (--pair A-B | --mu M) [--v-max V] [--accuracy E] -o FILE",
		Short: "Draw the well with its quantum levels and the harmonic ladder beside them",
		Long: `levels draws the well V(r) of SPEC with its vibrational levels at J = 0 (as
"pairwell levels" computes them), each a line between its classical turning
points, and beside the well, for contrast, the harmonic ladder V(re) + ħω(v + ½)
with ω = √(V″(re)/μ): evenly spaced where the real levels crowd together towards
the dissociation limit (dotted). --v-max V draws v = 0…V (default every bound
level, at most 120; required for the harmonic form); --accuracy as for
"pairwell levels".`,
		Example: `  pairwell plot levels morse:De=4.6,a=1.87,re=1.27 --pair 1H-35Cl -o levels.png
  pairwell plot levels lj:epsilon=120K,sigma=3.4 --pair Ar-Ar -o ar2.svg
  pairwell plot levels harmonic:k=30,r0=1.2 --mu 7 --v-max 8 -o harmonic.pdf`,
		Args: exactArgs(1, "SPEC"),
		RunE: func(cmd *cobra.Command, args []string) error {
			var o figure.LevelsOptions
			return fp.draw(e, args[0], true, func(m report.Mass) (err error) {
				if vmax < -1 {
					return usageErr(fmt.Errorf("--v-max %d: must be 0 or more (-1: every bound level)", vmax))
				}
				o = figure.LevelsOptions{Mu: m.Mu, VMax: vmax}
				if o.Tolerance, err = parseAccuracy(accuracy); err != nil {
					return usageErr(err)
				}
				return nil
			}, func(inst core.Instance, _ report.Mass, name string) (*figure.Figure, error) {
				o.Name = name
				return figure.Levels(inst.Potential, o)
			})
		},
	}
	fp.register(e, cmd)
	cmd.Flags().IntVar(&vmax, "v-max", -1, "highest vibrational level drawn (default: every bound level; required for the harmonic form)")
	accuracyVar(cmd.Flags(), &accuracy)
	return cmd
}
