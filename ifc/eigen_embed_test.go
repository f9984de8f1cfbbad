package ifc_test

import (
	"fmt"
	"math"
	"math/cmplx"

	"gonum.org/v1/gonum/mat"
)

// embedSolve is the slow, simple reference for the Hermitian eigensolver: it shares no code
// with ifc.Eigen. A Hermitian A = B + iC (B symmetric, C antisymmetric) has the real symmetric
// embedding
//
//	M = [[B, −C], [C, B]],
//
// and M (u; w) = λ (u; w) if and only if A (u + iw) = λ (u + iw) (derived: expand the real and
// imaginary parts of A(u+iw)). Each eigenvalue of A therefore appears twice among those of M,
// with (u; w) and (−w; u), the realification of x and i·x. gonum's mat.EigenSym (Dsyev)
// diagonalises M; the eigenvalues of A are the pair means. For eigenvectors, the 2m columns of
// M belonging to an eigenvalue cluster of A of multiplicity m are turned into u + iw and
// re-orthonormalised with column-pivoted Gram–Schmidt (twice), keeping the m best.
//
// a must be exactly Hermitian (both triangles are read).
func embedSolve(a []complex128, n int, vectors bool) (embedResult, error) {
	m2 := 2 * n
	data := make([]float64, m2*m2)
	for i := 0; i < n; i++ {
		for j := 0; j < n; j++ {
			re, im := real(a[i*n+j]), imag(a[i*n+j])
			data[i*m2+j] = re
			data[i*m2+n+j] = -im
			data[(n+i)*m2+j] = im
			data[(n+i)*m2+n+j] = re
		}
	}
	var res embedResult
	var es mat.EigenSym
	if !es.Factorize(mat.NewSymDense(m2, data), vectors) {
		return res, fmt.Errorf("embedding: EigenSym did not converge (n=%d)", n)
	}
	w := es.Values(nil)
	normA := eigNormF(a)
	// Pairs agree to the backward error of Dsyev, of order 2n·ε·‖M‖ with ‖M‖_F = √2‖A‖_F.
	pairTol := 100 * float64(m2) * eigEps * math.Sqrt2 * normA
	vals := make([]float64, n)
	for k := 0; k < n; k++ {
		lo, hi := w[2*k], w[2*k+1]
		if hi-lo > pairTol {
			return res, fmt.Errorf("embedding: eigenvalues %d,%d = %g, %g not a pair (tol %g)", 2*k, 2*k+1, lo, hi, pairTol)
		}
		vals[k] = 0.5 * (lo + hi)
	}
	res.vals = vals
	for _, c := range eigClusters(w, pairTol) {
		if (c[1]-c[0])%2 != 0 {
			return res, fmt.Errorf("embedding: cluster [%d,%d) of odd size", c[0], c[1])
		}
		res.clusters = append(res.clusters, [2]int{c[0] / 2, c[1] / 2})
	}
	if !vectors {
		return res, nil
	}
	var q mat.Dense
	es.VectorsTo(&q)
	vecs := make([]complex128, n*n)
	for _, c := range res.clusters {
		c = [2]int{2 * c[0], 2 * c[1]}
		size := c[1] - c[0]
		cand := make([][]complex128, size)
		for k := range cand {
			x := make([]complex128, n)
			for i := range x {
				x[i] = complex(q.At(i, c[0]+k), q.At(n+i, c[0]+k))
			}
			cand[k] = x
		}
		basis, err := eigPivotedGS(cand, size/2)
		if err != nil {
			return res, fmt.Errorf("embedding: cluster [%d,%d): %w", c[0], c[1], err)
		}
		for k, x := range basis {
			col := c[0]/2 + k
			for i := range x {
				vecs[i*n+col] = x[i]
			}
		}
	}
	// Dsyev's columns are orthonormal in R^{2n}, but vectors built from different clusters are
	// orthogonal only to O(ε‖A‖/gap): Im(xᴴy) is the product of x with the partner (−w; u) of y,
	// which lies in y's eigenspace only to that accuracy. A final Gram–Schmidt pass over all n
	// columns (twice) restores orthonormality and moves each vector by no more than that.
	cols := make([][]complex128, n)
	for j := range cols {
		x := make([]complex128, n)
		for i := range x {
			x[i] = vecs[i*n+j]
		}
		for pass := 0; pass < 2; pass++ {
			for _, y := range cols[:j] {
				eigAxpy(-eigDot(y, x), y, x)
			}
		}
		nrm := eigNorm2(x)
		for i := range x {
			x[i] /= complex(nrm, 0)
			vecs[i*n+j] = x[i]
		}
		cols[j] = x
	}
	res.vecs = vecs
	return res, nil
}

