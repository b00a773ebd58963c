package main

import (
	"fmt"
	"math"
	"strconv"

	"github.com/spf13/cobra"

	"github.com/pairwell/pairwell/core/report"
)

// validityCaution is printed under tables that show temperatures.
const validityCaution = "Caution: these are ranges of a classical model potential, not of a validated force field; do not base safety decisions on them."

func newValidityCmd(e *env) *cobra.Command {
	var (
		mass      massFlags
		order     int
		tolerance float64
	)
	cmd := &cobra.Command{
		Use:   "validity SPEC [--order N] [--tolerance T] [--pair A-B | --mu M]",
		Short: "How far from re the truncated Taylor expansion (harmonic, cubic, quartic) holds",
		Long: `validity says how far from the minimum the Taylor expansion of the well of SPEC
truncated at order N, V_N(r) = Σ_{k=0..N} c_k (r − re)^k (N = 2 harmonic, 3 cubic,
4 quartic), still describes the potential V, at a relative tolerance T:

  potential criterion  on each side of re, the largest displacement s such that
                       |V_N − V| ≤ T·(V − V(re)) at every displacement up to s
                       (compression: re − r; stretch: r − re)
  period criterion     the largest oscillation energy E above V(re) such that
                       |T_N(E)/T(E) − 1| ≤ T at every energy up to E, where T(E)
                       is the exact classical period in V and T_N that in V_N
                       (for N = 2 the harmonic period); reported as E in eV, as a
                       fraction of the well depth, as the temperature E/k_B, and
                       as the turning points (compression re − r₋, stretch
                       r₊ − re) of the real potential at E

Unbounded ranges are ∞ in tables and "Infinity" in JSON and CSV (a value that
does not apply, such as E/depth of an unbounded well, is null): for the harmonic form every
truncation is exact. An energy at which V_N has no bound motion (the cubic above
its own maximum) counts as a violation.

The ratio T_N/T does not depend on the mass, so neither criterion does:
--pair/--mu are optional and only echoed in the output.

JSON values are in eV, Å and K, whatever the input units.`,
		Example: `  pairwell validity morse:De=4.6,a=1.87,re=1.27
  pairwell validity lj:epsilon=120K,sigma=3.4 --truncation 4 --tolerance 0.1% --format json
  pairwell validity buckingham:A=1500,rho=0.3,C=25 --truncation 3 --tolerance 0.05`,
		Args: exactArgs(1, "SPEC"),
		RunE: func(cmd *cobra.Command, args []string) error {
			m, err := mass.resolve(false)
			if err != nil {
				return err
			}
			if err := checkTruncationOrder(order); err != nil {
				return err
			}
			tol := tolerance
			inst, err := e.build(args[0])
			if err != nil {
				return err
			}
			info := inst.Model.Info()
			if mo := inst.Potential.MaxOrder(); mo < order {
				return usageErr(fmt.Errorf("%s: --truncation %d needs derivatives up to order %d, the form has up to %d", info.Key, order, order, mo))
			}
			r, err := report.NewValidity(inst, order, tol, m)
			if err != nil {
				return computeErr(err)
			}
			if e.format == "table" {
				fmt.Fprintf(e.stdout, "%s (%s): %s truncation (order %d), tolerance %s\n",
					info.Key, r.Params, orderName(order), order, strconv.FormatFloat(100*tol, 'g', 6, 64)+"%")
				if err := e.writeTable(validityTable(r)); err != nil {
					return failErr(err)
				}
				for _, line := range validityNotes(r) {
					fmt.Fprintln(e.stdout, line)
				}
				return nil
			}
			return e.emit(r, validityTable(r))
		},
	}
	mass.register(cmd)
	e.energyUnitFlag(cmd, tableEnergies)
	truncationVar(cmd.Flags(), &order, report.DefaultValidityOrder, "order N of the truncated Taylor potential V_N: 2 (harmonic), 3 (cubic) or 4 (quartic)")
	toleranceVar(cmd.Flags(), &tolerance, "both criteria")
	return cmd
}

func orderName(n int) string {
	switch n {
	case 2:
		return "harmonic"
	case 3:
		return "cubic"
	}
	return "quartic"
}

// validityTable lays out both criteria as criterion, quantity, value, unit
// rows.
func validityTable(r report.Validity) *table {
	t := &table{cols: []column{{Title: "criterion"}, {Title: "quantity"}, {Title: "value"}, {Title: "unit"}}}
	v := r.Result
	t.add("potential", "largest compression re − r", num(v.Potential.Compression), "Å")
	t.add("potential", "largest stretch r − re", num(v.Potential.Stretch), "Å")
	t.add("period", "largest energy E above V(re)", num(v.Period.Energy), "eV")
	t.add("period", "E / well depth", num(v.Period.DepthFraction), "")
	t.add("period", "E / k_B", num(v.Period.Temperature), "K")
	t.add("period", "compression turning point re − r₋ at E", num(v.Period.Compression), "Å")
	t.add("period", "stretch turning point r₊ − re at E", num(v.Period.Stretch), "Å")
	return t
}

// validityNotes explains the unbounded values and carries the caution.
func validityNotes(r report.Validity) []string {
	var notes []string
	v := r.Result
	inf := []bool{math.IsInf(v.Potential.Compression, 1), math.IsInf(v.Potential.Stretch, 1), math.IsInf(v.Period.Energy, 1)}
	if inf[0] || inf[1] || inf[2] {
		notes = append(notes, "∞: the criterion is never violated (up to the edge of the domain, or at any energy with bound motion).")
	}
	if inf[0] && inf[1] && inf[2] && math.IsInf(float64(r.Depth), 1) {
		notes = append(notes, "The truncation reproduces this unbounded well everywhere (for the harmonic form it is exact).")
	}
	return append(notes, validityCaution)
}
