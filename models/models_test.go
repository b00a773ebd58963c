package models

import (
	"errors"
	"math"
	"sync"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
	"gonum.org/v1/gonum/diff/fd"

	"github.com/pairwell/pairwell/conformance"
	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/coretest"
)

// formCase is one parameter set of one form, with evaluation points in its
// range and a local length scale for finite differences.
type formCase struct {
	name   string
	model  core.Model
	params []float64
	pot    core.Potential
	rs     []float64
	// length is the distance over which V⁽ⁿ⁾ changes by O(1) relative
	// near r; the finite-difference step and tolerance scale with it.
	length func(r float64, n int) float64
}

func linspace(a, b float64, n int) []float64 {
	x := make([]float64, n)
	for i := range x {
		x[i] = a + (b-a)*float64(i)/float64(n-1)
	}
	return x
}

func mustNew(t testing.TB, m core.Model, params ...float64) core.Potential {
	t.Helper()
	p, err := m.New(params)
	require.NoError(t, err)
	return p
}

// forms returns the parameter sets used by the generic tests.
func forms(t testing.TB) []formCase {
	var cs []formCase
	add := func(name string, m core.Model, params []float64, rs func(core.Potential) []float64, length func(r float64, n int) float64) {
		p := mustNew(t, m, params...)
		cs = append(cs, formCase{name, m, params, p, rs(p), length})
	}
	// H₂-like Morse well (De, a, re).
	add("morse/H2-like", Morse{}, []float64{4.7446, 1.9426, 0.7416},
		func(core.Potential) []float64 { return linspace(0.45, 3.0, 20) },
		func(r float64, n int) float64 { return 1 / (2 * 1.9426) })
	// Stiff, narrow Morse well.
	add("morse/stiff", Morse{}, []float64{0.3, 4.0, 2.5},
		func(core.Potential) []float64 { return linspace(2.2, 4.0, 20) },
		func(r float64, n int) float64 { return 1 / (2 * 4.0) })
	// Argon-like Lennard-Jones (ε, σ).
	add("lj/Ar-like", LennardJones{}, []float64{0.0104, 3.40},
		func(core.Potential) []float64 { return linspace(2.9, 9.0, 20) },
		func(r float64, n int) float64 { return r / float64(13+n) })
	add("lj/reduced", LennardJones{}, []float64{1, 1},
		func(core.Potential) []float64 { return linspace(0.85, 3.0, 20) },
		func(r float64, n int) float64 { return r / float64(13+n) })
	bkRange := func(hi float64) func(core.Potential) []float64 {
		return func(p core.Potential) []float64 {
			rb := p.Domain().Min
			return linspace(1.05*rb, hi, 20)
		}
	}
	// BKS-like Si–O short-range part (A, ρ = 1/b, C).
	rhoBKS := 1 / 4.87318
	add("buckingham/BKS-like", Buckingham{}, []float64{18003.7572, rhoBKS, 133.5381}, bkRange(6),
		func(r float64, n int) float64 { return math.Min(rhoBKS, r/float64(7+n)) })
	add("buckingham/generic", Buckingham{}, []float64{1000, 0.3, 10}, bkRange(8),
		func(r float64, n int) float64 { return math.Min(0.3, r/float64(7+n)) })
	add("harmonic", Harmonic{}, []float64{32.2, 1.2746},
		func(core.Potential) []float64 { return linspace(0.6, 2.5, 20) },
		func(r float64, n int) float64 { return 1.2746 })
	return cs
}

func TestBuiltinAndRegistry(t *testing.T) {
	keys := []string{"morse", "lennard-jones", "buckingham", "harmonic"}
	ms := Builtin()
	require.Len(t, ms, len(keys))
	for i, m := range ms {
		info := m.Info()
		assert.Equal(t, keys[i], info.Key)
		assert.Equal(t, "built-in", info.Origin)
		assert.Equal(t, MaxOrder, info.MaxOrder)
		assert.Empty(t, info.Version)
		assert.NotEmpty(t, info.Name)
		assert.NotEmpty(t, info.Formula)
		assert.NotEmpty(t, info.Reference)
		assert.NotEmpty(t, info.Params)
		_, ok := m.(core.Matcher)
		assert.True(t, ok, "%s implements core.Matcher", info.Key)
	}
	reg := NewRegistry()
	for _, name := range []string{"morse", "Lennard-Jones", "lj", "buckingham", "harmonic"} {
		_, err := reg.Lookup(name)
		assert.NoError(t, err, name)
	}
	m, err := reg.Lookup("LJ")
	require.NoError(t, err)
	assert.Equal(t, "lennard-jones", m.Info().Key)
	assert.Equal(t, "Lennard-Jones 12-6", m.Info().Name)
	// Fresh registries are independent.
	require.NoError(t, NewRegistry().Add(fakeModel{}))
	_, err = NewRegistry().Lookup("fake")
	assert.Error(t, err)
}

