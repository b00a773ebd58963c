package conformance_test

import (
	"testing"

	"github.com/pairwell/pairwell/conformance"
	"github.com/pairwell/pairwell/models"
)

// BenchmarkBuiltins runs the full suite with default settings over the
// four built-in forms at their representative parameter sets (target:
// ≤ 1 s per run).
func BenchmarkBuiltins(b *testing.B) {
	for b.Loop() {
		for _, m := range models.Builtin() {
			ps, _ := conformance.Representative(m)
			rep, err := conformance.Run(m, [][]float64{ps}, conformance.Settings{})
			if err != nil || !rep.Passed() {
				b.Fatalf("%v %v", err, rep.Failures())
			}
		}
	}
}

// BenchmarkMorse is the suite over one form.
func BenchmarkMorse(b *testing.B) {
	ps, _ := conformance.Representative(models.Morse{})
	for b.Loop() {
		if _, err := conformance.Run(models.Morse{}, [][]float64{ps}, conformance.Settings{}); err != nil {
			b.Fatal(err)
		}
	}
}
