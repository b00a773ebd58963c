package main

import (
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"

	"github.com/spf13/cobra"
	"github.com/spf13/pflag"

	"github.com/pairwell/pairwell/core/levels"
	"github.com/pairwell/pairwell/core/motion"
	"github.com/pairwell/pairwell/core/suggest"
	"github.com/pairwell/pairwell/core/units"
	"github.com/pairwell/pairwell/core/validity"
)

// The flags whose meaning is shared by several commands are defined here,
// once: one parser per quantity, one meaning per flag name, one default per
// constant.

// Flag names for the two kinds of Taylor order.
const (
	// coefficientsFlag is the highest Taylor coefficient c_N shown (inspect).
	coefficientsFlag = "coefficients"
	// truncationFlag is the order N of a truncated Taylor potential V_N
	// (validity, compare, baseline record, plot taylor).
	truncationFlag = "truncation"
)

// parseTolerance reads a relative tolerance written as a fraction ("0.01")
// or a percentage ("1%"); it must lie strictly between 0 and 1.
func parseTolerance(s string) (float64, error) {
	t := strings.TrimSpace(s)
	scale := 1.0
	if strings.HasSuffix(t, "%") {
		t, scale = strings.TrimSpace(strings.TrimSuffix(t, "%")), 0.01
	}
	v, err := strconv.ParseFloat(t, 64)
	if err != nil {
		return 0, fmt.Errorf("%q is not a number (e.g. 0.01 or 1%%)", s)
	}
	v *= scale
	if !(v > 0 && v < 1) {
		return 0, fmt.Errorf("%q: must be between 0 and 1 (0%% and 100%%), exclusive", s)
	}
	return v, nil
}

// toleranceValue is a --tolerance flag: a fraction or a percentage.
type toleranceValue struct{ v *float64 }

func (t toleranceValue) String() string {
	if t.v == nil {
		return ""
	}
	return strconv.FormatFloat(*t.v, 'g', -1, 64)
}

func (t toleranceValue) Set(s string) error {
	v, err := parseTolerance(s)
	if err != nil {
		return err
	}
	*t.v = v
	return nil
}

func (toleranceValue) Type() string { return "TOL" }

// toleranceVar registers --tolerance with the default of the validity
// criteria.
func toleranceVar(f *pflag.FlagSet, v *float64, what string) {
	*v = validity.DefaultTolerance
	f.Var(toleranceValue{v}, "tolerance", "relative tolerance of "+what+", a fraction (0.01) or a percentage (1%)")
}

// accuracyFlag is the absolute accuracy of quantum levels (levels, plot
// levels): an energy, cm⁻¹ unless a unit is given. It was --tolerance, a
// name that everywhere else means a relative tolerance.
const accuracyFlag = "accuracy"

// accuracyVar registers --accuracy E, and the deprecated --tolerance as its
// alias (hidden; it still works, with a warning, see warnDeprecated).
func accuracyVar(f *pflag.FlagSet, v *string) {
	f.StringVar(v, accuracyFlag, "", fmt.Sprintf("absolute accuracy of the levels, an energy, cm⁻¹ unless a unit is given (e.g. 1e-4, 1e-9eV) (default %g)",
		levels.DefaultTolerance))
	f.StringVar(v, "tolerance", "", "deprecated: use --"+accuracyFlag)
	_ = f.MarkHidden("tolerance")
	_ = f.SetAnnotation("tolerance", "deprecated", []string{"--" + accuracyFlag + " (an absolute accuracy in cm⁻¹; --tolerance elsewhere is relative)"})
}

// parseAccuracy returns the value of --accuracy in cm⁻¹, 0 (the default)
// when s is empty.
func parseAccuracy(s string) (float64, error) {
	if s == "" {
		return 0, nil
	}
	ev, err := units.ParseIn(s, units.Energy, "cm-1")
	if err != nil {
		return 0, fmt.Errorf("--%s: %w", accuracyFlag, err)
	}
	if !(ev > 0) || math.IsInf(ev, 1) {
		return 0, fmt.Errorf("--%s %s: must be a finite energy > 0", accuracyFlag, s)
	}
	return ev / units.WavenumberEV, nil
}

// defaultJMax is the default of --j-max (levels).
const defaultJMax = 10

// asPercent writes a fraction as a percentage, e.g. 0.01 as "1 %".
func asPercent(f float64) string { return strconv.FormatFloat(100*f, 'g', -1, 64) + " %" }

// defaultMethod is the integrator of --method where the flag has a default
// (motion, plot motion).
const defaultMethod = motion.DormandPrince

// methodVar registers --method with defaultMethod.
func methodVar(f *pflag.FlagSet, v *string) {
	f.StringVar(v, "method", defaultMethod.String(), "integrator: heun, rk4, verlet or dopri")
}

// truncationVar registers --truncation N, and the deprecated --order as its
// alias.
func truncationVar(f *pflag.FlagSet, v *int, def int, usage string) {
	f.IntVar(v, truncationFlag, def, usage)
	deprecatedOrder(f, v, def, "--"+truncationFlag+" (the order of the truncated Taylor potential)")
}

// coefficientsVar registers --coefficients N, and the deprecated --order as
// its alias.
func coefficientsVar(f *pflag.FlagSet, v *int, def int, usage string) {
	f.IntVar(v, coefficientsFlag, def, usage)
	deprecatedOrder(f, v, def, "--"+coefficientsFlag+" (the highest Taylor coefficient shown)")
}

