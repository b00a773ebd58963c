package formula

import (
	"errors"
	"math"
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"github.com/pairwell/pairwell/core/jet"
	"github.com/pairwell/pairwell/core/units"
)

var (
	c6Dim, _   = units.NewDimension(1, 6, 0, 0, 0)
	betaDim, _ = units.NewDimension(0, -2, 0, 0, 0)
	ljParams   = []Param{{"epsilon", units.Energy}, {"sigma", units.Length}}
)

// eval0 returns V(r) of a compiled formula.
func eval0(t *testing.T, f *Formula, params []float64, r float64) float64 {
	t.Helper()
	s, err := f.prog.Scalars(params)
	require.NoError(t, err)
	l := jet.Layout{Order: 0, Points: 1}
	return f.prog.Eval(f.prog.NewWorkspace(l), l, s, []float64{r})[0]
}

// The grammar: precedence, associativity, unary minus, pi, pow, numbers.
// Expected values by hand (common practice).
func TestGrammar(t *testing.T) {
	e := []Param{{"E", units.Energy}}
	tests := []struct {
		src  string
		want float64 // at E = 2, r = 3
	}{
		{"E*r/r", 2},
		{"E*2^3^2/512 + 0*E*r/r", 2}, // right-associative: 2^9
		{"-E*(r/r)^2", -2},           // −(x²)
		{"E*(-r/r)^2", 2},            // (−1)² = 1
		{"E*r^-1*r", 2},              // x^-1
		{"E*pow(r, 2)/r^2", 2},       // pow
		{"E*sin(pi/2)*r/r", 2},       // pi
		{"E*1.5e1/15*r/r", 2},        // exponent
		{"E*.5*2*r/r", 2},            // leading dot
		{"E - E + E*r/r", 2},         // left-associative
		{"E*exp(log(r/r))", 2},       // functions
		{"E*sqrt(r*r)/r", 2},         //
		{"E*(tanh(0*r/r) + erf(0*r/r) + cos(0*r/r))", 2},
		{"+E*r/r", 2},
		{"E*r/r\n", 2},
	}
	for _, tt := range tests {
		f, err := Compile(tt.src, e)
		require.NoError(t, err, tt.src)
		assert.InDelta(t, tt.want, eval0(t, f, []float64{2}, 3), 1e-14, tt.src)
	}
}

// Errors name the token and its column, and Caret points at it.
func TestSyntaxErrors(t *testing.T) {
	tests := []struct {
		src     string
		params  []Param
		col     int
		contain string
	}{
		{"4*epsilon*((sigam/r)^12 - (sigma/r)^6)", ljParams, 13, "unknown name 'sigam' at column 13 (did you mean sigma?); parameters are epsilon, sigma"},
		{"4*epsilon*(sigma/r", ljParams, 19, "expected ')' to close the '(' at column 11, found end of formula"},
		{"4*epsilon*", ljParams, 11, "formula ends where a number, name or '(' is expected"},
		{"", ljParams, 1, "empty formula"},
		{"epsilon*expp(r/sigma)", ljParams, 9, "unknown function 'expp' at column 9 (did you mean exp?)"},
		{"epsilon*exp(r/sigma, 2)", ljParams, 9, "exp takes 1 argument, got 2"},
		{"epsilon*pow(r/sigma)", ljParams, 9, "pow takes 2 arguments, got 1"},
		{"epsilon*exp", ljParams, 9, "function 'exp' needs an argument in parentheses"},
		{"epsilon*(r/sigma)²", ljParams, 18, "unexpected character \"²\" at column 18 (write powers as ^2)"},
		{"epsilon − epsilon*r/sigma", ljParams, 9, "write the minus sign as -"},
		{"epsilon*1e+/r*sigma", ljParams, 9, "exponent without digits"},
		{"epsilon*1e999*r/sigma", ljParams, 9, "out of range"},
		{"epsilon sigma", ljParams, 9, "unexpected name 'sigma' at column 9"},
		{"epsilon*.*r", ljParams, 9, "'.' at column 9 is not a number"},
		{"epsilon*r)", ljParams, 10, "unexpected ')'"},
		{"x*r", nil, 1, "the form has no parameters"},
	}
	for _, tt := range tests {
		_, err := Compile(tt.src, tt.params)
		require.Error(t, err, tt.src)
		assert.ErrorIs(t, err, ErrFormula)
		var fe *Error
		require.True(t, errors.As(err, &fe), tt.src)
		assert.Equal(t, tt.col, fe.Column, "%s: %v", tt.src, err)
		assert.Contains(t, err.Error(), tt.contain, tt.src)
		assert.NotContains(t, err.Error(), "\n")
		lines := strings.Split(fe.Caret(), "\n")
		require.Len(t, lines, 2)
		assert.Equal(t, strings.Repeat(" ", tt.col+1)+"^", lines[1][:tt.col+2], tt.src)
	}
}

