package core

import (
	"errors"
	"fmt"
	"strings"

	"github.com/pairwell/pairwell/core/suggest"
	"github.com/pairwell/pairwell/core/units"
)

// ErrSpec means a model spec could not be parsed or does not fit its model.
var ErrSpec = errors.New("invalid spec")

// Assignment is one NAME=VALUE of a spec, VALUE still as text with its
// optional unit.
type Assignment struct {
	Name, Value string
}

// Spec is a parsed model spec, KEY:NAME=VALUE[UNIT],... such as
// "morse:De=4.4,a=1.9,re=1.27" or "lj:epsilon=120K,sigma=3.4", optionally
// followed by a cutoff, @NAME=VALUE,... such as
// "lj:epsilon=120K,sigma=3.4@cut=force-shift,rc=8.5" (the options are read
// by the registry's CutoffFunc, see Registry.SetCutoff).
type Spec struct {
	Model  string
	Params []Assignment
	// Cutoff holds the assignments after '@', in order; empty for a bare
	// form.
	Cutoff []Assignment
}

// String formats s back to spec syntax.
func (s Spec) String() string {
	out := s.Model + ":" + joinAssignments(s.Params)
	if len(s.Cutoff) > 0 {
		out += "@" + joinAssignments(s.Cutoff)
	}
	return out
}

func joinAssignments(as []Assignment) string {
	parts := make([]string, len(as))
	for i, a := range as {
		parts[i] = a.Name + "=" + a.Value
	}
	return strings.Join(parts, ",")
}

// ParseSpec splits a spec into its model name and assignments. It checks
// only the syntax; Registry.Build checks names, values and units.
func ParseSpec(s string) (Spec, error) {
	s = strings.TrimSpace(s)
	form, cut, hasCut := strings.Cut(s, "@")
	if hasCut {
		spec, err := ParseSpec(form)
		if err != nil {
			return Spec{}, err
		}
		if strings.Contains(cut, "@") {
			return Spec{}, fmt.Errorf("%w %q: more than one '@': a form takes one cutoff, e.g. @cut=force-shift,rc=8", ErrSpec, s)
		}
		if spec.Cutoff, err = parseAssignments(s, cut); err != nil {
			return Spec{}, err
		}
		if len(spec.Cutoff) == 0 {
			return Spec{}, fmt.Errorf("%w %q: nothing after '@': expected a cutoff such as @cut=force-shift,rc=8", ErrSpec, s)
		}
		return spec, nil
	}
	key, rest, found := strings.Cut(s, ":")
	key = strings.TrimSpace(key)
	if key == "" {
		return Spec{}, fmt.Errorf("%w %q: expected KEY:NAME=VALUE,... e.g. morse:De=4.4,a=1.9,re=1.27", ErrSpec, s)
	}
	spec := Spec{Model: key}
	if !found {
		return spec, nil
	}
	var err error
	spec.Params, err = parseAssignments(s, rest)
	return spec, err
}

// parseAssignments reads NAME=VALUE,... of the spec s; an empty list is
// nil.
func parseAssignments(s, rest string) ([]Assignment, error) {
	if strings.TrimSpace(rest) == "" {
		return nil, nil
	}
	var out []Assignment
	for _, part := range strings.Split(rest, ",") {
		name, value, ok := strings.Cut(part, "=")
		name, value = strings.TrimSpace(name), strings.TrimSpace(value)
		if !ok || name == "" || value == "" {
			return nil, fmt.Errorf("%w %q: %q is not NAME=VALUE", ErrSpec, s, strings.TrimSpace(part))
		}
		if f := strings.Fields(value); len(f) > 1 && strings.Contains(value, "=") {
			return nil, fmt.Errorf("%w %q: %q: separate the parameters with commas, e.g. %s", ErrSpec, s, strings.TrimSpace(part),
				name+"="+strings.Join(strings.Fields(strings.ReplaceAll(value, ",", " ")), ","))
		}
		out = append(out, Assignment{Name: name, Value: value})
	}
	return out, nil
}

