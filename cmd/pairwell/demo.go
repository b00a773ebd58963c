package main

import (
	"errors"
	"fmt"
	"math"
	"strconv"
	"strings"

	"github.com/spf13/cobra"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/report"
)

// The demo is a sequence of sections, each computed by a demoX function
// into a plain struct (the JSON section) and rendered by a writeDemoX
// function. A new section, such as a picture written to a directory, is
// one more pair of functions called from runDemo.

// demoBond is the invented bond of the demo: no real molecule has these
// numbers; they are round values of the size of a light covalent bond
// (re = 1.20 Å, De = 4.00 eV, k = 30 eV/Å² ≈ 481 N/m, μ = 7 u).
var demoBond = struct {
	target core.Target
	mu     float64
}{core.Target{Re: 1.20, Depth: 4.00, K: 30.0}, 7.0}

// demoAmplitudes are the stretches (Å) of the period-vs-amplitude table,
// from the harmonic regime (E ≈ 1 % of the depth) to near dissociation.
var demoAmplitudes = []float64{0.05, 0.1, 0.2, 0.3, 0.5, 0.8, 1.2, 2.0}

// demoRoomTemperature (K) is the temperature the interpretation relates
// to the harmonic period range.
const demoRoomTemperature = 300

// demoPeriodModel is the form of the period-vs-amplitude table.
const demoPeriodModel = "morse"

// demoCaution is printed with every demo.
const demoCaution = "pairwell evaluates classical model potentials: a model is not a validated force field; do not base production or safety decisions on its numbers alone."

// demoReport is the output of the demo; its JSON is one object with the
// sections as keys.
type demoReport struct {
	Scenario       demoScenario        `json:"scenario"`
	Compare        []report.CompareRow `json:"compare"`
	Period         report.PeriodTable  `json:"period"`
	Fit            *demoFit            `json:"fit"`
	Temperature    *demoTemperature    `json:"temperature"`
	Levels         *report.Levels      `json:"levels"`
	Interpretation string              `json:"interpretation"`
	Caution        string              `json:"caution"`
}

// demoScenario describes the invented bond.
type demoScenario struct {
	Invented    bool    `json:"invented"`
	Description string  `json:"description"`
	Re          float64 `json:"equilibrium_r_angstrom"`
	Depth       float64 `json:"well_depth_ev"`
	K           float64 `json:"force_constant_ev_per_angstrom2"`
	Mu          float64 `json:"reduced_mass_u"`
	Order       int     `json:"truncation_order"`
	Tolerance   float64 `json:"tolerance"`
}

func newDemoCmd(e *env) *cobra.Command {
	var pictures demoPictures // see plot_demo.go
	cmd := &cobra.Command{
		Use:   "demo",
		Short: "Tell the whole story on built-in data: one invented bond, four forms, their harmonic ranges",
		Long: fmt.Sprintf(`demo runs pairwell end to end on an INVENTED bond (re = %g Å, De = %g eV,
k = %g eV/Å², μ = %g u — made-up numbers, not a real molecule):

 1. every built-in form is matched to the bond (compare --match) and the forms
    are laid side by side: well, harmonic frequency, and how far the harmonic
    picture holds (potential and period criteria at 1 %%);
 2. for Morse, the exact period, the harmonic one and the second-order
    perturbative one at a handful of amplitudes;
 3. a paragraph saying in plain words what the numbers mean, computed from
    them;
 4. every built-in form fitted to an INVENTED energy scan of the bond
    (pairwell fit), ranked by RMSE;
 5. the thermal expansion of the bond (pairwell expansion: classical,
    cubic-term and quantum mean bond length), and B₂(T) of an INVENTED
    argon-like gas against INVENTED B₂ data (pairwell virial --data);
 6. the quantum levels of the matched Morse well (pairwell levels): zero-point
    energy, D0, fundamental, and where the classical harmonic range stands
    against the zero-point energy;
 7. pictures of the Morse well and its Taylor truncations, of the period
    against amplitude, of the four forms, of the motion, of the fits, of the
    expansion and of B₂, written to the
    folder --out (default ./pairwell-demo/; --no-pictures for none).

--format json emits one object with the keys scenario, compare, period, fit
(invented, description, data, points, fits: the objects of pairwell fit),
temperature (expansion: the object of pairwell expansion; gas: invented,
description, virial: the object of pairwell virial), levels (the object of
pairwell levels for the matched Morse form), interpretation and
caution; the pictures are then listed on stderr.`, demoBond.target.Re, demoBond.target.Depth, demoBond.target.K, demoBond.mu),
		Example: `  pairwell demo
  pairwell demo --out /tmp/pictures
  pairwell demo --format json --no-pictures`,
		Args: exactArgs(0, "no arguments"),
		RunE: func(cmd *cobra.Command, args []string) error {
			if e.format == "csv" {
				return usageErr(errors.New("demo prints several tables: use --format table or json"))
			}
			r, err := runDemo(e)
			if err != nil {
				return err
			}
			if e.format == "json" {
				if err := e.emit(r, nil); err != nil {
					return err
				}
				return pictures.write(e)
			}
			if err := writeDemo(e.tables(), r); err != nil {
				return failErr(fmt.Errorf("writing output: %w", err))
			}
			return pictures.write(e)
		},
	}
	pictures.register(cmd)
	e.energyUnitFlag(cmd, tableEnergies)
	return cmd
}

