package core

import (
	"fmt"
	"math"

	"github.com/pairwell/pairwell/core/units"
)

// Constraint restricts the values a parameter may take.
type Constraint int

const (
	// Finite admits every finite value.
	Finite Constraint = iota
	// Positive admits finite values > 0.
	Positive
	// NonNegative admits finite values ≥ 0.
	NonNegative
)

// String returns the constraint as text, e.g. "> 0".
func (c Constraint) String() string {
	switch c {
	case Positive:
		return "> 0"
	case NonNegative:
		return "≥ 0"
	default:
		return "finite"
	}
}

// Check returns an error wrapping ErrParam unless v satisfies c.
func (c Constraint) Check(name string, v float64) error {
	ok := !math.IsNaN(v) && !math.IsInf(v, 0)
	switch c {
	case Positive:
		ok = ok && v > 0
	case NonNegative:
		ok = ok && v >= 0
	}
	if !ok {
		return fmt.Errorf("%w: %s = %g, must be %s", ErrParam, name, v, c)
	}
	return nil
}

// Param describes one parameter of a form.
type Param struct {
	// Name as written in a spec, e.g. "De".
	Name string
	// Dimension of the value; its default unit is the one the model
	// expects, see units.Dimension.DefaultUnit.
	Dimension units.Dimension
	// Unit is the unit of a bare number in a spec, a unit of Dimension
	// (e.g. "kcal/mol*A^6"); empty means Dimension.DefaultUnit(). Values
	// reach Model.New in the default unit whatever Unit says.
	Unit string
	// Constraint on the value in the default unit.
	Constraint Constraint
	// Meaning is a one-line description.
	Meaning string
}

// SpecUnit returns the unit of a bare number in a spec: Unit, or the
// dimension's default unit when Unit is empty.
func (p Param) SpecUnit() string {
	if p.Unit != "" {
		return p.Unit
	}
	return p.Dimension.DefaultUnit()
}

// String describes p as NAME [UNIT, CONSTRAINT], e.g. "De [eV, > 0]" or
// "n [dimensionless, > 0]".
func (p Param) String() string {
	u := p.SpecUnit()
	if u == "" || u == "1" {
		u = "dimensionless"
	}
	return fmt.Sprintf("%s [%s, %s]", p.Name, u, p.Constraint)
}

// ModelInfo is the metadata of a form.
type ModelInfo struct {
	// Key is the canonical name used in specs, e.g. "morse".
	Key string
	// Aliases are other names accepted in specs, e.g. "lj".
	Aliases []string
	// Name is the form's usual name, e.g. "Lennard-Jones 12-6".
	Name string
	// Formula is V(r) as text, with the parameter names.
	Formula string
	// Params lists the parameters in the order Model.New expects them.
	Params []Param
	// Domain describes, in words, where the form is usable.
	Domain string
	// Reference is the literature reference of the form.
	Reference string
	// Notes holds conventions a user must know (e.g. the ½ in ½k(r−r0)²).
	Notes string
	// MaxOrder is the highest analytic derivative order.
	MaxOrder int
	// Origin is "built-in" for forms compiled into pairwell, or the path
	// of the plugin executable that serves the form.
	Origin string
	// Version is the plugin's own version; empty for built-ins.
	Version string
}

// Model is a functional form: metadata plus a constructor of potentials.
// Implementations must be safe for concurrent use.
type Model interface {
	Info() ModelInfo
	// New builds the potential for a parameter set given in the default
	// units of Info().Params, in that order. Invalid sets (wrong count,
	// a constraint broken, a set with no usable well where the form
	// requires one) give an error wrapping ErrParam or ErrNoMinimum.
	New(params []float64) (Potential, error)
}

// CheckParams checks the count and the constraints of a parameter set
// against info. It is a helper for implementations of Model.New.
func CheckParams(info ModelInfo, params []float64) error {
	if len(params) != len(info.Params) {
		return fmt.Errorf("%s: %w: got %d values, want %d", info.Key, ErrParam, len(params), len(info.Params))
	}
	for i, p := range info.Params {
		if err := p.Constraint.Check(p.Name, params[i]); err != nil {
			return fmt.Errorf("%s: %w", info.Key, err)
		}
	}
	return nil
}

// Target is a well to match: the quantities a user wants several forms to
// share so that their shapes can be compared. A zero field is unspecified.
type Target struct {
	Re    float64 // equilibrium distance, Å
	Depth float64 // well depth V(∞) − V(re), eV
	K     float64 // force constant V″(re), eV/Å²
}

// Matcher is implemented by models that can derive a parameter set from a
// target well. It is the one optional interface of the contract: a wrapper
// of a model (a plugin adapter, a renamed or cut-off form) implements it
// always and delegates with Match, which reports ErrUnsupported for an
// inner model without it, so that one wrapper type forwards the
// capability whether the inner model has it or not.
type Matcher interface {
	// Match returns parameters, in the order and default units of
	// Info().Params, whose well has the target's specified quantities as
	// far as the form allows. Notes say which quantities the form could
	// not honour and why. A target the form cannot reach at all is an
	// error wrapping ErrParam; a wrapper whose inner model has no Match
	// returns one wrapping ErrUnsupported.
	Match(t Target) (params []float64, notes []string, err error)
}

// Match derives the parameters of m for the target t when m is a Matcher,
// and otherwise returns an error wrapping ErrUnsupported. Callers and
// wrappers use it instead of a type assertion.
func Match(m Model, t Target) (params []float64, notes []string, err error) {
	if mm, ok := m.(Matcher); ok {
		return mm.Match(t)
	}
	return nil, nil, fmt.Errorf("%s: matching a target well: %w", m.Info().Key, ErrUnsupported)
}
