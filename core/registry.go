package core

import (
	"errors"
	"fmt"
	"sort"
	"strings"

	"github.com/pairwell/pairwell/core/suggest"
)

// ErrUnknownModel means no model of the registry has the key or alias
// asked for. Registry.Build wraps it together with ErrSpec.
var ErrUnknownModel = errors.New("unknown model")

// Registry is a set of models addressable by key or alias. The zero value
// is an empty registry ready to use. A Registry is not safe for concurrent
// mutation; lookups may run concurrently once it is filled.
type Registry struct {
	models []Model
	byName map[string]Model
	cutoff CutoffFunc
	// soft holds the lower-case keys of the models added with
	// AddReplaceable (models need not be comparable, keys are unique).
	soft map[string]bool
}

// CutoffFunc wraps a model in the cutoff scheme described by the
// assignments after '@' of a spec (e.g. cut=force-shift, rc=8). Errors
// wrap ErrSpec (unknown option, bad value) or ErrParam. Package
// core/cutoff provides the one pairwell uses (cutoff.FromSpec).
type CutoffFunc func(m Model, opts []Assignment) (Model, error)

// SetCutoff installs the function that reads the cutoff of a spec
// (SPEC@...) for Build and BuildParsed; nil (the zero value) refuses every
// spec with a cutoff.
func (r *Registry) SetCutoff(f CutoffFunc) { r.cutoff = f }

// NewRegistry returns a registry holding the given models.
func NewRegistry(models ...Model) (*Registry, error) {
	r := &Registry{}
	for _, m := range models {
		if err := r.Add(m); err != nil {
			return nil, err
		}
	}
	return r, nil
}

// Add adds a model. Keys and aliases are case-insensitive and must be
// unique across the registry, except that a model added with
// AddReplaceable gives way: it is removed, with all its names, when m
// claims one of them (see AddReplacing).
func (r *Registry) Add(m Model) error {
	_, err := r.AddReplacing(m)
	return err
}

// AddReplaceable adds a model that gives way to a later Add of a model with
// one of its names (the forms library: a user's forms file or a plugin that
// serves the same key takes precedence). Among themselves replaceable
// models must have distinct names.
func (r *Registry) AddReplaceable(m Model) error {
	if _, err := r.add(m, false); err != nil {
		return err
	}
	if r.soft == nil {
		r.soft = make(map[string]bool)
	}
	r.soft[strings.ToLower(m.Info().Key)] = true
	return nil
}

// AddReplacing adds m like Add and returns the replaceable models it
// replaced, in the order they were added, so that the caller can say so.
func (r *Registry) AddReplacing(m Model) (replaced []Model, err error) {
	return r.add(m, true)
}

func (r *Registry) add(m Model, replace bool) ([]Model, error) {
	info := m.Info()
	names := append([]string{info.Key}, info.Aliases...)
	if r.byName == nil {
		r.byName = make(map[string]Model)
	}
	gone := map[string]bool{} // lower-case keys of the models m replaces
	for _, n := range names {
		k := strings.ToLower(n)
		if k == "" {
			return nil, fmt.Errorf("model %q: empty key or alias", info.Key)
		}
		prev, ok := r.byName[k]
		if !ok {
			continue
		}
		if pk := strings.ToLower(prev.Info().Key); replace && r.soft[pk] {
			gone[pk] = true
			continue
		}
		return nil, fmt.Errorf("model %q (%s): name %q already used by %q (%s)", info.Key, info.Origin, n, prev.Info().Key, prev.Info().Origin)
	}
	var replaced []Model
	if len(gone) > 0 {
		kept := r.models[:0:0]
		for _, old := range r.models {
			info := old.Info()
			k := strings.ToLower(info.Key)
			if !gone[k] {
				kept = append(kept, old)
				continue
			}
			replaced = append(replaced, old)
			delete(r.soft, k)
			for _, n := range append([]string{info.Key}, info.Aliases...) {
				delete(r.byName, strings.ToLower(n))
			}
		}
		r.models = kept
	}
	for _, n := range names {
		r.byName[strings.ToLower(n)] = m
	}
	r.models = append(r.models, m)
	return replaced, nil
}

// Lookup returns the model with the given key or alias. Its error wraps
// ErrUnknownModel and names the near misses ("did you mean …?"). A name
// with a cutoff, KEY@cut=…, is the model cut by it (see SetCutoff).
func (r *Registry) Lookup(name string) (Model, error) {
	if key, _, ok := strings.Cut(name, "@"); ok {
		s, err := ParseSpec(name)
		if err != nil {
			return nil, err
		}
		m, err := r.Lookup(key)
		if err != nil || r.cutoff == nil {
			if err == nil {
				err = fmt.Errorf("%w: %s: this registry knows no cutoff schemes (Registry.SetCutoff)", ErrSpec, key)
			}
			return nil, err
		}
		if len(s.Params) > 0 {
			return nil, fmt.Errorf("%w %q: a model name takes no parameters", ErrSpec, name)
		}
		return r.cutoff(m, s.Cutoff)
	}
	if m, ok := r.byName[strings.ToLower(strings.TrimSpace(name))]; ok {
		return m, nil
	}
	names := make([]string, 0, len(r.byName))
	for n := range r.byName {
		names = append(names, n)
	}
	sort.Strings(names)
	return nil, fmt.Errorf("%w %q%s; known: %s", ErrUnknownModel, name, suggest.Hint(name, names), strings.Join(r.Keys(), ", "))
}

// Models returns the models in the order they were added.
func (r *Registry) Models() []Model {
	return append([]Model(nil), r.models...)
}

// Keys returns the sorted canonical keys.
func (r *Registry) Keys() []string {
	keys := make([]string, len(r.models))
	for i, m := range r.models {
		keys[i] = m.Info().Key
	}
	sort.Strings(keys)
	return keys
}
