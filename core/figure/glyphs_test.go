package figure

import (
	"bytes"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
	"gonum.org/v1/plot/font"
)

// TestDrawableText: the Liberation Sans of gonum/plot has ¹ ² ³ (Latin-1)
// and ₂ but not the superscript minus U+207B, ⁰ or ⟨ (checked with its
// glyph table, sfnt GlyphIndex), so "cm⁻¹" would be drawn as "cm¹": such
// runs become caret notation; runs the font has stay.
func TestDrawableText(t *testing.T) {
	has := fontGlyphs(font.From(sans, 12))
	require.False(t, has('⁻'), "the font lacks U+207B")
	require.True(t, has('¹'))
	for _, c := range []struct{ in, want string }{
		{"wavenumber [cm⁻¹]", "wavenumber [cm^-1]"},
		{"a [Å⁻¹], k [eV/Å²]", "a [Å^-1], k [eV/Å²]"},
		{"x⁻¹² − 2x⁻⁶", "x^-12 − 2x^-6"},
		{"B₂ [cm³/mol]", "B₂ [cm³/mol]"},
		{"10⁰", "10^0"},
		{"⟨r⟩ [Å]", "<r> [Å]"},
		{"levels to 1e-06 cm⁻¹; ħω = 2990 cm⁻¹", "levels to 1e-06 cm^-1; ħω = 2990 cm^-1"},
		{"plain", "plain"},
	} {
		assert.Equal(t, c.want, drawable(c.in, has), c.in)
	}
	// A font with every glyph keeps the text as it is.
	assert.Equal(t, "cm⁻¹", drawable("cm⁻¹", func(rune) bool { return true }))
}

// TestLevelsPictureUnits: the levels picture (whose title and notes say
// cm⁻¹) renders to SVG with "cm^-1" and without "cm¹".
func TestLevelsPictureUnits(t *testing.T) {
	f := &Figure{Kind: "levels", Title: "levels to 1e-06 cm⁻¹", XLabel: "separation r [Å]", YLabel: "energy [cm⁻¹]",
		XMin: 0, XMax: 1, YMin: 0, YMax: 1, Notes: []string{"zero-point energy 1495 cm⁻¹"},
		Series: []Series{{Name: "V(r)", Role: Reference, X: []float64{0, 1}, Y: []float64{0, 1}}}}
	var b bytes.Buffer
	require.NoError(t, f.Render(&b, SVG))
	svg := b.String()
	assert.Contains(t, svg, "cm^-1")
	assert.NotContains(t, svg, "cm¹")
	assert.NotContains(t, svg, "cm⁻¹")
}
