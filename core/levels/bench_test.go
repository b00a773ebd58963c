package levels

import (
	"fmt"
	"testing"

	"github.com/pairwell/pairwell/models"
)

// hclMorse is the Morse well built from the H³⁵Cl constants of Huber &
// Herzberg (1979, from memory): ωe = 2990.946, ωexe = 52.8186 cm⁻¹,
// re = 1.27455 Å; it holds 28 bound levels.
func hclMorse(b *testing.B) (*models.MorsePotential, float64) {
	mu := pairMass(b, "1H-35Cl")
	p, err := models.MorseFromSpectroscopic(2990.946, 52.8186, 1.27455, mu)
	if err != nil {
		b.Fatal(err)
	}
	m, err := models.NewMorse(p[0], p[1], p[2])
	if err != nil {
		b.Fatal(err)
	}
	return m, mu
}

// BenchmarkHClAllBound: every bound J = 0 level of the H³⁵Cl-like Morse
// well to 1e-6 cm⁻¹ (target ≤ 50 ms).
func BenchmarkHClAllBound(b *testing.B) {
	p, mu := hclMorse(b)
	for b.Loop() {
		if _, err := Solve(p, mu, Settings{Tolerance: 1e-6}); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkHClRotation: the lowest 5 levels at J = 0 … 10 of the same
// (target ≤ 200 ms).
func BenchmarkHClRotation(b *testing.B) {
	p, mu := hclMorse(b)
	for b.Loop() {
		if _, err := Solve(p, mu, Settings{Count: 5, JMax: 10, Tolerance: 1e-6}); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkDiagonalise measures one diagonalisation (every eigenvalue and
// the eigenvectors of the lowest 0 or 30) against the number of grid
// points: the tridiagonal reduction dominates and grows as n³.
func BenchmarkDiagonalise(b *testing.B) {
	for _, n := range []int{64, 128, 256, 512} {
		g := &grid{dx: 0.03, k0: 20}
		for i := 0; i < n; i++ {
			r := float64(g.k0+i) * g.dx
			g.r = append(g.r, r)
			g.v = append(g.v, (r-1)*(r-1))
		}
		for _, vec := range []int{0, 30} {
			b.Run(fmt.Sprintf("n=%d/vectors=%d", n, vec), func(b *testing.B) {
				for b.Loop() {
					if _, _, err := g.eigen(0.002, 0, func([]float64) int { return vec }); err != nil {
						b.Fatal(err)
					}
				}
			})
		}
	}
}
