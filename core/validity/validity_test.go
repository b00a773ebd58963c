package validity

import (
	"math"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/coretest"
	"github.com/pairwell/pairwell/core/period"
	"github.com/pairwell/pairwell/core/units"
	"github.com/pairwell/pairwell/models"
	"github.com/pairwell/pairwell/models/modelstest"
)

// form is a built-in potential with its well.
type form = modelstest.Form

func forms(t testing.TB) []form { return modelstest.Forms(t) }

// TestMorseHarmonicPeriodLimit: for Morse T(E) = T₀/√(1 − E/De) (classical
// Morse oscillator, standard result, from memory), so |T₀/T − 1| =
// 1 − √(1 − E/De) reaches τ at E/De = 1 − (1 − τ)², where the turning points
// are x± = −ln(1 ∓ √(E/De))/a.
func TestMorseHarmonicPeriodLimit(t *testing.T) {
	const de, a, re = 4.4, 1.9, 1.27
	f := modelstest.NewForm(t, "morse", models.Morse{}, []float64{de, a, re})
	for _, tol := range []float64{1e-3, 0.01, 0.05, 0.2, 0.6} {
		r, err := PeriodRange(f.P, f.W, 2, Settings{Tolerance: tol})
		require.NoError(t, err, "τ = %g", tol)
		want := 1 - (1-tol)*(1-tol)
		assert.InEpsilon(t, want, r.DepthFraction, 1e-8, "τ = %g", tol)
		assert.InEpsilon(t, want*de, r.Energy, 1e-8, "τ = %g", tol)
		assert.InEpsilon(t, want*de/units.BoltzmannEV, r.Temperature, 1e-8, "τ = %g", tol)
		s := math.Sqrt(r.DepthFraction)
		assert.InEpsilon(t, -math.Log1p(-s)/a, r.Stretch, 1e-10, "τ = %g", tol)
		assert.InEpsilon(t, math.Log1p(s)/a, r.Compression, 1e-10, "τ = %g", tol)
	}
}

// TestHarmonicFormUnbounded: the Taylor expansion of ½k(r − r0)² stops at
// c₂, so every truncation is exact and both ranges are unbounded.
func TestHarmonicFormUnbounded(t *testing.T) {
	f := forms(t)[3]
	for n := 2; n <= 4; n++ {
		r, err := Analyze(f.P, f.W, n, Settings{})
		require.NoError(t, err)
		assert.True(t, math.IsInf(r.Potential.Compression, 1), "n = %d", n)
		assert.True(t, math.IsInf(r.Potential.Stretch, 1), "n = %d", n)
		assert.True(t, math.IsInf(r.Period.Energy, 1), "n = %d", n)
		assert.True(t, math.IsNaN(r.Period.DepthFraction), "n = %d", n)
	}
}

// TestPotentialCriterion checks the limits by evaluating the criterion
// directly on a fine grid below them and just above them (1e-6 relative:
// the rounding of V − V(re) blurs the crossing by ≈ ε|V|/(τ·c₂s²), 1e-10
// at τ = 1% for Morse, more for the Buckingham terms that cancel at re),
// and, for Morse at
// n = 2, against the leading order: (V₂ − V)/(V − V(re)) = a·x + O(x²)
// for V = De(1 − e^{−ax})² (expansion of the Morse form), so s → τ/a.
func TestPotentialCriterion(t *testing.T) {
	for _, f := range forms(t)[:3] {
		for n := 2; n <= 4; n++ {
			for _, tol := range []float64{0.01, 0.1, 0.3} {
				d, err := PotentialRange(f.P, f.W, n, Settings{Tolerance: tol})
				require.NoError(t, err, "%s n=%d τ=%g", f.Name, n, tol)
				tr, err := NewTruncation(f.W, n)
				require.NoError(t, err)
				holds := func(x float64) bool {
					v, err := core.Value(f.P, f.W.Re+x)
					require.NoError(t, err)
					vn, err := core.Value(tr, f.W.Re+x)
					require.NoError(t, err)
					return math.Abs(vn-v) <= tol*math.Abs(v-f.W.Energy)
				}
				for _, side := range []struct {
					s   float64
					dir float64
				}{{d.Compression, -1}, {d.Stretch, 1}} {
					if math.IsInf(side.s, 1) {
						continue // holds up to the edge of the domain (Buckingham barrier at n = 4, τ = 0.3)
					}
					for k := 1; k <= 200; k++ {
						x := side.s * float64(k) / 200 * (1 - 1e-6)
						require.True(t, holds(side.dir*x), "%s n=%d τ=%g holds at %g", f.Name, n, tol, side.dir*x)
					}
					assert.False(t, holds(side.dir*side.s*(1+1e-6)), "%s n=%d τ=%g fails beyond %g", f.Name, n, tol, side.s)
				}
			}
		}
	}
	morse := forms(t)[0]
	d, err := PotentialRange(morse.P, morse.W, 2, Settings{Tolerance: 1e-4})
	require.NoError(t, err)
	assert.InEpsilon(t, 1e-4/1.9, d.Stretch, 1e-3)
	assert.InEpsilon(t, 1e-4/1.9, d.Compression, 1e-3)
}

