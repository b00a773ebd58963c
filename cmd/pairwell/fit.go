package main

import (
	"bytes"
	"errors"
	"fmt"
	"io"
	"math"
	"strings"
	"sync"

	"github.com/spf13/cobra"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/fit"
	"github.com/pairwell/pairwell/core/modelset"
	"github.com/pairwell/pairwell/core/refdata"
	"github.com/pairwell/pairwell/core/report"
	"github.com/pairwell/pairwell/core/units"
)

// fitFlags are the options shared by fit and plot fit.
type fitFlags struct {
	forms       []string
	weights     string
	offset      string
	forceWeight float64
	rank        string
	restarts    int
	starts      []string
	mass        massFlags
}

func (o *fitFlags) register(cmd *cobra.Command) {
	f := cmd.Flags()
	f.StringArrayVar(&o.forms, "form", nil, "form to fit (key or alias, built-in or plugin); repeat for several; default: every built-in form")
	f.StringVar(&o.weights, "weights", "", "point weights: uniform, boltzmann:T (e.g. boltzmann:1000K), window:E (e.g. window:1eV) or file (the weight column); default: the file's weights if it has them, else uniform")
	f.StringVar(&o.offset, "offset", "auto", "energy zero of the data: auto (the energy at the largest r), fit (a fitted parameter) or a VALUE with unit (e.g. -460.25hartree)")
	f.Float64Var(&o.forceWeight, "force-weight", fit.DefaultForceWeight, "weight of the force residuals relative to the energies, in Å² (used when the file has a force column)")
	f.StringVar(&o.rank, "rank", string(report.FitMetrics[0]), "ranking metric: rmse, mae, max (over all points), rmse10 or rmse50 (within 10 % or 50 % of the depth)")
	f.IntVar(&o.restarts, "restarts", fit.DefaultRestarts, "deterministic restarts beyond the automatic start (0 to 7)")
	f.StringArrayVar(&o.starts, "start", nil, "starting parameters SPEC for the form it names, instead of the automatic start (needed for a form without Match, such as a formula form); repeat for several")
	o.mass.register(cmd)
}

// fitRun is what fit and plot fit compute.
type fitRun struct {
	path     string
	data     fit.Data
	settings fit.Settings
	fits     []report.Fit
	inputs   []report.FitInput
	mass     report.Mass
	metric   report.FitMetric
}

// settings parses the flags.
func (o *fitFlags) settings() (fit.Settings, error) {
	var s fit.Settings
	var err error
	if s.Weights, err = parseWeights(o.weights); err != nil {
		return s, usageErr(fmt.Errorf("--weights: %w", err))
	}
	if s.Offset, err = parseOffset(o.offset); err != nil {
		return s, usageErr(fmt.Errorf("--offset: %w", err))
	}
	if !(o.forceWeight > 0) || math.IsInf(o.forceWeight, 0) {
		return s, usageErr(fmt.Errorf("--force-weight %g: must be > 0 (Å²)", o.forceWeight))
	}
	s.ForceWeight = o.forceWeight
	if o.restarts < 0 || o.restarts > 7 {
		return s, usageErr(fmt.Errorf("--restarts %d: must be 0 to 7", o.restarts))
	}
	s.Restarts = o.restarts
	if o.restarts == 0 {
		s.Restarts = -1
	}
	return s, nil
}

// parseWeights parses uniform, file, boltzmann:T or window:E.
func parseWeights(s string) (fit.Weights, error) {
	kind, arg, has := strings.Cut(strings.TrimSpace(s), ":")
	kind = strings.ToLower(strings.TrimSpace(kind))
	switch {
	case kind == "" && !has:
		return fit.Weights{}, nil
	case kind == "uniform" && !has:
		return fit.Weights{Scheme: fit.Uniform}, nil
	case kind == "file" && !has:
		return fit.Weights{Scheme: fit.FileWeights}, nil
	case kind == "boltzmann" && has:
		t, err := units.Parse(arg, units.Temperature)
		if err != nil {
			return fit.Weights{}, err
		}
		if !(t > 0) {
			return fit.Weights{}, fmt.Errorf("boltzmann:%s: the temperature must be > 0 K", arg)
		}
		return fit.Weights{Scheme: fit.Boltzmann, T: t}, nil
	case kind == "window" && has:
		w, err := units.Parse(arg, units.Energy)
		if err != nil {
			return fit.Weights{}, err
		}
		if !(w > 0) {
			return fit.Weights{}, fmt.Errorf("window:%s: the window must be > 0 eV", arg)
		}
		return fit.Weights{Scheme: fit.Window, Window: w}, nil
	}
	return fit.Weights{}, fmt.Errorf("%q: expected uniform, file, boltzmann:T (e.g. boltzmann:1000K) or window:E (e.g. window:0.5eV)", s)
}

