package main

import (
	"os"
	"path/filepath"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// TestCutSpecEverywhere: a cut form is a form for every command.
func TestCutSpecEverywhere(t *testing.T) {
	lj := "lj:epsilon=119.8K,sigma=3.405@cut=switch-c2,on=8,rc=9" // argon-like, illustrative
	morse := "morse:De=4.6,a=1.87,re=1.27@cut=force-shift,rc=6"   // invented, HCl-sized
	dir := t.TempDir()
	for _, args := range [][]string{
		{"inspect", lj, "--pair", "Ar-Ar"},
		{"compare", lj, morse, "--mu", "10"},
		{"levels", morse, "--pair", "H-Cl", "--v-max", "3", "--j-max", "1"},
		{"virial", lj, "--pair", "Ar-Ar", "--temperatures", "100,300"},
		{"validity", morse},
		{"period", morse, "--pair", "H-Cl", "--amplitudes", "0.1"},
		{"check", lj, morse},
		{"plot", "taylor", morse, "-o", filepath.Join(dir, "t.png")},
		{"fit", "demodata/invented-scan.csv", "--mu", "7", "--form", "morse@cut=shift,rc=6", "--start", "morse:De=3,a=1.5,re=1.5@cut=shift,rc=6"},
	} {
		code, _, errOut := runCLI(t, args...)
		assert.Equal(t, 0, code, "%v: %s", args, errOut)
	}
	// A model-set entry with a cut form.
	set := filepath.Join(dir, "set.toml")
	require.NoError(t, os.WriteFile(set, []byte("[[entry]]\nname = \"cut\"\nspec = \""+lj+"\"\npair = \"Ar-Ar\"\n"), 0o644))
	code, out, errOut := runCLI(t, "compare", "--set", set, "--format", "json")
	assert.Equal(t, 0, code, errOut)
	assert.Contains(t, out, `"model": "lennard-jones@cut=switch-c2,on=8,rc=9"`)
	code, _, errOut = runCLI(t, "inspect", "lj:epsilon=120K,sigma=3.4@cut=switch-c2,on=9,rc=8")
	assert.Equal(t, 2, code)
	assert.Contains(t, errOut, "r_on = 9 Å ≥ r_c = 8 Å")
}
