package main

import (
	"context"
	"strings"
	"testing"

	"github.com/stretchr/testify/require"

	"github.com/pairwell/pairwell/core/coretest"
	"github.com/pairwell/pairwell/core/report"
	"github.com/pairwell/pairwell/models"
	"github.com/pairwell/pairwell/plugins"
)

// pluginFourSpecs are fourSpecs with the Morse form served by the test
// plugin.
var pluginFourSpecs = append([]string{"plugin-morse:De=4.6,a=1.87,re=1.27"}, fourSpecs[1:]...)

// pluginCompareInputs loads the test plugin and returns the compare inputs
// of pluginFourSpecs, the plugin form wrapped in a counter.
func pluginCompareInputs(tb testing.TB) ([]report.CompareInput, *coretest.Counting) {
	tb.Helper()
	if pluginBin.buildErr != nil {
		tb.Fatal(pluginBin.buildErr)
	}
	pl, err := plugins.Load(context.Background(), pluginBin.test, plugins.Options{})
	require.NoError(tb, err)
	tb.Cleanup(func() { pl.Close() })
	reg := models.NewRegistry()
	for _, m := range pl.Models() {
		require.NoError(tb, reg.Add(m))
	}
	var inputs []report.CompareInput
	var cnt *coretest.Counting
	for _, s := range pluginFourSpecs {
		inst, err := reg.Build(s)
		require.NoError(tb, err)
		if strings.HasPrefix(s, "plugin-") {
			inst.Potential, cnt = coretest.Count(inst.Potential)
		}
		inputs = append(inputs, report.CompareInput{Name: inst.Model.Info().Key, Instance: inst, Mass: report.Mass{Mu: 0.9797}})
	}
	return inputs, cnt
}

// TestComparePluginCalls: the analysis of a plugin form, which costs a
// round trip per call, makes about a hundred calls, not thousands.
func TestComparePluginCalls(t *testing.T) {
	inputs, cnt := pluginCompareInputs(t)
	rows, err := report.Compare(inputs, report.CompareSettings{Validity: true})
	require.NoError(t, err)
	for _, r := range rows {
		require.NoError(t, r.Err, r.Name)
	}
	calls := cnt.Calls()
	t.Logf("plugin form: %d single-point and %d batched Taylor calls", cnt.Singles.Load(), cnt.Batches.Load())
	require.Less(t, calls, int64(250), "calls to the plugin for one compare row (over 6000 when the solves went point by point)")
}

// BenchmarkComparePlugin compares "pairwell compare" of four forms all
// built in with the same four where Morse is served by the test plugin
// (target: at most twice the time), and reports the calls made to the
// plugin form. cli runs the command in process, plugin start included;
// loaded analyses the rows with the plugin already running.
func BenchmarkComparePlugin(b *testing.B) {
	run1 := func(b *testing.B, args []string) {
		var out, errOut strings.Builder
		for b.Loop() {
			out.Reset()
			if code := run(args, strings.NewReader(""), &out, &errOut); code != 0 {
				b.Fatal(errOut.String())
			}
		}
	}
	b.Run("cli/builtin", func(b *testing.B) {
		run1(b, append([]string{"compare", "--pair", "H-Cl", "--format", "json"}, fourSpecs...))
	})
	b.Run("cli/plugin", func(b *testing.B) {
		if pluginBin.buildErr != nil {
			b.Fatal(pluginBin.buildErr)
		}
		run1(b, append([]string{"--plugin", pluginBin.test, "compare", "--pair", "H-Cl", "--format", "json"}, pluginFourSpecs...))
	})
	b.Run("loaded/plugin", func(b *testing.B) {
		inputs, cnt := pluginCompareInputs(b)
		for b.Loop() {
			if _, err := report.Compare(inputs, report.CompareSettings{Validity: true}); err != nil {
				b.Fatal(err)
			}
		}
		b.ReportMetric(float64(cnt.Calls())/float64(b.N), "calls/op")
	})
}
