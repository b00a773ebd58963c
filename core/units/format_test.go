package units

import (
	"testing"

	"github.com/stretchr/testify/assert"
)

func TestFormatHelpers(t *testing.T) {
	// Unicode superscript and subscript digits (Unicode Standard, blocks
	// Latin-1 Supplement and Superscripts and Subscripts).
	assert.Equal(t, "⁰", Superscript(0))
	assert.Equal(t, "¹²", Superscript(12))
	assert.Equal(t, "⁻¹", Superscript(-1))
	assert.Equal(t, "₄", Subscript(4))
	assert.Equal(t, "₁₀", Subscript(10))
	assert.Equal(t, "₋₁", Subscript(-1))
	for n, want := range []string{"eV", "eV/Å", "eV/Å²", "eV/Å³", "eV/Å⁴"} {
		assert.Equal(t, want, DerivativeUnit(n))
	}
	assert.Equal(t, "eV/Å¹²", DerivativeUnit(12))
}
