package main

import (
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"strconv"
	"strings"

	"github.com/spf13/cobra"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/figure"
	"github.com/pairwell/pairwell/core/motion"
	"github.com/pairwell/pairwell/core/report"
	"github.com/pairwell/pairwell/core/units"
	"github.com/pairwell/pairwell/core/validity"
)

// plotReport is the output of a plot command with --format json. Keys are
// a contract.
type plotReport struct {
	File   string   `json:"file"`
	Kind   string   `json:"kind"`
	Format string   `json:"format"`
	Series []string `json:"series"`
	Notes  []string `json:"notes"`
}

// maxPlotPeriods bounds --periods of the plots: every step of a run is
// kept for the picture, and a thousand periods are already unreadable.
const maxPlotPeriods = 1000

func newPlotCmd(e *env) *cobra.Command {
	cmd := &cobra.Command{
		Use:   "plot (taylor | period | compare | motion | virial | expansion | fit | levels) ... -o FILE",
		Short: "Draw pictures: the well and its Taylor truncations, period against amplitude, forms overlaid, motion",
		Long: `plot draws what pairwell computes, as PNG, SVG or PDF (by the extension of
-o FILE):

  taylor   V(r) and its Taylor truncations of order 0…N about re, with the
           range where the harmonic truncation holds shaded
  period   the period against amplitude (or energy): exact, harmonic,
           perturbative, and measured points with --method
  compare  several forms overlaid, in absolute or reduced units
  motion   the displacement against time, with the harmonic motion overlaid
  virial   B₂(T), classical and with the ħ² correction, measured points overlaid
  expansion  ⟨r⟩(T): classical, cubic-term estimate and quantum
  fit      reference data with fitted forms overlaid and a residual panel
  levels   the well with its quantum levels and the harmonic ladder beside them

Every curve has its own colour, dash pattern and marker (colours from the
Okabe–Ito palette for colour-blind readers), so the pictures stay readable in
grayscale. Curves that run off to ±∞ (truncations, Buckingham's collapse) are
cut at the axis limits. The file is written atomically: a failed command
leaves no partial file. Exit codes: 2 for bad input (unknown extension, empty
range, an amplitude beyond the well), 1 when the file cannot be written.`,
		Example: `  pairwell plot taylor morse:De=4.6,a=1.87,re=1.27 -o taylor.png
  pairwell plot period morse:De=4.6,a=1.87,re=1.27 --pair H-Cl --method rk4 -o period.svg
  pairwell plot compare morse:De=4.6,a=1.87,re=1.27 lj:epsilon=120K,sigma=3.4 --reduced -o compare.pdf
  pairwell plot motion morse:De=4.6,a=1.87,re=1.27 --pair H-Cl --amplitude 0.5 -o motion.png
  pairwell plot fit scan.csv -o fit.png`,
		RunE: func(cmd *cobra.Command, args []string) error {
			if len(args) > 0 {
				return unknownCommand(cmd, args[0])
			}
			return usageErr(fmt.Errorf("plot needs a kind: taylor, period, compare, motion, virial, expansion, fit or levels (see %s --help)", cmd.CommandPath()))
		},
	}
	cmd.AddCommand(newPlotTaylorCmd(e), newPlotPeriodCmd(e), newPlotCompareCmd(e), newPlotMotionCmd(e), newPlotVirialCmd(e), newPlotExpansionCmd(e), newPlotFitCmd(e), newPlotLevelsCmd(e))
	return cmd
}

// plotOutput is the -o, --width and --height flags of every plot command;
// register adds --energy-unit (env.energy) too.
type plotOutput struct {
	path          string
	width, height float64
}

func (o *plotOutput) register(e *env, cmd *cobra.Command) {
	f := cmd.Flags()
	f.StringVarP(&o.path, "output", "o", "", "picture file to write: .png, .svg or .pdf (required)")
	f.Float64Var(&o.width, "width", 0, fmt.Sprintf("picture width in inches, %d to %d (default %d; PNG has %d pixels per inch)", figure.MinSize, figure.MaxSize, figure.DefaultWidth, figure.DPI))
	f.Float64Var(&o.height, "height", 0, fmt.Sprintf("picture height in inches, %d to %d (default %d, %d with a panel below)", figure.MinSize, figure.MaxSize, figure.DefaultHeight, figure.DefaultHeightTwoPanels))
	e.energyUnitFlag(cmd, "the energy axis")
}

