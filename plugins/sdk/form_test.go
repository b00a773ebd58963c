package sdk_test

import (
	"math"
	"math/big"
	"sync"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"github.com/pairwell/pairwell/conformance"
	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/jet"
	"github.com/pairwell/pairwell/core/units"
	"github.com/pairwell/pairwell/models"
	"github.com/pairwell/pairwell/plugins/sdk"
)

// Forms written once over jets, each a published closed form, to compare
// with the hand-derived built-ins: Morse (P. M. Morse, Phys. Rev. 34, 57
// (1929)), Lennard-Jones 12-6 (J. E. Lennard-Jones, Proc. R. Soc. Lond. A
// 106, 463 (1924)) and Buckingham exp-6 (R. A. Buckingham, Proc. R. Soc.
// Lond. A 168, 264 (1938)).
var (
	jetMorse = sdk.Form{
		Meta: core.ModelInfo{Key: "jet-morse", Name: "Morse (jets)", Formula: "De[(1 − exp(−a(r − re)))² − 1]",
			Params: []core.Param{
				{Name: "De", Dimension: units.Energy, Constraint: core.Positive},
				{Name: "a", Dimension: units.InverseLength, Constraint: core.Positive},
				{Name: "re", Dimension: units.Length, Constraint: core.Positive},
			}},
		V: func(t *jet.Tape, r jet.Jet, p []float64) jet.Jet {
			y := t.Exp(t.Affine(r, -p[1], p[1]*p[2]))   // y = e^{−a(r − re)}
			return t.Mul(y, t.Affine(y, p[0], -2*p[0])) // y·De(y − 2)
		},
		DomainOf: func(p []float64) core.Domain {
			return core.Domain{Max: math.Inf(1), EquilibriumGuess: p[2]}
		},
		IdentitiesOf: func(p []float64) []conformance.Identity {
			return []conformance.Identity{
				{Name: "r_min = re", Quantity: conformance.EquilibriumR, Value: p[2], Source: "Morse 1929"},
				{Name: "V″(re) = 2De·a²", Quantity: conformance.DerivativeAtMinimum, Order: 2, Value: 2 * p[0] * p[1] * p[1], Source: "Morse 1929"},
			}
		},
	}
	jetLJ = sdk.Form{
		Meta: core.ModelInfo{Key: "jet-lj", Name: "Lennard-Jones 12-6 (jets)",
			Params: []core.Param{
				{Name: "epsilon", Dimension: units.Energy, Constraint: core.Positive},
				{Name: "sigma", Dimension: units.Length, Constraint: core.Positive},
			}},
		V: func(t *jet.Tape, r jet.Jet, p []float64) jet.Jet {
			s6 := t.PowInt(t.Scale(t.Recip(r), p[1]), 6) // (σ/r)⁶
			return t.Scale(t.Sub(t.Square(s6), s6), 4*p[0])
		},
	}
	jetBuckingham = sdk.Form{
		Meta: core.ModelInfo{Key: "jet-buckingham", Name: "Buckingham (jets)",
			Params: []core.Param{
				{Name: "A", Dimension: units.Energy, Constraint: core.Positive},
				{Name: "rho", Dimension: units.Length, Constraint: core.Positive},
				{Name: "C", Dimension: units.Dispersion, Constraint: core.NonNegative},
			}},
		V: func(t *jet.Tape, r jet.Jet, p []float64) jet.Jet {
			rep := t.Scale(t.Exp(t.Scale(r, -1/p[1])), p[0])
			return t.Sub(rep, t.Scale(t.PowInt(t.Recip(r), 6), p[2]))
		},
	}
)

func linspace(a, b float64, n int) []float64 {
	x := make([]float64, n)
	for i := range x {
		x[i] = a + (b-a)*float64(i)/float64(n-1)
	}
	return x
}

// binom returns C(m+k−1, k), the size of the normalized coefficient
// of r^{−m}: |dᵏr^{−m}/drᵏ|/k! = C(m+k−1, k)·r^{−m−k}.
func binom(m, k int) float64 {
	c := 1.0
	for j := 1; j <= k; j++ {
		c *= float64(m+j-1) / float64(j)
	}
	return c
}

