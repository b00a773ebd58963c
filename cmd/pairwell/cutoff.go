package main

import (
	"errors"
	"fmt"
	"math"
	"strconv"
	"strings"

	"github.com/spf13/cobra"

	"github.com/pairwell/pairwell/core/atoms"
	"github.com/pairwell/pairwell/core/cutoff"
	"github.com/pairwell/pairwell/core/report"
	"github.com/pairwell/pairwell/core/units"
)

func newCutoffCmd(e *env) *cobra.Command {
	var (
		mass              massFlags
		rc, on, densityIn string
	)
	cmd := &cobra.Command{
		Use:   "cutoff SPEC --cutoff RC [--switch-on R] [--density N] [--pair A-B | --mu M]",
		Short: "What a cutoff changes: jumps at r_c, shifts of the well, errors, tail corrections",
		Long: `cutoff cuts the form SPEC at r_c (--cutoff) by every scheme and shows them side
by side against the uncut form:

  truncate     V for r < r_c
  shift        V − V(r_c)
  force-shift  V − V(r_c) − (r − r_c)V′(r_c)
  switch-c1    S·V, S = 1 − (3x² − 2x³), x = (r − r_on)/(r_c − r_on)  (C¹)
  switch-c2    S·V, S = 1 − (10x³ − 15x⁴ + 6x⁵)                      (C²)

(every scheme 0 for r ≥ r_c; the switches between r_on = --switch-on, default
0.9·r_c, and r_c). For each: the jumps of V, F = −V′ and V″ at r_c; re, depth, k
and, with --pair or --mu, the harmonic wavenumber of the cut form and their shifts;
the largest |V_cut − V| and |F_cut − F| from 0.8·re up to r_c and where (a scan of
2048 points, then four rounds of 64 around the largest: positions to about 1e-9 of
the range). With --density (a number density in atoms/Å³, e.g. 0.021 or 21/nm^3,
or a mass density such as 1.40g/cm3 with the mass of a like pair from --pair A-A or
--mu, the atom mass taken as 2μ) also the standard long-range tail corrections of
the energy per particle and of the pressure for r > r_c (g(r) = 1): in closed form
for the built-in Lennard-Jones (M. P. Allen & D. J. Tildesley, Computer Simulation
of Liquids, 2nd ed. 2017, §2.8), by quadrature otherwise, with its accuracy.

A cut form is also a form for every other command: SPEC@cut=SCHEME,rc=R[,on=R_ON].
These are properties of a classical model potential, not of a validated force field.`,
		Example: `  pairwell cutoff lj:epsilon=119.8K,sigma=3.405 --cutoff 8.5 --pair Ar-Ar --density 1.40g/cm3
  pairwell cutoff lj:epsilon=120K,sigma=3.4 --cutoff 2.5nm --switch-on 2.2nm --density 0.021 --format json
  pairwell cutoff morse:De=4.6,a=1.87,re=1.27 --cutoff 6 --mu 0.98 --format csv`,
		Args: exactArgs(1, "one SPEC"),
		RunE: func(cmd *cobra.Command, args []string) error {
			m, err := mass.resolve(false)
			if err != nil {
				return err
			}
			if rc == "" {
				return usageErr(errors.New("--cutoff RC is required, e.g. --cutoff 8.5 (Å) or --cutoff 0.85nm"))
			}
			var s cutoff.AnalysisSettings
			if s.Cutoff, err = parseLength("--cutoff", rc); err != nil {
				return err
			}
			if on != "" {
				if s.SwitchOn, err = parseLength("--switch-on", on); err != nil {
					return err
				}
			}
			if densityIn != "" {
				if s.Density, err = parseDensity(densityIn, m); err != nil {
					return usageErr(fmt.Errorf("--density: %w", err))
				}
			}
			s.Mu = m.Mu
			inst, err := e.build(args[0])
			if err != nil {
				return err
			}
			if _, cut := inst.Model.(*cutoff.Model); cut {
				return usageErr(fmt.Errorf("%s is already a cut form: give the bare form, cutoff compares every scheme", args[0]))
			}
			r, err := cutoff.Analyze(inst, s)
			if err != nil {
				return computeErr(err)
			}
			out := cutoffOutput{Model: r.Model, Spec: strings.TrimSpace(args[0]), Params: report.NewParams(inst), Pair: report.Text(m.Pair), Report: &r}
			if e.format == "table" {
				if err := writeCutoffHead(e, out); err != nil {
					return err
				}
			}
			if err := e.emitRecords(out, "schemes", cutoffTable(r)); err != nil {
				return err
			}
			if e.format == "table" {
				return writeCutoffFoot(e, r)
			}
			return nil
		},
	}
	cmd.Flags().StringVar(&rc, "cutoff", "", "cutoff r_c, in Å unless a unit is given (e.g. 8.5, 0.85nm)")
	cmd.Flags().StringVar(&on, "switch-on", "", "start r_on of the switching region of the switches (default 0.9·r_c)")
	cmd.Flags().StringVar(&densityIn, "density", "", "number density for the tail corrections: atoms/Å³ (0.021, 21/nm^3) or a mass density (1.40g/cm3, with --pair A-A or --mu)")
	mass.register(cmd)
	e.energyUnitFlag(cmd, tableEnergies)
	return cmd
}