// embedResult is the outcome of embedSolve.
type embedResult struct {
	vals     []float64    // n ascending eigenvalues of A
	vecs     []complex128 // n×n row-major, column j an eigenvector of vals[j]; nil without vectors
	clusters [][2]int     // index ranges [lo, hi) of vals that embedSolve treated as one eigenvalue
}

// eigPivotedGS orthonormalises the m candidates of largest remaining norm (Gram–Schmidt with
// column pivoting, each projection applied twice). The 2m complexified columns of an embedded
// eigenspace form a tight frame of the m-dimensional complex space (Σ x xᴴ = 2P, derived from
// the orthonormality of the real columns): after k pivots the remaining squared norms sum to
// 2(m−k) over 2m−k candidates, so every pivot is at least √(2/(m+1)).
func eigPivotedGS(cand [][]complex128, m int) ([][]complex128, error) {
	out := make([][]complex128, 0, m)
	for len(out) < m {
		best, bestNorm := -1, 0.0
		for k, x := range cand {
			if x == nil {
				continue
			}
			if nrm := eigNorm2(x); nrm > bestNorm {
				best, bestNorm = k, nrm
			}
		}
		// Half the tight-frame bound leaves room for rounding in the columns of M.
		if floor := 0.5 * math.Sqrt(2/float64(m+1)); best < 0 || bestNorm < floor {
			return nil, fmt.Errorf("pivot %d has norm %g, want ≥ %g", len(out), bestNorm, floor)
		}
		x := cand[best]
		cand[best] = nil
		for pass := 0; pass < 2; pass++ {
			for _, y := range out {
				eigAxpy(-eigDot(y, x), y, x)
			}
		}
		nrm := eigNorm2(x)
		for i := range x {
			x[i] /= complex(nrm, 0)
		}
		out = append(out, x)
		for _, y := range cand {
			if y != nil {
				eigAxpy(-eigDot(x, y), x, y)
			}
		}
	}
	return out, nil
}

// eigClusters splits ascending vals into index ranges [lo, hi) whose consecutive members
// differ by at most tol.
func eigClusters(vals []float64, tol float64) [][2]int {
	var out [][2]int
	lo := 0
	for i := 1; i <= len(vals); i++ {
		if i == len(vals) || vals[i]-vals[i-1] > tol {
			out = append(out, [2]int{lo, i})
			lo = i
		}
	}
	return out
}

// eigDot returns xᴴy.
func eigDot(x, y []complex128) complex128 {
	var s complex128
	for i := range x {
		s += cmplx.Conj(x[i]) * y[i]
	}
	return s
}

// eigAxpy sets y += alpha x.
func eigAxpy(alpha complex128, x, y []complex128) {
	for i := range x {
		y[i] += alpha * x[i]
	}
}

// eigNorm2 is the Euclidean norm of x, scaled so that 1e±150 entries do not overflow or
// underflow when squared.
func eigNorm2(x []complex128) float64 {
	var scale float64
	for _, v := range x {
		scale = math.Max(scale, cmplx.Abs(v))
	}
	if scale == 0 {
		return 0
	}
	var ss float64
	for _, v := range x {
		r := cmplx.Abs(v) / scale
		ss += r * r
	}
	return scale * math.Sqrt(ss)
}

// eigNormF is the Frobenius norm of the row-major matrix a.
func eigNormF(a []complex128) float64 { return eigNorm2(a) }
