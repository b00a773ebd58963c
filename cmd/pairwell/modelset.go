package main

import (
	"fmt"

	"github.com/pairwell/pairwell/core/modelset"
)

// loadSet reads the model-set file at path and builds its entries. A file
// that cannot be read or parsed, and an entry that cannot be built from its
// spec, are usage errors; a plugin that fails while building is a failure.
func (e *env) loadSet(path string) ([]modelset.Built, error) {
	set, err := e.readSet(path)
	if err != nil {
		return nil, err
	}
	built, err := set.Build(e.registry)
	if err != nil {
		return nil, computeErr(fmt.Errorf("--set %s: %w", path, err))
	}
	return built, nil
}

// readSet reads and parses the model-set file at path (at most
// modelset.MaxSize bytes) as an input of the run and registers the forms it
// declares ([[form]] tables); failures are usage errors.
func (e *env) readSet(path string) (*modelset.Set, error) {
	data, err := e.readInput("--set", path, modelset.MaxSize)
	if err != nil {
		return nil, err
	}
	set, err := modelset.Parse(data, path)
	if err != nil {
		return nil, usageErr(fmt.Errorf("--set: %w", err))
	}
	if err := e.addForms(set.Forms); err != nil {
		return nil, err
	}
	return set, nil
}
