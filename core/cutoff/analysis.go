package cutoff

import (
	"encoding/json"
	"fmt"
	"math"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/units"
)

// Caution is the caution printed with every cutoff analysis.
const Caution = "Caution: these are properties of a classical model potential under a cutoff, not of a validated force field; do not base production or safety decisions on them."

// AnalysisSettings describe what Analyze compares. The zero value is not
// usable: Cutoff is required.
type AnalysisSettings struct {
	// Cutoff is r_c in Å (required).
	Cutoff float64
	// SwitchOn is r_on in Å for the switches; zero means
	// DefaultSwitchOnFraction·r_c.
	SwitchOn float64
	// From is the lower end in Å of the range [From, r_c) over which the
	// largest energy and force errors are sought; zero means 0.8·re of the
	// bare form (up its repulsive wall).
	From float64
	// Mu is the reduced mass in u for the harmonic wavenumbers; zero
	// leaves them out.
	Mu float64
	// Density is the number density ρ in atoms/Å³ for the tail
	// corrections; zero leaves them out.
	Density float64
}

// Well is the minimum of a form: bare or cut.
type Well struct {
	Re         float64  `json:"equilibrium_r_angstrom"`
	Depth      Depth    `json:"well_depth_ev"` // V(∞) − V(re); "Infinity" when unbounded
	K          float64  `json:"force_constant_ev_per_angstrom2"`
	Wavenumber *float64 `json:"harmonic_wavenumber_per_cm"` // null without a mass
}

// Depth is a well depth in eV that encodes +Inf (an unbounded well) as the
// JSON string "Infinity", as every command of pairwell does.
type Depth float64

// MarshalJSON implements json.Marshaler.
func (d Depth) MarshalJSON() ([]byte, error) {
	if math.IsInf(float64(d), 1) {
		return []byte(`"Infinity"`), nil
	}
	return json.Marshal(float64(d))
}

// SchemeReport is what one scheme changes. Jumps are the value just
// beyond r_c minus the value just below (F = −V′); shifts are cut minus
// bare; errors are the largest |V_cut − V| and |F_cut − F| over
// [From, r_c), where they occur (null where the error is zero
// everywhere).
type SchemeReport struct {
	Scheme          string   `json:"scheme"`
	Suffix          string   `json:"spec_suffix"` // after '@' in a spec
	Formula         string   `json:"formula"`
	EnergyJump      float64  `json:"energy_jump_ev"`
	ForceJump       float64  `json:"force_jump_ev_per_angstrom"`
	CurvatureJump   *float64 `json:"curvature_jump_ev_per_angstrom2"` // V″; null for a form without V″
	Well            Well     `json:"well"`
	ReShift         float64  `json:"re_shift_angstrom"`
	DepthShift      *float64 `json:"depth_shift_ev"` // null when the bare depth is unbounded
	KShift          float64  `json:"k_shift_ev_per_angstrom2"`
	WavenumberShift *float64 `json:"wavenumber_shift_per_cm"`
	MaxEnergyError  float64  `json:"max_energy_error_ev"`
	MaxEnergyErrorR *float64 `json:"max_energy_error_r_angstrom"`
	MaxForceError   float64  `json:"max_force_error_ev_per_angstrom"`
	MaxForceErrorR  *float64 `json:"max_force_error_r_angstrom"`
}

// ErrorScan says how the largest errors were found.
type ErrorScan struct {
	From       float64 `json:"from_angstrom"`
	To         float64 `json:"to_angstrom"`
	Resolution float64 `json:"resolution_angstrom"` // the position of a maximum is known to this
	Method     string  `json:"method"`
}

// Report compares every scheme at one cutoff.
type Report struct {
	Model      string         `json:"model"` // bare model key
	Cutoff     float64        `json:"cutoff_angstrom"`
	SwitchOn   float64        `json:"switch_on_angstrom"`
	VCut       float64        `json:"v_at_cutoff_ev"`               // bare V(r_c)
	DVCut      float64        `json:"dv_at_cutoff_ev_per_angstrom"` // bare V′(r_c)
	Mu         *float64       `json:"reduced_mass_u"`               // null: none
	Bare       Well           `json:"bare"`                         // the uncut form
	Schemes    []SchemeReport `json:"schemes"`                      // in the order of Schemes()
	Scan       ErrorScan      `json:"error_scan"`                   // how the errors were found
	Tail       *Tail          `json:"tail_correction"`              // null without a density
	TailSource *string        `json:"tail_correction_source"`       // literature of the formulas
	Notes      []string       `json:"notes"`                        // what a reader must know
	Caution    string         `json:"caution"`
}

// The error search: a scan of scanPoints points on [From, r_c), then
// refineRounds rounds of refinePoints points on the bracket around the
// largest value, which shrinks by 2/(refinePoints−1) each round.
const (
	scanPoints   = 2048
	refineRounds = 4
	refinePoints = 64
)

// tailSource is the literature of the tail-correction formulas.
const tailSource = "M. P. Allen & D. J. Tildesley, Computer Simulation of Liquids, 2nd ed. (Oxford 2017), §2.8"

