package models

import (
	"math"
	"math/big"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/coretest"
)

// TestMorseTaylor checks V⁽ⁿ⁾(re)/n! against the Taylor coefficients
// cₙ = De(−a)ⁿ(2ⁿ − 2)/n! of the Morse form (Morse 1929), n = 1..12.
func TestMorseTaylor(t *testing.T) {
	for _, ps := range [][3]float64{{4.7446, 1.9426, 0.7416}, {0.3, 4.0, 2.5}, {1, 1, 1}} {
		De, a, re := ps[0], ps[1], ps[2]
		p, err := NewMorse(De, a, re)
		require.NoError(t, err)
		var d [13]float64
		require.NoError(t, coretest.Derivatives(p, re, d[:]))
		assert.InEpsilon(t, -De, d[0], 1e-15, "V(re) = −De (Morse 1929)")
		fact := 1.0
		for n := 1; n <= 12; n++ {
			fact *= float64(n)
			want := De * math.Pow(-a, float64(n)) * (math.Pow(2, float64(n)) - 2) / fact
			if n == 1 {
				assert.Zero(t, d[1], "V′(re) = 0")
				continue
			}
			assert.InEpsilon(t, want, d[n]/fact, 1e-13, "c_%d (Morse 1929)", n)
		}
	}
}

// TestMorseValues checks V against the textbook form De[(1 − e^{−a(r−re)})² − 1]
// evaluated independently.
func TestMorseValues(t *testing.T) {
	De, a, re := 4.7446, 1.9426, 0.7416
	p, err := NewMorse(De, a, re)
	require.NoError(t, err)
	assert.Equal(t, []float64{De, a, re}, p.Params())
	for _, r := range linspace(0.3, 5, 30) {
		e := 1 - math.Exp(-a*(r-re))
		want := De * (e*e - 1)
		got, err := core.Value(p, r)
		require.NoError(t, err)
		assert.InDelta(t, want, got, 1e-14*De*(1+e*e), "V(%g)", r)
	}
	v, err := core.Value(p, 1e6)
	require.NoError(t, err)
	assert.Zero(t, v, "V → 0 at dissociation")
}

// TestMorseSpectroscopic builds Morse wells from handbook constants and
// converts them back.
func TestMorseSpectroscopic(t *testing.T) {
	// Atomic masses, AME2020 (from memory), u.
	const (
		mH1   = 1.00782503223
		mCl35 = 34.968852682
		mC12  = 12 // exact by definition of u
		mO16  = 15.99491461957
	)
	// hc·(1 cm⁻¹) in eV, CODATA 2018: h·c = 1.239841984…×10⁻⁶ eV·m (exact
	// since SI 2019).
	const cmEV = 1.239841984332e-4
	cases := []struct {
		name                string
		omegaE, omegaExe, r float64
		mu                  float64
	}{
		// H³⁵Cl X¹Σ⁺, Huber & Herzberg 1979, Constants of Diatomic Molecules (from memory).
		{"H35Cl", 2990.946, 52.8186, 1.27455, mH1 * mCl35 / (mH1 + mCl35)},
		// ¹²C¹⁶O X¹Σ⁺, Huber & Herzberg 1979 (from memory).
		{"12C16O", 2169.81358, 13.28831, 1.128323, mC12 * mO16 / (mC12 + mO16)},
	}
	for _, c := range cases {
		ps, err := MorseFromSpectroscopic(c.omegaE, c.omegaExe, c.r, c.mu)
		require.NoError(t, err, c.name)
		De, a, re := ps[0], ps[1], ps[2]
		assert.Equal(t, c.r, re)
		// De = ωe²/(4ωexe) (Morse 1929; Herzberg 1950).
		assert.InEpsilon(t, c.omegaE*c.omegaE/(4*c.omegaExe)*cmEV, De, 1e-12, c.name)
		we, wexe := MorseSpectroscopic(De, a, c.mu)
		assert.InEpsilon(t, c.omegaE, we, 1e-12, "%s: ωe round trip", c.name)
		assert.InEpsilon(t, c.omegaExe, wexe, 1e-12, "%s: ωexe round trip", c.name)
		p, err := NewMorse(De, a, re)
		require.NoError(t, err)
		_, _, k := wellOf(t, p)
		// k = μ(2πcωe)² in SI, converted to eV/Å² independently of package
		// units: u = 1.66053906660e-27 kg, c = 299792458 m/s, e = 1.602176634e-19 C.
		omega := 2 * math.Pi * 299792458 * 100 * c.omegaE
		kSI := c.mu * 1.66053906660e-27 * omega * omega
		assert.InEpsilon(t, kSI/1.602176634e-19/1e20, k, 1e-12, "%s: k = μω²", c.name)
	}
	// H³⁵Cl from the Huber & Herzberg constants above: De = ωe²/(4ωexe)
	// ≈ 5.25 eV and k ≈ 516 N/m = 32.2 eV/Å², computed by hand.
	ps, err := MorseFromSpectroscopic(2990.946, 52.8186, 1.27455, mH1*mCl35/(mH1+mCl35))
	require.NoError(t, err)
	assert.InDelta(t, 5.25, ps[0], 0.01)
	assert.InDelta(t, 32.2, 2*ps[0]*ps[1]*ps[1], 0.1)

	for _, bad := range [][4]float64{{0, 1, 1, 1}, {1, 0, 1, 1}, {1, 1, -1, 1}, {1, 1, 1, math.NaN()}, {math.Inf(1), 1, 1, 1}} {
		_, err := MorseFromSpectroscopic(bad[0], bad[1], bad[2], bad[3])
		assert.ErrorIs(t, err, core.ErrParam, "%v", bad)
	}
}

