package main

import (
	"math"
	"strings"
	"testing"
)

// FuzzParseTarget: --match never panics, and a parsed target holds only
// finite values with at least one quantity given.
func FuzzParseTarget(f *testing.F) {
	for _, s := range []string{"re=1.27,De=4.6eV,k=500N/m", "re=127pm", "depth=1,K=2", "re=", "x=1", "re=1,re=2"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		tg, err := parseTarget(s)
		if err != nil {
			if strings.Contains(err.Error(), "\n") {
				t.Fatalf("multi-line error %q", err)
			}
			return
		}
		for _, v := range []float64{tg.Re, tg.Depth, tg.K} {
			if math.IsNaN(v) || math.IsInf(v, 0) {
				t.Fatalf("%q parsed to non-finite %+v", s, tg)
			}
		}
		if tg.Re == 0 && tg.Depth == 0 && tg.K == 0 {
			t.Fatalf("%q parsed to an empty target", s)
		}
	})
}

// FuzzParsePlotRange: --range never panics, and a parsed range is a
// non-empty interval of positive, finite lengths.
func FuzzParsePlotRange(f *testing.F) {
	for _, s := range []string{"0.8:3.5", "80pm:350pm", "3:1", ":", "1:2:3", "0:1"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		lo, hi, err := parsePlotRange(s)
		if err != nil {
			return
		}
		if !(lo > 0 && lo < hi) || math.IsInf(hi, 0) {
			t.Fatalf("%q parsed to [%g, %g]", s, lo, hi)
		}
	})
}

// FuzzTableTolerance: --accuracy and --force-accuracy never panic, and an
// accepted pair is positive and finite (a force in eV/Å).
func FuzzTableTolerance(f *testing.F) {
	for _, s := range [][2]string{{"1e-6", ""}, {"1e-3meV", "1e-4kcal/mol/A"}, {"0.01K", "1e-6eV/bohr"}, {"-1", ""}, {"1e-6", "1eV"}, {"", ""}} {
		f.Add(s[0], s[1])
	}
	f.Fuzz(func(t *testing.T, e, fa string) {
		tol, err := tolerance(e, fa)
		if err != nil {
			if strings.Contains(err.Error(), "\n") {
				t.Fatalf("multi-line error %q", err)
			}
			return
		}
		for _, v := range []float64{tol.Energy, tol.Force} {
			if !(v > 0) || math.IsInf(v, 0) {
				t.Fatalf("%q, %q accepted as %+v", e, fa, tol)
			}
		}
	})
}
