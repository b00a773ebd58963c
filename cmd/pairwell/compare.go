package main

import (
	"errors"
	"fmt"
	"io"
	"math"
	"strings"

	"github.com/spf13/cobra"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/report"
	"github.com/pairwell/pairwell/core/units"
)

// progressThreshold is the number of rows from which compare draws a
// progress bar (on a terminal only); smaller comparisons finish at once.
const progressThreshold = 16

func newCompareCmd(e *env) *cobra.Command {
	var (
		mass      massFlags
		setPath   string
		match     string
		order     int
		tolerance float64
		withValid bool
	)
	cmd := &cobra.Command{
		Use:   "compare [SPEC...] [--set FILE.toml] [--match re=R,De=D,k=K] (--pair A-B | --mu M) [--validity]",
		Short: "Compare forms side by side: well, frequency and the range of the harmonic picture",
		Long: `compare analyses several parametrised forms and lays them side by side, one row
per form: re, depth, force constant k, the Taylor coefficients c3 and c4, the
harmonic wavenumber and period, and, with --validity (or --truncation or
--tolerance), how far the truncated Taylor potential V_n (--truncation,
default 2: the harmonic picture) holds, by two criteria at relative tolerance
--tolerance (default 0.01; 1% works too) — about 0.1 ms per form at order 2,
computed only when asked:
  potential: the largest compression and stretch s from re such that
             |V_n − V| ≤ tol·|V − V(re)| for every displacement up to s;
  period:    the largest oscillation energy E such that |T_n(E)/T(E) − 1| ≤ tol
             for every energy up to E, also as a fraction of the depth, as a
             temperature E/k_B and as the turning points' distances from re.

The forms come from SPEC arguments, from a model-set file (--set), and from
--match, which derives every built-in form's parameters from one target well
(any subset of re, De, k, with units, e.g. re=127pm,De=4.6eV,k=500N/m):
  morse         exactly (needs re, De, k)
  lennard-jones from re and De (k then follows, 72·De/re², and the mismatch is
                noted), or from re and k when De is not given
  buckingham    solving for (A, rho, C) (needs re, De, k) when a solution exists
  harmonic      from re and k (it has no depth)
A form that cannot be matched or analysed gets an error in its row; the others
are still reported. Rows are in the order: --set entries, SPECs, matched forms.

Reduced mass: an entry of the model set uses its own pair or mu, else the
file's [defaults]; --pair/--mu apply to SPECs, matched forms and set entries
without a mass. Every row needs one.

Rows are computed in parallel on all cores (GOMAXPROCS); the output order is
fixed. JSON is an array with, per row, the inspect object and "name",
"validity" {truncation_order, tolerance, potential {compression_angstrom,
stretch_angstrom}, period {energy_ev, depth_fraction, temperature_k,
compression_angstrom, stretch_angstrom}} (null without --validity),
"boyle_temperature_k", "zero_point_energy_per_cm", "fundamental_per_cm",
"notes" and "error" (null for a row that was analysed). CSV has one row per
form, its header the JSON keys. Values are in eV, Å, u, fs, cm⁻¹ and K; an
unbounded range is "Infinity" (∞ in the table), a value that does not apply
null (README "Output contract").`,
		Example: `  pairwell compare morse:De=4.6,a=1.87,re=1.27 lj:epsilon=4.6,sigma=1.13 --pair H-Cl
  pairwell compare --match re=127pm,De=4.6eV,k=500N/m --pair 1H-35Cl
  pairwell compare --set candidates.toml --tolerance 0.001 --format json`,
		RunE: func(cmd *cobra.Command, args []string) error {
			m, err := mass.resolve(false)
			if err != nil {
				return err
			}
			if err := checkTruncationOrder(order); err != nil {
				return err
			}
			if len(args) == 0 && setPath == "" && match == "" {
				return usageErr(fmt.Errorf("compare needs SPEC arguments, --set FILE.toml or --match re=R,De=D,k=K (see %s --help)", cmd.CommandPath()))
			}
			inputs, err := e.compareInputs(args, setPath, match, m)
			if err != nil {
				return err
			}
			f := cmd.Flags()
			withValid = withValid || f.Changed(truncationFlag) || f.Changed("order") || f.Changed("tolerance")
			rows, err := e.compare(inputs, report.CompareSettings{Order: order, Tolerance: tolerance, Validity: withValid})
			if err != nil {
				return err
			}
			if err := e.emitCompare(rows); err != nil {
				return err
			}
			errs := make([]error, len(rows))
			for i, r := range rows {
				if r.Err != nil {
					errs[i] = fmt.Errorf("%s: %w", r.Name, r.Err)
				}
			}
			return pluginRowFailure(errs)
		},
	}
	mass.register(cmd)
	f := cmd.Flags()
	f.StringVar(&setPath, "set", "", "model-set file (TOML) naming the forms to compare")
	f.StringVar(&match, "match", "", "match every built-in form to a target well: re=R,De=D,k=K (any subset, units allowed)")
	truncationVar(f, &order, report.DefaultValidityOrder, "order N of the truncated Taylor potential V_N whose validity is reported (2, 3 or 4)")
	toleranceVar(f, &tolerance, "the validity criteria")
	e.energyUnitFlag(cmd, tableEnergies)
	f.BoolVar(&withValid, "validity", false, "also compute how far the truncated Taylor potential holds (implied by --truncation and --tolerance)")
	return cmd
}

