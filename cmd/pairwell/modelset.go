package main

import (
	"fmt"

	"github.com/pairwell/pairwell/core/modelset"
)

// loadSet reads the model-set file at path and builds its entries. A file
// that cannot be read or parsed, and an entry that cannot be built from its
// spec, are usage errors; a plugin that fails while building is a failure.
func (e *env) loadSet(path string) ([]modelset.Built, error) {
	set, err := modelset.Load(path)
	if err != nil {
		return nil, usageErr(fmt.Errorf("--set: %w", err))
	}
	if err := e.addForms(set.Forms); err != nil {
		return nil, err
	}
	built, err := set.Build(e.registry)
	if err != nil {
		return nil, computeErr(fmt.Errorf("--set %s: %w", path, err))
	}
	return built, nil
}
