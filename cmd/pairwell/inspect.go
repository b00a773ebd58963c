package main

import (
	"fmt"

	"github.com/spf13/cobra"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/report"
	"github.com/pairwell/pairwell/core/units"
)

func newInspectCmd(e *env) *cobra.Command {
	var (
		mass  massFlags
		order int
	)
	cmd := &cobra.Command{
		Use:   "inspect SPEC",
		Short: "Find the well of one potential: re, depth, Taylor coefficients, force constant, frequency",
		Long: `inspect finds the minimum of the potential SPEC and reports the equilibrium
distance re, V(re), the well depth V(∞) − V(re) (unbounded for harmonic), the
Taylor coefficients c_n = V⁽ⁿ⁾(re)/n! for n = 0…N (--coefficients N, default
4; --order is its deprecated old name), the force constant
k = V″(re), and the stretch-side inflection point where the restoring force is
largest. With --pair or --mu it adds the harmonic vibration ω = √(k/μ) as a
wavenumber, frequency and period.

JSON values are always in eV, Å, u, fs and cm⁻¹, whatever the input units.`,
		Example: `  pairwell inspect morse:De=4.6,a=1.87,re=1.27 --pair H-Cl
  pairwell inspect lj:epsilon=120K,sigma=3.4 --pair Ar-Ar --coefficients 8 --format json
  pairwell inspect buckingham:A=1500,rho=0.3,C=25 --mu 20`,
		Args: exactArgs(1, "SPEC"),
		RunE: func(cmd *cobra.Command, args []string) error {
			m, err := mass.resolve(false)
			if err != nil {
				return err
			}
			if order < 2 {
				return usageErr(fmt.Errorf("--%s %d: must be at least 2", coefficientsFlag, order))
			}
			inst, err := e.build(args[0])
			if err != nil {
				return err
			}
			r, err := report.NewInspect("", inst, order, m)
			if err != nil {
				return computeErr(err)
			}
			return e.emit(r, inspectTable(r))
		},
	}
	mass.register(cmd)
	coefficientsVar(cmd.Flags(), &order, 4, "highest Taylor coefficient c_N to show (≥ 2)")
	return cmd
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
			t.add("pair", r.Pair, "")
		}
		t.add("reduced mass μ", num(*r.Mu), "u")
		t.add("harmonic wavenumber", num(*r.Wavenumber), "cm⁻¹")
		t.add("harmonic frequency", num(*r.FrequencyTHz), "THz")
		t.add("harmonic period", num(*r.HarmonicPeriodFs), "fs")
	}
	return t
}
