package models

import (
	"testing"

	"github.com/pairwell/pairwell/core"
)

var sink float64

func benchDerivatives4(b *testing.B, p core.Potential, r float64) {
	var d [5]float64
	b.ReportAllocs()
	for b.Loop() {
		if err := p.Derivatives(r, d[:]); err != nil {
			b.Fatal(err)
		}
	}
	sink = d[4]
}

func benchBatch(b *testing.B, p core.Potential, lo, hi float64) {
	const n = 4096
	r := linspace(lo, hi, n)
	dst := make([]float64, n)
	b.ReportAllocs()
	for b.Loop() {
		if err := p.Batch(2, r, dst); err != nil {
			b.Fatal(err)
		}
	}
	sink = dst[n/2]
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/n, "ns/point")
}

func BenchmarkMorseDerivatives4(b *testing.B) {
	benchDerivatives4(b, mustNew(b, Morse{}, 4.7446, 1.9426, 0.7416), 0.9)
}

func BenchmarkLJDerivatives4(b *testing.B) {
	benchDerivatives4(b, mustNew(b, LennardJones{}, 0.0104, 3.40), 3.9)
}

func BenchmarkBuckinghamDerivatives4(b *testing.B) {
	benchDerivatives4(b, mustNew(b, Buckingham{}, 18003.7572, 1/4.87318, 133.5381), 1.8)
}

func BenchmarkHarmonicDerivatives4(b *testing.B) {
	benchDerivatives4(b, mustNew(b, Harmonic{}, 32.2, 1.2746), 1.3)
}

func BenchmarkMorseBatch(b *testing.B) {
	benchBatch(b, mustNew(b, Morse{}, 4.7446, 1.9426, 0.7416), 0.5, 3)
}

func BenchmarkLJBatch(b *testing.B) {
	benchBatch(b, mustNew(b, LennardJones{}, 0.0104, 3.40), 3, 9)
}
