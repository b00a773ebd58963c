package formula

import (
	"fmt"
	"math"
	"slices"
	"strconv"
	"strings"
	"unicode/utf8"

	"github.com/pairwell/pairwell/core/suggest"
)

// kind is the kind of a syntax-tree node.
type kind int

const (
	kNum   kind = iota // a number (val)
	kVar               // the variable r
	kParam             // parameter number idx
	kNeg               // −x
	kAdd               // x + y
	kSub               // x − y
	kMul               // x·y
	kDiv               // x / y
	kPow               // x ^ y, pow(x, y)
	kCall              // fn(x)
)

// node is a node of the syntax tree. pos and end delimit its text in the
// source (byte offsets).
type node struct {
	kind     kind
	val      float64 // kNum
	idx      int     // kParam
	fn       string  // kCall
	args     []*node
	pos, end int
}

// functions are the one-argument functions of the language.
var functions = []string{"exp", "log", "sqrt", "sin", "cos", "tanh", "erf"}

// reserved are names that are not parameters: the variable, the constant
// and the functions (pow included).
func reserved(name string) bool {
	return name == "r" || name == "pi" || name == "pow" || slices.Contains(functions, name)
}

// token kinds.
const (
	tEOF = iota
	tNum
	tName
	tOp // one of + - * / ^ ( ) ,
)

type token struct {
	kind     int
	text     string
	num      float64
	pos, end int
}

// parser is a recursive-descent parser over the grammar in the package
// documentation.
type parser struct {
	src    string
	params []string
	tok    token
	next   int // byte offset after tok
	depth  int
}

// maxDepth bounds the nesting of a formula, so that a hostile input cannot
// exhaust the stack.
const maxDepth = 200

// parse parses src with the given parameter names.
func parse(src string, params []string) (*node, error) {
	p := &parser{src: src, params: params}
	if strings.TrimSpace(src) == "" {
		return nil, p.errAt(0, len(src), "empty formula")
	}
	if err := p.advance(); err != nil {
		return nil, err
	}
	n, err := p.expr()
	if err != nil {
		return nil, err
	}
	if p.tok.kind != tEOF {
		return nil, p.errAt(p.tok.pos, p.tok.end, fmt.Sprintf("unexpected %s", p.describe(p.tok)))
	}
	return n, nil
}

func (p *parser) describe(t token) string {
	switch t.kind {
	case tEOF:
		return "end of formula"
	case tNum:
		return "number " + t.text
	case tName:
		return "name '" + t.text + "'"
	}
	return "'" + t.text + "'"
}

// errAt returns an *Error for the source bytes [pos, end).
func (p *parser) errAt(pos, end int, msg string) *Error {
	return newError(p.src, pos, end, msg)
}

// advance reads the next token.
func (p *parser) advance() error {
	s := p.src
	i := p.next
	for i < len(s) && (s[i] == ' ' || s[i] == '\t' || s[i] == '\n' || s[i] == '\r') {
		i++
	}
	if i == len(s) {
		p.tok = token{kind: tEOF, pos: i, end: i}
		p.next = i
		return nil
	}
	c := s[i]
	switch {
	case c >= '0' && c <= '9' || c == '.':
		j := i
		digits := 0
		for j < len(s) && s[j] >= '0' && s[j] <= '9' {
			j++
			digits++
		}
		if j < len(s) && s[j] == '.' {
			j++
			for j < len(s) && s[j] >= '0' && s[j] <= '9' {
				j++
				digits++
			}
		}
		if digits == 0 {
			return p.errAt(i, j, "'.' is not a number")
		}
		if j < len(s) && (s[j] == 'e' || s[j] == 'E') {
			k := j + 1
			if k < len(s) && (s[k] == '+' || s[k] == '-') {
				k++
			}
			e := k
			for e < len(s) && s[e] >= '0' && s[e] <= '9' {
				e++
			}
			if e == k {
				return p.errAt(i, e, fmt.Sprintf("number %s has an exponent without digits", s[i:e]))
			}
			j = e
		}
		v, err := strconv.ParseFloat(s[i:j], 64)
		if err != nil || math.IsInf(v, 0) {
			return p.errAt(i, j, fmt.Sprintf("number %s is out of range", s[i:j]))
		}
		p.tok = token{kind: tNum, text: s[i:j], num: v, pos: i, end: j}
		p.next = j
	case isLetter(c):
		j := i
		for j < len(s) && (isLetter(s[j]) || s[j] >= '0' && s[j] <= '9') {
			j++
		}
		p.tok = token{kind: tName, text: s[i:j], pos: i, end: j}
		p.next = j
	case strings.IndexByte("+-*/^(),", c) >= 0:
		p.tok = token{kind: tOp, text: s[i : i+1], pos: i, end: i + 1}
		p.next = i + 1
	default:
		r, size := utf8.DecodeRuneInString(s[i:])
		hint := ""
		switch r {
		case '−':
			hint = " (write the minus sign as -)"
		case '·', '×':
			hint = " (write multiplication as *)"
		case '²', '³', '⁶':
			hint = " (write powers as ^2)"
		}
		return p.errAt(i, i+size, fmt.Sprintf("unexpected character %q%s", string(r), hint))
	}
	return nil
}

