package formula_test

import (
	"math"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/formula"
	"github.com/pairwell/pairwell/models"
)

// TestMatch checks the numerical match of formula forms against closed
// forms: Morse typed as a formula against the built-in Morse match
// (De = depth, a = √(k/(2De)), P. M. Morse, Phys. Rev. 34, 57 (1929)), to
// 1e-9 relative; Varshni (Y. P. Varshni, Rev. Mod. Phys. 29, 664 (1957))
// and the Mie 12–6 form (G. Mie 1903; with n, m free the match is one of
// a family) checked by the well they give: re, depth and k of
// core.AnalyzeWell to 1e-7 relative.
func TestMatch(t *testing.T) {
	morse, err := formula.NewForm(formula.Decl{Key: "fmorse", Formula: "De*((1 - exp(-a*(r - re)))^2 - 1)", Limit: "0",
		Params: []formula.ParamDecl{{Name: "De", Unit: "eV", Constraint: "> 0"}, {Name: "a", Unit: "1/A", Constraint: "> 0"}, {Name: "re", Unit: "A", Constraint: "> 0"}}})
	require.NoError(t, err)
	varshni, err := formula.NewForm(formula.Decl{Key: "varshni", Formula: "De*(1 - (re/r)*exp(-beta*(r^2 - re^2)))^2 - De",
		Params: []formula.ParamDecl{{Name: "De", Unit: "eV", Constraint: "> 0"}, {Name: "re", Unit: "A", Constraint: "> 0"}, {Name: "beta", Unit: "1/A^2", Constraint: "> 0"}}})
	require.NoError(t, err)
	mie, err := formula.NewForm(formula.Decl{Key: "mie", Formula: "n/(n - m)*(n/m)^(m/(n - m))*epsilon*((sigma/r)^n - (sigma/r)^m)", Limit: "0",
		Params: []formula.ParamDecl{{Name: "epsilon", Unit: "eV", Constraint: "> 0"}, {Name: "sigma", Unit: "A", Constraint: "> 0"}, {Name: "n", Unit: "1", Constraint: "> 0"}, {Name: "m", Unit: "1", Constraint: "> 0"}}})
	require.NoError(t, err)

	targets := []core.Target{{Re: 1.27, Depth: 4.6, K: 32.2}, {Re: 3.8, Depth: 0.0104, K: 0.06}, {Re: 0.74, Depth: 4.75, K: 35.9}}
	for _, tg := range targets {
		want, _, err := models.Morse{}.Match(tg)
		require.NoError(t, err)
		got, notes, err := morse.Match(tg)
		require.NoError(t, err)
		assert.Empty(t, notes)
		for j := range want {
			assert.InDelta(t, 1, got[j]/want[j], 1e-9, "morse %v parameter %d", tg, j)
		}
		for _, f := range []*formula.Form{varshni, mie} {
			p, _, err := f.Match(tg)
			require.NoError(t, err, "%s %v", f.Info().Key, tg)
			pot, err := f.New(p)
			require.NoError(t, err)
			w, err := core.AnalyzeWell(pot, core.WellSettings{})
			require.NoError(t, err)
			assert.InDelta(t, 1, w.Re/tg.Re, 1e-7, "%s re", f.Info().Key)
			assert.InDelta(t, 1, w.Depth/tg.Depth, 1e-7, "%s depth", f.Info().Key)
			assert.InDelta(t, 1, 2*w.Taylor[2]/tg.K, 1e-7, "%s k", f.Info().Key)
		}
	}
	// Kratzer (A. Kratzer, Z. Phys. 3, 289 (1920)), V = De((re/r)² − 2re/r):
	// two parameters for three conditions, so k is given up: the match is
	// De = depth, re = re exactly, and the note gives its k = 2De/re².
	kratzer, err := formula.NewForm(formula.Decl{Key: "kratzer", Formula: "De*((re/r)^2 - 2*re/r)", Limit: "0",
		Params: []formula.ParamDecl{{Name: "De", Unit: "eV", Constraint: "> 0"}, {Name: "re", Unit: "A", Constraint: "> 0"}}})
	require.NoError(t, err)
	p, notes, err := kratzer.Match(core.Target{Re: 1.2, Depth: 4, K: 30})
	require.NoError(t, err)
	assert.InDelta(t, 1, p[0]/4, 1e-9)
	assert.InDelta(t, 1, p[1]/1.2, 1e-9)
	require.Len(t, notes, 1)
	assert.Contains(t, notes[0], "k not honoured")
	assert.Contains(t, notes[0], "5.55556 eV/Å²") // 2·4/1.2²

	_, _, err = morse.Match(core.Target{Depth: 1, K: 1})
	assert.ErrorIs(t, err, core.ErrParam, "no re")
	_, _, err = morse.Match(core.Target{Re: math.NaN(), Depth: 1, K: 1})
	assert.ErrorIs(t, err, core.ErrParam)
}
