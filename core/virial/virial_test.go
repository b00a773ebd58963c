package virial

import (
	"math"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/coretest"
	"github.com/pairwell/pairwell/core/cutoff"
	"github.com/pairwell/pairwell/core/units"
	"github.com/pairwell/pairwell/models"
	"gonum.org/v1/gonum/integrate/quad"
)

// ljSeries is the reduced classical B* = B₂/(⅔πN_Aσ³) of the Lennard-Jones
// 12-6 potential from its convergent series (J. E. Lennard-Jones, Proc. R.
// Soc. Lond. A 106, 463 (1924); Hirschfelder, Curtiss & Bird 1954, eq.
// 3.6-8):
//
//	B* = −Σ_j 2^{j+½}/(4 j!) Γ((2j−1)/4) T*^{−(2j+1)/4}.
//
// It is summed until the terms fall below 1e-17 of the sum; the terms
// alternate in size only slowly at low T*, so the sum is accurate to a few
// ulp of its largest term.
func ljSeries(tstar float64) float64 {
	sum := 0.0
	fact := 1.0
	for j := 0; j < 400; j++ {
		if j > 0 {
			fact *= float64(j)
		}
		term := math.Pow(2, float64(j)+0.5) / (4 * fact) * math.Gamma((2*float64(j)-1)/4) * math.Pow(tstar, -(2*float64(j)+1)/4)
		sum -= term
		if j > 4 && math.Abs(term) < 1e-17*math.Abs(sum) {
			break
		}
	}
	return sum
}

func TestLJSeriesHCB(t *testing.T) {
	// Hirschfelder, Curtiss & Bird 1954, Table I-B (from memory), as quoted
	// in the issue: the series reproduces them to their 5 digits.
	for _, c := range []struct{ T, B float64 }{
		{0.5, -8.7202}, {1, -2.5381}, {2, -0.62763}, {5, 0.24334}, {10, 0.46088}, {100, 0.46407},
	} {
		assert.InDelta(t, c.B, ljSeries(c.T), 6e-5*math.Max(1, math.Abs(c.B)), "T* = %g", c.T)
	}
}

func lj(t testing.TB, eps, sigma float64) core.Potential {
	p, err := models.LennardJones{}.New([]float64{eps, sigma})
	require.NoError(t, err)
	return p
}

func TestLennardJonesReduced(t *testing.T) {
	const eps, sigma = 0.0104, 3.4
	c, err := New(lj(t, eps, sigma), Settings{})
	require.NoError(t, err)
	b0 := 2 * math.Pi / 3 * cm3PerMolPerA3 * sigma * sigma * sigma
	var ts, ref []float64
	for _, ts0 := range []float64{0.3, 0.5, 0.7, 1, 1.5, 2, 3, 3.4179, 5, 10, 25.15, 50, 100, 300, 1000} {
		ts = append(ts, ts0*eps/units.BoltzmannEV)
		ref = append(ref, ljSeries(ts0))
	}
	pts, err := c.Points(ts, 0)
	require.NoError(t, err)
	for i, p := range pts {
		got := p.Classical / b0
		errTrue := math.Abs(got - ref[i])
		scale := math.Max(math.Abs(ref[i]), 1)
		t.Logf("T*=%-8.4g B*=%.15f ref=%.15f err=%.2e est=%.2e nodes=%d", ts[i]*units.BoltzmannEV/eps, got, ref[i], errTrue, p.ErrorEstimate/b0, p.Nodes)
		assert.Less(t, errTrue, 1e-10*scale, "T* = %g", ts[i])
		// The estimate does not undercut the true error (the series is
		// good to ~1e-15 of its largest term).
		assert.GreaterOrEqual(t, p.ErrorEstimate/b0+1e-14*scale, errTrue)
	}
}

// ljSeriesSlope is dB*/dT* of ljSeries, term by term.
func ljSeriesSlope(tstar float64) float64 {
	sum := 0.0
	fact := 1.0
	for j := 0; j < 400; j++ {
		if j > 0 {
			fact *= float64(j)
		}
		p := (2*float64(j) + 1) / 4
		term := math.Pow(2, float64(j)+0.5) / (4 * fact) * math.Gamma((2*float64(j)-1)/4) * p * math.Pow(tstar, -p-1)
		sum += term
		if j > 4 && math.Abs(term) < 1e-17*math.Abs(sum) {
			break
		}
	}
	return sum
}

