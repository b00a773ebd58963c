package models

import (
	"testing"

	"github.com/pairwell/pairwell/core"
)

var sink float64

// benchTaylor4 measures c_0…c_4 at one r (one single-point Taylor call).
func benchTaylor4(b *testing.B, p core.Potential, r float64) {
	var d [5]float64
	rr := []float64{r}
	b.ReportAllocs()
	for b.Loop() {
		if err := p.Taylor(4, rr, d[:]); err != nil {
			b.Fatal(err)
		}
	}
	sink = d[4]
}

// benchBatch measures c_0…c_n at 4096 points in one Taylor call, per point.
func benchBatch(b *testing.B, p core.Potential, n int, lo, hi float64) {
	const points = 4096
	r := linspace(lo, hi, points)
	dst := make([]float64, (n+1)*points)
	b.ReportAllocs()
	for b.Loop() {
		if err := p.Taylor(n, r, dst); err != nil {
			b.Fatal(err)
		}
	}
	sink = dst[points/2]
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/points, "ns/point")
}

func BenchmarkMorseTaylor4(b *testing.B) {
	benchTaylor4(b, mustNew(b, Morse{}, 4.7446, 1.9426, 0.7416), 0.9)
}

func BenchmarkLJTaylor4(b *testing.B) {
	benchTaylor4(b, mustNew(b, LennardJones{}, 0.0104, 3.40), 3.9)
}

func BenchmarkBuckinghamTaylor4(b *testing.B) {
	benchTaylor4(b, mustNew(b, Buckingham{}, 18003.7572, 1/4.87318, 133.5381), 1.8)
}

func BenchmarkHarmonicTaylor4(b *testing.B) {
	benchTaylor4(b, mustNew(b, Harmonic{}, 32.2, 1.2746), 1.3)
}

// BenchmarkMorseBatch4 is orders 0–4 at 4096 points in one call (issue
// target ≤ 15 ns per point).
func BenchmarkMorseBatch4(b *testing.B) {
	benchBatch(b, mustNew(b, Morse{}, 4.7446, 1.9426, 0.7416), 4, 0.5, 3)
}

// BenchmarkLJBatch4 is orders 0–4 at 4096 points in one call (issue
// target ≤ 8 ns per point).
func BenchmarkLJBatch4(b *testing.B) {
	benchBatch(b, mustNew(b, LennardJones{}, 0.0104, 3.40), 4, 3, 9)
}

func BenchmarkBuckinghamBatch4(b *testing.B) {
	benchBatch(b, mustNew(b, Buckingham{}, 18003.7572, 1/4.87318, 133.5381), 4, 1.5, 6)
}

func BenchmarkMorseBatch2(b *testing.B) {
	benchBatch(b, mustNew(b, Morse{}, 4.7446, 1.9426, 0.7416), 2, 0.5, 3)
}

func BenchmarkLJBatch2(b *testing.B) {
	benchBatch(b, mustNew(b, LennardJones{}, 0.0104, 3.40), 2, 3, 9)
}
