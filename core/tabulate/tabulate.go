// Package tabulate puts a pair potential on a uniform grid, the way a
// simulation code reads it as a table, and says how accurately an
// interpolant of the table reproduces the potential.
//
// A table holds, at r_i = From + i·h (i = 0…Points−1), the energy V(r_i) in
// eV, the force F = −V′(r_i) in eV/Å and, when asked, V″(r_i) in eV/Å²,
// computed exactly (one batched Taylor call of the potential for the whole
// grid).
//
// Two interpolants are considered:
//
//   - Cubic: the complete (clamped) cubic spline s through the V column
//     whose end slopes are the exact V′ at both ends (the table's −F), and
//     F ≈ −s′. Its error bounds are those of C. A. Hall & W. W. Meyer,
//     J. Approx. Theory 16, 105 (1976) (also C. de Boor, A Practical Guide
//     to Splines, 1978, ch. V):
//     ‖V − s‖∞ ≤ (5/384)·h⁴·‖V⁽⁴⁾‖∞ and ‖V′ − s′‖∞ ≤ (1/24)·h³·‖V⁽⁴⁾‖∞.
//     (The 1/384 often quoted is the constant of the piecewise cubic
//     Hermite interpolant, which also uses V′ at every node; the spline
//     uses only the V column, and its constant is 5/384.)
//   - Linear: V and F each interpolated linearly from their own column:
//     ‖V − ℓ_V‖∞ ≤ h²·‖V″‖∞/8 and ‖F − ℓ_F‖∞ ≤ h²·‖F″‖∞/8 = h²·‖V‴‖∞/8
//     (the error of linear interpolation, e.g. de Boor 1978, ch. II).
//
// Plan chooses the spacing for a requested accuracy from these bounds,
// with the maximum of |V⁽ᵏ⁾| over the range taken from the Taylor
// coefficients (V⁽ᵏ⁾ = k!·c_k) on a dense scan refined around its largest
// value and multiplied by a safety factor, and then verifies the result:
// the interpolant is built (gonum's interp.PiecewiseCubic with the
// spline's node slopes, or interp.PiecewiseLinear) and compared with the
// exact form at three points in every interval — the midpoint, where the
// error of V is largest for a cubic, and h/2 ± h/(2√3), where the error of
// its derivative is — and the spacing is refined until the measured error
// reaches the request. A spacing that does not reach it is never returned.
//
// Units: Å, eV, eV/Å. Presentation of tables is not part of this package.
package tabulate

import (
	"fmt"
	"math"
	"runtime"
	"sync"

	"gonum.org/v1/gonum/interp"
	"gonum.org/v1/gonum/mat"

	"github.com/pairwell/pairwell/core"
)

// MaxPoints is the largest grid: 10⁶ points, about 60 MB of CSV.
const MaxPoints = 1_000_000

// ErrTooFine means that a requested accuracy cannot be reached within
// MaxPoints points or within the rounding error of float64. It is bad
// input, so it wraps core.ErrParam (errors.Is matches both); the message
// says what limits it.
var ErrTooFine = fmt.Errorf("%w: accuracy out of reach", core.ErrParam)

// Interpolation is the interpolant a table is meant for.
type Interpolation int

const (
	// Cubic is the complete cubic spline through V (end slopes V′), with
	// F = −s′. It is the zero value.
	Cubic Interpolation = iota
	// Linear interpolates V and F each linearly from its own column.
	Linear
)

// String returns "cubic" or "linear".
func (i Interpolation) String() string {
	if i == Linear {
		return "linear"
	}
	return "cubic"
}

// Grid is the uniform grid r_i = From + i·(To − From)/(Points − 1), i = 0…
// Points−1, in Å; the last point is To exactly.
type Grid struct {
	From, To float64
	Points   int
}

// Step returns the spacing h in Å.
func (g Grid) Step() float64 { return (g.To - g.From) / float64(g.Points-1) }

// R returns the i-th separation in Å.
func (g Grid) R(i int) float64 {
	if i == g.Points-1 {
		return g.To
	}
	return g.From + float64(i)*g.Step()
}