// runDemo computes every section.
func runDemo(e *env) (demoReport, error) {
	r := demoReport{Scenario: demoScenarioSection(), Caution: demoCaution}
	inputs := demoInputs(e.registry)
	rows, err := demoCompareSection(e, inputs)
	if err != nil {
		return r, err
	}
	r.Compare = rows
	var src *report.CompareInput
	for i := range inputs {
		if inputs[i].Model == demoPeriodModel && inputs[i].Err == nil {
			src = &inputs[i]
		}
	}
	if src == nil {
		return r, failErr(fmt.Errorf("demo: %s could not be matched to the demo bond", demoPeriodModel))
	}
	r.Period, err = report.NewPeriodTable(src.Name, src.Instance, demoBond.mu, demoAmplitudes)
	if err != nil {
		return r, computeErr(err)
	}
	if r.Fit, err = demoFitSection(e); err != nil {
		return r, err
	}
	if r.Temperature, err = demoTemperatureSection(e, src.Instance); err != nil {
		return r, err
	}
	lv, err := report.NewLevels(src.Instance, report.Mass{Mu: demoBond.mu}, report.LevelsSettings{VMax: -1})
	if err != nil {
		return r, computeErr(err)
	}
	r.Levels = &lv
	r.Interpretation = demoInterpretation(r)
	return r, nil
}

// demoScenarioSection describes the invented bond.
func demoScenarioSection() demoScenario {
	t := demoBond.target
	return demoScenario{
		Invented: true,
		Description: "An INVENTED bond, not a real molecule: round numbers of the size of a light covalent bond, " +
			"used to show what pairwell computes.",
		Re: t.Re, Depth: t.Depth, K: t.K, Mu: demoBond.mu,
		Order: report.DefaultValidityOrder, Tolerance: report.DefaultValidityTolerance,
	}
}

// demoInputs matches every built-in form to the demo bond.
func demoInputs(reg *core.Registry) []report.CompareInput {
	inputs := matchAll(reg, demoBond.target)
	for i := range inputs {
		inputs[i].Name = inputs[i].Model
		inputs[i].Mass = report.Mass{Mu: demoBond.mu}
	}
	return inputs
}

// demoCompareSection compares the matched forms.
func demoCompareSection(e *env, inputs []report.CompareInput) ([]report.CompareRow, error) {
	return e.compare(inputs, report.CompareSettings{Validity: true})
}

