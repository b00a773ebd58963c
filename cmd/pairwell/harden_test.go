package main

import (
	"testing"

	"github.com/stretchr/testify/assert"
)

// The reproductions of hostile and careless input: each must give its
// clear line and exit code.

// TestUnitsNeverGuessed: a laboratory unit without "/mol", or "mol" after a
// per-particle unit, is refused (exit 2) with the spelling meant.
func TestUnitsNeverGuessed(t *testing.T) {
	tests := []struct {
		args []string
		want string
	}{
		{[]string{"inspect", "lj:epsilon=0.238kcal,sigma=3.4"}, "did you mean kcal/mol?"},
		{[]string{"inspect", "lj:epsilon=0.238cal,sigma=3.4"}, "did you mean cal/mol?"},
		{[]string{"inspect", "lj:epsilon=1kJ,sigma=3.4"}, "did you mean kJ/mol?"},
		{[]string{"inspect", "lj:epsilon=1eV/mol,sigma=3.4"}, "only per mole"},
		{[]string{"inspect", "morse:De=4.4,a=1.9,re=1.27", "--mu", "5e-324"}, "from 0.0001 u to 1e+06 u"},
		{[]string{"inspect", "morse:De=4.4,a=1.9,re=1.27", "--mu", "0"}, "from 0.0001 u"},
		{[]string{"inspect", "morse:De=4.4,a=1.9,re=1.27", "--mu", "1e-400"}, "from 0.0001 u"},
		{[]string{"inspect", "morse:De=4.4,a=1.9,re=1.27", "--mu", "12g"}, "did you mean g/mol?"},
		{[]string{"inspect", "morse:De=4.4,a=1.9,re=1.27", "--pair", ""}, `--pair "": give an atom pair`},
		{[]string{"inspect", "morse:De=4.4,a=1.9,re=1.27", "--pair", "", "--mu", "1"}, "both given"},
		{[]string{"motion", "morse:De=4.4,a=1.9,re=1.27", "--pair=", "--amplitude", "0.1"}, `--pair ""`},
	}
	for _, tt := range tests {
		code, _, errOut := runCLI(t, tt.args...)
		assert.Equal(t, 2, code, "%v: %s", tt.args, errOut)
		assert.Contains(t, errOut, tt.want, "%v", tt.args)
	}
	code, _, errOut := runCLI(t, "inspect", "lj:epsilon=0.238kcal/mol,sigma=3.4", "--mu", "0.5")
	assert.Equal(t, 0, code, errOut)
}