// GridPoints returns the grid of n points from from to to.
func GridPoints(from, to float64, n int) (Grid, error) {
	if err := checkRange(from, to); err != nil {
		return Grid{}, err
	}
	if n < 2 || n > MaxPoints {
		return Grid{}, fmt.Errorf("%w: %d points: a table has 2 to %d", core.ErrParam, n, MaxPoints)
	}
	return Grid{From: from, To: to, Points: n}, nil
}

// GridStep returns the grid of spacing h from from up to the last point
// that does not pass to (to itself when (to − from)/h is a whole number,
// within 1e-9 of a step).
func GridStep(from, to, h float64) (Grid, error) {
	if err := checkRange(from, to); err != nil {
		return Grid{}, err
	}
	if !(h > 0) || math.IsInf(h, 0) {
		return Grid{}, fmt.Errorf("%w: step %g Å: it must be a positive length", core.ErrParam, h)
	}
	steps := math.Floor((to-from)/h + 1e-9)
	if steps < 1 {
		return Grid{}, fmt.Errorf("%w: step %g Å is longer than the range %g to %g Å", core.ErrParam, h, from, to)
	}
	if steps+1 > MaxPoints {
		return Grid{}, fmt.Errorf("%w: step %g Å from %g to %g Å gives %.0f points: a table has at most %d", core.ErrParam, h, from, to, steps+1, MaxPoints)
	}
	// Within 1e-9 of a step of to is to itself (rounding of from + steps·h).
	end := math.Min(from+steps*h, to)
	return Grid{From: from, To: end, Points: int(steps) + 1}, nil
}

func checkRange(from, to float64) error {
	switch {
	case !(from > 0) || math.IsInf(to, 0) || math.IsNaN(to):
		return fmt.Errorf("%w: range %g to %g Å: both ends must be positive lengths", core.ErrParam, from, to)
	case !(to > from):
		return fmt.Errorf("%w: range %g to %g Å: the end must lie beyond the start", core.ErrParam, from, to)
	}
	return nil
}

// checkDomain refuses a grid that leaves the potential's domain.
func checkDomain(p core.Potential, from, to float64) error {
	d := p.Domain()
	if !d.Contains(from) || !d.Contains(to) {
		return fmt.Errorf("%w: range %g to %g Å leaves the form's domain (%g, %g) Å", core.ErrDomain, from, to, d.Min, d.Max)
	}
	return nil
}

// Table is a potential on a grid.
type Table struct {
	Grid Grid
	R    []float64 // separations, Å
	V    []float64 // energies, eV
	F    []float64 // forces −V′, eV/Å
	D2V  []float64 // V″ in eV/Å², nil unless asked for
}

// Tabulate evaluates p on g in one Taylor call (order 1, or 2 with second).
func Tabulate(p core.Potential, g Grid, second bool) (*Table, error) {
	if err := checkDomain(p, g.From, g.To); err != nil {
		return nil, err
	}
	n := 1
	if second {
		n = 2
	}
	t := &Table{Grid: g, R: make([]float64, g.Points), V: make([]float64, g.Points), F: make([]float64, g.Points)}
	for i := range t.R {
		t.R[i] = g.R(i)
	}
	c := make([]float64, (n+1)*g.Points)
	if err := p.Taylor(n, t.R, c); err != nil {
		return nil, err
	}
	if second {
		t.D2V = make([]float64, g.Points)
	}
	for i := range t.R {
		row := c[i*(n+1):]
		t.V[i], t.F[i] = row[0], -row[1]
		if second {
			t.D2V[i] = 2 * row[2]
		}
	}
	return t, nil
}

// Check is the measured error of an interpolant of a table.
type Check struct {
	Energy  float64 // max |V − V_interp| in eV
	EnergyR float64 // where, Å
	Force   float64 // max |F − F_interp| in eV/Å
	ForceR  float64 // where, Å
	Points  int     // the number of points compared
}

