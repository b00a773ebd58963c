package tabulate_test

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/coretest"
	"github.com/pairwell/pairwell/core/tabulate"
	"github.com/pairwell/pairwell/models"
)

// Invented parameter sets of realistic magnitude: an HCl-like Morse bond
// and an argon-like Lennard-Jones pair.
func morse(t testing.TB) core.Potential {
	p, err := models.NewMorse(4.6, 1.87, 1.27)
	require.NoError(t, err)
	return p
}

func lj(t testing.TB) core.Potential {
	p, err := models.LennardJones{}.New([]float64{0.0104, 3.4})
	require.NoError(t, err)
	return p
}

// TestGrids: the grid constructors and their refusals.
func TestGrids(t *testing.T) {
	g, err := tabulate.GridStep(1, 2, 0.3)
	require.NoError(t, err)
	assert.Equal(t, 4, g.Points) // 1, 1.3, 1.6, 1.9: the last point not past 2
	assert.InDelta(t, 1.9, g.To, 1e-15)
	assert.InDelta(t, 0.3, g.Step(), 1e-15)
	g, err = tabulate.GridStep(1, 2, 0.1) // 10 steps exactly, within rounding
	require.NoError(t, err)
	assert.Equal(t, 11, g.Points)
	g, err = tabulate.GridPoints(1, 2, 5)
	require.NoError(t, err)
	assert.Equal(t, 2.0, g.R(4))
	assert.Equal(t, 1.25, g.R(1))
	for _, bad := range []func() error{
		func() error { _, err := tabulate.GridPoints(1, 2, 1); return err },
		func() error { _, err := tabulate.GridPoints(1, 2, tabulate.MaxPoints+1); return err },
		func() error { _, err := tabulate.GridPoints(2, 1, 10); return err },
		func() error { _, err := tabulate.GridPoints(0, 1, 10); return err },
		func() error { _, err := tabulate.GridPoints(1, math.Inf(1), 10); return err },
		func() error { _, err := tabulate.GridStep(1, 2, 0); return err },
		func() error { _, err := tabulate.GridStep(1, 2, 3); return err },
		func() error { _, err := tabulate.GridStep(1, 2, 1e-9); return err },
		func() error { _, err := tabulate.GridStep(1, 2, math.NaN()); return err },
	} {
		assert.ErrorIs(t, bad(), core.ErrParam)
	}
}

// TestTabulate: V and F = −V′ of Morse against its closed form (P. M.
// Morse, Phys. Rev. 34, 57 (1929): V = De[(1 − y)² − 1], y = e^{−a(r−re)},
// V′ = 2aDe·y(1 − y), V″ = 2a²De·y(2y − 1)) to 1e-13, in one batched
// call.
func TestTabulate(t *testing.T) {
	const De, a, re = 4.6, 1.87, 1.27
	p, count := coretest.Count(morse(t))
	g, err := tabulate.GridPoints(0.9, 6, 1001)
	require.NoError(t, err)
	tab, err := tabulate.Tabulate(p, g, true)
	require.NoError(t, err)
	assert.Equal(t, int64(1), count.Calls())
	for i, r := range tab.R {
		y := math.Exp(-a * (r - re))
		assert.InDelta(t, De*((1-y)*(1-y)-1), tab.V[i], 1e-13*De)
		assert.InDelta(t, -2*a*De*y*(1-y), tab.F[i], 1e-13*De*a*(1+y))
		assert.InDelta(t, 2*a*a*De*y*(2*y-1), tab.D2V[i], 1e-12*De*a*a*(1+y*y))
	}
	tab, err = tabulate.Tabulate(p, g, false)
	require.NoError(t, err)
	assert.Nil(t, tab.D2V)
	// Outside the domain (Buckingham's inner barrier): refused.
	b, err := models.Buckingham{}.New([]float64{1500, 0.3, 25})
	require.NoError(t, err)
	_, err = tabulate.Tabulate(b, tabulate.Grid{From: 0.1, To: 5, Points: 10}, false)
	assert.ErrorIs(t, err, core.ErrDomain)
}

// cubicPotential is V(r) = Σ a_k r^k, k ≤ 3: a complete cubic spline
// reproduces every cubic exactly (its error bounds hold with ‖V⁽⁴⁾‖ = 0;
// C. A. Hall & W. W. Meyer, J. Approx. Theory 16, 105 (1976)).
type cubicPotential struct{ a [4]float64 }