// check validates the output path before anything is computed: a known
// extension (bad input, exit 2) in an existing directory (exit 1).
func (o *plotOutput) check(e *env) error {
	if e.format == "csv" {
		return usageErr(errors.New("plot writes a picture and reports it as text or JSON: use --format table or json"))
	}
	if o.path == "" {
		return usageErr(errors.New("an output file is needed: -o FILE.png, FILE.svg or FILE.pdf"))
	}
	if _, err := figure.FormatFor(o.path); err != nil {
		return usageErr(fmt.Errorf("-o: %w", err))
	}
	for _, v := range []struct {
		name string
		v    float64
	}{{"--width", o.width}, {"--height", o.height}} {
		if v.v != 0 && !(v.v >= figure.MinSize && v.v <= figure.MaxSize) {
			return usageErr(fmt.Errorf("%s %g: must be %d to %d inches", v.name, v.v, figure.MinSize, figure.MaxSize))
		}
	}
	if err := e.checkOutput("-o", o.path); err != nil {
		return err
	}
	dir := filepath.Dir(o.path)
	st, err := os.Stat(dir)
	if err != nil {
		return failErr(fmt.Errorf("-o %s: cannot write to the directory %s: %w", o.path, dir, unwrapPath(err)))
	}
	if !st.IsDir() {
		return failErr(fmt.Errorf("-o %s: %s is not a directory", o.path, dir))
	}
	return nil
}

// unwrapPath strips the path from an *os.PathError, which the message
// already names.
func unwrapPath(err error) error {
	var pe *os.PathError
	if errors.As(err, &pe) {
		return pe.Err
	}
	return err
}

// writePlot writes f to the output file and reports it.
func (e *env) writePlot(f *figure.Figure, o *plotOutput) error {
	path := o.path
	format, err := figure.FormatFor(path)
	if err != nil {
		return usageErr(err)
	}
	f.Width, f.Height = o.width, o.height
	if name := e.energy.name; name != "" && name != "eV" && !f.ConvertEnergy(name, e.energy.perUnit) {
		return usageErr(fmt.Errorf("--energy-unit %s: the %s picture has no energy axis", name, f.Kind))
	}
	if err := e.writeOutput("-o", path, func(w io.Writer) error { return f.Render(w, format) }); err != nil {
		if errors.Is(err, figure.ErrFigure) {
			return computeErr(err)
		}
		return err
	}
	r := plotReport{File: path, Kind: f.Kind, Format: string(format), Notes: f.Notes}
	for _, s := range f.Series {
		r.Series = append(r.Series, s.Name)
	}
	if r.Notes == nil {
		r.Notes = []string{}
	}
	if e.format == "json" {
		return e.emit(r, nil)
	}
	var b strings.Builder
	fmt.Fprintf(&b, "wrote %s (%s, %s): %s\n", path, f.Kind, format, strings.Join(r.Series, "; "))
	for _, n := range f.Notes {
		fmt.Fprintf(&b, "  %s\n", n)
	}
	if _, err := fmt.Fprint(e.stdout, b.String()); err != nil {
		return failErr(fmt.Errorf("writing output: %w", err))
	}
	return nil
}

// checkPlotPeriods refuses --periods outside 1…maxPlotPeriods.
func checkPlotPeriods(periods int) error {
	if periods < 1 || periods > maxPlotPeriods {
		return usageErr(fmt.Errorf("--periods %d: must be from 1 to %d", periods, maxPlotPeriods))
	}
	return nil
}

// plotName names the form, and the pair when one is given, in a title.
func plotName(key string, m report.Mass) string {
	if m.Pair != "" {
		return key + " (" + m.Pair + ")"
	}
	return key
}

