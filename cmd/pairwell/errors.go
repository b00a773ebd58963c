package main

import (
	"errors"
	"fmt"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/plugins"
)

// Exit codes.
const (
	exitFailure = 1 // a computation, plugin or file operation failed
	exitUsage   = 2 // the input was wrong: nothing was computed or written
)

// codedError carries an exit code.
type codedError struct {
	code int
	err  error
}

func (e *codedError) Error() string { return e.err.Error() }
func (e *codedError) Unwrap() error { return e.err }

// usageErr marks err as bad input (exit 2).
func usageErr(err error) error {
	if err == nil {
		return nil
	}
	return &codedError{code: exitUsage, err: err}
}

// failErr marks err as a failure of the computation or the system (exit 1).
func failErr(err error) error {
	if err == nil {
		return nil
	}
	return &codedError{code: exitFailure, err: err}
}

// computeErr classifies an error from the analysis: input that has no
// answer (no minimum, out-of-domain request, invalid parameters) is bad
// input; anything else (no convergence, a plugin failure) is a failure.
func computeErr(err error) error {
	if err == nil {
		return nil
	}
	var c *codedError
	if errors.As(err, &c) {
		return err
	}
	for _, e := range []error{core.ErrNoMinimum, core.ErrDomain, core.ErrParam, core.ErrSpec, core.ErrOrder} {
		if errors.Is(err, e) {
			return usageErr(err)
		}
	}
	return failErr(err)
}

// pluginRowFailure returns, for a command that reports an error per row
// (and has printed every row), a failure (exit 1) when any row failed
// because a plugin did — crashed, timed out, answered against the
// protocol, or was stopped. A row whose input is out of the form's range
// (the pair dissociates, a start outside the domain) is no failure: nil.
func pluginRowFailure(rowErrs []error) error {
	n := 0
	var first error
	for _, err := range rowErrs {
		if err != nil && isPluginFailure(err) {
			if first == nil {
				first = err
			}
			n++
		}
	}
	if first == nil {
		return nil
	}
	return failErr(fmt.Errorf("%d of %d rows failed because a plugin failed; the first: %w", n, len(rowErrs), first))
}

// isPluginFailure reports whether err is a plugin's failure rather than
// an answer about the input.
func isPluginFailure(err error) bool {
	for _, target := range []error{plugins.ErrCrashed, plugins.ErrTimeout, plugins.ErrBadOutput, plugins.ErrClosed, plugins.ErrHandshake} {
		if errors.Is(err, target) {
			return true
		}
	}
	return false
}

// exitCode returns the exit code for an error returned by a command.
// Unmarked errors come from cobra's own parsing and are usage errors.
func exitCode(err error) int {
	var c *codedError
	if errors.As(err, &c) {
		return c.code
	}
	return exitUsage
}
