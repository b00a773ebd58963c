package main

import (
	"context"
	"fmt"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"

	"github.com/stretchr/testify/require"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/fit"
	"github.com/pairwell/pairwell/core/refdata"
	"github.com/pairwell/pairwell/models"
	"github.com/pairwell/pairwell/plugins"
)

// writeInventedScan200 writes 200 points of the demo's INVENTED
// extended-Rydberg curve (re = 1.20 Å, De = 4.00 eV, k = 30 eV/Å²,
// a₃ = 0.40 Å⁻³) from 0.85 to 8 Å on the scale −12539 eV.
func writeInventedScan200(tb testing.TB) string {
	tb.Helper()
	var b strings.Builder
	b.WriteString("# INVENTED scan for the benchmarks\nr_angstrom,energy_ev\n")
	for i := 0; i < 200; i++ {
		r := 0.85 + (8-0.85)*math.Pow(float64(i)/199, 2)
		p := r - 1.2
		fmt.Fprintf(&b, "%.17g,%.17g\n", r, -12539.0-4*(1+3*p+0.75*p*p+0.4*p*p*p)*math.Exp(-3*p))
	}
	path := filepath.Join(tb.TempDir(), "scan200.csv")
	require.NoError(tb, os.WriteFile(path, []byte(b.String()), 0o644))
	return path
}

// BenchmarkFitProcess runs "pairwell fit" on 200 points with the four
// built-in forms as a separate process, start-up included (issue target:
// ≤ 150 ms for the whole process), and Morse alone, built in and served by
// the test plugin (plugin start included).
func BenchmarkFitProcess(b *testing.B) {
	if pluginBin.buildErr != nil {
		b.Fatal(pluginBin.buildErr)
	}
	path := writeInventedScan200(b)
	for _, c := range []struct {
		name string
		args []string
	}{
		{"four built-in", []string{"fit", path, "--mu", "7", "--format", "json"}},
		{"morse", []string{"fit", path, "--form", "morse", "--format", "json"}},
		{"plugin-morse", []string{"--plugin", pluginBin.test, "fit", path, "--form", "plugin-morse", "--format", "json"}},
	} {
		b.Run(c.name, func(b *testing.B) {
			for b.Loop() {
				out, err := exec.Command(pluginBin.pairwell, c.args...).CombinedOutput()
				require.NoError(b, err, string(out))
			}
		})
	}
}

// BenchmarkFitPluginTwin fits Morse to the 200 points as the test plugin's
// plugin-morse (running already; central differences, a trial point and a
// Jacobian one EvaluateSets round trip each), as the same plugin answering
// as one built before EvaluateSets (an Open per parameter set), and as the
// built-in twin, analytic and with central differences (issue target:
// plugin ≤ 5× its built-in twin).
func BenchmarkFitPluginTwin(b *testing.B) {
	if pluginBin.buildErr != nil {
		b.Fatal(pluginBin.buildErr)
	}
	data, err := refdata.Load(writeInventedScan200(b))
	require.NoError(b, err)
	load := func(path string) core.Model {
		pl, err := plugins.Load(context.Background(), path, plugins.Options{})
		require.NoError(b, err)
		b.Cleanup(func() { pl.Close() })
		for _, m := range pl.Models() {
			if m.Info().Key == "plugin-morse" {
				return m
			}
		}
		b.Fatal("no plugin-morse")
		return nil
	}
	plugin, old := load(pluginBin.test), load(pluginBin.nosets)
	for _, c := range []struct {
		name    string
		m       core.Model
		central bool
	}{{"plugin", plugin, false}, {"plugin-without-sets", old, false}, {"builtin-analytic", models.Morse{}, false}, {"builtin-central", models.Morse{}, true}} {
		b.Run(c.name, func(b *testing.B) {
			for b.Loop() {
				r, err := fit.FitForm(c.m, data, fit.Settings{Central: c.central})
				require.NoError(b, err)
				b.ReportMetric(float64(r.Evaluations), "evaluations")
			}
		})
	}
}