// Analyze compares every scheme cut at s.Cutoff with the bare form of
// inst. Errors wrap core.ErrParam and ErrSettings for settings no cutoff
// accepts, core.ErrNoMinimum for a bare form or a cut without a minimum,
// and what the evaluation of the form reports.
func Analyze(inst core.Instance, s AnalysisSettings) (Report, error) {
	bare := inst.Potential
	if !(s.Mu >= 0) || math.IsInf(s.Mu, 0) || !(s.Density >= 0) || math.IsInf(s.Density, 0) || !(s.From >= 0) || math.IsInf(s.From, 0) {
		return Report{}, fmt.Errorf("%w: reduced mass %g u, density %g /Å³ and scan start %g Å must be finite and ≥ 0", core.ErrParam, s.Mu, s.Density, s.From)
	}
	bw, err := core.AnalyzeWell(bare, core.WellSettings{Order: 2})
	if err != nil {
		return Report{}, fmt.Errorf("the bare form: %w", err)
	}
	if s.Cutoff <= bw.Re {
		// Before the scan range is set up, so that the message is New's.
		if _, err := New(bare, Settings{Cutoff: s.Cutoff}); err != nil {
			return Report{}, err
		}
	}
	from := s.From
	if from == 0 {
		from = 0.8 * bw.Re
		if d := bare.Domain(); from <= d.Min {
			from = 0.5 * (d.Min + bw.Re)
		}
	}
	if from >= s.Cutoff {
		return Report{}, fmt.Errorf("%w: %w: the error scan would start at %g Å, not below r_c = %g Å", core.ErrParam, ErrSettings, from, s.Cutoff)
	}
	rep := Report{Model: inst.Model.Info().Key, Cutoff: s.Cutoff, Bare: well(bw, s.Mu), Caution: Caution}
	if s.Mu > 0 {
		mu := s.Mu
		rep.Mu = &mu
	}
	L := s.Cutoff - from
	rep.Scan = ErrorScan{
		From: from, To: s.Cutoff,
		Resolution: L / scanPoints * 2 * math.Pow(2.0/(refinePoints-1), refineRounds),
		Method: fmt.Sprintf("scan of %d points on [from, r_c) and the limit r → r_c from below, then %d rounds of %d points on the bracket around the largest; a peak narrower than the scan spacing (%.3g Å) could be missed",
			scanPoints, refineRounds, refinePoints, L/scanPoints),
	}
	scan := make([]float64, scanPoints)
	for i := range scan {
		scan[i] = from + L*float64(i)/scanPoints
	}
	bareScan := make([]float64, 2*scanPoints)
	if err := bare.Taylor(1, scan, bareScan); err != nil {
		return Report{}, fmt.Errorf("the bare form: %w", err)
	}
	for _, sc := range Schemes() {
		set := Settings{Scheme: sc, Cutoff: s.Cutoff}
		if sc.Switching() {
			set.SwitchOn = s.SwitchOn
		}
		c, err := New(bare, set)
		if err != nil {
			return Report{}, fmt.Errorf("%s: %w", sc, err)
		}
		rep.VCut, rep.DVCut = c.AtCutoff()
		if sc.Switching() {
			rep.SwitchOn = c.Settings().SwitchOn
		}
		row, err := schemeReport(c, bw, s.Mu, scan, bareScan)
		if err != nil {
			return Report{}, fmt.Errorf("%s: %w", sc, err)
		}
		rep.Schemes = append(rep.Schemes, row)
	}
	rep.Notes = append(rep.Notes, "Errors are |V_cut − V| and |F_cut − F| against the uncut form over the scanned range; jumps are (just beyond r_c) − (just below).")
	if s.Density > 0 {
		var t Tail
		if lj, ok := ljParams(inst); ok {
			t = LennardJonesTail(lj[0], lj[1], s.Cutoff, s.Density)
		} else if t, err = TailCorrections(bare, s.Cutoff, s.Density); err != nil {
			return Report{}, err
		}
		src := tailSource
		rep.Tail, rep.TailSource = &t, &src
		rep.Notes = append(rep.Notes, "The tail corrections are those of the interactions beyond r_c (g(r) = 1 there), the same for every scheme; they do not include what a shift or switch changes inside r_c, nor the impulsive pressure term of a truncated form.")
	}
	return rep, nil
}

// ljParams returns (ε, σ) when inst is the built-in Lennard-Jones form.
func ljParams(inst core.Instance) ([]float64, bool) {
	info := inst.Model.Info()
	if info.Key != "lennard-jones" || info.Origin != "built-in" || len(inst.Params) != 2 {
		return nil, false
	}
	return inst.Params, true
}

// well turns a core.Well into a Well, with the wavenumber for a mass mu.
func well(w core.Well, mu float64) Well {
	out := Well{Re: w.Re, K: w.K, Depth: Depth(w.Depth)}
	if mu > 0 {
		nu := units.Wavenumber(units.AngularFrequency(w.K, mu))
		out.Wavenumber = &nu
	}
	return out
}