// bisect finds a root of f in [a, b] to 1e-14 relative.
func bisect(f func(float64) float64, a, b float64) float64 {
	fa := f(a)
	for b-a > 1e-14*b {
		m := (a + b) / 2
		if fm := f(m); (fm < 0) == (fa < 0) {
			a, fa = m, fm
		} else {
			b = m
		}
	}
	return (a + b) / 2
}

func TestLennardJonesBoyleAndMaximum(t *testing.T) {
	const eps, sigma = 0.0104, 3.4
	c, err := New(lj(t, eps, sigma), Settings{})
	require.NoError(t, err)
	ch, err := c.Characteristic()
	require.NoError(t, err)
	unit := eps / units.BoltzmannEV
	// Hirschfelder, Curtiss & Bird 1954 (from memory, as quoted in the
	// issue): T*_Boyle = 3.4179, maximum of B* near T* = 25.15.
	assert.InDelta(t, 3.4179, ch.Boyle/unit, 1e-4)
	assert.InDelta(t, 25.15, ch.Max/unit, 0.01)
	// The roots of the series itself.
	boyle := bisect(ljSeries, 3, 4)
	tmax := bisect(ljSeriesSlope, 20, 30)
	t.Logf("Boyle T* = %.12f (series %.12f, est %.1e), max T* = %.10f (series %.10f, est %.1e)",
		ch.Boyle/unit, boyle, ch.BoyleError/unit, ch.Max/unit, tmax, ch.MaxError/unit)
	assert.InDelta(t, boyle, ch.Boyle/unit, 1e-9*boyle)
	assert.InDelta(t, tmax, ch.Max/unit, 1e-6*tmax)
	assert.GreaterOrEqual(t, ch.BoyleError/unit+1e-12, math.Abs(ch.Boyle/unit-boyle))
	assert.GreaterOrEqual(t, ch.MaxError/unit+1e-9, math.Abs(ch.Max/unit-tmax))
}

func TestArgon(t *testing.T) {
	// Argon as Lennard-Jones with ε/k_B = 119.8 K, σ = 3.405 Å (Hirschfelder,
	// Curtiss & Bird 1954, from memory). B₂ from the series, as quoted in
	// the issue: −47.8, −21.5, −15.5, −1.0, +12.2 cm³/mol at 200, 273.15,
	// 300, 400, 600 K; the measured values compiled by Dymond & Smith (1980)
	// are within about 1 cm³/mol (from memory).
	eps := 119.8 * units.BoltzmannEV
	c, err := New(lj(t, eps, 3.405), Settings{})
	require.NoError(t, err)
	ts := []float64{200, 273.15, 300, 400, 600}
	want := []float64{-47.8, -21.5, -15.5, -1.0, 12.2}
	pts, err := c.Points(ts, 0)
	require.NoError(t, err)
	b0 := 2 * math.Pi / 3 * cm3PerMolPerA3 * 3.405 * 3.405 * 3.405
	for i, p := range pts {
		assert.InDelta(t, want[i], p.Classical, 0.05, "%g K", ts[i])
		assert.InDelta(t, ljSeries(ts[i]/119.8)*b0, p.Classical, 1e-9*math.Abs(p.Classical)+1e-12, "%g K", ts[i])
		assert.True(t, math.IsNaN(p.QuantumCorrection))
	}
}

// ljQuantumSeries is ∫₀^∞ e^{−V/k_BT} V′² r² dr for Lennard-Jones in eV²·Å,
// from the expansion of e^{4βε(σ/r)⁶} term by term (derived here, the same
// route as the classical series): with a = 4βε and
// G(m) = ∫₀^∞ e^{−a y⁻¹²} y^{−m} dy = a^{(1−m)/12} Γ((m−1)/12)/12,
//
//	I = 16ε²σ Σ_j a^j/j! [144 G(24+6j) − 144 G(18+6j) + 36 G(12+6j)].
func ljQuantumSeries(eps, sigma, beta float64) float64 {
	a := 4 * beta * eps
	g := func(m float64) float64 { return math.Pow(a, (1-m)/12) * math.Gamma((m-1)/12) / 12 }
	sum, fact := 0.0, 1.0
	for j := 0; j < 400; j++ {
		if j > 0 {
			fact *= float64(j)
		}
		m := 6 * float64(j)
		term := math.Pow(a, float64(j)) / fact * (144*g(24+m) - 144*g(18+m) + 36*g(12+m))
		sum += term
		if j > 4 && math.Abs(term) < 1e-17*math.Abs(sum) {
			break
		}
	}
	return 16 * eps * eps * sigma * sum
}

