package main

import (
	"errors"
	"fmt"
	"strings"

	"github.com/spf13/cobra"

	"github.com/pairwell/pairwell/core/mixing"
	"github.com/pairwell/pairwell/core/report"
)

func newMixCmd(e *env) *cobra.Command {
	var (
		mass     massFlags
		rule     string
		allRules bool
	)
	var names []string
	for _, r := range mixing.Rules() {
		names = append(names, r.Name+" ("+r.Form+")")
	}
	cmd := &cobra.Command{
		Use:   "mix SPEC_A SPEC_B (--rule RULE | --all-rules) [--pair A-B | --mu M]",
		Short: "Cross-pair parameters from two like pairs by a combining rule",
		Long: `mix derives the cross pair 1–2 from the like pairs 1–1 (SPEC_A) and 2–2 (SPEC_B),
both of the same form, by a combining rule, and prints the cross-pair spec,
ready for the other commands. --all-rules compares every rule of the form: the
cross pair's equilibrium distance, well depth, force constant and, with --pair or
--mu (the reduced mass of the 1–2 pair), harmonic wavenumber.

Rules (RULE, form):
  lorentz-berthelot  lennard-jones  sigma12 = (sigma1+sigma2)/2, epsilon12 = sqrt(epsilon1 epsilon2)
                                    (H. A. Lorentz 1881; D. Berthelot 1898)
  geometric          lennard-jones  sigma12 = sqrt(sigma1 sigma2), epsilon12 = sqrt(epsilon1 epsilon2)
  waldman-hagler     lennard-jones  sigma12^6 = (sigma1^6+sigma2^6)/2,
                                    epsilon12 = 2 sqrt(epsilon1 epsilon2) sigma1^3 sigma2^3/(sigma1^6+sigma2^6)
                                    (M. Waldman & A. T. Hagler 1993)
  kong               lennard-jones  epsilon12 sigma12^12 = (epsilon1 sigma1^12/2^13)
                                      [1 + (epsilon2 sigma2^12/(epsilon1 sigma1^12))^(1/13)]^13,
                                    epsilon12 sigma12^6 = sqrt(epsilon1 sigma1^6 epsilon2 sigma2^6)
                                    (C. L. Kong 1973; formula written from memory)
  fender-halsey      lennard-jones  sigma12 = (sigma1+sigma2)/2, epsilon12 = 2 epsilon1 epsilon2/(epsilon1+epsilon2)
                                    (B. E. F. Fender & G. D. Halsey 1962)
  exp-arithmetic     buckingham     A, C geometric, rho arithmetic (common practice)
  exp-harmonic       buckingham     A, C geometric, 1/rho arithmetic (common practice)
  morse-mean         morse          De geometric, a and re arithmetic (common practice)

The mean rules (all but waldman-hagler and kong) also apply, by common practice,
to any form (library, formula, plugin) whose parameters include the rule's by name
and dimension — (epsilon, sigma), (A, rho, C) or (De, a, re); every other parameter
(Mie's n and m, say) must be the same in both like pairs.

Two like pairs of different forms, a rule that does not apply, or unequal other
parameters are an error (exit 2). A combining rule is an empirical estimate, not a validated cross
interaction.`,
		Example: `  pairwell mix lj:epsilon=119.8K,sigma=3.405 lj:epsilon=164K,sigma=3.636 --rule lorentz-berthelot
  pairwell mix lj:epsilon=119.8K,sigma=3.405 lj:epsilon=164K,sigma=3.636 --all-rules --pair Ar-Kr
  pairwell mix mie:epsilon=0.0103,sigma=3.40,n=14,m=6 mie:epsilon=0.0140,sigma=3.60,n=14,m=6 --rule lorentz-berthelot
  pairwell inspect "$(pairwell mix morse:De=4.4,a=1.9,re=1.27 morse:De=4.6,a=1.8,re=1.41 --rule morse-mean)"`,
		Args: exactArgs(2, "SPEC_A SPEC_B"),
		RunE: func(cmd *cobra.Command, args []string) error {
			m, err := mass.resolve(false)
			if err != nil {
				return err
			}
			switch {
			case allRules && rule != "":
				return usageErr(errors.New("--rule and --all-rules both given: use one"))
			case !allRules && rule == "":
				return usageErr(fmt.Errorf("give --rule RULE or --all-rules; rules: %s", strings.Join(names, ", ")))
			}
			a, err := e.build(args[0])
			if err != nil {
				return err
			}
			b, err := e.build(args[1])
			if err != nil {
				return err
			}
			r, err := report.NewMix(args[0], args[1], a, b, rule, m)
			switch {
			case errors.Is(err, mixing.ErrRule), errors.Is(err, report.ErrMixForms):
				return usageErr(fmt.Errorf("mix: %w", err))
			case err != nil:
				return computeErr(err)
			}
			if !allRules && e.format == "table" {
				// The bare spec, ready for the other commands.
				_, err := fmt.Fprintln(e.stdout, r.Rules[0].Spec)
				if err != nil {
					return failErr(fmt.Errorf("writing output: %w", err))
				}
				return nil
			}
			if e.format == "table" {
				fmt.Fprintf(e.stdout, "%s cross pair of %s and %s\n%s\n", r.Model, r.SpecA, r.SpecB, r.Caution)
			}
			return e.emitRecords(r, "rules", mixTable(r))
		},
	}
	cmd.Flags().StringVar(&rule, "rule", "", "combining rule (see the list above)")
	cmd.Flags().BoolVar(&allRules, "all-rules", false, "compare every rule of the form in a table")
	mass.register(cmd)
	e.energyUnitFlag(cmd, tableEnergies)
	return cmd
}

// mixTable is the table and CSV of mix: one row per rule.
func mixTable(r report.Mix) *table {
	t := &table{cols: []column{{Title: "rule"}, {Title: "spec"}, {Title: "re", Unit: "Å"},
		{Title: "depth", Unit: "eV"}, {Title: "k", Unit: "eV/Å²"}}}
	withMass := len(r.Rules) > 0 && r.Rules[0].Wavenumber != nil
	if withMass {
		t.cols = append(t.cols, column{Title: "harmonic wavenumber", Unit: "cm⁻¹"})
	}
	for _, x := range r.Rules {
		row := []string{x.Rule, x.Spec, num(x.Re), num(float64(x.Depth)), num(x.K)}
		if withMass {
			row = append(row, num(*x.Wavenumber))
		}
		t.add(row...)
	}
	return t
}
