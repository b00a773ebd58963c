package formula_test

import (
	"fmt"
	"math"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/coretest"
	"github.com/pairwell/pairwell/core/formula"
	"github.com/pairwell/pairwell/models"
)

// builtinCase is a formula declaration of a built-in form, its parameters
// and the separations compared.
type builtinCase struct {
	decl    formula.Decl
	params  []float64
	builtin core.Model
	lo, hi  float64
}

func p(name, unit string) formula.ParamDecl {
	return formula.ParamDecl{Name: name, Unit: unit, Constraint: "> 0"}
}

// builtinCases are the formula versions of the built-in forms: Morse
// (P. M. Morse, Phys. Rev. 34, 57 (1929)), Lennard-Jones 12-6 (J. E.
// Lennard-Jones, Proc. R. Soc. A 106, 463 (1924)), Buckingham (R. A.
// Buckingham, Proc. R. Soc. A 168, 264 (1938)) and harmonic, written as the
// README's table states them.
var builtinCases = []builtinCase{
	{
		decl: formula.Decl{Key: "fmorse", Formula: "De*(1 - exp(-a*(r - re)))^2 - De",
			Params: []formula.ParamDecl{p("De", "eV"), p("a", "1/A"), p("re", "A")}},
		params: []float64{4.6, 1.87, 1.27}, builtin: models.Morse{}, lo: 0.6, hi: 4,
	},
	{
		decl: formula.Decl{Key: "flj", Formula: "4*epsilon*((sigma/r)^12 - (sigma/r)^6)",
			Params: []formula.ParamDecl{p("epsilon", "eV"), p("sigma", "A")}},
		params: []float64{0.0104, 3.4}, builtin: models.LennardJones{}, lo: 3, hi: 10,
	},
	{
		decl: formula.Decl{Key: "fbuck", Formula: "A*exp(-r/rho) - C/r^6",
			Params: []formula.ParamDecl{p("A", "eV"), p("rho", "A"), p("C", "eV*A^6")}},
		params: []float64{1500, 0.3, 25}, builtin: models.Buckingham{}, lo: 1.5, hi: 8,
	},
	{
		decl: formula.Decl{Key: "fharm", Formula: "0.5*k*(r - r0)^2", Limit: "none",
			Params: []formula.ParamDecl{p("k", "eV/A^2"), p("r0", "A")}},
		params: []float64{30, 1.2}, builtin: models.Harmonic{}, lo: 0.5, hi: 2.5,
	},
}

// Formula forms equal the built-ins to 1e-13 relative at orders 0–12 over
// 50 points (issue 10). The relative error is taken against the size of the
// derivative's terms, |V⁽ⁿ⁾| of each term of the formula, so that a zero
// crossing of V⁽ⁿ⁾ (where any two correct codes differ in relative terms)
// does not count; away from crossings this is the plain relative error.
func TestBuiltinEquivalence(t *testing.T) {
	const points, maxOrder, tol = 50, 12, 1e-13
	for _, c := range builtinCases {
		t.Run(c.decl.Key, func(t *testing.T) {
			form, err := formula.NewForm(c.decl)
			require.NoError(t, err)
			fp, err := form.New(c.params)
			require.NoError(t, err)
			bp, err := c.builtin.New(c.params)
			require.NoError(t, err)
			rs := make([]float64, points)
			for i := range rs {
				rs[i] = c.lo + (c.hi-c.lo)*float64(i)/(points-1)
			}
			got, want := make([]float64, points), make([]float64, points)
			worst := 0.0
			for n := 0; n <= maxOrder; n++ {
				require.NoError(t, coretest.Batch(fp, n, rs, got))
				require.NoError(t, coretest.Batch(bp, n, rs, want))
				for i, r := range rs {
					scale := termScale(t, c, n, r)
					e := math.Abs(got[i]-want[i]) / scale
					worst = math.Max(worst, e)
					assert.LessOrEqual(t, e, tol, "order %d at r = %g: formula %.17g, built-in %.17g", n, r, got[i], want[i])
				}
			}
			t.Logf("%s: max relative error %.2g (orders 0–%d, %d points)", c.decl.Key, worst, maxOrder, points)
		})
	}
}

// termScale returns Σ |T⁽ⁿ⁾(r)| over the terms T of the case's formula
// (each term compiled as a formula itself), at least the smallest
// positive number.
func termScale(t *testing.T, c builtinCase, n int, r float64) float64 {
	t.Helper()
	var terms []string
	switch c.decl.Key {
	case "fmorse":
		terms = []string{"De*exp(-2*a*(r - re))", "2*De*exp(-a*(r - re))"}
	case "flj":
		terms = []string{"4*epsilon*(sigma/r)^12", "4*epsilon*(sigma/r)^6"}
	case "fbuck":
		terms = []string{"A*exp(-r/rho)", "C/r^6"}
	case "fharm":
		terms = []string{"0.5*k*r^2", "k*r*r0", "0.5*k*r0^2 + 0*k*r^2"}
	}
	s := 0.0
	for i, term := range terms {
		d := c.decl
		d.Key = fmt.Sprintf("term%d", i)
		d.Formula = term
		d.Limit = "none"
		f, err := formula.NewForm(d)
		require.NoError(t, err, term)
		tp, err := f.New(c.params)
		require.NoError(t, err)
		v, err := core.Derivative(tp, n, r)
		require.NoError(t, err)
		s += math.Abs(v)
	}
	return math.Max(s, math.SmallestNonzeroFloat64)
}

// The domains agree too: the formula Buckingham's inner maximum (the
// barrier, found by a scan and bisection on V′) is the built-in's closed
// one, and the limits found numerically are the built-ins' (0 up to the
// r⁻⁶ tail at 10¹² Å; +Inf for the harmonic form, declared "none").
func TestBuiltinDomains(t *testing.T) {
	for _, c := range builtinCases {
		form, err := formula.NewForm(c.decl)
		require.NoError(t, err)
		fp, err := form.New(c.params)
		require.NoError(t, err)
		bp, err := c.builtin.New(c.params)
		require.NoError(t, err)
		got, want := fp.Domain(), bp.Domain()
		assert.Equal(t, want.Barrier, got.Barrier, c.decl.Key)
		assert.InDelta(t, want.Min, got.Min, 1e-13*math.Max(1, want.Min), c.decl.Key)
		assert.InDelta(t, want.BarrierEnergy, got.BarrierEnergy, 1e-13*math.Abs(want.BarrierEnergy), c.decl.Key)
		if math.IsInf(want.Limit, 1) {
			assert.Equal(t, want.Limit, got.Limit, c.decl.Key)
		} else {
			// V(10¹² Å): the r⁻⁶ tails leave ~1e-71 eV.
			assert.InDelta(t, want.Limit, got.Limit, 1e-60, c.decl.Key)
		}
	}
}