// compareInputs collects the forms to compare: the entries of the model set
// at setPath, then the specs, then the built-in forms matched to the target
// match. m is the reduced mass from the command line, used by every input
// without its own. Inputs that cannot be built are usage errors; a target
// a form cannot match is that form's row error.
func (e *env) compareInputs(specs []string, setPath, match string, m report.Mass) ([]report.CompareInput, error) {
	var inputs []report.CompareInput
	if setPath != "" {
		built, err := e.loadSet(setPath)
		if err != nil {
			return nil, err
		}
		for _, b := range built {
			in := report.CompareInput{Name: b.Name, Instance: b.Instance, Mass: report.Mass{Pair: b.Pair, Mu: b.Mu}}
			if b.Mu == 0 {
				in.Mass = m
			}
			inputs = append(inputs, in)
		}
	}
	for _, s := range specs {
		inst, err := e.build(s)
		if err != nil {
			return nil, err
		}
		inputs = append(inputs, report.CompareInput{Name: inst.Model.Info().Key, Instance: inst, Mass: m})
	}
	if match != "" {
		t, err := parseTarget(match)
		if err != nil {
			return nil, usageErr(fmt.Errorf("--match: %w", err))
		}
		for _, m := range e.registry.Models() {
			// The library's forms are left out silently (their match is
			// numerical); only a user's form is worth a note.
			if _, ok := m.(core.Matcher); (!ok || numericalMatch(m)) && modelKind(m) != "library" {
				fmt.Fprintf(e.stderr, "pairwell: note: --match: %s (%s) declares no closed-form match to a target, so it is left out\n", m.Info().Key, modelKind(m))
			}
		}
		for _, in := range matchAll(e.registry, t) {
			in.Name = "matched-" + in.Model
			in.Mass = m
			inputs = append(inputs, in)
		}
	}
	uniqueNames(inputs)
	for _, in := range inputs {
		if in.Mass.Mu == 0 {
			return nil, usageErr(fmt.Errorf("%s: a reduced mass is needed: give --pair A-B (e.g. H-Cl) or --mu M (in u), or pair/mu in the model set", in.Name))
		}
	}
	return inputs, nil
}

// numericalMatch reports whether m is a formula form (of a forms file or
// of the library), whose match is numerical: --match leaves those out
// (fit uses it to start them).
func numericalMatch(m core.Model) bool {
	k := modelKind(m)
	return k == "formula" || k == "library"
}

// matchAll matches every model of reg that can match a target well
// in closed form (core.Match, skipping those that report
// core.ErrUnsupported, and formula forms) to the target t, in registry
// order. A model that cannot reach t gets an input
// carrying the error.
func matchAll(reg *core.Registry, t core.Target) []report.CompareInput {
	var out []report.CompareInput
	for _, model := range reg.Models() {
		if numericalMatch(model) {
			continue
		}
		params, notes, err := core.Match(model, t)
		if errors.Is(err, core.ErrUnsupported) {
			continue
		}
		key := model.Info().Key
		in := report.CompareInput{Model: key}
		in.Notes = notes
		if err == nil {
			var pot core.Potential
			if pot, err = model.New(params); err == nil {
				in.Instance = core.Instance{Model: model, Params: params, Potential: pot}
			}
		}
		if err != nil {
			in.Err = fmt.Errorf("cannot match: %w", err)
		}
		out = append(out, in)
	}
	return out
}

