package levels

import (
	"math"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/units"
	"github.com/pairwell/pairwell/models"
)

// TestDunhamMorse checks the perturbative constants against the Morse
// closed forms, for which Dunham's relations are exact (J. L. Dunham, Phys.
// Rev. 41, 721 (1932); P. M. Morse 1929): ωexe = ωe²/(4De), αe of
// C. L. Pekeris, Phys. Rev. 45, 98 (1934), αe = (6Be²/ωe)(√(ωexe/Be) − 1),
// and Y₀₀ = 0.
func TestDunhamMorse(t *testing.T) {
	for _, m := range morseSets(t) {
		t.Run(m.name, func(t *testing.T) {
			w, err := core.AnalyzeWell(m.potential(t), core.WellSettings{})
			require.NoError(t, err)
			d, err := Dunham(w, m.mu)
			require.NoError(t, err)
			h := Harmonic(w, m.mu)
			we, wexe := models.MorseSpectroscopic(m.de, m.a, m.mu)
			assert.InEpsilon(t, we, h.OmegaE, 1e-13)
			assert.InEpsilon(t, wexe, d.OmegaExe, 1e-11, "ωexe = ωe²/(4De)")
			pekeris := 6 * h.Be * h.Be / h.OmegaE * (math.Sqrt(wexe/h.Be) - 1)
			assert.InEpsilon(t, pekeris, d.AlphaE, 1e-11, "αe (Pekeris)")
			assert.InDelta(t, 0, d.Y00, 1e-11*h.Be, "Y00")
			assert.InEpsilon(t, 4*h.Be*h.Be*h.Be/(h.OmegaE*h.OmegaE), d.CentrifugalDe, 1e-14)
		})
	}
}

// TestFitMorse fits the computed levels (v = 0…3, J = 0…4, the default
// set) of Morse wells and compares with the closed forms: ωe and ωexe of
// Morse 1929, ωeye = 0, Be, and αe of Pekeris' rotating Morse oscillator.
// The rotating Morse levels have Dunham terms of every order, which the
// truncated fit absorbs, so the agreement is to a relative few Be/ωe
// (tolerances: measured differences, rounded up). The Ar₂-like set holds
// only 6 levels and its fit over v ≤ 3 is far from the perturbative regime:
// its αe is not compared with Pekeris' (they differ by 9 %).
func TestFitMorse(t *testing.T) {
	tols := map[string]struct{ we, wexe, be, alpha float64 }{
		"H35Cl":    {1e-5, 1e-4, 1e-5, 1e-3},
		"H2":       {2e-5, 5e-4, 1e-3, 1e-2},
		"12C16O":   {1e-7, 1e-5, 1e-5, 1e-3},
		"Ar2-like": {2e-4, 2e-3, 5e-3, math.Inf(1)},
		"hcl-like": {1e-5, 1e-4, 1e-4, 2e-3},
	}
	for _, m := range morseSets(t) {
		t.Run(m.name, func(t *testing.T) {
			tol := tols[m.name]
			p := m.potential(t)
			w, err := core.AnalyzeWell(p, core.WellSettings{})
			require.NoError(t, err)
			res, err := Solve(p, m.mu, Settings{Count: FitV + 1, JMax: FitJ})
			require.NoError(t, err)
			f, err := Fit(res.Levels, res.Minimum, FitV, FitJ)
			require.NoError(t, err)
			h := Harmonic(w, m.mu)
			we, wexe := models.MorseSpectroscopic(m.de, m.a, m.mu)
			pekeris := 6 * h.Be * h.Be / h.OmegaE * (math.Sqrt(wexe/h.Be) - 1)
			t.Logf("ωe %.8g (%.2g), ωexe %.6g (%.2g), ωeye %.2g, Be %.6g (%.2g), αe %.6g (Pekeris %.6g, %.2g), γe %.3g, D %.4g (4Be³/ωe² %.4g), rms %.2g",
				f.OmegaE, f.OmegaE/we-1, f.OmegaExe, f.OmegaExe/wexe-1, f.OmegaEye, f.Be, f.Be/h.Be-1,
				f.AlphaE, pekeris, f.AlphaE/pekeris-1, f.GammaE, f.D, 4*h.Be*h.Be*h.Be/(h.OmegaE*h.OmegaE), f.RMS)
			assert.InEpsilon(t, we, f.OmegaE, tol.we)
			assert.InEpsilon(t, wexe, f.OmegaExe, tol.wexe)
			assert.InDelta(t, 0, f.OmegaEye, tol.wexe*wexe)
			assert.InEpsilon(t, h.Be, f.Be, tol.be)
			if !math.IsInf(tol.alpha, 1) {
				assert.InEpsilon(t, pekeris, f.AlphaE, tol.alpha)
			}
			assert.Equal(t, FitV, f.VMax)
			assert.Equal(t, FitJ, f.JMax)
			assert.Equal(t, (FitV+1)*(FitJ+1), f.Levels)
		})
	}
}