func TestQuantumCorrectionLennardJones(t *testing.T) {
	// Argon-like (ε/k_B = 119.8 K, σ = 3.405 Å, μ = m(Ar)/2 with the
	// standard atomic weight 39.948, IUPAC).
	eps := 119.8 * units.BoltzmannEV
	const sigma, mu = 3.405, 39.948 / 2
	c, err := New(lj(t, eps, sigma), Settings{})
	require.NoError(t, err)
	ts := []float64{60, 100, 200, 500, 2000}
	pts, err := c.Points(ts, mu)
	require.NoError(t, err)
	for i, p := range pts {
		beta := 1 / (units.BoltzmannEV * ts[i])
		want := 2 * math.Pi * cm3PerMolPerA3 * wignerKirkwood(mu, beta) * ljQuantumSeries(eps, sigma, beta)
		assert.InDelta(t, want, p.QuantumCorrection, 1e-10*math.Abs(want), "%g K", ts[i])
		assert.Greater(t, p.QuantumCorrection, 0.0)
		assert.InDelta(t, p.Classical+p.QuantumCorrection, p.Total, 1e-15*math.Abs(p.Classical))
		t.Logf("%g K: B_cl = %.6f, B_qc = %.6f cm³/mol", ts[i], p.Classical, p.QuantumCorrection)
	}
}

func TestWignerKirkwoodPrefactor(t *testing.T) {
	// Independent route: the isotropic 3D harmonic oscillator
	// V = ½μω²r², whose quantum partition function is exact,
	// Z_q/Z_cl = ((x/2)/sinh(x/2))³ = 1 − x²/8 + O(x⁴), x = βħω. The ħ² term
	// of the Slater sum is −(ħ²β³/(24μ))∫e^{−βV}(∇V)²d³r, and with
	// ⟨(∇V)²⟩_cl = μ²ω⁴⟨r²⟩ = 3k/β (k = μω²) its relative size is
	// −wignerKirkwood·3k/β. ω comes from units.AngularFrequency, ħ in eV·fs.
	for _, c := range []struct{ k, mu, T float64 }{
		{30, 7, 3000}, {0.05, 20, 100}, {500, 1, 1e5},
	} {
		beta := 1 / (units.BoltzmannEV * c.T)
		x := beta * units.HbarEVfs * units.AngularFrequency(c.k, c.mu)
		exact := math.Pow(x/2/math.Sinh(x/2), 3) - 1
		wk := -wignerKirkwood(c.mu, beta) * 3 * c.k / beta
		t.Logf("x = %.3g: exact %.10e, ħ² term %.10e", x, exact, wk)
		assert.InDelta(t, -x*x/8, wk, 1e-12*x*x/8)
		// The exact value agrees with the ħ² term up to O(x⁴).
		assert.InDelta(t, exact, wk, x*x*x*x/100+1e-15)
	}
}

// gonumB2 is −2πN_A ∫_a^b (e^{−V/k_BT} − 1) r² dr − 2πN_A·(−a³/3) in
// cm³/mol by gonum's fixed Gauss–Legendre rule on 64 equal panels of
// 200 nodes each (a general-purpose reference; the integrand is negligible
// beyond b), plus the analytic tail beyond b of V = −c6/r⁶,
// Σ_j (βc6)^j/j!·b^{3−6j}/(6j − 3).
func gonumB2(t *testing.T, p core.Potential, T, a, b float64, c6 ...float64) float64 {
	beta := 1 / (units.BoltzmannEV * T)
	limit := p.Domain().Limit
	f := func(r float64) float64 {
		v, err := core.Value(p, r)
		require.NoError(t, err)
		return math.Expm1(-beta*(v-limit)) * r * r
	}
	sum := -a * a * a / 3
	const panels = 64
	h := (b - a) / panels
	for k := 0; k < panels; k++ {
		sum += quad.Fixed(f, a+float64(k)*h, a+float64(k+1)*h, 200, nil, 0)
	}
	if len(c6) > 0 {
		x, fact := 1.0, 1.0
		for j := 1; j < 20; j++ {
			x *= beta * c6[0]
			fact *= float64(j)
			sum += x / fact * math.Pow(b, 3-6*float64(j)) / (6*float64(j) - 3)
		}
	}
	return -2 * math.Pi * cm3PerMolPerA3 * sum
}