// TestJetFormsMatchBuiltins: the jet-written Morse, Lennard-Jones and
// Buckingham give the coefficients of the hand-derived built-ins to 1e-13
// at orders 0–12 over 50 points each, relative to the size of the form's
// two terms at that order (Σ|c_k of each term|, from the closed forms), so
// that zero crossings of c_k, where any two correct codes differ
// relatively, do not count.
func TestJetFormsMatchBuiltins(t *testing.T) {
	const points, top, tol = 50, 12, 1e-13
	cases := []struct {
		name    string
		form    sdk.Form
		builtin core.Model
		params  []float64
		lo, hi  float64
		scale   func(p []float64, k int, r float64) float64
	}{
		{"morse", jetMorse, models.Morse{}, []float64{4.6, 1.87, 1.27}, 0.7, 5,
			func(p []float64, k int, r float64) float64 {
				y := math.Exp(-p[1] * (r - p[2]))
				f := math.Pow(p[1], float64(k)) / core.Factorial(k)
				return p[0] * f * (math.Ldexp(y*y, k) + 2*y)
			}},
		{"lennard-jones", jetLJ, models.LennardJones{}, []float64{0.0104, 3.4}, 3, 12,
			func(p []float64, k int, r float64) float64 {
				s := p[1] / r
				return 4 * p[0] * (binom(12, k)*math.Pow(s, 12) + binom(6, k)*math.Pow(s, 6)) / math.Pow(r, float64(k))
			}},
		{"buckingham", jetBuckingham, models.Buckingham{}, []float64{1500, 0.3, 25}, 1.6, 6,
			func(p []float64, k int, r float64) float64 {
				return p[0]*math.Exp(-r/p[1])/(math.Pow(p[1], float64(k))*core.Factorial(k)) +
					p[2]*binom(6, k)/math.Pow(r, float64(6+k))
			}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			jp, err := c.form.New(c.params)
			require.NoError(t, err)
			bp, err := c.builtin.New(c.params)
			require.NoError(t, err)
			rs := linspace(c.lo, c.hi, points)
			got, want := make([]float64, (top+1)*points), make([]float64, (top+1)*points)
			require.NoError(t, jp.Taylor(top, rs, got))
			require.NoError(t, bp.Taylor(top, rs, want))
			worst := 0.0
			for i, r := range rs {
				for k := 0; k <= top; k++ {
					j := i*(top+1) + k
					e := math.Abs(got[j]-want[j]) / c.scale(c.params, k, r)
					worst = math.Max(worst, e)
					assert.LessOrEqual(t, e, tol, "c_%d(%g): jets %.17g, built-in %.17g", k, r, got[j], want[j])
				}
			}
			t.Logf("%s: worst relative difference %.2g (orders 0–%d, %d points)", c.name, worst, top, points)
		})
	}
}

// TestJetMorseAtMinimum: c_n(re) = De(−a)ⁿ(2ⁿ − 2)/n! (Morse 1929) to
// 1e-12 for n = 2…40, against the expression in 256-bit arithmetic
// (math/big): the jets do not overflow.
func TestJetMorseAtMinimum(t *testing.T) {
	De, a, re := 4.6, 1.87, 1.27
	p, err := jetMorse.New([]float64{De, a, re})
	require.NoError(t, err)
	const top = 40
	c := make([]float64, top+1)
	require.NoError(t, p.Taylor(top, []float64{re}, c))
	worst := 0.0
	for n := 2; n <= top; n++ {
		f := new(big.Float).SetPrec(256).SetFloat64(De)
		for k := 1; k <= n; k++ {
			f.Mul(f, new(big.Float).SetPrec(256).SetFloat64(-a))
			f.Quo(f, new(big.Float).SetPrec(256).SetInt64(int64(k)))
		}
		two := new(big.Float).SetPrec(256).SetMantExp(big.NewFloat(1), n)
		f.Mul(f, two.Sub(two, big.NewFloat(2)))
		want, _ := f.Float64()
		worst = math.Max(worst, math.Abs(c[n]/want-1))
		assert.InEpsilon(t, want, c[n], 1e-12, "c_%d", n)
	}
	t.Logf("worst relative error %.2g (n = 2…%d)", worst, top)
}

// TestJetFormConformance runs the conformance suite on the jet-written
// Morse: derivatives, layout, determinism, concurrency, identities,
// invalid input.
func TestJetFormConformance(t *testing.T) {
	conformance.Test(t, jetMorse, []float64{4.6, 1.87, 1.27}, []float64{0.3, 4, 2.5})
}