// plotErr classifies an error from a figure builder like computeErr.
func plotErr(key string, err error) error {
	return computeErr(fmt.Errorf("%s: %w", key, err))
}

// formPlot is the frame of the plots of one form with a reduced mass
// (period, motion, levels, virial, expansion): the output flags and
// --pair/--mu.
type formPlot struct {
	out  plotOutput
	mass massFlags
}

func (fp *formPlot) register(e *env, cmd *cobra.Command) {
	fp.out.register(e, cmd)
	fp.mass.register(cmd)
}

// draw checks the output and resolves the mass (required or not) before
// anything is computed, lets options read the command's own flags, builds
// SPEC, draws it with picture (given the title name of the form and pair)
// and writes the picture; a failure of picture is one of that form.
func (fp *formPlot) draw(e *env, spec string, massRequired bool, options func(m report.Mass) error,
	picture func(inst core.Instance, m report.Mass, name string) (*figure.Figure, error)) error {
	if err := fp.out.check(e); err != nil {
		return err
	}
	m, err := fp.mass.resolve(massRequired)
	if err != nil {
		return err
	}
	if options != nil {
		if err := options(m); err != nil {
			return err
		}
	}
	inst, err := e.build(spec)
	if err != nil {
		return err
	}
	key := inst.Model.Info().Key
	f, err := picture(inst, m, plotName(key, m))
	if err != nil {
		var coded *codedError
		if errors.As(err, &coded) {
			return err // already classified, e.g. bad input found while drawing
		}
		return plotErr(key, err)
	}
	return e.writePlot(f, &fp.out)
}

// parsePlotRange parses RMIN:RMAX, each a length with an optional unit.
func parsePlotRange(s string) (lo, hi float64, err error) {
	a, b, ok := strings.Cut(s, ":")
	if !ok || strings.Contains(b, ":") {
		return 0, 0, fmt.Errorf("%q: want RMIN:RMAX, e.g. 0.8:3.5 or 80pm:350pm", s)
	}
	if lo, err = units.Parse(a, units.Length); err != nil {
		return 0, 0, fmt.Errorf("%q: RMIN: %w", s, err)
	}
	if hi, err = units.Parse(b, units.Length); err != nil {
		return 0, 0, fmt.Errorf("%q: RMAX: %w", s, err)
	}
	if !(lo < hi) {
		return 0, 0, fmt.Errorf("%q: empty range: RMIN must be below RMAX", s)
	}
	if !(lo > 0) {
		return 0, 0, fmt.Errorf("%q: RMIN must be > 0", s)
	}
	return lo, hi, nil
}