func TestMorseAgainstGonum(t *testing.T) {
	// Illustrative parameters: a van-der-Waals-like Morse well and a bond
	// at high temperature.
	for _, c := range []struct {
		De, a, re float64
		ts        []float64
	}{
		{0.01, 1.5, 3.8, []float64{30, 100, 300, 1000, 1e4, 1e6}},
		{4.4, 1.9, 1.27, []float64{5000, 2e4, 1e5, 1e7}},
	} {
		p, err := models.Morse{}.New([]float64{c.De, c.a, c.re})
		require.NoError(t, err)
		calc, err := New(p, Settings{})
		require.NoError(t, err)
		pts, err := calc.Points(c.ts, 0)
		require.NoError(t, err)
		for i, pt := range pts {
			// Morse is finite at r = 0: integrate from 0 unless the wall
			// reaches 50 k_BT, and out to where e^{−a(r−re)} < 1e-25.
			ref := gonumB2(t, p, c.ts[i], 0, c.re+58/c.a)
			t.Logf("De=%g T=%g: B2 = %.15g ref %.15g est %.2e (core %.4g Å)", c.De, c.ts[i], pt.Classical, ref, pt.ErrorEstimate, pt.Core)
			assert.InDelta(t, ref, pt.Classical, 1e-10*math.Max(1, math.Abs(ref)))
		}
	}
}

func buckingham(t testing.TB, params ...float64) core.Potential {
	if len(params) == 0 {
		// Matched to an invented bond (re = 1.2 Å, De = 4 eV, k = 30 eV/Å²),
		// as in the demo: its barrier lies below the dissociation limit.
		var err error
		params, _, err = models.Buckingham{}.Match(core.Target{Re: 1.2, Depth: 4, K: 30})
		require.NoError(t, err)
	}
	p, err := models.Buckingham{}.New(params)
	require.NoError(t, err)
	return p
}

func TestBuckinghamHardCore(t *testing.T) {
	// Illustrative parameters of the README (A = 1500 eV, ρ = 0.3 Å,
	// C = 25 eV·Å⁶): a barrier well above the dissociation limit.
	p := buckingham(t, 1500, 0.3, 25)
	_, err := New(p, Settings{RefuseCollapse: true})
	require.ErrorIs(t, err, core.ErrDomain)
	assert.Contains(t, err.Error(), "barrier")

	c, err := New(p, Settings{})
	require.NoError(t, err)
	rb, vb, ok := c.HardCore()
	require.True(t, ok)
	require.Equal(t, p.Domain().Min, rb)
	// Low temperature: the wall reaches 50 k_BT above the barrier; high
	// temperature (barrier within reach): the hard core at r_b decides.
	tHigh := vb / units.BoltzmannEV / 5
	pts, err := c.Points([]float64{3000, tHigh}, 0)
	require.NoError(t, err)
	assert.Greater(t, pts[0].Core, rb)
	assert.Equal(t, rb, pts[1].Core)
	re, _ := c.Equilibrium()
	for i, T := range []float64{3000, tHigh} {
		ref := gonumB2(t, p, T, pts[i].Core, re+40, 25)
		assert.InDelta(t, ref, pts[i].Classical, 1e-10*math.Max(1, math.Abs(ref)), "%g K", T)
	}
	// With a mass, the hard core within reach has no ħ² correction.
	_, err = c.Points([]float64{tHigh}, 10)
	require.ErrorIs(t, err, core.ErrDomain)
	_, err = c.Points([]float64{3000}, 10)
	require.NoError(t, err)

	// A barrier below the limit: the hard core decides at every
	// temperature.
	bk, _, err := models.Buckingham{}.Match(core.Target{Re: 1.2, Depth: 4, K: 30})
	require.NoError(t, err)
	p = buckingham(t, bk...)
	c, err = New(p, Settings{})
	require.NoError(t, err)
	rb, vb, ok = c.HardCore()
	require.True(t, ok)
	require.Less(t, vb, 0.0)
	pts, err = c.Points([]float64{3000}, 0)
	require.NoError(t, err)
	assert.Equal(t, rb, pts[0].Core)
	re, _ = c.Equilibrium()
	ref := gonumB2(t, p, 3000, rb, re+40, bk[2])
	assert.InDelta(t, ref, pts[0].Classical, 1e-10*math.Abs(ref))
}

