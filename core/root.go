package core

import (
	"fmt"
	"math"
)

// maxIter bounds the safeguarded Newton iterations of Root. Every iteration
// at least halves the bracket, so 200 of them shrink a bracket of width W to
// W·2⁻²⁰⁰, within 2 ulp of the root unless the root lies closer to zero than
// about W·1e-44 — no separation in Å comes near that. Near a simple root the
// Newton steps converge in a handful of iterations.
const maxIter = 200

// Root finds a root of f in [lo, hi], where f(lo) and f(hi) have opposite
// signs (or one is zero). f returns the function and its derivative. Root
// takes Newton steps and falls back to bisection whenever a step would leave
// the current bracket or fails to halve it, so it converges for any
// continuous f with a sign change; near a simple root it converges
// quadratically. It stops when the step or the bracket is within 2 ulp of x,
// and returns an error wrapping ErrNoConvergence after maxIter iterations or
// when the ends do not bracket a root.
func Root(f func(x float64) (fx, dfx float64, err error), lo, hi float64) (float64, error) {
	if lo > hi {
		lo, hi = hi, lo
	}
	flo, _, err := f(lo)
	if err != nil {
		return 0, err
	}
	if flo == 0 {
		return lo, nil
	}
	fhi, _, err := f(hi)
	if err != nil {
		return 0, err
	}
	if fhi == 0 {
		return hi, nil
	}
	if (flo < 0) == (fhi < 0) {
		return 0, fmt.Errorf("same sign at %g and %g: %w", lo, hi, ErrNoConvergence)
	}
	x := 0.5 * (lo + hi)
	width := hi - lo
	for i := 0; i < maxIter; i++ {
		fx, dfx, err := f(x)
		if err != nil {
			return 0, err
		}
		if fx == 0 {
			return x, nil
		}
		if (fx < 0) == (flo < 0) {
			lo = x
		} else {
			hi = x
		}
		next := x - fx/dfx
		if !(next > lo && next < hi) || math.Abs(next-x) > 0.5*width {
			next = 0.5 * (lo + hi) // bisection safeguard
		}
		width = hi - lo
		if math.Abs(next-x) <= 2*ulp(x) || width <= 2*ulp(x) {
			return next, nil
		}
		x = next
	}
	return 0, fmt.Errorf("bracket [%g, %g] after %d iterations: %w", lo, hi, maxIter, ErrNoConvergence)
}

func ulp(x float64) float64 {
	x = math.Abs(x)
	return math.Nextafter(x, math.Inf(1)) - x
}
