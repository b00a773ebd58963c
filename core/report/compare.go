package report

import (
	"encoding/json"
	"errors"
	"fmt"
	"math"
	"runtime"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/levels"
	"github.com/pairwell/pairwell/core/units"
	"github.com/pairwell/pairwell/core/validity"
)

// Defaults of CompareSettings.
const (
	// DefaultValidityOrder is the truncation order n of the Taylor
	// potential V_n whose validity is reported: 2, the harmonic picture.
	DefaultValidityOrder = 2
	// DefaultValidityTolerance is the relative tolerance of the validity
	// criteria, validity.DefaultTolerance (1 %).
	DefaultValidityTolerance = validity.DefaultTolerance
)

// CompareInput is one form to compare: a named instance with its reduced
// mass, or the reason it could not be built (a target the form cannot
// match), which becomes the row's error.
type CompareInput struct {
	Name     string
	Instance core.Instance // unused when Err is set
	Mass     Mass
	// Notes are remarks about how the instance was obtained, e.g. which
	// target quantities a matched form could not honour.
	Notes []string
	// Model is the model key, reported when Err is set (an Instance
	// supplies it otherwise).
	Model string
	// Err, when set, is why there is no instance.
	Err error
}

// CompareRow is the result of one form. When the form could be analysed it
// is its Inspect object with a validity object; otherwise Err says why and
// only the name, model, notes and error are reported. It encodes as one
// JSON object: the keys of Inspect, then "validity" (null when not asked
// for), "boyle_temperature_k", "zero_point_energy_per_cm",
// "fundamental_per_cm" (null without a mass), "notes" and "error" (null
// for a form that was analysed).
type CompareRow struct {
	Name  string
	Model string
	// Inspect is nil when the form could not be built or its well not
	// analysed.
	Inspect *Inspect
	// Validity is nil when it was not asked for (CompareSettings.Validity)
	// or could not be computed (Err then says why). It encodes as the
	// validity command's JSON object; the key is absent when nil.
	Validity *validity.Result
	// Boyle is the Boyle temperature in K of the classical B₂ of a
	// bounded form (BoyleTemperature); NaN (null) for an unbounded form,
	// or when there is none or it cannot be computed (a note says why).
	Boyle float64
	// ZPE and Fundamental are the zero-point energy and E(1) − E(0) in
	// cm⁻¹ of the quantum levels (package levels), computed only with a
	// reduced mass; NaN (null) when the well holds too few levels (a note
	// says why).
	ZPE, Fundamental float64
	Notes            []string
	Err              error
}

// compareJSON is the encoding of CompareRow. The outer name and model
// shadow those of the embedded Inspect, which a nil pointer leaves out.
type compareJSON struct {
	Name  string `json:"name"`
	Model string `json:"model"`
	*Inspect
	Validity *ValidityRanges `json:"validity"`
	Boyle    Number          `json:"boyle_temperature_k"`
	ZPE      Number          `json:"zero_point_energy_per_cm"`
	Fund     Number          `json:"fundamental_per_cm"`
	Notes    []string        `json:"notes"`
	Error    Text            `json:"error"`
}

// MarshalJSON implements json.Marshaler.
func (r CompareRow) MarshalJSON() ([]byte, error) {
	nan := Number(math.NaN())
	j := compareJSON{Name: r.Name, Model: r.Model, Inspect: r.Inspect, Validity: (*ValidityRanges)(r.Validity),
		Boyle: nan, ZPE: nan, Fund: nan, Notes: r.Notes}
	if j.Notes == nil {
		j.Notes = []string{}
	}
	if r.Inspect != nil {
		j.Boyle = Number(r.Boyle)
		if r.Inspect.Mu != nil {
			j.ZPE, j.Fund = Number(r.ZPE), Number(r.Fundamental)
		}
	}
	if r.Err != nil {
		j.Error = Text(r.Err.Error())
	}
	if r.Inspect == nil {
		// A form that failed: what it is, and why.
		return json.Marshal(struct {
			Name  string   `json:"name"`
			Model string   `json:"model"`
			Notes []string `json:"notes"`
			Error Text     `json:"error"`
		}{j.Name, j.Model, j.Notes, j.Error})
	}
	return json.Marshal(j)
}

// CompareSettings controls Compare. The zero value gives the defaults.
type CompareSettings struct {
	// TaylorOrder is the highest Taylor coefficient reported (0 means 4,
	// and at least 4 is used so that the validity analysis has c₃, c₄).
	TaylorOrder int
	// Order is the truncation order n of V_n, 2 to 4; 0 means
	// DefaultValidityOrder.
	Order int
	// Tolerance is the relative tolerance of the validity criteria in
	// (0, 1); 0 means DefaultValidityTolerance. The criteria do not
	// depend on the reduced mass; a zero Mass.Mu only leaves out the
	// harmonic vibration.
	Tolerance float64
	// Validity asks for the validity ranges of the truncated Taylor
	// potential (validity.Analyze, about 0.1 ms per form at order 2);
	// without it CompareRow.Validity is nil.
	Validity bool
	// Workers is the number of goroutines; 0 means runtime.GOMAXPROCS(0).
	Workers int
	// Progress, if not nil, is called after each row is done, from the
	// worker goroutines: it must be safe for concurrent use.
	Progress func()
}