// parseOffset parses auto, fit or an energy with unit.
func parseOffset(s string) (fit.Offset, error) {
	switch strings.ToLower(strings.TrimSpace(s)) {
	case "auto", "":
		return fit.Offset{Mode: fit.OffsetAuto}, nil
	case "fit":
		return fit.Offset{Mode: fit.OffsetFit}, nil
	}
	v, err := units.Parse(s, units.Energy)
	if err != nil {
		return fit.Offset{}, fmt.Errorf("%w (expected auto, fit or an energy such as -460.25hartree)", err)
	}
	return fit.Offset{Mode: fit.OffsetValue, Value: v}, nil
}

// models returns the forms to fit: --form values, or every built-in form.
func (o *fitFlags) models(e *env) ([]core.Model, error) {
	if len(o.forms) == 0 {
		var out []core.Model
		for _, m := range e.registry.Models() {
			if m.Info().Origin == "built-in" {
				out = append(out, m)
			}
		}
		return out, nil
	}
	var out []core.Model
	seen := map[string]bool{}
	for _, k := range o.forms {
		m, err := e.registry.Lookup(strings.TrimSpace(k))
		if err != nil {
			return nil, usageErr(fmt.Errorf("--form: %w", err))
		}
		if key := m.Info().Key; !seen[key] {
			seen[key] = true
			out = append(out, m)
		}
	}
	return out, nil
}

// run reads the data and fits every form.
func (o *fitFlags) run(e *env, path string) (*fitRun, error) {
	s, err := o.settings()
	if err != nil {
		return nil, err
	}
	mass, err := o.mass.resolve(false)
	if err != nil {
		return nil, err
	}
	ms, err := o.models(e)
	if err != nil {
		return nil, err
	}
	starts := map[string][]float64{}
	for _, spec := range o.starts {
		inst, err := e.registry.Build(spec)
		if err != nil {
			return nil, usageErr(fmt.Errorf("--start: %w", err))
		}
		key := inst.Model.Info().Key
		if _, dup := starts[key]; dup {
			return nil, usageErr(fmt.Errorf("--start: two starts for %s", key))
		}
		starts[key] = inst.Params
	}
	if len(o.forms) == 0 {
		for key := range starts {
			if m, err := e.registry.Lookup(key); err == nil && m.Info().Origin != "built-in" {
				ms = append(ms, m) // a start names a form to fit
			}
		}
	}
	for _, m := range ms {
		key := m.Info().Key
		// A wrapper (a plugin's model) always has Match and reports
		// core.ErrUnsupported when the form has none (core.Match); an
		// empty target is refused without matching anything.
		if starts[key] != nil {
			continue
		}
		if _, _, err := core.Match(m, core.Target{}); errors.Is(err, core.ErrUnsupported) {
			form, cut, _ := strings.Cut(key, "@")
			if cut != "" {
				cut = "@" + cut
			}
			return nil, usageErr(fmt.Errorf("--form %s: the form has no match to a well, so it needs a start: --start %s:NAME=VALUE,…%s", key, form, cut))
		}
	}
	for key := range starts {
		found := false
		for _, m := range ms {
			found = found || m.Info().Key == key
		}
		if !found {
			return nil, usageErr(fmt.Errorf("--start %s: the form is not fitted (add --form %s)", key, key))
		}
	}
	raw, err := e.readInput("DATA", path, refdata.MaxSize)
	if err != nil {
		return nil, err
	}
	data, err := refdata.Read(bytes.NewReader(raw), path)
	if err != nil {
		return nil, usageErr(err)
	}
	return fitAll(ms, data, path, s, starts, report.FitMetric(strings.ToLower(o.rank)), mass)
}

