package longrange

import (
	"math"
	"testing"

	"lamina/grid"
)

// TestDefaultLambda checks the default rule of PHYSICS.md §5 on cells whose Wigner–Seitz radius
// is known by hand (derived values, tolerance 1e-12 for rounding).
func TestDefaultLambda(t *testing.T) {
	hex, _ := hexSheet(t, 0.3, isoZ(1), grid.Identity())
	// The same hexagonal lattice through a skewed basis a2' = a2 + 5·a1: the shortest supercell
	// vector is still 6·3 Å, which only a search beyond the basis vectors finds.
	skew := hex
	v := hex.Lattice.Vectors
	v[1] = grid.Vec3(v[1]).Add(grid.Vec3(v[0]).Scale(5))
	skew.Lattice = mustLattice(t, v, grid.Sheet)
	cubic := grid.Structure{Lattice: mustLattice(t, grid.Mat3{{5, 0, 0}, {0, 5, 0}, {0, 0, 5}}, grid.Bulk),
		Atoms: []grid.Atom{{Species: "A", Mass: 1}}}
	// A rotated diag(2, 3, 4): eigenvalues unchanged, λ_max = 4.
	c, sn := math.Cos(0.7), math.Sin(0.7)
	rot := grid.Mat3{{c, -sn, 0}, {sn, c, 0}, {0, 0, 1}}
	epsRot := rot.Mul(grid.Mat3{{2, 0, 0}, {0, 4, 0}, {0, 0, 3}}).Mul(rot.T())
	cases := []struct {
		name string
		s    grid.Structure
		eps  grid.Mat3
		mesh grid.Mesh
		kind Kind
		want float64
	}{
		// 6×6 grid of a 3 Å lattice: r_WS = 9 Å (PHYSICS.md §5), Λ = 5/9; ε and the 15 Å
		// height do not enter the 2D rule.
		{"hex 6×6 2d", hex, grid.Mat3{{4, 0, 0}, {0, 4, 0}, {0, 0, 9}}, grid.Mesh{N: [3]int{6, 6, 1}}, Kernel2D, 5.0 / 9},
		{"hex skewed basis 6×6 2d", skew, grid.Identity(), grid.Mesh{N: [3]int{6, 6, 1}}, Kernel2D, 5.0 / 9},
		// 4×3 grid: shortest supercell vector 3·3 Å, r_WS = 4.5 Å.
		{"hex 4×3 2d", hex, grid.Identity(), grid.Mesh{N: [3]int{4, 3, 1}}, Kernel2D, 5.0 / 4.5},
		// 4×4×4 of a 5 Å cube: r_WS = 10 Å; λ_max(ε) = 4, Λ = 4.5·2/10.
		{"cubic 4×4×4 3d", cubic, epsRot, grid.Mesh{N: [3]int{4, 4, 4}}, Kernel3D, 0.9},
		{"cubic 4×4×4 3d ε=1", cubic, grid.Identity(), grid.Mesh{N: [3]int{4, 4, 4}}, Kernel3D, 0.45},
		// 4×4×2: shortest supercell vector 10 Å, r_WS = 5 Å.
		{"cubic 4×4×2 3d", cubic, grid.Identity(), grid.Mesh{N: [3]int{4, 4, 2}}, Kernel3D, 0.9},
	}
	for _, tc := range cases {
		if got := DefaultLambda(tc.s, tc.eps, tc.mesh, tc.kind); math.Abs(got-tc.want) > 1e-12*tc.want {
			t.Errorf("DefaultLambda(%s) = %.15g, want %.15g", tc.name, got, tc.want)
		}
	}
}
