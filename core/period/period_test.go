package period

import (
	"errors"
	"math"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/coretest"
	"github.com/pairwell/pairwell/models"
	"github.com/pairwell/pairwell/models/modelstest"
)

// form is a built-in potential with its well.
type form = modelstest.Form

func forms(t testing.TB) []form { return modelstest.Forms(t) }

const mu = 0.9797 // u, about H-Cl

// TestMorseClosedForm checks the exact period and the turning points
// against the closed forms of the classical Morse oscillator (standard
// result, from memory): T(E) = T₀/√(1 − E/De) and
// x± = −ln(1 ∓ √(E/De))/a.
func TestMorseClosedForm(t *testing.T) {
	const de, a, re = 4.4, 1.9, 1.27
	f := modelstest.NewForm(t, "morse", models.Morse{}, []float64{de, a, re})
	t0, err := Harmonic(f.W, mu)
	require.NoError(t, err)
	in, err := NewIntegrator(Settings{})
	require.NoError(t, err)
	for _, frac := range []float64{1e-7, 1e-5, 1e-4, 1e-3, 0.01, 0.1, 0.3, 0.5, 0.7, 0.9, 0.99} {
		E := frac * de
		r, err := in.Exact(f.P, f.W, mu, E)
		require.NoError(t, err, "E/De = %g", frac)
		want := t0 / math.Sqrt(1-frac)
		rel := math.Abs(r.Period/want - 1)
		assert.Less(t, rel, 1e-12, "period at E/De = %g", frac)
		assert.GreaterOrEqual(t, r.ErrorEstimate, rel, "error estimate at E/De = %g", frac)
		assert.Less(t, r.ErrorEstimate, 1e-11, "error estimate at E/De = %g", frac)
		s := math.Sqrt(frac)
		outer := re - math.Log1p(-s)/a
		inner := re - math.Log1p(s)/a
		assert.InEpsilon(t, outer, r.Outer, 1e-12, "outer turning point at E/De = %g", frac)
		assert.InEpsilon(t, inner, r.Inner, 1e-12, "inner turning point at E/De = %g", frac)
	}
}

// TestMorseSmallEnergyDisplacements: the displacements r± − re of the
// turning points (Result.Compression and Stretch) keep 1e-14 relative
// down to the tiniest energies, against x± = −ln(1 ∓ √(E/De))/a (closed
// form as above, with log1p).
func TestMorseSmallEnergyDisplacements(t *testing.T) {
	const de, a = 4.7, 2.0
	f := modelstest.NewForm(t, "morse", models.Morse{}, []float64{de, a, 0.74})
	var es []float64
	for lg := -30.0; lg < -0.01; lg += 0.25 {
		es = append(es, de*math.Pow(10, lg))
	}
	res, errs := Sweep(f.P, f.W, mu, es, Settings{}, nil)
	t0, err := Harmonic(f.W, mu)
	require.NoError(t, err)
	worst, worstT := 0.0, 0.0
	for i, E := range es {
		require.NoError(t, errs[i], "E = %g", E)
		// T(E) = T₀/√(1 − E/De), as in TestMorseClosedForm.
		relT := math.Abs(res[i].Period/(t0/math.Sqrt(1-E/de)) - 1)
		assert.LessOrEqual(t, relT, 1e-14, "period at E/De = %g", E/de)
		assert.LessOrEqual(t, relT, res[i].ErrorEstimate, "period error estimate at E/De = %g", E/de)
		worstT = math.Max(worstT, relT)
		s := math.Sqrt(E / de)
		stretch, compression := -math.Log1p(-s)/a, math.Log1p(s)/a
		for _, c := range []struct{ got, want float64 }{{res[i].Stretch, stretch}, {res[i].Compression, compression}} {
			rel := math.Abs(c.got/c.want - 1)
			// Above 1e-2·De the displacement is solved directly, to
			// ε·|V(re)|/(2E) ≈ 1e-14.
			assert.LessOrEqual(t, rel, 2e-14, "E/De = %g", E/de)
			worst = math.Max(worst, rel)
		}
	}
	t.Logf("worst relative error of the displacements: %.2g, of the period %.2g", worst, worstT)
}

// TestHarmonicForm: in V = ½k(r − r0)² the period is 2π√(μ/k) at every
// amplitude (the isochronous oscillator).
func TestHarmonicForm(t *testing.T) {
	f := modelstest.NewForm(t, "harmonic", models.Harmonic{}, []float64{30, 1.2})
	t0, err := Harmonic(f.W, mu)
	require.NoError(t, err)
	// A well with Taylor coefficients only up to c₂ is always integrated.
	w2, err := core.AnalyzeWell(f.P, core.WellSettings{Order: 2})
	require.NoError(t, err)
	for _, w := range []core.Well{f.W, w2} {
		for _, E := range []float64{1e-12, 1e-6, 1e-3, 0.1, 1, 10, 21} {
			r, err := Exact(f.P, w, mu, E, Settings{})
			require.NoError(t, err, "E = %g eV", E)
			assert.InEpsilon(t, t0, r.Period, 1e-12, "E = %g eV, Taylor order %d", E, len(w.Taylor)-1)
			assert.False(t, r.SmallAmplitude, "E = %g eV", E)
		}
	}
	// k = 30 eV/Å², μ = 1 u: T₀ = 2π/(√30 · 0.0982269 rad/fs) ≈ 11.679 fs
	// (ω for k = μ = 1 from the units package documentation).
	t1, err := Harmonic(f.W, 1)
	require.NoError(t, err)
	assert.InDelta(t, 11.679, t1, 1e-3)
}

