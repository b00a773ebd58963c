package figure

import (
	"math"
	"strconv"
	"strings"

	"gonum.org/v1/plot"
)

// niceTicks places about six labelled ticks at multiples of 1, 2, 2.5 or
// 5 × 10ᵏ, with unlabelled minor ticks between them, and writes negative
// labels with a true minus sign.
type niceTicks struct{}

// Ticks implements plot.Ticker.
func (niceTicks) Ticks(lo, hi float64) []plot.Tick {
	span := hi - lo
	if !(span > 0) || math.IsInf(span, 0) {
		return nil
	}
	step, minor, digits := niceStep(span / 6)
	var ticks []plot.Tick
	start := math.Ceil(lo/minor-1e-9) * minor
	for i := 0; ; i++ {
		v := start + float64(i)*minor
		if v > hi+1e-9*span {
			break
		}
		t := plot.Tick{Value: v}
		if k := v / step; math.Abs(k-math.Round(k)) < 1e-6 {
			if math.Abs(v) < 1e-9*step {
				v = 0
			}
			t.Value = v
			t.Label = strings.Replace(strconv.FormatFloat(v, 'f', digits, 64), "-", "−", 1)
		}
		ticks = append(ticks, t)
	}
	return ticks
}

// niceStep returns the step of labelled ticks nearest above raw among
// {1, 2, 2.5, 5} × 10ᵏ, the step of the minor ticks and the number of
// decimals the labels need.
func niceStep(raw float64) (step, minor float64, digits int) {
	e := math.Floor(math.Log10(raw))
	p := math.Pow(10, e)
	m := raw / p
	var mant, sub float64
	extra := 0
	switch {
	case m <= 1:
		mant, sub = 1, 5
	case m <= 2:
		mant, sub = 2, 4
	case m <= 2.5:
		mant, sub, extra = 2.5, 5, 1
	case m <= 5:
		mant, sub = 5, 5
	default:
		mant, sub, e = 1, 5, e+1
		p *= 10
	}
	step = mant * p
	digits = max(0, int(-e)+extra)
	return step, step / sub, digits
}