func (c cubicPotential) Taylor(n int, r, dst []float64) error {
	for i, x := range r {
		v := [4]float64{
			c.a[0] + x*(c.a[1]+x*(c.a[2]+x*c.a[3])),
			c.a[1] + x*(2*c.a[2]+3*c.a[3]*x),
			c.a[2] + 3*c.a[3]*x,
			c.a[3],
		}
		for k := 0; k <= n; k++ {
			if k < 4 {
				dst[i*(n+1)+k] = v[k]
			} else {
				dst[i*(n+1)+k] = 0
			}
		}
	}
	return nil
}
func (cubicPotential) Domain() core.Domain { return core.Domain{Max: math.Inf(1), Limit: math.Inf(1)} }
func (cubicPotential) MaxOrder() int       { return 8 }

func TestSplineReproducesCubics(t *testing.T) {
	p := cubicPotential{[4]float64{0.3, -1.2, 0.7, -0.15}}
	for _, n := range []int{2, 3, 7, 200} {
		res, err := tabulate.Build(p, tabulate.Grid{From: 0.5, To: 3.5, Points: n}, tabulate.Settings{})
		require.NoError(t, err)
		assert.Less(t, res.Check.Energy, 1e-13, "n = %d", n)
		assert.Less(t, res.Check.Force, 1e-12, "n = %d", n)
	}
	// The plan needs 2 points (V⁽⁴⁾ = 0).
	res, err := tabulate.PlanFor(p, 0.5, 3.5, tabulate.Tolerance{Energy: 1e-10, Force: 1e-10}, tabulate.Settings{})
	require.NoError(t, err)
	assert.Equal(t, 2, res.Table.Grid.Points)
}

// TestPlanReachesAccuracy: the planned spacing reaches the requested
// accuracy (the check value), measured by the package and, more
// finely, at 16 random points of every interval here; the measured error
// never exceeds the a-priori bound (Hall & Meyer 1976 for the cubic
// spline, h²‖f″‖/8 for linear interpolation), which never undercuts it.
func TestPlanReachesAccuracy(t *testing.T) {
	tests := []struct {
		name     string
		p        core.Potential
		from, to float64
		tol      tabulate.Tolerance
		how      tabulate.Interpolation
	}{
		{"morse cubic", morse(t), 0.9, 6, tabulate.Tolerance{Energy: 1e-6, Force: 1e-5}, tabulate.Cubic},
		{"morse cubic tight", morse(t), 0.9, 6, tabulate.Tolerance{Energy: 1e-9, Force: 1e-9}, tabulate.Cubic},
		{"morse linear", morse(t), 0.9, 6, tabulate.Tolerance{Energy: 1e-4, Force: 1e-3}, tabulate.Linear},
		{"lj cubic", lj(t), 3.0, 12, tabulate.Tolerance{Energy: 1e-7, Force: 1e-7}, tabulate.Cubic},
		{"lj cubic wall", lj(t), 2.8, 10, tabulate.Tolerance{Energy: 1e-6, Force: 1e-6}, tabulate.Cubic},
		{"lj linear", lj(t), 3.0, 12, tabulate.Tolerance{Energy: 1e-6, Force: 1e-6}, tabulate.Linear},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			res, err := tabulate.PlanFor(tt.p, tt.from, tt.to, tt.tol, tabulate.Settings{Interpolation: tt.how})
			require.NoError(t, err)
			require.NotNil(t, res.Plan)
			assert.LessOrEqual(t, res.Check.Energy, tt.tol.Energy)
			assert.LessOrEqual(t, res.Check.Force, tt.tol.Force)
			dense := probe(t, tt.p, res, 16)
			assert.LessOrEqual(t, dense.Energy, tt.tol.Energy, "dense probe, V")
			assert.LessOrEqual(t, dense.Force, tt.tol.Force, "dense probe, F")
			assert.LessOrEqual(t, dense.Energy, res.Plan.Bound.Energy, "bound of V")
			assert.LessOrEqual(t, dense.Force, res.Plan.Bound.Force, "bound of F")
			// The check points find the largest error to within 10 %.
			assert.GreaterOrEqual(t, res.Check.Energy, 0.9*dense.Energy)
			assert.GreaterOrEqual(t, res.Check.Force, 0.9*dense.Force)
		})
	}
}

