// Package mixing derives the parameters of a cross pair 1–2 from those of
// the like pairs 1–1 and 2–2 by a combining rule.
//
// A rule applies to one built-in form, named by its key, and works on the
// parameters in that form's order and default units (eV, Å):
//
//	lennard-jones  (epsilon, sigma)
//	buckingham     (A, rho, C)
//	morse          (De, a, re)
//
// Every rule gives back the like pair when both inputs are equal (to
// rounding). Combining rules are empirical: the cross pair they produce is
// an estimate, not a measured or validated interaction.
package mixing

import (
	"errors"
	"fmt"
	"math"
	"strings"

	"github.com/pairwell/pairwell/core"
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
	mix       func(a, b []float64) []float64
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
	LennardJones: {{Name: "epsilon", Constraint: core.Positive}, {Name: "sigma", Constraint: core.Positive}},
	Buckingham:   {{Name: "A", Constraint: core.Positive}, {Name: "rho", Constraint: core.Positive}, {Name: "C", Constraint: core.NonNegative}},
	Morse:        {{Name: "De", Constraint: core.Positive}, {Name: "a", Constraint: core.Positive}, {Name: "re", Constraint: core.Positive}},
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
	{Name: "lorentz-berthelot", Form: LennardJones, Title: "Lorentz–Berthelot",
		Formula:   "sigma12 = (sigma1+sigma2)/2, epsilon12 = sqrt(epsilon1 epsilon2)",
		Reference: lorentz + "; " + berthelot, mix: lorentzBerthelot},
	{Name: "geometric", Form: LennardJones, Title: "geometric mean",
		Formula:   "sigma12 = sqrt(sigma1 sigma2), epsilon12 = sqrt(epsilon1 epsilon2)",
		Reference: practice, mix: geometricLJ},
	{Name: "waldman-hagler", Form: LennardJones, Title: "Waldman–Hagler",
		Formula:   "sigma12^6 = (sigma1^6+sigma2^6)/2, epsilon12 = 2 sqrt(epsilon1 epsilon2) sigma1^3 sigma2^3/(sigma1^6+sigma2^6)",
		Reference: waldman, mix: waldmanHagler},
	{Name: "kong", Form: LennardJones, Title: "Kong",
		Formula:   "epsilon12 sigma12^12 = (epsilon1 sigma1^12/2^13)[1 + (epsilon2 sigma2^12/(epsilon1 sigma1^12))^(1/13)]^13, epsilon12 sigma12^6 = sqrt(epsilon1 sigma1^6 epsilon2 sigma2^6) (from memory)",
		Reference: kong, mix: kongLJ},
	{Name: "fender-halsey", Form: LennardJones, Title: "Fender–Halsey",
		Formula:   "sigma12 = (sigma1+sigma2)/2, epsilon12 = 2 epsilon1 epsilon2/(epsilon1+epsilon2)",
		Reference: fender, mix: fenderHalsey},
	{Name: "exp-arithmetic", Form: Buckingham, Title: "geometric A and C, arithmetic rho",
		Formula:   "A12 = sqrt(A1 A2), rho12 = (rho1+rho2)/2, C12 = sqrt(C1 C2)",
		Reference: practice, mix: expArithmetic},
	{Name: "exp-harmonic", Form: Buckingham, Title: "geometric A and C, harmonic rho",
		Formula:   "A12 = sqrt(A1 A2), 1/rho12 = (1/rho1+1/rho2)/2, C12 = sqrt(C1 C2)",
		Reference: hhPractice, mix: expHarmonic},
	{Name: "morse-mean", Form: Morse, Title: "geometric De, arithmetic a and re",
		Formula:   "De12 = sqrt(De1 De2), a12 = (a1+a2)/2, re12 = (re1+re2)/2",
		Reference: "common practice, by analogy with Lorentz–Berthelot (no single source)", mix: morseMean},
}

// Rules returns every rule, Lennard-Jones first, in a fixed order.
func Rules() []Rule { return append([]Rule(nil), rules...) }

// ForForm returns the rules that apply to the form key, in the order of
// Rules; none for a form without rules.
func ForForm(form string) []Rule {
	var out []Rule
	for _, r := range rules {
		if r.Form == form {
			out = append(out, r)
		}
	}
	return out
}

// Lookup returns the rule called name for form. An unknown name, or a rule
// of another form, gives an error wrapping ErrRule that lists the rules
// of form.
func Lookup(name, form string) (Rule, error) {
	var names []string
	for _, r := range ForForm(form) {
		if r.Name == name {
			return r, nil
		}
		names = append(names, r.Name)
	}
	allowed := "none: combining rules exist for " + strings.Join([]string{LennardJones, Buckingham, Morse}, ", ")
	if len(names) > 0 {
		allowed = strings.Join(names, ", ")
	}
	for _, r := range rules {
		if r.Name == name {
			return Rule{}, fmt.Errorf("%w: rule %s is for %s, not %s; rules for %s: %s", ErrRule, name, r.Form, form, form, allowed)
		}
	}
	return Rule{}, fmt.Errorf("%w: unknown rule %q; rules for %s: %s", ErrRule, name, form, allowed)
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
