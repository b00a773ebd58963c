package cutoff_test

import (
	"math"
	"testing"
	"time"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/cutoff"
	"github.com/pairwell/pairwell/models"
)

// BenchmarkTaylor compares a cut form with its bare form per point: one
// batched Taylor call of order 4 at 4096 points from 0.8·re to r_c (issue
// 16's target: at most 1.2× the bare form). Lennard-Jones (argon-like,
// re = 3.82 Å) cut at 8.5 Å, the switches from 7.65 Å; Morse (HCl-like,
// re = 1.27 Å) cut at 6 Å, the switches from 5.4 Å.
func BenchmarkTaylor(b *testing.B) {
	const n, points = 4, 4096
	forms := []struct {
		name   string
		m      core.Model
		params []float64
		rc     float64
	}{
		{"lj", models.LennardJones{}, ljParams, 8.5},
		{"morse", models.Morse{}, morseParams, 6},
	}
	for _, f := range forms {
		bare, err := f.m.New(f.params)
		if err != nil {
			b.Fatal(err)
		}
		re, err := core.Equilibrium(bare)
		if err != nil {
			b.Fatal(err)
		}
		rs := make([]float64, points)
		for i := range rs {
			rs[i] = 0.8*re + (f.rc-0.8*re)*float64(i)/points
		}
		dst := make([]float64, (n+1)*points)
		run := func(name string, p core.Potential) {
			b.Run(f.name+"/"+name, func(b *testing.B) {
				for b.Loop() {
					if err := p.Taylor(n, rs, dst); err != nil {
						b.Fatal(err)
					}
				}
				b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/points, "ns/point")
			})
		}
		run("bare", bare)
		for _, sc := range cutoff.Schemes() {
			c, err := cutoff.New(bare, cutoff.Settings{Scheme: sc, Cutoff: f.rc})
			if err != nil {
				b.Fatal(err)
			}
			run(sc.String(), c)
			// The ratio to the bare form, measured call by call in
			// alternation, and of the fastest call of each: on a machine
			// shared with other work the fastest call is the one least
			// disturbed by it.
			b.Run(f.name+"/"+sc.String()+"/ratio", func(b *testing.B) {
				tb, tc := time.Duration(math.MaxInt64), time.Duration(math.MaxInt64)
				for b.Loop() {
					t0 := time.Now()
					if err := bare.Taylor(n, rs, dst); err != nil {
						b.Fatal(err)
					}
					t1 := time.Now()
					if err := c.Taylor(n, rs, dst); err != nil {
						b.Fatal(err)
					}
					tb, tc = min(tb, t1.Sub(t0)), min(tc, time.Since(t1))
				}
				b.ReportMetric(float64(tc)/float64(tb), "cut/bare")
				b.ReportMetric(float64(tb.Nanoseconds())/points, "bare-ns/point")
				b.ReportMetric(float64(tc.Nanoseconds())/points, "cut-ns/point")
			})
		}
	}
}
