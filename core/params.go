package core

import (
	"fmt"
	"sync"
)

// The two optional capabilities a fit uses beyond the contract: the
// derivatives of V with respect to a potential's own parameters
// (ParamGradient, on a potential) and the evaluation of many parameter sets
// of a model in one call (SetEvaluator, on a model). Like Matcher, a
// wrapper always implements them and delegates with ParamDerivatives and
// EvaluateSets, which report ErrUnsupported (ParamDerivatives) or fall back
// to New and Taylor (EvaluateSets) when the wrapped value has none; so a
// capability survives any number of wrappers.

// ParamGradient is implemented by potentials that evaluate the derivatives
// of V with respect to their own parameters analytically (a fit then uses
// them for its Jacobian instead of central differences).
type ParamGradient interface {
	// ParamGradient stores ∂V(r[i])/∂pⱼ in dst[i·P+j] (row-major), P the
	// number of parameters, in the order and default units of the
	// model's Info().Params: eV per unit of pⱼ. len(dst) must be
	// len(r)·P; a separation outside the domain is a *PointError
	// wrapping ErrDomain, as for Taylor. A wrapper whose inner potential
	// has none returns an error wrapping ErrUnsupported.
	ParamGradient(r, dst []float64) error
}

// ParamDerivatives stores ∂V(r[i])/∂pⱼ in dst[i·P+j] when p is a
// ParamGradient, and otherwise returns an error wrapping ErrUnsupported.
// Callers and wrappers use it instead of a type assertion.
func ParamDerivatives(p Potential, r, dst []float64) error {
	if g, ok := p.(ParamGradient); ok {
		return g.ParamGradient(r, dst)
	}
	return fmt.Errorf("parameter derivatives: %w", ErrUnsupported)
}

// SetEvaluator is implemented by models that evaluate the Taylor
// coefficients of many parameter sets in one call — a plugin in one round
// trip instead of a New and a Taylor call for each set.
type SetEvaluator interface {
	// EvaluateSets evaluates S = len(errs) parameter sets, set s being
	// params[s·P:(s+1)·P] (P = len(Info().Params), default units): it
	// stores c_k(r[i]) = V⁽ᵏ⁾(r[i])/k! of set s at
	// dst[(s·len(r)+i)·(n+1)+k] — each set's block laid out as Taylor lays
	// it out — and the error of building or evaluating set s (what New or
	// Taylor would return) in errs[s], leaving that block unspecified. The
	// returned error is for the call as a whole: lengths that do not fit
	// (wrapping ErrLength), a plugin that failed.
	EvaluateSets(n int, params, r, dst []float64, errs []error) error
}

// EvaluateSets evaluates many parameter sets of m as SetEvaluator
// describes: through m's own EvaluateSets when m is a SetEvaluator, and
// otherwise by New and one Taylor call for each set, the sets
// concurrently (for a model in another process their round trips
// overlap). Callers and wrappers use it instead of a type assertion.
func EvaluateSets(m Model, n int, params, r, dst []float64, errs []error) error {
	if e, ok := m.(SetEvaluator); ok {
		return e.EvaluateSets(n, params, r, dst, errs)
	}
	return EvaluateEach(m, n, params, r, dst, errs)
}

// EvaluateEach evaluates many parameter sets of m as SetEvaluator
// describes by New and one Taylor call for each set, the sets
// concurrently: the fallback of EvaluateSets, and of a SetEvaluator that
// finds its fast path missing (a plugin built before it).
func EvaluateEach(m Model, n int, params, r, dst []float64, errs []error) error {
	if err := CheckSets(m.Info(), n, params, r, dst, errs); err != nil {
		return err
	}
	np, block := len(m.Info().Params), len(r)*(n+1)
	var wg sync.WaitGroup
	for s := range errs {
		wg.Add(1)
		go func() {
			defer wg.Done()
			p, err := m.New(params[s*np : (s+1)*np])
			if err == nil {
				err = p.Taylor(n, r, dst[s*block:(s+1)*block])
			}
			errs[s] = err
		}()
	}
	wg.Wait()
	return nil
}

// CheckSets checks the arguments of an EvaluateSets call for a model
// described by info: the order, and lengths that fit each other (errors
// wrapping ErrOrder and ErrLength).
func CheckSets(info ModelInfo, n int, params, r, dst []float64, errs []error) error {
	if err := CheckOrder(n, info.MaxOrder); err != nil {
		return fmt.Errorf("%s: %w", info.Key, err)
	}
	s, np := len(errs), len(info.Params)
	if len(params) != s*np || len(dst) != s*len(r)*(n+1) {
		return fmt.Errorf("%s: %w: %d parameter sets of %d need %d parameters and %d coefficients at %d separations, got %d and %d",
			info.Key, ErrLength, s, np, s*np, s*len(r)*(n+1), len(r), len(params), len(dst))
	}
	return nil
}

// CheckParamGradient checks the lengths of a ParamGradient call of the form
// key with np parameters: dst must hold len(r)·np values, else the error
// wraps ErrLength.
func CheckParamGradient(key string, np int, r, dst []float64) error {
	if len(dst) != len(r)*np {
		return fmt.Errorf("%s: %w: %d separations need %d gradient values, dst has %d", key, ErrLength, len(r), len(r)*np, len(dst))
	}
	return nil
}