// demoInterpretation says in words what the numbers of r mean. Every
// number in it comes from r.
func demoInterpretation(r demoReport) string {
	rows := map[string]*report.CompareRow{}
	for i := range r.Compare {
		if r.Compare[i].Err == nil && r.Compare[i].Inspect != nil && r.Compare[i].Validity != nil {
			rows[r.Compare[i].Model] = &r.Compare[i]
		}
	}
	tol := 100 * r.Scenario.Tolerance
	target := core.Target{Re: r.Scenario.Re, Depth: r.Scenario.Depth, K: r.Scenario.K}
	var s []string
	if m := rows["morse"]; m != nil {
		v := m.Validity
		s = append(s, fmt.Sprintf("For Morse, the harmonic period is within %g %% of the true one up to an oscillation energy E = %.3g eV "+
			"(%.3g %% of the depth, k_B·T at T = %.0f K), i.e. for vibrations from %.3g Å inside to %.3g Å outside re;",
			tol, v.Period.Energy, 100*v.Period.DepthFraction, v.Period.Temperature, v.Period.Compression, v.Period.Stretch))
		pot := fmt.Sprintf("the harmonic potential itself is within %g %% of the Morse potential only from −%.2g Å to +%.2g Å.",
			tol, v.Potential.Compression, v.Potential.Stretch)
		if v.Potential.Stretch < v.Period.Stretch && v.Potential.Compression < v.Period.Compression {
			pot = strings.TrimSuffix(pot, ".") + ": the period is far more forgiving, because the cubic term, which spoils the potential " +
				"at first order, changes the period only at second order (its effects on the two sides of a swing largely cancel)."
		}
		s = append(s, pot)
		room := report.NewThermal(*v, demoRoomTemperature)
		s = append(s, fmt.Sprintf("At room temperature the mean energy of a classical vibration, k_B·%g K = %.3g eV, is %.2g %% of that limit.",
			room.Temperature, room.Energy, 100*room.Fraction))
	}
	if lj, m := rows["lennard-jones"], rows["morse"]; lj != nil && m != nil {
		c := report.NewContrast(*lj.Inspect, *m.Inspect, target)
		s = append(s, fmt.Sprintf("Lennard-Jones matched to re and De is %.2g× stiffer than the target (k = %.4g instead of %.4g eV/Å²), "+
			"so its harmonic wavenumber is %.3g× higher (%.0f cm⁻¹ against %.0f cm⁻¹):"+
			" its two parameters cannot give this bond its depth and its curvature at once.",
			c.StiffnessRatio, lj.Inspect.K, r.Scenario.K, c.WavenumberRatio, *lj.Inspect.Wavenumber, *m.Inspect.Wavenumber))
	}
	if b, m := rows["buckingham"], rows["morse"]; b != nil && m != nil {
		c := report.NewContrast(*b.Inspect, *m.Inspect, target)
		s = append(s, fmt.Sprintf("Buckingham matches re, De and k exactly, so it has the same harmonic frequency as Morse, "+
			"yet its harmonic period range ends at %.3g eV instead of %.3g eV (c3 = %.4g against %.4g eV/Å³): "+
			"the same curvature does not mean the same anharmonicity.",
			b.Validity.Period.Energy, m.Validity.Period.Energy, taylor(b.Inspect.Taylor, 3), taylor(m.Inspect.Taylor, 3)))
		if br := b.Inspect.Barrier; br != nil {
			s = append(s, fmt.Sprintf("Its spurious inner maximum lies at r = %.3g Å, only %.3g eV above the minimum: "+
				"a vibration with more energy than that collapses the pair, so for this bond the form is close to turning over.",
				br.R, c.BarrierHeight))
		}
	}
	if h := rows["harmonic"]; h != nil && math.IsInf(h.Validity.Period.Energy, 1) {
		s = append(s, "The harmonic form is its own Taylor expansion, so its ranges are unbounded; it never dissociates and cannot describe a bond breaking.")
	}
	s = append(s, periodSentence(r.Period, tol))
	s = append(s, levelsSentences(r, rows)...)
	return strings.Join(strings.Fields(strings.Join(s, " ")), " ")
}

// periodSentence summarises the period table: how far the harmonic period
// is off at the largest amplitude where the perturbative one is still
// within tol percent.
func periodSentence(p report.PeriodTable, tol float64) string {
	row, ok := p.PerturbativeReach(tol / 100)
	if !ok {
		return ""
	}
	last := p.Rows[len(p.Rows)-1]
	s := fmt.Sprintf("In the period table, second-order perturbation theory is within %g %% of the exact %s period up to a stretch of %g Å "+
		"(E = %.3g eV, %.0f %% of the depth), where the exact period is already %.3g %% longer than the harmonic one.",
		tol, p.Name, row.Amplitude, row.Energy, 100*row.DepthFraction, 100*row.Lengthening())
	if last.Error == "" {
		s += fmt.Sprintf(" Near dissociation (%g Å, %.0f %% of the depth) the period is %.3g× the harmonic one and neither approximation holds.",
			last.Amplitude, 100*last.DepthFraction, last.PeriodRatio())
	}
	return s
}

