package main

import (
	"bufio"
	"bytes"
	"errors"
	"fmt"
	"io"
	"strconv"
	"strings"

	"github.com/spf13/cobra"

	"github.com/pairwell/pairwell/core/report"
	"github.com/pairwell/pairwell/core/tabulate"
	"github.com/pairwell/pairwell/core/units"
)

// forceDim is the dimension of a force, eV/Å.
var forceDim, _ = units.NewDimension(1, -1, 0, 0, 0)

var interpolations = []string{"cubic", "linear"}

func newTableCmd(e *env) *cobra.Command {
	var (
		from, to, step, accuracy, forceAccuracy, interpolation, out string
		points                                                      int
		second                                                      bool
	)
	cmd := &cobra.Command{
		Use:   "table SPEC --from R1 --to R2 (--step H | --points N | --accuracy E) [--interpolation cubic|linear] [--second-derivative] [-o FILE]",
		Short: "The potential on a grid: V, F = −V′ (and V″) for a simulation's table, with the interpolation error",
		Long: `table evaluates a form on the uniform grid r = R1, R1 + h, …, R2 (exactly, one batched
evaluation) and writes the energy V [eV], the force F = −V′ [eV/Å] and, with
--second-derivative, V″ [eV/Å²]: CSV with the columns r_angstrom, energy_ev,
force_ev_per_angstrom, d2v_ev_per_angstrom2 (the rows only: the summary goes to
standard error), a JSON object with the rows, or an aligned table.

The grid: --step H (up to the last point not beyond R2), --points N, or
--accuracy E: the spacing a simulation needs so that interpolating the table
reproduces V to E and F to --force-accuracy (default: E per Å), from the error
bounds of the interpolant,
  cubic   the complete cubic spline s through V, end slopes −F, F = −s′:
          |V − s| ≤ (5/384)·h⁴·max|V⁽⁴⁾|, |V′ − s′| ≤ (1/24)·h³·max|V⁽⁴⁾|
          (C. A. Hall & W. W. Meyer, J. Approx. Theory 16, 105 (1976))
  linear  V and F each linear from their column: h²·max|V″|/8, h²·max|V‴|/8
with max|V⁽ᵏ⁾| over [R1, R2] from the form's Taylor coefficients on a dense scan,
times a safety factor 1.5; the table is then built and the interpolant compared
with the exact form at three points in every interval, refining h until the
measured error reaches the request. Every table reports the measured maximum
error of its interpolant. An accuracy that needs more than 10⁶ points (a start
deep in the repulsive wall) or lies below the rounding error of V is refused
(exit 2), saying what limits it.

With -o FILE the table goes to FILE (written atomically, see "Files" in the
README) and the summary to standard output.`,
		Example: `  pairwell table morse:De=4.6,a=1.87,re=1.27 --from 0.9 --to 6 --points 1000 --format csv -o morse.csv
  pairwell table lj:epsilon=120K,sigma=3.4 --from 3 --to 12 --accuracy 1e-6eV --format csv
  pairwell table lj:epsilon=120K,sigma=3.4 --from 3 --to 12 --accuracy 0.01K --interpolation linear
  pairwell table buckingham:A=1500,rho=0.3,C=25 --from 1.5 --to 10 --step 0.01 --second-derivative --format json`,
		Args: exactArgs(1, "one SPEC"),
		RunE: func(cmd *cobra.Command, args []string) error {
			how, err := choice("interpolation", interpolation, interpolations)
			if err != nil {
				return usageErr(err)
			}
			s := tabulate.Settings{SecondDerivative: second}
			if how == "linear" {
				s.Interpolation = tabulate.Linear
			}
			r1, err := lengthFlag("--from", from)
			if err != nil {
				return err
			}
			r2, err := lengthFlag("--to", to)
			if err != nil {
				return err
			}
			given := 0
			for _, set := range []bool{step != "", cmd.Flags().Changed("points"), accuracy != ""} {
				if set {
					given++
				}
			}
			if given != 1 {
				return usageErr(errors.New("table: give exactly one of --step H, --points N and --accuracy E (--accuracy chooses the spacing itself)"))
			}
			if forceAccuracy != "" && accuracy == "" {
				return usageErr(errors.New("table: --force-accuracy goes with --accuracy"))
			}
			if out != "" {
				if err := e.checkOutput("-o", out); err != nil {
					return err
				}
			}
			inst, err := e.build(args[0])
			if err != nil {
				return err
			}
			var res *tabulate.Result
			switch {
			case accuracy != "":
				tol, err := tolerance(accuracy, forceAccuracy)
				if err != nil {
					return err
				}
				res, err = tabulate.PlanFor(inst.Potential, r1, r2, tol, s)
				if err != nil {
					return computeErr(fmt.Errorf("table: %w", err))
				}
			default:
				var g tabulate.Grid
				if step != "" {
					h, err := lengthFlag("--step", step)
					if err != nil {
						return err
					}
					g, err = tabulate.GridStep(r1, r2, h)
					if err != nil {
						return usageErr(fmt.Errorf("table: %w", err))
					}
				} else {
					g, err = tabulate.GridPoints(r1, r2, points)
					if err != nil {
						return usageErr(fmt.Errorf("table: --points: %w", err))
					}
				}
				res, err = tabulate.Build(inst.Potential, g, s)
				if err != nil {
					return computeErr(fmt.Errorf("table: %w", err))
				}
			}
			meta := report.NewTable(strings.TrimSpace(args[0]), inst, res)
			write := func(w io.Writer) error { return writeTableData(w, e.format, meta, res.Table) }
			if e.format == "csv" && out == "" {
				// CSV is the rows only; the summary goes beside it.
				if err := writeOut(e.stderr, func(w io.Writer) error { return writeTableSummary(w, "pairwell: table: ", meta) }); err != nil {
					return err
				}
			}
			if out != "" {
				if err := e.writeOutput("-o", out, write); err != nil {
					return err
				}
				return writeOut(e.stdout, func(w io.Writer) error {
					if err := writeTableSummary(w, "", meta); err != nil {
						return err
					}
					_, err := fmt.Fprintf(w, "%d rows written to %s\n", meta.Points, out)
					return err
				})
			}
			return writeOut(e.stdout, write)
		},
	}
	f := cmd.Flags()
	f.StringVar(&from, "from", "", "first separation R1 (a length: 0.9, 90pm, 1.7bohr)")
	f.StringVar(&to, "to", "", "last separation R2 (a length)")
	f.StringVar(&step, "step", "", "grid spacing H (a length)")
	f.IntVar(&points, "points", 0, "number of grid points N (2 to 10⁶)")
	f.StringVar(&accuracy, "accuracy", "", "choose the spacing so that the interpolated V is within E (an energy: 1e-6, 1e-3meV, 0.01K)")
	f.StringVar(&forceAccuracy, "force-accuracy", "", "with --accuracy: the interpolated F within this force (eV/Å, or e.g. 1e-4kcal/mol/A); default E per Å")
	f.StringVar(&interpolation, "interpolation", "cubic", "interpolant the errors refer to: cubic (spline through V) or linear")
	f.BoolVar(&second, "second-derivative", false, "add the column V″ (d2v_ev_per_angstrom2)")
	f.StringVarP(&out, "output", "o", "", "write the table to FILE instead of standard output")
	_ = cmd.MarkFlagRequired("from")
	_ = cmd.MarkFlagRequired("to")
	return cmd
}

