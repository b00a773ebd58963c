package conformance

import (
	"fmt"
	"math"
	"sync"
)

// mismatch records the first value that differs from the reference.
type mismatch struct {
	count       int
	order       int
	r           float64
	want, got   float64
	how         string
	err         error // an evaluation that failed
	errOrder    int
	errR        float64
	evaluations int
}

func (m *mismatch) compare(how string, order int, r, want, got float64) {
	m.evaluations++
	if math.Float64bits(want) == math.Float64bits(got) {
		return
	}
	if m.count == 0 {
		m.order, m.r, m.want, m.got, m.how = order, r, want, got, how
	}
	m.count++
}

func (m *mismatch) fail(how string, order int, r float64, err error) {
	if m.err == nil {
		m.err, m.errOrder, m.errR = fmt.Errorf("%s: %w", how, err), order, r
	}
}

// merge adds o into m, keeping m's first mismatch.
func (m *mismatch) merge(o mismatch) {
	if m.count == 0 && o.count > 0 {
		m.order, m.r, m.want, m.got, m.how = o.order, o.r, o.want, o.got, o.how
	}
	m.count += o.count
	m.evaluations += o.evaluations
	if m.err == nil && o.err != nil {
		m.err, m.errOrder, m.errR = o.err, o.errOrder, o.errR
	}
}

// mismatchResult turns m into a Result whose reference is the first
// Batch pass.
func (c *subject) mismatchResult(r Result, m mismatch, what string) Result {
	r.Tolerance = 0
	r.Error = float64(m.count)
	switch {
	case m.err != nil:
		r.Error, r.WorstR = math.NaN(), m.errR
		r.Message = fmt.Sprintf("%s failed at order %d, r = %.9g Å, where Batch succeeded: %s", what, m.errOrder, m.errR, errString(m.err))
	case m.count > 0:
		r.WorstR = m.r
		r.Message = fmt.Sprintf("%d of %d values differ in their bits; first at order %d, r = %.17g Å: Batch gave %.17g, %s gave %.17g",
			m.count, m.evaluations, m.order, m.r, m.want, m.how, m.got)
	default:
		r.Passed = true
		r.Message = fmt.Sprintf("%d values identical to the bit", m.evaluations)
	}
	return r
}

// usableOrders returns the orders whose reference Batch pass succeeded.
func (c *subject) usableOrders() []int {
	var ks []int
	for k, err := range c.ev.errs {
		if err == nil {
			ks = append(ks, k)
		}
	}
	return ks
}

// checkBatch compares Derivatives with the reference Batch values at every
// sample point: with all orders at once, and with a prefix of them (the
// prefix length cycling over the points), since the contract asks for the
// same bits whichever method and slice length is used.
func (c *subject) checkBatch() Result {
	r := c.result(CheckBatch, "Batch = Derivatives, bit for bit")
	ev := c.ev
	ks := c.usableOrders()
	if len(ks) == 0 {
		r.Message = "no order could be evaluated by Batch (see the derivative checks)"
		return r
	}
	var m mismatch
	full := make([]float64, c.order+1)
	for i, x := range ev.rs {
		if err := c.p.Derivatives(x, full); err != nil {
			m.fail("Derivatives", c.order, x, err)
			continue
		}
		prefix := make([]float64, i%(c.order+1)+1)
		if err := c.p.Derivatives(x, prefix); err != nil {
			m.fail(fmt.Sprintf("Derivatives with len(dst) = %d", len(prefix)), len(prefix)-1, x, err)
			continue
		}
		for _, k := range ks {
			m.compare("Derivatives", k, x, ev.vals[k][i], full[k])
			if k < len(prefix) {
				m.compare(fmt.Sprintf("Derivatives with len(dst) = %d", len(prefix)), k, x, ev.vals[k][i], prefix[k])
			}
		}
	}
	return c.mismatchResult(r, m, "Derivatives")
}

// checkDeterminism evaluates every order again by Batch, with the points
// in reverse order, and compares the bits.
func (c *subject) checkDeterminism() Result {
	r := c.result(CheckDeterminism, "repeatable, bit for bit")
	ks := c.usableOrders()
	if len(ks) == 0 {
		r.Message = "no order could be evaluated by Batch (see the derivative checks)"
		return r
	}
	rs := c.ev.rs
	rev := make([]float64, len(rs))
	for i, x := range rs {
		rev[len(rs)-1-i] = x
	}
	var m mismatch
	out := make([]float64, len(rs))
	for _, k := range ks {
		if err := c.p.Batch(k, rev, out); err != nil {
			m.fail("a repeated Batch", k, math.NaN(), err)
			continue
		}
		for i, x := range rev {
			m.compare("a repeated Batch (points reversed)", k, x, c.ev.vals[k][len(rs)-1-i], out[i])
		}
	}
	return c.mismatchResult(r, m, "a repeated Batch")
}

// concurrencyRounds is how often each goroutine repeats its evaluations.
const concurrencyRounds = 2

// checkConcurrency evaluates from Settings.Goroutines goroutines at once:
// each runs Batch over every order (starting at a different one, with the
// points rotated) and Derivatives at every G-th point, twice, and compares
// the bits with the reference.
func (c *subject) checkConcurrency() Result {
	g := c.s.Goroutines
	r := c.result(CheckConcurrency, fmt.Sprintf("%d goroutines at once, bit for bit", g))
	ks := c.usableOrders()
	if len(ks) == 0 {
		r.Message = "no order could be evaluated by Batch (see the derivative checks)"
		return r
	}
	rs := c.ev.rs
	n := len(rs)
	results := make([]mismatch, g)
	var wg sync.WaitGroup
	for w := 0; w < g; w++ {
		wg.Add(1)
		go func(w int) {
			defer wg.Done()
			m := &results[w]
			shift := (w * n) / g
			rot := append(append([]float64(nil), rs[shift:]...), rs[:shift]...)
			out := make([]float64, n)
			dst := make([]float64, c.order+1)
			for round := 0; round < concurrencyRounds; round++ {
				for j := range ks {
					k := ks[(j+w)%len(ks)]
					if err := c.p.Batch(k, rot, out); err != nil {
						m.fail("a concurrent Batch", k, math.NaN(), err)
						continue
					}
					for i := range rot {
						src := (i + shift) % n
						m.compare("a concurrent Batch", k, rot[i], c.ev.vals[k][src], out[i])
					}
				}
				for i := w; i < n; i += g {
					if err := c.p.Derivatives(rs[i], dst); err != nil {
						m.fail("a concurrent Derivatives", c.order, rs[i], err)
						continue
					}
					for _, k := range ks {
						m.compare("a concurrent Derivatives", k, rs[i], c.ev.vals[k][i], dst[k])
					}
				}
			}
		}(w)
	}
	wg.Wait()
	var all mismatch
	for _, m := range results {
		all.merge(m)
	}
	return c.mismatchResult(r, all, "a concurrent evaluation")
}
