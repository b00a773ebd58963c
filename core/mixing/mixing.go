// Package mixing derives the parameters of a cross pair 1–2 from those of
// the like pairs 1–1 and 2–2 by a combining rule.
//
// A rule belongs to one built-in form, named by its key, and works on the
// parameters in that form's order and default units (eV, Å):
//
//	lennard-jones  (epsilon, sigma)
//	buckingham     (A, rho, C)
//	morse          (De, a, re)
//
// A rule that treats each parameter on its own (a mean of the two values:
// Lorentz–Berthelot, geometric, Fender–Halsey and the Buckingham and Morse
// rules) also applies, by common practice, to any other form — a formula
// form, a plugin, a form of the library such as Mie n–m — whose parameters
// include the rule's by name and dimension (ForModel): those are mixed, and
// every other parameter (Mie's exponents, say) must be the same in both
// like pairs (MixModel). Waldman–Hagler and Kong rest on the r⁻⁶ and r⁻¹²
// terms of the 12-6 form and apply to Lennard-Jones only.
//
// Every rule gives back the like pair when both inputs are equal (to
// rounding). Combining rules are empirical: the cross pair they produce is
// an estimate, not a measured or validated interaction.
package mixing

import (
	"errors"
	"fmt"
	"math"
	"slices"
	"strings"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/units"
)

// ErrRule means a combining rule is unknown or does not apply to a form.
var ErrRule = errors.New("combining rule does not apply")

// Form keys the rules apply to (the keys of the built-in models).
const (
	LennardJones = "lennard-jones"
	Buckingham   = "buckingham"
	Morse        = "morse"
)

// Rule is a combining rule for one form.
type Rule struct {
	Name      string // as given to --rule, e.g. "lorentz-berthelot"
	Form      string // the form key it applies to
	Title     string // usual name
	Formula   string // the rule as text
	Reference string // literature source, or "common practice"
	// ByName says that the rule mixes each parameter on its own, so that
	// it applies to any form with parameters of the same names and
	// dimensions (see the package documentation).
	ByName bool
	mix    func(a, b []float64) []float64
}

// Mix returns the cross-pair parameters for like-pair parameters a and b,
// both in the order and default units of r.Form. Each parameter must be
// finite and positive (C of Buckingham may be 0), else the error wraps
// core.ErrParam.
func (r Rule) Mix(a, b []float64) ([]float64, error) {
	ps := params[r.Form]
	n := len(ps)
	if len(a) != n || len(b) != n {
		return nil, fmt.Errorf("%s: %w: %s takes %d parameters, got %d and %d", r.Name, core.ErrParam, r.Form, n, len(a), len(b))
	}
	for _, p := range [][]float64{a, b} {
		for i, v := range p {
			if err := ps[i].Constraint.Check(ps[i].Name, v); err != nil {
				return nil, fmt.Errorf("%s: %w", r.Name, err)
			}
		}
	}
	out := r.mix(a, b)
	for _, v := range out {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return nil, fmt.Errorf("%s: %w: cross-pair parameter overflows float64", r.Name, core.ErrParam)
		}
	}
	return out, nil
}

// params are the names and constraints of the parameters of each form, in
// its order: those of the built-in models' Info (TestParamsOfTheModels
// keeps them equal).
var params = map[string][]core.Param{
	LennardJones: {{Name: "epsilon", Dimension: units.Energy, Constraint: core.Positive}, {Name: "sigma", Dimension: units.Length, Constraint: core.Positive}},
	Buckingham: {{Name: "A", Dimension: units.Energy, Constraint: core.Positive}, {Name: "rho", Dimension: units.Length, Constraint: core.Positive},
		{Name: "C", Dimension: units.Dispersion, Constraint: core.NonNegative}},
	Morse: {{Name: "De", Dimension: units.Energy, Constraint: core.Positive}, {Name: "a", Dimension: units.InverseLength, Constraint: core.Positive},
		{Name: "re", Dimension: units.Length, Constraint: core.Positive}},
}

// arith is (x+y)/2, halved first only when the sum overflows.
func arith(x, y float64) float64 {
	if s := x + y; !math.IsInf(s, 0) {
		return s / 2
	}
	return x/2 + y/2
}

// geom is √(xy) without overflow or underflow of the product.
func geom(x, y float64) float64 { return math.Sqrt(x) * math.Sqrt(y) }