// lengthFlag reads a length flag (bare numbers in Å).
func lengthFlag(flag, s string) (float64, error) {
	v, err := units.Parse(s, units.Length)
	if err != nil {
		return 0, usageErr(fmt.Errorf("table: %s: %w", flag, err))
	}
	return v, nil
}

// tolerance reads --accuracy (an energy) and --force-accuracy (a force;
// empty: the same number in eV/Å, i.e. E per Å).
func tolerance(accuracy, forceAccuracy string) (tabulate.Tolerance, error) {
	e, err := units.Parse(accuracy, units.Energy)
	if err != nil {
		return tabulate.Tolerance{}, usageErr(fmt.Errorf("table: --accuracy: %w", err))
	}
	f := e
	if forceAccuracy != "" {
		if f, err = units.Parse(forceAccuracy, forceDim); err != nil {
			return tabulate.Tolerance{}, usageErr(fmt.Errorf("table: --force-accuracy: %w", err))
		}
	}
	if !(e > 0) || !(f > 0) {
		return tabulate.Tolerance{}, usageErr(fmt.Errorf("table: --accuracy %s, force %g eV/Å: both must be positive", accuracy, f))
	}
	return tabulate.Tolerance{Energy: e, Force: f}, nil
}

// writeOut writes through one 64 KiB buffer.
func writeOut(w io.Writer, write func(io.Writer) error) error {
	b := bufio.NewWriterSize(w, 64<<10)
	err := write(b)
	if err == nil {
		err = b.Flush()
	}
	if err != nil {
		return failErr(fmt.Errorf("writing output: %w", err))
	}
	return nil
}