func (s CompareSettings) resolved() (CompareSettings, error) {
	if s.TaylorOrder < 4 {
		s.TaylorOrder = 4
	}
	if s.Order == 0 {
		s.Order = DefaultValidityOrder
	}
	if s.Tolerance == 0 {
		s.Tolerance = DefaultValidityTolerance
	}
	if s.Workers <= 0 {
		s.Workers = runtime.GOMAXPROCS(0)
	}
	if s.Order < 2 || s.Order > 4 {
		return s, fmt.Errorf("compare: %w: validity order %d, must be 2, 3 or 4", core.ErrParam, s.Order)
	}
	if !(s.Tolerance > 0 && s.Tolerance < 1) {
		return s, fmt.Errorf("compare: %w: tolerance %g, must be in (0, 1)", core.ErrParam, s.Tolerance)
	}
	return s, nil
}

// Compare analyses every input — its well, Taylor coefficients, harmonic
// vibration and, when asked, the validity ranges of its truncated Taylor
// potential —
// and returns one row per input, in input order whatever the scheduling.
// The inputs are shared among s.Workers goroutines; potentials must be safe
// for concurrent use, as core.Potential requires. A form that fails gets
// its error in its row; the others are unaffected. The error is non-nil
// only for invalid settings.
func Compare(inputs []CompareInput, s CompareSettings) ([]CompareRow, error) {
	s, err := s.resolved()
	if err != nil {
		return nil, err
	}
	rows := make([]CompareRow, len(inputs))
	forEach(s.Workers, len(inputs), func(i int) {
		rows[i] = compareOne(inputs[i], s)
		if s.Progress != nil {
			s.Progress()
		}
	})
	return rows, nil
}

// compareOne analyses one input.
func compareOne(in CompareInput, s CompareSettings) CompareRow {
	row := CompareRow{Name: in.Name, Model: in.Model, Notes: in.Notes, Err: in.Err, Boyle: math.NaN(), ZPE: math.NaN(), Fundamental: math.NaN()}
	if in.Err != nil {
		return row
	}
	if in.Instance.Model == nil || in.Instance.Potential == nil {
		row.Err = errors.New("no potential")
		return row
	}
	row.Model = in.Instance.Model.Info().Key
	r, w, err := newInspect(in.Name, in.Instance, s.TaylorOrder, in.Mass)
	if err != nil {
		row.Err = err
		return row
	}
	row.Inspect = &r
	if s.Validity {
		v, err := validity.Analyze(in.Instance.Potential, w, s.Order, validity.Settings{Tolerance: s.Tolerance})
		if err != nil {
			row.Err = fmt.Errorf("%s: validity: %w", row.Model, err)
			return row
		}
		row.Validity = &v
	}
	if in.Mass.Mu > 0 {
		var note string
		row.ZPE, row.Fundamental, note = lowestLevels(in.Instance.Potential, w, in.Mass.Mu)
		if note != "" {
			row.Notes = append(row.Notes, note)
		}
	}
	if w.Bounded() {
		b, err := BoyleTemperature(in.Instance.Potential)
		switch {
		case err != nil:
			row.Notes = append(row.Notes, "no Boyle temperature: "+err.Error())
		case math.IsNaN(b.Boyle):
			row.Notes = append(row.Notes, fmt.Sprintf("no Boyle temperature: B₂ does not change sign between %.4g K and %.4g K", b.Low, b.High))
		}
		row.Boyle = b.Boyle
	}
	return row
}

// Failed reports whether every row has an error, and returns the first.
func Failed(rows []CompareRow) (bool, error) {
	var first error
	for _, r := range rows {
		if r.Err == nil {
			return false, nil
		}
		if first == nil {
			first = fmt.Errorf("%s: %w", r.Name, r.Err)
		}
	}
	return first != nil, first
}

// lowestLevels returns the zero-point energy and the fundamental in cm⁻¹ of
// the well w of p for the reduced mass mu (NaN when the well holds too few
// levels), and a note when they are missing.
func lowestLevels(p core.Potential, w core.Well, mu float64) (zpe, fund float64, note string) {
	zpe, fund = math.NaN(), math.NaN()
	res, err := levels.Solve(p, mu, levels.Settings{Count: 2, Well: &w})
	if errors.Is(err, core.ErrParam) {
		// one bound level at most
		res, err = levels.Solve(p, mu, levels.Settings{Count: 1, Well: &w})
	}
	if err != nil {
		return zpe, fund, "no quantum levels: " + err.Error()
	}
	zpe = (res.Levels[0].Energy - w.Energy) / units.WavenumberEV
	if len(res.Levels) > 1 {
		fund = (res.Levels[1].Energy - res.Levels[0].Energy) / units.WavenumberEV
	} else {
		note = "no fundamental: the well holds a single bound level"
	}
	return zpe, fund, note
}
