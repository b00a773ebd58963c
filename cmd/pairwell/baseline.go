package main

import (
	"errors"
	"fmt"
	"math"

	"github.com/spf13/cobra"

	"github.com/pairwell/pairwell/conformance/baseline"
	"github.com/pairwell/pairwell/core/report"
	"github.com/pairwell/pairwell/core/validity"
)

func newBaselineCmd(e *env) *cobra.Command {
	cmd := &cobra.Command{
		Use:   "baseline",
		Short: "Record the physics of a model set and verify later that it did not move",
		Long: `baseline record analyses every entry of a model set and writes, per entry, re,
V(re), the depth, the force constant k, the Taylor coefficients c3 and c4, the
harmonic wavenumber (entries with a mass) and the validity limits of the harmonic
truncation (potential criterion: compression and stretch in Å; period criterion:
energy in eV; tolerance 1% unless --tolerance), with the entries' specs and
parameters, to a JSON baseline file.

baseline verify analyses the set again and reports every parameter and quantity
whose relative change |new − old|/max(|old|, |new|) exceeds --rtol, and entries
added to or removed from the set. Run it in CI to catch a change to a form or to
pairwell that silently moves the physics.`,
		Example: `  pairwell baseline record --set forms.toml -o forms.baseline.json
  pairwell baseline verify --set forms.toml forms.baseline.json`,
		RunE: func(cmd *cobra.Command, args []string) error {
			if len(args) > 0 {
				return unknownCommand(cmd, args[0])
			}
			return usageErr(fmt.Errorf("baseline needs a subcommand: record or verify (see %s --help)", cmd.CommandPath()))
		},
	}
	cmd.AddCommand(newBaselineRecordCmd(e), newBaselineVerifyCmd(e))
	return cmd
}

func newBaselineRecordCmd(e *env) *cobra.Command {
	var (
		setPath, out string
		tolerance    float64
	)
	cmd := &cobra.Command{
		Use:   "record --set FILE.toml -o BASELINE.json",
		Short: "Record re, depth, k, c3, c4, wavenumber and validity limits of every entry",
		Long: `record analyses every entry of the model set and writes the baseline file
atomically (a temporary file renamed over the target when complete): an existing
baseline is replaced only by a complete new one.`,
		Example: `  pairwell baseline record --set forms.toml -o forms.baseline.json`,
		Args:    exactArgs(0, "no arguments"),
		RunE: func(cmd *cobra.Command, args []string) error {
			if setPath == "" || out == "" {
				return usageErr(errors.New("baseline record needs --set FILE.toml and -o BASELINE.json"))
			}
			set, err := e.readSet(setPath)
			if err != nil {
				return err
			}
			if err := e.checkOutput("-o", out); err != nil {
				return err
			}
			b, err := baseline.Record(set, e.registry, baseline.Settings{Tool: toolVersion(), Validity: validity.Settings{Tolerance: tolerance}})
			if err != nil {
				return computeErr(fmt.Errorf("--set %s: %w", setPath, err))
			}
			if err := e.writeOutput("-o", out, b.Write); err != nil {
				return err
			}
			n := 0
			for _, en := range b.Entries {
				n += len(en.Params) + len(en.Quantities)
			}
			summary := struct {
				Path       string `json:"file"`
				Entries    int    `json:"entries"`
				Quantities int    `json:"values"`
				Tool       string `json:"tool"`
			}{out, len(b.Entries), n, b.Tool}
			t := &table{cols: []column{{Title: "baseline"}, {Title: "entries"}, {Title: "values"}, {Title: "tool"}}}
			t.add(out, fmt.Sprint(len(b.Entries)), fmt.Sprint(n), b.Tool)
			return e.emit(summary, t)
		},
	}
	cmd.Flags().StringVar(&setPath, "set", "", "model-set file (TOML)")
	cmd.Flags().StringVarP(&out, "output", "o", "", "baseline file to write")
	toleranceVar(cmd.Flags(), &tolerance, "the validity criteria")
	return cmd
}