// cutoffOutput is the JSON object of cutoff: the form and the report.
type cutoffOutput struct {
	Model  string        `json:"model"` // first, as in every command (the report's own is the same)
	Spec   string        `json:"spec"`
	Params report.Params `json:"params"`
	Pair   report.Text   `json:"pair"` // null without --pair
	*cutoff.Report
}

// parseLength reads a length flag > 0.
func parseLength(flag, s string) (float64, error) {
	v, err := units.Parse(s, units.Length)
	if err != nil {
		return 0, usageErr(fmt.Errorf("%s: %w", flag, err))
	}
	if !(v > 0) {
		return 0, usageErr(fmt.Errorf("%s %s: must be a length > 0", flag, s))
	}
	return v, nil
}

// massDensityUnits are the mass-density units of --density, in g/cm³.
var massDensityUnits = []struct {
	name   string
	factor float64
}{
	{"g/cm^3", 1}, {"g/cm3", 1}, {"g/cm³", 1}, {"g/mL", 1}, {"g/ml", 1},
	{"kg/m^3", 1e-3}, {"kg/m3", 1e-3}, {"kg/m³", 1e-3},
}

// numberDensity is the dimension of a number density, 1/Å³.
var numberDensity, _ = units.NewDimension(0, -3, 0, 0, 0)

// parseDensity reads --density: a number density (bare number in atoms/Å³,
// or any unit of 1/length³), or a mass density in g/cm³ or kg/m³, turned
// into atoms/Å³ with the atom mass of a like pair: ρ_n = ρ/(m·u), with
// 1 g/cm³ = 1/(m[u]·1.66053906660) atoms/Å³ (u = 1.66053906660e-24 g,
// CODATA 2018; 1 cm³ = 10²⁴ Å³).
func parseDensity(s string, m report.Mass) (float64, error) {
	t := strings.TrimSpace(s)
	for _, u := range massDensityUnits {
		num, ok := strings.CutSuffix(t, u.name)
		if !ok {
			continue
		}
		v, err := strconv.ParseFloat(strings.TrimSpace(num), 64)
		if err != nil || !(v > 0) || math.IsInf(v, 0) {
			return 0, fmt.Errorf("%q: expected a positive number before %s", s, u.name)
		}
		atom, err := atomMass(m)
		if err != nil {
			return 0, fmt.Errorf("%q is a mass density: %w", s, err)
		}
		return v * u.factor / (atom * units.Dalton * 1e3) * 1e-24, nil
	}
	v, err := units.ParseIn(t, numberDensity, "1/Å^3")
	if err != nil {
		return 0, fmt.Errorf("%w (a number density in atoms/Å³ such as 0.021, or a mass density such as 1.40g/cm3)", err)
	}
	if !(v > 0) || math.IsInf(v, 0) {
		return 0, fmt.Errorf("%q: must be a density > 0", s)
	}
	return v, nil
}

// atomMass returns the mass of one atom of a like pair: that of A for
// --pair A-A, 2μ for --mu.
func atomMass(m report.Mass) (float64, error) {
	switch {
	case m.Mu == 0:
		return 0, errors.New("it needs the atom mass: give --pair A-A (a like pair) or --mu (the atom mass is taken as 2μ)")
	case m.Pair == "":
		return 2 * m.Mu, nil
	}
	p, err := atoms.ParsePair(m.Pair)
	if err != nil {
		return 0, err
	}
	if p.A != p.B {
		return 0, fmt.Errorf("the pair %s is unlike, so a mass density does not give a number density: give it in atoms/Å³", m.Pair)
	}
	return 2 * p.Mu, nil
}

// opt formats an optional value, — when absent.
func opt(v *float64) string {
	if v == nil {
		return "—"
	}
	return num(*v)
}