type fakeModel struct{ core.Model }

func (fakeModel) Info() core.ModelInfo { return core.ModelInfo{Key: "fake"} }

func TestInterfaces(t *testing.T) {
	for _, c := range forms(t) {
		assert.Equal(t, MaxOrder, c.pot.MaxOrder(), c.name)
		assert.Positive(t, c.pot.Domain().EquilibriumGuess, "%s: EquilibriumGuess", c.name)
		_, ok := c.pot.(conformance.Identifier)
		assert.True(t, ok, "%s: Identifier", c.name)
		d := c.pot.Domain()
		assert.True(t, math.IsInf(d.Max, 1), c.name)
		for _, r := range c.rs {
			assert.True(t, d.Contains(r), "%s: %g in domain", c.name, r)
		}
	}
}

// TestFiniteDifferences checks V⁽ⁿ⁾, n = 1..6, against central finite
// differences of the analytic V⁽ⁿ⁻¹⁾ computed by gonum's diff/fd, an
// independent reference. Step h = 10⁻⁴·L with L the local length scale:
// truncation ≈ (h/L)²/6 ≈ 2·10⁻⁹ and rounding ≈ ε·L/h ≈ 10⁻¹² relative to
// the local magnitude |V⁽ⁿ⁾| + |V⁽ⁿ⁻¹⁾|/L + |V⁽ⁿ⁺¹⁾|·L, against which the
// tolerance 10⁻⁷ is relative (the sum keeps it meaningful where V⁽ⁿ⁾
// crosses zero).
func TestFiniteDifferences(t *testing.T) {
	const tol = 1e-7
	for _, c := range forms(t) {
		t.Run(c.name, func(t *testing.T) {
			var d [8]float64
			for _, r := range c.rs {
				require.NoError(t, coretest.Derivatives(c.pot, r, d[:]))
				for n := 1; n <= 6; n++ {
					L := c.length(r, n)
					f := func(x float64) float64 {
						v, err := core.Derivative(c.pot, n-1, x)
						require.NoError(t, err)
						return v
					}
					got := fd.Derivative(f, r, &fd.Settings{Formula: fd.Central, Step: 1e-4 * L})
					scale := math.Abs(d[n]) + math.Abs(d[n-1])/L + math.Abs(d[n+1])*L
					assert.InDelta(t, got, d[n], tol*scale, "%s: V^(%d)(%g): analytic %.17g, gonum fd %.17g", c.name, n, r, d[n], got)
				}
			}
		})
	}
}

