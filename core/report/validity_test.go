package report

import (
	"encoding/json"
	"errors"
	"math"
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"github.com/pairwell/pairwell/core"
)

func TestValidity(t *testing.T) {
	tests := []struct {
		name     string
		spec     string
		order    int
		tol      float64
		mass     Mass
		fraction float64 // E/De of the period range; NaN when unbounded
	}{
		// Morse, V₂: T0/T = √(1 − E/De) ≥ 1 − τ up to E/De = 1 − (1 − τ)²
		// (from T = T0/√(1 − E/De), standard result; from memory).
		{"morse harmonic 1%", morseSpec, 2, 0.01, Mass{}, 1 - 0.99*0.99},
		{"morse harmonic 5%", morseSpec, 2, 0.05, Mass{Pair: "H-Cl", Mu: testMu}, 1 - 0.95*0.95},
		{"morse default tolerance", morseSpec, 2, 0, Mass{}, 1 - 0.99*0.99},
		// The harmonic form is its own expansion: every range unbounded.
		{"harmonic", "harmonic:k=30,r0=1.2", 2, 0.01, Mass{Mu: 2}, math.NaN()},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			inst := build(t, tt.spec)
			r, err := NewValidity(inst, tt.order, tt.tol, tt.mass)
			require.NoError(t, err)
			assert.Equal(t, inst.Model.Info().Key, r.Model)
			assert.Equal(t, tt.order, r.Result.Order)
			assert.Equal(t, tt.mass.Pair, r.Pair)
			if tt.mass.Mu == 0 {
				assert.Nil(t, r.Mu)
			} else {
				require.NotNil(t, r.Mu)
				assert.Equal(t, tt.mass.Mu, *r.Mu)
			}
			if math.IsNaN(tt.fraction) {
				assert.True(t, math.IsInf(float64(r.Depth), 1))
				assert.True(t, math.IsInf(r.Result.Period.Energy, 1))
				return
			}
			assert.InEpsilon(t, morseRe, r.Re, 1e-12)
			assert.InEpsilon(t, morseDe, float64(r.Depth), 1e-12)
			assert.InEpsilon(t, tt.fraction, r.Result.Period.DepthFraction, 1e-9)
		})
	}
}

func TestValidityJSON(t *testing.T) {
	r, err := NewValidity(build(t, "harmonic:k=30,r0=1.2"), 2, 0.01, Mass{Pair: "H-H", Mu: 0.5})
	require.NoError(t, err)
	b, err := json.Marshal(r)
	require.NoError(t, err)
	s := string(b)
	// The head keys, then those of ValidityRanges, in this order.
	keys := []string{`"model"`, `"params"`, `"equilibrium_r_angstrom"`, `"well_depth_ev":"Infinity"`, `"pair"`, `"reduced_mass_u"`,
		`"truncation_order"`, `"tolerance"`, `"potential"`, `"period"`}
	last := -1
	for _, k := range keys {
		i := strings.Index(s, k)
		require.GreaterOrEqual(t, i, 0, "%s in %s", k, s)
		assert.Greater(t, i, last, "%s in order", k)
		last = i
	}
	// The harmonic form is its own expansion: every range is unbounded
	// ("Infinity"), and E/depth does not apply to an unbounded well (null).
	assert.Contains(t, s, `"potential":{"compression_angstrom":"Infinity","stretch_angstrom":"Infinity"}`)
	assert.Contains(t, s, `"period":{"energy_ev":"Infinity","depth_fraction":null,"temperature_k":"Infinity",`+
		`"compression_angstrom":"Infinity","stretch_angstrom":"Infinity"}`)
	r, err = NewValidity(build(t, morseSpec), 2, 0.01, Mass{})
	require.NoError(t, err)
	b, err = json.Marshal(r)
	require.NoError(t, err)
	assert.Contains(t, string(b), `"pair":null`, "no mass: the keys are there, null")
	assert.Contains(t, string(b), `"reduced_mass_u":null`)
}

// TestNumberJSON: an unbounded value and one that does not apply encode
// apart (the output contract of README "Output contract").
func TestNumberJSON(t *testing.T) {
	for _, tt := range []struct {
		v    float64
		want string
	}{
		{math.Inf(1), `"Infinity"`}, {math.Inf(-1), `"-Infinity"`}, {math.NaN(), "null"}, {1.5, "1.5"}, {0, "0"},
	} {
		b, err := json.Marshal(Number(tt.v))
		require.NoError(t, err)
		assert.Equal(t, tt.want, string(b))
	}
	b, err := json.Marshal(struct {
		A Text `json:"a"`
		B Text `json:"b"`
	}{"", "x"})
	require.NoError(t, err)
	assert.Equal(t, `{"a":null,"b":"x"}`, string(b))
}

func TestValidityErrors(t *testing.T) {
	for _, n := range []int{1, 5} {
		_, err := NewValidity(build(t, morseSpec), n, 0.01, Mass{})
		require.Error(t, err, "order %d", n)
		assert.True(t, strings.HasPrefix(err.Error(), "morse: "), "%v", err)
	}
	_, err := NewValidity(build(t, morseSpec), 2, 1.5, Mass{})
	assert.True(t, errors.Is(err, core.ErrParam), "%v", err)
}
