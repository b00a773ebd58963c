package cutoff_test

import (
	"errors"
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/cutoff"
	"github.com/pairwell/pairwell/models"
)

// TestSpecs: SPEC@cut=… builds a cut form through the registry; lengths
// take unit suffixes (1 nm = 10 Å; 1 bohr = 0.529177210903 Å, CODATA 2018).
func TestSpecs(t *testing.T) {
	reg := models.NewRegistry()
	tests := []struct {
		spec string
		want cutoff.Settings
	}{
		{"lj:epsilon=120K,sigma=3.4@cut=force-shift,rc=8.5", cutoff.Settings{Scheme: cutoff.ForceShift, Cutoff: 8.5}},
		{"lj:epsilon=120K,sigma=3.4@cut=truncate,rc=0.85nm", cutoff.Settings{Scheme: cutoff.Truncate, Cutoff: 8.5}},
		{"lj:epsilon=120K,sigma=3.4 @ CUT=Switch-C2, on=7, rc=8.5", cutoff.Settings{Scheme: cutoff.Switch2, Cutoff: 8.5, SwitchOn: 7}},
		{"lj:epsilon=120K,sigma=3.4@rc=10,cut=switch-c1", cutoff.Settings{Scheme: cutoff.Switch1, Cutoff: 10, SwitchOn: 9}},
		{"morse:De=4.6,a=1.87,re=1.27@cut=shift,rc=16bohr", cutoff.Settings{Scheme: cutoff.Shift, Cutoff: 16 * 0.529177210903}},
	}
	for _, tt := range tests {
		inst, err := reg.Build(tt.spec)
		require.NoError(t, err, tt.spec)
		m, ok := inst.Model.(*cutoff.Model)
		require.True(t, ok, tt.spec)
		got := m.Settings()
		assert.Equal(t, tt.want.Scheme, got.Scheme, tt.spec)
		assert.InEpsilon(t, tt.want.Cutoff, got.Cutoff, 1e-14, tt.spec)
		if tt.want.SwitchOn != 0 {
			assert.InEpsilon(t, tt.want.SwitchOn, got.SwitchOn, 1e-14, tt.spec)
		}
		assert.Equal(t, inst.Model.Info().Key, m.Inner().Info().Key+"@"+got.Suffix())
	}
}

func TestSpecErrors(t *testing.T) {
	reg := models.NewRegistry()
	lj := "lj:epsilon=120K,sigma=3.4"
	tests := []struct {
		spec    string
		is      error
		mention string
	}{
		{lj + "@", core.ErrSpec, "nothing after '@'"},
		{lj + "@cut=shift,rc=8@cut=shift,rc=9", core.ErrSpec, "more than one '@'"},
		{lj + "@rc=8", core.ErrSpec, "needs cut=SCHEME"},
		{lj + "@cut=shift", core.ErrSpec, "needs rc=LENGTH"},
		{lj + "@cut=shfit,rc=8", core.ErrSpec, "did you mean shift?"},
		{lj + "@cut=shift,rc=8,rcut=9", core.ErrSpec, `unknown cutoff option "rcut" (did you mean cut or rc?)`},
		{lj + "@cut=shift,rc=8,rc=9", core.ErrSpec, "given twice"},
		{lj + "@cut=shift,rc=8eV", core.ErrSpec, "rc"},
		{lj + "@cut=shift,rc", core.ErrSpec, "NAME=VALUE"},
		{lj + "@cut=shift,rc=0", core.ErrParam, "must be a length > 0"},
		{lj + "@cut=shift,rc=-3", core.ErrParam, "r_c = -3"},
		{lj + "@cut=switch-c2,on=9,rc=8", core.ErrParam, "≥ r_c"},
		{lj + "@cut=force-shift,on=7,rc=8", core.ErrParam, "only the switches"},
		{lj + "@cut=force-shift,rc=3", core.ErrParam, "inside the repulsive wall"},
		{"mrose:De=1,a=1,re=1@cut=shift,rc=8", core.ErrSpec, "did you mean morse?"},
	}
	for _, tt := range tests {
		_, err := reg.Build(tt.spec)
		require.Error(t, err, tt.spec)
		assert.ErrorIs(t, err, tt.is, tt.spec)
		assert.Contains(t, err.Error(), tt.mention, tt.spec)
		assert.NotContains(t, err.Error(), "\n", tt.spec)
	}
	// A length of the wrong dimension names the option and the dimension
	// (the table's "rc" alone would also match other messages).
	_, err := reg.Build(lj + "@cut=shift,rc=8eV")
	assert.ErrorContains(t, err, "cutoff option rc")
	assert.ErrorContains(t, err, "want length")
	// Without a CutoffFunc the registry refuses a cutoff.
	bare, err := core.NewRegistry(models.Builtin()...)
	require.NoError(t, err)
	_, err = bare.Build(lj + "@cut=shift,rc=8")
	assert.ErrorIs(t, err, core.ErrSpec)
	// The parsed spec formats back with its cutoff.
	s, err := core.ParseSpec(lj + "@cut=shift,rc=8")
	require.NoError(t, err)
	assert.Equal(t, lj+"@cut=shift,rc=8", s.String())
}

// FuzzParseOptions fuzzes the cutoff part of a spec (after '@'): no
// panics, one-line errors wrapping core.ErrSpec or core.ErrParam, and an
// accepted cutoff formats (Settings.Suffix) to text that reads back to the
// same settings.
func FuzzParseOptions(f *testing.F) {
	for _, s := range []string{"cut=force-shift,rc=8", "cut=switch-c2,on=7,rc=8", "cut=truncate,rc=0.85nm", "rc=8", "cut=", "cut=shift,rc=1e400", "on=@"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		spec, err := core.ParseSpec("lj:epsilon=0.01,sigma=3.4@" + s)
		if err != nil {
			if !errors.Is(err, core.ErrSpec) {
				t.Fatalf("%q: error %v does not wrap ErrSpec", s, err)
			}
			return
		}
		set, err := cutoff.ParseOptions(spec.Cutoff)
		if err != nil {
			if !errors.Is(err, core.ErrSpec) && !errors.Is(err, core.ErrParam) {
				t.Fatalf("%q: error %v wraps neither ErrSpec nor ErrParam", s, err)
			}
			if strings.Contains(err.Error(), "\n") {
				t.Fatalf("%q: multi-line error %q", s, err)
			}
			return
		}
		back, err := core.ParseSpec("lj:epsilon=0.01,sigma=3.4@" + set.Suffix())
		if err != nil {
			t.Fatalf("%q: suffix %q does not parse: %v", s, set.Suffix(), err)
		}
		again, err := cutoff.ParseOptions(back.Cutoff)
		if err != nil || again != set {
			t.Fatalf("%q: suffix %q reads back as %+v, %v; want %+v", s, set.Suffix(), again, err, set)
		}
	})
}