func isLetter(c byte) bool { return c >= 'a' && c <= 'z' || c >= 'A' && c <= 'Z' || c == '_' }

func (p *parser) isOp(op string) bool { return p.tok.kind == tOp && p.tok.text == op }

// expr = term { ("+" | "-") term }
func (p *parser) expr() (*node, error) {
	p.depth++
	defer func() { p.depth-- }()
	if p.depth > maxDepth {
		return nil, p.errAt(p.tok.pos, p.tok.end, fmt.Sprintf("formula nested deeper than %d levels", maxDepth))
	}
	x, err := p.term()
	if err != nil {
		return nil, err
	}
	for p.isOp("+") || p.isOp("-") {
		k := kAdd
		if p.tok.text == "-" {
			k = kSub
		}
		if err := p.advance(); err != nil {
			return nil, err
		}
		y, err := p.term()
		if err != nil {
			return nil, err
		}
		x = &node{kind: k, args: []*node{x, y}, pos: x.pos, end: y.end}
	}
	return x, nil
}

// term = unary { ("*" | "/") unary }
func (p *parser) term() (*node, error) {
	x, err := p.unary()
	if err != nil {
		return nil, err
	}
	for p.isOp("*") || p.isOp("/") {
		k := kMul
		if p.tok.text == "/" {
			k = kDiv
		}
		if err := p.advance(); err != nil {
			return nil, err
		}
		y, err := p.unary()
		if err != nil {
			return nil, err
		}
		x = &node{kind: k, args: []*node{x, y}, pos: x.pos, end: y.end}
	}
	return x, nil
}

// unary = ("-" | "+") unary | power
func (p *parser) unary() (*node, error) {
	if p.isOp("-") || p.isOp("+") {
		neg := p.tok.text == "-"
		pos := p.tok.pos
		p.depth++
		defer func() { p.depth-- }()
		if p.depth > maxDepth {
			return nil, p.errAt(p.tok.pos, p.tok.end, fmt.Sprintf("formula nested deeper than %d levels", maxDepth))
		}
		if err := p.advance(); err != nil {
			return nil, err
		}
		x, err := p.unary()
		if err != nil {
			return nil, err
		}
		if !neg {
			return x, nil
		}
		return &node{kind: kNeg, args: []*node{x}, pos: pos, end: x.end}, nil
	}
	return p.power()
}

// power = primary [ "^" unary ]   (right-associative: 2^3^2 = 2^(3^2),
// and -x^2 = -(x^2))
func (p *parser) power() (*node, error) {
	x, err := p.primary()
	if err != nil {
		return nil, err
	}
	if !p.isOp("^") {
		return x, nil
	}
	if err := p.advance(); err != nil {
		return nil, err
	}
	y, err := p.unary()
	if err != nil {
		return nil, err
	}
	return &node{kind: kPow, args: []*node{x, y}, pos: x.pos, end: y.end}, nil
}

