package core_test

import (
	"math"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/models"
)

// noGuess hides a potential's EquilibriumGuess so that the analysis has to
// scan the domain.
type noGuess struct{ core.Potential }

func (p noGuess) Domain() core.Domain {
	d := p.Potential.Domain()
	d.EquilibriumGuess = 0
	return d
}

func build(t testing.TB, spec string) core.Potential {
	t.Helper()
	inst, err := models.NewRegistry().Build(spec)
	require.NoError(t, err, spec)
	return inst.Potential
}

func TestAnalyzeWellClosedForms(t *testing.T) {
	const (
		eps, sigma = 0.0104, 3.40 // Lennard-Jones ε (eV), σ (Å): argon-like, illustrative
		de, a, re  = 4.6, 1.87, 1.27
	)
	tests := []struct {
		name       string
		spec       string
		re, energy float64
		depth      float64
		k          float64
		inflection float64
	}{
		{
			// Lennard-Jones 12-6 closed forms (standard result):
			// r_min = 2^{1/6}σ, V(r_min) = −ε, V″(r_min) = 36·2^{2/3}ε/σ²,
			// inflection where V″ = 0: r = (26/7)^{1/6}σ.
			name: "lennard-jones", spec: "lj:epsilon=0.0104,sigma=3.40",
			re: math.Pow(2, 1.0/6) * sigma, energy: -eps, depth: eps,
			k:          36 * math.Pow(2, 2.0/3) * eps / (sigma * sigma),
			inflection: math.Pow(26.0/7, 1.0/6) * sigma,
		},
		{
			// Morse 1929 (Phys. Rev. 34, 57): V(re) = −De, V″(re) = 2De·a²;
			// V″ = De·a²(4y² − 2y) vanishes at y = e^{−a(r−re)} = ½, r = re + ln2/a.
			name: "morse", spec: "morse:De=4.6,a=1.87,re=1.27",
			re: re, energy: -de, depth: de, k: 2 * de * a * a,
			inflection: re + math.Ln2/a,
		},
		{
			// Harmonic ½k(r−r0)²: minimum at r0, V″ = k, no inflection.
			name: "harmonic", spec: "harmonic:k=30,r0=1.2",
			re: 1.2, energy: 0, depth: math.Inf(1), k: 30, inflection: math.NaN(),
		},
	}
	for _, tt := range tests {
		for _, hide := range []bool{false, true} {
			p := build(t, tt.spec)
			if hide {
				p = noGuess{p}
			}
			w, err := core.AnalyzeWell(p, core.WellSettings{Order: 6})
			require.NoError(t, err, tt.name)
			assert.InEpsilon(t, tt.re, w.Re, 1e-14, "%s re (scan=%v)", tt.name, hide)
			assert.InDelta(t, tt.energy, w.Energy, 1e-14*math.Abs(tt.depth+1), "%s V(re)", tt.name)
			if math.IsInf(tt.depth, 1) {
				assert.True(t, math.IsInf(w.Depth, 1), "%s depth", tt.name)
				assert.False(t, w.Bounded())
			} else {
				assert.InEpsilon(t, tt.depth, w.Depth, 1e-13, "%s depth", tt.name)
			}
			assert.InEpsilon(t, tt.k, w.K, 1e-12, "%s k", tt.name)
			assert.Len(t, w.Taylor, 7)
			assert.InDelta(t, 0, w.Taylor[1], 1e-12*tt.k, "%s c1", tt.name)
			if math.IsNaN(tt.inflection) {
				assert.True(t, math.IsNaN(w.Inflection), "%s inflection", tt.name)
			} else {
				assert.InEpsilon(t, tt.inflection, w.Inflection, 1e-13, "%s inflection", tt.name)
			}
		}
	}
}

func TestAnalyzeWellMorseTaylor(t *testing.T) {
	// Morse 1929: c_n = De(−a)ⁿ(2ⁿ − 2)/n! for n ≥ 1.
	const de, a = 4.6, 1.87
	w, err := core.AnalyzeWell(build(t, "morse:De=4.6,a=1.87,re=1.27"), core.WellSettings{Order: 12})
	require.NoError(t, err)
	fact := 1.0
	for n := 1; n <= 12; n++ {
		fact *= float64(n)
		want := de * math.Pow(-a, float64(n)) * (math.Pow(2, float64(n)) - 2) / fact
		if n == 1 {
			assert.InDelta(t, 0, w.Taylor[1], 1e-13)
			continue
		}
		assert.InEpsilon(t, want, w.Taylor[n], 1e-13, "c_%d", n)
	}
}

