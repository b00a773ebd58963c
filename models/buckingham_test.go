package models

import (
	"math"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/coretest"
)

// bkPrime is V′ = −(A/ρ)e^{−r/ρ} + 6C/r⁷ written out independently of the
// package.
func bkPrime(A, rho, C, r float64) float64 {
	return -A/rho*math.Exp(-r/rho) + 6*C/math.Pow(r, 7)
}

// bisect finds a sign change of f in [lo, hi] to the last bit.
func bisect(f func(float64) float64, lo, hi float64) float64 {
	flo := f(lo)
	for {
		mid := 0.5 * (lo + hi)
		if mid <= lo || mid >= hi {
			return mid
		}
		if fm := f(mid); (fm < 0) == (flo < 0) {
			lo, flo = mid, fm
		} else {
			hi = mid
		}
	}
}

// bkSets are Buckingham parameter sets (A, ρ, C) with a well.
var bkSets = [][3]float64{
	{18003.7572, 1 / 4.87318, 133.5381}, // BKS-like Si–O
	{1388.7730, 0.36262, 175.0},         // BKS-like O–O
	{1000, 0.3, 10},
	{22764, 0.149, 27.88}, // Catlow-like O–O: barely a well
	{1e8, 0.1, 1e-3},      // very deep repulsion: tiny barrier
	{2.5e3, 0.25, 1e-6},   // weak dispersion
	{1, 1, 1e-3},          // reduced units
	{5e4, 0.2, 50},
}

// TestBuckinghamWell compares the barrier and minimum found by New with an
// independent bisection on V′ (r_b in (0, 7ρ), r_e in (7ρ, ∞)).
func TestBuckinghamWell(t *testing.T) {
	for _, s := range bkSets {
		A, rho, C := s[0], s[1], s[2]
		p, err := NewBuckingham(A, rho, C)
		require.NoError(t, err, "%v", s)
		assert.Equal(t, []float64{A, rho, C}, p.Params())
		d := p.Domain()
		rb, vb, re := d.Min, d.BarrierEnergy, d.EquilibriumGuess
		require.Less(t, rb, 7*rho, "%v", s)
		require.Greater(t, re, 7*rho, "%v", s)
		f := func(r float64) float64 { return bkPrime(A, rho, C, r) }
		wantRe := bisect(f, 7*rho, 1e4*rho)
		wantRb := bisect(f, 1e-6*rho, 7*rho)
		assert.InEpsilon(t, wantRe, re, 1e-14, "r_e of %v", s)
		assert.InEpsilon(t, wantRb, rb, 1e-14, "r_b of %v", s)
		// Residual: V′ vanishes relative to its terms 6C/r⁷.
		for _, r := range []float64{rb, re} {
			var c [2]float64
			p.row(r, c[:])
			assert.InDelta(t, 0, c[1], 1e-14*6*C/math.Pow(r, 7), "V′(%g) of %v", r, s)
		}
		assert.InEpsilon(t, A*math.Exp(-rb/rho)-C/math.Pow(rb, 6), vb, 1e-13, "V(r_b)")
		assert.Equal(t, core.Domain{Min: rb, Max: math.Inf(1), Barrier: true, BarrierEnergy: vb, Limit: 0, EquilibriumGuess: re}, d)
		// Maximum at r_b, minimum at r_e.
		var cb [3]float64
		p.row(rb, cb[:])
		assert.Less(t, cb[2], 0.0)
		var dd [3]float64
		require.NoError(t, coretest.Derivatives(p, re, dd[:]))
		assert.Greater(t, dd[2], 0.0)
		assert.Less(t, dd[0], 0.0)
		assert.Greater(t, vb, dd[0])
		// Just above the barrier works; at and below it does not.
		_, err = core.Value(p, rb*(1+1e-12))
		assert.NoError(t, err)
		_, err = core.Value(p, rb)
		assert.ErrorIs(t, err, core.ErrDomain)
		assert.ErrorContains(t, err, "collapses")
	}
}

