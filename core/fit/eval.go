package fit

import (
	"errors"
	"fmt"

	"github.com/pairwell/pairwell/core"
)

// This file holds every evaluation of a potential that the package makes:
// each is one batched call for all points, since a potential may live in
// another process.

// build makes the potential of params, an error wrapping ErrInfeasible
// when the model refuses the set (constraints, no minimum).
func build(m core.Model, params []float64) (core.Potential, error) {
	p, err := m.New(params)
	if err != nil {
		return nil, infeasible(err)
	}
	return p, nil
}

// energies stores V(r[i]) in dst: one Taylor call of order 0 for all
// points.
func energies(p core.Potential, r, dst []float64) error {
	return infeasible(p.Taylor(0, r, dst))
}

// forces stores −V′(r[i]) in dst: one Taylor call of order 1 for all
// points.
func forces(p core.Potential, r, dst []float64) error {
	if _, err := core.DerivativeBatch(p, 1, r, dst, nil); err != nil {
		return infeasible(err)
	}
	for i, v := range dst {
		dst[i] = -v
	}
	return nil
}

// evaluateSets evaluates parameter sets of m in one call
// (core.EvaluateSets).
func evaluateSets(m core.Model, n int, params, r, dst []float64, errs []error) error {
	return core.EvaluateSets(m, n, params, r, dst, errs)
}

// equilibrium returns the position of the minimum of p.
func equilibrium(p core.Potential) (float64, error) { return core.Equilibrium(p) }

// paramGradient stores ∂V(r[i])/∂pⱼ in dst when p evaluates it
// analytically (core.ParamGradient, also through wrappers); ok is false
// when it does not.
func paramGradient(p core.Potential, r, dst []float64) (ok bool, err error) {
	err = core.ParamDerivatives(p, r, dst)
	if errors.Is(err, core.ErrUnsupported) {
		return false, nil
	}
	return true, infeasible(err)
}

// infeasible wraps errors that mean "this parameter set cannot describe
// the data" (outside the domain, invalid parameters, no minimum) in
// ErrInfeasible, so that the engine rejects the trial point; other errors
// (a crashed plugin) pass unchanged and stop the fit.
func infeasible(err error) error {
	if err == nil {
		return nil
	}
	for _, e := range []error{core.ErrDomain, core.ErrParam, core.ErrNoMinimum} {
		if errors.Is(err, e) {
			return fmt.Errorf("%w: %w", ErrInfeasible, err)
		}
	}
	return err
}
