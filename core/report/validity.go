package report

import (
	"encoding/json"
	"fmt"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/validity"
)

// Validity is how far from re the truncated Taylor expansion of the well
// of one form holds (see package validity), with the form and its well.
// It encodes as one JSON object: model, params, equilibrium_r_angstrom,
// well_depth_ev, pair and reduced_mass_u (null when not given), then the
// keys of ValidityRanges (truncation_order, tolerance, potential,
// period). Values are in eV, Å and K; an unbounded value is "Infinity",
// one that does not apply null (see Number).
type Validity struct {
	Model  string
	Params Params
	Re     float64 // Å
	Depth  Number  // eV; +Inf for an unbounded well
	Pair   string  // may be empty
	// Mu is the reduced mass in u, nil when none was given: neither
	// criterion depends on it.
	Mu     *float64
	Result validity.Result
}

// validityHead is the encoding of the fields of Validity before Result.
type validityHead struct {
	Model  string   `json:"model"`
	Params Params   `json:"params"`
	Re     float64  `json:"equilibrium_r_angstrom"`
	Depth  Number   `json:"well_depth_ev"`
	Pair   Text     `json:"pair"`
	Mu     *float64 `json:"reduced_mass_u"`
}

// MarshalJSON implements json.Marshaler.
func (r Validity) MarshalJSON() ([]byte, error) {
	a, err := json.Marshal(validityHead{Model: r.Model, Params: r.Params, Re: r.Re, Depth: r.Depth, Pair: Text(r.Pair), Mu: r.Mu})
	if err != nil {
		return nil, err
	}
	b, err := json.Marshal(ValidityRanges(r.Result))
	if err != nil {
		return nil, err
	}
	out := append(a[:len(a)-1], ',')
	return append(out, b[1:]...), nil
}

// NewValidity analyses the truncation of order n (2, 3 or 4) of the well
// of inst at the relative tolerance tol in (0, 1) (0 means
// validity.DefaultTolerance). m is only echoed: a zero m.Mu leaves the
// mass out. Errors are prefixed with the model key.
func NewValidity(inst core.Instance, n int, tol float64, m Mass) (Validity, error) {
	key := inst.Model.Info().Key
	w, err := wellOf(inst, n)
	if err != nil {
		return Validity{}, err
	}
	res, err := validity.Analyze(inst.Potential, w, n, validity.Settings{Tolerance: tol})
	if err != nil {
		return Validity{}, fmt.Errorf("%s: %w", key, err)
	}
	r := Validity{Model: key, Params: NewParams(inst), Re: w.Re, Depth: Number(w.Depth), Pair: m.Pair, Result: res}
	if m.Mu > 0 {
		mu := m.Mu
		r.Mu = &mu
	}
	return r, nil
}

// ValidityRanges is validity.Result as the commands print it: the keys
// truncation_order, tolerance, potential {compression_angstrom,
// stretch_angstrom} and period {energy_ev, depth_fraction, temperature_k,
// compression_angstrom, stretch_angstrom}. An unbounded range is
// "Infinity"; a value that does not apply (E/depth of an unbounded well)
// is null.
type ValidityRanges validity.Result

// MarshalJSON implements json.Marshaler.
func (r ValidityRanges) MarshalJSON() ([]byte, error) {
	type pot struct {
		Compression Number `json:"compression_angstrom"`
		Stretch     Number `json:"stretch_angstrom"`
	}
	type per struct {
		Energy        Number `json:"energy_ev"`
		DepthFraction Number `json:"depth_fraction"`
		Temperature   Number `json:"temperature_k"`
		Compression   Number `json:"compression_angstrom"`
		Stretch       Number `json:"stretch_angstrom"`
	}
	return json.Marshal(struct {
		Order     int     `json:"truncation_order"`
		Tolerance float64 `json:"tolerance"`
		Potential pot     `json:"potential"`
		Period    per     `json:"period"`
	}{
		r.Order, r.Tolerance,
		pot{Number(r.Potential.Compression), Number(r.Potential.Stretch)},
		per{Number(r.Period.Energy), Number(r.Period.DepthFraction), Number(r.Period.Temperature),
			Number(r.Period.Compression), Number(r.Period.Stretch)},
	})
}
