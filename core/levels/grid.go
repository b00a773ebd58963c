package levels

import (
	"errors"
	"fmt"
	"math"

	"gonum.org/v1/gonum/mat"

	"github.com/pairwell/pairwell/core"
)

// grid is a uniform radial grid r_k = k·dx, k = k0, …, k0+len(r)−1 (k0 ≥ 1),
// with the potential sampled on it.
type grid struct {
	dx   float64
	k0   int
	r, v []float64 // Å, eV
	// mapped grids (see remap) have points r_i = r(i), not k·dx, with
	// a_i = 1/J_i, J = dr/dx, and the extra potential u_i of the map in
	// 1/Å² (times ħ²/(2μ) in the Hamiltonian).
	mapped bool
	a, u   []float64
	// wall reports that the grid's inner end is the end of the potential's
	// domain (Domain.Min > 0, e.g. a Buckingham barrier) rather than a point
	// chosen deep in the classically forbidden region: a level is then
	// bound only if its wave function has decayed before the wall.
	wall bool
}

// errTooLarge means a grid would need more points than the limit.
var errTooLarge = errors.New("grid too large")

// walkBlock is the number of points sampled per batched call while a grid
// end is searched for.
const walkBlock = 256

// build samples the grid of spacing dx that runs from re into the
// classically forbidden region on both sides of the energy e (eV), each end
// where the WKB decay exponent ∫κ dr, κ = √((V − e)/c), c = ħ²/(2μ), reaches
// tail. The inner end stops earlier at the domain's end: at r = dx (the
// radial DVR imposes χ(0) = 0 there) or above Domain.Min (wall).
func build(p core.Potential, c, re, e, dx, tail float64, maxPoints int) (*grid, error) {
	d := p.Domain()
	kc := int(math.Round(re / dx))
	if kc < 1 {
		kc = 1
	}
	kmin := 1
	if d.Min > 0 {
		kmin = int(math.Floor(d.Min/dx)) + 1
	}
	kmax := math.MaxInt32
	if !math.IsInf(d.Max, 1) {
		kmax = int(math.Ceil(d.Max/dx)) - 1
	}
	g := &grid{dx: dx}
	// Inner side: k = kc−1, kc−2, …
	var in []float64 // V at kc−1, kc−2, … (reversed later)
	k := kc - 1
	phase := 0.0 // ∫κ dr so far
	prev := -1.0 // κ at the previous point, −1 before the first
	reached := false
	for !reached && k >= kmin {
		n := min(walkBlock, k-kmin+1)
		if len(in)+n > maxPoints {
			return nil, errTooLarge
		}
		rs := make([]float64, n)
		for i := range rs {
			rs[i] = float64(k-i) * dx
		}
		vs := make([]float64, n)
		if err := sample(p, rs, vs); err != nil {
			return nil, err
		}
		for i, v := range vs {
			if math.IsNaN(v) {
				return nil, fmt.Errorf("V(%g Å) is NaN: %w", rs[i], core.ErrDomain)
			}
			if math.IsInf(v, 1) {
				reached = true
				break
			}
			in = append(in, v)
			kap := math.Sqrt(math.Max(v-e, 0) / c)
			if prev >= 0 {
				phase += 0.5 * (prev + kap) * dx
			}
			prev = kap
			if phase >= tail {
				reached = true
				break
			}
		}
		k -= n
	}
	// Stopped by the end of a domain that ends above r = 0: a wall.
	g.wall = !reached && d.Min > 0
	g.k0 = kc - len(in)
	// Outer side: k = kc, kc+1, …
	var out []float64
	k = kc
	phase, prev = 0, -1
	stop := k > kmax
	for !stop {
		n := min(walkBlock, kmax-k+1)
		if len(in)+len(out)+n > maxPoints+walkBlock {
			return nil, errTooLarge
		}
		rs := make([]float64, n)
		for i := range rs {
			rs[i] = float64(k+i) * dx
		}
		vs := make([]float64, n)
		if err := sample(p, rs, vs); err != nil {
			return nil, err
		}
		for i, v := range vs {
			if math.IsNaN(v) || math.IsInf(v, 0) {
				return nil, fmt.Errorf("V(%g Å) = %g: %w", rs[i], v, core.ErrDomain)
			}
			out = append(out, v)
			kap := 0.0
			if rs[i] > re {
				kap = math.Sqrt(math.Max(v-e, 0) / c)
			}
			if prev >= 0 {
				phase += 0.5 * (prev + kap) * dx
			}
			prev = kap
			if phase >= tail {
				stop = true
				break
			}
		}
		k += n
		if k > kmax {
			stop = true
		}
	}
	if len(in)+len(out) > maxPoints {
		return nil, errTooLarge
	}
	g.v = make([]float64, 0, len(in)+len(out))
	for i := len(in) - 1; i >= 0; i-- {
		g.v = append(g.v, in[i])
	}
	g.v = append(g.v, out...)
	g.r = make([]float64, len(g.v))
	for i := range g.r {
		g.r[i] = float64(g.k0+i) * dx
	}
	return g, nil
}