// checkFractions are the points of every interval [r_i, r_i + h] where an
// interpolant is compared with the form, as fractions of h: the midpoint
// (the largest error of V for a cubic between nodes, ∝ x²(h−x)²) and
// h/2 ± h/(2√3) (the extrema of its derivative, ∝ x(h−x)(h−2x)).
var checkFractions = [3]float64{0.5 - 0.5/math.Sqrt(3), 0.5, 0.5 + 0.5/math.Sqrt(3)}

// interpolant is the interpolant of a table, fitted by gonum over the
// nodes a…b (all of them, or a block): each piece between two nodes depends
// only on the values there (and, for the spline, on the node slopes from
// the global solve), so a fit over a block gives the same polynomials on
// it, and gonum's segment search runs over the block only.
type interpolant struct {
	t     *Table
	how   Interpolation
	slope []float64 // the spline's node slopes (cubic)
	c     interp.PiecewiseCubic
	v, f  interp.PiecewiseLinear
}

// newInterpolant prepares the interpolant of t (for the spline: its node
// slopes, from the global solve); fit then fits it over the nodes asked
// for (Verify: block by block; Predict: the whole table).
func newInterpolant(t *Table, how Interpolation) (*interpolant, error) {
	in := &interpolant{t: t, how: how}
	if how == Cubic {
		m, err := splineSlopes(t.R, t.V, -t.F[0], -t.F[len(t.F)-1])
		if err != nil {
			return nil, err
		}
		in.slope = m
	}
	return in, nil
}

// fit fits the interpolant over the nodes a…b (b > a).
func (in *interpolant) fit(a, b int) error {
	r, v := in.t.R[a:b+1], in.t.V[a:b+1]
	if in.how == Cubic {
		in.c.FitWithDerivatives(r, v, in.slope[a:b+1])
		return nil
	}
	if err := in.v.Fit(r, v); err != nil {
		return err
	}
	return in.f.Fit(r, in.t.F[a:b+1])
}

// block returns a copy that shares the table and slopes, for fits over
// blocks on another goroutine.
func (in *interpolant) block() *interpolant {
	return &interpolant{t: in.t, how: in.how, slope: in.slope}
}

func (in *interpolant) energy(r float64) float64 {
	if in.how == Cubic {
		return in.c.Predict(r)
	}
	return in.v.Predict(r)
}

func (in *interpolant) force(r float64) float64 {
	if in.how == Cubic {
		return -in.c.PredictDerivative(r)
	}
	return in.f.Predict(r)
}

// splineSlopes returns the node slopes m_i of the complete cubic spline
// through (x_i, y_i) with end slopes m_0 = d0 and m_{n−1} = dn: for each
// interior node, with h₋ = x_i − x_{i−1} and h₊ = x_{i+1} − x_i,
//
//	h₊·m_{i−1} + 2(h₋ + h₊)·m_i + h₋·m_{i+1} = 3[h₊(y_i − y_{i−1})/h₋ + h₋(y_{i+1} − y_i)/h₊]
//
// (continuity of s″; de Boor 1978, ch. IV), a tridiagonal system solved by
// gonum (mat.Tridiag). The spline is then the piecewise cubic Hermite
// interpolant with these slopes (interp.PiecewiseCubic.FitWithDerivatives).
func splineSlopes(x, y []float64, d0, dn float64) ([]float64, error) {
	n := len(x)
	m := make([]float64, n)
	m[0], m[n-1] = d0, dn
	k := n - 2 // unknowns m_1 … m_{n−2}
	if k == 0 {
		return m, nil
	}
	dl, d, du := make([]float64, k-1), make([]float64, k), make([]float64, k-1)
	b := make([]float64, k)
	for j := 0; j < k; j++ {
		i := j + 1
		hm, hp := x[i]-x[i-1], x[i+1]-x[i]
		d[j] = 2 * (hm + hp)
		b[j] = 3 * (hp*(y[i]-y[i-1])/hm + hm*(y[i+1]-y[i])/hp)
		if j > 0 {
			dl[j-1] = hp
		} else {
			b[j] -= hp * d0
		}
		if j < k-1 {
			du[j] = hm
		} else {
			b[j] -= hm * dn
		}
	}
	sol := mat.NewVecDense(k, nil)
	if err := mat.NewTridiag(k, dl, d, du).SolveVecTo(sol, false, mat.NewVecDense(k, b)); err != nil {
		return nil, fmt.Errorf("cubic spline slopes: %w", err)
	}
	copy(m[1:], sol.RawVector().Data)
	return m, nil
}