// Dimensional analysis: each message names the sub-expression and the
// dimensions found.
func TestDimensionErrors(t *testing.T) {
	buck := []Param{{"A", units.Energy}, {"rho", units.Length}, {"C6", c6Dim}}
	varshni := []Param{{"De", units.Energy}, {"re", units.Length}, {"beta", betaDim}}
	tests := []struct {
		src     string
		params  []Param
		contain string
	}{
		{"A*exp(-r/rho) - C6/r^5", buck, "'C6/r^5' at column 17 has dimension energy·length: expected energy"},
		{"A*exp(-r) - C6/r^6", buck, "exp argument '-r' has dimension length: expected dimensionless"},
		{"A*exp(-r/rho)*r - C6/r^5", buck, "the formula 'A*exp(-r/rho)*r - C6/r^5' has dimension energy·length: expected energy"},
		{"A*log(r) + A", buck, "log argument 'r' has dimension length"},
		{"A*(r/rho)^rho", buck, "exponent 'rho' has dimension length: expected dimensionless"},
		{"A*r^(r/rho)", buck, "'r^(r/rho)': a power of 'r' (length) needs a constant exponent, not '(r/rho)' at column 3"},
		{"A*(r/rho) + r", buck, "'r' at column 13 has dimension length: expected energy"},
		{"A*r^pi/rho^pi", buck, "needs a rational exponent"},
		{"(r - re)*De", varshni, "the formula '(r - re)*De' has dimension energy·length"},
		{"De*(1 - (re/r)*exp(-beta*(r - re^2)))^2 - De", varshni, "cannot subtract 'r' (length) and 're^2' (length^2): terms of a sum need the same dimension at column 26"},
		{"De*sqrt(r)", varshni, "dimension energy·length^1/2"},
		{"De*(r/re)^0.5 + sqrt(beta)*De*r", varshni, "ok"},
	}
	for _, tt := range tests {
		_, err := Compile(tt.src, tt.params)
		if tt.contain == "ok" {
			assert.NoError(t, err, tt.src)
			continue
		}
		require.Error(t, err, tt.src)
		assert.ErrorIs(t, err, ErrFormula)
		assert.Contains(t, err.Error(), tt.contain, tt.src)
	}
	// Declarations.
	for _, ps := range [][]Param{
		{{"r", units.Length}},
		{{"exp", units.Length}},
		{{"a", units.Length}, {"a", units.Energy}},
		{{"2a", units.Length}},
		{{"m", units.Mass}},
	} {
		_, err := Compile("r", ps)
		assert.ErrorIs(t, err, ErrFormula, "%v", ps)
	}
}

func TestUnusedAndConstant(t *testing.T) {
	f, err := Compile("4*epsilon*(r/r)", ljParams)
	require.NoError(t, err)
	assert.Equal(t, []string{"sigma"}, f.Unused)
	_, err = Compile("4*epsilon", ljParams)
	assert.ErrorContains(t, err, "does not depend on r")
	e, err := CompileExpr("2^(1/6)*sigma", ljParams, units.Length)
	require.NoError(t, err)
	v, err := e.Eval([]float64{1, 3.4})
	require.NoError(t, err)
	assert.InDelta(t, math.Pow(2, 1.0/6)*3.4, v, 1e-15)
	_, err = CompileExpr("sigma*r", ljParams, units.Length)
	assert.ErrorContains(t, err, "r is not allowed here")
	_, err = CompileExpr("epsilon", ljParams, units.Length)
	assert.ErrorContains(t, err, "dimension energy: expected length")
	e, err = CompileExpr("0", ljParams, units.Energy)
	require.NoError(t, err)
	v, _ = e.Eval([]float64{1, 1})
	assert.Zero(t, v)
}

// Compilation shares common sub-expressions and folds constants: the
// Lennard-Jones formula computes r, its two powers r⁻¹² and r⁻⁶ (the
// powers of σ/r become σⁿ·r⁻ⁿ, by the binomial series of a linear jet),
// and nothing else; the numbers 4·(1/2)·2 fold to one constant.
func TestCompileSharesAndFolds(t *testing.T) {
	f, err := Compile("4*(1/2)*2*epsilon*((sigma/r)^12 - (sigma/r)^6)", ljParams)
	require.NoError(t, err)
	ops := map[opcode]int{}
	for _, o := range f.prog.code {
		ops[o.op]++
	}
	assert.Equal(t, 1, ops[opVar], f.prog.String())
	assert.Equal(t, 2, ops[opPowLin], f.prog.String())
	assert.LessOrEqual(t, len(f.prog.code), 7, f.prog.String())
	// One scalar slot holds 4·(1/2)·2 = 4.
	found := false
	for _, k := range f.prog.consts {
		found = found || k.val == 4
	}
	assert.True(t, found)
	// Morse: five jet instructions (r, the affine exponent, exp, 1 − e and
	// its square, the affine De·x − De).
	m, err := Compile("De*(1 - exp(-a*(r - re)))^2 - De", []Param{{"De", units.Energy}, {"a", units.InverseLength}, {"re", units.Length}})
	require.NoError(t, err)
	assert.Len(t, m.prog.code, 6, m.prog.String())
	assert.LessOrEqual(t, m.prog.nregs, 2, m.prog.String())
}