// harm is the harmonic mean 2xy/(x+y), 0 when either is 0.
func harm(x, y float64) float64 {
	if x == 0 || y == 0 {
		return 0
	}
	return 2 / (1/x + 1/y)
}

const (
	lorentz    = "H. A. Lorentz, Ann. Phys. 248, 127 (1881)"
	berthelot  = "D. Berthelot, C. R. Acad. Sci. 126, 1703 (1898)"
	waldman    = "M. Waldman & A. T. Hagler, J. Comput. Chem. 14, 1077 (1993)"
	kong       = "C. L. Kong, J. Chem. Phys. 59, 2464 (1973)"
	fender     = "B. E. F. Fender & G. D. Halsey, J. Chem. Phys. 36, 1881 (1962)"
	practice   = "common practice (no single source; from memory)"
	hhPractice = "common practice: 1/rho is mixed arithmetically (from memory)"
)

var rules = []Rule{
	{Name: "lorentz-berthelot", ByName: true, Form: LennardJones, Title: "Lorentz–Berthelot",
		Formula:   "sigma12 = (sigma1+sigma2)/2, epsilon12 = sqrt(epsilon1 epsilon2)",
		Reference: lorentz + "; " + berthelot, mix: lorentzBerthelot},
	{Name: "geometric", ByName: true, Form: LennardJones, Title: "geometric mean",
		Formula:   "sigma12 = sqrt(sigma1 sigma2), epsilon12 = sqrt(epsilon1 epsilon2)",
		Reference: practice, mix: geometricLJ},
	{Name: "waldman-hagler", Form: LennardJones, Title: "Waldman–Hagler",
		Formula:   "sigma12^6 = (sigma1^6+sigma2^6)/2, epsilon12 = 2 sqrt(epsilon1 epsilon2) sigma1^3 sigma2^3/(sigma1^6+sigma2^6)",
		Reference: waldman, mix: waldmanHagler},
	{Name: "kong", Form: LennardJones, Title: "Kong",
		Formula:   "epsilon12 sigma12^12 = (epsilon1 sigma1^12/2^13)[1 + (epsilon2 sigma2^12/(epsilon1 sigma1^12))^(1/13)]^13, epsilon12 sigma12^6 = sqrt(epsilon1 sigma1^6 epsilon2 sigma2^6) (from memory)",
		Reference: kong, mix: kongLJ},
	{Name: "fender-halsey", ByName: true, Form: LennardJones, Title: "Fender–Halsey",
		Formula:   "sigma12 = (sigma1+sigma2)/2, epsilon12 = 2 epsilon1 epsilon2/(epsilon1+epsilon2)",
		Reference: fender, mix: fenderHalsey},
	{Name: "exp-arithmetic", ByName: true, Form: Buckingham, Title: "geometric A and C, arithmetic rho",
		Formula:   "A12 = sqrt(A1 A2), rho12 = (rho1+rho2)/2, C12 = sqrt(C1 C2)",
		Reference: practice, mix: expArithmetic},
	{Name: "exp-harmonic", ByName: true, Form: Buckingham, Title: "geometric A and C, harmonic rho",
		Formula:   "A12 = sqrt(A1 A2), 1/rho12 = (1/rho1+1/rho2)/2, C12 = sqrt(C1 C2)",
		Reference: hhPractice, mix: expHarmonic},
	{Name: "morse-mean", ByName: true, Form: Morse, Title: "geometric De, arithmetic a and re",
		Formula:   "De12 = sqrt(De1 De2), a12 = (a1+a2)/2, re12 = (re1+re2)/2",
		Reference: "common practice, by analogy with Lorentz–Berthelot (no single source)", mix: morseMean},
}

// Rules returns every rule, Lennard-Jones first, in a fixed order.
func Rules() []Rule { return append([]Rule(nil), rules...) }

// ForForm returns the rules of the built-in form key, in the order of
// Rules; none for a form without rules.
func ForForm(form string) []Rule { return ForModel(form, nil) }

// ForModel returns the rules that apply to the form key with parameters
// ps (its Info().Params): the rules of the built-in form key, and the ByName
// rules whose parameters ps includes by name and dimension. The order is
// that of Rules.
func ForModel(key string, ps []core.Param) []Rule {
	var out []Rule
	for _, r := range rules {
		if _, ok := r.indices(key, ps); ok {
			out = append(out, r)
		}
	}
	return out
}

