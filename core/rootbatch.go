package core

import (
	"errors"
	"fmt"
	"math"
)

// RootProblem is one problem of RootBatch: a root in [Lo, Hi] of a
// function whose values FLo at Lo and FHi at Hi have opposite signs (or one
// is zero). The ends may come in either order.
type RootProblem struct {
	Lo, Hi   float64
	FLo, FHi float64

	// Start is the first iterate when it lies strictly between Lo and
	// Hi (e.g. from linear interpolation between the ends); otherwise
	// the first iterate is the midpoint, as in Root.
	Start float64

	// Noise is the absolute rounding error of the function's values, 0
	// when negligible. Once |f(x)| ≤ Noise at an iterate, Newton steps
	// are steered by rounding rather than by f; the bracket is then
	// narrowed by sampling instead (see RootBatch).
	Noise float64
}

// BatchFunc evaluates many functions at once for RootBatch. It stores in
// fx[k] the value at x[k] of the function of problem idx[k], for every k,
// and that function's derivative at x[k] in dfx[k] for k < len(dfx) (dfx
// may be shorter than x, or empty). A failure at one point is reported as
// a *PointError whose Index is k.
type BatchFunc func(idx []int, x, fx, dfx []float64) error

// rootSamples is the number of points a problem samples per iteration once
// its function values are dominated by rounding: each such iteration
// narrows the bracket by a factor of rootSamples+1.
const rootSamples = 15

// sampleBand is the width of the rounding band, in ulp, from which a
// problem samples rather than takes Newton steps.
const sampleBand = 32

// RootBatch finds roots of many functions at once, for functions that are
// cheaper to evaluate in bulk than one point at a time (a potential in
// another process, whose every call is a round trip). It is Root run on
// all problems in lockstep: each iteration makes one call to f, over the
// problems not yet done, and each problem follows its own iteration,
// whatever the others do, so its root does not depend on which problems
// it is solved with.
//
// The iteration of a problem is that of Root, with the ends' values given
// instead of evaluated: Newton steps, falling back to bisection whenever a
// step would leave the current bracket or fails to halve it. It stops, with
// a root accurate to a few ulp, when the Newton step |f/f′| is within 2 ulp
// of x, when the safeguarded step or the bracket is within 2 ulp of x, or
// at an exact zero. Two changes make it converge where Root is slow: the
// Newton step is checked before the safeguard, so that an iterate on a
// root at an end of the bracket stops there; and the first time a Newton
// step leaves the bracket through an end, the next iterate is the point
// next to that end instead of the midpoint, so that a root within an ulp
// of an end (a bracket end from a scan that happens to be the root) closes
// the bracket at once rather than after ~50 bisections. When |f(x)| ≤ Noise the rounding of f, not f, steers
// the Newton steps, which then only wander inside the band where the sign
// of f is uncertain; the problem instead samples rootSamples points per
// iteration (fewer when fewer floats lie in between), first across that
// band (width 2·Noise/|f′(x)| next to x) and then across the bracket,
// keeping each time the first sign change from the Lo side, down to a
// bracket of 2 ulp, and returns the end with the smaller |f|. These
// sampling iterations need no derivatives.
//
// roots[i] and errs[i] receive the result of problem i: the root and nil,
// or an error wrapping ErrNoConvergence (ends of the same sign, or more
// than 200 iterations), or the error of f at a point of that problem (a
// *PointError). Any other error of f is returned, and then the problems not
// yet done have errs[i] set to it. roots, errs and probs must have the same
// length, else the error wraps ErrLength.
func RootBatch(f BatchFunc, probs []RootProblem, roots []float64, errs []error) error {
	var ws RootWorkspace
	return ws.Solve(f, probs, roots, errs)
}

// RootWorkspace holds the buffers of RootBatch, to be reused by calls in
// a loop. The zero value is ready to use; a RootWorkspace must not be used
// by two calls at once.
type RootWorkspace struct {
	st         []rootState
	active     []int
	idx        []int
	xs, fx, dx []float64
}

