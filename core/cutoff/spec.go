package cutoff

import (
	"fmt"
	"strings"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/suggest"
	"github.com/pairwell/pairwell/core/units"
)

// Option names of a cutoff in a spec, SPEC@cut=SCHEME,rc=LENGTH[,on=LENGTH].
const (
	optScheme = "cut" // the scheme name
	optCutoff = "rc"  // r_c
	optOn     = "on"  // r_on of a switch
)

// ParseOptions reads the assignments after '@' of a spec into Settings:
// cut=SCHEME (truncate, shift, force-shift, switch-c1, switch-c2; required),
// rc=LENGTH (required) and, for the switches only, on=LENGTH (default
// DefaultSwitchOnFraction·rc). Lengths are in Å or carry a unit suffix
// (8.5, 0.85nm, 16bohr). Names and scheme names are read ignoring case.
// Errors wrap core.ErrSpec, and core.ErrParam for settings that cannot
// work (r_on ≥ r_c, r_c ≤ 0).
func ParseOptions(opts []core.Assignment) (Settings, error) {
	var s Settings
	seen := map[string]bool{}
	for _, a := range opts {
		name := strings.ToLower(strings.TrimSpace(a.Name))
		if seen[name] {
			return Settings{}, fmt.Errorf("%w: cutoff option %s given twice", core.ErrSpec, name)
		}
		seen[name] = true
		switch name {
		case optScheme:
			sc, err := ParseScheme(a.Value)
			if err != nil {
				return Settings{}, fmt.Errorf("%w: %v%s", core.ErrSpec, err, suggest.Hint(a.Value, schemeNames[:]))
			}
			s.Scheme = sc
		case optCutoff, optOn:
			v, err := units.Parse(a.Value, units.Length)
			if err != nil {
				return Settings{}, fmt.Errorf("%w: cutoff option %s: %v", core.ErrSpec, name, err)
			}
			if v == 0 {
				return Settings{}, fmt.Errorf("%w: %w: cutoff option %s = 0: must be a length > 0", core.ErrParam, ErrSettings, name)
			}
			if name == optCutoff {
				s.Cutoff = v
			} else {
				s.SwitchOn = v
			}
		default:
			return Settings{}, fmt.Errorf("%w: unknown cutoff option %q%s; options: cut=SCHEME (%s), rc=LENGTH, on=LENGTH (switches)",
				core.ErrSpec, a.Name, suggest.Hint(a.Name, []string{optScheme, optCutoff, optOn}), strings.Join(schemeNames[:], ", "))
		}
	}
	switch {
	case !seen[optScheme]:
		return Settings{}, fmt.Errorf("%w: a cutoff needs cut=SCHEME (%s), e.g. @cut=force-shift,rc=8", core.ErrSpec, strings.Join(schemeNames[:], ", "))
	case !seen[optCutoff]:
		return Settings{}, fmt.Errorf("%w: a cutoff needs rc=LENGTH, e.g. @cut=%s,rc=8", core.ErrSpec, s.Scheme)
	}
	rs, err := s.resolved()
	if err != nil {
		return Settings{}, err
	}
	return rs, nil
}

// FromSpec is the core.CutoffFunc of pairwell: it wraps m in the cutoff
// read by ParseOptions. Install it with Registry.SetCutoff.
func FromSpec(m core.Model, opts []core.Assignment) (core.Model, error) {
	s, err := ParseOptions(opts)
	if err != nil {
		return nil, fmt.Errorf("cutoff of %s: %w", m.Info().Key, err)
	}
	return Wrap(m, s)
}
