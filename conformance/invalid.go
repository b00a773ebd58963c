package conformance

import (
	"errors"
	"fmt"
	"math"
	"strings"

	"github.com/pairwell/pairwell/core"
)

// invalidSet is a parameter set that Model.New must reject.
type invalidSet struct {
	why    string
	params []float64
}

// invalidSets derives invalid parameter sets from a valid one and the
// model's declared constraints: one value too few and one too many, and
// for every parameter NaN, +Inf and −Inf, plus 0 and a negative value for
// a Positive parameter and a negative value for a NonNegative one.
func invalidSets(info core.ModelInfo, valid []float64) []invalidSet {
	var out []invalidSet
	if len(valid) > 0 {
		out = append(out, invalidSet{fmt.Sprintf("%d values instead of %d", len(valid)-1, len(valid)), append([]float64(nil), valid[:len(valid)-1]...)})
	}
	out = append(out, invalidSet{fmt.Sprintf("%d values instead of %d", len(valid)+1, len(valid)), append(append([]float64(nil), valid...), 1)})
	with := func(i int, v float64) []float64 {
		ps := append([]float64(nil), valid...)
		ps[i] = v
		return ps
	}
	for i, p := range info.Params {
		if i >= len(valid) {
			break
		}
		bad := []float64{math.NaN(), math.Inf(1), math.Inf(-1)}
		mag := math.Abs(valid[i])
		if mag == 0 || math.IsNaN(mag) || math.IsInf(mag, 0) {
			mag = 1
		}
		switch p.Constraint {
		case core.Positive:
			bad = append(bad, 0, -mag)
		case core.NonNegative:
			bad = append(bad, -mag)
		}
		for _, v := range bad {
			out = append(out, invalidSet{fmt.Sprintf("%s = %g (must be %s)", p.Name, v, p.Constraint), with(i, v)})
		}
	}
	return out
}

// checkInvalidParams checks that Model.New rejects every invalid set,
// with an error wrapping core.ErrParam (or core.ErrNoMinimum).
func (c *subject) checkInvalidParams() Result {
	sets := invalidSets(c.info, c.inst.Params)
	r := c.result(CheckInvalidParams, fmt.Sprintf("%d invalid parameter sets rejected", len(sets)))
	r.Tolerance = 0
	var problems []string
	for _, set := range sets {
		pot, err := c.inst.Model.New(set.params)
		switch {
		case err == nil:
			closePotential(pot)
			problems = append(problems, set.why+": accepted")
		case !isAny(err, core.ErrParam, core.ErrNoMinimum):
			problems = append(problems, fmt.Sprintf("%s: rejected, but the error does not wrap core.ErrParam: %s", set.why, errString(err)))
		}
	}
	r.Error = float64(len(problems))
	r.Passed = len(problems) == 0
	if r.Passed {
		r.Message = fmt.Sprintf("wrong counts, NaN, ±Inf and values breaking the constraints of %s all rejected", paramNames(c.info))
	} else {
		r.Message = fmt.Sprintf("%d of %d invalid sets not rejected properly: %s", len(problems), len(sets), strings.Join(problems, "; "))
	}
	return r
}

func paramNames(info core.ModelInfo) string {
	names := make([]string, len(info.Params))
	for i, p := range info.Params {
		names[i] = p.Name
	}
	return strings.Join(names, ", ")
}

// invalidRs returns separations outside the domain: 0, a negative value,
// NaN, ±Inf, and Domain.Min when it is positive, Domain.Max when finite.
func (c *subject) invalidRs() []float64 {
	rs := []float64{0, -1, math.NaN(), math.Inf(1), math.Inf(-1)}
	if c.dom.Min > 0 {
		rs = append(rs, c.dom.Min, 0.5*c.dom.Min)
	}
	if !math.IsInf(c.dom.Max, 1) {
		rs = append(rs, c.dom.Max)
	}
	return rs
}

