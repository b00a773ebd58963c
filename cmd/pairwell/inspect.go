package main

import (
	"fmt"
	"strings"

	"github.com/spf13/cobra"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/report"
	"github.com/pairwell/pairwell/core/units"
)

func newInspectCmd(e *env) *cobra.Command {
	var (
		mass    massFlags
		order   int
		setPath string
	)
	cmd := &cobra.Command{
		Use:   "inspect SPEC... [--set FILE.toml]",
		Short: "Find the well of potentials: re, depth, Taylor coefficients, force constant, frequency",
		Long: `inspect finds the minimum of the potential SPEC and reports the equilibrium
distance re, V(re), the well depth V(∞) − V(re) (unbounded for harmonic), the
Taylor coefficients c_n = V⁽ⁿ⁾(re)/n! for n = 0…N (--coefficients N, default
4; --order is its deprecated old name), the force constant
k = V″(re), and the stretch-side inflection point where the restoring force is
largest. With --pair or --mu it adds the harmonic vibration ω = √(k/μ) as a
wavenumber, frequency and period.

Many forms at once: several SPECs and/or --set FILE.toml (entries with their
own pair or mu, else --pair/--mu) give one record per form, in input order,
streamed as they are computed (in parallel): a JSON array of inspect objects
(each with "name"; a form whose well cannot be found has "name", "model",
"error"), CSV with one row per form, or a table with one row per form.

CSV is one row per form (also for one SPEC), its header the JSON keys:
barrier.r_angstrom for the nested barrier, params as "NAME=VALUE ...", the
Taylor coefficients space-separated. JSON values are always in eV, Å, u, fs
and cm⁻¹, whatever the input units.`,
		Example: `  pairwell inspect morse:De=4.6,a=1.87,re=1.27 --pair H-Cl
  pairwell inspect lj:epsilon=120K,sigma=3.4 --pair Ar-Ar --coefficients 8 --format json
  pairwell inspect buckingham:A=1500,rho=0.3,C=25 --mu 20
  pairwell inspect --set candidates.toml --format csv`,
		RunE: func(cmd *cobra.Command, args []string) error {
			m, err := mass.resolve(false)
			if err != nil {
				return err
			}
			if order < 2 {
				return usageErr(fmt.Errorf("--%s %d: must be at least 2", coefficientsFlag, order))
			}
			if len(args) == 0 && setPath == "" {
				return usageErr(fmt.Errorf("inspect needs a SPEC (or several, or --set FILE.toml); see %s --help", cmd.CommandPath()))
			}
			if len(args) == 1 && setPath == "" && e.format != "csv" {
				inst, err := e.build(args[0])
				if err != nil {
					return err
				}
				name := strings.TrimSpace(args[0])
				r, err := report.NewInspect(name, inst, order, m)
				if err != nil {
					return computeErr(err)
				}
				return e.emit(newInspectRecord(name, r.Model, &r, nil), inspectTable(r))
			}
			inputs, err := e.inspectInputs(args, setPath, m)
			if err != nil {
				return err
			}
			return e.inspectAll(inputs, order, len(args) == 1 && setPath == "")
		},
	}
	mass.register(cmd)
	coefficientsVar(cmd.Flags(), &order, 4, "highest Taylor coefficient c_N to show (≥ 2)")
	cmd.Flags().StringVar(&setPath, "set", "", "model-set file (TOML) naming the forms to inspect")
	e.energyUnitFlag(cmd, tableEnergies)
	return cmd
}

// inspectInputs builds the forms of a batch: the model-set entries (their
// own mass, else m), then the specs (named by their text, with mass m).
func (e *env) inspectInputs(specs []string, setPath string, m report.Mass) ([]report.InspectInput, error) {
	var inputs []report.InspectInput
	if setPath != "" {
		built, err := e.loadSet(setPath)
		if err != nil {
			return nil, err
		}
		for _, b := range built {
			bm := m
			if b.Mu != 0 {
				bm = report.Mass{Pair: b.Pair, Mu: b.Mu}
			}
			inputs = append(inputs, report.InspectInput{Name: b.Name, Instance: b.Instance, Mass: bm})
		}
	}
	for _, s := range specs {
		// A spec that cannot be built is that record's error: one bad
		// set does not stop a batch.
		inst, err := e.registry.Build(s)
		inputs = append(inputs, report.InspectInput{Name: strings.TrimSpace(s), Instance: inst, Mass: m, Err: err})
	}
	return inputs, nil
}