// writeTableData writes a table in a format: csv (summary as # comments,
// then the header of column keys and one row per point), json (the
// report.Table keys and "rows", an array of objects with the column keys)
// or table (the summary, then aligned columns with units).
func writeTableData(w io.Writer, format string, meta report.Table, t *tabulate.Table) error {
	cols := [][]float64{t.R, t.V, t.F}
	if t.D2V != nil {
		cols = append(cols, t.D2V)
	}
	var buf []byte
	switch format {
	case "csv":
		if _, err := io.WriteString(w, strings.Join(meta.Columns, ",")+"\n"); err != nil {
			return err
		}
		for i := range t.R {
			buf = buf[:0]
			for j, c := range cols {
				if j > 0 {
					buf = append(buf, ',')
				}
				buf = strconv.AppendFloat(buf, c[i], 'g', -1, 64)
			}
			buf = append(buf, '\n')
			if _, err := w.Write(buf); err != nil {
				return err
			}
		}
		return nil
	case "json":
		keys := make([][]byte, len(cols))
		for j := range cols {
			keys[j] = append(strconv.AppendQuote(nil, meta.Columns[j]), ": "...)
		}
		var hb bytes.Buffer
		if err := writeJSON(&hb, meta); err != nil {
			return err
		}
		// The object without its closing brace, then "rows".
		head := bytes.TrimSuffix(hb.Bytes(), []byte("\n}\n"))
		if _, err := w.Write(append(head, ",\n  \"rows\": [\n"...)); err != nil {
			return err
		}
		for i := range t.R {
			buf = append(buf[:0], "    {"...)
			for j, c := range cols {
				if j > 0 {
					buf = append(buf, ", "...)
				}
				buf = append(buf, keys[j]...)
				buf = strconv.AppendFloat(buf, c[i], 'g', -1, 64)
			}
			buf = append(buf, '}')
			if i < len(t.R)-1 {
				buf = append(buf, ',')
			}
			buf = append(buf, '\n')
			if _, err := w.Write(buf); err != nil {
				return err
			}
		}
		_, err := io.WriteString(w, "  ]\n}\n")
		return err
	default:
		if err := writeTableSummary(w, "", meta); err != nil {
			return err
		}
		heads := []string{"r [Å]", "V [eV]", "F [eV/Å]", "V″ [eV/Å²]"}[:len(cols)]
		var head strings.Builder
		for _, h := range heads {
			fmt.Fprintf(&head, "%-24s", h)
		}
		if _, err := io.WriteString(w, strings.TrimRight(head.String(), " ")+"\n"); err != nil {
			return err
		}
		for i := range t.R {
			buf = buf[:0]
			for _, c := range cols {
				start := len(buf)
				buf = strconv.AppendFloat(buf, c[i], 'g', 15, 64)
				for len(buf)-start < 24 {
					buf = append(buf, ' ')
				}
			}
			buf = append(buf[:len(buf)-len(trailing(buf))], '\n')
			if _, err := w.Write(buf); err != nil {
				return err
			}
		}
		return nil
	}
}

// trailing returns the trailing spaces of b.
func trailing(b []byte) []byte {
	i := len(b)
	for i > 0 && b[i-1] == ' ' {
		i--
	}
	return b[i:]
}

// writeTableSummary writes what the table is and how accurate its
// interpolant is, each line starting with prefix.
func writeTableSummary(w io.Writer, prefix string, m report.Table) error {
	lines := []string{
		fmt.Sprintf("pairwell table %s (%s, %s)", m.Spec, m.Model, m.Params),
		fmt.Sprintf("grid: %d points from %s to %s Å, step %s Å", m.Points, num(m.From), num(m.To), num(m.Step)),
		fmt.Sprintf("interpolation %s: %s", m.Interpolation, m.Interpolant),
	}
	if a := m.Accuracy; a != nil {
		var ds []string
		orders, maxima, at := a.Derivatives()
		for i, k := range orders {
			ds = append(ds, fmt.Sprintf("max|V%s| = %.4g eV/Å%s at %s Å", derivMark(k), maxima[i], units.Superscript(k), num(at[i])))
		}
		lines = append(lines,
			fmt.Sprintf("requested accuracy: V %.3g eV, F %.3g eV/Å; bounds at this step (safety factor %g on %s): V %.3g eV by %s, F %.3g eV/Å by %s; %d refinements after checking",
				a.Energy, a.Force, a.Safety, strings.Join(ds, ", "), a.BoundEnergy, a.EnergyRule, a.BoundForce, a.ForceRule, a.Refinements))
	}
	lines = append(lines,
		fmt.Sprintf("measured interpolation error (%d points: %s): V %.3g eV at %s Å, F %.3g eV/Å at %s Å",
			m.Check.Points, m.Check.Where, m.Check.Energy, num(m.Check.EnergyR), m.Check.Force, num(m.Check.ForceR)),
		m.Caution)
	for _, l := range lines {
		if _, err := io.WriteString(w, prefix+l+"\n"); err != nil {
			return err
		}
	}
	return nil
}

// derivMark is the prime mark of V⁽ᵏ⁾.
func derivMark(k int) string {
	switch k {
	case 2:
		return "″"
	case 3:
		return "‴"
	}
	return "⁽" + units.Superscript(k) + "⁾"
}
