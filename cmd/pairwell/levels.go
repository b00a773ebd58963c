package main

import (
	"encoding/json"
	"fmt"
	"strconv"

	"github.com/spf13/cobra"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/levels"
	"github.com/pairwell/pairwell/core/report"
)

func newLevelsCmd(e *env) *cobra.Command {
	var (
		mass     massFlags
		vmax     int
		jmax     int
		accuracy string
		setPath  string
	)
	cmd := &cobra.Command{
		Use:   "levels SPEC... | --set FILE.toml (--pair A-B | --mu M) [--v-max V] [--j-max J] [--accuracy E]",
		Short: "Quantum vibration–rotation levels, zero-point energy, D0 and spectroscopic constants",
		Long: `levels solves the radial Schrödinger equation of the pair in the well of SPEC,

  −ħ²/(2μ) χ″ + [V(r) + ħ²J(J+1)/(2μr²)] χ = E χ,

for the bound levels E(v, J), v = 0…V (--v-max; default every bound level) and
J = 0…J (--j-max; default ` + strconv.Itoa(defaultJMax) + `), each converged to the absolute accuracy E
(--accuracy, default ` + fmt.Sprint(levels.DefaultTolerance) + ` cm⁻¹; a bare number is in cm⁻¹, units such as 1e-9eV
are accepted; the old name --tolerance still works, with a warning). The method
is a Colbert–Miller discrete variable representation on a grid chosen from the
well and refined until two grids agree; the accuracy reported is that
difference, not an assumption. Levels above an inner (Buckingham) barrier are
not bound states and are refused. The harmonic form has no highest level:
give --v-max.

It reports for each level the term value above V(re) and the binding energy
below the dissociation limit (cm⁻¹), ⟨r⟩ and the rms displacement √⟨(r − re)²⟩,
the spacing to the next level and, at J = 0, the classical value h/T(E) of the
spacing at the midpoint energy (correspondence principle). Then the zero-point
energy, D0 = depth − ZPE, the fundamental and first overtone, the number of
bound levels, and the spectroscopic constants three ways: harmonic (ωe from
V″(re), Be from re), perturbative (Dunham 1932, from the Taylor coefficients:
ωexe, αe, Y00, De = 4Be³/ωe²) and fitted to the levels v = 0…3, J = 0…4
(ωe, ωexe, ωeye, Be, αe, γe). Notes say where the perturbative and fitted
constants differ by more than 2 %, and when the classical harmonic range of
validity (period criterion, 1 %) lies below the zero-point energy.

Many forms at once: several SPECs and/or --set FILE.toml (a model set, such as
the one "pairwell fit -o" writes; entries with their own pair or mu, else
--pair/--mu) solve each form in turn: a JSON array of levels objects, each with
"name" (a form that fails has "name", "model", "error"), CSV rows with the form's
name first, or one table block per form.

CSV has one row per level, after the name, model, params, pair and
reduced_mass_u columns; the summary is in the table and in JSON. JSON values
are in cm⁻¹ (eV where the key says so), Å and u.`,
		Example: `  pairwell levels morse:De=4.6,a=1.87,re=1.27 --pair 1H-35Cl
  pairwell levels lj:epsilon=120K,sigma=3.4 --pair Ar-Ar --j-max 2 --format json
  pairwell levels harmonic:k=30,r0=1.2 --mu 7 --v-max 5
  pairwell levels buckingham:A=1500,rho=0.3,C=25 --mu 20 --format csv
  pairwell levels --set fitted.toml --pair 1H-35Cl --j-max 0`,
		RunE: func(cmd *cobra.Command, args []string) error {
			m, err := mass.resolve(false)
			if err != nil {
				return err
			}
			if vmax < -1 {
				return usageErr(fmt.Errorf("--v-max %d: must be 0 or more (-1: every bound level)", vmax))
			}
			if jmax < 0 || jmax > levels.MaxJ {
				return usageErr(fmt.Errorf("--j-max %d: must be between 0 and %d", jmax, levels.MaxJ))
			}
			tol, err := parseAccuracy(accuracy)
			if err != nil {
				return usageErr(err)
			}
			ls := report.LevelsSettings{VMax: vmax, JMax: jmax, Tolerance: tol}
			switch {
			case len(args) == 0 && setPath == "":
				return usageErr(fmt.Errorf("levels needs a SPEC (or several, or --set FILE.toml); see %s --help", cmd.CommandPath()))
			case len(args) == 1 && setPath == "":
				if m.Mu == 0 {
					_, err := mass.resolve(true)
					return err
				}
				inst, err := e.build(args[0])
				if err != nil {
					return err
				}
				r, err := report.NewLevels(inst, m, ls)
				if err != nil {
					return computeErr(err)
				}
				if e.format != "table" {
					return e.emitRecords(r, "levels", levelsTable(r))
				}
				return writeLevels(e, r)
			}
			inputs, err := e.inspectInputs(args, setPath, m)
			if err != nil {
				return err
			}
			return e.levelsAll(inputs, ls)
		},
	}
	mass.register(cmd)
	e.energyUnitFlag(cmd, tableEnergies)
	cmd.Flags().StringVar(&setPath, "set", "", "model-set file (TOML) naming the forms, e.g. one written by fit -o")
	cmd.Flags().IntVar(&vmax, "v-max", -1, "highest vibrational level v (default: every bound level; required for the harmonic form)")
	cmd.Flags().IntVar(&jmax, "j-max", defaultJMax, "highest rotational level J")
	accuracyVar(cmd.Flags(), &accuracy)
	return cmd
}