// TestSmallEnergyLimit: the exact period tends to the harmonic one as
// E → 0, with T/T₀ − 1 ∝ E to first order, whose coefficient is the
// Lindstedt–Poincaré one, −δ/E (Landau & Lifshitz, Mechanics, §28). The
// coefficient (T/T₀ − 1)/(E/De) is 0.5 for Morse, 0.63 for Lennard-Jones
// and 4.9 for the stiff Buckingham well used here, hence the bound 1e-5 at
// E = 1e-6·depth; the tolerances of the ratios allow for the O(E²) term,
// whose relative size is ≈ 25·E/De for that Buckingham well.
func TestSmallEnergyLimit(t *testing.T) {
	for _, f := range forms(t) {
		if !f.W.Bounded() {
			continue
		}
		t.Run(f.Name, func(t *testing.T) {
			t0, err := Harmonic(f.W, mu)
			require.NoError(t, err)
			shift := func(frac float64, small bool) float64 {
				r, err := Exact(f.P, f.W, mu, frac*f.W.Depth, Settings{})
				require.NoError(t, err)
				if !small {
					assert.False(t, r.SmallAmplitude, "quadrature at E/depth = %g", frac)
				}
				return r.Period/t0 - 1
			}
			s6, s5, s4 := shift(1e-6, true), shift(1e-5, false), shift(1e-4, false)
			assert.Less(t, math.Abs(s6), 1e-5, "relative difference from the harmonic period at E = 1e-6 depth")
			assert.InEpsilon(t, 10, s4/s5, 5e-3, "T/T₀ − 1 scales as E")
			assert.InEpsilon(t, 10, s5/s6, 5e-4, "T/T₀ − 1 scales as E")
			d, err := PerturbativeShift(f.W, 1e-5*f.W.Depth)
			require.NoError(t, err)
			assert.InEpsilon(t, -d, s5, 5e-4, "first-order coefficient")
			zero, err := Exact(f.P, f.W, mu, 0, Settings{})
			require.NoError(t, err)
			assert.Equal(t, t0, zero.Period)
			assert.Equal(t, f.W.Re, zero.Inner)
		})
	}
}

// TestPerturbativeMorse: for Morse the second-order formula reduces to
// ω = ω₀(1 − E/(2De)), the first-order term of the closed form
// ω = ω₀√(1 − E/De) (standard result, from memory); checked to rounding
// (1e-14 relative).
func TestPerturbativeMorse(t *testing.T) {
	const de = 4.4
	f := modelstest.NewForm(t, "morse", models.Morse{}, []float64{de, 1.9, 1.27})
	t0, err := Harmonic(f.W, mu)
	require.NoError(t, err)
	for _, frac := range []float64{0, 1e-6, 0.01, 0.1, 0.5, 0.9} {
		got, err := Perturbative(f.W, mu, frac*de)
		require.NoError(t, err)
		assert.InEpsilon(t, t0/(1-frac/2), got, 1e-14, "E/De = %g", frac)
	}
	_, err = Perturbative(f.W, mu, 2.5*de)
	assert.ErrorIs(t, err, core.ErrDomain, "ω ≤ 0")
	short := f.W
	short.Taylor = short.Taylor[:4]
	_, err = Perturbative(short, mu, 0.1)
	assert.ErrorIs(t, err, core.ErrOrder)
}

func TestErrors(t *testing.T) {
	fs := forms(t)
	morse, lj, bk, harm := fs[0], fs[1], fs[2], fs[3]
	barrier := bk.P.Domain().BarrierEnergy - bk.W.Energy
	tests := []struct {
		name string
		f    form
		mu   float64
		E    float64
		want error
		text string
	}{
		{"negative energy", morse, mu, -1e-3, core.ErrParam, "≥ 0"},
		{"NaN energy", morse, mu, math.NaN(), core.ErrParam, "≥ 0"},
		{"zero mass", morse, 0, 1, core.ErrParam, "reduced mass"},
		{"morse at the depth", morse, mu, 4.4, core.ErrDomain, "dissociates"},
		{"lj above the depth", lj, mu, 0.02, core.ErrDomain, "dissociates"},
		{"buckingham above the barrier", bk, mu, barrier * 1.0001, core.ErrDomain, "collapses"},
		{"harmonic through r = 0", harm, mu, 30, core.ErrDomain, "compression"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			_, err := Exact(tt.f.P, tt.f.W, tt.mu, tt.E, Settings{})
			require.Error(t, err)
			assert.ErrorIs(t, err, tt.want)
			assert.Contains(t, err.Error(), tt.text)
		})
	}
	// Below the barrier the Buckingham oscillation exists.
	r, err := Exact(bk.P, bk.W, mu, barrier*0.999, Settings{})
	require.NoError(t, err)
	assert.Greater(t, r.Inner, bk.P.Domain().Min)
	_, err = NewIntegrator(Settings{Tolerance: -1})
	assert.ErrorIs(t, err, core.ErrParam)
	_, err = NewIntegrator(Settings{MinNodes: 64, MaxNodes: 100})
	assert.ErrorIs(t, err, core.ErrParam)
}