// fitAll fits every form to data, in parallel, and ranks the fits. A form
// that cannot describe the data gets its row error; bad data or settings
// are usage errors, a failing plugin is a failure.
// starts holds given starting parameters by model key.
func fitAll(ms []core.Model, data fit.Data, path string, s fit.Settings, starts map[string][]float64, metric report.FitMetric, mass report.Mass) (*fitRun, error) {
	inputs := make([]report.FitInput, len(ms))
	var wg sync.WaitGroup
	for i, m := range ms {
		inputs[i] = report.FitInput{Name: m.Info().Key + "-fit", Model: m}
		wg.Add(1)
		go func() {
			defer wg.Done()
			si := s
			si.Start = starts[m.Info().Key]
			inputs[i].Result, inputs[i].Err = fit.FitForm(m, data, si)
		}()
	}
	wg.Wait()
	for _, in := range inputs {
		if err := in.Err; err != nil && !errors.Is(err, fit.ErrInfeasible) {
			return nil, computeErr(fmt.Errorf("%s: %w", path, err))
		}
	}
	fits, err := report.NewFits(inputs, metric, mass)
	if err != nil {
		return nil, usageErr(fmt.Errorf("--rank: %w", err))
	}
	return &fitRun{path: path, data: data, settings: s, fits: fits, inputs: inputs, mass: mass, metric: metric}, nil
}

func newFitCmd(e *env) *cobra.Command {
	var (
		o   fitFlags
		out string
	)
	cmd := &cobra.Command{
		Use:   "fit DATA.csv [--form KEY ...] [--weights W] [--offset auto|fit|VALUE] [--pair A-B | --mu M] [-o FILE.toml]",
		Short: "Fit forms to reference data (an energy scan) and rank them",
		Long: `fit fits each form to reference data E(r) by weighted least squares
(Levenberg–Marquardt) and ranks the forms by their errors.

DATA.csv has a header naming its columns with their units: one separation
(r_angstrom, r_bohr, r_nm, r_pm), one energy (energy_ev, energy_mev,
energy_hartree, energy_kcal_per_mol, energy_kj_per_mol, energy_per_cm,
energy_kelvin), optionally a force −dE/dr (force_ev_per_angstrom,
force_hartree_per_bohr) and a weight; lines starting with # are comments.
A malformed file is refused with one line naming the line (exit 2).

The energy zero (--offset): auto takes the energy at the largest r (a scan of
absolute energies that reaches dissociation), VALUE a given energy, fit makes
it a parameter. A form without a dissociation limit (harmonic) always has its
zero fitted. Weights (--weights): uniform; boltzmann:T, e^(−(E−E_min)/k_B·T);
window:E, only points up to E above the minimum; file, the weight column.

No start is needed for a form that can be matched to a well (every built-in
form): it starts from its match to the data's own minimum, depth and
curvature (a spline through the points near the lowest), plus deterministic
restarts (--restarts). --start SPEC gives the start of a form that has no
match (a formula form) or overrides the automatic one. Parameters "> 0" or
"≥ 0" are fitted as logarithms so they keep their constraints. Reported per
form, ranked by --rank: parameters with standard errors (from the Jacobian at the optimum,
scaled by the residual variance) and their correlation matrix; RMSE, MAE and
max |error| over all points and within 10 % and 50 % of the data's depth;
re, depth, k and, with --pair/--mu, the harmonic wavenumber, zero-point
energy and fundamental (J = 0 levels) of the fitted form; iterations,
convergence reason and gradient norm. -o FILE.toml writes the fitted forms
as a model set for compare, baseline and plot.

JSON is an array in rank order; each object has rank, model, name, origin,
params, standard_errors (null where not determined), correlation, spec,
energy_zero_ev, energy_zero_fitted, energy_zero_source (fitted, largest r
or given), energy_zero_standard_error_ev, rmse_ev, mae_ev,
max_abs_error_ev, windows [{depth_fraction, bound_ev, points, rmse_ev,
mae_ev, max_abs_error_ev}], points, fitted_points, weighted_rss_ev2,
iterations, evaluations, converged, reason, gradient_norm, jacobian, well
{equilibrium_r_angstrom, well_depth_ev, force_constant_ev_per_angstrom2,
pair, reduced_mass_u, harmonic_wavenumber_per_cm, zero_point_energy_per_cm,
fundamental_per_cm}, notes, and error (null unless the form could not be
fitted). CSV has one row per form, its header the JSON keys.

A fit says how well a classical model form reproduces the data given; it is
not a validated force field for production or safety decisions.`,
		Example: `  pairwell fit scan.csv
  pairwell fit scan.csv --form morse --form lj --offset fit --pair H-Cl
  pairwell fit scan.csv --weights boltzmann:2000K --rank rmse10 -o fitted.toml
  pairwell fit scan.csv --format json`,
		Args: func(cmd *cobra.Command, args []string) error {
			if len(args) != 1 {
				return usageErr(fmt.Errorf("fit needs one DATA.csv file, got %d arguments (see %s --help)", len(args), cmd.CommandPath()))
			}
			return nil
		},
		RunE: func(cmd *cobra.Command, args []string) error {
			if out != "" {
				if err := e.checkOutput("-o", out); err != nil {
					return err
				}
			}
			run, err := o.run(e, args[0])
			if err != nil {
				return err
			}
			if out != "" {
				if err := e.writeFitSet(out, run); err != nil {
					return err
				}
			}
			return e.emitFit(run)
		},
	}
	o.register(cmd)
	e.energyUnitFlag(cmd, tableEnergies)
	cmd.Flags().StringVarP(&out, "output", "o", "", "write the fitted forms as a model set (TOML) to this file")
	return cmd
}