func TestBuckinghamNoMinimum(t *testing.T) {
	for _, s := range [][3]float64{
		{1000, 0.3, 0},     // C = 0: purely repulsive
		{1e-3, 0.3, 10},    // A tiny: dispersion wins everywhere
		{22764, 0.149, 40}, // Catlow-like with C too large
		{1, 1, 1e3},
	} {
		_, err := Buckingham{}.New(s[:])
		assert.ErrorIs(t, err, core.ErrNoMinimum, "%v", s)
		assert.ErrorContains(t, err, "no well", "%v", s)
	}
	// Threshold: (A/ρ)(7ρ)⁷e⁻⁷ = 6C exactly is a double root (inflection),
	// not a minimum; just above it there is a narrow well.
	A, rho := 1000.0, 0.3
	C0 := A / rho * math.Pow(7*rho, 7) * math.Exp(-7) / 6
	_, err := NewBuckingham(A, rho, C0*1.0001)
	assert.ErrorIs(t, err, core.ErrNoMinimum)
	p, err := NewBuckingham(A, rho, C0*0.9999)
	require.NoError(t, err)
	assert.InDelta(t, 7*rho, p.Domain().Min, 0.05*rho)
	assert.InDelta(t, 7*rho, p.Domain().EquilibriumGuess, 0.05*rho)
}

// TestBuckinghamMatch checks Match against targets across the range of
// κ = K·re²/Depth (a Morse well has κ = 2(a·re)²; H₂ ≈ 4, HCl ≈ 10,
// Lennard-Jones 72) and verifies the resulting well independently.
func TestBuckinghamMatch(t *testing.T) {
	for _, tg := range []core.Target{
		{Re: 0.7416, Depth: 4.7446, K: 35.81}, // H₂-like, κ ≈ 4.1
		{Re: 1.27455, Depth: 5.25, K: 32.2},   // HCl-like, κ ≈ 10
		{Re: 3.816, Depth: 0.0104, K: 0.0514}, // LJ-like, κ ≈ 72
		{Re: 1.6, Depth: 1, K: 78},            // κ ≈ 200
		{Re: 2, Depth: 0.5, K: 250},           // κ = 2000
		{Re: 2, Depth: 1, K: 0.5},             // κ = 2: soft, near the inflection limit
	} {
		ps, notes, err := Buckingham{}.Match(tg)
		require.NoError(t, err, "%+v", tg)
		assert.Empty(t, notes)
		assert.Less(t, 7*ps[1], tg.Re, "re > 7ρ")
		assert.Greater(t, ps[2], 0.0, "C > 0")
		p := mustNew(t, Buckingham{}, ps...)
		re, depth, k := wellOf(t, p)
		assert.InEpsilon(t, tg.Re, re, 1e-12, "re of %+v", tg)
		assert.InEpsilon(t, tg.Depth, depth, 1e-12, "Depth of %+v", tg)
		assert.InEpsilon(t, tg.K, k, 1e-12, "K of %+v", tg)
		// Independent check of the minimum position.
		f := func(r float64) float64 { return bkPrime(ps[0], ps[1], ps[2], r) }
		assert.InEpsilon(t, tg.Re, bisect(f, 7*ps[1], 1e4*ps[1]), 1e-12, "bisection re of %+v", tg)
	}
	for _, tg := range []core.Target{
		{Re: 1, Depth: 1}, {Re: 1, K: 1}, {Depth: 1, K: 1}, {Re: 1, Depth: -1, K: 1},
		{Re: 1, Depth: 1e-3, K: 1e3}, // κ = 10⁶: A = …e^{κ/6} overflows
	} {
		_, _, err := Buckingham{}.Match(tg)
		assert.ErrorIs(t, err, core.ErrParam, "%+v", tg)
	}
}
