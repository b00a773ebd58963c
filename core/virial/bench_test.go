package virial

import (
	"testing"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/models"
)

func benchForms(b *testing.B) map[string]core.Potential {
	m, err := models.Morse{}.New([]float64{0.01, 1.5, 3.8})
	if err != nil {
		b.Fatal(err)
	}
	return map[string]core.Potential{
		"lj":         lj(b, 0.0104, 3.4),
		"morse":      m,
		"buckingham": buckingham(b, 1500, 0.3, 25),
	}
}

// BenchmarkPoint is B₂ at one temperature (300 K, with the quantum
// correction) to the default tolerance 1e-10, the Calculator reused.
func BenchmarkPoint(b *testing.B) {
	for name, p := range benchForms(b) {
		b.Run(name, func(b *testing.B) {
			c, err := New(p, Settings{})
			if err != nil {
				b.Fatal(err)
			}
			ts := []float64{300}
			if _, err := c.Points(ts, 20); err != nil {
				b.Fatal(err)
			}
			b.ResetTimer()
			for b.Loop() {
				if _, err := c.Points(ts, 20); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

// BenchmarkPoints1000 is B₂ at 1000 temperatures from 50 K to 5000 K with
// the quantum correction, the Calculator built inside the loop.
func BenchmarkPoints1000(b *testing.B) {
	ts := make([]float64, 1000)
	for i := range ts {
		ts[i] = 50 + 4.95*float64(i)
	}
	for name, p := range benchForms(b) {
		b.Run(name, func(b *testing.B) {
			for b.Loop() {
				c, err := New(p, Settings{})
				if err != nil {
					b.Fatal(err)
				}
				if _, err := c.Points(ts, 20); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

// BenchmarkCharacteristic is the Boyle temperature and the maximum of B₂.
func BenchmarkCharacteristic(b *testing.B) {
	c, err := New(lj(b, 0.0104, 3.4), Settings{})
	if err != nil {
		b.Fatal(err)
	}
	for b.Loop() {
		if _, err := c.Characteristic(); err != nil {
			b.Fatal(err)
		}
	}
}