// writeFitSet writes the successful fits of run as a model set.
func (e *env) writeFitSet(path string, run *fitRun) error {
	set := &modelset.Set{Title: "Forms fitted to " + run.path}
	for _, f := range run.fits {
		if f.Error != "" {
			continue
		}
		in := findInput(run.inputs, f.Name)
		info := in.Model.Info()
		e := modelset.Entry{Name: f.Name, Spec: core.Spec{Model: info.Key}}
		for i, q := range info.Params {
			e.Spec.Params = append(e.Spec.Params, core.Assignment{Name: q.Name, Value: report.ParamText(q, f.Params.Values[i])})
		}
		if run.mass.Mu != 0 {
			if run.mass.Pair != "" {
				e.Pair = run.mass.Pair
			} else {
				e.Mu = fmt.Sprintf("%s u", fmtFull(run.mass.Mu))
			}
		}
		set.Entries = append(set.Entries, e)
	}
	if len(set.Entries) == 0 {
		return computeErr(fmt.Errorf("-o %s: %w: no form could be fitted, nothing to write", path, core.ErrNoConvergence))
	}
	comment := fmt.Sprintf("Written by pairwell fit from %s (%d points), ranked by %s.\n"+
		"Parameters in their default units. Fitted classical model forms, not validated force fields.", run.path, len(run.data.R), run.metric)
	data, err := modelset.Marshal(set, comment)
	if err != nil {
		return failErr(fmt.Errorf("-o %s: %w", path, err))
	}
	return e.writeOutput("-o", path, func(w io.Writer) error {
		_, err := w.Write(data)
		return err
	})
}

func fmtFull(v float64) string { return fmt.Sprintf("%.17g", v) }

func findInput(in []report.FitInput, name string) report.FitInput {
	for _, x := range in {
		if x.Name == name {
			return x
		}
	}
	return report.FitInput{}
}

// fitColumns are the columns of the fit ranking table.
var fitColumns = []column{
	{Title: "rank"}, {Title: "form"},
	{Title: "RMSE", Unit: "eV"}, {Title: "MAE", Unit: "eV"}, {Title: "max", Unit: "eV"},
	{Title: "RMSE<10%", Unit: "eV"}, {Title: "RMSE<50%", Unit: "eV"},
	{Title: "re", Unit: "Å"}, {Title: "depth", Unit: "eV"}, {Title: "k", Unit: "eV/Å²"}, {Title: "wavenumber", Unit: "cm⁻¹"},
	{Title: "iterations"}, {Title: "converged"},
}

