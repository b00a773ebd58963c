// Package coretest holds helpers for testing code built on core.Potential.
package coretest

import (
	"sync/atomic"

	"github.com/pairwell/pairwell/core"
)

// Counting wraps a potential and counts the calls made to it, so that a
// test can check that a hot loop batches its evaluations (a plugin potential
// pays a process round trip per call). It forwards everything the contract
// carries (Domain holds the barrier and the equilibrium guess) and the
// optional core.ParamGradient, so the analysis takes the same path with and
// without the counter. It is safe for
// concurrent use.
type Counting struct {
	core.Potential
	// Singles counts calls with one separation, Batches calls with more
	// (or none).
	Singles, Batches atomic.Int64
}

// Taylor counts the call and forwards it.
func (c *Counting) Taylor(n int, r, dst []float64) error {
	if len(r) == 1 {
		c.Singles.Add(1)
	} else {
		c.Batches.Add(1)
	}
	return c.Potential.Taylor(n, r, dst)
}

// ParamGradient forwards the parameter derivatives of the wrapped
// potential (core.ParamDerivatives: an error wrapping core.ErrUnsupported
// when it has none), uncounted.
func (c *Counting) ParamGradient(r, dst []float64) error {
	return core.ParamDerivatives(c.Potential, r, dst)
}

// Calls returns the number of calls so far, single-point and batched.
func (c *Counting) Calls() int64 { return c.Singles.Load() + c.Batches.Load() }

// Count returns p wrapped in a Counting, both as a core.Potential and as
// the counter.
func Count(p core.Potential) (core.Potential, *Counting) {
	c := &Counting{Potential: p}
	return c, c
}

// Derivatives stores V⁽ᵏ⁾(r) = k!·c_k(r) in d[k], k = 0, …, len(d)−1, from
// one single-point Taylor call: for tests that compare raw derivatives
// with the literature or with finite differences. Values whose k!·c_k
// overflows are ±Inf.
func Derivatives(p core.Potential, r float64, d []float64) error {
	if len(d) == 0 {
		return nil
	}
	if err := p.Taylor(len(d)-1, []float64{r}, d); err != nil {
		return err
	}
	for k := range d {
		d[k] *= core.Factorial(k)
	}
	return nil
}

// Batch stores V⁽ⁿ⁾(r[i]) in dst[i] (core.DerivativeBatch without reused
// scratch).
func Batch(p core.Potential, n int, r, dst []float64) error {
	_, err := core.DerivativeBatch(p, n, r, dst, nil)
	return err
}