// parseTarget parses re=R,De=D,k=K (any non-empty subset, each at most
// once; names case-insensitive, "depth" for De) with optional units.
func parseTarget(s string) (core.Target, error) {
	var t core.Target
	seen := map[string]bool{}
	for _, part := range strings.Split(s, ",") {
		name, value, ok := strings.Cut(part, "=")
		name, value = strings.TrimSpace(name), strings.TrimSpace(value)
		if !ok || name == "" || value == "" {
			return core.Target{}, fmt.Errorf("%q is not NAME=VALUE; expected re=R,De=D,k=K, e.g. re=1.27,De=4.6eV,k=500N/m", strings.TrimSpace(part))
		}
		var (
			dst *float64
			dim units.Dimension
			key string
		)
		switch strings.ToLower(name) {
		case "re":
			dst, dim, key = &t.Re, units.Length, "re"
		case "de", "depth":
			dst, dim, key = &t.Depth, units.Energy, "De"
		case "k":
			dst, dim, key = &t.K, units.ForceConstant, "k"
		default:
			return core.Target{}, fmt.Errorf("unknown quantity %q; allowed: re (length), De (energy), k (force constant)", name)
		}
		if seen[key] {
			return core.Target{}, fmt.Errorf("%s given twice", key)
		}
		seen[key] = true
		v, err := units.Parse(value, dim)
		if err != nil {
			return core.Target{}, fmt.Errorf("%s: %w", key, err)
		}
		if err := core.Positive.Check(key, v); err != nil {
			return core.Target{}, err
		}
		*dst = v
	}
	return t, nil
}

// uniqueNames makes the names of inputs unique by appending -2, -3, … to
// repeats, keeping the first occurrence as it is.
func uniqueNames(inputs []report.CompareInput) {
	used := map[string]bool{}
	for i := range inputs {
		name := inputs[i].Name
		for n := 2; used[name]; n++ {
			name = fmt.Sprintf("%s-%d", inputs[i].Name, n)
		}
		used[name] = true
		inputs[i].Name = name
	}
}

// compare runs report.Compare on all cores with a progress bar for long
// comparisons. It returns an error only when every row failed (nothing to
// show), classified as computeErr does.
func (e *env) compare(inputs []report.CompareInput, s report.CompareSettings) ([]report.CompareRow, error) {
	if len(inputs) >= progressThreshold {
		step, done := e.progress(len(inputs), "compare")
		defer done()
		s.Progress = step
	}
	rows, err := report.Compare(inputs, s)
	if err != nil {
		return nil, usageErr(err)
	}
	if all, first := report.Failed(rows); all {
		return nil, computeErr(fmt.Errorf("no form could be compared: %w", first))
	}
	return rows, nil
}

// emitCompare writes the rows: JSON as the rows themselves, a table (with
// notes and errors as numbered footnotes) or CSV (with them in a column).
func (e *env) emitCompare(rows []report.CompareRow) error {
	if e.format != "table" {
		return e.emit(rows, nil)
	}
	t, notes := compareTable(rows)
	if err := e.emit(rows, t); err != nil {
		return err
	}
	if e.format == "table" {
		if err := writeCompareLegend(e.stdout, rows, notes); err != nil {
			return failErr(fmt.Errorf("writing output: %w", err))
		}
	}
	return nil
}

// writeCompareLegend explains the validity columns of the compare table and
// writes its footnotes.
func writeCompareLegend(w io.Writer, rows []report.CompareRow, notes []string) error {
	for _, r := range rows {
		if v := r.Validity; v != nil {
			if _, err := fmt.Fprintf(w, "Validity of the Taylor potential V_%d at %g %%: V_n ±x, largest compression/stretch where "+
				"|V_n − V| ≤ tol·(V − V(re)); T_n E, largest oscillation energy where the period in V_n is within tol of the exact one.\n",
				v.Order, 100*v.Tolerance); err != nil {
				return err
			}
			break
		}
	}
	return writeFootnotes(w, notes)
}

