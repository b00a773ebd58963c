package formula

import (
	"fmt"
	"math"
	"strconv"
	"strings"

	"github.com/pairwell/pairwell/core/units"
)

// rat is a rational number num/den in lowest terms, den > 0.
type rat struct{ num, den int64 }

func gcd(a, b int64) int64 {
	if a < 0 {
		a = -a
	}
	if b < 0 {
		b = -b
	}
	for b != 0 {
		a, b = b, a%b
	}
	return a
}

func mkRat(num, den int64) rat {
	if den < 0 {
		num, den = -num, -den
	}
	g := gcd(num, den)
	if g == 0 {
		return rat{0, 1}
	}
	return rat{num / g, den / g}
}

func (a rat) add(b rat) rat { return mkRat(a.num*b.den+b.num*a.den, a.den*b.den) }
func (a rat) mul(b rat) rat { return mkRat(a.num*b.num, a.den*b.den) }
func (a rat) neg() rat      { return rat{-a.num, a.den} }

func (a rat) String() string {
	if a.den == 1 {
		return strconv.FormatInt(a.num, 10)
	}
	return fmt.Sprintf("%d/%d", a.num, a.den)
}

// ratOf returns p/q with q ≤ maxDen equal to x within 1e-12 relative, and
// whether there is one.
func ratOf(x float64) (rat, bool) {
	const maxDen = 24
	if math.IsNaN(x) || math.IsInf(x, 0) || math.Abs(x) > 1e6 {
		return rat{}, false
	}
	for q := int64(1); q <= maxDen; q++ {
		p := math.Round(x * float64(q))
		if math.Abs(p/float64(q)-x) <= 1e-12*math.Max(1, math.Abs(x)) {
			return mkRat(int64(p), q), true
		}
	}
	return rat{}, false
}

// maxExp bounds exponents in dimensions, so that the arithmetic on them
// cannot overflow.
const maxExp = 1 << 20

// dim is a dimension energy^e·length^l with rational exponents.
type dim struct{ e, l rat }

var (
	dimNone   = dim{rat{0, 1}, rat{0, 1}}
	dimEnergy = dim{rat{1, 1}, rat{0, 1}}
	dimLength = dim{rat{0, 1}, rat{1, 1}}
)

func (a dim) mul(b dim) dim { return dim{a.e.add(b.e), a.l.add(b.l)} }
func (a dim) inv() dim      { return dim{a.e.neg(), a.l.neg()} }
func (a dim) pow(p rat) dim { return dim{a.e.mul(p), a.l.mul(p)} }
func (a dim) none() bool    { return a == dimNone }
func (a dim) big() bool {
	for _, r := range []rat{a.e, a.l} {
		if r.num > maxExp || r.num < -maxExp || r.den > maxExp {
			return true
		}
	}
	return false
}

// String names the dimension as package units does: "dimensionless",
// "energy", "length", "energy·length^-2", "length^1/2".
func (a dim) String() string {
	if a.e.den == 1 && a.l.den == 1 {
		if d, ok := units.NewDimension(int(a.e.num), int(a.l.num), 0, 0, 0); ok {
			return d.String()
		}
	}
	var parts []string
	for i, r := range []rat{a.e, a.l} {
		name := [2]string{"energy", "length"}[i]
		switch {
		case r.num == 0:
		case r == rat{1, 1}:
			parts = append(parts, name)
		default:
			parts = append(parts, name+"^"+r.String())
		}
	}
	if len(parts) == 0 {
		return "dimensionless"
	}
	return strings.Join(parts, "·")
}

// dimOfUnit converts a parameter's dimension; ok is false unless it is a
// product of powers of energy and length.
func dimOfUnit(d units.Dimension) (dim, bool) {
	e, l, m, t, θ := d.Exponents()
	if m != 0 || t != 0 || θ != 0 {
		return dim{}, false
	}
	if back, _ := units.NewDimension(e, l, 0, 0, 0); back != d {
		return dim{}, false
	}
	return dim{rat{int64(e), 1}, rat{int64(l), 1}}, true
}

// checker is the dimensional analysis of one formula.
type checker struct {
	src    string
	params []dim
	names  []string
}

func (c *checker) text(n *node) string { return snippet(c.src[n.pos:n.end]) }

func (c *checker) fail(n *node, format string, args ...any) *Error {
	return newError(c.src, n.pos, n.end, fmt.Sprintf(format, args...))
}

