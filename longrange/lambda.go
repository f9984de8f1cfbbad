package longrange

import (
	"math"

	"lamina/grid"
)

// Range-separation criteria (shared PHYSICS.md section 5): Λ·r_WS measured in the length that the
// kernel's damping sees.
const (
	// lambdaRWS3D is Λ·r_WS/√λ_max(ε∞) of the 3D default: the real-space remainder
	// erfc(Λd)/d, d = √(r·ε∞⁻¹·r) ≥ |r|/√λ_max, is down to erfc(4.5) ≈ 2e-10 at the supercell's
	// Wigner–Seitz radius.
	lambdaRWS3D = 4.5
	// lambdaRWS2D is Λ·r_WS of the 2D default. The unscreened sheet kernel allows Λ·r_WS from
	// about 4.5 up; the screening correction, whose result depends on Λ, came out best at the
	// lower end, Λ·r_WS ≈ 5 (PHYSICS.md section 5: 0.006 THz near Γ on a 6×6 grid, up to 5×
	// worse at larger Λ). 5 rather than 4.5 also pushes the neglected remainder at r_WS from about
	// 1e-7 to 1e-9 of the dipole interaction (erfc(5) ≈ 1.5e-12 against erfc(4.5) ≈ 2e-10, times
	// the (Λr)² growth of the second derivative).
	lambdaRWS2D = 5.0
)

// DefaultLambda returns the default range-separation parameter Λ in 1/Å for a kernel of kind k
// on the supercell of the Γ-centred mesh (n_i·a_i), shared PHYSICS.md section 5:
//
//	Kernel3D: Λ = 4.5·√λ_max(ε∞) / r_WS
//	Kernel2D: Λ = 5 / r_WS
//
// where r_WS is half the shortest non-zero supercell lattice vector (in-plane vectors only for
// Kernel2D) and λ_max(ε∞) the largest eigenvalue of eps (ε∞ enters the 3D damping as K·ε∞·K, so
// the real-space length is √(r·ε∞⁻¹·r)). The 2D criterion is the unscreened one, independent of
// eps; 5 sits at the lower end of the allowed range where the Λ-dependent screening correction
// works best (see lambdaRWS2D).
//
// Mesh entries below 1 count as 1. For inputs New rejects (a non-positive-definite eps) the
// result is meaningless.
func DefaultLambda(s grid.Structure, eps grid.Mat3, mesh grid.Mesh, k Kind) float64 {
	r := wsRadius(s.Lattice, mesh, k.dims())
	if k == Kernel2D {
		return lambdaRWS2D / r
	}
	return lambdaRWS3D * math.Sqrt(maxEigenSym3(eps)) / r
}

// wsRadius returns half the shortest non-zero vector of the supercell lattice n_i·a_i, i < dims.
func wsRadius(l grid.Lattice, mesh grid.Mesh, dims int) float64 {
	var basis, dual grid.Mat3
	recip := l.Reciprocal()
	for i := 0; i < dims; i++ {
		n := float64(max(mesh.N[i], 1))
		basis[i] = grid.Vec3(l.Vectors[i]).Scale(n)
		dual[i] = grid.Vec3(recip[i]).Scale(1 / n)
		if dims == 2 {
			dual[i][2] = 0
		}
	}
	return shortestVector(basis, dual, dims) / 2
}

// maxEigenSym3 returns the largest eigenvalue of the symmetric part of m.
func maxEigenSym3(m grid.Mat3) float64 { return -minEigenSym3(m.Scale(-1)) }
