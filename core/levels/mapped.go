package levels

import (
	"math"
	"sort"

	"gonum.org/v1/gonum/mat"

	"github.com/pairwell/pairwell/core"
)

// A uniform grid wastes points beyond the outer turning point, where the
// local wave number is small but the wave functions of the highest levels
// decay slowly. The outer part of the grid is therefore stretched by a
// smooth analytic map r(x), uniform in x (unit step), whose Jacobian rises
// in doubling steps from the spacing h₀ of the well:
//
//	J(x) = dr/dx = h₀ + Σ_m (h_m − h_{m−1})·σ((x − x_m)/w),  h_m = 2^m·h₀,
//	r(x) = r₀ + h₀x + Σ_m (h_m − h_{m−1})·w·[s((x − x_m)/w) − s(−x_m/w)],
//
// with σ(z) = 1/(1 + e^{−z}) and s(z) = ln(1 + e^z) (a mapped Fourier grid
// in the sense of E. Fattal, R. Baer & R. Kosloff, Phys. Rev. E 53, 1217
// (1996), from memory). With φ(x) = J^{1/2} χ(r(x)) the kinetic operator
// becomes
//
//	J^{−1/2} (−d/dx J^{−1} d/dx) J^{−1/2} = −J⁻¹ (d²/dx²) J⁻¹ + (3J′²/(4J⁴) − J″/(2J³))
//
// (a short calculation with B = J^{−1/2}: the extra term is B³B″), whose
// d²/dx² is the Colbert–Miller matrix of unit spacing. The map is analytic,
// so the spectral convergence of the DVR is kept; it only decides how many
// points are needed, and the grid refinement measures the accuracy.

// Map shape: the width of each step in grid steps, the largest number of
// doublings, and the slack allowed on the local resolution.
const (
	mapWidth = 6.0
	maxSteps = 12
	mapSlack = 1.1
)

// remap replaces the uniform grid g (a probe of the potential) by a
// stretched one when that saves points. The local spacing needed at r is
// π/(β·q(r)), with q the larger of the wave number √((eSpace − V)/c) and the
// decay constant √((V − eTail)/c); each step x_m is placed as early as the
// stretched grid keeps that resolution (within mapSlack) at every probe
// point beyond re.
func (g *grid) remap(p core.Potential, c, re, eSpace, eTail, beta float64) error {
	if len(g.r) < 32 {
		return nil
	}
	h0 := g.dx
	n := len(g.r)
	need := make([]float64, n) // required spacing at g.r[i]
	iRe := sort.SearchFloat64s(g.r, re)
	for i := range g.r {
		ks := math.Sqrt(math.Max(eSpace-g.v[i], 0) / c)
		kt := math.Sqrt(math.Max(g.v[i]-eTail, 0) / c)
		need[i] = math.Pi / (beta * math.Max(ks, kt))
	}
	r0, rEnd := g.r[0], g.r[n-1]
	needAt := func(r float64) float64 {
		i := int((r - r0) / h0)
		if i >= n-1 {
			return need[n-1]
		}
		t := (r - g.r[i]) / h0
		return need[i] + t*(need[i+1]-need[i])
	}
	mp := stretch{r0: r0, h0: h0, w: mapWidth}
	ok := func() bool {
		for x := float64(iRe); ; x++ {
			r := mp.r(x)
			if r > rEnd {
				return true
			}
			if mp.j(x) > mapSlack*needAt(r) {
				return false
			}
		}
	}
	lo := float64(iRe) + 3*mapWidth
	for m := 0; m < maxSteps; m++ {
		mp.x = append(mp.x, 0)
		last := len(mp.x) - 1
		hi := float64(n)
		if mp.x[last] = hi; !ok() {
			mp.x = mp.x[:last]
			break
		}
		if mp.x[last] = lo; !ok() {
			for hi-lo > 0.5 {
				mid := 0.5 * (lo + hi)
				if mp.x[last] = mid; ok() {
					hi = mid
				} else {
					lo = mid
				}
			}
			mp.x[last] = hi
		}
		if mp.r(mp.x[last]) > rEnd {
			mp.x = mp.x[:last]
			break
		}
		lo = mp.x[last] + mapWidth
	}
	if len(mp.x) == 0 {
		return nil
	}
	var rs []float64
	for x := 0.0; ; x++ {
		r := mp.r(x)
		rs = append(rs, r)
		if r >= rEnd {
			break
		}
	}
	if len(rs) >= n {
		return nil
	}
	vs := make([]float64, len(rs))
	if err := sample(p, rs, vs); err != nil {
		return err
	}
	g.mapped = true
	g.r, g.v = rs, vs
	g.a = make([]float64, len(rs))
	g.u = make([]float64, len(rs))
	for i := range rs {
		jx, j1, j2 := mp.derivs(float64(i))
		g.a[i] = 1 / jx
		g.u[i] = 0.75*j1*j1/(jx*jx*jx*jx) - 0.5*j2/(jx*jx*jx)
	}
	return nil
}

