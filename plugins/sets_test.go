package plugins_test

import (
	"context"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/models"
	"github.com/pairwell/pairwell/plugins"
	"github.com/pairwell/pairwell/plugins/testdata/morse"
)

// TestEvaluateSets evaluates three parameter sets of the test plugin's
// Morse in one call — over the direct channel, over gRPC, and through a
// plugin answering as one built before EvaluateSets (the host then opens
// each set) — and compares them bit for bit with the same code in
// process; an invalid set is its own error (core.ErrParam), a separation
// outside the domain a *core.PointError at its index, and lengths that do
// not fit an error of the call.
func TestEvaluateSets(t *testing.T) {
	paths := append(transports(), struct{ name, path string }{"nosets", bin.nosets})
	r := []float64{0.9, 1.1, 1.27, 1.6, 2.5, 4}
	params := []float64{4.6, 1.87, 1.27, 4.4, 1.9, 1.25, -1, 1.87, 1.27}
	for _, tr := range paths {
		t.Run(tr.name, func(t *testing.T) {
			p, err := plugins.Load(context.Background(), tr.path, plugins.Options{})
			require.NoError(t, err)
			defer p.Close()
			var m core.Model
			for _, x := range p.Models() {
				if x.Info().Key == "plugin-morse" {
					m = x
				}
			}
			require.NotNil(t, m)
			_, ok := m.(core.SetEvaluator)
			require.True(t, ok)
			const n = 2
			dst := make([]float64, 3*len(r)*(n+1))
			errs := make([]error, 3)
			require.NoError(t, core.EvaluateSets(m, n, params, r, dst, errs))
			block := len(r) * (n + 1)
			for s := 0; s < 2; s++ {
				require.NoError(t, errs[s])
				pot, err := morse.Model{Key: "plugin-morse"}.New(params[3*s : 3*s+3])
				require.NoError(t, err)
				want := make([]float64, block)
				require.NoError(t, pot.Taylor(n, r, want))
				assert.Equal(t, want, dst[s*block:(s+1)*block], "set %d", s)
			}
			assert.ErrorIs(t, errs[2], core.ErrParam)

			bad := []float64{1.2, -1}
			errs = make([]error, 1)
			require.NoError(t, core.EvaluateSets(m, 0, params[:3], bad, make([]float64, 2), errs))
			var pe *core.PointError
			require.ErrorAs(t, errs[0], &pe)
			assert.Equal(t, 1, pe.Index)
			assert.ErrorIs(t, errs[0], core.ErrDomain)

			assert.ErrorIs(t, core.EvaluateSets(m, 0, params[:3], r, make([]float64, 1), errs), core.ErrLength)
		})
	}
}

// TestPluginParamGradient checks that the host's plugin potential forwards
// core.ParamGradient: the test plugin's plugin-buckingham (the built-in
// Buckingham served by the plugin) gives the built-in's analytic
// derivatives bit for bit on both transports, and its plugin-morse (no
// analytic derivatives) and a plugin built before EvaluateSets report
// core.ErrUnsupported.
func TestPluginParamGradient(t *testing.T) {
	params := []float64{1000, 0.3, 20}
	r := []float64{2.2, 2.5, 3, 3.5, 5, 8}
	want := make([]float64, 3*len(r))
	bp, err := models.Buckingham{}.New(params)
	require.NoError(t, err)
	require.NoError(t, core.ParamDerivatives(bp, r, want))
	paths := append(transports(), struct{ name, path string }{"nosets", bin.nosets})
	for _, tr := range paths {
		t.Run(tr.name, func(t *testing.T) {
			p, err := plugins.Load(context.Background(), tr.path, plugins.Options{})
			require.NoError(t, err)
			defer p.Close()
			byKey := map[string]core.Model{}
			for _, m := range p.Models() {
				byKey[m.Info().Key] = m
			}
			pot, err := byKey["plugin-buckingham"].New(params)
			require.NoError(t, err)
			got := make([]float64, len(want))
			err = core.ParamDerivatives(pot, r, got)
			if tr.name == "nosets" {
				assert.ErrorIs(t, err, core.ErrUnsupported)
				return
			}
			require.NoError(t, err)
			assert.Equal(t, want, got)
			assert.ErrorIs(t, core.ParamDerivatives(pot, r, got[:1]), core.ErrLength)
			var pe *core.PointError
			require.ErrorAs(t, core.ParamDerivatives(pot, []float64{3, 0.01}, make([]float64, 6)), &pe)
			assert.Equal(t, 1, pe.Index)
			assert.ErrorIs(t, pe, core.ErrDomain)
			mp, err := byKey["plugin-morse"].New([]float64{4.6, 1.87, 1.27})
			require.NoError(t, err)
			assert.ErrorIs(t, core.ParamDerivatives(mp, r, got), core.ErrUnsupported)
		})
	}
}