func TestFormErrors(t *testing.T) {
	p, err := jetMorse.New([]float64{4.6, 1.87, 1.27})
	require.NoError(t, err)
	assert.Equal(t, sdk.DefaultMaxOrder, p.MaxOrder())
	var pe *core.PointError
	err = p.Taylor(1, []float64{1, -1}, make([]float64, 4))
	require.ErrorAs(t, err, &pe)
	assert.Equal(t, 1, pe.Index)
	assert.ErrorIs(t, err, core.ErrDomain)
	assert.ErrorIs(t, p.Taylor(sdk.DefaultMaxOrder+1, []float64{1}, make([]float64, sdk.DefaultMaxOrder+2)), core.ErrOrder)
	assert.ErrorIs(t, p.Taylor(2, []float64{1}, make([]float64, 2)), core.ErrLength)
	_, err = jetMorse.New([]float64{-1, 1, 1})
	assert.ErrorIs(t, err, core.ErrParam)
	_, _, err = core.Match(jetMorse, core.Target{Re: 1, Depth: 1, K: 1})
	assert.ErrorIs(t, err, core.ErrUnsupported)
	// V undefined (log of a negative number) or overflowing: domain errors.
	bad := sdk.Form{Meta: core.ModelInfo{Key: "bad"}, V: func(t *jet.Tape, r jet.Jet, _ []float64) jet.Jet {
		return t.Log(t.AddConst(r, -2))
	}}
	bp, err := bad.New(nil)
	require.NoError(t, err)
	err = bp.Taylor(0, []float64{3, 1}, make([]float64, 2))
	require.ErrorAs(t, err, &pe)
	assert.Equal(t, 1, pe.Index)
	assert.ErrorIs(t, err, core.ErrDomain)
	assert.ErrorContains(t, err, "not defined")
}

// TestFormNoAllocation: after the first call, an evaluation allocates
// nothing.
func TestFormNoAllocation(t *testing.T) {
	p, err := jetMorse.New([]float64{4.6, 1.87, 1.27})
	require.NoError(t, err)
	rs := linspace(0.8, 4, 1000)
	dst := make([]float64, 5*len(rs))
	require.NoError(t, p.Taylor(4, rs, dst))
	assert.Zero(t, testing.AllocsPerRun(20, func() { _ = p.Taylor(4, rs, dst) }))
}

func TestFormConcurrent(t *testing.T) {
	p, err := jetLJ.New([]float64{0.0104, 3.4})
	require.NoError(t, err)
	rs := linspace(3, 9, 700)
	want := make([]float64, 4*len(rs))
	require.NoError(t, p.Taylor(3, rs, want))
	var wg sync.WaitGroup
	for g := 0; g < 8; g++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			got := make([]float64, 4*len(rs))
			for i := 0; i < 20; i++ {
				if err := p.Taylor(3, rs, got); err != nil {
					t.Error(err)
					return
				}
			}
			assert.Equal(t, want, got)
		}()
	}
	wg.Wait()
}

var sink float64

// BenchmarkJetMorse compares the jet-written Morse with the built-in at
// 4096 points per call: orders 0–4 (issue target ≤ 3× the built-in) and
// order 20 (≤ 1 µs per point).
func BenchmarkJetMorse(b *testing.B) {
	params := []float64{4.7446, 1.9426, 0.7416}
	jp, err := jetMorse.New(params)
	require.NoError(b, err)
	bp, err := models.Morse{}.New(params)
	require.NoError(b, err)
	const points = 4096
	rs := linspace(0.5, 3, points)
	for _, n := range []int{4, 20} {
		dst := make([]float64, (n+1)*points)
		for _, c := range []struct {
			name string
			p    core.Potential
		}{{"jets", jp}, {"builtin", bp}} {
			b.Run(c.name+"/order"+string(rune('0'+n/10))+string(rune('0'+n%10)), func(b *testing.B) {
				b.ReportAllocs()
				for b.Loop() {
					if err := c.p.Taylor(n, rs, dst); err != nil {
						b.Fatal(err)
					}
				}
				sink = dst[0]
				b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/points, "ns/point")
			})
		}
	}
}