// Instance is a model with a validated parameter set and its potential.
type Instance struct {
	Model     Model
	Params    []float64 // in the default units of Model.Info().Params
	Potential Potential
}

// Build parses spec, looks its model up, converts each value to the
// parameter's default unit and builds the potential. Parameter names match
// exactly, or case-insensitively when that is unambiguous. Every error names
// what is wrong and what is allowed and wraps ErrSpec, ErrParam or
// ErrNoMinimum.
func (r *Registry) Build(spec string) (Instance, error) {
	s, err := ParseSpec(spec)
	if err != nil {
		return Instance{}, err
	}
	return r.BuildParsed(s)
}

// BuildParsed is Build for a parsed spec: it looks the model up, wraps it
// in the cutoff of s.Cutoff (if any) with the registry's CutoffFunc, and
// builds the potential. The instance's Model is then the wrapped model.
func (r *Registry) BuildParsed(s Spec) (Instance, error) {
	name := s.Model
	if len(s.Cutoff) > 0 {
		name += "@" + joinAssignments(s.Cutoff)
		s.Cutoff = nil
	}
	m, err := r.Lookup(name)
	if err != nil {
		if errors.Is(err, ErrUnknownModel) {
			err = fmt.Errorf("%w: %w", ErrSpec, err)
		}
		return Instance{}, err
	}
	return BuildSpec(m, s)
}

// BuildSpec is Build for a parsed spec whose model is already known. A
// spec with a cutoff is refused (ErrSpec): wrapping needs the registry's
// CutoffFunc, see Registry.BuildParsed.
func BuildSpec(m Model, s Spec) (Instance, error) {
	info := m.Info()
	if len(s.Cutoff) > 0 {
		return Instance{}, fmt.Errorf("%w: %s: a cutoff (@%s) needs Registry.BuildParsed", ErrSpec, info.Key, joinAssignments(s.Cutoff))
	}
	values := make([]float64, len(info.Params))
	set := make([]bool, len(info.Params))
	for _, a := range s.Params {
		i := paramIndex(info, a.Name)
		if i < 0 {
			names := make([]string, len(info.Params))
			for i, p := range info.Params {
				names[i] = p.Name
			}
			return Instance{}, fmt.Errorf("%w: %s has no parameter %q%s; parameters: %s", ErrSpec, info.Key, a.Name, suggest.Hint(a.Name, names), ParamList(info.Params))
		}
		p := info.Params[i]
		if set[i] {
			return Instance{}, fmt.Errorf("%w: %s: parameter %s given twice", ErrSpec, info.Key, p.Name)
		}
		v, err := units.ParseIn(a.Value, p.Dimension, p.Unit)
		if err != nil {
			return Instance{}, fmt.Errorf("%w: %s: %s: %v", ErrSpec, info.Key, p.Name, err)
		}
		if err := p.Constraint.Check(p.Name, v); err != nil {
			return Instance{}, fmt.Errorf("%s: %w", info.Key, err)
		}
		values[i], set[i] = v, true
	}
	var missing []string
	for i, ok := range set {
		if !ok {
			missing = append(missing, info.Params[i].Name)
		}
	}
	if len(missing) > 0 {
		return Instance{}, fmt.Errorf("%w: %s: missing %s; parameters: %s", ErrSpec, info.Key, strings.Join(missing, ", "), ParamList(info.Params))
	}
	pot, err := m.New(values)
	if err != nil {
		return Instance{}, err
	}
	return Instance{Model: m, Params: values, Potential: pot}, nil
}

func paramIndex(info ModelInfo, name string) int {
	for i, p := range info.Params {
		if p.Name == name {
			return i
		}
	}
	found := -1
	for i, p := range info.Params {
		if strings.EqualFold(p.Name, name) {
			if found >= 0 {
				return -1
			}
			found = i
		}
	}
	return found
}

// ParamList describes parameters for messages: "NAME [UNIT, CONSTRAINT],
// ..." (Param.String of each, in order).
func ParamList(ps []Param) string {
	parts := make([]string, len(ps))
	for i, p := range ps {
		parts[i] = p.String()
	}
	return strings.Join(parts, ", ")
}
