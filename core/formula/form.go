package formula

import (
	"errors"
	"fmt"
	"math"
	"strings"
	"sync"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/units"
)

// ErrDecl is wrapped by errors about a form declaration other than its
// formula text: keys, units, constraints.
var ErrDecl = errors.New("invalid form declaration")

// Decl declares a form typed as a formula, as a forms file does.
type Decl struct {
	Key       string // used in specs; letters, digits, - and _
	Name      string // usual name; Key when empty
	Formula   string // V(r) in eV
	Reference string
	Notes     string
	Params    []ParamDecl
	// RMin is the lower end of the domain, excluded: a formula of the
	// parameters giving a length (a bare number is in Å). Empty means 0.
	RMin string
	// Limit is lim V(r) as r → ∞: a formula of the parameters giving an
	// energy (a bare number is in eV), or "none" for a form that grows
	// without bound. Empty means: found numerically for each parameter set.
	Limit string
	// Tail is the power p of a slow approach to the limit, V − V(∞) ≈ C·r^−p
	// (1 for a Coulomb-like tail), core.Domain.TailPower; 0 means not
	// declared (a fast approach). It needs a finite limit.
	Tail float64
	// Origin says where the declaration comes from, e.g. "forms.toml:12".
	Origin string
}

// ParamDecl declares a parameter.
type ParamDecl struct {
	Name string
	// Unit is the parameter's default unit, and so its dimension: any
	// product of powers of energy and length units ("eV", "A", "1/A^2",
	// "eV*A^8", "kcal/mol*A^6"), or "1" for a dimensionless parameter. A
	// bare number in a spec is in this unit.
	Unit string
	// Constraint is "> 0", ">= 0" (or "≥ 0"), or "finite" (also empty).
	Constraint string
	Meaning    string
}

// Form is a core.Model whose potential is a compiled formula.
type Form struct {
	info    core.ModelInfo
	f       *Formula
	rmin    *Expr // nil: 0
	limit   *Expr // nil: numerical, unless unbounded
	noLimit bool  // Limit = "none"

	gradOnce sync.Once
	gradient *gradient // nil until grad, and when a derivative cannot be compiled
	tail     float64
	warnings []string
}

// MaxOrder is the highest derivative order of a formula form.
const MaxOrder = 40

// NewForm checks and compiles a declaration. Errors wrap ErrDecl or
// ErrFormula and start with the key (and the origin where the formula is at
// fault).
func NewForm(d Decl) (*Form, error) {
	fail := func(format string, args ...any) (*Form, error) {
		return nil, fmt.Errorf("form %q: %w: %s", d.Key, ErrDecl, fmt.Sprintf(format, args...))
	}
	if !validKey(d.Key) {
		return fail("key %q: use letters, digits, - and _, starting with a letter", d.Key)
	}
	if strings.TrimSpace(d.Formula) == "" {
		return fail("no formula")
	}
	params := make([]Param, len(d.Params))
	infos := make([]core.Param, len(d.Params))
	for i, p := range d.Params {
		if strings.TrimSpace(p.Unit) == "" {
			return fail("parameter %q has no unit (write unit = \"1\" for a dimensionless one)", p.Name)
		}
		dim, factor, err := units.ParseUnit(p.Unit)
		if err != nil {
			return fail("parameter %q: %v", p.Name, err)
		}
		if _, ok := dimOfUnit(dim); !ok {
			hint := ""
			if dim == units.Temperature {
				hint = "; declare an energy unit (eV, kcal/mol, …): values may still be given in K"
			}
			return fail("parameter %q: unit %q is a %s: a parameter's unit must be a product of powers of energy and length units%s", p.Name, p.Unit, dim, hint)
		}
		c, err := parseConstraint(p.Constraint)
		if err != nil {
			return fail("parameter %q: %v", p.Name, err)
		}
		params[i] = Param{Name: p.Name, Dimension: dim}
		unit := strings.TrimSpace(p.Unit)
		if factor == 1 {
			unit = "" // the default unit, however spelled ("A", "Å")
		}
		infos[i] = core.Param{Name: p.Name, Dimension: dim, Unit: unit, Constraint: c, Meaning: p.Meaning}
	}
	f, err := Compile(d.Formula, params)
	if err != nil {
		return nil, fmt.Errorf("form %q: %w", d.Key, err)
	}
	form := &Form{f: f}
	for _, u := range f.Unused {
		form.warnings = append(form.warnings, fmt.Sprintf("form %q: parameter %s is declared but not used in the formula", d.Key, u))
	}
	domain := "r > 0"
	if s := strings.TrimSpace(d.RMin); s != "" {
		e, err := CompileExpr(s, params, units.Length)
		if err != nil {
			return nil, fmt.Errorf("form %q: r_min: %w", d.Key, err)
		}
		form.rmin = e
		domain = "r > " + s
	}
	limitNote := "dissociation limit V(∞) found numerically for each parameter set"
	switch s := strings.TrimSpace(d.Limit); s {
	case "":
	case "none":
		form.noLimit = true
		limitNote = "grows without bound as r → ∞"
	default:
		e, err := CompileExpr(s, params, units.Energy)
		if err != nil {
			return nil, fmt.Errorf("form %q: limit: %w", d.Key, err)
		}
		form.limit = e
		limitNote = "dissociation limit V(∞) = " + s
	}
	if d.Tail != 0 {
		if !(d.Tail > 0 && d.Tail <= 6) {
			return fail("tail %g: the power of a slow tail must be > 0 and at most 6 (faster tails need no declaration)", d.Tail)
		}
		if form.noLimit {
			return fail("tail %g: a form that grows without bound (limit = \"none\") has no tail", d.Tail)
		}
		form.tail = d.Tail
		limitNote += fmt.Sprintf(", approached as r^-%g", d.Tail)
	}
	name := d.Name
	if name == "" {
		name = d.Key
	}
	ref := d.Reference
	if strings.TrimSpace(ref) == "" {
		ref = "no reference given"
	}
	notes := d.Notes
	if notes != "" {
		notes += "; "
	}
	form.info = core.ModelInfo{
		Key:       d.Key,
		Name:      name,
		Formula:   "V = " + strings.TrimSpace(d.Formula),
		Params:    infos,
		Domain:    domain,
		Reference: ref,
		Notes:     notes + limitNote + "; derivatives of every order by Taylor arithmetic on the compiled formula",
		MaxOrder:  MaxOrder,
		Origin:    d.Origin,
	}
	return form, nil
}

