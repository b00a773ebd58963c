package formula_test

import (
	"bufio"
	"math"
	"os"
	"strconv"
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/coretest"
	"github.com/pairwell/pairwell/core/formula"
)

var varshniDecl = formula.Decl{
	Key:       "varshni",
	Name:      "Varshni",
	Formula:   "De*(1 - (re/r)*exp(-beta*(r^2 - re^2)))^2 - De",
	Reference: "Y. P. Varshni, Rev. Mod. Phys. 29, 664 (1957)",
	Params: []formula.ParamDecl{
		{Name: "De", Unit: "eV", Constraint: "> 0", Meaning: "well depth"},
		{Name: "re", Unit: "A", Constraint: "> 0", Meaning: "equilibrium distance"},
		{Name: "beta", Unit: "1/A^2", Constraint: "> 0", Meaning: "range parameter"},
	},
}

// Varshni's form V = De[1 − u]² − De with u = (re/r)·e^{−β(r² − re²)}
// (Y. P. Varshni, Rev. Mod. Phys. 29, 664 (1957)). u(re) = 1 and
// u′ = −u(1/r + 2βr), so V′ = −2De(1 − u)u′ vanishes at re and
// V″ = 2De u′² − 2De(1 − u)u″ is V″(re) = 2De u′(re)² = 2De(1/re + 2βre)²
// > 0: re is the minimum. Derivatives of orders 1–8 at six r against
// testdata/varshni.txt (mpmath 1.3.0, 50 digits, see varshni.py).
func TestVarshni(t *testing.T) {
	const De, re, beta = 4.6, 1.27, 0.5
	form, err := formula.NewForm(varshniDecl)
	require.NoError(t, err)
	p, err := form.New([]float64{De, re, beta})
	require.NoError(t, err)
	w, err := core.AnalyzeWell(p, core.WellSettings{})
	require.NoError(t, err)
	assert.InDelta(t, re, w.Re, 1e-14*re)
	assert.InDelta(t, -De, w.Energy, 1e-14*De)
	assert.InDelta(t, De, w.Depth, 1e-14*De) // limit found numerically: 0
	want := 2 * De * math.Pow(1/re+2*beta*re, 2)
	assert.InDelta(t, want, w.K, 1e-13*want)

	f, err := os.Open("testdata/varshni.txt")
	require.NoError(t, err)
	defer f.Close()
	sc := bufio.NewScanner(f)
	count := 0
	worst := 0.0
	for sc.Scan() {
		if strings.HasPrefix(sc.Text(), "#") {
			continue
		}
		fs := strings.Fields(sc.Text())
		require.Len(t, fs, 3)
		r, _ := strconv.ParseFloat(fs[0], 64)
		n, _ := strconv.Atoi(fs[1])
		ref, err := strconv.ParseFloat(fs[2], 64)
		require.NoError(t, err)
		got, err := core.Derivative(p, n, r)
		require.NoError(t, err)
		scale := math.Abs(ref)
		if ref == 0 {
			// V′(re) = 0: compare with the natural scale V″(re)·re.
			scale = want * re
		}
		e := math.Abs(got-ref) / scale
		worst = math.Max(worst, e)
		// 1e-12: orders up to 8 of a composition of exp, a product and a
		// square (measured maximum in the log).
		assert.LessOrEqual(t, e, 1e-12, "V⁽%d⁾(%g): got %.17g, mpmath %.17g", n, r, got, ref)
		count++
	}
	require.NoError(t, sc.Err())
	require.Equal(t, 48, count)
	t.Logf("Varshni orders 1–8 against mpmath: max relative error %.2g", worst)
}

