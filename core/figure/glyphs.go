package figure

import (
	"strings"

	"golang.org/x/image/font/sfnt"
	"gonum.org/v1/plot/font"
)

// superscripts and subscripts map the Unicode super- and subscript
// characters to the plain characters they raise or lower.
var (
	superscripts = map[rune]rune{'⁰': '0', '¹': '1', '²': '2', '³': '3', '⁴': '4', '⁵': '5', '⁶': '6', '⁷': '7', '⁸': '8', '⁹': '9',
		'⁺': '+', '⁻': '-', '⁼': '=', '⁽': '(', '⁾': ')', 'ⁿ': 'n'}
	subscripts = map[rune]rune{'₀': '0', '₁': '1', '₂': '2', '₃': '3', '₄': '4', '₅': '5', '₆': '6', '₇': '7', '₈': '8', '₉': '9',
		'₊': '+', '₋': '-', '₌': '=', '₍': '(', '₎': ')'}
	// plainFor replaces other characters that a font may lack.
	plainFor = map[rune]string{'⟨': "<", '⟩': ">"}
)

// glyphs reports whether the font has a glyph for a character.
type glyphs func(r rune) bool

// fontGlyphs returns the glyph test of fnt, from the font cache of
// gonum/plot (the one its text handler draws with).
func fontGlyphs(fnt font.Font) glyphs {
	face := font.DefaultCache.Lookup(fnt, fnt.Size)
	if face.Face == nil {
		return func(rune) bool { return true }
	}
	var buf sfnt.Buffer
	return func(r rune) bool {
		i, err := face.Face.GlyphIndex(&buf, r)
		return err == nil && i != 0
	}
}

// drawable returns s in characters the font has: a run of superscript
// characters one of which it lacks becomes "^" and the plain characters
// ("cm⁻¹" → "cm^-1" in Liberation Sans, which has ¹ but not ⁻), a run of
// subscripts likewise "_" and the plain characters, and ⟨ ⟩ become < >
// where missing. Other characters are kept: a missing one is drawn as
// nothing by gonum/plot.
func drawable(s string, has glyphs) string {
	if !strings.ContainsFunc(s, func(r rune) bool { return !has(r) }) {
		return s
	}
	var b strings.Builder
	rs := []rune(s)
	for i := 0; i < len(rs); {
		if n := scriptRun(&b, rs[i:], superscripts, '^', has) + scriptRun(&b, rs[i:], subscripts, '_', has); n > 0 {
			i += n
			continue
		}
		if p, ok := plainFor[rs[i]]; ok && !has(rs[i]) {
			b.WriteString(p)
		} else {
			b.WriteRune(rs[i])
		}
		i++
	}
	return b.String()
}

// scriptRun writes the run of characters of m at the start of rs to b —
// as they are when the font has all of them, else as mark and their plain
// characters — and returns its length (0 when rs does not start with one).
func scriptRun(b *strings.Builder, rs []rune, m map[rune]rune, mark byte, has glyphs) int {
	n := 0
	for n < len(rs) && m[rs[n]] != 0 {
		n++
	}
	run := rs[:n]
	missing := false
	for _, r := range run {
		missing = missing || !has(r)
	}
	switch {
	case n == 0:
	case !missing:
		b.WriteString(string(run))
	default:
		b.WriteByte(mark)
		for _, r := range run {
			b.WriteRune(m[r])
		}
	}
	return n
}
