package ifc_test

import (
	"fmt"
	"math/rand/v2"
	"testing"

	"lamina/ifc"
)

// BenchmarkEigen times Factorize + Values(dst) (+ Vectors(dst)) on a random Hermitian matrix
// at the sizes of 2, 8 and 32 atoms (n = 3N).
func BenchmarkEigen(b *testing.B) {
	for _, n := range []int{6, 24, 96} {
		for _, vectors := range []bool{false, true} {
			kind := "values"
			if vectors {
				kind = "vectors"
			}
			b.Run(fmt.Sprintf("n=%d/%s", n, kind), func(b *testing.B) { benchmarkEigen(b, n, vectors) })
		}
	}
}

func benchmarkEigen(b *testing.B, n int, vectors bool) {
	a := eigRandHermitian(rand.New(rand.NewPCG(7, 7)), n)
	vals := make([]float64, n)
	vecs := make([]complex128, n*n)
	var e ifc.Eigen
	e.Factorize(a, n, vectors) // warm-up: the workspace is allocated once, outside the timing
	b.ReportAllocs()
	for b.Loop() {
		if !e.Factorize(a, n, vectors) {
			b.Fatal("no convergence")
		}
		e.Values(vals)
		if vectors {
			e.Vectors(vecs)
		}
	}
}
