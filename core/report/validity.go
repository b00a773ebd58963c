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
// well_depth_ev, pair and reduced_mass_u, then the keys of
// validity.Result (order, tolerance, potential, period). Values are in
// eV, Å and K; unbounded values are null.
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
	Pair   string   `json:"pair,omitempty"`
	Mu     *float64 `json:"reduced_mass_u,omitempty"`
}

// MarshalJSON implements json.Marshaler.
func (r Validity) MarshalJSON() ([]byte, error) {
	a, err := json.Marshal(validityHead{Model: r.Model, Params: r.Params, Re: r.Re, Depth: r.Depth, Pair: r.Pair, Mu: r.Mu})
	if err != nil {
		return nil, err
	}
	b, err := json.Marshal(r.Result)
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