// constant returns the value of n when it is made of numbers only.
func constant(n *node) (float64, bool) {
	switch n.kind {
	case kNum:
		return n.val, true
	case kNeg:
		x, ok := constant(n.args[0])
		return -x, ok
	case kAdd, kSub, kMul, kDiv, kPow:
		x, ok1 := constant(n.args[0])
		y, ok2 := constant(n.args[1])
		if !ok1 || !ok2 {
			return 0, false
		}
		return arith(n.kind, x, y), true
	case kCall:
		x, ok := constant(n.args[0])
		if !ok {
			return 0, false
		}
		return call1(n.fn, x), true
	}
	return 0, false
}

// dimOf returns the dimension of n. want, when not nil, is the dimension
// the context expects (an energy at the top, or the other operand of a
// sum), used to word the message when n's terms disagree.
func (c *checker) dimOf(n *node, want *dim) (dim, error) {
	switch n.kind {
	case kNum:
		return dimNone, nil
	case kVar:
		return dimLength, nil
	case kParam:
		return c.params[n.idx], nil
	case kNeg:
		return c.dimOf(n.args[0], want)
	case kAdd, kSub:
		a, err := c.dimOf(n.args[0], want)
		if err != nil {
			return dim{}, err
		}
		b, err := c.dimOf(n.args[1], want)
		if err != nil {
			return dim{}, err
		}
		if a == b {
			return a, nil
		}
		op := "add"
		if n.kind == kSub {
			op = "subtract"
		}
		switch {
		case want != nil && a == *want:
			return dim{}, c.fail(n.args[1], "'%s' has dimension %s: expected %s", c.text(n.args[1]), b, *want)
		case want != nil && b == *want:
			return dim{}, c.fail(n.args[0], "'%s' has dimension %s: expected %s", c.text(n.args[0]), a, *want)
		}
		return dim{}, c.fail(n, "cannot %s '%s' (%s) and '%s' (%s): terms of a sum need the same dimension", op, c.text(n.args[0]), a, c.text(n.args[1]), b)
	case kMul, kDiv:
		a, err := c.dimOf(n.args[0], nil)
		if err != nil {
			return dim{}, err
		}
		b, err := c.dimOf(n.args[1], nil)
		if err != nil {
			return dim{}, err
		}
		if n.kind == kDiv {
			b = b.inv()
		}
		d := a.mul(b)
		if d.big() {
			return dim{}, c.fail(n, "'%s': exponents of its dimension are too large", c.text(n))
		}
		return d, nil
	case kPow:
		a, err := c.dimOf(n.args[0], nil)
		if err != nil {
			return dim{}, err
		}
		b, err := c.dimOf(n.args[1], nil)
		if err != nil {
			return dim{}, err
		}
		if !b.none() {
			return dim{}, c.fail(n.args[1], "exponent '%s' has dimension %s: expected dimensionless", c.text(n.args[1]), b)
		}
		if a.none() {
			return dimNone, nil
		}
		y, ok := constant(n.args[1])
		if !ok {
			return dim{}, c.fail(n, "'%s': a power of '%s' (%s) needs a constant exponent, not '%s'; make the base dimensionless (e.g. divide by a parameter)", c.text(n), c.text(n.args[0]), a, c.text(n.args[1]))
		}
		p, ok := ratOf(y)
		if !ok {
			return dim{}, c.fail(n, "'%s': a power of '%s' (%s) needs a rational exponent (p/q with q ≤ 24), not %g", c.text(n), c.text(n.args[0]), a, y)
		}
		d := a.pow(p)
		if d.big() {
			return dim{}, c.fail(n, "'%s': exponents of its dimension are too large", c.text(n))
		}
		return d, nil
	case kCall:
		a, err := c.dimOf(n.args[0], nil)
		if err != nil {
			return dim{}, err
		}
		if n.fn == "sqrt" {
			return a.pow(rat{1, 2}), nil
		}
		if !a.none() {
			return dim{}, c.fail(n.args[0], "%s argument '%s' has dimension %s: expected dimensionless", n.fn, c.text(n.args[0]), a)
		}
		return dimNone, nil
	}
	return dim{}, c.fail(n, "internal error: unknown node")
}

// checkDims checks that the formula tree n has dimension want, with the
// parameters of the given dimensions.
func checkDims(src string, n *node, names []string, params []dim, want dim, what string) error {
	c := &checker{src: src, params: params, names: names}
	d, err := c.dimOf(n, &want)
	if err != nil {
		return err
	}
	if d != want {
		return c.fail(n, "%s '%s' has dimension %s: expected %s", what, c.text(n), d, want)
	}
	return nil
}
