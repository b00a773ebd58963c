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
// "morse:De=4.4,a=1.9,re=1.27" or "lj:epsilon=120K,sigma=3.4".
type Spec struct {
	Model  string
	Params []Assignment
}

// String formats s back to spec syntax.
func (s Spec) String() string {
	parts := make([]string, len(s.Params))
	for i, a := range s.Params {
		parts[i] = a.Name + "=" + a.Value
	}
	return s.Model + ":" + strings.Join(parts, ",")
}

// ParseSpec splits a spec into its model name and assignments. It checks
// only the syntax; Registry.Build checks names, values and units.
func ParseSpec(s string) (Spec, error) {
	s = strings.TrimSpace(s)
	key, rest, found := strings.Cut(s, ":")
	key = strings.TrimSpace(key)
	if key == "" {
		return Spec{}, fmt.Errorf("%w %q: expected KEY:NAME=VALUE,... e.g. morse:De=4.4,a=1.9,re=1.27", ErrSpec, s)
	}
	spec := Spec{Model: key}
	if !found || strings.TrimSpace(rest) == "" {
		return spec, nil
	}
	for _, part := range strings.Split(rest, ",") {
		name, value, ok := strings.Cut(part, "=")
		name, value = strings.TrimSpace(name), strings.TrimSpace(value)
		if !ok || name == "" || value == "" {
			return Spec{}, fmt.Errorf("%w %q: %q is not NAME=VALUE", ErrSpec, s, strings.TrimSpace(part))
		}
		if f := strings.Fields(value); len(f) > 1 && strings.Contains(value, "=") {
			return Spec{}, fmt.Errorf("%w %q: %q: separate the parameters with commas, e.g. %s", ErrSpec, s, strings.TrimSpace(part),
				name+"="+strings.Join(strings.Fields(strings.ReplaceAll(value, ",", " ")), ","))
		}
		spec.Params = append(spec.Params, Assignment{Name: name, Value: value})
	}
	return spec, nil
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
	m, err := r.Lookup(s.Model)
	if err != nil {
		return Instance{}, fmt.Errorf("%w: %w", ErrSpec, err)
	}
	return BuildSpec(m, s)
}

// BuildSpec is Build for a parsed spec whose model is already known.
func BuildSpec(m Model, s Spec) (Instance, error) {
	info := m.Info()
	values := make([]float64, len(info.Params))
	set := make([]bool, len(info.Params))
	for _, a := range s.Params {
		i := paramIndex(info, a.Name)
		if i < 0 {
			names := make([]string, len(info.Params))
			for i, p := range info.Params {
				names[i] = p.Name
			}
			return Instance{}, fmt.Errorf("%w: %s has no parameter %q%s; parameters: %s", ErrSpec, info.Key, a.Name, suggest.Hint(a.Name, names), paramList(info))
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
		return Instance{}, fmt.Errorf("%w: %s: missing %s; parameters: %s", ErrSpec, info.Key, strings.Join(missing, ", "), paramList(info))
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

func paramList(info ModelInfo) string {
	parts := make([]string, len(info.Params))
	for i, p := range info.Params {
		parts[i] = p.String()
	}
	return strings.Join(parts, ", ")
}
