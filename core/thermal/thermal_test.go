package thermal

import (
	"math"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
	"gonum.org/v1/gonum/integrate/quad"
	"gonum.org/v1/gonum/mathext"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/coretest"
	"github.com/pairwell/pairwell/core/levels"
	"github.com/pairwell/pairwell/core/units"
	"github.com/pairwell/pairwell/models"
)

// Illustrative Morse bond (HCl-like, not fitted): De = 4.6 eV, a = 1.87/Å,
// re = 1.27 Å.
const mDe, mA, mRe = 4.6, 1.87, 1.27

func morse(t testing.TB) core.Potential {
	p, err := models.Morse{}.New([]float64{mDe, mA, mRe})
	require.NoError(t, err)
	return p
}

// gonumMean is the classical 1D ⟨x⟩ and ⟨x²⟩ over [lo, hi] by gonum's
// fixed Gauss–Legendre rule on 200 panels of 100 nodes (a general-purpose
// reference).
func gonumMean(t *testing.T, p core.Potential, T, lo, hi float64) (mx, mx2 float64) {
	beta := 1 / (units.BoltzmannEV * T)
	re := mRe
	ve, err := core.Value(p, re)
	require.NoError(t, err)
	var z, s1, s2 float64
	const panels = 200
	h := (hi - lo) / panels
	for k := 0; k < panels; k++ {
		a, b := lo+float64(k)*h, lo+float64(k+1)*h
		for m, acc := range []*float64{&z, &s1, &s2} {
			*acc += quad.Fixed(func(r float64) float64 {
				v, err := core.Value(p, r)
				require.NoError(t, err)
				return math.Pow(r-re, float64(m)) * math.Exp(-beta*(v-ve))
			}, a, b, 100, nil, 0)
		}
	}
	return s1 / z, s2 / z
}

func TestMorseClassical(t *testing.T) {
	p := morse(t)
	e, err := New(p, Settings{})
	require.NoError(t, err)
	ts := []float64{1, 10, 100, 300, 1000, 2000}
	pts, err := e.Points(ts, nil)
	require.NoError(t, err)
	for i, pt := range pts {
		kT := units.BoltzmannEV * ts[i]
		// Cubic term, Morse: ⟨x⟩ = 3k_BT/(4aDe) (from Kittel's formula with
		// c₂ = De·a², c₃ = −De·a³).
		cubic := 3 * kT / (4 * mA * mDe)
		assert.InDelta(t, cubic, pt.MeanCubic-mRe, 1e-12*cubic+1e-15)
		// The classical mean approaches it at low T, with a relative
		// difference of order k_BT/De.
		mx := pt.MeanClassical - mRe
		assert.InDelta(t, cubic, mx, 3*kT/mDe*cubic, "%g K", ts[i])
		// Against gonum over the same bound region, ΔV < 0.9·De.
		_, lo, hi := e.Cut()
		rx, rx2 := gonumMean(t, p, ts[i], lo, hi)
		t.Logf("%g K: <x> = %.12e (gonum %.12e, cubic %.6e, est %.1e) rms %.6e harmonic %.6e  alpha %.4e cubic %.4e",
			ts[i], mx, rx, cubic, pt.ClassicalError, pt.RMSClassical, pt.RMSHarmonic, pt.ExpansionClassical, pt.ExpansionCubic)
		assert.InDelta(t, rx, mx, 1e-9*math.Abs(rx))
		assert.GreaterOrEqual(t, pt.ClassicalError+1e-15, math.Abs(mx-rx))
		assert.InDelta(t, math.Sqrt(rx2-rx*rx), pt.RMSClassical, 1e-9*pt.RMSClassical)
		// d⟨x⟩/dT against a central difference of the gonum means.
		h := 1e-3 * ts[i]
		xp, _ := gonumMean(t, p, ts[i]+h, lo, hi)
		xm, _ := gonumMean(t, p, ts[i]-h, lo, hi)
		assert.InDelta(t, (xp-xm)/(2*h)/mRe, pt.ExpansionClassical, 1e-5*math.Abs(pt.ExpansionClassical))
		assert.Zero(t, pt.EdgePopulation < 1e-300 && ts[i] > 1000)
	}
}