// changeRow is the JSON form of a baseline change.
type changeRow struct {
	Kind     string        `json:"kind"`
	Entry    string        `json:"entry"`
	Quantity report.Text   `json:"quantity"`
	Unit     report.Text   `json:"unit"`
	Old      report.Number `json:"old"`
	New      report.Number `json:"new"`
	Rel      report.Number `json:"relative_change"`
	Text     report.Text   `json:"detail"`
}

func newBaselineVerifyCmd(e *env) *cobra.Command {
	var (
		setPath string
		rtol    float64
	)
	cmd := &cobra.Command{
		Use:   "verify --set FILE.toml BASELINE.json [--rtol R]",
		Short: "Report every quantity that moved beyond --rtol since the baseline; exit 1 if any did",
		Long: `verify analyses the model set again (with the baseline's validity tolerance) and
compares it with the baseline: one line per parameter or quantity whose relative
change |new − old|/max(|old|, |new|) exceeds --rtol (old, new, relative change),
and per entry added to or removed from the set. Values equal to the bit, equal
infinities included, never move.

JSON is an object: file, rtol, entries, compared, changes [{kind (moved,
added, removed, model), entry, quantity, unit, old, new, relative_change,
detail}].

Exit status: 0 nothing moved, 1 something moved or an entry was added or
removed, 2 bad input (including a corrupt or foreign baseline file).`,
		Example: `  pairwell baseline verify --set forms.toml forms.baseline.json
  pairwell baseline verify --set forms.toml forms.baseline.json --rtol 1e-6 --format json`,
		Args: exactArgs(1, "BASELINE.json"),
		RunE: func(cmd *cobra.Command, args []string) error {
			if setPath == "" {
				return usageErr(errors.New("baseline verify needs --set FILE.toml"))
			}
			if !(rtol >= 0) || math.IsInf(rtol, 1) {
				return usageErr(fmt.Errorf("--rtol %g: must be ≥ 0", rtol))
			}
			data, err := e.readInput("baseline", args[0], baseline.MaxSize)
			if err != nil {
				return err
			}
			old, err := baseline.Read(data, args[0])
			if err != nil {
				return usageErr(err)
			}
			set, err := e.readSet(setPath)
			if err != nil {
				return err
			}
			d, err := baseline.Verify(old, set, e.registry, rtol, baseline.Settings{Tool: toolVersion()})
			if err != nil {
				return computeErr(fmt.Errorf("--set %s: %w", setPath, err))
			}
			rows := make([]changeRow, len(d.Changes))
			t := &table{cols: []column{{Title: "entry"}, {Title: "quantity"}, {Title: "unit"}, {Title: "old"}, {Title: "new"}, {Title: "relative change"}, {Title: "change"}}}
			for i, c := range d.Changes {
				rows[i] = changeRow{c.Kind, c.Entry, report.Text(c.Quantity), report.Text(c.Unit),
					report.Number(c.Old), report.Number(c.New), report.Number(c.Rel), report.Text(c.Text)}
				q := c.Quantity
				if q == "" {
					q = "(entry) " + c.Text
				}
				t.add(c.Entry, q, c.Unit, num(c.Old), num(c.New), shortNum(c.Rel), c.Kind)
			}
			summary := fmt.Sprintf("%d values of %d entries compared with %s at rtol %g: %d changes", d.Compared, d.Entries, args[0], rtol, len(d.Changes))
			if e.format == "table" {
				if len(d.Changes) > 0 {
					if err := writeTable(e.stdout, t); err != nil {
						return failErr(err)
					}
					fmt.Fprintln(e.stdout)
				}
				fmt.Fprintln(e.stdout, summary)
			} else {
				v := struct {
					Baseline string      `json:"file"`
					RTol     float64     `json:"rtol"`
					Entries  int         `json:"entries"`
					Compared int         `json:"compared"`
					Changes  []changeRow `json:"changes"`
				}{args[0], rtol, d.Entries, d.Compared, rows}
				if err := e.emitRecords(v, "changes", t); err != nil {
					return err
				}
			}
			if len(d.Changes) > 0 {
				return failErr(errors.New(summary))
			}
			return nil
		},
	}
	cmd.Flags().StringVar(&setPath, "set", "", "model-set file (TOML) the baseline was recorded from")
	cmd.Flags().Float64Var(&rtol, "rtol", 1e-9, "largest relative change that is not reported")
	return cmd
}