// writeDemo renders every section as text.
func writeDemo(w tableWriter, r demoReport) error {
	for _, f := range []func(tableWriter, demoReport) error{
		writeDemoScenario, writeDemoCompare, writeDemoPeriod, writeDemoFit, writeDemoTemperature, writeDemoLevels, writeDemoInterpretation,
	} {
		if err := f(w, r); err != nil {
			return err
		}
	}
	return nil
}

func writeDemoScenario(w tableWriter, r demoReport) error {
	s := r.Scenario
	_, err := fmt.Fprintf(w, `pairwell demo — an INVENTED bond, not a real molecule:
  re = %.2f Å, De = %.2f eV, k = %g eV/Å², reduced mass μ = %g u.
Every built-in form is matched to it (pairwell compare --match re=%g,De=%g,k=%g --mu %g).
Validity: the Taylor potential of order %d within a tolerance of %g %%.
`, s.Re, s.Depth, s.K, s.Mu, s.Re, s.Depth, s.K, s.Mu, s.Order, 100*s.Tolerance)
	return err
}

func writeDemoCompare(w tableWriter, r demoReport) error {
	fmt.Fprintln(w, "\n== Four forms, one bond")
	pt := &table{cols: []column{{Title: "name"}, {Title: "matched parameters"}}}
	for _, row := range r.Compare {
		ps := "—"
		if row.Inspect != nil {
			ps = row.Inspect.Params.String()
		}
		pt.add(row.Name, ps)
	}
	if err := w.table(pt); err != nil {
		return err
	}
	fmt.Fprintln(w)
	t, notes := compareTable(r.Compare)
	if err := w.table(t); err != nil {
		return err
	}
	return writeCompareLegend(w, r.Compare, notes)
}

func writeDemoPeriod(w tableWriter, r demoReport) error {
	fmt.Fprintf(w, "\n== Period against amplitude (%s, stretched from rest by the amplitude)\n", r.Period.Name)
	t := &table{cols: []column{
		{Title: "amplitude", Unit: "Å"}, {Title: "energy", Unit: "eV"}, {Title: "E/depth"},
		{Title: "exact", Unit: "fs"}, {Title: "harmonic", Unit: "fs"}, {Title: "perturbative", Unit: "fs"},
		{Title: "exact/harmonic − 1", Unit: "%"}, {Title: "perturbative/exact − 1", Unit: "%"}, {Title: "notes"},
	}}
	for _, row := range r.Period.Rows {
		t.add(short(row.Amplitude), short(row.Energy), short(row.DepthFraction),
			short(float64(row.Exact)), short(row.Harmonic), short(float64(row.Perturbative)),
			percent(row.Lengthening()), percent(row.PerturbativeError()), string(row.Error))
	}
	return w.table(t)
}

func writeDemoInterpretation(w tableWriter, r demoReport) error {
	_, err := fmt.Fprintf(w, "\n== What the numbers say\n%s\n\n%s\n", wrap(r.Interpretation, 88), wrap(r.Caution, 88))
	return err
}

// percent formats a ratio as a percentage with 3 significant digits.
func percent(v float64) string {
	if math.IsNaN(v) {
		return "—"
	}
	return fmt.Sprintf("%+.3g", 100*v)
}

// wrap breaks text into lines of at most width runes at spaces.
func wrap(text string, width int) string {
	var b strings.Builder
	n := 0
	for _, word := range strings.Fields(text) {
		l := len([]rune(word))
		if n > 0 && n+1+l > width {
			b.WriteByte('\n')
			n = 0
		} else if n > 0 {
			b.WriteByte(' ')
			n++
		}
		b.WriteString(word)
		n += l
	}
	return b.String()
}