// indices returns where each parameter of r lies in ps, and whether r
// applies to the form key with parameters ps.
func (r Rule) indices(key string, ps []core.Param) ([]int, bool) {
	own := params[r.Form]
	idx := make([]int, len(own))
	if key == r.Form {
		for i := range idx {
			idx[i] = i
		}
		return idx, true
	}
	if !r.ByName {
		return nil, false
	}
	for i, q := range own {
		idx[i] = -1
		for j, p := range ps {
			if p.Name == q.Name && p.Dimension == q.Dimension {
				idx[i] = j
				break
			}
		}
		if idx[i] < 0 {
			return nil, false
		}
	}
	return idx, true
}

// MixModel mixes the like-pair parameters a and b of the form key with
// parameters ps (both full parameter sets, in the form's order and default
// units): the rule's parameters are mixed by Mix and every other parameter
// must be equal in a and b (to 1e-12 relative), else the error wraps
// ErrRule, naming it. A rule that does not apply to the form is an error
// wrapping ErrRule.
func (r Rule) MixModel(key string, ps []core.Param, a, b []float64) ([]float64, error) {
	idx, ok := r.indices(key, ps)
	if !ok {
		return nil, fmt.Errorf("%w: rule %s does not apply to %s", ErrRule, r.Name, key)
	}
	if key == r.Form {
		return r.Mix(a, b)
	}
	if len(a) != len(ps) || len(b) != len(ps) {
		return nil, fmt.Errorf("%s: %w: %s takes %d parameters, got %d and %d", r.Name, core.ErrParam, key, len(ps), len(a), len(b))
	}
	mixed := make(map[int]bool, len(idx))
	sa, sb := make([]float64, len(idx)), make([]float64, len(idx))
	for i, j := range idx {
		mixed[j] = true
		sa[i], sb[i] = a[j], b[j]
	}
	for j, p := range ps {
		if !mixed[j] && math.Abs(a[j]-b[j]) > 1e-12*math.Max(math.Abs(a[j]), math.Abs(b[j])) {
			var names []string
			for _, q := range params[r.Form] {
				names = append(names, q.Name)
			}
			return nil, fmt.Errorf("%w: %s = %g and %g differ; rule %s mixes %s only, so the other parameters of %s must be the same in both like pairs",
				ErrRule, p.Name, a[j], b[j], r.Name, strings.Join(names, ", "), key)
		}
	}
	m, err := r.Mix(sa, sb)
	if err != nil {
		return nil, err
	}
	out := append([]float64(nil), a...)
	for i, j := range idx {
		out[j] = m[i]
	}
	return out, nil
}

// Lookup returns the rule called name for the built-in form. An unknown
// name, or a rule of another form, gives an error wrapping ErrRule that
// lists the rules of form.
func Lookup(name, form string) (Rule, error) { return LookupFor(name, form, nil) }

// Exist says, for a message, for which forms combining rules exist: the
// forms of the rules and, by parameter names, the parameters of the
// ByName rules' forms ("combining rules exist for lennard-jones, … and, by
// parameter names, for forms with (epsilon, sigma), …").
func Exist() string {
	var forms, tuples []string
	for _, r := range rules {
		if !slices.Contains(forms, r.Form) {
			forms = append(forms, r.Form)
		}
		var names []string
		for _, p := range params[r.Form] {
			names = append(names, p.Name)
		}
		if t := "(" + strings.Join(names, ", ") + ")"; r.ByName && !slices.Contains(tuples, t) {
			tuples = append(tuples, t)
		}
	}
	return "combining rules exist for " + strings.Join(forms, ", ") +
		" and, by parameter names, for forms with " + strings.Join(tuples, ", ")
}

// LookupFor returns the rule called name if it applies to the form key
// with parameters ps (see ForModel). An unknown name, or a rule that does
// not apply, gives an error wrapping ErrRule that lists the rules that do.
func LookupFor(name, key string, ps []core.Param) (Rule, error) {
	var names []string
	for _, r := range ForModel(key, ps) {
		if r.Name == name {
			return r, nil
		}
		names = append(names, r.Name)
	}
	allowed := "none: " + Exist()
	if len(names) > 0 {
		allowed = strings.Join(names, ", ")
	}
	for _, r := range rules {
		if r.Name == name {
			return Rule{}, fmt.Errorf("%w: rule %s is for %s, not %s; rules for %s: %s", ErrRule, name, r.Form, key, key, allowed)
		}
	}
	return Rule{}, fmt.Errorf("%w: unknown rule %q; rules for %s: %s", ErrRule, name, key, allowed)
}

