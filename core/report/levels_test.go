package report

import (
	"encoding/json"
	"math"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/atoms"
	"github.com/pairwell/pairwell/models"
)

func hclInstance(t *testing.T) (core.Instance, Mass) {
	t.Helper()
	pair, err := atoms.ParsePair("1H-35Cl")
	require.NoError(t, err)
	// Morse from the H³⁵Cl constants of Huber & Herzberg (1979, from
	// memory): ωe = 2990.946, ωexe = 52.8186 cm⁻¹, re = 1.27455 Å.
	par, err := models.MorseFromSpectroscopic(2990.946, 52.8186, 1.27455, pair.Mu)
	require.NoError(t, err)
	p, err := models.Morse{}.New(par)
	require.NoError(t, err)
	return core.Instance{Model: models.Morse{}, Params: par, Potential: p}, Mass{Pair: "1H-35Cl", Mu: pair.Mu}
}

// TestLevelsMorse checks the summary numbers against the Morse closed form
// (Morse 1929): ZPE = ωe/2 − ωexe/4, fundamental ωe − 2ωexe, first overtone
// 2ωe − 6ωexe, 28 bound levels, D0 = De − ZPE.
func TestLevelsMorse(t *testing.T) {
	inst, m := hclInstance(t)
	r, err := NewLevels(inst, m, LevelsSettings{VMax: -1})
	require.NoError(t, err)
	we, wexe := 2990.946, 52.8186
	assert.InDelta(t, we/2-wexe/4, r.ZPE, 1e-5)
	require.NotNil(t, r.Fundamental)
	assert.InDelta(t, we-2*wexe, *r.Fundamental, 1e-5)
	assert.InDelta(t, 2*we-6*wexe, *r.FirstOvertone, 1e-5)
	require.NotNil(t, r.BoundLevels)
	assert.Equal(t, 28, *r.BoundLevels)
	assert.Len(t, r.Levels, 28)
	assert.InEpsilon(t, inst.Params[0]-r.ZPEeV, *r.D0, 1e-12)
	assert.InEpsilon(t, we, r.Harmonic.OmegaE, 1e-6)
	require.NotNil(t, r.Perturbative)
	assert.InEpsilon(t, wexe, r.Perturbative.OmegaExe, 1e-6)
	require.NotNil(t, r.FromLevels)
	assert.InEpsilon(t, wexe, r.FromLevels.OmegaExe, 1e-4)
	// Correspondence: the spacing and h/T(E) at the midpoint agree to the
	// order of ωexe/ωe... within 1 % at the bottom of the well, and the
	// harmonic picture fails already at v = 0 (2ωexe/ωe = 3.5 % > 1 %).
	l0 := r.Levels[0]
	require.NotNil(t, l0.ClassicalSpacing)
	assert.InEpsilon(t, *l0.Spacing, *l0.ClassicalSpacing, 0.01)
	assert.Nil(t, r.HarmonicValidity.HighestV)
	// The period criterion at 1 % ends at E/De = 1 − 0.99² (Morse) =
	// 0.0199·De = 843 cm⁻¹, below the ZPE of 1482 cm⁻¹.
	assert.InEpsilon(t, 0.0199*we*we/(4*wexe), float64(r.HarmonicValidity.ClassicalEnergy), 1e-6)
	assert.True(t, r.HarmonicValidity.BelowZeroPoint)
	b, err := json.Marshal(r)
	require.NoError(t, err)
	var keys map[string]any
	require.NoError(t, json.Unmarshal(b, &keys))
	for _, k := range []string{"model", "params", "reduced_mass_u", "levels", "zero_point_energy_per_cm", "fundamental_per_cm",
		"first_overtone_per_cm", "bound_levels", "d0_ev", "harmonic", "perturbative", "from_levels", "error_estimate_per_cm"} {
		assert.Contains(t, keys, k)
	}
	lv := keys["levels"].([]any)[0].(map[string]any)
	for _, k := range []string{"v", "j", "term_value_per_cm", "binding_energy_per_cm", "mean_r_angstrom", "rms_displacement_angstrom"} {
		assert.Contains(t, lv, k)
	}
	for group, ks := range map[string][]string{
		"harmonic":     {"omega_e_per_cm", "b_e_per_cm"},
		"perturbative": {"omega_e_x_e_per_cm", "alpha_e_per_cm", "y00_per_cm", "centrifugal_d_e_per_cm"},
		"from_levels":  {"omega_e_per_cm", "omega_e_x_e_per_cm", "omega_e_y_e_per_cm", "b_e_per_cm", "alpha_e_per_cm"},
	} {
		for _, k := range ks {
			assert.Contains(t, keys[group], k, group)
		}
	}
}