// slowTail is V = A/r¹² − C/r³: its B₂ diverges.
type slowTail struct{}

func (slowTail) Taylor(n int, r, dst []float64) error {
	if err := core.CheckTaylor(n, 4, len(r), len(dst)); err != nil {
		return err
	}
	for i, x := range r {
		if err := core.CheckR(slowTail{}.Domain(), x); err != nil {
			return &core.PointError{Index: i, R: x, Err: err}
		}
		for k := 0; k <= n; k++ {
			// dᵏ/drᵏ r^{−m}/k! = (−1)ᵏ m(m+1)…(m+k−1)/k!·r^{−m−k}
			d := func(m float64) float64 {
				c := 1.0
				for j := 0; j < k; j++ {
					c *= -(m + float64(j)) / float64(j+1)
				}
				return c * math.Pow(x, -m-float64(k))
			}
			dst[i*(n+1)+k] = d(12) - d(3)
		}
	}
	return nil
}

func (slowTail) Domain() core.Domain { return core.Domain{Max: math.Inf(1)} }
func (slowTail) MaxOrder() int       { return 4 }

func TestRefusals(t *testing.T) {
	h, err := models.Harmonic{}.New([]float64{30, 1.2})
	require.NoError(t, err)
	_, err = New(h, Settings{})
	require.ErrorIs(t, err, core.ErrDomain)
	assert.Contains(t, err.Error(), "without bound")

	_, err = New(slowTail{}, Settings{})
	require.ErrorIs(t, err, core.ErrDomain)
	assert.Contains(t, err.Error(), "r⁻³")

	_, err = New(lj(t, 0.01, 3.4), Settings{Tolerance: -1})
	require.ErrorIs(t, err, core.ErrParam)

	c, err := New(lj(t, 0.0104, 3.4), Settings{})
	require.NoError(t, err)
	for _, T := range []float64{0, -5, math.NaN(), math.Inf(1)} {
		_, err := c.Points([]float64{300, T}, 0)
		require.ErrorIs(t, err, core.ErrParam, "T = %g", T)
	}
	_, err = c.Points([]float64{300}, math.NaN())
	require.ErrorIs(t, err, core.ErrParam)
	// β·depth = 0.0104 eV / (k_B · 0.1 K) ≈ 1207 > 600.
	_, err = c.Points([]float64{0.1}, 0)
	require.ErrorIs(t, err, core.ErrDomain)
	assert.Contains(t, err.Error(), "bound")
	// Not enough nodes for the tolerance.
	c, err = New(lj(t, 0.0104, 3.4), Settings{MaxNodes: 32, Tolerance: 1e-14})
	require.NoError(t, err)
	_, err = c.Points([]float64{30}, 0)
	require.ErrorIs(t, err, core.ErrNoConvergence)
}

func TestBatched(t *testing.T) {
	// All nodes of a round of every temperature in one call per order.
	cp := &coretest.Counting{Potential: lj(t, 0.0104, 3.4)}
	c, err := New(cp, Settings{})
	require.NoError(t, err)
	setup := cp.Calls()
	ts := make([]float64, 1000)
	for i := range ts {
		ts[i] = 20 + float64(i)
	}
	_, err = c.Points(ts, 20)
	require.NoError(t, err)
	assert.LessOrEqual(t, cp.Calls()-setup, int64(2*len(c.rules)))
	assert.LessOrEqual(t, setup, int64(20))
}