func (e *env) emitFit(run *fitRun) error {
	if e.format != "table" {
		return e.emit(run.fits, nil)
	}
	if err := e.emit(run.fits, fitTable(run.fits)); err != nil {
		return err
	}
	if e.format == "table" {
		if err := writeFitDetails(e.stdout, run); err != nil {
			return failErr(fmt.Errorf("writing output: %w", err))
		}
	}
	return nil
}

// fitTable is the ranking table.
func fitTable(fits []report.Fit) *table {
	t := &table{cols: fitColumns}
	for _, f := range fits {
		w10, w50 := math.NaN(), math.NaN()
		for _, w := range f.Windows {
			switch w.Fraction {
			case fit.WindowFractions[0]:
				w10 = float64(w.RMSE)
			case fit.WindowFractions[1]:
				w50 = float64(w.RMSE)
			}
		}
		re, depth, k, wn := math.NaN(), math.NaN(), math.NaN(), math.NaN()
		if f.Well != nil {
			re, depth, k = f.Well.Re, float64(f.Well.Depth), f.Well.K
			if math.IsNaN(depth) {
				depth = math.Inf(1)
			}
			if f.Well.Wavenumber != nil {
				wn = *f.Well.Wavenumber
			}
		}
		conv := "yes"
		switch {
		case f.Error != "":
			conv = "error"
		case !f.Converged:
			conv = "no (" + f.Reason + ")"
		}
		t.add(fmt.Sprint(f.Rank), f.Model, num(float64(f.RMSE)), num(float64(f.MAE)), num(float64(f.Max)),
			num(w10), num(w50), num(re), num(depth), num(k), num(wn), fmt.Sprint(f.Iterations), conv)
	}
	return t
}

// writeFitDetails writes, per form, the parameters with their standard
// errors, the correlation matrix, the spec and the notes.
func writeFitDetails(w io.Writer, run *fitRun) error {
	var b strings.Builder
	fmt.Fprintf(&b, "\nData: %s, %d points; errors are fit − data in eV over all points and within 10 %% and 50 %% of the data's depth.\n", run.path, len(run.data.R))
	for _, f := range run.fits {
		fmt.Fprintf(&b, "\n%d. %s", f.Rank, f.Model)
		if f.Error != "" {
			fmt.Fprintf(&b, ": not fitted: %s\n", f.Error)
			continue
		}
		state := "converged"
		if !f.Converged {
			state = "NOT converged"
		}
		fmt.Fprintf(&b, ": %s (%s) after %d iterations, %d evaluations, gradient norm %.3g, %s Jacobian, %d of %d points weighted\n",
			state, f.Reason, f.Iterations, f.Evaluations, float64(f.GradNorm), f.Jacobian, f.NFitted, f.NPoints)
		width := 0
		for _, n := range f.Params.Names {
			width = max(width, len([]rune(n)))
		}
		for i, n := range f.Params.Names {
			fmt.Fprintf(&b, "   %-*s = %-18s ± %-12s %s\n", width, n, num(f.Params.Values[i]), num(f.StandardErrors.Values[i]), f.Params.Units[i])
		}
		zero := f.ZeroSource
		switch {
		case f.ZeroFitted:
			zero = "fitted, ± " + num(float64(f.ZeroErr)) + " eV"
		case f.ZeroSource == "largest r":
			zero = "the energy at the largest r"
		}
		fmt.Fprintf(&b, "   energy zero %s eV (%s)\n", num(float64(f.Zero)), zero)
		if f.Correlation != nil {
			fmt.Fprintf(&b, "   correlation:")
			for _, n := range f.Params.Names {
				fmt.Fprintf(&b, " %8s", n)
			}
			b.WriteString("\n")
			for i, row := range f.Correlation {
				fmt.Fprintf(&b, "   %11s ", f.Params.Names[i])
				for _, v := range row {
					fmt.Fprintf(&b, " %8.4f", float64(v))
				}
				b.WriteString("\n")
			}
		}
		fmt.Fprintf(&b, "   spec: %s\n", f.Spec)
		for _, n := range f.Notes {
			fmt.Fprintf(&b, "   note: %s\n", n)
		}
	}
	b.WriteString("\nA fit measures how well a classical model form reproduces these data; it is not a validated force field for production or safety decisions.\n")
	_, err := io.WriteString(w, b.String())
	return err
}
