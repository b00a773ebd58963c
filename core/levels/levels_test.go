package levels

import (
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/atoms"
	"github.com/pairwell/pairwell/core/coretest"
	"github.com/pairwell/pairwell/core/units"
	"github.com/pairwell/pairwell/models"
)

// pairMass returns the reduced mass of an atom pair such as "1H-35Cl"
// (AME2020 masses, package atoms).
func pairMass(t testing.TB, pair string) float64 {
	t.Helper()
	p, err := atoms.ParsePair(pair)
	require.NoError(t, err)
	return p.Mu
}

// morseSet is a Morse well with its reduced mass.
type morseSet struct {
	name      string
	de, a, re float64 // eV, 1/Å, Å
	mu        float64 // u
}

// morseSets are the parameter sets of the Morse checks. The spectroscopic
// constants are those of Huber & Herzberg, Constants of Diatomic Molecules
// (1979), from memory; the Ar₂-like and the stiff sets are invented.
func morseSets(t testing.TB) []morseSet {
	t.Helper()
	fromSpec := func(name string, we, wexe, re float64, pair string) morseSet {
		mu := pairMass(t, pair)
		p, err := models.MorseFromSpectroscopic(we, wexe, re, mu)
		require.NoError(t, err)
		return morseSet{name, p[0], p[1], p[2], mu}
	}
	return []morseSet{
		fromSpec("H35Cl", 2990.946, 52.8186, 1.27455, "1H-35Cl"),
		fromSpec("H2", 4401.21, 121.34, 0.74144, "1H-1H"),
		fromSpec("12C16O", 2169.81358, 13.28831, 1.128323, "12C-16O"),
		{"Ar2-like", 0.0123, 1.7, 3.76, 19.98},
		{"hcl-like", 4.6, 1.87, 1.27, 0.98},
	}
}

func (m morseSet) potential(t testing.TB) core.Potential {
	t.Helper()
	p, err := models.NewMorse(m.de, m.a, m.re)
	require.NoError(t, err)
	return p
}

// morseLevel returns the exact Morse term value ωe(v+½) − ωexe(v+½)² in
// cm⁻¹ (Morse 1929) and λ = √(2μDe)/(aħ) = ωe/(2ωexe).
func (m morseSet) morseLevel(v int) (term, lambda float64) {
	we, wexe := models.MorseSpectroscopic(m.de, m.a, m.mu)
	x := float64(v) + 0.5
	return we*x - wexe*x*x, we / (2 * wexe)
}

// TestMorseLevels checks every bound J = 0 level of several Morse wells
// against the closed form E_v = ωe(v+½) − ωexe(v+½)² (P. M. Morse, Phys.
// Rev. 34, 57 (1929)): within 1e-6 cm⁻¹ below 0.9·De and within the
// reported accuracy everywhere; and the number of bound levels, v < λ − ½.
func TestMorseLevels(t *testing.T) {
	for _, m := range morseSets(t) {
		t.Run(m.name, func(t *testing.T) {
			res, err := Solve(m.potential(t), m.mu, Settings{})
			require.NoError(t, err)
			_, lambda := m.morseLevel(0)
			bound := int(math.Ceil(lambda - 0.5)) // v = 0 … ⌈λ − ½⌉ − 1
			assert.Equal(t, bound, res.BoundLevels+res.Unresolved, "bound levels, λ = %g", lambda)
			assert.Equal(t, res.BoundLevels, len(res.Levels))
			deCm := m.de / units.WavenumberEV
			worst := 0.0
			for _, l := range res.Levels {
				want, _ := m.morseLevel(l.V)
				got := (l.Energy - res.Minimum) / units.WavenumberEV
				err := math.Abs(got - want)
				assert.LessOrEqual(t, err, math.Max(l.Accuracy, 1e-9), "v = %d: error %.3g cm⁻¹ above the reported accuracy", l.V, err)
				if want < 0.9*deCm {
					assert.InDelta(t, want, got, 1e-6, "v = %d", l.V)
					worst = math.Max(worst, err)
				}
				assert.LessOrEqual(t, l.Accuracy, DefaultTolerance)
			}
			t.Logf("%d bound levels on %d points; largest error below 0.9·De %.2g cm⁻¹, reported accuracy %.2g cm⁻¹", res.BoundLevels, res.Points, worst, res.Accuracy)
		})
	}
}

