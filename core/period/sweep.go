package period

import (
	"runtime"
	"sync"
	"sync/atomic"

	"github.com/pairwell/pairwell/core"
)

// Sweep returns the exact periods (fs) at many energies (eV) in the well w
// of p for the reduced mass mu (u), with NewIntegrator(s). See
// Integrator.Sweep.
func Sweep(p core.Potential, w core.Well, mu float64, energies []float64, s Settings, progress func(done, total int)) ([]Result, []error) {
	in, err := NewIntegrator(s)
	if err != nil {
		errs := make([]error, len(energies))
		for i := range errs {
			errs[i] = err
		}
		return make([]Result, len(energies)), errs
	}
	return in.Sweep(p, w, mu, energies, progress)
}

// Sweep returns the exact periods (fs) at many energies (eV) in the well w
// of p for the reduced mass mu (u): results[i] and errs[i] are those of
// in.Exact(p, w, mu, energies[i]), whatever the scheduling, so the output
// order is deterministic. An energy without a bound oscillation gets its
// own error; the others are unaffected.
//
// The energies are shared among runtime.GOMAXPROCS(0) goroutines, each
// with its own buffers; p must be safe for concurrent use, as
// core.Potential requires.
//
// progress, if not nil, is called after each energy with the number of
// energies done so far and the total. Calls are serialised and done
// increases by one each time; keep progress cheap.
func (in *Integrator) Sweep(p core.Potential, w core.Well, mu float64, energies []float64, progress func(done, total int)) ([]Result, []error) {
	n := len(energies)
	results := make([]Result, n)
	errs := make([]error, n)
	workers := min(runtime.GOMAXPROCS(0), n)
	var (
		next atomic.Int64
		lock sync.Mutex
		done int
		wg   sync.WaitGroup
	)
	for range workers {
		wg.Add(1)
		go func() {
			defer wg.Done()
			var sc scratch
			for {
				i := int(next.Add(1)) - 1
				if i >= n {
					return
				}
				results[i], errs[i] = in.exact(p, w, mu, energies[i], &sc)
				if progress != nil {
					lock.Lock()
					done++
					progress(done, n)
					lock.Unlock()
				}
			}
		}()
	}
	wg.Wait()
	return results, errs
}
