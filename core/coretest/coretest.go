// Package coretest holds helpers for testing code built on core.Potential.
package coretest

import (
	"sync/atomic"

	"github.com/pairwell/pairwell/core"
)

// Counting wraps a potential and counts the calls made to it, so that a
// test can check that a hot loop batches its evaluations (a plugin potential
// pays a process round trip per call). It is safe for concurrent use.
type Counting struct {
	core.Potential
	Derivs, Batches atomic.Int64
}

// Derivatives counts the call and forwards it.
func (c *Counting) Derivatives(r float64, dst []float64) error {
	c.Derivs.Add(1)
	return c.Potential.Derivatives(r, dst)
}

// Batch counts the call and forwards it.
func (c *Counting) Batch(n int, r, dst []float64) error {
	c.Batches.Add(1)
	return c.Potential.Batch(n, r, dst)
}

// Calls returns the number of calls so far, single-point and batched.
func (c *Counting) Calls() int64 { return c.Derivs.Load() + c.Batches.Load() }

type countingGuess struct{ *Counting }

func (c countingGuess) EquilibriumGuess() float64 {
	return c.Potential.(core.Guesser).EquilibriumGuess()
}

type countingTurnover struct{ *Counting }

func (c countingTurnover) Barrier() (r, v float64) { return c.Potential.(core.Turnover).Barrier() }

type countingBoth struct{ *Counting }

func (c countingBoth) EquilibriumGuess() float64 {
	return c.Potential.(core.Guesser).EquilibriumGuess()
}

func (c countingBoth) Barrier() (r, v float64) { return c.Potential.(core.Turnover).Barrier() }

// Count returns p wrapped in a Counting, as a potential that keeps p's
// core.Guesser and core.Turnover, so that the analysis takes the same path
// with and without the counter.
func Count(p core.Potential) (core.Potential, *Counting) {
	c := &Counting{Potential: p}
	_, g := p.(core.Guesser)
	_, t := p.(core.Turnover)
	switch {
	case g && t:
		return countingBoth{c}, c
	case g:
		return countingGuess{c}, c
	case t:
		return countingTurnover{c}, c
	}
	return c, c
}