// TestAccuracyIsHonest asks for loose tolerances and checks that the
// reported accuracy is never below the true error of the Morse levels.
func TestAccuracyIsHonest(t *testing.T) {
	for _, m := range morseSets(t) {
		for _, tol := range []float64{1e-1, 1e-3} {
			t.Run(fmt.Sprintf("%s/%g", m.name, tol), func(t *testing.T) {
				res, err := Solve(m.potential(t), m.mu, Settings{Tolerance: tol})
				require.NoError(t, err)
				assert.LessOrEqual(t, res.Accuracy, tol)
				for _, l := range res.Levels {
					want, _ := m.morseLevel(l.V)
					got := (l.Energy - res.Minimum) / units.WavenumberEV
					assert.LessOrEqual(t, math.Abs(got-want), math.Max(l.Accuracy, 1e-9), "v = %d", l.V)
				}
			})
		}
	}
}

// TestHarmonicLevels checks E_v = ħω(v+½) exactly, and ⟨r⟩ = r0,
// ⟨(r − r0)²⟩ = (v+½)ħ/(μω) (textbook harmonic oscillator).
func TestHarmonicLevels(t *testing.T) {
	for _, tc := range []struct {
		name  string
		k, r0 float64
		mu    float64
		count int
	}{
		{"stiff", 30, 1.2, 7, 12},
		{"soft", 0.05, 3.8, 20, 8},
		// H₂-like: only v ≤ 3, for above that the wave function reaches
		// r = 0, where the radial equation imposes χ(0) = 0 and the
		// levels rise above the full-line oscillator's (by 3e-5 cm⁻¹ at
		// v = 5).
		{"hydrogen-like", 36, 0.74, 0.504, 4},
	} {
		t.Run(tc.name, func(t *testing.T) {
			p, err := models.Harmonic{}.New([]float64{tc.k, tc.r0})
			require.NoError(t, err)
			res, err := Solve(p, tc.mu, Settings{Count: tc.count})
			require.NoError(t, err)
			require.Len(t, res.Levels, tc.count)
			assert.Equal(t, -1, res.BoundLevels)
			omega := units.AngularFrequency(tc.k, tc.mu) // rad/fs
			hw := units.HbarEVfs * omega / units.WavenumberEV
			x2 := units.HbarEVfs * omega / tc.k // ħ/(μω) = ħω/k, Å²
			for _, l := range res.Levels {
				x := float64(l.V) + 0.5
				assert.InDelta(t, hw*x, (l.Energy-res.Minimum)/units.WavenumberEV, 1e-6, "v = %d", l.V)
				assert.InDelta(t, tc.r0, l.MeanR, 1e-9, "⟨r⟩, v = %d", l.V)
				assert.InEpsilon(t, x*x2, l.MeanSquareR-l.MeanR*l.MeanR, 1e-9, "⟨(r−r0)²⟩, v = %d", l.V)
			}
		})
	}
}

