package cutoff

import (
	"fmt"
	"math"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/internal/gauss"
	"github.com/pairwell/pairwell/core/units"
)

// Tail holds the standard long-range tail corrections of a pair potential
// cut at r_c, for a uniform fluid of number density ρ (pair correlation
// g(r) = 1 beyond r_c):
//
//	u_tail = 2πρ ∫_{r_c}^∞ r² V(r) dr            (energy per particle)
//	p_tail = −(2/3)πρ² ∫_{r_c}^∞ r³ V′(r) dr     (pressure)
//
// (M. P. Allen & D. J. Tildesley, Computer Simulation of Liquids, 2nd ed.,
// Oxford 2017, §2.8). They correct for the interactions beyond r_c that a
// cut form leaves out; the changes a shift or a switch makes inside r_c
// are not part of them. The pressure of a truncated (unshifted) form also
// has an impulsive term from its jump at r_c, which depends on g(r_c) and
// is not included.
type Tail struct {
	Density     float64 `json:"density_per_angstrom3"`      // ρ, atoms/Å³
	Energy      float64 `json:"energy_per_particle_ev"`     // u_tail, eV
	Pressure    float64 `json:"pressure_ev_per_angstrom3"`  // p_tail, eV/Å³
	PressureBar float64 `json:"pressure_bar"`               // p_tail, bar
	Method      string  `json:"method"`                     // "analytic (Lennard-Jones)" or "quadrature"
	Accuracy    float64 `json:"relative_accuracy_estimate"` // of the quadrature; 0 for the closed form
}

// barPerEVPerA3 is 1 eV/Å³ in bar: 1.602176634e-19 J / 1e-30 m³ = 1.602176634e11 Pa.
const barPerEVPerA3 = units.ElectronVolt * 1e30 / 1e5

// LennardJonesTail returns the closed-form tail corrections of the
// Lennard-Jones 12-6 form V = 4ε[(σ/r)¹² − (σ/r)⁶] (ε in eV, σ and r_c in
// Å, ρ in atoms/Å³):
//
//	u_tail = (8/3)πρεσ³[(1/3)(σ/r_c)⁹ − (σ/r_c)³]
//	p_tail = (16/3)πρ²εσ³[(2/3)(σ/r_c)⁹ − (σ/r_c)³]
//
// These are the formulas of Allen & Tildesley (2017), §2.8, whose factors
// are quoted from memory and were checked here by derivation:
// ∫_{r_c}^∞ r²·4ε[σ¹²r⁻¹² − σ⁶r⁻⁶] dr = 4εσ³[(1/9)(σ/r_c)⁹ − (1/3)(σ/r_c)³],
// times 2πρ gives u_tail; r³V′ = 4ε[−12σ¹²r⁻¹⁰ + 6σ⁶r⁻⁴] integrates to
// 4εσ³[−(4/3)(σ/r_c)⁹ + 2(σ/r_c)³], times −(2/3)πρ² gives p_tail.
func LennardJonesTail(eps, sigma, rc, rho float64) Tail {
	s3 := math.Pow(sigma/rc, 3)
	s9 := s3 * s3 * s3
	sig3 := sigma * sigma * sigma
	u := 8.0 / 3 * math.Pi * rho * eps * sig3 * (s9/3 - s3)
	p := 16.0 / 3 * math.Pi * rho * rho * eps * sig3 * (2*s9/3 - s3)
	return Tail{Density: rho, Energy: u, Pressure: p, PressureBar: p * barPerEVPerA3, Method: "analytic (Lennard-Jones)"}
}

// Quadrature of the tail. The integrals are taken in t = r_c/r ∈ (0, 1]:
//
//	∫_{r_c}^∞ r²V dr = r_c³ ∫₀¹ V(r_c/t) t⁻⁴ dt,  ∫_{r_c}^∞ r³V′ dr = r_c⁴ ∫₀¹ V′(r_c/t) t⁻⁵ dt,
//
// where an r⁻⁶ tail gives the integrands C·t² and 6C·t², polynomials, and an
// exponential tail integrands that vanish with all their derivatives at 0.
// [0, 1] is split into the dyadic panels [2^−(k+1), 2^−k], k = 0…tailPanels−1
// (which also resolve a non-integer power t^α at 0), each integrated by the
// Gauss–Legendre rules of tailLow and tailHigh nodes; the value is the
// higher rule's. The accuracy estimate is the sum over panels of the
// difference of the two rules, a rounding bound (tailRounding) and the part
// below the last panel,
// extrapolated geometrically from the last two (a tail decaying as r⁻³ or
// slower makes the integral diverge and is refused), relative to the
// integral. All nodes go to the potential in one Taylor call of order 1.
const (
	tailPanels = 64
	tailLow    = 12
	tailHigh   = 24
)

// tailRounding bounds the relative rounding of a sum of the quadrature
// terms and of the values of V in them: 32 ulp.
const tailRounding = 32 * 0x1p-52