// writeLevels prints the table layout of one form's levels.
func writeLevels(e *env, r report.Levels) error {
	mass := "μ = " + strconv.FormatFloat(r.Mu, 'g', 10, 64) + " u"
	if r.Pair != "" {
		mass = string(r.Pair) + ", " + mass
	}
	fmt.Fprintf(e.stdout, "%s (%s), %s: levels to %g cm⁻¹ (achieved %.2g cm⁻¹, %d grid points)\n",
		r.Model, r.Params, mass, r.Tolerance, r.Accuracy, r.Grid.Points)
	if err := e.writeTable(levelsTable(r)); err != nil {
		return failErr(err)
	}
	fmt.Fprintln(e.stdout)
	if err := e.writeTable(levelsSummary(r)); err != nil {
		return failErr(err)
	}
	for _, n := range r.Notes {
		fmt.Fprintln(e.stdout, n)
	}
	fmt.Fprintln(e.stdout, r.Caution)
	return nil
}

// namedLevels is one form's record when levels solves several: its name
// and the levels report, or the error that stopped it.
type namedLevels struct {
	Name  string
	Model string
	*report.Levels
	Error report.Text
}

// MarshalJSON implements json.Marshaler: "name", the keys of the levels
// object, "error" (null); for a form that failed, name, model and error.
func (n namedLevels) MarshalJSON() ([]byte, error) {
	head, err := json.Marshal(struct {
		Name  string `json:"name"`
		Model string `json:"model,omitempty"`
	}{n.Name, n.Model})
	if err != nil {
		return nil, err
	}
	tail, err := json.Marshal(struct {
		Error report.Text `json:"error"`
	}{n.Error})
	if err != nil {
		return nil, err
	}
	body := []byte{}
	if n.Levels != nil {
		head, _ = json.Marshal(struct {
			Name string `json:"name"`
		}{n.Name})
		if body, err = json.Marshal(n.Levels); err != nil {
			return nil, err
		}
		body = append(body[1:len(body)-1], ',')
	}
	out := append(head[:len(head)-1], ',')
	out = append(out, body...)
	return append(out, tail[1:]...), nil
}

// levelsAll solves the levels of several forms (model-set entries with
// their own mass, else --pair/--mu, then the SPECs) one after the other. A
// form that fails (its spec cannot be built, no mass, a harmonic form
// without --v-max) is a record with its error; the command fails (exit 2
// for bad input, 1 for a failure) only when every form did. JSON is an
// array of records, CSV one row per level with the form's name and model
// block first (a form that failed: one row with its error), the table one
// block per form.
func (e *env) levelsAll(inputs []report.InspectInput, ls report.LevelsSettings) error {
	var (
		recs  []namedLevels
		first error
	)
	failed := 0
	for _, in := range inputs {
		err := in.Err
		var r report.Levels
		if err == nil && in.Mass.Mu == 0 {
			err = fmt.Errorf("%w: no reduced mass: the entry has no pair or mu; give --pair A-B or --mu M", core.ErrParam)
		}
		if err == nil {
			r, err = report.NewLevels(in.Instance, in.Mass, ls)
		}
		if err != nil {
			failed++
			if first == nil {
				first = err
			}
			recs = append(recs, namedLevels{Name: in.Name, Model: inputModel(in), Error: report.Text(err.Error())})
			if e.format == "table" {
				fmt.Fprintf(e.stdout, "== %s: %v\n\n", in.Name, err)
			}
			continue
		}
		recs = append(recs, namedLevels{Name: in.Name, Levels: &r, Model: r.Model})
		if e.format == "table" {
			fmt.Fprintf(e.stdout, "== %s\n", in.Name)
			if err := writeLevels(e, r); err != nil {
				return err
			}
			fmt.Fprintln(e.stdout)
		}
	}
	if failed == len(inputs) && first != nil {
		return computeErr(fmt.Errorf("no form's levels could be solved: %w", first))
	}
	if e.format == "table" {
		return nil
	}
	return e.emitRecords(recs, "levels", nil)
}

