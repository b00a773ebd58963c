package main

import (
	"fmt"
	"io"
	"unicode/utf8"
)

// cleanWriter escapes, in everything pairwell prints, the characters that
// a terminal would execute rather than show: C0 controls other than
// newline and tab (ESC, CR, BS, BEL, …), DEL, C1 controls (U+0080–U+009F,
// among them the one-character CSI), the bidirectional overrides and
// isolates (U+202A–U+202E, U+2066–U+2069), and bytes that are not UTF-8.
// Text from plugins (model names, notes, error messages) and from input
// files therefore cannot clear the screen or rewrite lines. A character
// is written as \uXXXX (a byte as \xXX), which inside a JSON string is
// the same character.
type cleanWriter struct {
	w       io.Writer
	pending []byte // an incomplete UTF-8 sequence from the last Write
}

// dangerous reports whether a terminal might act on r.
func dangerous(r rune) bool {
	switch {
	case r == '\n' || r == '\t':
		return false
	case r < 0x20 || r == 0x7f || (r >= 0x80 && r <= 0x9f):
		return true
	case r >= 0x202a && r <= 0x202e, r >= 0x2066 && r <= 0x2069:
		return true
	}
	return false
}

func (c *cleanWriter) Write(p []byte) (int, error) {
	n := len(p)
	if len(c.pending) > 0 {
		p = append(c.pending, p...)
		c.pending = nil
	}
	out := make([]byte, 0, len(p))
	for i := 0; i < len(p); {
		b := p[i]
		if b >= 0x20 && b < 0x7f || b == '\n' || b == '\t' {
			out = append(out, b)
			i++
			continue
		}
		if !utf8.FullRune(p[i:]) {
			c.pending = append([]byte(nil), p[i:]...)
			break
		}
		r, size := utf8.DecodeRune(p[i:])
		switch {
		case r == utf8.RuneError && size == 1:
			out = fmt.Appendf(out, `\x%02x`, b)
		case dangerous(r):
			out = fmt.Appendf(out, `\u%04x`, r)
		default:
			out = append(out, p[i:i+size]...)
		}
		i += size
	}
	if _, err := c.w.Write(out); err != nil {
		return 0, err
	}
	return n, nil
}
