package main

import (
	"errors"
	"fmt"
	"io"
	"math"
	"strings"

	"github.com/spf13/cobra"

	"github.com/pairwell/pairwell/conformance"
)

func newCheckCmd(e *env) *cobra.Command {
	var (
		setPath  string
		junit    string
		points   int
		maxOrder int
	)
	cmd := &cobra.Command{
		Use:   "check [SPEC... | --set FILE.toml] [--junit FILE]",
		Short: "Run the conformance suite: derivatives vs finite differences, identities, invalid input",
		Long: `check runs the conformance suite on parametrised forms — built-in or served by a
plugin (--plugin) — and prints one line per check with its measured error and
tolerance:

  max-order      analytic derivatives up to order ≥ 4, as ModelInfo says
  derivative     V⁽ⁿ⁾ vs the finite-difference derivative of V⁽ⁿ⁻¹⁾, n = 1…8, at
                 64 points from 0.8·re to 3·re; relative error ≤ 1e-7 measured
                 against |V⁽ⁿ⁾| + |V⁽ⁿ⁻¹⁾|/r. A failure names the order and the r
                 and says whether V⁽ⁿ⁾ or V⁽ⁿ⁻¹⁾ is at fault. Stencils stay on one
                 side of a kink the form declares (a cutoff's r_on and r_c)
  batch, determinism, concurrency
                 single-point, batched, lower-order, repeated and concurrent
                 Taylor calls give the same bits
  equilibrium    V′(re) = 0 (|V′|/(V″·re) ≤ 1e-10) and V″(re) > 0 at the minimum
  identity       each identity the form declares, relative error ≤ 1e-9
  invalid-params wrong counts, NaN, ±Inf and broken constraints are rejected
  invalid-r      r ≤ 0, NaN, ±Inf and r outside the domain give errors
  invalid-order  orders beyond MaxOrder and mismatched slices give errors
  asymptote      V(10⁶·re) within 1e-6 of the well depth of Domain.Limit

The forms are the SPEC arguments, or the entries of a model-set file (--set,
labelled by entry name). With neither, every form in the registry is checked at
a representative parameter set (for the built-ins, illustrative invented values:
morse De=4.6,a=1.87,re=1.27; lennard-jones epsilon=0.0104,sigma=3.4; buckingham
A=1500,rho=0.3,C=25; harmonic k=30,r0=1.2); a plugin form without one is
reported as skipped: give it a SPEC.

--junit FILE also writes the results as JUnit XML (one testsuite per form, one
testcase per check), written atomically, for CI systems to display. JSON is an
array with, per check: name (the form checked), model, check, title,
derivative_order, status, passed, skipped, deviation, tolerance,
worst_r_angstrom, message, source, seconds (README "Output contract").

Exit status: 0 every check passed, 1 a check failed, 2 bad input.`,
		Example: `  pairwell check
  pairwell check morse:De=4.6,a=1.87,re=1.27 lj:epsilon=120K,sigma=3.4
  pairwell check --set forms.toml --junit conformance.xml
  pairwell --plugin ./pairwell-plugin-rydberg check rydberg:De=4.6,a=2.1,re=1.27 --format json`,
		RunE: func(cmd *cobra.Command, args []string) (err error) {
			if setPath != "" && len(args) > 0 {
				return usageErr(errors.New("give SPEC arguments or --set FILE, not both"))
			}
			if points != 0 && (points < 8 || points > conformance.MaxPoints) {
				return usageErr(fmt.Errorf("--points %d: must be from 8 to %d (default %d)", points, conformance.MaxPoints, conformance.DefaultPoints))
			}
			if maxOrder < 0 {
				return usageErr(fmt.Errorf("--max-order %d: must be at least 1 (default %d)", maxOrder, conformance.DefaultMaxOrder))
			}
			if junit != "" {
				if err := e.checkOutput("--junit", junit); err != nil {
					return err
				}
			}
			settings := conformance.Settings{Points: points, MaxOrder: maxOrder}
			var rep conformance.Report
			if setPath == "" && len(args) == 0 {
				rep, err = e.checkRegistry(settings)
			} else {
				var cases []conformance.Case
				if cases, err = e.checkCases(args, setPath); err == nil {
					rep, err = conformance.RunCases(cases, settings)
				}
			}
			if err != nil {
				return err
			}
			if err := e.emit(rep, checkTable(rep)); err != nil {
				return err
			}
			if junit != "" {
				if err := e.writeOutput("--junit", junit, func(w io.Writer) error { return rep.WriteJUnit(w, "pairwell check") }); err != nil {
					return err
				}
			}
			return checkOutcome(e, rep)
		},
	}
	cmd.Flags().StringVar(&setPath, "set", "", "model-set file (TOML) naming the forms to check")
	cmd.Flags().StringVar(&junit, "junit", "", "also write the results as JUnit XML to this file")
	cmd.Flags().IntVar(&points, "points", 0, fmt.Sprintf("separations at which derivatives are checked (default %d)", conformance.DefaultPoints))
	cmd.Flags().IntVar(&maxOrder, "max-order", 0, fmt.Sprintf("highest derivative order checked (default %d, capped by the form's)", conformance.DefaultMaxOrder))
	return cmd
}

