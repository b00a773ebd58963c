package period

import (
	"encoding/json"
	"math"
	"os"
	"strconv"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/models"
)

// reference is testdata/reference.json, written by testdata/make_reference.py
// with mpmath 1.3.0 at 40 significant digits (checked against 50): periods
// near the top of Morse, Lennard-Jones and Buckingham wells (invented,
// illustrative parameter sets, one Buckingham with an inner barrier only
// 1.5e-6 eV above its minimum).
type reference struct {
	Library string `json:"library"`
	Digits  int    `json:"digits"`
	Forms   []struct {
		Key  string `json:"key"`
		Spec string `json:"spec"`
		Top  string `json:"top"`
		Rows []struct {
			Fraction string `json:"fraction"`
			Energy   string `json:"energy_ev"`
			Inner    string `json:"inner"`
			Outer    string `json:"outer"`
			Integral string `json:"integral"`
		} `json:"rows"`
	} `json:"forms"`
}

func parse(t *testing.T, s string) float64 {
	t.Helper()
	f, err := strconv.ParseFloat(s, 64)
	require.NoError(t, err, s)
	return f
}

// TestReferenceNearTop: on the test grid of energies from 1% to 0.999999 of
// the top of each well (the depth, or the inner barrier when lower), the
// period agrees with the mpmath reference and the error estimate is never
// below the true error.
func TestReferenceNearTop(t *testing.T) {
	data, err := os.ReadFile("testdata/reference.json")
	require.NoError(t, err)
	var ref reference
	require.NoError(t, json.Unmarshal(data, &ref))
	require.Equal(t, "mpmath 1.3.0", ref.Library)
	require.GreaterOrEqual(t, ref.Digits, 30)
	in, err := NewIntegrator(Settings{})
	require.NoError(t, err)
	reg := models.NewRegistry()
	const mu = 1.0 // u: T = √(2μ)·I in the unit √(u·Å²/eV)
	for _, f := range ref.Forms {
		inst, err := reg.Build(f.Spec)
		require.NoError(t, err, f.Spec)
		w, err := core.AnalyzeWell(inst.Potential, core.WellSettings{})
		require.NoError(t, err)
		worst, worstRatio := 0.0, 0.0
		for _, row := range f.Rows {
			E := parse(t, row.Energy)
			want := math.Sqrt(2*mu) * parse(t, row.Integral) * timeUnit()
			res, err := in.Exact(inst.Potential, w, mu, E)
			require.NoError(t, err, "%s at %s of the top", f.Key, row.Fraction)
			rel := math.Abs(res.Period/want - 1)
			assert.GreaterOrEqual(t, res.ErrorEstimate, rel, "%s at %s of the top: estimate %.3g, true error %.3g",
				f.Key, row.Fraction, res.ErrorEstimate, rel)
			t.Logf("%-15s %-9s error %.3g estimate %.3g", f.Key, row.Fraction, rel, res.ErrorEstimate)
			worst = math.Max(worst, rel)
			worstRatio = math.Max(worstRatio, rel/res.ErrorEstimate)
		}
		t.Logf("%s: worst error %.3g, worst error/estimate %.3g", f.Key, worst, worstRatio)
	}
}
