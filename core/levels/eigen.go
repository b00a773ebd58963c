package levels

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/blas"
	"gonum.org/v1/gonum/lapack/gonum"

	"github.com/pairwell/pairwell/core"
)

// eigen diagonalises the Hamiltonian of g for rotational quantum number j.
// It returns every eigenvalue in ascending order and the eigenvectors of
// the lowest want(vals) levels, vecs[v][i] being component i of level v.
//
// The dense matrix is reduced to tridiagonal form T = QᵀHQ (LAPACK Dsytrd),
// the eigenvalues of T come from the root-free QL iteration (Dsterf), and
// the m eigenvectors wanted from inverse iteration on T (each a solve of
// the tridiagonal system T − λ by Dgtsv) transformed back with the
// Householder reflectors of Q (Dormqr), all from gonum's LAPACK. This is
// what LAPACK's Dstein and Dormtr do, which gonum lacks; computing all n
// eigenvectors (mat.EigenSym) would cost about as much again as the whole
// solve for the few levels wanted.
func (g *grid) eigen(c float64, j int, want func(vals []float64) int) ([]float64, [][]float64, error) {
	n := len(g.r)
	h := g.hamiltonian(c, j).RawSymmetric()
	a := h.Data // row-major, upper triangle filled: mirror it
	for r := 0; r < n; r++ {
		for s := r + 1; s < n; s++ {
			a[s*h.Stride+r] = a[r*h.Stride+s]
		}
	}
	var impl gonum.Implementation
	d := make([]float64, n)
	e := make([]float64, max(n-1, 1))
	tau := make([]float64, max(n-1, 1))
	work := make([]float64, 1)
	impl.Dsytrd(blas.Lower, n, a, h.Stride, d, e, tau, work, -1)
	work = make([]float64, int(work[0]))
	impl.Dsytrd(blas.Lower, n, a, h.Stride, d, e, tau, work, len(work))
	vals := append([]float64(nil), d...)
	off := append([]float64(nil), e[:n-1]...)
	if !impl.Dsterf(n, vals, off) {
		return nil, nil, fmt.Errorf("diagonalising the %d-point Hamiltonian: %w", n, core.ErrNoConvergence)
	}
	m := min(want(vals), n)
	if m == 0 {
		return vals, nil, nil
	}
	// Inverse iteration on T, the vectors as the columns of y (n×m).
	norm := 0.0
	for i := range d {
		norm = math.Max(norm, math.Abs(d[i])+2*math.Abs(e[min(i, n-2)]))
	}
	y := make([]float64, n*m)
	dl, dd, du := make([]float64, n-1), make([]float64, n), make([]float64, n-1)
	x := make([]float64, n)
	for k := 0; k < m; k++ {
		for i := range x {
			x[i] = 1 + 0.25*math.Sin(float64(3*i+k)) // not orthogonal to any eigenvector in practice
		}
		shift := vals[k]
		for it := 0; it < 3; it++ {
			for tries := 0; ; tries++ {
				copy(dl, e[:n-1])
				copy(du, e[:n-1])
				for i := range dd {
					dd[i] = d[i] - shift
				}
				xs := append([]float64(nil), x...)
				if impl.Dgtsv(n, 1, dl, dd, du, xs, 1) {
					copy(x, xs)
					break
				}
				if tries == 4 {
					return nil, nil, fmt.Errorf("inverse iteration for level %d: %w", k, core.ErrNoConvergence)
				}
				shift += 4 * math.Nextafter(norm, math.Inf(1)) * 1e-16 * float64(tries+1)
			}
			s := 0.0
			for _, v := range x {
				s += v * v
			}
			s = 1 / math.Sqrt(s)
			for i := range x {
				x[i] *= s
			}
		}
		for i, v := range x {
			y[i*m+k] = v
		}
	}
	// Back to the grid basis: rows 1…n−1 of y are multiplied by the
	// reflectors stored below the subdiagonal (LAPACK Dormtr, lower).
	if n > 1 {
		work = make([]float64, 1)
		impl.Dormqr(blas.Left, blas.NoTrans, n-1, m, n-1, a[h.Stride:], h.Stride, tau[:n-1], y[m:], m, work, -1)
		work = make([]float64, int(work[0]))
		impl.Dormqr(blas.Left, blas.NoTrans, n-1, m, n-1, a[h.Stride:], h.Stride, tau[:n-1], y[m:], m, work, len(work))
	}
	vecs := make([][]float64, m)
	for k := range vecs {
		vecs[k] = make([]float64, n)
		for i := range vecs[k] {
			vecs[k][i] = y[i*m+k]
		}
	}
	return vals, vecs, nil
}