// TestTaylorLayout checks the layout rules of the contract: one call over
// many points gives the bits of single-point calls, a row of order n is the
// prefix of the row of any higher order, and the core helpers return
// k!·c_k of the same bits.
func TestTaylorLayout(t *testing.T) {
	for _, c := range forms(t) {
		t.Run(c.name, func(t *testing.T) {
			const top = 12
			all := make([]float64, (top+1)*len(c.rs))
			require.NoError(t, c.pot.Taylor(top, c.rs, all))
			for n := 0; n <= top; n++ {
				rows := make([]float64, (n+1)*len(c.rs))
				require.NoError(t, c.pot.Taylor(n, c.rs, rows))
				dst := make([]float64, len(c.rs))
				require.NoError(t, coretest.Batch(c.pot, n, c.rs, dst))
				for i, r := range c.rs {
					want := all[i*(top+1)+n]
					require.Equal(t, math.Float64bits(want), math.Float64bits(rows[i*(n+1)+n]), "order %d at r = %g", n, r)
					one := make([]float64, n+1)
					require.NoError(t, c.pot.Taylor(n, []float64{r}, one))
					require.Equal(t, math.Float64bits(want), math.Float64bits(one[n]))
					require.Equal(t, math.Float64bits(want*core.Factorial(n)), math.Float64bits(dst[i]))
					v, err := core.Derivative(c.pot, n, r)
					require.NoError(t, err)
					require.Equal(t, math.Float64bits(want*core.Factorial(n)), math.Float64bits(v))
				}
			}
			// Every order up to MaxOrder at one mid-range point: all
			// coefficients finite (normalized coefficients do not
			// overflow here), and Derivative agrees or reports an
			// overflow of k!·c_k.
			r := c.rs[len(c.rs)/2]
			full := make([]float64, MaxOrder+1)
			require.NoError(t, c.pot.Taylor(MaxOrder, []float64{r}, full))
			for n := 0; n <= MaxOrder; n++ {
				v, err := core.Derivative(c.pot, n, r)
				if err != nil {
					require.ErrorIs(t, err, core.ErrDomain)
					continue
				}
				require.Equal(t, math.Float64bits(full[n]*core.Factorial(n)), math.Float64bits(v), "order %d", n)
			}
		})
	}
}

func TestNoAllocation(t *testing.T) {
	for _, c := range forms(t) {
		var d [5]float64
		rr := []float64{c.rs[3]}
		dst := make([]float64, 3*len(c.rs))
		assert.Zero(t, testing.AllocsPerRun(100, func() { _ = c.pot.Taylor(4, rr, d[:]) }), c.name)
		assert.Zero(t, testing.AllocsPerRun(100, func() { _ = c.pot.Taylor(2, c.rs, dst) }), c.name)
	}
}

func TestConcurrentUse(t *testing.T) {
	for _, c := range forms(t) {
		want := make([]float64, 4*len(c.rs))
		require.NoError(t, c.pot.Taylor(3, c.rs, want))
		var wg sync.WaitGroup
		for g := 0; g < 8; g++ {
			wg.Add(1)
			go func() {
				defer wg.Done()
				got := make([]float64, 4*len(c.rs))
				for i := 0; i < 50; i++ {
					if err := c.pot.Taylor(3, c.rs, got); err != nil {
						t.Error(err)
						return
					}
				}
				assert.Equal(t, want, got, c.name)
			}()
		}
		wg.Wait()
	}
}

// TestIdentities evaluates each declared identity through the potential.
func TestIdentities(t *testing.T) {
	const tol = 1e-12
	for _, c := range forms(t) {
		ids := c.pot.(conformance.Identifier).Identities()
		require.NotEmpty(t, ids, c.name)
		guess := c.pot.Domain().EquilibriumGuess
		var d [8]float64
		require.NoError(t, coretest.Derivatives(c.pot, guess, d[:]))
		for _, id := range ids {
			assert.NotEmpty(t, id.Source, "%s: %s", c.name, id.Name)
			switch id.Quantity {
			case conformance.EquilibriumR:
				assert.InEpsilon(t, id.Value, guess, tol, "%s: %s", c.name, id.Name)
				// V′ vanishes there relative to the curvature scale.
				assert.InDelta(t, 0, d[1], tol*d[2]*guess, "%s: V′(re)", c.name)
			case conformance.MinimumEnergy:
				assert.InDelta(t, id.Value, d[0], tol*math.Max(math.Abs(id.Value), d[2]*guess*guess), "%s: %s", c.name, id.Name)
			case conformance.DerivativeAtMinimum:
				assert.InDelta(t, id.Value, d[id.Order], tol*math.Max(math.Abs(id.Value), d[2]/math.Pow(guess, float64(id.Order-2))), "%s: %s", c.name, id.Name)
			default:
				t.Errorf("%s: unexpected quantity %v", c.name, id.Quantity)
			}
		}
	}
}