// stretch is the map r(x) described above: step m (from 0) doubles the
// spacing from 2^m·h0 to 2^(m+1)·h0 around x[m].
type stretch struct {
	r0, h0, w float64
	x         []float64
}

// softplus returns ln(1 + e^z) without overflow.
func softplus(z float64) float64 { return math.Max(z, 0) + math.Log1p(math.Exp(-math.Abs(z))) }

func (m stretch) r(x float64) float64 {
	r := m.r0 + m.h0*x
	d := m.h0 // h_{m+1} − h_m = 2^m·h0
	for _, xm := range m.x {
		r += d * m.w * (softplus((x-xm)/m.w) - softplus(-xm/m.w))
		d *= 2
	}
	return r
}

func (m stretch) j(x float64) float64 {
	j, _, _ := m.derivs(x)
	return j
}

// derivs returns J, J′ and J″ at x.
func (m stretch) derivs(x float64) (j, j1, j2 float64) {
	j = m.h0
	d := m.h0
	for _, xm := range m.x {
		s := 1 / (1 + math.Exp(-(x-xm)/m.w))
		j += d * s
		j1 += d * s * (1 - s) / m.w
		j2 += d * s * (1 - s) * (1 - 2*s) / (m.w * m.w)
		d *= 2
	}
	return j, j1, j2
}

// mappedHamiltonian is H = c·[A T A + diag(u)] + diag(V + c·j(j+1)/r²) with
// A = diag(1/J) and T the Colbert–Miller matrix of unit spacing on
// (−∞, ∞): T_ii = π²/3, T_ik = 2(−1)^(i−k)/(i−k)². When the grid starts at
// the origin (r₀ = h₀, where the map is linear) T is the radial matrix of
// points k = i+1, with the image terms −(−1)^(k−l)·2/(k+l)² (and −1/(2k²) on
// the diagonal) that impose χ(0) = 0; far from the origin they cancel for
// smooth wave functions.
func (g *grid) mappedHamiltonian(c float64, j int) *mat.SymDense {
	n := len(g.r)
	h := mat.NewSymDense(n, nil)
	rot := c * float64(j*(j+1))
	raw := h.RawSymmetric()
	origin := g.k0 == 1
	for i := 0; i < n; i++ {
		row := raw.Data[i*raw.Stride:]
		ai := g.a[i]
		ki := float64(i + 1)
		tii := math.Pi * math.Pi / 3
		if origin {
			tii -= 0.5 / (ki * ki)
		}
		row[i] = c*(ai*ai*tii+g.u[i]) + g.v[i] + rot/(g.r[i]*g.r[i])
		for k := i + 1; k < n; k++ {
			d := float64(k - i)
			t := 2 / (d * d)
			if origin {
				s := ki + float64(k+1)
				t -= 2 / (s * s)
			}
			if (k-i)%2 == 1 {
				t = -t
			}
			row[k] = c * ai * t * g.a[k]
		}
	}
	return h
}