func TestAnalyzeWellErrors(t *testing.T) {
	p := build(t, "morse:De=4.6,a=1.87,re=1.27")
	_, err := core.AnalyzeWell(p, core.WellSettings{Order: 1})
	assert.ErrorIs(t, err, core.ErrOrder)
	_, err = core.AnalyzeWell(p, core.WellSettings{Order: p.MaxOrder() + 1})
	assert.ErrorIs(t, err, core.ErrOrder)
}

func TestHarmonicCODATA(t *testing.T) {
	// ω = √(k/μ) in SI with CODATA 2018: eV = 1.602176634e-19 J (exact),
	// u = 1.66053906660e-27 kg, c = 299792458 m/s (exact).
	k, mu := 30.0, 7.0
	omega := math.Sqrt(k * 1.602176634e-19 / 1e-20 / (mu * 1.66053906660e-27)) // rad/s
	h, err := core.NewHarmonic(k, mu)
	require.NoError(t, err)
	assert.InEpsilon(t, omega*1e-15, h.Omega, 1e-12)
	assert.InEpsilon(t, omega/(2*math.Pi*299792458*100), h.Wavenumber, 1e-12)
	assert.InEpsilon(t, omega/(2*math.Pi)*1e-12, h.FrequencyTHz, 1e-12)
	assert.InEpsilon(t, 2*math.Pi/omega*1e15, h.PeriodFs, 1e-12)
	for _, bad := range [][2]float64{{0, 1}, {1, 0}, {-1, 1}, {math.NaN(), 1}, {1, math.Inf(1)}} {
		_, err := core.NewHarmonic(bad[0], bad[1])
		assert.ErrorIs(t, err, core.ErrParam, "%v", bad)
	}
}

func BenchmarkWellAndHarmonic(b *testing.B) {
	p := build(b, "morse:De=4.6,a=1.87,re=1.27")
	b.ReportAllocs()
	for b.Loop() {
		w, err := core.AnalyzeWell(p, core.WellSettings{Order: 8})
		if err != nil {
			b.Fatal(err)
		}
		if _, err := core.NewHarmonic(w.K, 0.98); err != nil {
			b.Fatal(err)
		}
	}
}

// repulsive is V = A·e^{−r/ρ}, which has no minimum; its derivatives
// underflow to zero far out, which must not pass for a minimum.
type repulsive struct{}

func (repulsive) Taylor(n int, r, dst []float64) error {
	if err := core.CheckTaylor(n, 7, len(r), len(dst)); err != nil {
		return err
	}
	for i, x := range r {
		for k := 0; k <= n; k++ {
			dst[i*(n+1)+k] = 1000 * math.Pow(-1/0.3, float64(k)) / core.Factorial(k) * math.Exp(-x/0.3)
		}
	}
	return nil
}

func (repulsive) Domain() core.Domain { return core.Domain{Max: math.Inf(1)} }
func (repulsive) MaxOrder() int       { return 7 }

func TestEquilibriumRejectsUnderflowedTail(t *testing.T) {
	_, err := core.Equilibrium(repulsive{})
	assert.ErrorIs(t, err, core.ErrNoMinimum)
}

// secondOrder hides every derivative above V″ of a potential.
type secondOrder struct{ core.Potential }

func (p secondOrder) Taylor(n int, r, dst []float64) error {
	if err := core.CheckOrder(n, 2); err != nil {
		return err
	}
	return p.Potential.Taylor(n, r, dst)
}

func (secondOrder) MaxOrder() int { return 2 }

func TestAnalyzeWellSecondOrderForm(t *testing.T) {
	// Without V‴ the inflection is found by bisection on V″. Morse 1929:
	// V″ vanishes at r = re + ln2/a.
	const a, re = 1.87, 1.27
	w, err := core.AnalyzeWell(secondOrder{build(t, "morse:De=4.6,a=1.87,re=1.27")}, core.WellSettings{Order: 2})
	require.NoError(t, err)
	assert.InEpsilon(t, re+math.Ln2/a, w.Inflection, 1e-13)
	assert.InEpsilon(t, 4.6*a/2, w.MaxForce, 1e-13) // V′ = 2De·a·y(1 − y) at y = ½
}