func newPlotTaylorCmd(e *env) *cobra.Command {
	var (
		out       plotOutput
		order     int
		rng       string
		tolerance float64
	)
	cmd := &cobra.Command{
		Use:   "taylor SPEC [--truncation N] [--range RMIN:RMAX] -o FILE",
		Short: "Draw V(r) and its Taylor truncations of order 0…N about re",
		Long: `taylor draws the exact V(r) of SPEC (black, solid) and its Taylor truncations
about the minimum,

  V_n(r) = Σ c_k (r − re)ᵏ over k = 0 … n,   c_k = V⁽ᵏ⁾(re)/k!,

for n = 0 … N (--truncation, default ` + strconv.Itoa(figure.DefaultTaylorOrder) + `; orders 0 and 1 are one curve, c₁ = V′(re) = 0).
A shaded band marks where the harmonic truncation V₂ satisfies the potential
criterion |V₂ − V| ≤ tol·(V − V(re)) (--tolerance, default ` + asPercent(validity.DefaultTolerance) + `), and dotted
lines the turning points up to which its period is within tol of the exact one
(see "pairwell validity"). A hatched region is outside the form's domain (below
Buckingham's inner barrier V collapses to −∞).

Default range: from where V − V(re) reaches twice the depth (or a little below
an inner barrier) to where it reaches 95 % of the depth (between 1.5 and 4 re);
energies from V(re) − 0.2·depth to at most V(re) + 2.5·depth. --range sets the
separations, RMIN:RMAX with optional units; it must overlap the domain.`,
		Example: `  pairwell plot taylor morse:De=4.6,a=1.87,re=1.27 -o taylor.png
  pairwell plot taylor lj:epsilon=120K,sigma=3.4 --truncation 6 --range 3.3:6 -o lj.svg
  pairwell plot taylor buckingham:A=1500,rho=0.3,C=25 --range 250pm:700pm -o bk.pdf`,
		Args: exactArgs(1, "SPEC"),
		RunE: func(cmd *cobra.Command, args []string) error {
			if err := out.check(e); err != nil {
				return err
			}
			o := figure.TaylorOptions{Order: order, Tolerance: tolerance}
			if order < 2 || order > figure.MaxTaylorOrder {
				return usageErr(fmt.Errorf("--truncation %d: must be 2 to %d", order, figure.MaxTaylorOrder))
			}
			if rng != "" {
				var err error
				if o.RMin, o.RMax, err = parsePlotRange(rng); err != nil {
					return usageErr(fmt.Errorf("--range %w", err))
				}
			}
			inst, err := e.build(args[0])
			if err != nil {
				return err
			}
			key := inst.Model.Info().Key
			o.Name = key
			f, err := figure.Taylor(inst.Potential, o)
			if err != nil {
				return plotErr(key, err)
			}
			return e.writePlot(f, &out)
		},
	}
	out.register(e, cmd)
	f := cmd.Flags()
	truncationVar(f, &order, figure.DefaultTaylorOrder, fmt.Sprintf("highest order N of the truncated Taylor potentials drawn (2 to %d)", figure.MaxTaylorOrder))
	f.StringVar(&rng, "range", "", "separations RMIN:RMAX, Å unless a unit is given (default: from the well's shape)")
	toleranceVar(f, &tolerance, "the validity marks")
	return cmd
}

func newPlotPeriodCmd(e *env) *cobra.Command {
	var (
		fp         formPlot
		amplitudes string
		energyAxis bool
		method     string
		periods    int
	)
	cmd := &cobra.Command{
		Use:   "period SPEC (--pair A-B | --mu M) [--amplitudes LIST|FROM:TO:COUNT] [--energy-axis] [--method M] -o FILE",
		Short: "Draw the period against amplitude or energy: exact, harmonic, perturbative, measured",
		Long: `period draws the period of the classical vibration in the well of SPEC against
its amplitude x0 (a start at rest at r = re + x0; --energy-axis: against the
oscillation energy E = V(re + x0) − V(re)):

  exact         by quadrature (black, solid; see "pairwell period")
  harmonic      2π/ω0 = 2π√(μ/k), the same at every amplitude
  perturbative  second-order Lindstedt–Poincaré, T0/(1 + δ)
  measured      with --method (heun, rk4, verlet, dopri): one point per
                amplitude, integrated over --periods periods

--amplitudes takes a list (0.1,0.2,30pm) or FROM:TO:COUNT as in "pairwell
period"; the curves run from 0 to the extreme amplitudes and the measured
points sit at the amplitudes. Default: 8 stretches evenly spaced up to the one
whose energy is 90 % of the limit of bound motion (the depth, or an inner
barrier when lower); re/2 for a well without a top. An amplitude beyond the
well is bad input.`,
		Example: `  pairwell plot period morse:De=4.6,a=1.87,re=1.27 --pair H-Cl -o period.png
  pairwell plot period morse:De=4.6,a=1.87,re=1.27 --pair H-Cl --method rk4 --energy-axis -o period.svg
  pairwell plot period lj:epsilon=120K,sigma=3.4 --pair Ar-Ar --amplitudes=-0.3:0.8:12 --method dopri -o lj.png`,
		Args: exactArgs(1, "SPEC"),
		RunE: func(cmd *cobra.Command, args []string) error {
			var o figure.PeriodOptions
			return fp.draw(e, args[0], true, func(m report.Mass) (err error) {
				o = figure.PeriodOptions{Mu: m.Mu, EnergyAxis: energyAxis, Periods: periods}
				if cmd.Flags().Changed("amplitudes") {
					if o.Amplitudes, err = parseSweep(amplitudes, units.Length); err != nil {
						return usageErr(fmt.Errorf("--amplitudes: %w", err))
					}
				}
				if method != "" {
					if o.Method, err = motion.ParseMethod(method); err != nil {
						return usageErr(fmt.Errorf("--method: %w", err))
					}
					o.Measure = true
				} else if cmd.Flags().Changed("periods") {
					return usageErr(errors.New("--periods applies to the measured points: name an integrator with --method"))
				}
				return checkPlotPeriods(periods)
			}, func(inst core.Instance, _ report.Mass, name string) (*figure.Figure, error) {
				o.Name = name
				return figure.Period(inst.Potential, o)
			})
		},
	}
	fp.register(e, cmd)
	f := cmd.Flags()
	f.StringVar(&amplitudes, "amplitudes", "", "displacements from re at rest, Å unless a unit is given: LIST or FROM:TO:COUNT (default: 8 up to 90 % of the limit of bound motion)")
	f.BoolVar(&energyAxis, "energy-axis", false, "put the oscillation energy E = V(re + x0) − V(re) on the x axis instead of the amplitude")
	f.StringVar(&method, "method", "", "also measure the period at each amplitude by integrating: heun, rk4, verlet or dopri")
	f.IntVar(&periods, "periods", motion.DefaultPeriods, "periods per measured run (with --method)")
	return cmd
}