func TestMorseMatch(t *testing.T) {
	for _, tg := range []core.Target{
		{Re: 0.7416, Depth: 4.7446, K: 35.81},
		{Re: 1.27455, Depth: 5.25, K: 32.2},
		{Re: 3.76, Depth: 0.0104, K: 0.05},
	} {
		ps, notes, err := Morse{}.Match(tg)
		require.NoError(t, err)
		assert.Empty(t, notes)
		p := mustNew(t, Morse{}, ps...)
		re, depth, k := wellOf(t, p)
		assert.InEpsilon(t, tg.Re, re, 1e-12)
		assert.InEpsilon(t, tg.Depth, depth, 1e-12)
		assert.InEpsilon(t, tg.K, k, 1e-12)
	}
	for _, tg := range []core.Target{{Re: 1, Depth: 1}, {Re: 1, K: 1}, {Depth: 1, K: 1}, {Re: -1, Depth: 1, K: 1}, {Re: 1, Depth: math.NaN(), K: 1}} {
		_, _, err := Morse{}.Match(tg)
		assert.ErrorIs(t, err, core.ErrParam, "%+v", tg)
	}
}

// TestMorseCoefficientsAtMinimum checks the closed form of the Morse
// Taylor coefficients at the minimum (Morse 1929: with y = e^{−a(r−re)},
// V = De(y² − 2y), so c_n(re) = De(−a)ⁿ(2ⁿ − 2)/n!) for n = 2…40 and up to
// MaxOrder, against the same expression evaluated in 256-bit arithmetic
// (math/big), to 1e-12 relative: no overflow, no loss of accuracy at high
// order.
func TestMorseCoefficientsAtMinimum(t *testing.T) {
	for _, ps := range [][3]float64{{4.6, 1.87, 1.27}, {0.3, 4, 2.5}, {1, 50, 10}} {
		De, a, re := ps[0], ps[1], ps[2]
		p, err := NewMorse(De, a, re)
		require.NoError(t, err)
		c := make([]float64, MaxOrder+1)
		require.NoError(t, p.Taylor(MaxOrder, []float64{re}, c))
		for n := 2; n <= MaxOrder; n++ {
			// De(−a)ⁿ(2ⁿ − 2)/n! at 256 bits.
			f := new(big.Float).SetPrec(256).SetFloat64(De)
			ma := new(big.Float).SetPrec(256).SetFloat64(-a)
			for k := 1; k <= n; k++ {
				f.Mul(f, ma)
				f.Quo(f, new(big.Float).SetPrec(256).SetInt64(int64(k)))
			}
			two := new(big.Float).SetPrec(256).SetMantExp(big.NewFloat(1), n) // 2ⁿ
			two.Sub(two, big.NewFloat(2))
			f.Mul(f, two)
			want, _ := f.Float64()
			if n > 40 && (math.IsInf(want, 0) || want == 0) {
				continue // beyond float64 for the steepest set
			}
			require.False(t, math.IsInf(c[n], 0), "c_%d", n)
			assert.InEpsilon(t, want, c[n], 1e-12, "De=%g a=%g: c_%d", De, a, n)
		}
	}
}
