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
// Taylor pass over the sample points.
func (c *subject) mismatchResult(r Result, m mismatch, what string) Result {
	r.Tolerance = 0
	r.Error = float64(m.count)
	switch {
	case m.err != nil:
		r.Error, r.WorstR = math.NaN(), m.errR
		r.Message = fmt.Sprintf("%s failed at order %d, r = %.9g Å, where the reference Taylor call succeeded: %s", what, m.errOrder, m.errR, errString(m.err))
	case m.count > 0:
		r.WorstR = m.r
		r.Message = fmt.Sprintf("%d of %d values differ in their bits; first at order %d, r = %.17g Å: the reference Taylor call gave %s = %.17g, %s gave %.17g",
			m.count, m.evaluations, m.order, m.r, vname(m.order), m.want, m.how, m.got)
	default:
		r.Passed = true
		r.Message = fmt.Sprintf("%d values identical to the bit", m.evaluations)
	}
	return r
}

// usableOrders returns the orders whose reference evaluation succeeded.
func (c *subject) usableOrders() []int {
	var ks []int
	for k, err := range c.ev.errs {
		if err == nil {
			ks = append(ks, k)
		}
	}
	return ks
}

// compareRows compares the rows of order m in out (one per point of xs,
// V⁽ᵏ⁾ = k!·c_k) with the reference at the points ref(i), for the usable
// orders k ≤ m.
func (c *subject) compareRows(mm *mismatch, how string, ks []int, m int, xs, out []float64, ref func(i int) int) {
	for i, x := range xs {
		for _, k := range ks {
			if k > m {
				break
			}
			mm.compare(how, k, x, c.ev.vals[k][ref(i)], out[i*(m+1)+k]*factorial(k))
		}
	}
}

// checkBatch checks the layout rules of the contract at every sample
// point: a single-point Taylor call gives the bits of the batched
// reference, and a row of a lower order is the prefix of the row of a
// higher one (the order cycling over the points, and once over all points
// at half the top order).
func (c *subject) checkBatch() Result {
	r := c.result(CheckBatch, "one point = many points, order n = prefix of order m, bit for bit")
	ev := c.ev
	ks := c.usableOrders()
	if len(ks) == 0 {
		r.Message = "no order could be evaluated by Taylor (see the derivative checks)"
		return r
	}
	top := ks[len(ks)-1]
	var m mismatch
	same := func(i int) int { return i }
	for i, x := range ev.rs {
		n := i % (top + 1)
		out := make([]float64, n+1)
		if err := c.p.Taylor(n, []float64{x}, out); err != nil {
			m.fail(fmt.Sprintf("a single-point Taylor(%d)", n), n, x, err)
			continue
		}
		c.compareRows(&m, fmt.Sprintf("a single-point Taylor(%d)", n), ks, n, []float64{x}, out, func(int) int { return i })
	}
	half := top / 2
	out := make([]float64, (half+1)*len(ev.rs))
	if err := c.p.Taylor(half, ev.rs, out); err != nil {
		m.fail(fmt.Sprintf("Taylor(%d) over the sample points", half), half, math.NaN(), err)
	} else {
		c.compareRows(&m, fmt.Sprintf("Taylor(%d) over the sample points", half), ks, half, ev.rs, out, same)
	}
	return c.mismatchResult(r, m, "an evaluation of another shape")
}

// checkDeterminism evaluates every order again, with the points in reverse
// order, and compares the bits.
func (c *subject) checkDeterminism() Result {
	r := c.result(CheckDeterminism, "repeatable, bit for bit")
	ks := c.usableOrders()
	if len(ks) == 0 {
		r.Message = "no order could be evaluated by Taylor (see the derivative checks)"
		return r
	}
	top := ks[len(ks)-1]
	rs := c.ev.rs
	rev := make([]float64, len(rs))
	for i, x := range rs {
		rev[len(rs)-1-i] = x
	}
	var m mismatch
	out := make([]float64, (top+1)*len(rs))
	if err := c.p.Taylor(top, rev, out); err != nil {
		m.fail("a repeated Taylor call", top, math.NaN(), err)
	} else {
		c.compareRows(&m, "a repeated Taylor call (points reversed)", ks, top, rev, out, func(i int) int { return len(rs) - 1 - i })
	}
	return c.mismatchResult(r, m, "a repeated Taylor call")
}

// concurrencyRounds is how often each goroutine repeats its evaluations.
const concurrencyRounds = 2

// checkConcurrency evaluates from Settings.Goroutines goroutines at once:
// each runs Taylor over every point (rotated by a different shift) and at
// every G-th point alone, twice, and compares the bits with the reference.
func (c *subject) checkConcurrency() Result {
	g := c.s.Goroutines
	r := c.result(CheckConcurrency, fmt.Sprintf("%d goroutines at once, bit for bit", g))
	ks := c.usableOrders()
	if len(ks) == 0 {
		r.Message = "no order could be evaluated by Taylor (see the derivative checks)"
		return r
	}
	top := ks[len(ks)-1]
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
			out := make([]float64, (top+1)*n)
			one := make([]float64, top+1)
			for round := 0; round < concurrencyRounds; round++ {
				if err := c.p.Taylor(top, rot, out); err != nil {
					m.fail("a concurrent Taylor call", top, math.NaN(), err)
				} else {
					c.compareRows(m, "a concurrent Taylor call", ks, top, rot, out, func(i int) int { return (i + shift) % n })
				}
				for i := w; i < n; i += g {
					if err := c.p.Taylor(top, rs[i:i+1], one); err != nil {
						m.fail("a concurrent single-point Taylor call", top, rs[i], err)
						continue
					}
					c.compareRows(m, "a concurrent single-point Taylor call", ks, top, rs[i:i+1], one, func(int) int { return i })
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