// TestEstimateNeverUndercuts: over 200 temperatures T* = 0.2 … 10⁴ the error
// estimate of the Lennard-Jones B* is never below its true error (against
// the series, good to ~1e-15 of its largest term).
func TestEstimateNeverUndercuts(t *testing.T) {
	const eps, sigma = 0.0104, 3.4
	c, err := New(lj(t, eps, sigma), Settings{})
	require.NoError(t, err)
	b0 := 2 * math.Pi / 3 * cm3PerMolPerA3 * sigma * sigma * sigma
	var ts []float64
	for k := 0; k < 200; k++ {
		ts = append(ts, 0.2*math.Pow(5e4, float64(k)/199)*eps/units.BoltzmannEV)
	}
	pts, err := c.Points(ts, 0)
	require.NoError(t, err)
	worst := 0.0
	for i, p := range pts {
		ref := ljSeries(ts[i] * units.BoltzmannEV / eps)
		e := math.Abs(p.Classical/b0 - ref)
		scale := math.Max(1, math.Abs(ref))
		assert.GreaterOrEqual(t, p.ErrorEstimate/b0+2e-15*scale, e, "T* = %g", ts[i]*units.BoltzmannEV/eps)
		assert.Less(t, e, 1e-10*scale)
		worst = math.Max(worst, e/scale)
	}
	t.Logf("worst relative error %.2e", worst)
}

// TestCutForm: a cut form declares its kinks (core.Domain.Kinks) and the
// panels end there. B₂ = −2πN_A ∫ (e^{−βV} − 1) r² dr, so B₂ of
// Lennard-Jones truncated at r_c exceeds the uncut B₂ by 2πN_A ∫_{r_c}^∞
// (e^{−βV} − 1) r² dr, computed here independently with gonum's 64-point
// Gauss–Legendre rule in u = r_c/r. (mpmath at 30 digits, the same
// integrals over [0, σ/2, σ, r_c, ∞): truncated B₂ = −235.346383902400781,
// −10.4223391252467974, 22.5116900644236022 cm³/mol at 80, 300, 1000 K,
// which the truncated form also meets.) The switched form converges too
// (its kinks at r_on and r_c).
func TestCutForm(t *testing.T) {
	eps, sigma, rc := 120*units.BoltzmannEV, 3.4, 8.5 // argon-like, illustrative
	bare, err := models.NewLennardJones(eps, sigma)
	require.NoError(t, err)
	for _, T := range []float64{80, 300, 1000} {
		beta := 1 / (units.BoltzmannEV * T)
		full, err := New(bare, Settings{})
		require.NoError(t, err)
		pf, err := full.Points([]float64{T}, 0)
		require.NoError(t, err)
		tr, err := cutoff.New(bare, cutoff.Settings{Scheme: cutoff.Truncate, Cutoff: rc})
		require.NoError(t, err)
		cut, err := New(tr, Settings{})
		require.NoError(t, err)
		pc, err := cut.Points([]float64{T}, 0)
		require.NoError(t, err)
		tail := quad.Fixed(func(u float64) float64 {
			r := rc / u
			s6 := math.Pow(sigma/r, 6)
			v := 4 * eps * (s6*s6 - s6)
			return math.Expm1(-beta*v) * r * r * rc / (u * u)
		}, 0, 1, 64, quad.Legendre{}, 0)
		want := pf[0].Classical + 2*math.Pi*cm3PerMolPerA3*tail
		assert.InDelta(t, want, pc[0].Classical, 1e-9*math.Abs(pf[0].Classical)+pc[0].ErrorEstimate+pf[0].ErrorEstimate, "T = %g K", T)
		assert.InEpsilon(t, map[float64]float64{80: -235.346383902400781, 300: -10.4223391252467974, 1000: 22.5116900644236022}[T], pc[0].Classical, 1e-9, "mpmath, T = %g K", T)
		sw, err := cutoff.New(bare, cutoff.Settings{Scheme: cutoff.Switch2, Cutoff: rc, SwitchOn: 7})
		require.NoError(t, err)
		cs, err := New(sw, Settings{})
		require.NoError(t, err)
		_, err = cs.Points([]float64{T}, 0)
		require.NoError(t, err, "switched form at %g K", T)
	}
}