// checkInvalidR checks that every separation outside the domain gives an
// error wrapping core.ErrDomain from a single-point Taylor call and from a
// batched one, which must report it as a *core.PointError with the index
// of the bad point when it sits between valid ones.
func (c *subject) checkInvalidR() Result {
	bad := c.invalidRs()
	r := c.result(CheckInvalidR, "bad r rejected")
	r.Tolerance = 0
	good := c.ev.rs[len(c.ev.rs)/2]
	var problems []string
	dst := make([]float64, 3)
	for _, x := range bad {
		err := c.p.Taylor(2, []float64{x}, dst)
		switch {
		case err == nil:
			problems = append(problems, fmt.Sprintf("Taylor(2, [%g]) returned V = %g without an error", x, dst[0]))
		case !errors.Is(err, core.ErrDomain):
			problems = append(problems, fmt.Sprintf("Taylor(2, [%g]): error does not wrap core.ErrDomain: %s", x, errString(err)))
		}
		for _, n := range []int{0, 1} {
			xs := []float64{good, x, good}
			out := make([]float64, 3*(n+1))
			err := c.p.Taylor(n, xs, out)
			var pe *core.PointError
			switch {
			case err == nil:
				problems = append(problems, fmt.Sprintf("Taylor(%d, [%g, %g, %g]) returned V = %g without an error", n, good, x, good, out[n+1]))
			case !errors.Is(err, core.ErrDomain):
				problems = append(problems, fmt.Sprintf("Taylor(%d) with r = %g: error does not wrap core.ErrDomain: %s", n, x, errString(err)))
			case !errors.As(err, &pe) || pe.Index != 1:
				problems = append(problems, fmt.Sprintf("Taylor(%d) with r = %g at index 1: error is not a *core.PointError with Index 1: %s", n, x, errString(err)))
			}
		}
	}
	r.Error = float64(len(problems))
	r.Passed = len(problems) == 0
	if r.Passed {
		r.Message = fmt.Sprintf("%d bad separations rejected by Taylor, alone and among good ones (orders 0 to 2)", len(bad))
	} else {
		r.Message = fmt.Sprintf("%d problems: %s", len(problems), strings.Join(problems, "; "))
	}
	return r
}

// checkInvalidOrder checks that orders beyond MaxOrder and negative orders
// give errors wrapping core.ErrOrder, and that a dst that does not hold
// (n+1)·len(r) values gives an error wrapping core.ErrLength.
func (c *subject) checkInvalidOrder() Result {
	r := c.result(CheckInvalidOrder, "bad orders, slice lengths rejected")
	r.Tolerance = 0
	mo := c.p.MaxOrder()
	good := c.ev.rs[len(c.ev.rs)/2]
	var problems []string
	expect := func(what string, err, want error) {
		switch {
		case err == nil:
			problems = append(problems, what+": no error")
		case !errors.Is(err, want):
			problems = append(problems, fmt.Sprintf("%s: error does not wrap %v: %s", what, want, errString(err)))
		}
	}
	if mo >= 0 && mo < 1<<16 {
		expect(fmt.Sprintf("Taylor(MaxOrder+1 = %d)", mo+1), c.p.Taylor(mo+1, []float64{good}, make([]float64, mo+2)), core.ErrOrder)
	}
	expect("Taylor(−1)", c.p.Taylor(-1, []float64{good}, make([]float64, 0)), core.ErrOrder)
	expect("Taylor(0) with len(r) = 2, len(dst) = 1", c.p.Taylor(0, []float64{good, good}, make([]float64, 1)), core.ErrLength)
	expect("Taylor(2) with len(r) = 1, len(dst) = 2", c.p.Taylor(2, []float64{good}, make([]float64, 2)), core.ErrLength)
	r.Error = float64(len(problems))
	r.Passed = len(problems) == 0
	if r.Passed {
		r.Message = fmt.Sprintf("orders %d and −1 and mismatched slices rejected", mo+1)
	} else {
		r.Message = strings.Join(problems, "; ")
	}
	return r
}