// inputModel is the model key of an input, also of one that could not be
// built (as written in its spec).
func inputModel(in report.InspectInput) string {
	if in.Instance.Model != nil {
		return in.Instance.Model.Info().Key
	}
	if s, err := core.ParseSpec(in.Name); err == nil {
		return s.Model
	}
	return ""
}

// inspectAll streams one record per input. single is one SPEC given alone
// (CSV only): a failure is then the command's error, as for the object.
// Otherwise a form that fails (its spec cannot be built, or it has no
// minimum) is a record with its error, and the command fails (exit 2 for
// bad input, 1 for a failure) only when every form did.
func (e *env) inspectAll(inputs []report.InspectInput, order int, single bool) error {
	var (
		w   recordWriter
		err error
	)
	switch e.format {
	case "json":
		w = &jsonArray{w: e.stdout}
	case "csv":
		if w, err = newCSVRecords(e.stdout); err != nil {
			return failErr(fmt.Errorf("writing output: %w", err))
		}
	default:
		w = newTableRecords(e)
	}
	failed := 0
	var first error
	err = report.InspectAll(inputs, order, 0, func(i int, r report.Inspect, rErr error) error {
		if rErr != nil {
			if single {
				return rErr
			}
			failed++
			if first == nil {
				first = rErr
			}
			return w.write(inputs[i].Name, inputModel(inputs[i]), nil, rErr)
		}
		return w.write(inputs[i].Name, r.Model, &r, nil)
	})
	if err != nil {
		if single {
			return computeErr(err)
		}
		return failErr(fmt.Errorf("writing output: %w", err))
	}
	if err := w.close(); err != nil {
		return failErr(fmt.Errorf("writing output: %w", err))
	}
	if failed == len(inputs) && first != nil {
		return computeErr(fmt.Errorf("no form could be inspected: %w", first))
	}
	return nil
}

// build turns a spec into a potential, as a usage error when it fails.
func (e *env) build(spec string) (core.Instance, error) {
	inst, err := e.registry.Build(spec)
	if err != nil {
		return core.Instance{}, usageErr(err)
	}
	return inst, nil
}

// exactArgs is cobra.ExactArgs with a message naming the arguments.
func exactArgs(n int, names string) cobra.PositionalArgs {
	return func(cmd *cobra.Command, args []string) error {
		if len(args) != n {
			return usageErr(fmt.Errorf("%s takes %s, got %d arguments (see %s --help)", cmd.Name(), names, len(args), cmd.CommandPath()))
		}
		return nil
	}
}

// inspectTable lays out an inspect report as quantity, value, unit rows.
func inspectTable(r report.Inspect) *table {
	t := quantityTable(r.Model, r.Params)
	t.add("equilibrium distance re", num(r.Re), "Å")
	t.add("V(re)", num(r.Energy), "eV")
	t.add("well depth V(∞) − V(re)", num(float64(r.Depth)), "eV")
	t.add("force constant k = V″(re)", num(r.K), "eV/Å²")
	for n, c := range r.Taylor {
		t.add(fmt.Sprintf("c%s = V⁽%s⁾(re)/%d!", units.Subscript(n), units.Superscript(n), n), num(c), units.DerivativeUnit(n))
	}
	t.add("stretch inflection point", num(float64(r.Inflection)), "Å")
	t.add("max restoring force", num(float64(r.MaxForce)), "eV/Å")
	if r.Barrier != nil {
		t.add("inner barrier position", num(r.Barrier.R), "Å")
		t.add("inner barrier energy", num(r.Barrier.Energy), "eV")
	}
	if r.Mu != nil {
		if r.Pair != "" {
			t.add("pair", string(r.Pair), "")
		}
		t.add("reduced mass μ", num(*r.Mu), "u")
		t.add("harmonic wavenumber", num(*r.Wavenumber), "cm⁻¹")
		t.add("harmonic frequency", num(*r.FrequencyTHz), "THz")
		t.add("harmonic period", num(*r.HarmonicPeriodFs), "fs")
	}
	return t
}