func TestEvaluationErrors(t *testing.T) {
	for _, c := range forms(t) {
		t.Run(c.name, func(t *testing.T) {
			d := make([]float64, 3)
			bad := []float64{0, -1, math.NaN(), math.Inf(1), math.Inf(-1)}
			if _, ok := c.pot.(*BuckinghamPotential); ok {
				rb := c.pot.Domain().Min
				bad = append(bad, rb, 0.5*rb, math.Nextafter(rb, 0))
			}
			for _, r := range bad {
				err := coretest.Derivatives(c.pot, r, d)
				assert.ErrorIs(t, err, core.ErrDomain, "r = %g", r)
				rs := []float64{c.rs[0], c.rs[1], r, c.rs[2]}
				err = coretest.Batch(c.pot, 1, rs, make([]float64, len(rs)))
				var pe *core.PointError
				require.True(t, errors.As(err, &pe), "r = %g: %v", r, err)
				assert.Equal(t, 2, pe.Index)
				assert.Equal(t, math.Float64bits(r), math.Float64bits(pe.R))
				assert.ErrorIs(t, err, core.ErrDomain)
			}
			// Orders.
			assert.ErrorIs(t, c.pot.Taylor(MaxOrder+1, c.rs[:1], make([]float64, MaxOrder+2)), core.ErrOrder)
			assert.ErrorIs(t, c.pot.Taylor(-1, c.rs, nil), core.ErrOrder)
			// Lengths: dst must hold (n+1)·len(r) values.
			assert.ErrorIs(t, c.pot.Taylor(0, c.rs, make([]float64, len(c.rs)-1)), core.ErrLength)
			assert.ErrorIs(t, c.pot.Taylor(0, c.rs[:1], make([]float64, 2)), core.ErrLength)
			assert.ErrorIs(t, c.pot.Taylor(2, c.rs, make([]float64, 2*len(c.rs))), core.ErrLength)
			assert.NoError(t, c.pot.Taylor(0, nil, nil))
			assert.NoError(t, c.pot.Taylor(3, nil, nil))
		})
	}
}

// TestOverflow checks that values beyond float64 are errors, not ±Inf.
func TestOverflow(t *testing.T) {
	lj := mustNew(t, LennardJones{}, 1, 1)
	d := make([]float64, 3)
	assert.ErrorIs(t, coretest.Derivatives(lj, 1e-30, d), core.ErrDomain)
	_, err := core.Derivative(lj, 0, 1e-30)
	assert.ErrorIs(t, err, core.ErrDomain)
	var pe *core.PointError
	assert.ErrorAs(t, coretest.Batch(lj, 2, []float64{1, 1e-30}, make([]float64, 2)), &pe)

	morse := mustNew(t, Morse{}, 1, 50, 10)
	assert.ErrorIs(t, coretest.Derivatives(morse, 0.1, d), core.ErrDomain) // y² = e^{2·50·9.9} overflows
	_, err = core.Derivative(morse, 0, 0.1)
	assert.ErrorIs(t, err, core.ErrDomain)
	full := make([]float64, MaxOrder+1)
	morse = mustNew(t, Morse{}, 1, 2000, 10)
	// V⁽¹⁰⁰⁾ ∝ (2a)¹⁰⁰ = 4000¹⁰⁰ ≈ 10³⁶⁰ overflows, but the normalized
	// c₁₀₀ ∝ 4000¹⁰⁰/100! ≈ 10²⁰² does not.
	require.NoError(t, morse.Taylor(MaxOrder, []float64{10}, full))
	assert.InEpsilon(t, math.Exp(100*math.Log(4000)-lgamma(101)), full[MaxOrder], 1e-12)
	_, err = core.Derivative(morse, MaxOrder, 10)
	assert.ErrorIs(t, err, core.ErrDomain)
	assert.ErrorContains(t, err, "overflows")
	v, err := core.Derivative(morse, 2, 10) // low orders are fine
	assert.NoError(t, err)
	assert.InEpsilon(t, 2*2000.0*2000, v, 1e-15)

	h := mustNew(t, Harmonic{}, 1e10, 1)
	assert.ErrorIs(t, coretest.Derivatives(h, 1e300, d), core.ErrDomain)
	_, err = core.Derivative(h, 0, 1e300)
	assert.ErrorIs(t, err, core.ErrDomain)
}

