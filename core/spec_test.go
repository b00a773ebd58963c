package core_test

import (
	"math"
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/units"
	"github.com/pairwell/pairwell/models"
)

func TestBuildUnits(t *testing.T) {
	reg := models.NewRegistry()
	tests := []struct {
		spec string
		want []float64
	}{
		{"morse:De=4.4,a=1.9,re=1.27", []float64{4.4, 1.9, 1.27}},
		{" MORSE : re = 1.27 , De = 4.4 eV , a = 1.9 ", []float64{4.4, 1.9, 1.27}},
		// 1 hartree = 27.211386245988 eV, 1 bohr = 0.529177210903 Å (CODATA 2018).
		{"morse:De=0.1hartree,a=1/bohr,re=2bohr", []float64{2.7211386245988, 1 / 0.529177210903, 2 * 0.529177210903}},
		// k_B = 8.617333262e-5 eV/K (CODATA 2018); 0.34 nm = 3.4 Å.
		{"lj:epsilon=120K,sigma=0.34nm", []float64{120 * 8.617333262e-5, 3.4}},
		{"lennard-jones:EPSILON=0.0104,Sigma=340pm", []float64{0.0104, 3.4}},
	}
	for _, tt := range tests {
		inst, err := reg.Build(tt.spec)
		require.NoError(t, err, tt.spec)
		require.Len(t, inst.Params, len(tt.want))
		for i := range tt.want {
			assert.InEpsilon(t, tt.want[i], inst.Params[i], 1e-9, "%s param %d", tt.spec, i)
		}
	}
}

func TestBuildErrors(t *testing.T) {
	reg := models.NewRegistry()
	tests := []struct {
		spec    string
		is      error
		mention string
	}{
		{"", core.ErrSpec, "KEY:NAME=VALUE"},
		{"quartic:k=1", core.ErrSpec, "unknown model"},
		{"morse:De=4.4,a=1.9", core.ErrSpec, "missing re"},
		{"morse", core.ErrSpec, "missing De, a, re"},
		{"morse:De=4.4,a=1.9,re=1.27,x=1", core.ErrSpec, `no parameter "x"`},
		{"morse:De=4.4,De=4,a=1.9,re=1.27", core.ErrSpec, "twice"},
		{"morse:De=4.4,a=1.9,re", core.ErrSpec, "NAME=VALUE"},
		{"morse:De=4..4,a=1.9,re=1.27", core.ErrSpec, "De"},
		{"morse:De=NaN,a=1.9,re=1.27", core.ErrSpec, "De"},
		{"morse:De=Inf,a=1.9,re=1.27", core.ErrSpec, "De"},
		{"morse:De=4.4furlong,a=1.9,re=1.27", core.ErrSpec, "De"},
		{"morse:De=4.4A,a=1.9,re=1.27", core.ErrSpec, "De"},
		{"morse:De=-4.4,a=1.9,re=1.27", core.ErrParam, "> 0"},
		{"buckingham:A=1000,rho=0.3,C=-1", core.ErrParam, "≥ 0"},
		{"buckingham:A=1000,rho=0.3,C=0", core.ErrNoMinimum, "buckingham"},
	}
	for _, tt := range tests {
		_, err := reg.Build(tt.spec)
		require.Error(t, err, tt.spec)
		assert.ErrorIs(t, err, tt.is, tt.spec)
		assert.Contains(t, err.Error(), tt.mention, tt.spec)
		assert.NotContains(t, err.Error(), "\n", tt.spec)
	}
}

func FuzzParseSpec(f *testing.F) {
	for _, s := range []string{"morse:De=4.4,a=1.9,re=1.27", "lj:epsilon=120K,sigma=3.4", "x", ":", "a:b=", "a:=1,,", "lj:epsilon=120K,sigma=3.4@cut=force-shift,rc=8", "a@b=1"} {
		f.Add(s)
	}
	reg := models.NewRegistry()
	f.Fuzz(func(t *testing.T, s string) {
		spec, err := core.ParseSpec(s)
		if err != nil {
			return
		}
		again, err := core.ParseSpec(spec.String())
		if err != nil || again.Model != spec.Model || len(again.Params) != len(spec.Params) || len(again.Cutoff) != len(spec.Cutoff) {
			t.Fatalf("round trip of %q via %q: %v %+v", s, spec.String(), err, again)
		}
		inst, err := reg.Build(s)
		if err != nil {
			if strings.Contains(err.Error(), "\n") {
				t.Fatalf("multi-line error %q", err)
			}
			return
		}
		for _, v := range inst.Params {
			if math.IsNaN(v) || math.IsInf(v, 0) {
				t.Fatalf("%q built with non-finite parameter %v", s, inst.Params)
			}
		}
	})
}

// TestParamSpecUnit: a bare number is read in Unit, or in the dimension's
// default unit when Unit is empty (the eV of core/units for an energy).
func TestParamSpecUnit(t *testing.T) {
	for _, tt := range []struct {
		p    core.Param
		want string
	}{
		{core.Param{Name: "De", Dimension: units.Energy}, "eV"},
		{core.Param{Name: "eps", Dimension: units.Energy, Unit: "kcal/mol"}, "kcal/mol"},
		{core.Param{Name: "re", Dimension: units.Length}, "Å"},
	} {
		assert.Equal(t, tt.want, tt.p.SpecUnit(), tt.p.Name)
	}
}
