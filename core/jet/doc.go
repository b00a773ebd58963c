// Package jet implements Taylor-mode automatic differentiation: arithmetic
// on truncated power series ("jets").
//
// A jet of order n of a function f at a point x0 holds its normalized Taylor
// coefficients
//
//	j[k] = f⁽ᵏ⁾(x0)/k!,   k = 0, …, n,
//
// so that f(x0 + t) = Σₖ j[k] tᵏ + O(tⁿ⁺¹). The independent variable x at x0
// is the jet [x0, 1, 0, …, 0]; a constant c is [c, 0, …, 0]. Every operation
// maps the jets of its operands to the jet of its result exactly up to order
// n (up to rounding), using the standard recurrences of Taylor arithmetic
// (A. Griewank & A. Walther, Evaluating Derivatives, 2nd ed., SIAM 2008,
// ch. 13; R. E. Moore, Interval Analysis, Prentice-Hall 1966). Each
// recurrence is stated in the doc comment of its function; its cost is
// O(n²) per jet (O(n) for the linear operations), independent of how the
// operands were built. Normalized coefficients stay finite where raw
// derivatives overflow (exp(x) at order 200 has coefficient e^x0/200!).
//
// # Two layers
//
// The low-level layer is the methods of Layout. A Layout describes Points
// jets of order Order stored in one float64 slice, coefficient-major:
// coefficient k of jet i is at index k·Points + i. A single jet is the layout
// with Points = 1. The methods write into a caller-provided dst (and, for
// tanh, erf, sin, cos and integer powers, a caller-provided workspace) and
// never allocate; each loops over the points innermost, so one call does the
// work for many evaluation points at once.
//
// The ergonomic layer is Tape: a workspace whose methods (Var, Const, Add,
// Mul, Exp, …) take and return Jet values, so that a function is written as
// a short Go function of a Jet. A Tape owns the memory of its jets and
// reuses it after Reset: once a function has been evaluated once (warm-up),
// evaluating it again after Reset allocates nothing.
//
//	t := jet.NewTape(4, len(rs))          // order 4 at every r in rs
//	r := t.Var(rs)
//	e := t.Exp(t.Affine(r, -a, a*re))     // exp(−a(r − re))
//	v := t.AddConst(t.Scale(t.Square(t.AddConst(t.Neg(e), 1)), De), -De)
//	v.Coeff(2, i)                          // V″(rs[i])/2
//
// Domain errors are not detected: as with package math, log of a negative
// number, a square root or real power at zero, or a division by zero give
// NaN or ±Inf coefficients. Callers that need a domain check test the
// result for finiteness.
//
// Neither layer keeps global state. A Layout is a value and safe for
// concurrent use; a Tape is not (use one per goroutine).
package jet