func newPlotCompareCmd(e *env) *cobra.Command {
	var (
		out                  plotOutput
		setPath              string
		reduced, fromMinimum bool
	)
	cmd := &cobra.Command{
		Use:   "compare [SPEC...] [--set FILE.toml] [--reduced] [--from-minimum] -o FILE",
		Short: "Draw several forms overlaid, in absolute or reduced units",
		Long: `compare draws the forms given as SPEC arguments and in a model-set file (--set,
as for "pairwell compare"; legend entries are the entry names, then the model
keys) on common axes:

  default          V(r) [eV] against r [Å], each form with its own energy zero
  --from-minimum   V(r) − V(re) [eV]: every minimum at 0
  --reduced        (V(r) − V(∞))/De against r/re: every minimum at (1, −1)
                   (V/De for forms whose energy zero is at dissociation, as
                   every built-in form with a depth)
  --reduced --from-minimum
                   (V(r) − V(re))/De against r/re: minimum at (1, 0), 1 at
                   dissociation

A form without a well depth (harmonic) has no reduced form and is left out of
reduced plots, with a note. A dotted line marks a Buckingham-type inner
barrier, below which that form collapses.`,
		Example: `  pairwell plot compare morse:De=4.6,a=1.87,re=1.27 lj:epsilon=4.6,sigma=1.13 -o forms.png
  pairwell plot compare --set candidates.toml --reduced -o reduced.svg`,
		RunE: func(cmd *cobra.Command, args []string) error {
			if err := out.check(e); err != nil {
				return err
			}
			if len(args) == 0 && setPath == "" {
				return usageErr(fmt.Errorf("plot compare needs SPEC arguments or --set FILE.toml (see %s --help)", cmd.CommandPath()))
			}
			curves, err := e.plotCurves(args, setPath)
			if err != nil {
				return err
			}
			f, err := figure.Compare(curves, figure.CompareOptions{Reduced: reduced, FromMinimum: fromMinimum})
			if err != nil {
				return computeErr(err)
			}
			return e.writePlot(f, &out)
		},
	}
	out.register(e, cmd)
	f := cmd.Flags()
	f.StringVar(&setPath, "set", "", "model-set file (TOML) naming the forms to draw")
	f.BoolVar(&reduced, "reduced", false, "reduced units: r/re and (V − V(∞))/De")
	f.BoolVar(&fromMinimum, "from-minimum", false, "measure energies from each form's minimum, V − V(re)")
	return cmd
}