// TestMorseMoments checks ⟨r⟩ and ⟨r²⟩ against quadratures of the exact
// Morse eigenfunctions with mpmath 1.3.0 (testdata/morse_moments.py, 30
// digits; 20 printed).
func TestMorseMoments(t *testing.T) {
	sets := map[string]morseSet{
		"hcl-like": {"hcl-like", 4.6, 1.87, 1.27, 0.98},
		"ar2-like": {"ar2-like", 0.0123, 1.7, 3.76, 19.98},
	}
	ref := []struct {
		set    string
		v      int
		m1, m2 float64
	}{
		{"hcl-like", 0, 1.2863884553464196384, 1.6607316098755484045},
		{"hcl-like", 1, 1.3202822623490745648, 1.7612105570998042948},
		{"hcl-like", 5, 1.4750516932456483713, 2.2495106613843012393},
		{"hcl-like", 10, 1.730869770380769203, 3.1612541745264337742},
		{"ar2-like", 0, 3.8333889410697416454, 14.7255887779600811},
		{"ar2-like", 1, 4.0030447185744235605, 16.123053518808935254},
		{"ar2-like", 3, 4.5106585038085441041, 20.647190594316946511},
	}
	results := map[string]*Result{}
	for name, m := range sets {
		res, err := Solve(m.potential(t), m.mu, Settings{})
		require.NoError(t, err)
		results[name] = res
	}
	for _, r := range ref {
		l := results[r.set].Levels[r.v]
		require.Equal(t, r.v, l.V)
		assert.InDelta(t, r.m1, l.MeanR, 1e-9, "%s v = %d ⟨r⟩", r.set, r.v)
		assert.LessOrEqual(t, math.Abs(l.MeanR-r.m1), math.Max(l.MeanRAccuracy, 1e-11), "%s v = %d: ⟨r⟩ error above its estimate", r.set, r.v)
		assert.InDelta(t, r.m2, l.MeanSquareR, 1e-8, "%s v = %d ⟨r²⟩", r.set, r.v)
	}
}

// TestRotation checks the levels with J > 0 against the rotating Morse
// oscillator of C. L. Pekeris, Phys. Rev. 45, 98 (1934):
// E(v, J) − E(v, 0) ≈ B_v J(J+1) − D_e J²(J+1)², B_v = Be − αe(v+½),
// αe = (6Be²/ωe)(√(ωexe/Be) − 1), D_e = 4Be³/ωe², to the size of the
// neglected terms: the γe(v+½)² term of B_v, which makes the relative
// difference grow as (v+½)² (3e-4 at v = 1, 3e-3 at v = 4 here), so the
// check uses v ≤ 1.
func TestRotation(t *testing.T) {
	m := morseSets(t)[0] // H35Cl
	res, err := Solve(m.potential(t), m.mu, Settings{Count: 5, JMax: 10})
	require.NoError(t, err)
	require.Len(t, res.Levels, 5*11)
	we, wexe := models.MorseSpectroscopic(m.de, m.a, m.mu)
	be := hbar2Over2u / m.mu / (m.re * m.re) / units.WavenumberEV
	alpha := 6 * be * be / we * (math.Sqrt(wexe/be) - 1)
	dcent := 4 * be * be * be / (we * we)
	e0 := map[int]float64{}
	for i, l := range res.Levels {
		assert.Equal(t, i/5, l.J)
		assert.Equal(t, i%5, l.V)
		if l.J == 0 {
			e0[l.V] = l.Energy
			continue
		}
		if l.V > 1 {
			continue
		}
		x := float64(l.J * (l.J + 1))
		bv := be - alpha*(float64(l.V)+0.5)
		want := bv*x - dcent*x*x
		got := (l.Energy - e0[l.V]) / units.WavenumberEV
		assert.InEpsilon(t, want, got, []float64{1e-4, 4e-4}[l.V], "v = %d, J = %d", l.V, l.J)
		assert.Greater(t, l.MeanR, res.Levels[l.V].MeanR, "centrifugal stretching, v = %d J = %d", l.V, l.J)
	}
}

// TestBuiltinForms runs every built-in form: levels increase with v and J,
// lie below the ceiling, and are converged to the tolerance.
func TestBuiltinForms(t *testing.T) {
	for _, tc := range []struct {
		name   string
		m      core.Model
		params []float64
		mu     float64
		s      Settings
	}{
		{"lj-argon-like", models.LennardJones{}, []float64{120 * units.BoltzmannEV, 3.4}, pairMass(t, "Ar-Ar"), Settings{JMax: 2}},
		{"buckingham", models.Buckingham{}, []float64{1500, 0.3, 25}, 20, Settings{JMax: 1}},
		{"morse", models.Morse{}, []float64{4.4, 1.9, 1.27}, 7, Settings{Count: 4, JMax: 3}},
		{"harmonic", models.Harmonic{}, []float64{30, 1.2}, 7, Settings{Count: 4, JMax: 3}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			p, err := tc.m.New(tc.params)
			require.NoError(t, err)
			res, err := Solve(p, tc.mu, tc.s)
			require.NoError(t, err)
			require.NotEmpty(t, res.Levels)
			assert.LessOrEqual(t, res.Accuracy, DefaultTolerance)
			for i, l := range res.Levels {
				assert.Less(t, l.Energy, res.Ceiling)
				assert.Greater(t, l.Energy, res.Minimum)
				if i > 0 && res.Levels[i-1].J == l.J {
					assert.Greater(t, l.Energy, res.Levels[i-1].Energy)
				}
			}
			t.Logf("%d levels, %d bound at J = 0, %d points, accuracy %.2g cm⁻¹", len(res.Levels), res.BoundLevels, res.Points, res.Accuracy)
		})
	}
}