// The exp-6 form in (ε, r_m, α), V = ε/(1 − 6/α)·[(6/α)e^{α(1 − r/r_m)} −
// (r_m/r)⁶], as written by E. A. Mason, J. Chem. Phys. 22, 169 (1954)
// (citation from memory), the "modified Buckingham" form of R. A.
// Buckingham, Proc. R. Soc. A 168, 264 (1938): its minimum is at r_m with
// V(r_m) = −ε (substitute r = r_m: the bracket is 6/α − 1; V′(r_m) ∝
// −6/r_m + 6/r_m = 0). The well analysis finds it without a guess.
func TestExp6(t *testing.T) {
	form, err := formula.NewForm(formula.Decl{
		Key:     "exp6",
		Formula: "epsilon/(1 - 6/alpha)*(6/alpha*exp(alpha*(1 - r/rm)) - (rm/r)^6)",
		Params: []formula.ParamDecl{
			{Name: "epsilon", Unit: "eV", Constraint: "> 0"},
			{Name: "rm", Unit: "A", Constraint: "> 0"},
			{Name: "alpha", Unit: "1", Constraint: "> 0"},
		},
	})
	require.NoError(t, err)
	for _, c := range [][3]float64{{0.0123, 3.76, 14}, {0.01, 4.0, 12}, {1.5, 2.0, 15.5}, {0.0042, 3.1, 13.5}} {
		p, err := form.New(c[:])
		require.NoError(t, err)
		w, err := core.AnalyzeWell(p, core.WellSettings{})
		require.NoError(t, err, "%v", c)
		assert.InDelta(t, c[1], w.Re, 1e-13*c[1], "%v", c)
		assert.InDelta(t, -c[0], w.Energy, 1e-14*c[0], "%v", c)
		assert.InDelta(t, c[0], w.Depth, 1e-14*c[0], "%v", c)
		// The form turns over at short range: its inner maximum bounds
		// the domain, below r_m, above V(r_m).
		d := p.Domain()
		assert.True(t, d.Barrier, "%v", c)
		assert.Less(t, d.Min, c[1])
		assert.Greater(t, d.BarrierEnergy, -c[0])
	}
}

// A NaN or ±Inf inside the declared domain is a domain error at that r,
// never a number.
func TestNonFiniteIsDomainError(t *testing.T) {
	form, err := formula.NewForm(formula.Decl{
		Key:     "logwell",
		Formula: "De*log(r/re - 1)^2 - De + 0*De*r/re",
		Limit:   "none",
		Params:  []formula.ParamDecl{{Name: "De", Unit: "eV"}, {Name: "re", Unit: "A"}},
	})
	require.NoError(t, err)
	p, err := form.New([]float64{1, 1})
	require.NoError(t, err)
	rs := []float64{2.5, 3, 0.5, 4}
	dst := make([]float64, len(rs))
	err = coretest.Batch(p, 0, rs, dst)
	require.ErrorIs(t, err, core.ErrDomain)
	var pe *core.PointError
	require.ErrorAs(t, err, &pe)
	assert.Equal(t, 2, pe.Index)
	assert.Equal(t, 0.5, pe.R)
	assert.Contains(t, err.Error(), "r = 0.5 Å")
	_, err = core.Value(p, 0.5)
	assert.ErrorIs(t, err, core.ErrDomain)
	// At r = re·2 the log vanishes: finite value, but its square's
	// derivatives are fine; at r = re the argument is 0: −Inf.
	_, err = core.Derivative(p, 1, 1)
	assert.ErrorIs(t, err, core.ErrDomain)
}

// Domains, limits and parameter checks at New.
func TestNewDomainAndLimit(t *testing.T) {
	decl := func(f, rmin, limit string) formula.Decl {
		return formula.Decl{Key: "x", Formula: f, RMin: rmin, Limit: limit,
			Params: []formula.ParamDecl{{Name: "De", Unit: "eV", Constraint: "> 0"}, {Name: "a", Unit: "1/A", Constraint: "> 0"}}}
	}
	morse := "De*(1 - exp(2 - a*r))^2"
	tests := []struct {
		d       formula.Decl
		min     float64
		limit   float64
		errText string
	}{
		{d: decl(morse, "", ""), limit: 2}, // numerical limit De
		{d: decl(morse, "0.5/a", "De"), min: 0.25, limit: 2},
		{d: decl("De*(a*r)^2", "", "none"), limit: math.Inf(1)},
		{d: decl("De*(a*r)^2", "", ""), limit: math.Inf(1)}, // grows: unbounded
		{d: decl(morse, "", "0"), errText: "declared limit 0 = 0 eV, but V(r) tends to 2 eV"},
		{d: decl("-De*(a*r)^2", "", ""), errText: "decreases without bound"},
		{d: decl("De*log(a*r)", "", ""), limit: math.Inf(1)},
		{d: decl("De*(a*r)^-0.05", "", ""), errText: "cannot be found numerically"},
		{d: decl(morse, "-1", ""), errText: "negative"},
		{d: decl("De*log(a*a/(a*a) - 3)*a*r", "", "none"), errText: "'log(a*a/(a*a) - 3)' is NaN for these parameters"},
	}
	for _, tt := range tests {
		f, err := formula.NewForm(tt.d)
		require.NoError(t, err, tt.d.Formula)
		p, err := f.New([]float64{2, 2})
		if tt.errText != "" {
			require.Error(t, err, tt.d.Formula)
			assert.Contains(t, err.Error(), tt.errText)
			continue
		}
		require.NoError(t, err, tt.d.Formula)
		d := p.Domain()
		assert.False(t, d.Barrier, tt.d.Formula)
		assert.Equal(t, tt.min, d.Min, tt.d.Formula)
		assert.Equal(t, tt.limit, d.Limit, tt.d.Formula)
	}
	// Parameter constraints as declared.
	f, err := formula.NewForm(decl(morse, "", ""))
	require.NoError(t, err)
	_, err = f.New([]float64{-1, 2})
	assert.ErrorIs(t, err, core.ErrParam)
}