// primary = number | "r" | "pi" | parameter | function "(" expr ")"
//
//	| "pow" "(" expr "," expr ")" | "(" expr ")"
func (p *parser) primary() (*node, error) {
	t := p.tok
	switch {
	case t.kind == tNum:
		if err := p.advance(); err != nil {
			return nil, err
		}
		return &node{kind: kNum, val: t.num, pos: t.pos, end: t.end}, nil
	case p.isOp("("):
		if err := p.advance(); err != nil {
			return nil, err
		}
		x, err := p.expr()
		if err != nil {
			return nil, err
		}
		if !p.isOp(")") {
			return nil, p.errAt(p.tok.pos, p.tok.end, fmt.Sprintf("expected ')' to close the '(' at column %d, found %s", column(p.src, t.pos), p.describe(p.tok)))
		}
		end := p.tok.end
		if err := p.advance(); err != nil {
			return nil, err
		}
		// Keep the parentheses in the span, so that messages quote them.
		x.pos, x.end = min(x.pos, t.pos), max(x.end, end)
		return x, nil
	case t.kind == tName:
		if err := p.advance(); err != nil {
			return nil, err
		}
		if p.isOp("(") {
			return p.call(t)
		}
		switch t.text {
		case "r":
			return &node{kind: kVar, pos: t.pos, end: t.end}, nil
		case "pi":
			return &node{kind: kNum, val: math.Pi, pos: t.pos, end: t.end}, nil
		}
		if i := slices.Index(p.params, t.text); i >= 0 {
			return &node{kind: kParam, idx: i, pos: t.pos, end: t.end}, nil
		}
		if t.text == "pow" || slices.Contains(functions, t.text) {
			return nil, p.errAt(t.pos, t.end, fmt.Sprintf("function '%s' needs an argument in parentheses", t.text))
		}
		return nil, p.errAt(t.pos, t.end, p.unknownName(t.text))
	case t.kind == tEOF:
		return nil, p.errAt(t.pos, t.end, "formula ends where a number, name or '(' is expected")
	}
	return nil, p.errAt(t.pos, t.end, fmt.Sprintf("unexpected %s where a number, name or '(' is expected", p.describe(t)))
}

// unknownName describes an unknown name with the names that are known.
func (p *parser) unknownName(name string) string {
	msg := fmt.Sprintf("unknown name '%s'", name)
	known := append([]string{"r", "pi"}, p.params...)
	if near := suggest.Near(name, known); len(near) > 0 {
		msg += fmt.Sprintf(" (did you mean %s?)", near[0])
	}
	if len(p.params) == 0 {
		return msg + "; the form has no parameters, only r and pi"
	}
	return msg + "; parameters are " + strings.Join(p.params, ", ")
}

// call parses the argument list of the function named by t; the current
// token is "(".
func (p *parser) call(t token) (*node, error) {
	nargs := 1
	switch {
	case t.text == "pow":
		nargs = 2
	case slices.Contains(functions, t.text):
	default:
		msg := fmt.Sprintf("unknown function '%s'", t.text)
		if near := suggest.Near(t.text, append(slices.Clone(functions), "pow")); len(near) > 0 {
			msg += fmt.Sprintf(" (did you mean %s?)", near[0])
		}
		return nil, p.errAt(t.pos, t.end, msg+"; functions are "+strings.Join(functions, ", ")+", pow")
	}
	open := p.tok
	if err := p.advance(); err != nil {
		return nil, err
	}
	var args []*node
	for {
		x, err := p.expr()
		if err != nil {
			return nil, err
		}
		args = append(args, x)
		if !p.isOp(",") {
			break
		}
		if err := p.advance(); err != nil {
			return nil, err
		}
	}
	if !p.isOp(")") {
		return nil, p.errAt(p.tok.pos, p.tok.end, fmt.Sprintf("expected ')' to close the '(' at column %d, found %s", column(p.src, open.pos), p.describe(p.tok)))
	}
	end := p.tok.end
	if err := p.advance(); err != nil {
		return nil, err
	}
	if len(args) != nargs {
		return nil, p.errAt(t.pos, end, fmt.Sprintf("%s takes %d argument%s, got %d", t.text, nargs, plural(nargs), len(args)))
	}
	if t.text == "pow" {
		return &node{kind: kPow, args: args, pos: t.pos, end: end}, nil
	}
	return &node{kind: kCall, fn: t.text, args: args, pos: t.pos, end: end}, nil
}

func plural(n int) string {
	if n == 1 {
		return ""
	}
	return "s"
}
