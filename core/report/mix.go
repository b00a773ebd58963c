package report

import (
	"errors"
	"fmt"
	"strconv"
	"strings"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/mixing"
)

// MixCaution is the caution printed with cross pairs from combining rules.
const MixCaution = "Caution: a combining rule is an empirical estimate of the cross pair, not a fitted or validated interaction; do not base production or safety decisions on it."

// MixRule is one cross pair derived by one combining rule.
type MixRule struct {
	Rule       string   `json:"rule"`
	Title      string   `json:"title"`
	Formula    string   `json:"formula"`
	Reference  string   `json:"reference"`
	Spec       string   `json:"spec"`
	Params     Params   `json:"params"`
	Re         float64  `json:"equilibrium_r_angstrom"`
	Depth      Number   `json:"well_depth_ev"`
	K          float64  `json:"force_constant_ev_per_angstrom2"`
	Mu         *float64 `json:"reduced_mass_u"`
	Wavenumber *float64 `json:"harmonic_wavenumber_per_cm"`
}

// Mix is the cross pair of two like pairs of one form, by one rule or by
// every rule of the form.
type Mix struct {
	Model   string    `json:"model"`
	SpecA   string    `json:"spec_a"`
	SpecB   string    `json:"spec_b"`
	ParamsA Params    `json:"params_a"`
	ParamsB Params    `json:"params_b"`
	Pair    Text      `json:"pair"`
	Rules   []MixRule `json:"rules"`
	Caution string    `json:"caution"`
}

// ErrMixForms means the two like pairs are of different forms.
var ErrMixForms = errors.New("cannot mix different forms")

// NewMix mixes like pairs a and b (given as specA and specB) by the rule
// named rule, or by every rule of their form when rule is empty. A zero
// m.Mu leaves out the harmonic wavenumber. Different forms give an error
// wrapping ErrMixForms; a rule that does not apply, mixing.ErrRule.
func NewMix(specA, specB string, a, b core.Instance, rule string, m Mass) (Mix, error) {
	ka, kb := a.Model.Info().Key, b.Model.Info().Key
	if ka != kb {
		return Mix{}, fmt.Errorf("%w: %s and %s; both like pairs must be of the same form", ErrMixForms, ka, kb)
	}
	ps := a.Model.Info().Params
	rules := mixing.ForModel(ka, ps)
	if rule != "" {
		r, err := mixing.LookupFor(rule, ka, ps)
		if err != nil {
			return Mix{}, err
		}
		rules = []mixing.Rule{r}
	} else if len(rules) == 0 {
		return Mix{}, fmt.Errorf("%w: no combining rules for %s; %s", mixing.ErrRule, ka, mixing.Exist())
	}
	out := Mix{Model: ka, SpecA: specA, SpecB: specB, ParamsA: NewParams(a), ParamsB: NewParams(b), Pair: Text(m.Pair), Caution: MixCaution}
	for _, r := range rules {
		row, err := mixRow(r, a, b, m)
		if err != nil {
			return Mix{}, err
		}
		out.Rules = append(out.Rules, row)
	}
	return out, nil
}

func mixRow(r mixing.Rule, a, b core.Instance, m Mass) (MixRule, error) {
	vals, err := r.MixModel(a.Model.Info().Key, a.Model.Info().Params, a.Params, b.Params)
	if err != nil {
		return MixRule{}, err
	}
	pot, err := a.Model.New(vals)
	if err != nil {
		return MixRule{}, fmt.Errorf("%s: cross pair: %w", r.Name, err)
	}
	inst := core.Instance{Model: a.Model, Params: vals, Potential: pot}
	w, err := wellOf(inst, 2)
	if err != nil {
		return MixRule{}, fmt.Errorf("%s: cross pair: %w", r.Name, err)
	}
	row := MixRule{Rule: r.Name, Title: r.Title, Formula: r.Formula, Reference: r.Reference,
		Spec: CrossSpec(inst), Params: NewParams(inst), Re: w.Re, Depth: Number(w.Depth), K: w.K}
	if m.Mu != 0 {
		h, err := core.NewHarmonic(w.K, m.Mu)
		if err != nil {
			return MixRule{}, fmt.Errorf("%s: cross pair: %w", r.Name, err)
		}
		row.Mu, row.Wavenumber = &h.Mu, &h.Wavenumber
	}
	return row, nil
}

// CrossSpec formats inst as a spec that builds it again: each value with
// the shortest digits that round-trip, followed by its default unit when
// a bare number would be read in another unit.
func CrossSpec(inst core.Instance) string {
	info := inst.Model.Info()
	parts := make([]string, len(info.Params))
	for i, p := range info.Params {
		v := strconv.FormatFloat(inst.Params[i], 'g', -1, 64)
		if p.Unit != "" && p.Unit != p.Dimension.DefaultUnit() {
			v += p.Dimension.DefaultUnit()
		}
		parts[i] = p.Name + "=" + v
	}
	return info.Key + ":" + strings.Join(parts, ",")
}