// Bad declarations: one clear message each.
func TestDeclErrors(t *testing.T) {
	good := func() formula.Decl {
		return formula.Decl{Key: "x", Formula: "De*(1 - exp(-a*(r - re)))^2 - De",
			Params: []formula.ParamDecl{{Name: "De", Unit: "eV"}, {Name: "a", Unit: "1/A"}, {Name: "re", Unit: "A"}}}
	}
	tests := []struct {
		mutate  func(*formula.Decl)
		contain string
	}{
		{func(d *formula.Decl) { d.Key = "a:b" }, `key "a:b"`},
		{func(d *formula.Decl) { d.Formula = " " }, "no formula"},
		{func(d *formula.Decl) { d.Params[0].Unit = "" }, `parameter "De" has no unit`},
		{func(d *formula.Decl) { d.Params[0].Unit = "furlong" }, `parameter "De": invalid unit "furlong"`},
		{func(d *formula.Decl) { d.Params[0].Unit = "K" }, "values may still be given in K"},
		{func(d *formula.Decl) { d.Params[0].Unit = "u" }, "unit \"u\" is a mass: a parameter's unit must be a product of powers of energy and length units"},
		{func(d *formula.Decl) { d.Params[0].Constraint = "< 3" }, `constraint "< 3": allowed are`},
		{func(d *formula.Decl) { d.Params[1].Unit = "A" }, "exp argument '-a*(r - re)' has dimension length^2"},
		{func(d *formula.Decl) { d.Params = append(d.Params, formula.ParamDecl{Name: "re", Unit: "A"}) }, `"re" declared twice`},
		{func(d *formula.Decl) { d.RMin = "De" }, "r_min: the expression 'De' has dimension energy: expected length"},
		{func(d *formula.Decl) { d.Limit = "re" }, "limit: the expression 're' has dimension length: expected energy"},
		{func(d *formula.Decl) { d.Limit = "r*De" }, "r is not allowed here"},
	}
	for _, tt := range tests {
		d := good()
		tt.mutate(&d)
		_, err := formula.NewForm(d)
		require.Error(t, err, tt.contain)
		assert.Contains(t, err.Error(), tt.contain)
		assert.NotContains(t, err.Error(), "\n")
	}
	// An unused parameter is a warning, not an error.
	d := good()
	d.Params = append(d.Params, formula.ParamDecl{Name: "C8", Unit: "eV*A^8"})
	f, err := formula.NewForm(d)
	require.NoError(t, err)
	assert.Equal(t, []string{`form "x": parameter C8 is declared but not used in the formula`}, f.Warnings())
	// A declared unit is the unit of bare numbers; values with a suffix
	// may use any unit of the dimension.
	d = good()
	d.Params[1].Unit = "1/nm"
	f, err = formula.NewForm(d)
	require.NoError(t, err)
	inst, err := core.BuildSpec(f, core.Spec{Model: "x", Params: []core.Assignment{{Name: "De", Value: "4.6"}, {Name: "a", Value: "18.7"}, {Name: "re", Value: "127pm"}}})
	require.NoError(t, err)
	assert.InDeltaSlice(t, []float64{4.6, 1.87, 1.27}, inst.Params, 1e-14)
	assert.Equal(t, "a [1/nm, finite]", f.Info().Params[1].String())
}

// The potential is deterministic: the same bits from a batched and a single-point Taylor call,
// one point or many, and across goroutines (the conformance suite checks
// this for every form through pairwell check).
func TestBatchEqualsSinglePoint(t *testing.T) {
	form, err := formula.NewForm(varshniDecl)
	require.NoError(t, err)
	p, err := form.New([]float64{4.6, 1.27, 0.5})
	require.NoError(t, err)
	rs := make([]float64, 600)
	for i := range rs {
		rs[i] = 0.8 + 0.01*float64(i)
	}
	for n := 0; n <= 10; n++ {
		got := make([]float64, len(rs))
		require.NoError(t, coretest.Batch(p, n, rs, got))
		d := make([]float64, n+1)
		for i, r := range rs {
			require.NoError(t, coretest.Derivatives(p, r, d))
			require.Equal(t, d[n], got[i], "order %d at %g", n, r)
		}
	}
}