// cutoffTable lays the schemes out side by side: one row per quantity,
// one column per scheme, the uncut form first.
func cutoffTable(r cutoff.Report) *table {
	t := &table{cols: []column{{Title: "quantity"}, {Title: "unit"}, {Title: "uncut"}}}
	for _, s := range r.Schemes {
		t.cols = append(t.cols, column{Title: s.Scheme})
	}
	row := func(name, unit, bare string, f func(s cutoff.SchemeReport) string) {
		cells := []string{name, unit, bare}
		for _, s := range r.Schemes {
			cells = append(cells, f(s))
		}
		t.add(cells...)
	}
	row("energy jump at r_c", "eV", "—", func(s cutoff.SchemeReport) string { return num(s.EnergyJump) })
	row("force jump at r_c", "eV/Å", "—", func(s cutoff.SchemeReport) string { return num(s.ForceJump) })
	row("V″ jump at r_c", "eV/Å²", "—", func(s cutoff.SchemeReport) string { return opt(s.CurvatureJump) })
	row("re", "Å", num(r.Bare.Re), func(s cutoff.SchemeReport) string { return num(s.Well.Re) })
	row("re shift", "Å", "—", func(s cutoff.SchemeReport) string { return num(s.ReShift) })
	depth := func(d cutoff.Depth) string { return num(float64(d)) }
	row("well depth", "eV", depth(r.Bare.Depth), func(s cutoff.SchemeReport) string { return depth(s.Well.Depth) })
	row("depth shift", "eV", "—", func(s cutoff.SchemeReport) string { return opt(s.DepthShift) })
	row("k = V″(re)", "eV/Å²", num(r.Bare.K), func(s cutoff.SchemeReport) string { return num(s.Well.K) })
	row("k shift", "eV/Å²", "—", func(s cutoff.SchemeReport) string { return num(s.KShift) })
	if r.Bare.Wavenumber != nil {
		row("harmonic wavenumber", "cm⁻¹", num(*r.Bare.Wavenumber), func(s cutoff.SchemeReport) string { return opt(s.Well.Wavenumber) })
		row("wavenumber shift", "cm⁻¹", "—", func(s cutoff.SchemeReport) string { return opt(s.WavenumberShift) })
	}
	row("max |V_cut − V| below r_c", "eV", "—", func(s cutoff.SchemeReport) string { return num(s.MaxEnergyError) })
	row("  at r", "Å", "—", func(s cutoff.SchemeReport) string { return opt(s.MaxEnergyErrorR) })
	row("max |F_cut − F| below r_c", "eV/Å", "—", func(s cutoff.SchemeReport) string { return num(s.MaxForceError) })
	row("  at r", "Å", "—", func(s cutoff.SchemeReport) string { return opt(s.MaxForceErrorR) })
	return t
}

// writeCutoffHead prints what is cut where, above the table.
func writeCutoffHead(e *env, out cutoffOutput) error {
	r := out.Report
	_, err := fmt.Fprintf(e.stdout, "%s cut at r_c = %s Å (switches from r_on = %s Å); bare V(r_c) = %s eV, V′(r_c) = %s eV/Å\n",
		out.Spec, num(r.Cutoff), num(r.SwitchOn), num(r.VCut), num(r.DVCut))
	if err != nil {
		return failErr(fmt.Errorf("writing output: %w", err))
	}
	return nil
}

// writeCutoffFoot prints how the errors were found, the tail corrections,
// the notes and the caution.
func writeCutoffFoot(e *env, r cutoff.Report) error {
	var b strings.Builder
	fmt.Fprintf(&b, "Errors over [%s Å, %s Å): %s; positions to %.2g Å.\n", num(r.Scan.From), num(r.Scan.To), r.Scan.Method, r.Scan.Resolution)
	if t := r.Tail; t != nil {
		acc := "exact to rounding"
		if t.Accuracy > 0 {
			acc = fmt.Sprintf("relative accuracy %.2g", t.Accuracy)
		}
		fmt.Fprintf(&b, "Tail corrections for r > r_c at ρ = %s atoms/Å³ (%s, %s; %s):\n", num(t.Density), t.Method, acc, *r.TailSource)
		fmt.Fprintf(&b, "  energy per particle u_tail  %s eV\n  pressure p_tail             %s eV/Å³ = %s bar\n", num(t.Energy), num(t.Pressure), num(t.PressureBar))
	}
	for _, n := range r.Notes {
		b.WriteString(n + "\n")
	}
	b.WriteString(r.Caution + "\n")
	if _, err := fmt.Fprint(e.stdout, b.String()); err != nil {
		return failErr(fmt.Errorf("writing output: %w", err))
	}
	return nil
}