// levelsSentences say what the quantum levels of the Morse form mean.
func levelsSentences(r demoReport, rows map[string]*report.CompareRow) []string {
	l := r.Levels
	if l == nil || l.Fundamental == nil || l.BoundLevels == nil || l.D0 == nil {
		return nil
	}
	var s []string
	depth := float64(l.Depth)
	s = append(s, fmt.Sprintf("Quantum mechanically the Morse well holds %d bound vibrational levels. Its zero-point energy is %.0f cm⁻¹ (%.3g eV), "+
		"so breaking the bond takes D0 = %.4g eV, %.2g %% less than De; the fundamental E₁ − E₀ = %.1f cm⁻¹ is %.1f cm⁻¹ below the harmonic "+
		"ωe = %.1f cm⁻¹ (about 2ωexe), so even the lowest transition a spectrum shows is not the harmonic frequency.",
		*l.BoundLevels, l.ZPE, l.ZPEeV, *l.D0, 100*(depth-*l.D0)/depth, *l.Fundamental, l.Harmonic.OmegaE-*l.Fundamental, l.Harmonic.OmegaE))
	hv := l.HarmonicValidity
	ce := float64(hv.ClassicalEnergy)
	if hv.BelowZeroPoint {
		s = append(s, fmt.Sprintf("The classical harmonic range (period within %g %%) ends at %.0f cm⁻¹ above the minimum, below the zero-point energy: "+
			"the classical harmonic picture does not describe even the ground state.", 100*hv.Tolerance, ce))
	} else if !math.IsInf(ce, 1) {
		t := fmt.Sprintf("The classical harmonic range (period within %g %%) ends at %.0f cm⁻¹ above the minimum, only %.2g× the zero-point energy: "+
			"the ground state alone uses %.0f %% of it", 100*hv.Tolerance, ce, ce/l.ZPE, 100*l.ZPE/ce)
		if l.Levels[1].TermValue > ce {
			t += fmt.Sprintf(", and the first excited level (%.0f cm⁻¹) is already beyond it", l.Levels[1].TermValue)
		}
		s = append(s, t+".")
	}
	if lj := rows["lennard-jones"]; lj != nil && !math.IsNaN(lj.ZPE) {
		s = append(s, fmt.Sprintf("The stiffer Lennard-Jones form puts its zero-point energy at %.0f cm⁻¹ and its fundamental at %.0f cm⁻¹: "+
			"matched to re and De alone, it puts the spectrum %.2g× higher than Morse does.", lj.ZPE, lj.Fundamental, lj.Fundamental / *l.Fundamental))
	}
	return s
}

// writeDemoLevels prints the lowest and highest levels of the Morse form
// and what they add up to.
func writeDemoLevels(w tableWriter, r demoReport) error {
	l := r.Levels
	if l == nil {
		return nil
	}
	fmt.Fprintf(w, "\n== Quantum levels (%s, μ = %g u; pairwell levels %s --mu %g)\n", l.Model, l.Mu, l.Model+":"+paramSpec(l.Params), l.Mu)
	t := &table{cols: []column{{Title: "v"}, {Title: "term value", Unit: "cm⁻¹"}, {Title: "binding energy", Unit: "cm⁻¹"},
		{Title: "spacing to v+1", Unit: "cm⁻¹"}, {Title: "classical h/T(E)", Unit: "cm⁻¹"}, {Title: "⟨r⟩", Unit: "Å"}}}
	for i, lr := range l.Levels {
		if lr.J != 0 || i >= 4 && i < len(l.Levels)-2 {
			if i == 4 {
				t.add("…", "", "", "", "", "")
			}
			continue
		}
		t.add(fmt.Sprint(lr.V), short(lr.TermValue), optShort(lr.Binding), optShort(lr.Spacing), optShort(lr.ClassicalSpacing), short(lr.MeanR))
	}
	if err := w.table(t); err != nil {
		return err
	}
	_, err := fmt.Fprintf(w, "zero-point energy %s cm⁻¹, D0 = depth − ZPE = %s eV, fundamental %s cm⁻¹ (harmonic ωe %s cm⁻¹), %d bound levels; accuracy %.2g cm⁻¹\n",
		short(l.ZPE), short(*l.D0), short(*l.Fundamental), short(l.Harmonic.OmegaE), *l.BoundLevels, l.Accuracy)
	return err
}

// optShort is short for an optional value.
func optShort(v *float64) string {
	if v == nil {
		return "—"
	}
	return short(*v)
}

// paramSpec writes parameters as NAME=VALUE,… in their default units.
func paramSpec(p report.Params) string {
	parts := make([]string, len(p.Names))
	for i, n := range p.Names {
		parts[i] = n + "=" + strconv.FormatFloat(p.Values[i], 'g', 10, 64)
	}
	return strings.Join(parts, ",")
}
