package exact

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/mat"

	"lamina/grid"
	"lamina/grid/units"
)

// Frequencies returns the 3N phonon frequencies in THz at reduced q, ascending, an imaginary
// mode as a negative number (dir as in Matrix). They are the eigenvalues of the mass-weighted
// D = C/√(M_κ M_κ'), found by gonum's real symmetric solver on the 2n×2n embedding
// [[Re D, −Im D], [Im D, Re D]], whose spectrum is that of D with every eigenvalue twice.
func (m *Model) Frequencies(q grid.Vec3, dir grid.Vec3) []float64 {
	c := m.Matrix(nil, q, dir)
	lam := hermitianEigenvalues(c, massWeights(m.Structure))
	out := make([]float64, len(lam))
	for i, l := range lam {
		out[i] = units.FrequencyTHz(l)
	}
	return out
}

// massWeights returns 1/√M per matrix index 3κ+α.
func massWeights(s grid.Structure) []float64 {
	w := make([]float64, 3*s.N())
	for k, a := range s.Atoms {
		for i := 0; i < 3; i++ {
			w[3*k+i] = 1 / math.Sqrt(a.Mass)
		}
	}
	return w
}

// hermitianEigenvalues returns the ascending eigenvalues of D_ij = w_i c_ij w_j (c Hermitian,
// row-major n×n with n = len(w)), made exactly Hermitian first.
func hermitianEigenvalues(c []complex128, w []float64) []float64 {
	n := len(w)
	emb := mat.NewSymDense(2*n, nil)
	for i := 0; i < n; i++ {
		for j := i; j < n; j++ {
			v := (c[i*n+j] + complex(real(c[j*n+i]), -imag(c[j*n+i]))) / 2 * complex(w[i]*w[j], 0)
			re, im := real(v), imag(v)
			if i == j {
				im = 0
			}
			emb.SetSym(i, j, re)
			emb.SetSym(n+i, n+j, re)
			// Lower-left block Im D: element (n+i, j) = Im D_ij, (n+j, i) = Im D_ji = −Im D_ij.
			emb.SetSym(j, n+i, im)
			emb.SetSym(i, n+j, -im)
		}
	}
	var es mat.EigenSym
	if !es.Factorize(emb, false) {
		panic(fmt.Sprintf("exact: symmetric eigensolver failed on a %d×%d matrix", 2*n, 2*n))
	}
	all := es.Values(nil)
	out := make([]float64, n)
	for i := range out {
		// The spectrum is doubled and sorted: pairs (2i, 2i+1) belong to one eigenvalue.
		out[i] = (all[2*i] + all[2*i+1]) / 2
	}
	return out
}
