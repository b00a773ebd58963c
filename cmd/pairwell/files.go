package main

import (
	"errors"
	"fmt"
	"io"

	"github.com/pairwell/pairwell/core/fileio"
)

// readInput reads an input file of the run with a size cap (and records
// it as an input, so that no output of the run may replace it). A file
// that is missing, unreadable, not regular or too large is bad input.
func (e *env) readInput(flag, path string, max int64) ([]byte, error) {
	data, err := e.files.ReadFile(path, max)
	if err != nil {
		return nil, usageErr(fmt.Errorf("%s: %w", flag, err))
	}
	return data, nil
}

// checkOutput checks an output path before the work starts: a target the
// output-file policy refuses (an input of the run, a link, a device, …) is
// bad input.
func (e *env) checkOutput(flag, path string) error {
	if _, err := e.files.Check(path); err != nil {
		return fileErr(flag, err)
	}
	return nil
}

// writeOutput writes an output file under the policy of core/fileio.
func (e *env) writeOutput(flag, path string, write func(io.Writer) error) error {
	if err := e.files.WriteFile(path, write); err != nil {
		return fileErr(flag, err)
	}
	return nil
}

// fileErr classifies a file error: a refusal by the policy or a size cap
// is bad input (exit 2), anything else a failure (exit 1).
func fileErr(flag string, err error) error {
	err = fmt.Errorf("%s: %w", flag, err)
	if errors.Is(err, fileio.ErrRefused) || errors.Is(err, fileio.ErrTooLarge) {
		return usageErr(err)
	}
	return failErr(err)
}