func TestHarmonicClassical(t *testing.T) {
	// V = ½k(r − r0)²: ⟨x⟩ = 0 and ⟨x²⟩ = k_BT/k exactly, no cut-off.
	p, err := models.Harmonic{}.New([]float64{30, 1.2})
	require.NoError(t, err)
	e, err := New(p, Settings{})
	require.NoError(t, err)
	pts, err := e.Points([]float64{10, 300, 3000}, nil)
	require.NoError(t, err)
	for _, pt := range pts {
		kT := units.BoltzmannEV * pt.Temperature
		assert.InDelta(t, 1.2, pt.MeanClassical, 1e-14)
		assert.InDelta(t, math.Sqrt(kT/30), pt.RMSClassical, 1e-11*pt.RMSClassical)
		assert.InDelta(t, pt.RMSHarmonic, pt.RMSClassical, 1e-11*pt.RMSClassical)
		assert.InDelta(t, 0, pt.ExpansionClassical, 1e-14)
		assert.Zero(t, pt.EdgePopulation)
	}
}

func TestRefusals(t *testing.T) {
	p := morse(t)
	e, err := New(p, Settings{})
	require.NoError(t, err)
	for _, T := range []float64{0, -1, math.NaN(), math.Inf(1)} {
		_, err := e.Points([]float64{T}, nil)
		require.ErrorIs(t, err, core.ErrParam)
	}
	// Near dissociation: k_BT = De/5.
	_, err = e.Points([]float64{mDe / 5 / units.BoltzmannEV}, nil)
	require.ErrorIs(t, err, core.ErrDomain)
	assert.Contains(t, err.Error(), "cut-off")
	_, err = New(p, Settings{Cutoff: 2})
	require.ErrorIs(t, err, core.ErrParam)
}

func TestBatched(t *testing.T) {
	cp := &coretest.Counting{Potential: morse(t)}
	e, err := New(cp, Settings{})
	require.NoError(t, err)
	before := cp.Calls()
	ts := make([]float64, 100)
	for i := range ts {
		ts[i] = 10 + 20*float64(i)
	}
	_, err = e.Points(ts, nil)
	require.NoError(t, err)
	assert.LessOrEqual(t, cp.Calls()-before, int64(len(e.rules)))
}

// morseLevels are the bound J = 0 levels of the Morse oscillator in closed
// form (P. M. Morse, Phys. Rev. 34, 57 (1929)):
// E_v = −De + ħω(v+½) − (ħω(v+½))²/(4De), ω = a√(2De/μ), with ⟨r⟩_v and
// ⟨r²⟩_v by our own quadrature of the Morse wavefunctions
// ψ_v ∝ z^{s/2} e^{−z/2} L_v^{(s)}(z), z = 2λe^{−a(r−re)}, λ = 2De/(ħω),
// s = 2λ − 2v − 1: with dr = −dz/(az), ⟨g(r)⟩ = ∫ g z^{s−1}e^{−z}L² dz / ∫ z^{s−1}e^{−z}L² dz,
// integrated over t = ln z by gonum's Gauss–Legendre rule on 90 panels of
// 64 nodes over [ln s − 40, ln s + 5].
func morseLevels(mu float64, vmax int) []Level {
	omega := units.AngularFrequency(2*mDe*mA*mA, mu)
	hw := units.HbarEVfs * omega
	lambda := 2 * mDe / hw
	var out []Level
	for v := 0; float64(v) < lambda-0.5 && v <= vmax; v++ {
		x := hw * (float64(v) + 0.5)
		s := 2*lambda - 2*float64(v) - 1
		var m [3]float64
		t0, t1 := math.Log(s)-40, math.Log(s)+5
		const panels = 90
		h := (t1 - t0) / panels
		// The weight is scaled by its value at the peak t = ln s.
		peak := s*math.Log(s) - s
		for k := 0; k < panels; k++ {
			for j := range m {
				m[j] += quad.Fixed(func(t float64) float64 {
					z := math.Exp(t)
					l0, l1 := 1.0, 1+s-z
					l := l0
					if v > 0 {
						l = l1
						for n := 1; n < v; n++ {
							l0, l1 = l1, ((2*float64(n)+1+s-z)*l1-(float64(n)+s)*l0)/float64(n+1)
							l = l1
						}
					}
					r := mRe - math.Log(z/(2*lambda))/mA
					return math.Pow(r, float64(j)) * math.Exp(s*t-z-peak) * l * l
				}, t0+float64(k)*h, t0+float64(k+1)*h, 64, nil, 0)
			}
		}
		out = append(out, Level{Energy: -mDe + x - x*x/(4*mDe), MeanR: m[1] / m[0], MeanSquareR: m[2] / m[0]})
	}
	return out
}

