// Package models holds pairwell's built-in pair-potential forms: Morse,
// Lennard-Jones 12-6, Buckingham (exp-6) and harmonic.
//
// Each form is a core.Model (Morse, LennardJones, Buckingham, Harmonic;
// their zero values are ready to use) whose New builds an immutable
// potential (*MorsePotential, *LennardJonesPotential, *BuckinghamPotential,
// *HarmonicPotential) safe for concurrent use. Every model also implements
// core.Matcher, every potential reports its closed-form minimum in
// Domain().EquilibriumGuess and declares its published identities
// (conformance.Identifier).
//
// Units are pairwell's: energy eV, length Å, mass u; the Taylor coefficient
// c_k = V⁽ᵏ⁾/k! is in eV/Åᵏ.
//
// Evaluation. Each form has one evaluation method, Taylor, with closed-form
// normalized coefficients of every order up to MaxOrder, computed without
// forming k! or raw derivatives, so that they stay finite where V⁽ᵏ⁾
// would overflow. It does not allocate. A coefficient that overflows
// float64 anyway (for instance V itself at r → 0) is reported as an error
// wrapping core.ErrDomain instead of being returned as ±Inf.
// Morse and Buckingham use the package's own exp (see below), correctly
// rounded in all but about 0.1% of cases and shorter in latency than
// math.Exp.
package models

import (
	"fmt"
	"math"
	"math/big"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/cutoff"
)

// MaxOrder is the highest derivative order of every built-in form. The
// closed forms hold at any order; 100 keeps the coefficient tables small
// while being far above what any analysis needs (anharmonic expansions
// stop well below order 20).
const MaxOrder = 100

// origin is ModelInfo.Origin for the forms in this package.
const origin = "built-in"

// Builtin returns the built-in models: morse, lennard-jones, buckingham,
// harmonic, in that order.
func Builtin() []core.Model {
	return []core.Model{Morse{}, LennardJones{}, Buckingham{}, Harmonic{}}
}

// NewRegistry returns a fresh registry holding the built-in models, with
// the cutoff schemes of package cutoff for specs SPEC@cut=… installed
// (core.Registry.SetCutoff).
func NewRegistry() *core.Registry {
	r, err := core.NewRegistry(Builtin()...)
	if err != nil {
		// The built-in keys and aliases are distinct; this cannot happen.
		panic("models: " + err.Error())
	}
	r.SetCutoff(cutoff.FromSpec)
	return r
}

// binom12 and binom6 hold the normalized derivative coefficients of r^{−m}
// for m = 12 and m = 6, n = 0, …, MaxOrder:
//
//	dⁿ r^{−m}/drⁿ / n! = (−1)ⁿ C(m+n−1, n)·r^{−m−n},
//
// so binomM[n] = (−1)ⁿ C(m+n−1, n), built by C(m+n−1, n) = C(m+n−2, n−1)·(m+n−1)/n.
// They are shared by Lennard-Jones (both) and Buckingham (dispersion term).
var (
	binom12 = binomTable(12)
	binom6  = binomTable(6)
)

func binomTable(m int) *[MaxOrder + 1]float64 {
	var t [MaxOrder + 1]float64
	t[0] = 1
	for n := 1; n <= MaxOrder; n++ {
		t[n] = -t[n-1] * float64(m+n-1) / float64(n)
	}
	return &t
}

// finite reports whether v is neither ±Inf nor NaN.
func finite(v float64) bool { return v-v == 0 }

// firstOverflow returns the error for the first non-finite coefficient of
// the row of c_0, c_1, … at r. It is the slow path of Taylor, called only
// when one was produced.
func firstOverflow(key string, r float64, row []float64) error {
	for k, v := range row {
		if !finite(v) {
			return fmt.Errorf("%s: %w", key, core.OverflowError(r, k))
		}
	}
	return nil
}

// pointError wraps err for point i of a Taylor call.
func pointError(i int, r float64, err error) error {
	return &core.PointError{Index: i, R: r, Err: err}
}

// positive reports whether v is finite and > 0.
func positive(v float64) bool { return v > 0 && finite(v) }

// expTableBits is log₂ of the size of the 2^{j/N} table used by exp.
const (
	expTableBits = 7
	expN         = 1 << expTableBits
)

// Constants of exp: invLn2N = N/ln 2; ln2hiN + ln2loN = ln 2/N with ln2hiN
// holding the leading 36 bits, so that k·ln2hiN is exact for |k| < 2¹⁷;
// expShift = 1.5·2⁵² rounds to an integer by addition.
const (
	invLn2N  = expN / math.Ln2
	ln2hiN   = 0x1.62e42fefa0000p-8
	ln2loN   = math.Ln2/expN - ln2hiN
	expShift = 0x1.8p52
	expC3    = 1.0 / 6
	expC4    = 1.0 / 24
	expC5    = 1.0 / 120
)

// expTable[j] holds the bits of 2^{j/N}, correctly rounded, minus j<<(52−7),
// so that adding k<<(52−7) for k = N·m + j gives the bits of 2^{m + j/N}.
var expTable, expTail = func() (*[expN]uint64, *[expN]float64) {
	var t [expN]uint64
	var tail [expN]float64
	for j := range t {
		// 2^{j/N} = √…√(2^j), N = 2⁷: seven square roots at 160 bits.
		v := new(big.Float).SetPrec(160).SetInt(new(big.Int).Lsh(big.NewInt(1), uint(j)))
		for i := 0; i < expTableBits; i++ {
			v.Sqrt(v)
		}
		f, _ := v.Float64()
		t[j] = math.Float64bits(f) - uint64(j)<<(52-expTableBits)
		// Relative rounding error of f: 2^{j/N} = f·(1 + tail).
		d := new(big.Float).SetPrec(160).SetFloat64(f)
		d.Sub(v, d).Quo(d, big.NewFloat(f))
		tail[j], _ = d.Float64()
	}
	return &t, &tail
}()

// exp returns eˣ, like math.Exp but with a short dependency chain (≈ 40
// cycles against ≈ 120 for the amd64 assembly of math.Exp), which is what
// a single-point evaluation waits for, and 3 ns instead of 9 ns of
// throughput. Measured against 60-digit decimal eˣ on 2·10⁵ points in
// [−60, 60] its error is ≤ 0.51 ulp (math.Exp, measured
// the same way on amd64: ≤ 1.55 ulp). Arguments
// beyond ±708, where the result leaves the normal range, ±Inf and NaN go
// to math.Exp. The method is the table-driven one of musl and ARM
// optimized-routines (Szabolcs Nagy): x = k·ln2/N + r, |r| ≤ ln2/(2N),
// eˣ = 2^{k/N}·(1 + tail)·eʳ with a degree-5 polynomial for eʳ − 1
// (truncation < 10⁻¹⁸). The float64 conversions forbid fused multiply-adds,
// so results are the same on every architecture.
func exp(x float64) float64 {
	if !(x > -708 && x < 708) {
		return math.Exp(x)
	}
	kd := float64(x*invLn2N) + expShift
	ki := math.Float64bits(kd)
	kd -= expShift
	r := float64(x-float64(kd*ln2hiN)) - float64(kd*ln2loN)
	j := ki & (expN - 1)
	s := math.Float64frombits(expTable[j] + ki<<(52-expTableBits))
	r2 := float64(r * r)
	p := expTail[j] + r + float64(r2*float64(0.5+float64(r*expC3))) + float64(float64(r2*r2)*float64(expC4+float64(r*expC5)))
	return s + float64(s*p)
}
