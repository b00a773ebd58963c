package report

import (
	"fmt"
	"runtime"
	"sync"
	"sync/atomic"

	"github.com/pairwell/pairwell/core"
)

// wellOf analyses the well of inst with Taylor coefficients up to order n,
// and up to 4 when the form has them. Errors are prefixed with the model
// key.
func wellOf(inst core.Instance, n int) (core.Well, error) {
	p := inst.Potential
	w, err := core.AnalyzeWell(p, core.WellSettings{Order: max(n, min(4, p.MaxOrder()))})
	if err != nil {
		return core.Well{}, fmt.Errorf("%s: %w", inst.Model.Info().Key, err)
	}
	return w, nil
}

// forEach calls f(i) for every i in [0, n), in any order, on workers
// goroutines (at most n; workers ≤ 0 means runtime.GOMAXPROCS(0)), and
// returns when every call has returned.
func forEach(workers, n int, f func(i int)) {
	if workers <= 0 {
		workers = runtime.GOMAXPROCS(0)
	}
	var (
		next atomic.Int64
		wg   sync.WaitGroup
	)
	for range min(workers, n) {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for i := int(next.Add(1)) - 1; i < n; i = int(next.Add(1)) - 1 {
				f(i)
			}
		}()
	}
	wg.Wait()
}