// schemeReport measures one scheme against the bare form.
func schemeReport(c *Potential, bw core.Well, mu float64, scan, bareScan []float64) (SchemeReport, error) {
	sc := c.Settings().Scheme
	row := SchemeReport{Scheme: sc.String(), Suffix: c.Settings().Suffix(), Formula: sc.Formula()}
	rc := c.Settings().Cutoff
	n := min(2, c.MaxOrder())
	left := make([]float64, n+1)
	if err := c.Piece(n, rc, left); err != nil {
		return row, err
	}
	row.EnergyJump = 0 - left[0]
	if n >= 1 {
		row.ForceJump = left[1] // F(r_c⁺) − F(r_c⁻) = 0 − (−V′(r_c⁻))
	}
	if n >= 2 {
		j := -2*left[2] + 0 // + 0: no −0
		row.CurvatureJump = &j
	}
	cw, err := core.AnalyzeWell(c, core.WellSettings{Order: 2})
	if err != nil {
		return row, err
	}
	row.Well = well(cw, mu)
	row.ReShift = cw.Re - bw.Re
	row.KShift = cw.K - bw.K
	if bw.Bounded() {
		d := cw.Depth - bw.Depth
		row.DepthShift = &d
	}
	if mu > 0 {
		d := *row.Well.Wavenumber - units.Wavenumber(units.AngularFrequency(bw.K, mu))
		row.WavenumberShift = &d
	}
	var leftErr [2]float64
	leftErr[0] = math.Abs(left[0] - c.vc)
	if n >= 1 {
		leftErr[1] = math.Abs(left[1] - c.dvc)
	}
	maxima, err := maxErrors(c, scan, bareScan, leftErr)
	if err != nil {
		return row, err
	}
	row.MaxEnergyError, row.MaxEnergyErrorR = maxima[0].v, maxima[0].at()
	row.MaxForceError, row.MaxForceErrorR = maxima[1].v, maxima[1].at()
	return row, nil
}

// maximum is the largest error found and where.
type maximum struct{ v, r float64 }

// at returns the position, nil when the error is zero everywhere.
func (m maximum) at() *float64 {
	if m.v == 0 {
		return nil
	}
	r := m.r
	return &r
}

// errorsAt stores |V_cut − V| and |F_cut − F| at rs (all below r_c) in
// e[0] and e[1], from one Taylor call of order 1 of the bare form (given in
// b when non-nil): the cut rows are the bare ones turned by apply, as
// Potential.Taylor does, so the bare form is not evaluated a second time.
func errorsAt(c *Potential, rs, b []float64, e *[2][]float64) error {
	if b == nil {
		b = make([]float64, 2*len(rs))
		if err := c.inner.Taylor(1, rs, b); err != nil {
			return err
		}
	}
	cc := append([]float64(nil), b...)
	c.apply(1, rs, cc)
	for q := range e {
		e[q] = e[q][:0]
	}
	for i := range rs {
		e[0] = append(e[0], math.Abs(cc[2*i]-b[2*i]))
		e[1] = append(e[1], math.Abs(cc[2*i+1]-b[2*i+1]))
	}
	return nil
}

// maxErrors finds the largest energy and force errors of c over the scan
// range (see AnalysisSettings.From), including their limits at r_c from
// below, leftErr.
func maxErrors(c *Potential, scan, bareScan []float64, leftErr [2]float64) ([2]maximum, error) {
	var out [2]maximum
	var e [2][]float64
	if err := errorsAt(c, scan, bareScan, &e); err != nil {
		return out, err
	}
	var lo, hi [2]float64
	for q := range out {
		best := 0
		for i, v := range e[q] {
			if v > e[q][best] {
				best = i
			}
		}
		out[q] = maximum{e[q][best], scan[best]}
		lo[q] = scan[max(best-1, 0)]
		hi[q] = scan[min(best+1, len(scan)-1)]
		if best == len(scan)-1 {
			hi[q] = math.Nextafter(c.s.Cutoff, 0)
		}
	}
	rs := make([]float64, 0, 2*refinePoints)
	for range refineRounds {
		rs = rs[:0]
		for q := range out {
			for i := range refinePoints {
				rs = append(rs, lo[q]+(hi[q]-lo[q])*float64(i)/(refinePoints-1))
			}
		}
		if err := errorsAt(c, rs, nil, &e); err != nil {
			return out, err
		}
		for q := range out {
			part := rs[q*refinePoints : (q+1)*refinePoints]
			vals := e[q][q*refinePoints : (q+1)*refinePoints]
			best := 0
			for i, v := range vals {
				if v > vals[best] {
					best = i
				}
			}
			if vals[best] > out[q].v {
				out[q] = maximum{vals[best], part[best]}
			}
			lo[q], hi[q] = part[max(best-1, 0)], part[min(best+1, refinePoints-1)]
		}
	}
	for q := range out {
		if leftErr[q] > out[q].v {
			out[q] = maximum{leftErr[q], c.s.Cutoff}
		}
	}
	return out, nil
}
