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
// formula form of core/formula (numerical Match).
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
// Morse and recovers the parameters to 1e-8 relative, from the automatic
// start (the formula form's numerical Match) and from a given start 10–20 %
// off, with the zero fitted.
func TestFormulaRecovery(t *testing.T) {
	m := morseFormula(t)
	truth := []float64{4.6, 1.87, 1.27}
	d := scan(t, models.Morse{}, truth, 0.95, 4, 60, -1234.5)
	for _, start := range [][]float64{nil, {5.5, 1.6, 1.35}} {
		res, err := fit.FitForm(m, d, fit.Settings{Offset: fit.Offset{Mode: fit.OffsetFit}, Start: start})
		require.NoError(t, err)
		assert.True(t, res.Converged(), "reason %s", res.Reason)
		for j, want := range truth {
			assert.InDelta(t, 1, res.Instance.Params[j]/want, 1e-8, "start %v parameter %d", start, j)
		}
		assert.InDelta(t, -1234.5, res.Zero, 1e-8*1234.5)
	}
}

// BenchmarkFitFormula fits the formula Morse and its built-in twin (with
// central differences, and analytic) to 200 points, from the automatic
// start and from the same given start (issue target: a formula form ≤ 3×
// its built-in twin).
func BenchmarkFitFormula(b *testing.B) {
	d := inventedScan(200)
	for _, start := range [][]float64{nil, {4, 2, 1.2}} {
		from := "/auto"
		if start != nil {
			from = "/given"
		}
		for _, c := range []struct {
			name    string
			m       core.Model
			central bool
		}{{"formula", morseFormula(b), false}, {"builtin-central", models.Morse{}, true}, {"builtin-analytic", models.Morse{}, false}} {
			b.Run(c.name+from, func(b *testing.B) {
				for b.Loop() {
					_, err := fit.FitForm(c.m, d, fit.Settings{Start: start, Central: c.central})
					require.NoError(b, err)
				}
			})
		}
	}
}
