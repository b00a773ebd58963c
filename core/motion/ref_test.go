package motion_test

import (
	"math"
	"testing"

	"gonum.org/v1/gonum/integrate/quad"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/units"
)

// kineticEV is the kinetic energy in eV of 1 u·Å²/fs², from CODATA 2018
// constants (m_u·10¹⁰ J / e).
const kineticEV = units.Dalton * 1e10 / units.ElectronVolt

// quadPeriod is the test's independent reference period in fs at
// oscillation energy e (eV above V(re)): T = √(2μ·kineticEV) ∫ dr/√(E − V)
// between the turning points r± (found with core.Root), after the
// substitution r = m + h·sin θ (m, h the midpoint and half-width of
// [r−, r+]) that removes the inverse-square-root endpoint singularities;
// the smooth integrand h·cos θ/√(E − V) is integrated over θ ∈ (−π/2, π/2)
// by gonum's quad.Fixed with n-point Gauss–Legendre. Near the turning
// points E − V is evaluated by Taylor series about them (see below).
func quadPeriod(t *testing.T, p core.Potential, mu, e float64, n int) float64 {
	t.Helper()
	w, err := core.AnalyzeWell(p, core.WellSettings{Order: 2})
	if err != nil {
		t.Fatal(err)
	}
	var buf [2]float64
	g := func(r float64) (float64, float64, error) {
		if err := p.Taylor(1, []float64{r}, buf[:]); err != nil {
			return 0, 0, err
		}
		return buf[0] - w.Energy - e, buf[1], nil
	}
	side := func(dir float64) float64 {
		x := math.Sqrt(2 * e / w.K)
		lo := w.Re
		for {
			r := w.Re + dir*x
			if dir < 0 && r <= p.Domain().Min {
				r = 0.5 * (lo + p.Domain().Min)
			}
			v, _, err := g(r)
			if err != nil {
				t.Fatal(err)
			}
			if v > 0 {
				root, err := core.Root(g, lo, r)
				if err != nil {
					t.Fatal(err)
				}
				return root
			}
			lo = r
			x *= 2
		}
	}
	rm, rp := side(-1), side(1)
	m, h := 0.5*(rp+rm), 0.5*(rp-rm)
	// Near each turning point r± (|r − r±| < h/4), E − V(r) is computed as
	// V(r±) − V(r) from the Taylor series of V about r±, so that it keeps
	// its relative accuracy where it vanishes; elsewhere by subtraction.
	const terms = 60
	cm, cp := make([]float64, terms+1), make([]float64, terms+1)
	if err := p.Taylor(terms, []float64{rm}, cm); err != nil {
		t.Fatal(err)
	}
	if err := p.Taylor(terms, []float64{rp}, cp); err != nil {
		t.Fatal(err)
	}
	taylorDrop := func(c []float64, d float64) float64 { // V(r±) − V(r± + d)
		var s, dn float64 = 0, 1
		for n := 1; n <= terms; n++ {
			dn *= d
			term := c[n] * dn
			s -= term
			if math.Abs(term) < 1e-18*math.Abs(s) {
				break
			}
		}
		return s
	}
	f := func(th float64) float64 {
		sn, cs := math.Sin(th), math.Cos(th)
		var gap float64 // E − V(r) > 0
		switch {
		case th > 0 && h*cs*cs/(1+sn) < h/4:
			gap = taylorDrop(cp, -h*cs*cs/(1+sn)) // r − r+ = −h(1 − sin θ)
		case th < 0 && h*cs*cs/(1-sn) < h/4:
			gap = taylorDrop(cm, h*cs*cs/(1-sn)) // r − r− = h(1 + sin θ)
		default:
			v, _, err := g(m + h*sn)
			if err != nil {
				t.Fatal(err)
			}
			gap = -v
		}
		return h * cs / math.Sqrt(gap)
	}
	return math.Sqrt(2*mu*kineticEV) * quad.Fixed(f, -math.Pi/2, math.Pi/2, n, quad.Legendre{}, 0)
}