// deprecatedOrder registers the old --order, hidden, as an alias of the
// flag named by use; warnDeprecated reports its use on stderr.
func deprecatedOrder(f *pflag.FlagSet, v *int, def int, use string) {
	f.IntVar(v, "order", def, "deprecated: use "+use)
	_ = f.MarkHidden("order")
	_ = f.SetAnnotation("order", "deprecated", []string{use})
}

// warnDeprecated writes a warning for every deprecated flag given.
func warnDeprecated(f *pflag.FlagSet, stderr io.Writer) {
	f.Visit(func(fl *pflag.Flag) {
		if use, ok := fl.Annotations["deprecated"]; ok {
			fmt.Fprintf(stderr, "pairwell: warning: --%s is deprecated: use %s\n", fl.Name, use[0])
		}
	})
}

// formats are the output formats of --format.
var formats = []string{"table", "json", "csv"}

// choice returns the element of allowed equal to s ignoring case and
// surrounding space, or an error naming the allowed values and the near
// misses.
func choice(flag, s string, allowed []string) (string, error) {
	t := strings.ToLower(strings.TrimSpace(s))
	for _, a := range allowed {
		if t == a {
			return a, nil
		}
	}
	return "", fmt.Errorf("--%s %q%s: allowed: %s", flag, s, suggest.Hint(t, allowed), strings.Join(allowed, ", "))
}

// energyUnits are the units of --energy-unit, in the spelling shown.
var energyUnits = []string{"eV", "meV", "K", "kcal/mol", "kJ/mol", "cm-1", "hartree"}

// energyUnit returns the canonical spelling of an --energy-unit value
// (read ignoring case) and the value of the unit in eV (CODATA 2018, as
// units.Parse reads it: K as k_B·T, cm-1 as h·c·ν̃).
func energyUnit(s string) (name string, perUnit float64, err error) {
	lower := make([]string, len(energyUnits))
	for i, u := range energyUnits {
		lower[i] = strings.ToLower(u)
	}
	c, err := choice("energy-unit", s, lower)
	if err != nil {
		return "", 0, fmt.Errorf("--energy-unit %q%s: allowed: %s", s, suggest.Hint(s, energyUnits), strings.Join(energyUnits, ", "))
	}
	for i, l := range lower {
		if l == c {
			name = energyUnits[i]
		}
	}
	f, err := units.Factor(name, units.Energy)
	if err != nil {
		return "", 0, err
	}
	return name, f, nil
}

// energyUnitVar registers --energy-unit.
func energyUnitVar(f *pflag.FlagSet, v *string, what string) {
	f.StringVar(v, "energy-unit", "eV", "unit of the energies of "+what+": "+strings.Join(energyUnits, ", "))
}

// energyChoice is the --energy-unit of a command: the flag as given, and
// once read (PersistentPreRunE) the unit's canonical name and value in eV.
// The zero value, and a command without the flag, mean eV.
type energyChoice struct {
	flag, name string
	perUnit    float64
}

// tableEnergies is what --energy-unit converts in a command's table.
const tableEnergies = "the table (JSON and CSV stay in eV)"

// energyUnitFlag registers --energy-unit on cmd: the energies of what
// (tableEnergies, or a picture's energy axis) are shown in that unit.
func (e *env) energyUnitFlag(cmd *cobra.Command, what string) {
	energyUnitVar(cmd.Flags(), &e.energy.flag, what)
}

// readEnergyUnit reads --energy-unit, when the command has it.
func (e *env) readEnergyUnit() error {
	if e.energy.flag == "" {
		return nil
	}
	name, perUnit, err := energyUnit(e.energy.flag)
	if err != nil {
		return usageErr(err)
	}
	e.energy.name, e.energy.perUnit = name, perUnit
	return nil
}

// convertEnergies rewrites the energies of a table in another unit: in a
// table with a "unit" column, the "value" cell (without one, every cell
// right of the unit) of every row whose unit starts with "eV" (eV, eV/Å²,
// eV/Å³ …), to 9 significant digits; in a
// table with units in the headers, every column whose unit starts with
// "eV", to 6. Values are divided by perUnit, the unit's value in eV; cells
// that are not numbers (∞, —) stay. JSON and CSV are never converted: they
// keep the documented units.
func convertEnergies(t *table, name string, perUnit float64) {
	format := short
	conv := func(cell string) string {
		v, err := strconv.ParseFloat(cell, 64)
		if err != nil {
			return cell
		}
		return format(v / perUnit)
	}
	unitCol, valueCol := -1, -1
	for i, c := range t.cols {
		switch c.Title {
		case "unit":
			unitCol = i
		case "value":
			valueCol = i
		}
	}
	if unitCol >= 0 {
		// The cells hold 10 digits; converted, 9 are certain.
		format = func(v float64) string { return strconv.FormatFloat(v, 'g', 9, 64) }
		for _, r := range t.rows {
			u := r[unitCol]
			if !strings.HasPrefix(u, "eV") {
				continue
			}
			for i := range r {
				if i == valueCol || valueCol < 0 && i > unitCol {
					r[i] = conv(r[i])
				}
			}
			r[unitCol] = name + strings.TrimPrefix(u, "eV")
		}
		return
	}
	for i, c := range t.cols {
		if !strings.HasPrefix(c.Unit, "eV") {
			continue
		}
		t.cols[i].Unit = name + strings.TrimPrefix(c.Unit, "eV")
		for _, r := range t.rows {
			if i < len(r) {
				r[i] = conv(r[i])
			}
		}
	}
}