func TestMorseQuantum(t *testing.T) {
	mu := 0.9797 // ¹H³⁵Cl-like reduced mass, illustrative
	levels := morseLevels(mu, 1000)
	// v = 0 in closed form: ⟨ln z⟩ = ψ(s), so ⟨r⟩₀ = re − (ψ(2λ−1) − ln 2λ)/a
	// (digamma from gonum/mathext).
	hw := units.HbarEVfs * units.AngularFrequency(2*mDe*mA*mA, mu)
	lambda := 2 * mDe / hw
	r0 := mRe - (mathext.Digamma(2*lambda-1)-math.Log(2*lambda))/mA
	assert.InDelta(t, r0, levels[0].MeanR, 1e-12*r0)

	e, err := New(morse(t), Settings{})
	require.NoError(t, err)
	pts, err := e.Points([]float64{1, 300, 1500, 3000}, levels)
	require.NoError(t, err)
	// At 1 K only v = 0 is populated.
	assert.InDelta(t, r0, pts[0].MeanQuantum, 1e-12)
	for _, pt := range pts {
		t.Logf("%g K: quantum %.8f classical %.8f cubic %.8f; alpha q %.3e cl %.3e; rms q %.5f cl %.5f",
			pt.Temperature, pt.MeanQuantum, pt.MeanClassical, pt.MeanCubic, pt.ExpansionQuantum, pt.ExpansionClassical, pt.RMSQuantum, pt.RMSClassical)
	}
	// Quantum expansion freezes out at low T; the zero-point motion keeps
	// ⟨r⟩ above the classical value.
	assert.Less(t, pts[0].ExpansionQuantum, 1e-12)
	assert.Greater(t, pts[1].MeanQuantum, pts[1].MeanClassical)
	// Below ħω/k_B ≈ 4300 K the quantum expansion is smaller than the
	// classical one (freeze-out).
	for _, pt := range pts {
		assert.Less(t, pt.ExpansionQuantum, pt.ExpansionClassical)
	}
	// d⟨r⟩/dT of the quantum average against a central difference.
	h := 1.0
	pp, err := e.Points([]float64{3000 - h, 3000 + h}, levels)
	require.NoError(t, err)
	assert.InDelta(t, (pp[1].MeanQuantum-pp[0].MeanQuantum)/(2*h)/mRe, pts[3].ExpansionQuantum, 1e-5*pts[3].ExpansionQuantum)
}

func TestLevelSolverAgainstMorseWavefunctions(t *testing.T) {
	// The level solver (package levels) against our own quadrature of the
	// Morse wavefunctions and the closed-form Morse energies.
	mu := 0.9797
	ref := morseLevels(mu, 1000)
	res, err := levels.Solve(morse(t), mu, levels.Settings{})
	require.NoError(t, err)
	require.GreaterOrEqual(t, len(res.Levels), len(ref)-res.Unresolved-1)
	var worstE, worstR float64
	defer func() { t.Logf("worst |ΔE| = %.2e cm⁻¹, |Δ⟨r⟩| = %.2e Å", worstE, worstR) }()
	for i, l := range res.Levels {
		if i >= len(ref) || float64(l.V) > 0.8*float64(len(ref)) {
			break
		}
		r := ref[l.V]
		worstE = math.Max(worstE, math.Abs(r.Energy-l.Energy)/units.WavenumberEV)
		worstR = math.Max(worstR, math.Abs(r.MeanR-l.MeanR))
		assert.InDelta(t, r.Energy, l.Energy, 1e-5*units.WavenumberEV, "v = %d", l.V)
		assert.InDelta(t, r.MeanR, l.MeanR, math.Max(1e-9, 2*l.MeanRAccuracy), "v = %d", l.V)
		assert.InDelta(t, r.MeanSquareR, l.MeanSquareR, 1e-8, "v = %d", l.V)
	}
	// And the thermal average built on them.
	e, err := New(morse(t), Settings{})
	require.NoError(t, err)
	var solved []Level
	for _, l := range res.Levels {
		solved = append(solved, Level{Energy: l.Energy, MeanR: l.MeanR, MeanSquareR: l.MeanSquareR})
	}
	ts := []float64{10, 300, 1000, 2500}
	a, err := e.Points(ts, solved)
	require.NoError(t, err)
	b, err := e.Points(ts, ref)
	require.NoError(t, err)
	for i := range ts {
		assert.InDelta(t, b[i].MeanQuantum, a[i].MeanQuantum, 1e-9, "%g K", ts[i])
		assert.InDelta(t, b[i].ExpansionQuantum, a[i].ExpansionQuantum, 1e-6*math.Abs(b[i].ExpansionQuantum)+1e-15, "%g K", ts[i])
	}
}
