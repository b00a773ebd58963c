package main

import (
	"bytes"
	"encoding/json"
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"github.com/pairwell/pairwell/core/units"
)

func validityJSON(t *testing.T, args ...string) map[string]any {
	t.Helper()
	var stdout, stderr bytes.Buffer
	code := run(append([]string{"validity", "--format", "json"}, args...), strings.NewReader(""), &stdout, &stderr)
	require.Equal(t, 0, code, stderr.String())
	var obj map[string]any
	require.NoError(t, json.Unmarshal(stdout.Bytes(), &obj), stdout.String())
	return obj
}

func TestValidityJSONContract(t *testing.T) {
	for _, spec := range []string{"morse:De=4.6,a=1.87,re=1.27", "lj:epsilon=120K,sigma=3.4", "buckingham:A=1500,rho=0.3,C=25", "harmonic:k=30,r0=1.2"} {
		for _, order := range []string{"2", "3", "4"} {
			obj := validityJSON(t, spec, "--truncation", order)
			for _, k := range []string{"truncation_order", "tolerance", "potential", "period"} {
				require.Contains(t, obj, k, "%s: key %s", spec, k)
			}
			assert.EqualValues(t, order[0]-'0', obj["truncation_order"])
			assert.Equal(t, 0.01, obj["tolerance"])
			pot := obj["potential"].(map[string]any)
			per := obj["period"].(map[string]any)
			for _, k := range []string{"compression_angstrom", "stretch_angstrom"} {
				assert.Contains(t, pot, k, spec)
			}
			for _, k := range []string{"energy_ev", "depth_fraction", "temperature_k", "compression_angstrom", "stretch_angstrom"} {
				assert.Contains(t, per, k, spec)
			}
			if strings.HasPrefix(spec, "harmonic") {
				assert.Equal(t, "Infinity", pot["stretch_angstrom"], "exact truncation: unbounded")
				assert.Equal(t, "Infinity", per["energy_ev"], "exact truncation: unbounded")
				assert.Nil(t, per["depth_fraction"], "no depth: does not apply")
			} else {
				assert.Greater(t, per["energy_ev"], 0.0, spec)
				assert.Less(t, per["depth_fraction"], 1.0, spec)
			}
		}
	}
}

// TestValidityMorse: for Morse at order 2 the period limit is
// E/De = 1 − (1 − τ)² (from T = T₀/√(1 − E/De), the classical Morse
// oscillator, standard result, from memory); the mass does not matter.
func TestValidityMorse(t *testing.T) {
	for _, tt := range []struct {
		tol  string
		frac float64
	}{{"1%", 1 - 0.99*0.99}, {"0.05", 1 - 0.95*0.95}, {"0.1 %", 1 - 0.999*0.999}} {
		obj := validityJSON(t, "morse:De=4.6,a=1.87,re=1.27", "--tolerance", tt.tol)
		per := obj["period"].(map[string]any)
		assert.InEpsilon(t, tt.frac, per["depth_fraction"], 1e-8, tt.tol)
		assert.InEpsilon(t, tt.frac*4.6/units.BoltzmannEV, per["temperature_k"], 1e-8, tt.tol)
	}
	a := validityJSON(t, "morse:De=4.6,a=1.87,re=1.27", "--pair", "H-Cl")
	b := validityJSON(t, "morse:De=4.6,a=1.87,re=1.27", "--mu", "100")
	assert.Equal(t, a["period"], b["period"], "mass independent")
	assert.Equal(t, "H-Cl", a["pair"])
}

func TestValidityTable(t *testing.T) {
	var stdout, stderr bytes.Buffer
	code := run([]string{"validity", "harmonic:k=30,r0=1.2"}, strings.NewReader(""), &stdout, &stderr)
	require.Equal(t, 0, code, stderr.String())
	out := stdout.String()
	for _, s := range []string{"harmonic truncation (order 2)", "Å", "eV", "K", "∞", "exact", "safety"} {
		assert.Contains(t, out, s)
	}
	stdout.Reset()
	code = run([]string{"validity", "morse:De=4.6,a=1.87,re=1.27", "--format", "csv", "--truncation", "4"}, strings.NewReader(""), &stdout, &stderr)
	require.Equal(t, 0, code, stderr.String())
	lines := strings.Split(strings.TrimSpace(stdout.String()), "\n")
	assert.Equal(t, "model,params,equilibrium_r_angstrom,well_depth_ev,pair,reduced_mass_u,truncation_order,tolerance,"+
		"potential.compression_angstrom,potential.stretch_angstrom,period.energy_ev,period.depth_fraction,period.temperature_k,"+
		"period.compression_angstrom,period.stretch_angstrom", lines[0])
	assert.Len(t, lines, 2, "one record")
}

func TestValidityBadInput(t *testing.T) {
	tests := []struct {
		name string
		args []string
		text string
	}{
		{"order 5", []string{"morse:De=4.6,a=1.87,re=1.27", "--truncation", "5"}, "--truncation"},
		{"order 1", []string{"morse:De=4.6,a=1.87,re=1.27", "--truncation", "1"}, "--truncation"},
		{"tolerance 0", []string{"morse:De=4.6,a=1.87,re=1.27", "--tolerance", "0"}, "--tolerance"},
		{"tolerance 150%", []string{"morse:De=4.6,a=1.87,re=1.27", "--tolerance", "150%"}, "--tolerance"},
		{"tolerance text", []string{"morse:De=4.6,a=1.87,re=1.27", "--tolerance", "tight"}, "--tolerance"},
		{"bad mass", []string{"morse:De=4.6,a=1.87,re=1.27", "--mu", "-1"}, "--mu"},
		{"bad spec", []string{"nosuch:x=1"}, "nosuch"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			var stdout, stderr bytes.Buffer
			code := run(append([]string{"validity"}, tt.args...), strings.NewReader(""), &stdout, &stderr)
			assert.Equal(t, exitUsage, code)
			assert.Empty(t, stdout.String())
			assert.Contains(t, stderr.String(), tt.text)
		})
	}
}

// TestValiditySmallTolerance: a tolerance far below the rounding of
// V − V(re) is resolved from the Taylor series at re. For Morse at N = 2
// the potential limit is x ≈ τ·c₂/|c₃| = τ/a to leading order
// (c₂ = De·a², c₃ = −De·a³, Morse 1929), with corrections of order a·x.
func TestValiditySmallTolerance(t *testing.T) {
	var stdout, stderr bytes.Buffer
	code := run([]string{"validity", "morse:De=4.6,a=1.87,re=1.27", "--tolerance", "1e-9", "--format", "json"}, strings.NewReader(""), &stdout, &stderr)
	require.Equal(t, 0, code, stderr.String())
	var out struct {
		Potential struct {
			Compression float64 `json:"compression_angstrom"`
			Stretch     float64 `json:"stretch_angstrom"`
		} `json:"potential"`
	}
	require.NoError(t, json.Unmarshal(stdout.Bytes(), &out))
	assert.InEpsilon(t, 1e-9/1.87, out.Potential.Compression, 1e-6)
	assert.InEpsilon(t, 1e-9/1.87, out.Potential.Stretch, 1e-6)
}
