package formula

import (
	"errors"
	"fmt"
	"strings"
	"unicode/utf8"
)

// ErrFormula is wrapped by every error about the text of a formula: its
// syntax, its names and its dimensions.
var ErrFormula = errors.New("invalid formula")

// Error is an error at a place in a formula. Its message is one line; Caret
// gives the two-line picture of the place.
type Error struct {
	Formula string // the formula as written
	Column  int    // 1-based column (in characters) of the offending token
	Width   int    // its width in characters, at least 1
	Msg     string // what is wrong, e.g. "unknown name 'sigam' at column 14; …"
}

func newError(src string, pos, end int, msg string) *Error {
	col := column(src, pos)
	w := utf8.RuneCountInString(src[pos:max(pos, min(end, len(src)))])
	if !strings.Contains(msg, "at column") {
		msg = insertColumn(msg, col)
	}
	return &Error{Formula: src, Column: col, Width: max(w, 1), Msg: msg}
}

// insertColumn adds "at column N" to msg: before a "; " or a parenthesized
// hint that ends the first clause, after a leading quoted sub-expression,
// or at the end.
func insertColumn(msg string, col int) string {
	at := fmt.Sprintf(" at column %d", col)
	i := -1
	for _, mark := range []string{"; ", " (did you mean", " (write"} {
		if j := strings.Index(msg, mark); j >= 0 && (i < 0 || j < i) {
			i = j
		}
	}
	if i < 0 && strings.HasPrefix(msg, "'") {
		if j := strings.Index(msg[1:], "'"); j >= 0 {
			i = j + 2
		}
	}
	if i < 0 {
		return msg + at
	}
	return msg[:i] + at + msg[i:]
}

func (e *Error) Error() string { return e.Msg }

// Unwrap returns ErrFormula.
func (e *Error) Unwrap() error { return ErrFormula }

// Caret returns the formula on one line and a caret under the offending
// token on the next, both indented by two spaces:
//
//	4*epsilon*((sigam/r)^12 - (sigma/r)^6)
//	            ^^^^^
func (e *Error) Caret() string {
	line := strings.NewReplacer("\n", " ", "\r", " ", "\t", " ").Replace(e.Formula)
	return "  " + line + "\n  " + strings.Repeat(" ", e.Column-1) + strings.Repeat("^", e.Width)
}

// column returns the 1-based column, in characters, of byte offset pos.
func column(src string, pos int) int {
	pos = max(0, min(pos, len(src)))
	return utf8.RuneCountInString(src[:pos]) + 1
}

// snippet returns a piece of a formula for a one-line message: white space
// (also line breaks) collapsed to single spaces.
func snippet(s string) string { return strings.Join(strings.Fields(s), " ") }
