package jet

import (
	"bufio"
	"math"
	"os"
	"strconv"
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// refCase is one function at one point with its reference coefficients.
type refCase struct {
	fn     string
	x0, p  float64
	coeffs []float64
}

// readReference reads testdata/reference.txt: Taylor coefficients
// f⁽ᵏ⁾(x0)/k!, k = 0…30, computed by mpmath 1.3.0 at 60 significant digits
// (checked at 80) and written with 25 digits by testdata/reference.py.
func readReference(t *testing.T) []refCase {
	t.Helper()
	f, err := os.Open("testdata/reference.txt")
	require.NoError(t, err)
	defer f.Close()
	var cases []refCase
	sc := bufio.NewScanner(f)
	for sc.Scan() {
		line := sc.Text()
		if strings.HasPrefix(line, "#") || line == "" {
			continue
		}
		fs := strings.Fields(line)
		require.Len(t, fs, 5, line)
		x0, err1 := strconv.ParseFloat(fs[1], 64)
		p, err2 := strconv.ParseFloat(fs[2], 64)
		k, err3 := strconv.Atoi(fs[3])
		c, err4 := strconv.ParseFloat(fs[4], 64)
		require.NoError(t, err1)
		require.NoError(t, err2)
		require.NoError(t, err3)
		require.NoError(t, err4)
		n := len(cases)
		if k == 0 {
			cases = append(cases, refCase{fn: fs[0], x0: x0, p: p})
			n++
		}
		require.Equal(t, k, len(cases[n-1].coeffs), line)
		cases[n-1].coeffs = append(cases[n-1].coeffs, c)
	}
	require.NoError(t, sc.Err())
	require.NotEmpty(t, cases)
	return cases
}

// evalRef computes the jet of c.fn at all the points xs with the low-level
// layer.
func evalRef(fn string, p float64, order int, xs []float64) []float64 {
	l := Layout{Order: order, Points: len(xs)}
	a := make([]float64, l.Len())
	dst := make([]float64, l.Len())
	work := make([]float64, 2*l.Len())
	l.Var(a, xs)
	switch fn {
	case "exp":
		l.Exp(dst, a)
	case "log":
		l.Log(dst, a)
	case "sin":
		l.Sin(dst, a, work)
	case "cos":
		l.Cos(dst, a, work)
	case "tanh":
		l.Tanh(dst, a, work)
	case "erf":
		l.Erf(dst, a, work)
	case "sqrt":
		l.Sqrt(dst, a)
	case "pow":
		if p == math.Trunc(p) {
			l.PowInt(dst, a, int(p), work)
		} else {
			l.Pow(dst, a, p)
		}
	default:
		panic(fn)
	}
	return dst
}

// relErr is |got − want|/|want|, or |got| where want is exactly 0.
func relErr(got, want float64) float64 {
	if want == 0 {
		return math.Abs(got)
	}
	return math.Abs(got-want) / math.Abs(want)
}

// Tolerances against the mpmath references: the issue asks for 1e-13
// relative at orders ≤ 12. Measured maxima over these cases (see the log of
// TestReference): 1.7e-14 (tanh) at orders ≤ 12, 2.4e-14 (tanh) at orders
// 13–30; the high orders get a tenfold margin over that worst case too.
const (
	refTolLow  = 1e-13
	refTolHigh = 3e-13
)

// evalLinear computes exp and pow with the linear-operand methods (the
// variable is a linear jet); ok is false for the other functions.
func evalLinear(fn string, p float64, order int, x0 float64) ([]float64, bool) {
	l := Layout{Order: order, Points: 1}
	a := make([]float64, l.Len())
	dst := make([]float64, l.Len())
	l.Var(a, []float64{x0})
	switch fn {
	case "exp":
		l.ExpLinear(dst, a)
	case "pow":
		l.PowLinear(dst, a, p)
	default:
		return nil, false
	}
	return dst, true
}

// The linear-operand methods against the same references, same tolerances.
func TestReferenceLinear(t *testing.T) {
	for _, c := range readReference(t) {
		got, ok := evalLinear(c.fn, c.p, 30, c.x0)
		if !ok {
			continue
		}
		for k, want := range c.coeffs {
			tol := refTolLow
			if k > 12 {
				tol = refTolHigh
			}
			assert.LessOrEqual(t, relErr(got[k], want), tol, "%s x0=%g p=%g order %d", c.fn, c.x0, c.p, k)
		}
	}
}

func TestReference(t *testing.T) {
	const order = 30
	cases := readReference(t)
	worst := map[string][2]float64{}
	for _, c := range cases {
		require.Len(t, c.coeffs, order+1)
		got := evalRef(c.fn, c.p, order, []float64{c.x0})
		w := worst[c.fn]
		for k, want := range c.coeffs {
			e := relErr(got[k], want)
			if k <= 12 {
				w[0] = math.Max(w[0], e)
				assert.LessOrEqual(t, e, refTolLow, "%s x0=%g p=%g order %d: got %.17g want %.17g", c.fn, c.x0, c.p, k, got[k], want)
			} else {
				w[1] = math.Max(w[1], e)
				assert.LessOrEqual(t, e, refTolHigh, "%s x0=%g p=%g order %d: got %.17g want %.17g", c.fn, c.x0, c.p, k, got[k], want)
			}
		}
		worst[c.fn] = w
	}
	for fn, w := range worst {
		t.Logf("%-5s max relative error: orders 0–12 %.2g, orders 13–30 %.2g", fn, w[0], w[1])
	}
}

// TestReferenceBatched evaluates all points of one function in one layout
// and requires the same bits as one point at a time: the points of a
// layout do not interact.
func TestReferenceBatched(t *testing.T) {
	const order = 30
	groups := map[[2]any][]refCase{}
	for _, c := range readReference(t) {
		key := [2]any{c.fn, c.p}
		if c.fn == "pow" {
			key[1] = c.p
		} else {
			key[1] = 0.0
		}
		groups[key] = append(groups[key], c)
	}
	for key, cs := range groups {
		xs := make([]float64, len(cs))
		for i, c := range cs {
			xs[i] = c.x0
		}
		fn, p := key[0].(string), key[1].(float64)
		all := evalRef(fn, p, order, xs)
		for i, c := range cs {
			one := evalRef(fn, p, order, []float64{c.x0})
			for k := 0; k <= order; k++ {
				require.Equal(t, one[k], all[k*len(xs)+i], "%s x0=%g order %d", fn, c.x0, k)
			}
		}
	}
}