// TestFitTooFew checks that a fit without enough levels is refused.
func TestFitTooFew(t *testing.T) {
	m := morseSets(t)[0]
	res, err := Solve(m.potential(t), m.mu, Settings{Count: 3, JMax: 4})
	require.NoError(t, err)
	_, err = Fit(res.Levels, res.Minimum, FitV, FitJ)
	assert.ErrorIs(t, err, core.ErrParam)
	res, err = Solve(m.potential(t), m.mu, Settings{Count: 4, JMax: 2})
	require.NoError(t, err)
	_, err = Fit(res.Levels, res.Minimum, FitV, FitJ)
	assert.ErrorIs(t, err, core.ErrParam)
}

// TestHandbookFundamentals builds Morse wells from the constants of Huber &
// Herzberg, Constants of Diatomic Molecules (1979; all values here from
// memory) and checks the fundamental E₁ − E₀ of the computed levels against
// the Morse value ωe − 2ωexe exactly (to 1e-6 cm⁻¹), and the observed
// fundamental within the size of the term the Morse form neglects: with
// G(v) = ωe(v+½) − ωexe(v+½)² + ωeye(v+½)³ the fundamental gains (13/4)ωeye
// (plus 0.005 cm⁻¹ for the rounding of the quoted observed value).
func TestHandbookFundamentals(t *testing.T) {
	for _, tc := range []struct {
		name            string
		we, wexe, weye  float64 // cm⁻¹
		re              float64 // Å
		pair            string
		morse, observed float64 // cm⁻¹
	}{
		{"H35Cl", 2990.946, 52.8186, 0.2243, 1.27455, "1H-35Cl", 2885.3088, 2885.98},
		{"12C16O", 2169.81358, 13.28831, 0.010511, 1.128323, "12C-16O", 2143.23696, 2143.27},
	} {
		t.Run(tc.name, func(t *testing.T) {
			mu := pairMass(t, tc.pair)
			par, err := models.MorseFromSpectroscopic(tc.we, tc.wexe, tc.re, mu)
			require.NoError(t, err)
			p, err := models.NewMorse(par[0], par[1], par[2])
			require.NoError(t, err)
			res, err := Solve(p, mu, Settings{Count: 2})
			require.NoError(t, err)
			fund := (res.Levels[1].Energy - res.Levels[0].Energy) / units.WavenumberEV
			assert.InDelta(t, tc.we-2*tc.wexe, fund, 1e-6, "Morse fundamental")
			assert.InDelta(t, tc.morse, fund, 1e-4, "Morse fundamental as quoted")
			assert.InDelta(t, tc.observed, fund, 13.0/4*tc.weye+0.005, "observed fundamental within (13/4)ωeye")
			t.Logf("Morse %.6f, observed %.2f, difference %.3f, (13/4)ωeye %.3f", fund, tc.observed, tc.observed-fund, 13.0/4*tc.weye)
		})
	}
}