// Verify measures the error of the interpolant of t against p at the three
// points of every interval (checkFractions), in one Taylor call.
func Verify(p core.Potential, t *Table, how Interpolation) (Check, error) {
	in, err := newInterpolant(t, how)
	if err != nil {
		return Check{}, err
	}
	nint := len(t.R) - 1
	xs := make([]float64, 0, len(checkFractions)*nint)
	for i := 0; i < nint; i++ {
		h := t.R[i+1] - t.R[i]
		for _, f := range checkFractions {
			xs = append(xs, t.R[i]+f*h)
		}
	}
	c := make([]float64, 2*len(xs))
	if err := p.Taylor(1, xs, c); err != nil {
		return Check{}, err
	}
	// The comparison runs on every core, each on a range of intervals
	// fitted in blocks of verifyBlock intervals; the largest errors of the
	// ranges are then merged in order, so the result does not depend on
	// the number of cores.
	const verifyBlock = 16
	k := len(checkFractions)
	workers := max(1, min(runtime.GOMAXPROCS(0), nint/4096))
	parts := make([]Check, workers)
	errs := make([]error, workers)
	var wg sync.WaitGroup
	for w := range workers {
		lo, hi := w*nint/workers, (w+1)*nint/workers
		wg.Add(1)
		go func() {
			defer wg.Done()
			b := in.block()
			ch := Check{EnergyR: xs[k*lo], ForceR: xs[k*lo]}
			for a := lo; a < hi; a += verifyBlock {
				end := min(a+verifyBlock, hi)
				if err := b.fit(a, end); err != nil {
					errs[w] = err
					return
				}
				for i := k * a; i < k*end; i++ {
					x := xs[i]
					if e := math.Abs(c[2*i] - b.energy(x)); e > ch.Energy {
						ch.Energy, ch.EnergyR = e, x
					}
					if e := math.Abs(-c[2*i+1] - b.force(x)); e > ch.Force {
						ch.Force, ch.ForceR = e, x
					}
				}
			}
			parts[w] = ch
		}()
	}
	wg.Wait()
	for _, err := range errs {
		if err != nil {
			return Check{}, err
		}
	}
	ch := parts[0]
	for _, p := range parts[1:] {
		if p.Energy > ch.Energy {
			ch.Energy, ch.EnergyR = p.Energy, p.EnergyR
		}
		if p.Force > ch.Force {
			ch.Force, ch.ForceR = p.Force, p.ForceR
		}
	}
	ch.Points = len(xs)
	return ch, nil
}

// Result is a table with the measured error of its interpolant and, when
// its spacing was planned for an accuracy, the plan.
type Result struct {
	Table         *Table
	Interpolation Interpolation
	Check         Check
	Plan          *Plan // nil for a grid given by the caller
}

// Build tabulates p on g and measures the error of its interpolant.
func Build(p core.Potential, g Grid, s Settings) (*Result, error) {
	s, err := s.withDefaults()
	if err != nil {
		return nil, err
	}
	t, err := Tabulate(p, g, s.SecondDerivative)
	if err != nil {
		return nil, err
	}
	ch, err := Verify(p, t, s.Interpolation)
	if err != nil {
		return nil, err
	}
	return &Result{Table: t, Interpolation: s.Interpolation, Check: ch}, nil
}

// Predict evaluates the interpolant the table is meant for at rs (inside
// the grid): V in eV and F in eV/Å.
func (r *Result) Predict(rs []float64) (v, f []float64, err error) {
	in, err := newInterpolant(r.Table, r.Interpolation)
	if err != nil {
		return nil, nil, err
	}
	if err := in.fit(0, len(r.Table.R)-1); err != nil {
		return nil, nil, err
	}
	v, f = make([]float64, len(rs)), make([]float64, len(rs))
	for i, x := range rs {
		v[i], f[i] = in.energy(x), in.force(x)
	}
	return v, f, nil
}