// hamiltonian returns the Colbert–Miller DVR Hamiltonian on g for rotational
// quantum number j: H = c·T + diag(V + c·j(j+1)/r²), c = ħ²/(2μ) in eV·Å²,
// with the kinetic matrix of the radial (0, ∞) grid r_k = k·dx (D. T. Colbert
// & W. H. Miller, J. Chem. Phys. 96, 1982 (1992), Eq. (A7)):
//
//	T_kk = (π²/3 − 1/(2k²))/dx²,  T_kl = (−1)^(k−l) [2/(k−l)² − 2/(k+l)²]/dx².
func (g *grid) hamiltonian(c float64, j int) *mat.SymDense {
	if g.mapped {
		return g.mappedHamiltonian(c, j)
	}
	n := len(g.r)
	h := mat.NewSymDense(n, nil)
	s := c / (g.dx * g.dx)
	rot := c * float64(j*(j+1))
	raw := h.RawSymmetric()
	for a := 0; a < n; a++ {
		ka := float64(g.k0 + a)
		row := raw.Data[a*raw.Stride:]
		row[a] = s*(math.Pi*math.Pi/3-0.5/(ka*ka)) + g.v[a] + rot/(g.r[a]*g.r[a])
		for b := a + 1; b < n; b++ {
			kb := float64(g.k0 + b)
			d := float64(b - a)
			t := 2/(d*d) - 2/((ka+kb)*(ka+kb))
			if (b-a)%2 == 1 {
				t = -t
			}
			row[b] = s * t
		}
	}
	return h
}

// tails returns the WKB decay exponents ∫κ dr of a level of energy e on the
// effective potential V + c·j(j+1)/r² of g, from the innermost and outermost
// classically allowed grid points to the two ends of the grid.
func (g *grid) tails(c float64, j int, e float64) (inner, outer float64) {
	rot := c * float64(j*(j+1))
	veff := func(i int) float64 { return g.v[i] + rot/(g.r[i]*g.r[i]) }
	first, last := -1, -1
	for i := range g.r {
		if veff(i) < e {
			if first < 0 {
				first = i
			}
			last = i
		}
	}
	if first < 0 {
		return math.Inf(1), math.Inf(1)
	}
	kap := func(i int) float64 { return math.Sqrt(math.Max(veff(i)-e, 0) / c) }
	for i := first; i > 0; i-- {
		inner += 0.5 * (kap(i) + kap(i-1)) * (g.r[i] - g.r[i-1])
	}
	for i := last; i < len(g.r)-1; i++ {
		outer += 0.5 * (kap(i) + kap(i+1)) * (g.r[i+1] - g.r[i])
	}
	return inner, outer
}
