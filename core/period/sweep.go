package period

import (
	"runtime"
	"sync"
	"sync/atomic"

	"github.com/pairwell/pairwell/core"
)

// sweepChunk is the number of energies of a chunk of Sweep, one batched
// pass (see Integrator.Sweep).
const sweepChunk = 256

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
// The energies are split into chunks of 256, shared among
// runtime.GOMAXPROCS(0) goroutines (up to 256 energies are computed in the
// calling goroutine), and each chunk is computed in one batched pass: its turning points in one scan and one Newton
// iteration at a time for all its energies, the Taylor expansions at the
// turning points in one p.Taylor call, and the quadrature nodes of all its
// energies in one p.Taylor call per rule. A chunk thus costs a few tens of
// p.Taylor calls whatever its size, which is what matters for
// a potential in another process. p must be safe for concurrent use, as
// core.Potential requires.
//
// progress, if not nil, is called after each energy with the number of
// energies done so far and the total, as the chunks complete. Calls are
// serialised and done increases by one each time; keep progress cheap.
func (in *Integrator) Sweep(p core.Potential, w core.Well, mu float64, energies []float64, progress func(done, total int)) ([]Result, []error) {
	n := len(energies)
	results := make([]Result, n)
	errs := make([]error, n)
	chunks := (n + sweepChunk - 1) / sweepChunk
	if chunks <= 1 {
		sc := in.getScratch()
		in.pass(p, w, mu, energies, results, errs, sc)
		in.putScratch(sc)
		for i := range n {
			if progress != nil {
				progress(i+1, n)
			}
		}
		return results, errs
	}
	workers := min(runtime.GOMAXPROCS(0), chunks)
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
			sc := in.getScratch()
			defer in.putScratch(sc)
			for {
				c := int(next.Add(1)) - 1
				if c >= chunks {
					return
				}
				a, b := c*sweepChunk, min((c+1)*sweepChunk, n)
				in.pass(p, w, mu, energies[a:b], results[a:b], errs[a:b], sc)
				if progress != nil {
					lock.Lock()
					for range b - a {
						done++
						progress(done, n)
					}
					lock.Unlock()
				}
			}
		}()
	}
	wg.Wait()
	return results, errs
}
