package exact

import (
	"math"
	"math/rand/v2"
	"testing"
)

// TestHermitian2x2 checks the embedded solver on [[a, b], [b*, d]], whose eigenvalues are
// (a + d)/2 ± √(((a − d)/2)² + |b|²) (closed form). Tolerance 1e-14 relative.
func TestHermitian2x2(t *testing.T) {
	a, d := 2.5, -0.7
	b := complex(0.8, -1.9)
	got := hermitianEigenvalues([]complex128{complex(a, 0), b, complex(real(b), -imag(b)), complex(d, 0)}, []float64{1, 1})
	r := math.Sqrt((a-d)*(a-d)/4 + real(b)*real(b) + imag(b)*imag(b))
	want := []float64{(a+d)/2 - r, (a+d)/2 + r}
	for i := range want {
		if math.Abs(got[i]-want[i]) > 1e-14*r {
			t.Errorf("eigenvalue %d = %.16g, want %.16g", i, got[i], want[i])
		}
	}
}

// TestHermitianInvariants checks a random 12×12 Hermitian matrix with mass weights: the
// eigenvalues are ascending, sum to the trace of D and their squares to ‖D‖²_F (unitary
// invariants). Tolerance 1e-12 relative.
func TestHermitianInvariants(t *testing.T) {
	const n = 12
	rng := rand.New(rand.NewPCG(2, 9))
	c := make([]complex128, n*n)
	w := make([]float64, n)
	for i := 0; i < n; i++ {
		w[i] = 1 / math.Sqrt(1+20*rng.Float64())
		c[i*n+i] = complex(rng.NormFloat64(), 0)
		for j := i + 1; j < n; j++ {
			v := complex(rng.NormFloat64(), rng.NormFloat64())
			c[i*n+j] = v
			c[j*n+i] = complex(real(v), -imag(v))
		}
	}
	lam := hermitianEigenvalues(c, w)
	var tr, fro, s1, s2 float64
	for i := 0; i < n; i++ {
		tr += real(c[i*n+i]) * w[i] * w[i]
		for j := 0; j < n; j++ {
			x := c[i*n+j] * complex(w[i]*w[j], 0)
			fro += real(x)*real(x) + imag(x)*imag(x)
		}
	}
	for i, l := range lam {
		s1 += l
		s2 += l * l
		if i > 0 && l < lam[i-1] {
			t.Errorf("eigenvalues not ascending at %d: %g < %g", i, l, lam[i-1])
		}
	}
	if math.Abs(s1-tr) > 1e-12*math.Sqrt(fro) {
		t.Errorf("Σλ = %.15g, trace %.15g", s1, tr)
	}
	if math.Abs(s2-fro) > 1e-12*fro {
		t.Errorf("Σλ² = %.15g, ‖D‖² = %.15g", s2, fro)
	}
}