// TestBatched checks that the potential is evaluated in a few batched
// calls, never point by point (a plugin pays a round trip per call).
func TestBatched(t *testing.T) {
	m := morseSets(t)[0]
	p, c := coretest.Count(m.potential(t))
	_, err := Solve(p, m.mu, Settings{JMax: 2})
	require.NoError(t, err)
	assert.Less(t, c.Calls(), int64(200), "potential calls")
	t.Logf("%d single-point and %d batched calls", c.Singles.Load(), c.Batches.Load())
	// With the well given, only batched calls remain.
	w, err := core.AnalyzeWell(p, core.WellSettings{})
	require.NoError(t, err)
	before := c.Singles.Load()
	_, err = Solve(p, m.mu, Settings{JMax: 2, Well: &w})
	require.NoError(t, err)
	assert.Equal(t, before, c.Singles.Load(), "single-point calls with the well given")
}

// TestBadInput checks that every invalid request is refused with the right
// sentinel and no levels.
func TestBadInput(t *testing.T) {
	morse, err := models.NewMorse(4.6, 1.87, 1.27)
	require.NoError(t, err)
	shallow, err := models.NewMorse(1e-4, 1.0, 3.0)
	require.NoError(t, err)
	harm, err := models.Harmonic{}.New([]float64{30, 1.2})
	require.NoError(t, err)
	bk, _, err := models.Buckingham{}.Match(core.Target{Re: 1.2, Depth: 4, K: 30})
	require.NoError(t, err)
	buck, err := models.Buckingham{}.New(bk)
	require.NoError(t, err)
	lj3K, err := models.LennardJones{}.New([]float64{3 * units.BoltzmannEV, 2.6})
	require.NoError(t, err)
	for _, tc := range []struct {
		name string
		p    core.Potential
		mu   float64
		s    Settings
		want error
		msg  string
	}{
		{"zero mass", morse, 0, Settings{}, core.ErrParam, "reduced mass"},
		{"NaN mass", morse, math.NaN(), Settings{}, core.ErrParam, "reduced mass"},
		{"negative count", morse, 1, Settings{Count: -1}, core.ErrParam, "negative"},
		{"negative J", morse, 1, Settings{JMax: -1}, core.ErrParam, "J max"},
		{"huge J", morse, 1, Settings{JMax: MaxJ + 1}, core.ErrParam, "J max"},
		{"negative tolerance", morse, 1, Settings{Tolerance: -1}, core.ErrParam, "tolerance"},
		{"NaN tolerance", morse, 1, Settings{Tolerance: math.NaN()}, core.ErrParam, "tolerance"},
		{"tiny grid limit", morse, 1, Settings{MaxPoints: 3}, core.ErrParam, "grid limit"},
		{"unbounded without count", harm, 1, Settings{}, core.ErrParam, "number of levels"},
		{"more levels than bound", morse, 0.98, Settings{Count: 40}, core.ErrParam, "holds only 25"},
		{"too shallow", shallow, 1, Settings{}, core.ErrParam, "too shallow"},
		{"no level below the barrier", buck, 7, Settings{}, core.ErrParam, "below its inner barrier"},
		{"above the barrier", buck, 7, Settings{Count: 2}, core.ErrParam, "barrier"},
		{"grid too large", morse, 0.98, Settings{MaxPoints: 20}, core.ErrParam, "points"},
		// ε = 3 K, σ = 2.6 Å, μ(⁴He₂) = 2.0013 u (invented, helium-sized):
		// at most a level at the threshold, which no grid settles.
		{"level at the threshold", lj3K, 2.0013, Settings{}, core.ErrNoConvergence, "dissociation limit"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			res, err := Solve(tc.p, tc.mu, tc.s)
			require.Error(t, err)
			assert.Nil(t, res)
			assert.True(t, errors.Is(err, tc.want), "%v", err)
			assert.Contains(t, err.Error(), tc.msg)
			t.Log(err)
		})
	}
}

