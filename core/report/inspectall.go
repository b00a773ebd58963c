package report

import (
	"runtime"

	"github.com/pairwell/pairwell/core"
)

// InspectInput is one form of a batch inspection: a named instance and its
// reduced mass (a zero Mu leaves out the harmonic vibration).
type InspectInput struct {
	Name     string
	Instance core.Instance
	Mass     Mass
	// Err, when set, is why there is no instance (a spec that could not
	// be built); it is passed to emit as the form's error.
	Err error
}

// InspectChunk is the number of forms InspectAll analyses between two
// rounds of output: it bounds the memory held for records not yet written.
const InspectChunk = 512

// InspectAll analyses every input as NewInspect does, on workers
// goroutines (0 means runtime.GOMAXPROCS(0)), and hands the results to emit
// in input order, chunk by chunk (InspectChunk forms), so that a caller can
// stream them. A form that fails is passed with its error; the others are
// unaffected. order is the highest Taylor coefficient (0 means 4). InspectAll
// stops at the first error emit returns, and returns it.
func InspectAll(inputs []InspectInput, order, workers int, emit func(i int, r Inspect, err error) error) error {
	if workers <= 0 {
		workers = runtime.GOMAXPROCS(0)
	}
	res := make([]Inspect, min(InspectChunk, len(inputs)))
	errs := make([]error, len(res))
	for start := 0; start < len(inputs); start += InspectChunk {
		n := min(InspectChunk, len(inputs)-start)
		forEach(workers, n, func(i int) {
			in := inputs[start+i]
			if in.Err != nil {
				res[i], errs[i] = Inspect{}, in.Err
				return
			}
			res[i], errs[i] = NewInspect(in.Name, in.Instance, order, in.Mass)
		})
		for i := range n {
			if err := emit(start+i, res[i], errs[i]); err != nil {
				return err
			}
		}
	}
	return nil
}