// legendParams names a form with its parameters for a legend:
// "morse De=4.6 a=1.87 re=1.27" (default units, 4 significant digits).
func legendParams(inst core.Instance) string {
	info := inst.Model.Info()
	var b strings.Builder
	b.WriteString(info.Key)
	for i, p := range info.Params {
		fmt.Fprintf(&b, " %s=%.4g", p.Name, inst.Params[i])
	}
	return b.String()
}

// plotCurves builds the forms of a comparison: the model-set entries, then
// the specs, with unique legend names.
func (e *env) plotCurves(specs []string, setPath string) ([]figure.Curve, error) {
	var curves []figure.Curve
	if setPath != "" {
		built, err := e.loadSet(setPath)
		if err != nil {
			return nil, err
		}
		for _, b := range built {
			curves = append(curves, figure.Curve{Name: b.Name + ": " + legendParams(b.Instance), Potential: b.Instance.Potential})
		}
	}
	for _, s := range specs {
		inst, err := e.build(s)
		if err != nil {
			return nil, err
		}
		curves = append(curves, figure.Curve{Name: legendParams(inst), Potential: inst.Potential})
	}
	used := map[string]bool{}
	for i := range curves {
		name := curves[i].Name
		for n := 2; used[name]; n++ {
			name = fmt.Sprintf("%s-%d", curves[i].Name, n)
		}
		used[name] = true
		curves[i].Name = name
	}
	return curves, nil
}

func newPlotMotionCmd(e *env) *cobra.Command {
	var (
		fp        formPlot
		amplitude string
		method    string
		periods   int
	)
	cmd := &cobra.Command{
		Use:   "motion SPEC (--pair A-B | --mu M) --amplitude X [--method M] [--periods P] -o FILE",
		Short: "Draw the displacement against time, with the harmonic motion overlaid",
		Long: `motion integrates the vibration of the pair in the well of SPEC from rest at
r = re + X (--amplitude; positive stretches, negative compresses) with --method
(heun, rk4, verlet or dopri, default ` + defaultMethod.String() + `; see "pairwell motion") over
--periods periods (default ` + strconv.Itoa(motion.DefaultPeriods) + `), and draws the displacement x(t) = r(t) − re of
every step against the harmonic motion x0·cos(ω0 t), ω0 = √(k/μ), started the
same way. The title gives the measured, exact and harmonic periods.`,
		Example: `  pairwell plot motion morse:De=4.6,a=1.87,re=1.27 --pair H-Cl --amplitude 0.5 -o motion.png
  pairwell plot motion lj:epsilon=120K,sigma=3.4 --pair Ar-Ar --amplitude=-0.3 --method verlet --periods 5 -o lj.svg`,
		Args: exactArgs(1, "SPEC"),
		RunE: func(cmd *cobra.Command, args []string) error {
			var o figure.MotionOptions
			return fp.draw(e, args[0], true, func(m report.Mass) (err error) {
				if !cmd.Flags().Changed("amplitude") {
					return usageErr(errors.New("a start is needed: --amplitude X (Å; positive stretches, negative compresses)"))
				}
				o = figure.MotionOptions{Mu: m.Mu, Periods: periods}
				if o.Amplitude, err = units.Parse(amplitude, units.Length); err != nil {
					return usageErr(fmt.Errorf("--amplitude: %w", err))
				}
				if o.Method, err = motion.ParseMethod(method); err != nil {
					return usageErr(fmt.Errorf("--method: %w", err))
				}
				return checkPlotPeriods(periods)
			}, func(inst core.Instance, _ report.Mass, name string) (*figure.Figure, error) {
				o.Name = name
				return figure.Motion(inst.Potential, o)
			})
		},
	}
	fp.register(e, cmd)
	f := cmd.Flags()
	f.StringVar(&amplitude, "amplitude", "", "starting displacement r0 − re at rest, Å unless a unit is given (e.g. 0.2, -0.1, 20pm)")
	methodVar(f, &method)
	f.IntVar(&periods, "periods", motion.DefaultPeriods, "number of periods to integrate")
	return cmd
}