// TestHighJ: at high J the number of bound levels falls with J until none
// is left; every level returned is below the dissociation limit and
// converged, the J = 0 ladder is complete (28 levels, Morse 1929), and
// levels bound just below the limit that a grid cannot settle are counted
// as unresolved rather than returned.
func TestHighJ(t *testing.T) {
	m := morseSets(t)[0] // H35Cl
	res, err := Solve(m.potential(t), m.mu, Settings{JMax: 80})
	require.NoError(t, err)
	assert.Equal(t, 28, res.BoundLevels+res.Unresolved)
	perJ := map[int]int{}
	for _, l := range res.Levels {
		perJ[l.J]++
		assert.Less(t, l.Energy, res.Ceiling)
		assert.LessOrEqual(t, l.Accuracy, DefaultTolerance)
	}
	for j := 1; j <= 80; j++ {
		assert.LessOrEqual(t, perJ[j], perJ[j-1]+1, "J = %d", j)
	}
	assert.Equal(t, 0, perJ[80], "no level bound at J = 80 (Be·J(J+1) = 69000 cm⁻¹ > De)")
	t.Logf("levels per J: %v; unresolved at J = 0: %d", perJ, res.Unresolved)
}

// TestRandomWells is a property test: for random Morse, Lennard-Jones and
// Buckingham wells and masses (fixed seed), Solve either refuses with a
// sentinel error or returns levels ordered by J then v, increasing in v,
// below the ceiling and converged to the tolerance; it never panics.
func TestRandomWells(t *testing.T) {
	rng := rand.New(rand.NewPCG(13, 1))
	logu := func(lo, hi float64) float64 { return lo * math.Pow(hi/lo, rng.Float64()) }
	solved, refused := 0, 0
	defer func() { t.Logf("%d solved, %d refused", solved, refused) }()
	for i := 0; i < 45; i++ {
		var (
			m      core.Model
			params []float64
		)
		switch i % 3 {
		case 0:
			m, params = models.Morse{}, []float64{logu(0.005, 10), logu(0.5, 4), logu(0.7, 4)}
		case 1:
			m, params = models.LennardJones{}, []float64{logu(1e-3, 0.1), logu(2.5, 4)}
		default:
			m, params = models.Buckingham{}, []float64{logu(500, 5e4), logu(0.2, 0.4), logu(5, 100)}
		}
		p, err := m.New(params)
		if err != nil {
			continue // no well for this set
		}
		mu := logu(0.5, 60)
		s := Settings{JMax: rng.IntN(4), Tolerance: logu(1e-7, 1e-3)}
		res, err := Solve(p, mu, s)
		if err != nil {
			assert.True(t, errors.Is(err, core.ErrParam) || errors.Is(err, core.ErrNoConvergence) || errors.Is(err, core.ErrNoMinimum), "%s %v μ=%g: %v", m.Info().Key, params, mu, err)
			refused++
			continue
		}
		solved++
		for k, l := range res.Levels {
			assert.Less(t, l.Energy, res.Ceiling)
			assert.LessOrEqual(t, l.Accuracy, s.Tolerance*(1+1e-12), "%s %v μ=%g v=%d J=%d", m.Info().Key, params, mu, l.V, l.J)
			if k > 0 && res.Levels[k-1].J == l.J {
				assert.Equal(t, res.Levels[k-1].V+1, l.V)
				assert.Greater(t, l.Energy, res.Levels[k-1].Energy)
			}
		}
	}
}