// probe measures the error of the result's interpolant (Result.Predict)
// at k random points of every interval (fixed seed), independently of the
// package's three check points per interval.
func probe(t *testing.T, p core.Potential, res *tabulate.Result, k int) tabulate.Check {
	t.Helper()
	rng := rand.New(rand.NewPCG(1, 2))
	g := res.Table.Grid
	var xs []float64
	for i := 0; i < g.Points-1; i++ {
		for j := 0; j < k; j++ {
			xs = append(xs, g.R(i)+rng.Float64()*(g.R(i+1)-g.R(i)))
		}
	}
	v, f, err := res.Predict(xs)
	require.NoError(t, err)
	c := make([]float64, 2*len(xs))
	require.NoError(t, p.Taylor(1, xs, c))
	var ch tabulate.Check
	for i := range xs {
		ch.Energy = math.Max(ch.Energy, math.Abs(c[2*i]-v[i]))
		ch.Force = math.Max(ch.Force, math.Abs(-c[2*i+1]-f[i]))
	}
	return ch
}

// TestOrder: halving the spacing divides the error of the cubic spline's V
// by about 16 (fourth order; the check value, ratio within
// 0.05–0.08) and of its F by about 8 (third order, Hall & Meyer 1976),
// and of linear interpolation by about 4 (second order).
func TestOrder(t *testing.T) {
	tests := []struct {
		name     string
		p        core.Potential
		from, to float64
		n        int
		how      tabulate.Interpolation
		lo, hi   float64 // ratio of V errors
		flo, fhi float64 // ratio of F errors
	}{
		{"morse cubic", morse(t), 0.9, 6, 201, tabulate.Cubic, 0.05, 0.08, 0.10, 0.15},
		{"lj cubic", lj(t), 3.0, 12, 201, tabulate.Cubic, 0.05, 0.08, 0.10, 0.15},
		{"morse linear", morse(t), 0.9, 6, 201, tabulate.Linear, 0.22, 0.28, 0.22, 0.28},
		{"lj linear", lj(t), 3.0, 12, 201, tabulate.Linear, 0.22, 0.28, 0.22, 0.28},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			s := tabulate.Settings{Interpolation: tt.how}
			a, err := tabulate.Build(tt.p, tabulate.Grid{From: tt.from, To: tt.to, Points: tt.n}, s)
			require.NoError(t, err)
			b, err := tabulate.Build(tt.p, tabulate.Grid{From: tt.from, To: tt.to, Points: 2*tt.n - 1}, s)
			require.NoError(t, err)
			rv, rf := b.Check.Energy/a.Check.Energy, b.Check.Force/a.Check.Force
			t.Logf("V ratio %.4f, F ratio %.4f", rv, rf)
			assert.True(t, rv >= tt.lo && rv <= tt.hi, "V error ratio %.4f not in [%g, %g]", rv, tt.lo, tt.hi)
			assert.True(t, rf >= tt.flo && rf <= tt.fhi, "F error ratio %.4f not in [%g, %g]", rf, tt.flo, tt.fhi)
		})
	}
}

// TestOutOfReach: deep in the Lennard-Jones wall a tight accuracy needs
// more than MaxPoints points, and an accuracy below the rounding error of
// V cannot be met: both refused with ErrTooFine, saying why.
func TestOutOfReach(t *testing.T) {
	_, err := tabulate.PlanFor(lj(t), 1.0, 12, tabulate.Tolerance{Energy: 1e-6, Force: 1e-6}, tabulate.Settings{Interpolation: tabulate.Linear})
	require.ErrorIs(t, err, tabulate.ErrTooFine)
	assert.Contains(t, err.Error(), "start the table further out")
	assert.Contains(t, err.Error(), "r = 1 Å")
	assert.ErrorIs(t, err, core.ErrParam, "out of reach is bad input, classified as such by callers")
	_, err = tabulate.PlanFor(morse(t), 0.9, 6, tabulate.Tolerance{Energy: 1e-17, Force: 1}, tabulate.Settings{})
	require.ErrorIs(t, err, tabulate.ErrTooFine)
	assert.Contains(t, err.Error(), "rounding")
	for _, tol := range []tabulate.Tolerance{{0, 1}, {1, -1}, {math.NaN(), 1}, {math.Inf(1), 1}} {
		_, err = tabulate.PlanFor(morse(t), 0.9, 6, tol, tabulate.Settings{})
		assert.ErrorIs(t, err, core.ErrParam, "%+v", tol)
	}
	_, err = tabulate.PlanFor(morse(t), 0.9, 6, tabulate.Tolerance{Energy: 1, Force: 1}, tabulate.Settings{Safety: 0.5})
	assert.ErrorIs(t, err, core.ErrParam)
	_, err = tabulate.Build(morse(t), tabulate.Grid{From: 1, To: 2, Points: 5}, tabulate.Settings{Interpolation: 7})
	assert.ErrorIs(t, err, core.ErrParam)
}