// TestCubicBarrier: the cubic truncation of Morse, De·a²x² − De·a³x³, has its
// maximum at x = 2/(3a), 4De/27 above the minimum (elementary calculus).
// Above that energy it has no bound motion, so a large tolerance still
// ends the period range below it.
func TestCubicBarrier(t *testing.T) {
	const de, a, re = 4.4, 1.9, 1.27
	f := modelstest.NewForm(t, "morse", models.Morse{}, []float64{de, a, re})
	tr, err := NewTruncation(f.W, 3)
	require.NoError(t, err)
	rb, h, ok := tr.Barrier()
	require.True(t, ok)
	assert.InEpsilon(t, re+2/(3*a), rb, 1e-12)
	assert.InEpsilon(t, 4*de/27, h, 1e-12)
	assert.InEpsilon(t, 4*de/27, tr.Well().Depth, 1e-12)
	_, err = period.Exact(tr, tr.Well(), 1, 0.9*h, period.Settings{})
	require.NoError(t, err)
	_, err = period.Exact(tr, tr.Well(), 1, 1.01*h, period.Settings{})
	assert.ErrorIs(t, err, core.ErrDomain)
	r, err := PeriodRange(f.P, f.W, 3, Settings{Tolerance: 0.9})
	require.NoError(t, err)
	assert.Less(t, r.Energy, h)
	// The quartic truncation of Morse has c₄ = 7De·a⁴/12 > 0 and
	// 9c₃² < 32c₂c₄: no maximum.
	tr4, err := NewTruncation(f.W, 4)
	require.NoError(t, err)
	_, _, ok = tr4.Barrier()
	assert.False(t, ok)
}

// TestTruncationDerivatives compares the analytic derivatives with the
// polynomial written out, for the well c = (−1, 0, 2, −3, 0.5) at re = 1.5.
func TestTruncationDerivatives(t *testing.T) {
	w := core.Well{Re: 1.5, Energy: -1, Taylor: []float64{-1, 1e-17, 2, -3, 0.5}, K: 4}
	tr, err := NewTruncation(w, 4)
	require.NoError(t, err)
	assert.Equal(t, 4, tr.Order())
	assert.Equal(t, 0.0, tr.Coefficients()[1])
	for _, r := range []float64{0.3, 1.5, 2, 4.5} {
		x := r - 1.5
		want := []float64{
			-1 + 2*x*x - 3*x*x*x + 0.5*x*x*x*x,
			4*x - 9*x*x + 2*x*x*x,
			4 - 18*x + 6*x*x,
			-18 + 12*x,
			12,
			0,
		}
		got := make([]float64, len(want))
		require.NoError(t, tr.Taylor(len(want)-1, []float64{r}, got))
		for k := range want {
			assert.InDelta(t, want[k], got[k]*core.Factorial(k), 1e-12*(1+math.Abs(want[k])), "V⁽%d⁾(%g)", k, r)
			b := make([]float64, k+1)
			require.NoError(t, tr.Taylor(k, []float64{r}, b))
			assert.Equal(t, got[k], b[k], "prefix of order %d", k)
		}
	}
	assert.ErrorIs(t, tr.Taylor(1, []float64{0}, make([]float64, 2)), core.ErrDomain)
	assert.ErrorIs(t, tr.Taylor(0, []float64{1}, nil), core.ErrLength)
	assert.True(t, math.IsInf(tr.Domain().Limit, 1))
	// c₄ < 0: both sides turn over; the lower maximum counts.
	w.Taylor[4] = -0.5
	tr, err = NewTruncation(w, 4)
	require.NoError(t, err)
	_, h, ok := tr.Barrier()
	require.True(t, ok)
	// Critical points of 2x² − 3x³ − 0.5x⁴: x(4 − 9x − 2x²) = 0.
	x := (-9 + math.Sqrt(81+32)) / 4
	assert.InEpsilon(t, 2*x*x-3*x*x*x-0.5*x*x*x*x, h, 1e-12)
}