// Solve is RootBatch with the buffers of ws.
func (ws *RootWorkspace) Solve(f BatchFunc, probs []RootProblem, roots []float64, errs []error) error {
	n := len(probs)
	if len(roots) != n || len(errs) != n {
		return fmt.Errorf("root batch: %w: %d problems, %d roots, %d errors", ErrLength, n, len(roots), len(errs))
	}
	if cap(ws.st) < n {
		ws.st, ws.active = make([]rootState, n), make([]int, 0, n)
	}
	st := ws.st[:n]
	active := ws.active[:0]
	for i, pr := range probs {
		errs[i] = nil
		lo, hi, flo, fhi := pr.Lo, pr.Hi, pr.FLo, pr.FHi
		if lo > hi {
			lo, hi, flo, fhi = hi, lo, fhi, flo
		}
		switch {
		case flo == 0:
			roots[i] = lo
			continue
		case fhi == 0:
			roots[i] = hi
			continue
		case (flo < 0) == (fhi < 0) || math.IsNaN(flo) || math.IsNaN(fhi):
			errs[i] = fmt.Errorf("same sign at %g and %g: %w", lo, hi, ErrNoConvergence)
			continue
		}
		x := 0.5 * (lo + hi)
		if pr.Start > lo && pr.Start < hi {
			x = pr.Start
		}
		st[i] = rootState{lo: lo, hi: hi, flo: flo, fhi: fhi, x: x, width: hi - lo, noise: pr.Noise}
		active = append(active, i)
	}
	idx, xs, fx, dfx := ws.idx, ws.xs, ws.fx, ws.dx
	defer func() { ws.idx, ws.xs, ws.fx, ws.dx = idx[:0], xs[:0], fx, dfx }()
	for iter := 0; len(active) > 0; iter++ {
		if iter == maxIter {
			for _, i := range active {
				errs[i] = fmt.Errorf("bracket [%g, %g] after %d iterations: %w", st[i].lo, st[i].hi, maxIter, ErrNoConvergence)
			}
			return nil
		}
		// Newton iterates first (with derivatives), then the samples.
		total := 0
		for _, i := range active {
			total++
			if st[i].sampling {
				total += rootSamples
			}
		}
		if cap(idx) < total {
			idx, xs = make([]int, 0, total), make([]float64, 0, total)
		}
		idx, xs = idx[:0], xs[:0]
		for _, i := range active {
			if !st[i].sampling {
				idx, xs = append(idx, i), append(xs, st[i].x)
			}
		}
		nd := len(xs)
		for _, i := range active {
			if s := &st[i]; s.sampling {
				a, b := s.lo, s.hi
				if s.band > 0 { // the first sampling: the band next to x
					if s.x == s.lo {
						b = math.Min(s.hi, s.x+s.band)
					} else {
						a = math.Max(s.lo, s.x-s.band)
					}
				}
				// No more samples than floats in between.
				m := rootSamples
				if u := (b - a) / ulp(math.Max(math.Abs(a), math.Abs(b))); u < rootSamples+1 {
					m = max(int(u)-1, 1)
				}
				for k := 1; k <= m; k++ {
					idx, xs = append(idx, i), append(xs, a+(b-a)*float64(k)/float64(m+1))
				}
			}
		}
		fx = grow(fx, len(xs))
		dfx = grow(dfx, nd)
		err := f(idx, xs, fx, dfx)
		for err != nil {
			var pe *PointError
			if !errors.As(err, &pe) || pe.Index < 0 || pe.Index >= len(idx) {
				for _, i := range active {
					errs[i] = err
				}
				return err
			}
			// Drop the failing problem and evaluate the others again.
			bad := idx[pe.Index]
			errs[bad] = err
			st[bad].failed = true
			k, kd := 0, 0
			for j, i := range idx {
				if i == bad {
					continue
				}
				if j < nd {
					kd++
				}
				idx[k], xs[k] = i, xs[j]
				k++
			}
			idx, xs, fx, dfx, nd = idx[:k], xs[:k], fx[:k], dfx[:kd], kd
			err = nil
			if k > 0 {
				err = f(idx, xs, fx, dfx)
			}
		}
		// Update every problem from its values.
		for j := 0; j < nd; j++ {
			i := idx[j]
			if r, done := st[i].newton(fx[j], dfx[j]); done {
				roots[i], st[i].done = r, true
			}
		}
		for j := nd; j < len(idx); {
			i := idx[j]
			k := j
			for k < len(idx) && idx[k] == i {
				k++
			}
			if r, done := st[i].sample(xs[j:k], fx[j:k]); done {
				roots[i], st[i].done = r, true
			}
			j = k
		}
		k := 0
		for _, i := range active {
			if !st[i].done && !st[i].failed {
				active[k] = i
				k++
			}
		}
		active = active[:k]
	}
	return nil
}