// TestBatched: a plan makes a handful of Taylor calls, none per point (a
// plugin form lives in another process).
func TestBatched(t *testing.T) {
	p, count := coretest.Count(lj(t))
	res, err := tabulate.PlanFor(p, 3.0, 12, tabulate.Tolerance{Energy: 1e-8, Force: 1e-8}, tabulate.Settings{})
	require.NoError(t, err)
	assert.Zero(t, count.Singles.Load())
	// scan: 1 + 3 zooms; then per try one tabulation and one check.
	assert.LessOrEqual(t, count.Calls(), int64(4+2*(1+res.Plan.Refinements)))
	assert.Greater(t, res.Table.Grid.Points, 100)
}

// FuzzGrid: the grid constructors never panic, and an accepted grid has 2
// to MaxPoints increasing points inside the requested range.
func FuzzGrid(f *testing.F) {
	f.Add(1.0, 2.0, 0.1, 11)
	f.Add(0.5, 12.0, 1e-5, 2)
	f.Add(2.0, 1.0, -1.0, 0)
	f.Fuzz(func(t *testing.T, from, to, h float64, n int) {
		for _, mk := range []func() (tabulate.Grid, error){
			func() (tabulate.Grid, error) { return tabulate.GridStep(from, to, h) },
			func() (tabulate.Grid, error) { return tabulate.GridPoints(from, to, n) },
		} {
			g, err := mk()
			if err != nil {
				continue
			}
			if g.Points < 2 || g.Points > tabulate.MaxPoints || g.From != from || g.To > to || !(g.Step() > 0) {
				t.Fatalf("grid %+v from %g, %g, %g, %d", g, from, to, h, n)
			}
		}
	})
}

// TestBlocksMatchWhole: Verify fits the interpolant in blocks of intervals;
// its pieces are the whole table's to the bit, so the errors it measures
// are those of the interpolant fitted over the whole table (Result.Predict)
// at the same points (the midpoint and h/2 ± h/(2√3) of every interval).
func TestBlocksMatchWhole(t *testing.T) {
	for _, how := range []tabulate.Interpolation{tabulate.Cubic, tabulate.Linear} {
		res, err := tabulate.Build(lj(t), tabulate.Grid{From: 3, To: 12, Points: 10001}, tabulate.Settings{Interpolation: how})
		require.NoError(t, err)
		var xs []float64
		g := res.Table.Grid
		for i := 0; i < g.Points-1; i++ {
			h := res.Table.R[i+1] - res.Table.R[i]
			for _, f := range []float64{0.5 - 0.5/math.Sqrt(3), 0.5, 0.5 + 0.5/math.Sqrt(3)} {
				xs = append(xs, res.Table.R[i]+f*h)
			}
		}
		v, f, err := res.Predict(xs)
		require.NoError(t, err)
		c := make([]float64, 2*len(xs))
		require.NoError(t, lj(t).Taylor(1, xs, c))
		var ev, ef float64
		for i := range xs {
			ev = math.Max(ev, math.Abs(c[2*i]-v[i]))
			ef = math.Max(ef, math.Abs(-c[2*i+1]-f[i]))
		}
		assert.Equal(t, ev, res.Check.Energy, how)
		assert.Equal(t, ef, res.Check.Force, how)
		assert.Equal(t, len(xs), res.Check.Points)
	}
}