func TestBadParams(t *testing.T) {
	good := map[string][]float64{
		"morse":         {4.7446, 1.9426, 0.7416},
		"lennard-jones": {0.0104, 3.4},
		"buckingham":    {1000, 0.3, 10},
		"harmonic":      {32.2, 1.2746},
	}
	for _, m := range Builtin() {
		info := m.Info()
		g := good[info.Key]
		require.NotNil(t, g, info.Key)
		_, err := m.New(g)
		require.NoError(t, err, info.Key)
		// Wrong counts.
		for _, ps := range [][]float64{nil, g[:len(g)-1], append(append([]float64{}, g...), 1)} {
			_, err := m.New(ps)
			assert.ErrorIs(t, err, core.ErrParam, "%s: %v", info.Key, ps)
			assert.ErrorContains(t, err, info.Key)
		}
		// Each constraint of each parameter.
		for i, p := range info.Params {
			bads := []float64{math.NaN(), math.Inf(1), math.Inf(-1), -1}
			if p.Constraint == core.Positive {
				bads = append(bads, 0)
			}
			for _, b := range bads {
				ps := append([]float64{}, g...)
				ps[i] = b
				_, err := m.New(ps)
				assert.ErrorIs(t, err, core.ErrParam, "%s: %s = %g", info.Key, p.Name, b)
				assert.ErrorContains(t, err, info.Key)
				assert.ErrorContains(t, err, p.Name)
			}
		}
	}
}

// wellOf returns re, Depth and K of a potential's well, located by its
// EquilibriumGuess (exact for Morse, LJ and harmonic; the root found by New
// for Buckingham).
func wellOf(t *testing.T, p core.Potential) (re, depth, k float64) {
	t.Helper()
	re = p.Domain().EquilibriumGuess
	var d [3]float64
	require.NoError(t, coretest.Derivatives(p, re, d[:]))
	return re, p.Domain().Limit - d[0], d[2]
}

// TestExp checks the package's exp against eˣ correctly rounded to float64
// (reference values from Python's decimal module at 60 digits, an
// independent arbitrary-precision implementation) and against math.Exp.
func TestExp(t *testing.T) {
	ulp := func(v float64) float64 { return math.Nextafter(math.Abs(v), math.Inf(1)) - math.Abs(v) }
	for _, c := range [][2]float64{
		{-700.0, 9.85967654375977e-305},
		{-123.456, 2.4195825412645934e-54},
		{-50.0, 1.9287498479639178e-22},
		{-20.5, 1.2501528663867426e-09},
		{-3.3, 0.036883167401240015},
		{-0.001, 0.999000499833375},
		{-1e-10, 0.9999999999},
		{0.1, 1.1051709180756477},
		{0.7, 2.0137527074704766},
		{1.0, 2.718281828459045},
		{2.5, 12.182493960703473},
		{13.7, 890911.1659791603},
		{100.25, 3.451610733125924e+43},
		{700.0, 1.0142320547350045e+304},
		{-14.093379, 7.573964564962688e-07},
		{-27.932066, 7.400445557885383e-13},
		{12.074758, 175388.36103157228},
		{-34.205097, 1.3960954765012305e-15},
		{2.87056, 17.646897696029974},
		{-10.744887, 2.1555339488861793e-05},
		{-35.360086, 4.3985524048950883e-16},
		{0.594859, 1.8127753256185044},
		{-37.000347, 8.530087171886401e-17},
		{-5.308345, 0.0049501123781632355},
	} {
		assert.LessOrEqual(t, math.Abs(exp(c[0])-c[1]), ulp(c[1]), "exp(%v) = %v, want %v", c[0], exp(c[0]), c[1])
	}
	assert.Equal(t, 1.0, exp(0))
	assert.Equal(t, 1.0, exp(math.Copysign(0, -1)))
	for _, x := range []float64{math.NaN(), math.Inf(1), math.Inf(-1), 708, -708, 709.7, 710, -745, -746} {
		want := math.Exp(x)
		if math.IsNaN(want) {
			assert.True(t, math.IsNaN(exp(x)))
			continue
		}
		assert.Equal(t, want, exp(x), "exp(%v)", x)
	}
	// math.Exp is within about 1.5 ulp of eˣ and exp within about 0.5 ulp,
	// so they agree to 2 ulp.
	for i := 0; i < 200000; i++ {
		x := -707 + 1414*float64(i)/200000 + 1e-7*float64(i%7)
		want := math.Exp(x)
		require.LessOrEqual(t, math.Abs(exp(x)-want), 2*ulp(want), "exp(%v)", x)
	}
}

func lgamma(x float64) float64 {
	v, _ := math.Lgamma(x)
	return v
}