// rootState is the state of one problem of RootBatch. lo and hi are the
// ends of the bracket in increasing order, flo and fhi the function there.
type rootState struct {
	lo, hi, flo, fhi float64
	x, width         float64
	noise            float64
	band             float64 // width of the first sampling, next to x
	sampling, probed bool
	done, failed     bool
}

// newton takes one step of Root's iteration from the value fx and
// derivative dfx at s.x.
func (s *rootState) newton(fx, dfx float64) (root float64, done bool) {
	x := s.x
	if fx == 0 {
		return x, true
	}
	if (fx < 0) == (s.flo < 0) {
		s.lo, s.flo = x, fx
	} else {
		s.hi, s.fhi = x, fx
	}
	step := fx / dfx
	if math.Abs(step) <= 2*ulp(x) {
		return x - step, true
	}
	if math.Abs(fx) <= s.noise {
		// Sample when the band is wide; within a narrow one, Newton
		// steps and the safeguard close the bracket in a few steps.
		band := 2 * s.noise / math.Abs(dfx)
		if !(band > 0) || math.IsInf(band, 1) {
			band = 0
		}
		if !(band > 0) || band > sampleBand*ulp(x) {
			s.sampling, s.band = true, band
			return s.converged()
		}
	}
	next := x - step
	switch {
	case !s.probed && (next >= s.hi || next <= s.lo):
		// The step leaves the bracket through an end, near which the
		// root may then lie: probe the point next to that end, once.
		s.probed = true
		end := s.hi
		if next <= s.lo {
			end = s.lo
		}
		next = math.Nextafter(end, x)
		if !(next > s.lo && next < s.hi) {
			next = 0.5 * (s.lo + s.hi)
		}
	case !(next > s.lo && next < s.hi) || math.Abs(next-x) > 0.5*s.width:
		next = 0.5 * (s.lo + s.hi) // bisection safeguard
	}
	s.width = s.hi - s.lo
	if math.Abs(next-x) <= 2*ulp(x) || s.width <= 2*ulp(x) {
		return next, true
	}
	s.x = next
	return 0, false
}

// sample narrows the bracket to the first sign change among the samples
// xs (increasing, inside it) with values fx.
func (s *rootState) sample(xs, fx []float64) (root float64, done bool) {
	s.band = 0
	for k, v := range fx {
		if v == 0 {
			return xs[k], true
		}
		if (v < 0) == (s.flo < 0) {
			s.lo, s.flo = xs[k], v
			continue
		}
		s.hi, s.fhi = xs[k], v
		break
	}
	return s.converged()
}

// converged reports whether the bracket is within 2 ulp, with the end of
// smaller |f| as the root.
func (s *rootState) converged() (float64, bool) {
	if s.hi-s.lo > 2*ulp(math.Max(math.Abs(s.lo), math.Abs(s.hi))) {
		return 0, false
	}
	if math.Abs(s.fhi) < math.Abs(s.flo) {
		return s.hi, true
	}
	return s.lo, true
}

// grow returns s resized to n, reusing its storage when large enough.
func grow(s []float64, n int) []float64 {
	if cap(s) < n {
		return make([]float64, n)
	}
	return s[:n]
}