// checkCases collects the forms to check: the specs or the entries of the
// model set. Inputs that cannot be built are usage errors.
func (e *env) checkCases(specs []string, setPath string) ([]conformance.Case, error) {
	var cases []conformance.Case
	if setPath != "" {
		built, err := e.loadSet(setPath)
		if err != nil {
			return nil, err
		}
		for _, b := range built {
			cases = append(cases, conformance.Case{Name: b.Name, Instance: b.Instance})
		}
		return cases, nil
	}
	for _, s := range specs {
		inst, err := e.build(s)
		if err != nil {
			return nil, err
		}
		cases = append(cases, conformance.Case{Name: strings.TrimSpace(s), Instance: inst})
	}
	return cases, nil
}

// checkRegistry checks every registered form at its representative
// parameter set; a form without one is reported as skipped.
func (e *env) checkRegistry(s conformance.Settings) (conformance.Report, error) {
	var rep conformance.Report
	for _, m := range e.registry.Models() {
		info := m.Info()
		ps, ok := conformance.Representative(m)
		if !ok {
			rep.Results = append(rep.Results, conformance.Result{
				Subject: info.Key, Model: info.Key, Check: conformance.CheckBuild, Name: "representative parameter set",
				Passed: true, Skipped: true, Error: math.NaN(), Tolerance: math.NaN(), WorstR: math.NaN(),
				Message: fmt.Sprintf("%s (%s) has no representative parameter set: check it with a SPEC, e.g. pairwell check %s:NAME=VALUE,...", info.Key, info.Origin, info.Key),
			})
			continue
		}
		r, err := conformance.Run(m, [][]float64{ps}, s)
		if err != nil {
			return rep, usageErr(err)
		}
		rep.Results = append(rep.Results, r.Results...)
	}
	return rep, nil
}

// checkTable lays out the results one per line.
func checkTable(rep conformance.Report) *table {
	t := &table{cols: []column{
		{Title: "form"}, {Title: "check"}, {Title: "result"}, {Title: "error"}, {Title: "tolerance"},
		{Title: "worst r", Unit: "Å"}, {Title: "message"},
	}}
	for _, r := range rep.Results {
		t.add(r.Subject, r.Name, r.Status(), shortNum(r.Error), shortNum(r.Tolerance), num(r.WorstR), r.Message)
	}
	return t
}

// shortNum formats a measured error or tolerance with 3 significant digits.
func shortNum(v float64) string {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return num(v)
	}
	return fmt.Sprintf("%.3g", v)
}

// checkOutcome prints a summary for tables and returns the exit status:
// a failErr naming the failed checks when any failed.
func checkOutcome(e *env, rep conformance.Report) error {
	var passed, skipped int
	for _, r := range rep.Results {
		switch {
		case r.Skipped:
			skipped++
		case r.Passed:
			passed++
		}
	}
	fails := rep.Failures()
	if e.format == "table" {
		forms := "forms"
		if len(rep.Subjects()) == 1 {
			forms = "form"
		}
		fmt.Fprintf(e.stdout, "\n%d checks on %d %s: %d passed, %d failed, %d skipped\n",
			len(rep.Results), len(rep.Subjects()), forms, passed, len(fails), skipped)
	}
	if len(fails) == 0 {
		return nil
	}
	names := make([]string, 0, len(fails))
	for i, f := range fails {
		if i == 3 {
			names = append(names, fmt.Sprintf("and %d more", len(fails)-3))
			break
		}
		names = append(names, fmt.Sprintf("%s: %s", f.Subject, f.Name))
	}
	return failErr(fmt.Errorf("%d of %d checks failed: %s", len(fails), len(rep.Results), strings.Join(names, "; ")))
}
