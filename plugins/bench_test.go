package plugins_test

import (
	"context"
	"fmt"
	"testing"

	"github.com/stretchr/testify/require"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/models"
	"github.com/pairwell/pairwell/plugins"
	"github.com/pairwell/pairwell/plugins/testdata/morse"
)

// benchPotentials returns Morse potentials of the same parameters: through
// the test plugin on both transports, and in process, both the built-in and
// the test plugin's own implementation.
func benchPotentials(b *testing.B) []struct {
	name string
	pot  core.Potential
} {
	params := []float64{4.6, 1.87, 1.27}
	var out []struct {
		name string
		pot  core.Potential
	}
	for _, tp := range transports() {
		pot, err := model(b, load(b, tp.path, plugins.Options{}), "plugin-morse").New(params)
		require.NoError(b, err)
		out = append(out, struct {
			name string
			pot  core.Potential
		}{"plugin-" + tp.name, pot})
	}
	builtin, err := models.Morse{}.New(params)
	require.NoError(b, err)
	same, err := morse.Model{Key: "plugin-morse"}.New(params)
	require.NoError(b, err)
	return append(out, struct {
		name string
		pot  core.Potential
	}{"inprocess-builtin", builtin}, struct {
		name string
		pot  core.Potential
	}{"inprocess-same", same})
}

// BenchmarkBatch compares batched evaluation of the same form, Morse,
// through a plugin (direct channel and gRPC) and in process: orders 0–2
// (V, V′, V″ as c₀, c₁, c₂) at 4096 and 65536 points in one Taylor call.
func BenchmarkBatch(b *testing.B) {
	pots := benchPotentials(b)
	for _, n := range []int{4096, 65536} {
		r := make([]float64, n)
		for i := range r {
			r[i] = 0.8 + 4*float64(i)/float64(n)
		}
		dst := make([]float64, 3*n)
		for _, c := range pots {
			b.Run(fmt.Sprintf("%s/%d", c.name, n), func(b *testing.B) {
				for b.Loop() {
					if err := c.pot.Taylor(2, r, dst); err != nil {
						b.Fatal(err)
					}
				}
				b.ReportMetric(float64(b.N)*float64(n)/b.Elapsed().Seconds(), "points/s")
			})
		}
	}
}

// BenchmarkRoundTrip measures one call: c₀, c₁, c₂ at one point.
func BenchmarkRoundTrip(b *testing.B) {
	for _, c := range benchPotentials(b) {
		b.Run(c.name, func(b *testing.B) {
			dst := make([]float64, 3)
			r := []float64{1.3}
			for b.Loop() {
				if err := c.pot.Taylor(2, r, dst); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

// BenchmarkStart measures starting a plugin, describing its models and
// stopping it.
func BenchmarkStart(b *testing.B) {
	for b.Loop() {
		p, err := plugins.Load(context.Background(), bin.rydberg, plugins.Options{})
		if err != nil {
			b.Fatal(err)
		}
		p.Close()
	}
}
