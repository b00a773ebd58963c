package units

import (
	"errors"
	"math"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

func TestParseTemperature(t *testing.T) {
	for _, c := range []struct {
		in   string
		want float64
	}{
		{"300", 300},
		{"300K", 300},
		{"300 K", 300},
		{"25degC", 298.15},        // 0 °C = 273.15 K (definition of the Celsius scale)
		{"-273.15°C", 0},          // absolute zero
		{"100 ℃", 373.15},         // boiling point of water at 1 atm, near enough (ITS-90: 373.124 K)
		{"1eV", 11604.51812},      // 1 eV / k_B (CODATA 2018: 1.160451812e4 K)
		{"1000cm-1", 1438.776877}, // hc·1000 cm⁻¹/k_B, second radiation constant c₂ = 1.438776877e-2 m·K (CODATA 2018)
		{"25meV", 290.1129530},
	} {
		got, err := ParseTemperature(c.in)
		require.NoError(t, err, c.in)
		assert.InDelta(t, c.want, got, 1e-9*math.Max(1, c.want), c.in)
	}
	for _, in := range []string{"", "K", "3 Å", "5 parsec", "1e999", "1e999degC", "NaN", "1e308eV", "3 degF"} {
		_, err := ParseTemperature(in)
		require.Error(t, err, in)
		var pe *ParseError
		require.True(t, errors.As(err, &pe), in)
		assert.Equal(t, Temperature, pe.Dim, in)
	}
}

func FuzzParseTemperature(f *testing.F) {
	for _, s := range []string{"300", "25degC", "1eV", "-5 °C", "1000cm-1", "1e999K", "x"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		v, err := ParseTemperature(s)
		if err != nil {
			var pe *ParseError
			if !errors.As(err, &pe) {
				t.Fatalf("%q: error %v is not a *ParseError", s, err)
			}
			return
		}
		if math.IsNaN(v) || math.IsInf(v, 0) {
			t.Fatalf("%q: non-finite %g without an error", s, v)
		}
	})
}