// TestNoConvergence: a rule cap too low for the tolerance is reported,
// with the result still filled in.
func TestNoConvergence(t *testing.T) {
	f := forms(t)[0]
	r, err := Exact(f.P, f.W, mu, 0.999*f.W.Depth, Settings{MinNodes: 2, MaxNodes: 4})
	require.Error(t, err)
	assert.True(t, errors.Is(err, core.ErrNoConvergence))
	assert.Greater(t, r.Period, 0.0)
	assert.Greater(t, r.ErrorEstimate, 1e-12)
}

func TestSweep(t *testing.T) {
	f := forms(t)[0]
	energies := []float64{0.1, 5, 1, -1, 2, 0, 4.3}
	var calls []int
	in, err := NewIntegrator(Settings{})
	require.NoError(t, err)
	res, errs := in.Sweep(f.P, f.W, mu, energies, func(done, total int) {
		assert.Equal(t, len(energies), total)
		calls = append(calls, done)
	})
	require.Len(t, res, len(energies))
	assert.Equal(t, []int{1, 2, 3, 4, 5, 6, 7}, calls)
	for i, E := range energies {
		want, wantErr := in.Exact(f.P, f.W, mu, E)
		if wantErr != nil {
			assert.Error(t, errs[i], "row %d", i)
			continue
		}
		require.NoError(t, errs[i], "row %d", i)
		assert.Equal(t, want, res[i], "row %d", i)
	}
	_, errs = Sweep(f.P, f.W, mu, energies, Settings{MaxNodes: 1}, nil)
	assert.ErrorIs(t, errs[0], core.ErrParam)
}

// BenchmarkExactPeriod is one Morse period at E = 0.3 De to 1e-10
// relative.
func BenchmarkExactPeriod(b *testing.B) {
	f := modelstest.NewForm(b, "morse", models.Morse{}, []float64{4.4, 1.9, 1.27})
	in, err := NewIntegrator(Settings{Tolerance: 1e-10})
	require.NoError(b, err)
	for b.Loop() {
		if _, err := in.Exact(f.P, f.W, mu, 1.32); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkSweep is 1000 energies, evenly spaced up to 95% of the depth
// (or of the Buckingham barrier; up to 10 eV for harmonic), for each of the
// four built-in forms, on GOMAXPROCS goroutines.
func BenchmarkSweep(b *testing.B) {
	fs := forms(b)
	grids := make([][]float64, len(fs))
	for i, f := range fs {
		top := 10.0
		if f.W.Bounded() {
			top = f.W.Depth
		}
		if d := f.P.Domain(); d.Barrier {
			top = min(top, d.BarrierEnergy-f.W.Energy)
		}
		for k := 1; k <= 1000; k++ {
			grids[i] = append(grids[i], 0.95*top*float64(k)/1000)
		}
	}
	in, err := NewIntegrator(Settings{})
	require.NoError(b, err)
	for b.Loop() {
		for i, f := range fs {
			_, errs := in.Sweep(f.P, f.W, mu, grids[i], nil)
			for _, err := range errs {
				if err != nil {
					b.Fatal(err)
				}
			}
		}
	}
}

// TestBatchedCalls: a potential in another process costs a round trip per
// call, so a sweep of many energies makes a few tens of calls in all, not
// tens per energy, and a single period about fifteen.
func TestBatchedCalls(t *testing.T) {
	f := forms(t)[0]
	c := &coretest.Counting{Potential: f.P}
	var energies []float64
	for k := 1; k <= 200; k++ {
		energies = append(energies, 0.9*f.W.Depth*float64(k)/200)
	}
	in, err := NewIntegrator(Settings{})
	require.NoError(t, err)
	res, errs := in.Sweep(c, f.W, mu, energies, nil)
	for i := range errs {
		require.NoError(t, errs[i])
		want, err := in.Exact(f.P, f.W, mu, energies[i])
		require.NoError(t, err)
		require.Equal(t, want, res[i], "E = %g eV", energies[i])
	}
	calls := c.Calls()
	assert.Less(t, calls, int64(60), "calls for 200 energies")
	c.Singles.Store(0)
	c.Batches.Store(0)
	_, err = in.Exact(c, f.W, mu, 0.3*f.W.Depth)
	require.NoError(t, err)
	assert.Less(t, c.Calls(), int64(25), "calls for one energy")
}