// TestLevelsHarmonic: for the harmonic form the levels are ħω(v+½), the
// binding energies and the bound-level count are null, and every spacing
// is ħω, so the harmonic picture holds for every level shown.
func TestLevelsHarmonic(t *testing.T) {
	p, err := models.Harmonic{}.New([]float64{30, 1.2})
	require.NoError(t, err)
	inst := core.Instance{Model: models.Harmonic{}, Params: []float64{30, 1.2}, Potential: p}
	_, err = NewLevels(inst, Mass{Mu: 7}, LevelsSettings{VMax: -1})
	assert.ErrorIs(t, err, core.ErrParam)
	r, err := NewLevels(inst, Mass{Mu: 7}, LevelsSettings{VMax: 5, JMax: 1})
	require.NoError(t, err)
	assert.Nil(t, r.BoundLevels)
	assert.Nil(t, r.D0)
	assert.Len(t, r.Levels, 12)
	assert.Nil(t, r.Levels[0].Binding)
	require.NotNil(t, r.HarmonicValidity.HighestV)
	assert.Equal(t, 4, *r.HarmonicValidity.HighestV)
	assert.True(t, math.IsInf(float64(r.HarmonicValidity.ClassicalEnergy), 1))
	assert.InEpsilon(t, r.Harmonic.OmegaE, *r.Fundamental, 1e-9)
	b, err := json.Marshal(r)
	require.NoError(t, err)
	assert.Contains(t, string(b), `"bound_levels":"Infinity"`)
	assert.Contains(t, string(b), `"binding_energy_per_cm":"Infinity"`)
}

// TestLevelsBadInput: v beyond the bound levels and no mass are refused.
func TestLevelsBadInput(t *testing.T) {
	inst, m := hclInstance(t)
	_, err := NewLevels(inst, m, LevelsSettings{VMax: 28})
	assert.ErrorIs(t, err, core.ErrParam)
	assert.ErrorContains(t, err, "holds 28 bound levels")
	_, err = NewLevels(inst, Mass{}, LevelsSettings{VMax: -1})
	assert.ErrorIs(t, err, core.ErrParam)
}

// TestCompareQuantumColumns: with a mass, compare rows carry the ZPE and
// the fundamental of the levels, for Morse ωe/2 − ωexe/4 and ωe − 2ωexe
// (Morse 1929); without one, neither key.
func TestCompareQuantumColumns(t *testing.T) {
	inst, m := hclInstance(t)
	rows, err := Compare([]CompareInput{{Name: "hcl", Instance: inst, Mass: m}, {Name: "no mass", Instance: inst}}, CompareSettings{})
	require.NoError(t, err)
	we, wexe := 2990.946, 52.8186
	assert.InDelta(t, we/2-wexe/4, rows[0].ZPE, 1e-5)
	assert.InDelta(t, we-2*wexe, rows[0].Fundamental, 1e-5)
	b, err := json.Marshal(rows)
	require.NoError(t, err)
	var got []map[string]any
	require.NoError(t, json.Unmarshal(b, &got))
	assert.Contains(t, got[0], "zero_point_energy_per_cm")
	assert.Contains(t, got[0], "fundamental_per_cm")
	assert.NotNil(t, got[0]["zero_point_energy_per_cm"])
	// Without a mass the keys are there, null: the quantity does not apply.
	assert.Contains(t, got[1], "zero_point_energy_per_cm")
	assert.Nil(t, got[1]["zero_point_energy_per_cm"])
	assert.Nil(t, got[1]["fundamental_per_cm"])
}