// optNum formats an optional value.
func optNum(v *float64) string {
	if v == nil {
		return "—"
	}
	return num(*v)
}

// levelsTable has one row per level.
func levelsTable(r report.Levels) *table {
	t := &table{cols: []column{{Title: "v"}, {Title: "J"}, {Title: "term value", Unit: "cm⁻¹"}, {Title: "binding energy", Unit: "cm⁻¹"},
		{Title: "⟨r⟩", Unit: "Å"}, {Title: "rms displacement", Unit: "Å"}, {Title: "spacing to v+1", Unit: "cm⁻¹"},
		{Title: "classical h/T(E)", Unit: "cm⁻¹"}, {Title: "accuracy", Unit: "cm⁻¹"}}}
	for _, l := range r.Levels {
		t.add(strconv.Itoa(l.V), strconv.Itoa(l.J), num(l.TermValue), optNum(l.Binding), num(l.MeanR), num(l.RMS),
			optNum(l.Spacing), optNum(l.ClassicalSpacing), fmt.Sprintf("%.2g", l.Accuracy))
	}
	return t
}

// levelsSummary lays out the summary as quantity, value, unit rows.
func levelsSummary(r report.Levels) *table {
	t := &table{cols: []column{{Title: "quantity"}, {Title: "value"}, {Title: "unit"}}}
	t.add("zero-point energy", num(r.ZPE), "cm⁻¹")
	t.add("fundamental E(1) − E(0)", optNum(r.Fundamental), "cm⁻¹")
	t.add("first overtone E(2) − E(0)", optNum(r.FirstOvertone), "cm⁻¹")
	if r.BoundLevels != nil {
		t.add("bound levels at J = 0", strconv.Itoa(*r.BoundLevels), "")
		t.add("D0 = depth − ZPE", num(*r.D0), "eV")
	} else {
		t.add("bound levels at J = 0", "∞ (unbounded form)", "")
	}
	t.add("harmonic ωe (from V″(re))", num(r.Harmonic.OmegaE), "cm⁻¹")
	t.add("harmonic Be (from re)", num(r.Harmonic.Be), "cm⁻¹")
	if pc := r.Perturbative; pc != nil {
		t.add("perturbative ωexe (Dunham)", num(pc.OmegaExe), "cm⁻¹")
		t.add("perturbative αe (Dunham)", num(pc.AlphaE), "cm⁻¹")
		t.add("perturbative Y00 (Dunham)", num(pc.Y00), "cm⁻¹")
		t.add("centrifugal De = 4Be³/ωe²", num(pc.CentrifugalDe), "cm⁻¹")
	}
	if fc := r.FromLevels; fc != nil {
		used := fmt.Sprintf(" (fit, v ≤ %d, J ≤ %d)", fc.VMax, fc.JMax)
		t.add("from levels ωe"+used, num(fc.OmegaE), "cm⁻¹")
		t.add("from levels ωexe"+used, num(fc.OmegaExe), "cm⁻¹")
		t.add("from levels ωeye"+used, num(fc.OmegaEye), "cm⁻¹")
		t.add("from levels Be"+used, num(fc.Be), "cm⁻¹")
		t.add("from levels αe"+used, num(fc.AlphaE), "cm⁻¹")
		t.add("from levels γe"+used, num(fc.GammaE), "cm⁻¹")
	}
	hv := r.HarmonicValidity
	highest := "none (already E(1) − E(0) is off)"
	if hv.HighestV != nil {
		highest = strconv.Itoa(*hv.HighestV)
	}
	t.add(fmt.Sprintf("highest v with spacing within %g%% of ħω", 100*hv.Tolerance), highest, "")
	t.add(fmt.Sprintf("classical harmonic range (period within %g%%)", 100*hv.Tolerance), num(float64(hv.ClassicalEnergy)), "cm⁻¹")
	return t
}
