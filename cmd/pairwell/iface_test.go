package main

import (
	"testing"

	"github.com/stretchr/testify/assert"
)

// Tests of issue 17: one consistent interface across commands.

func TestPairsAllElements(t *testing.T) {
	for _, pair := range []string{"Au-Au", "Pt-O", "Cs-Cl", "63Cu-63Cu", "H-CL", "h-cl"} {
		code, out, errOut := runCLI(t, "inspect", "morse:De=2.3,a=1.5,re=2.5", "--pair", pair)
		assert.Equal(t, 0, code, "%s: %s", pair, errOut)
		assert.Contains(t, out, "reduced mass", pair)
	}
	code, _, errOut := runCLI(t, "inspect", "morse:De=4.6,a=1.87,re=1.27", "--pair", "HCl")
	assert.Equal(t, 2, code)
	assert.Contains(t, errOut, "did you mean H-Cl?")
}