// compareColumns are the columns of the compare table.
var compareColumns = []column{
	{Title: "name"},
	{Title: "re", Unit: "Å"},
	{Title: "depth", Unit: "eV"},
	{Title: "k", Unit: "eV/Å²"},
	{Title: "c3", Unit: "eV/Å³"},
	{Title: "c4", Unit: "eV/Å⁴"},
	{Title: "wavenumber", Unit: "cm⁻¹"},
	{Title: "period", Unit: "fs"},
	{Title: "V_n −x", Unit: "Å"},
	{Title: "V_n +x", Unit: "Å"},
	{Title: "T_n E", Unit: "eV"},
	{Title: "E/depth"},
	{Title: "E/k_B", Unit: "K"},
	{Title: "Boyle T", Unit: "K"},
	{Title: "notes"},
}

// quantumColumns are the columns of the quantum levels, shown when a
// reduced mass is given.
var quantumColumns = []column{
	{Title: "fundamental", Unit: "cm⁻¹"},
	{Title: "ZPE", Unit: "cm⁻¹"},
}

// validityColumn reports whether c is one of the validity columns, shown
// only when the validity was computed.
func validityColumn(c column) bool {
	switch c.Title {
	case "V_n −x", "V_n +x", "T_n E", "E/depth", "E/k_B":
		return true
	}
	return false
}

// compareTable lays the rows out, one per form, with cells of 6
// significant digits and the notes as footnotes.
func compareTable(rows []report.CompareRow) (*table, []string) {
	f := short
	// With a reduced mass, the quantum columns follow the period.
	quantum := false
	withValidity := false
	for _, r := range rows {
		quantum = quantum || r.Inspect != nil && r.Inspect.Mu != nil
		withValidity = withValidity || r.Validity != nil
	}
	cols := compareColumns
	if quantum {
		cols = append(append(append([]column{}, compareColumns[:8]...), quantumColumns...), compareColumns[8:]...)
	}
	if !withValidity {
		var kept []column
		for _, c := range cols {
			if !validityColumn(c) {
				kept = append(kept, c)
			}
		}
		cols = kept
	}
	t := &table{cols: cols}
	var foot []string
	for _, r := range rows {
		cells := []string{r.Name}
		if in := r.Inspect; in != nil {
			cells = append(cells, f(in.Re), f(float64(in.Depth)), f(in.K), f(taylor(in.Taylor, 3)), f(taylor(in.Taylor, 4)))
			if in.Wavenumber != nil {
				cells = append(cells, f(*in.Wavenumber), f(*in.HarmonicPeriodFs))
			} else {
				cells = append(cells, "—", "—")
			}
			if quantum {
				cells = append(cells, f(r.Fundamental), f(r.ZPE))
			}
		} else {
			cells = append(cells, "—", "—", "—", "—", "—", "—", "—")
			if quantum {
				cells = append(cells, "—", "—")
			}
		}
		if v := r.Validity; v != nil {
			cells = append(cells,
				f(float64(v.Potential.Compression)), f(float64(v.Potential.Stretch)),
				f(float64(v.Period.Energy)), f(float64(v.Period.DepthFraction)), f(float64(v.Period.Temperature)))
		} else if withValidity {
			cells = append(cells, "—", "—", "—", "—", "—")
		}
		cells = append(cells, f(r.Boyle))
		var text []string
		text = append(text, r.Notes...)
		if r.Err != nil {
			text = append(text, "error: "+r.Err.Error())
		}
		if len(text) == 0 {
			cells = append(cells, "")
		} else {
			var refs []string
			for _, s := range text {
				foot = append(foot, r.Name+": "+s)
				refs = append(refs, fmt.Sprintf("[%d]", len(foot)))
			}
			cells = append(cells, strings.Join(refs, " "))
		}
		t.add(cells...)
	}
	return t, foot
}

// writeFootnotes writes numbered notes below a table.
func writeFootnotes(w io.Writer, notes []string) error {
	for i, n := range notes {
		if _, err := fmt.Fprintf(w, "[%d] %s\n", i+1, n); err != nil {
			return err
		}
	}
	return nil
}

// taylor returns c[n], or NaN when the slice is too short.
func taylor(c []float64, n int) float64 {
	if n < len(c) {
		return c[n]
	}
	return math.NaN()
}

// short formats a table value to 6 significant digits, with num's
// conventions for NaN and ±Inf.
func short(v float64) string {
	if s := num(v); s == "—" || strings.HasSuffix(s, "∞") {
		return s
	}
	return fmt.Sprintf("%.6g", v)
}