func validKey(s string) bool {
	if s == "" || !isLetter(s[0]) {
		return false
	}
	for i := 0; i < len(s); i++ {
		c := s[i]
		if !isLetter(c) && !(c >= '0' && c <= '9') && c != '-' {
			return false
		}
	}
	return true
}

func parseConstraint(s string) (core.Constraint, error) {
	switch strings.Join(strings.Fields(s), " ") {
	case "", "finite":
		return core.Finite, nil
	case "> 0", ">0":
		return core.Positive, nil
	case ">= 0", ">=0", "≥ 0", "≥0":
		return core.NonNegative, nil
	}
	return 0, fmt.Errorf("constraint %q: allowed are \"> 0\", \">= 0\" and \"finite\"", s)
}

// base is the potential of params with its scalars and lower end of the
// domain, before the search for an inner barrier and the limit: what New
// starts from, and what Match evaluates.
func (f *Form) base(params []float64) (*potential, error) {
	key := f.info.Key
	scal, err := f.f.prog.Scalars(params)
	if err != nil {
		return nil, fmt.Errorf("%s: %w: %v", key, core.ErrParam, err)
	}
	dom := core.Domain{Max: math.Inf(1), Limit: math.Inf(1)}
	if f.rmin != nil {
		v, err := f.rmin.Eval(params)
		if err != nil || v < 0 {
			if err == nil {
				err = fmt.Errorf("r_min = %g Å is negative", v)
			}
			return nil, fmt.Errorf("%s: %w: r_min: %v", key, core.ErrParam, err)
		}
		dom.Min = v
	}
	dom.TailPower = f.tail
	return newPotential(f, scal, dom), nil
}

// Info returns the form's metadata.
func (f *Form) Info() core.ModelInfo {
	i := f.info
	i.Params = append([]core.Param(nil), i.Params...)
	return i
}

// Formula returns the compiled formula.
func (f *Form) Formula() *Formula { return f.f }

// Warnings returns what is suspicious but not wrong in the declaration
// (parameters declared but unused).
func (f *Form) Warnings() []string { return append([]string(nil), f.warnings...) }

// New builds the potential for a parameter set in default units. It
// wraps core.ErrParam when a constant part of the formula, the domain or
// the limit is not finite for the set, and when a declared limit
// disagrees with the formula.
func (f *Form) New(params []float64) (core.Potential, error) {
	if err := core.CheckParams(f.info, params); err != nil {
		return nil, err
	}
	key := f.info.Key
	p, err := f.base(params)
	if err != nil {
		return nil, err
	}
	if rb, vb, ok := p.innerBarrier(); ok {
		// Below an inner maximum the form collapses: the domain ends
		// there, as for the built-in Buckingham form.
		p.dom.Min, p.dom.Barrier, p.dom.BarrierEnergy = rb, true, vb
	}
	if f.noLimit {
		return p, nil
	}
	lim, ok, err := p.limit()
	if err != nil {
		return nil, fmt.Errorf("%s: %w", key, err)
	}
	if f.limit != nil {
		v, err := f.limit.Eval(params)
		if err != nil {
			return nil, fmt.Errorf("%s: %w: limit: %v", key, core.ErrParam, err)
		}
		if ok && math.Abs(v-lim) > 1e-6*math.Max(1, math.Abs(v)) {
			return nil, fmt.Errorf("%s: %w: declared limit %s = %g eV, but V(r) tends to %g eV at large r", key, core.ErrParam, strings.TrimSpace(f.limit.Text), v, lim)
		}
		p.dom.Limit = v
		return p, nil
	}
	if !ok {
		return nil, fmt.Errorf("%s: %w: the limit of V as r → ∞ cannot be found numerically (V converges too slowly); declare limit in the form", key, core.ErrParam)
	}
	p.dom.Limit = lim
	return p, nil
}
