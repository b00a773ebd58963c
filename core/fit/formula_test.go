package fit_test

import (
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/fit"
	"github.com/pairwell/pairwell/core/formula"
	"github.com/pairwell/pairwell/models"
)

// morseFormula is the Morse form typed as a formula (Morse 1929), a
// formula form of core/formula: it has no Match and no ParamGradient.
func morseFormula(tb testing.TB) core.Model {
	tb.Helper()
	f, err := formula.NewForm(formula.Decl{
		Key:     "morse-formula",
		Formula: "De*((1 - exp(-a*(r - re)))^2 - 1)",
		Limit:   "0",
		Params: []formula.ParamDecl{
			{Name: "De", Unit: "eV", Constraint: "> 0"},
			{Name: "a", Unit: "1/A", Constraint: "> 0"},
			{Name: "re", Unit: "A", Constraint: "> 0"},
		},
	})
	require.NoError(tb, err)
	return f
}

// TestFormulaRecovery fits the formula Morse to exact data of the built-in
// Morse and recovers the parameters to 1e-8 relative. A formula form has
// no Match, so it needs a start (here 10–20 % off); without one FitForm
// says so.
func TestFormulaRecovery(t *testing.T) {
	m := morseFormula(t)
	truth := []float64{4.6, 1.87, 1.27}
	d := scan(t, models.Morse{}, truth, 0.95, 4, 60, -1234.5)
	res, err := fit.FitForm(m, d, fit.Settings{Offset: fit.Offset{Mode: fit.OffsetFit}, Start: []float64{5.5, 1.6, 1.35}})
	require.NoError(t, err)
	assert.True(t, res.Converged(), "reason %s", res.Reason)
	assert.False(t, res.Analytic, "central differences")
	for j, want := range truth {
		assert.InDelta(t, 1, res.Instance.Params[j]/want, 1e-8, "parameter %d", j)
	}
	assert.InDelta(t, -1234.5, res.Zero, 1e-8*1234.5)
	_, err = fit.FitForm(m, d, fit.Settings{})
	assert.ErrorIs(t, err, core.ErrParam, "no Match: a start is needed")
}

// BenchmarkFitFormula fits the formula Morse and its built-in twin (with
// central differences, and analytic) from the same start to 200 points
// (issue target: a formula form ≤ 3× its built-in twin).
func BenchmarkFitFormula(b *testing.B) {
	d := inventedScan(200)
	start := []float64{4, 2, 1.2}
	for _, c := range []struct {
		name    string
		m       core.Model
		central bool
	}{{"formula", morseFormula(b), false}, {"builtin-central", models.Morse{}, true}, {"builtin-analytic", models.Morse{}, false}} {
		b.Run(c.name, func(b *testing.B) {
			for b.Loop() {
				_, err := fit.FitForm(c.m, d, fit.Settings{Start: start, Central: c.central})
				require.NoError(b, err)
			}
		})
	}
}
