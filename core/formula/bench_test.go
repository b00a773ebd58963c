package formula_test

import (
	"fmt"
	"testing"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/coretest"
	"github.com/pairwell/pairwell/core/formula"
	"github.com/pairwell/pairwell/models"
)

// BenchmarkCompile compiles a 60-character formula (issue 10: ≤ 50 µs).
func BenchmarkCompile(b *testing.B) {
	const src = "De*(1 - (re/r)*exp(-beta*(r^2 - re^2)))^2 - De + C6/r^6*0.12"
	if len(src) != 60 {
		b.Fatalf("formula has %d characters", len(src))
	}
	params := []formula.Param{{"De", 1}, {"re", 64}, {"beta", -128}, {"C6", 1 + 6*64}}
	for b.Loop() {
		if _, err := formula.Compile(src, params); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkMorse compares a formula Morse with the built-in, orders 0–4 at
// 4096 points (one order at a time, and orders 0–4 in one Taylor call as
// the analysis makes them); ns/point.
func BenchmarkMorse(b *testing.B) {
	form, err := formula.NewForm(builtinCases[0].decl)
	if err != nil {
		b.Fatal(err)
	}
	fp, err := form.New(builtinCases[0].params)
	if err != nil {
		b.Fatal(err)
	}
	bp, err := models.Morse{}.New(builtinCases[0].params)
	if err != nil {
		b.Fatal(err)
	}
	const m = 4096
	rs := make([]float64, m)
	for i := range rs {
		rs[i] = 0.8 + 3*float64(i)/m
	}
	dst := make([]float64, m)
	for _, c := range []struct {
		name string
		p    core.Potential
	}{{"formula", fp}, {"builtin", bp}} {
		for _, n := range []int{0, 2, 4} {
			b.Run(fmt.Sprintf("%s/order%d", c.name, n), func(b *testing.B) {
				for b.Loop() {
					if err := coretest.Batch(c.p, n, rs, dst); err != nil {
						b.Fatal(err)
					}
				}
				b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N*m), "ns/point")
			})
		}
		all := make([]float64, 5*m)
		b.Run(c.name+"/orders0-4", func(b *testing.B) {
			for b.Loop() {
				if err := c.p.Taylor(4, rs, all); err != nil {
					b.Fatal(err)
				}
			}
			b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N*m), "ns/point")
		})
	}
}