func TestErrors(t *testing.T) {
	f := forms(t)[0]
	_, err := Analyze(f.P, f.W, 5, Settings{})
	assert.ErrorIs(t, err, core.ErrOrder)
	_, err = Analyze(f.P, f.W, 1, Settings{})
	assert.ErrorIs(t, err, core.ErrOrder)
	_, err = Analyze(f.P, f.W, 2, Settings{Tolerance: 1.5})
	assert.ErrorIs(t, err, core.ErrParam)
	_, err = Analyze(f.P, f.W, 2, Settings{Tolerance: -0.1})
	assert.ErrorIs(t, err, core.ErrParam)
	short := f.W
	short.Taylor = short.Taylor[:3]
	_, err = Analyze(f.P, short, 3, Settings{})
	assert.ErrorIs(t, err, core.ErrOrder)
	// With the series at re even 1e-9 is resolved; a well without the
	// higher coefficients (a form with few derivatives) has only the
	// direct difference, and refuses, saying what would be resolvable.
	_, err = PotentialRange(f.P, f.W, 2, Settings{Tolerance: 1e-9})
	assert.NoError(t, err)
	bare := f.W
	bare.Series, bare.Taylor = nil, bare.Taylor[:5]
	_, err = PotentialRange(f.P, bare, 4, Settings{Tolerance: 1e-7})
	assert.ErrorIs(t, err, core.ErrParam, "tolerance below the rounding of V(r) − V(re)")
	if err != nil {
		assert.Contains(t, err.Error(), "resolvable")
	}
	r, err := Analyze(f.P, f.W, 2, Settings{})
	require.NoError(t, err)
	assert.Equal(t, DefaultTolerance, r.Tolerance)
}

// TestOrdersImprove: on bounded forms, the quartic truncation is valid
// further than the harmonic one by both criteria.
func TestOrdersImprove(t *testing.T) {
	for _, f := range forms(t)[:3] {
		r2, err := Analyze(f.P, f.W, 2, Settings{})
		require.NoError(t, err)
		r4, err := Analyze(f.P, f.W, 4, Settings{})
		require.NoError(t, err)
		assert.Greater(t, r4.Potential.Stretch, r2.Potential.Stretch, f.Name)
		assert.Greater(t, r4.Potential.Compression, r2.Potential.Compression, f.Name)
		assert.Greater(t, r4.Period.Energy, r2.Period.Energy, f.Name)
		assert.Less(t, r4.Period.DepthFraction, 1.0, f.Name)
	}
}

// TestPeriodSeriesAgrees: the period limits found with the amplitude
// series (period.AmplitudeSeries, used wherever its bound is below a tenth
// of the quadrature's tolerance) agree with those found from the
// quadrature alone to 1e-9 relative, the resolution of the limit (the
// periods to ≈ 1e-12 resolve E to ≈ 1e-12/(τ·dlnR/dlnE)), for the bounded
// built-in forms at every order and tolerances from 1e-4 to 0.3.
func TestPeriodSeriesAgrees(t *testing.T) {
	worst := 0.0
	for _, f := range forms(t)[:3] {
		for n := 2; n <= 4; n++ {
			for _, tol := range []float64{1e-4, 1e-3, 0.01, 0.1, 0.3} {
				s := Settings{Tolerance: tol}
				got, err := periodRange(f.P, f.W, n, s, true)
				require.NoError(t, err, "%s n=%d τ=%g", f.Name, n, tol)
				want, err := periodRange(f.P, f.W, n, s, false)
				require.NoError(t, err, "%s n=%d τ=%g", f.Name, n, tol)
				if math.IsInf(want.Energy, 1) {
					assert.True(t, math.IsInf(got.Energy, 1), "%s n=%d τ=%g", f.Name, n, tol)
					continue
				}
				assert.InEpsilon(t, want.Energy, got.Energy, 1e-9, "%s n=%d τ=%g", f.Name, n, tol)
				worst = math.Max(worst, math.Abs(got.Energy/want.Energy-1))
				assert.InEpsilon(t, want.Compression, got.Compression, 1e-9, "%s n=%d τ=%g", f.Name, n, tol)
				assert.InEpsilon(t, want.Stretch, got.Stretch, 1e-9, "%s n=%d τ=%g", f.Name, n, tol)
			}
		}
	}
	t.Logf("worst relative difference of the period limits: %.2g", worst)
}

// BenchmarkAnalyze is both criteria at n = 2 for the four built-in forms.
func BenchmarkAnalyze(b *testing.B) {
	fs := forms(b)
	for b.Loop() {
		for _, f := range fs {
			if _, err := Analyze(f.P, f.W, 2, Settings{}); err != nil {
				b.Fatal(err)
			}
		}
	}
}

// TestBatchedCalls: both criteria of a form make about a hundred calls to
// the potential (a round trip each for a potential in another process), not
// thousands.
func TestBatchedCalls(t *testing.T) {
	f := forms(t)[0]
	c := &coretest.Counting{Potential: f.P}
	r, err := Analyze(c, f.W, 2, Settings{})
	require.NoError(t, err)
	want, err := Analyze(f.P, f.W, 2, Settings{})
	require.NoError(t, err)
	assert.Equal(t, want, r)
	assert.Less(t, c.Calls(), int64(200))
}

// BenchmarkCriteria is each criterion at n = 2 for each built-in form.
func BenchmarkCriteria(b *testing.B) {
	for _, f := range forms(b) {
		b.Run(f.Name+"/potential", func(b *testing.B) {
			for b.Loop() {
				if _, err := PotentialRange(f.P, f.W, 2, Settings{}); err != nil {
					b.Fatal(err)
				}
			}
		})
		b.Run(f.Name+"/period", func(b *testing.B) {
			for b.Loop() {
				if _, err := PeriodRange(f.P, f.W, 2, Settings{}); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}