// maxTailRatio is the largest ratio of the last two panels accepted: a
// tail V ∝ r⁻ⁿ gives 2^−(n−3), so 0.99 refuses n ≤ 3.0145 (divergent at
// n ≤ 3).
const maxTailRatio = 0.99

// tailRules are the two rules, built on first use and read-only after.
var tailRules = [2]gauss.Rule{{N: tailLow}, {N: tailHigh}}

// TailCorrections returns the tail corrections of the bare potential p for
// a cutoff rc (Å) and a number density rho (atoms/Å³) by quadrature. V is
// taken relative to its limit Domain.Limit. Errors wrap core.ErrParam (rc or
// rho not finite and > 0) or core.ErrDomain (a form unbounded at long
// range, a domain that ends before ∞, a tail that decays as r⁻³ or slower).
func TailCorrections(p core.Potential, rc, rho float64) (Tail, error) {
	if !(rc > 0) || math.IsInf(rc, 0) || !(rho > 0) || math.IsInf(rho, 0) {
		return Tail{}, fmt.Errorf("tail correction: %w: r_c = %g Å and ρ = %g /Å³ must be finite and > 0", core.ErrParam, rc, rho)
	}
	d := p.Domain()
	if !d.Bounded() {
		return Tail{}, fmt.Errorf("tail correction: %w: the form grows without bound at long range (no V(∞)), so it has no tail correction", core.ErrDomain)
	}
	if !math.IsInf(d.Max, 1) {
		return Tail{}, fmt.Errorf("tail correction: %w: the form is defined only below %g Å; the tail needs V out to r → ∞", core.ErrDomain, d.Max)
	}
	var ts, ws []float64
	var rule []int8 // 0 low, 1 high
	var panel []int
	for k := range tailPanels {
		b := math.Ldexp(1, -k)
		a := b / 2
		for q := range tailRules {
			x, w := tailRules[q].Nodes()
			for i := range x {
				ts = append(ts, a+(b-a)*(x[i]+1)/2)
				ws = append(ws, (b-a)/2*w[i])
				rule, panel = append(rule, int8(q)), append(panel, k)
			}
		}
	}
	rs := make([]float64, len(ts))
	for i, t := range ts {
		rs[i] = rc / t
	}
	c := make([]float64, 2*len(rs))
	if err := p.Taylor(1, rs, c); err != nil {
		return Tail{}, fmt.Errorf("tail correction: %w", err)
	}
	var iu, ip [2][tailPanels]float64 // per rule and panel
	var au, ap float64                // Σ|term| of the higher rule, for the rounding
	for i, t := range ts {
		t2 := t * t
		t4 := t2 * t2
		v := c[2*i] - d.Limit
		tu, tp := ws[i]*v/t4, ws[i]*c[2*i+1]/(t4*t)
		iu[rule[i]][panel[i]] += tu
		ip[rule[i]][panel[i]] += tp
		if rule[i] == 1 {
			au, ap = au+math.Abs(tu), ap+math.Abs(tp)
		}
	}
	u, eu, err := tailSum(&iu)
	if err != nil {
		return Tail{}, err
	}
	pp, ep, err := tailSum(&ip)
	if err != nil {
		return Tail{}, err
	}
	// Rounding: of the sums, and of V itself (a few ulp per value).
	eu += tailRounding * au
	ep += tailRounding * ap
	rc3 := rc * rc * rc
	t := Tail{Density: rho, Method: "quadrature"}
	t.Energy = 2 * math.Pi * rho * rc3 * u
	t.Pressure = -2.0 / 3 * math.Pi * rho * rho * rc3 * rc * pp
	t.PressureBar = t.Pressure * barPerEVPerA3
	t.Accuracy = math.Max(relative(eu, u), relative(ep, pp))
	return t, nil
}

// relative returns e/|v|, 0 when both are 0.
func relative(e, v float64) float64 {
	if e == 0 {
		return 0
	}
	return e / math.Abs(v)
}

// tailSum adds the panels of the higher rule and estimates the error: the
// differences of the rules and the geometric remainder below the last
// panel.
func tailSum(q *[2][tailPanels]float64) (sum, errEst float64, err error) {
	for k := range tailPanels {
		sum += q[1][k]
		errEst += math.Abs(q[1][k] - q[0][k])
	}
	last, prev := math.Abs(q[1][tailPanels-1]), math.Abs(q[1][tailPanels-2])
	if last != 0 {
		ratio := last / prev
		if !(ratio < maxTailRatio) {
			return 0, 0, fmt.Errorf("tail correction: %w: the tail decays as r⁻³ or slower (the last panels shrink by a factor %.3g only), so the tail correction diverges", core.ErrDomain, ratio)
		}
		errEst += last * ratio / (1 - ratio)
	}
	return sum, errEst, nil
}