// lorentzBerthelot: σ₁₂ = (σ₁+σ₂)/2 (Lorentz 1881), ε₁₂ = √(ε₁ε₂)
// (Berthelot 1898).
func lorentzBerthelot(a, b []float64) []float64 {
	return []float64{geom(a[0], b[0]), arith(a[1], b[1])}
}

// geometricLJ: σ₁₂ = √(σ₁σ₂), ε₁₂ = √(ε₁ε₂).
func geometricLJ(a, b []float64) []float64 {
	return []float64{geom(a[0], b[0]), geom(a[1], b[1])}
}

// waldmanHagler (Waldman & Hagler 1993):
//
//	σ₁₂⁶ = (σ₁⁶ + σ₂⁶)/2,  ε₁₂ = 2√(ε₁ε₂)·σ₁³σ₂³/(σ₁⁶ + σ₂⁶),
//
// evaluated with σ scaled by the larger σ so that the sixth powers do not
// overflow.
func waldmanHagler(a, b []float64) []float64 {
	s := math.Max(a[1], b[1])
	u, v := a[1]/s, b[1]/s
	u3, v3 := u*u*u, v*v*v
	sum := u3*u3 + v3*v3
	return []float64{2 * geom(a[0], b[0]) * u3 * v3 / sum, s * math.Pow(sum/2, 1.0/6)}
}

// kongLJ is the Kong rule (Kong 1973) for the 12-6 form, written here from
// memory (not checked against the paper):
//
//	ε₁₂σ₁₂¹² = (ε₁σ₁¹²/2¹³)·[1 + (ε₂σ₂¹²/(ε₁σ₁¹²))^{1/13}]¹³,
//	ε₁₂σ₁₂⁶  = √(ε₁σ₁⁶·ε₂σ₂⁶),
//
// the repulsive coefficient from the overlap of exponential repulsions,
// the dispersion coefficient geometric. With P = ε₁₂σ₁₂¹² and
// Q = ε₁₂σ₁₂⁶: σ₁₂⁶ = P/Q and ε₁₂ = Q²/P. It works in logarithms:
// ln P = ln(ε₁σ₁¹²) + 13·ln((1 + t)/2) with t = (ε₂σ₂¹²/(ε₁σ₁¹²))^{1/13}.
// For equal pairs t = 1 and P = ε σ¹², Q = ε σ⁶: the like pair.
func kongLJ(a, b []float64) []float64 {
	l1 := math.Log(a[0]) + 12*math.Log(a[1])
	l2 := math.Log(b[0]) + 12*math.Log(b[1])
	t := math.Exp((l2 - l1) / 13)
	lp := l1 + 13*math.Log((1+t)/2)
	lq := 0.5 * (math.Log(a[0]) + 6*math.Log(a[1]) + math.Log(b[0]) + 6*math.Log(b[1]))
	sigma := math.Exp((lp - lq) / 6)
	eps := math.Exp(2*lq - lp)
	return []float64{eps, sigma}
}

// fenderHalsey (Fender & Halsey 1962): ε₁₂ = 2ε₁ε₂/(ε₁+ε₂), the harmonic
// mean, with σ₁₂ = (σ₁+σ₂)/2.
func fenderHalsey(a, b []float64) []float64 {
	return []float64{harm(a[0], b[0]), arith(a[1], b[1])}
}

// expArithmetic: A and C geometric, ρ arithmetic (common practice).
func expArithmetic(a, b []float64) []float64 {
	return []float64{geom(a[0], b[0]), arith(a[1], b[1]), geom(a[2], b[2])}
}

// expHarmonic: A and C geometric, 1/ρ arithmetic, so ρ₁₂ is the harmonic
// mean of ρ₁ and ρ₂ (common practice).
func expHarmonic(a, b []float64) []float64 {
	return []float64{geom(a[0], b[0]), harm(a[1], b[1]), geom(a[2], b[2])}
}

// morseMean: De geometric, a and re arithmetic (common practice).
func morseMean(a, b []float64) []float64 {
	return []float64{geom(a[0], b[0]), arith(a[1], b[1]), arith(a[2], b[2])}
}
