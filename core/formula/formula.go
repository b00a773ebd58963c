// Package formula implements pairwell's formula language: a pair potential
// V(r) typed as text, checked for dimensions, compiled once and
// differentiated exactly to any order with Taylor arithmetic (package
// core/jet).
//
// # The language
//
//	formula = sum
//	sum     = product { ("+" | "-") product }
//	product = unary { ("*" | "/") unary }
//	unary   = ("-" | "+") unary | power
//	power   = primary [ "^" unary ]
//	primary = number | "r" | "pi" | parameter | "(" sum ")"
//	        | function "(" sum ")" | "pow" "(" sum "," sum ")"
//	function = "exp" | "log" | "sqrt" | "sin" | "cos" | "tanh" | "erf"
//	number  = digits [ "." digits ] [ ("e" | "E") [ "+" | "-" ] digits ]   (also ".5")
//	name    = letter { letter | digit | "_" }       (letters a–z, A–Z and "_")
//
// "^" binds tighter than unary minus and groups to the right: -x^2 is
// −(x²) and 2^3^2 is 2⁹; x^-1 is allowed. pow(x, y) is x^y. log is the
// natural logarithm. r is the separation in Å; each parameter stands for
// its value in the default unit of its dimension (eV, Å, eV·Å⁶, …), and a
// number is dimensionless. Names are case-sensitive; r, pi, pow and the
// function names cannot be parameters.
//
// # Dimensions
//
// Every formula is checked before any number is computed: r is a length,
// each parameter has its declared dimension (a product of integer powers of
// energy and length), the terms of a sum have the same dimension, the
// arguments of exp, log, sin, cos, tanh and erf and every exponent are
// dimensionless, a dimensioned quantity is raised only to a constant
// rational power p/q (q ≤ 24; sqrt is the power ½), and V comes out as an
// energy.
//
// Errors about the text are *Error values wrapping ErrFormula: one line
// naming the offending token and its column, plus Caret for a picture.
package formula

import (
	"fmt"
	"math"
	"slices"

	"github.com/pairwell/pairwell/core/units"
)

// Param declares a parameter of a formula.
type Param struct {
	Name      string
	Dimension units.Dimension // a product of powers of energy and length
}

// Formula is a formula of r, parsed, checked and compiled.
type Formula struct {
	// Text is the formula as written.
	Text string
	// Params are its parameters, in the order of the values Scalars and
	// the potential expect.
	Params []Param
	// Unused lists declared parameters the formula does not use.
	Unused []string
	prog   *Program
	tree   *node // the syntax tree, for the parameter derivatives
}

// Program returns the compiled program.
func (f *Formula) Program() *Program { return f.prog }

// checkParams validates the declarations and returns their names and
// dimensions.
func checkParams(params []Param) ([]string, []dim, error) {
	names := make([]string, len(params))
	dims := make([]dim, len(params))
	for i, p := range params {
		if !validName(p.Name) {
			return nil, nil, fmt.Errorf("%w: parameter name %q: use letters, digits and _, starting with a letter", ErrFormula, p.Name)
		}
		if reserved(p.Name) {
			return nil, nil, fmt.Errorf("%w: parameter name %q is reserved (r is the separation, pi the constant, the functions are exp, log, sqrt, sin, cos, tanh, erf, pow)", ErrFormula, p.Name)
		}
		if slices.Contains(names[:i], p.Name) {
			return nil, nil, fmt.Errorf("%w: parameter %q declared twice", ErrFormula, p.Name)
		}
		d, ok := dimOfUnit(p.Dimension)
		if !ok {
			return nil, nil, fmt.Errorf("%w: parameter %q has dimension %s: a parameter's dimension must be a product of powers of energy and length", ErrFormula, p.Name, p.Dimension)
		}
		names[i], dims[i] = p.Name, d
	}
	return names, dims, nil
}

func validName(s string) bool {
	if s == "" || !isLetter(s[0]) {
		return false
	}
	for i := 0; i < len(s); i++ {
		if !isLetter(s[i]) && !(s[i] >= '0' && s[i] <= '9') {
			return false
		}
	}
	return true
}

// Compile parses text, checks that it is an energy given r in Å and the
// parameters' dimensions, and compiles it. Errors wrap ErrFormula; those
// about a place in the text are *Error.
func Compile(text string, params []Param) (*Formula, error) {
	names, dims, err := checkParams(params)
	if err != nil {
		return nil, err
	}
	n, err := parse(text, names)
	if err != nil {
		return nil, err
	}
	if err := checkDims(text, n, names, dims, dimEnergy, "the formula"); err != nil {
		return nil, err
	}
	prog, used, err := compile(text, n, len(params))
	if err != nil {
		return nil, err
	}
	f := &Formula{Text: text, Params: slices.Clone(params), prog: prog, tree: n}
	for i, u := range used {
		if !u {
			f.Unused = append(f.Unused, params[i].Name)
		}
	}
	return f, nil
}

// Expr is a formula of the parameters only (no r), such as the lower end of
// a domain or a dissociation limit.
type Expr struct {
	Text string
	tree *node
}

// CompileExpr parses text as a formula of the parameters (r is not
// allowed) and checks that it has dimension want. A formula made of numbers
// only is in the default unit of want (e.g. "0" for a limit in eV, "1.2" for
// a length in Å).
func CompileExpr(text string, params []Param, want units.Dimension) (*Expr, error) {
	names, dims, err := checkParams(params)
	if err != nil {
		return nil, err
	}
	n, err := parse(text, names)
	if err != nil {
		return nil, err
	}
	if v := findVar(n); v != nil {
		return nil, newError(text, v.pos, v.end, "r is not allowed here: this is a constant of the form")
	}
	w, ok := dimOfUnit(want)
	if !ok {
		return nil, fmt.Errorf("%w: dimension %s", ErrFormula, want)
	}
	if _, isConst := constant(n); !isConst {
		if err := checkDims(text, n, names, dims, w, "the expression"); err != nil {
			return nil, err
		}
	}
	return &Expr{Text: text, tree: n}, nil
}

func findVar(n *node) *node {
	if n.kind == kVar {
		return n
	}
	for _, a := range n.args {
		if v := findVar(a); v != nil {
			return v
		}
	}
	return nil
}

// Eval returns the value of e for the parameter values params (default
// units); an error when it is not finite.
func (e *Expr) Eval(params []float64) (float64, error) {
	x := evalTree(e.tree, params)
	if math.IsNaN(x) || math.IsInf(x, 0) {
		return 0, fmt.Errorf("'%s' is %g for these parameters", snippet(e.Text), x)
	}
	return x, nil
}

func evalTree(n *node, params []float64) float64 {
	switch n.kind {
	case kNum:
		return n.val
	case kParam:
		return params[n.idx]
	case kNeg:
		return -evalTree(n.args[0], params)
	case kCall:
		return call1(n.fn, evalTree(n.args[0], params))
	case kAdd, kSub, kMul, kDiv, kPow:
		return arith(n.kind, evalTree(n.args[0], params), evalTree(n.args[1], params))
	}
	return math.NaN()
}
