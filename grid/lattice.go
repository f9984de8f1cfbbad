package grid

import (
	"errors"
	"fmt"
	"math"
	"strings"
)

// Periodicity says whether a crystal is periodic in three dimensions or is a sheet.
type Periodicity int

const (
	// Bulk is periodic along a1, a2 and a3.
	Bulk Periodicity = iota
	// Sheet is periodic along a1 and a2 only (in the xy plane); a3 sets the cell height of the
	// first-principles run and carries no periodicity.
	Sheet
)

// String returns "3d" or "2d", the spelling of the grid format.
func (p Periodicity) String() string {
	if p == Sheet {
		return "2d"
	}
	return "3d"
}

// ParsePeriodicity parses "2d" or "3d".
func ParsePeriodicity(s string) (Periodicity, error) {
	switch strings.ToLower(s) {
	case "3d":
		return Bulk, nil
	case "2d":
		return Sheet, nil
	}
	return 0, fmt.Errorf("unknown periodicity %q (valid: 2d, 3d)", s)
}

// InPlaneTol is the largest |a_z|/|a| allowed for the in-plane vectors a1, a2 of a sheet.
const InPlaneTol = 1e-6

// Lattice is a Bravais lattice with its periodicity.
type Lattice struct {
	// Vectors holds a1, a2, a3 as rows, in Å.
	Vectors     Mat3
	Periodicity Periodicity
	recip       Mat3
}

// NewLattice validates the vectors and returns the lattice. It fails for a singular or
// left-handed-degenerate cell and, for a sheet, for a1 or a2 out of the xy plane or an a3 with
// no z component.
func NewLattice(vectors Mat3, p Periodicity) (Lattice, error) {
	for i := 0; i < 3; i++ {
		for j := 0; j < 3; j++ {
			if math.IsNaN(vectors[i][j]) || math.IsInf(vectors[i][j], 0) {
				return Lattice{}, fmt.Errorf("grid: lattice vector a%d is not finite", i+1)
			}
		}
	}
	vol := vectors.Det()
	scale := Vec3(vectors[0]).Norm() * Vec3(vectors[1]).Norm() * Vec3(vectors[2]).Norm()
	if scale == 0 || math.Abs(vol) < 1e-10*scale {
		return Lattice{}, errors.New("grid: lattice vectors are linearly dependent (zero cell volume)")
	}
	if p == Sheet {
		for i := 0; i < 2; i++ {
			a := Vec3(vectors[i])
			if math.Abs(a[2]) > InPlaneTol*a.Norm() {
				return Lattice{}, fmt.Errorf("grid: 2d lattice vector a%d = %v is not in the xy plane", i+1, a)
			}
		}
	}
	l := Lattice{Vectors: vectors, Periodicity: p}
	if p == Sheet {
		// Make the in-plane vectors exactly planar so that no z leaks into phases.
		l.Vectors[0][2], l.Vectors[1][2] = 0, 0
	}
	// b_i = 2π (a_j × a_k)/Ω, rows of 2π (A⁻¹)ᵀ.
	l.recip = l.Vectors.Inv().T().Scale(2 * math.Pi)
	return l, nil
}

// A returns lattice vector a_i (i = 0, 1, 2).
func (l Lattice) A(i int) Vec3 { return Vec3(l.Vectors[i]) }

// Reciprocal returns the reciprocal vectors b1, b2, b3 as rows, in 1/Å.
func (l Lattice) Reciprocal() Mat3 { return l.recip }

// Volume returns the cell volume Ω = |a1·(a2×a3)| in Å³.
func (l Lattice) Volume() float64 { return math.Abs(l.Vectors.Det()) }

// Area returns |a1 × a2| in Å².
func (l Lattice) Area() float64 { return l.A(0).Cross(l.A(1)).Norm() }

// Height returns c = Ω/A in Å, the cell height of a sheet.
func (l Lattice) Height() float64 { return l.Volume() / l.Area() }

// Cartesian returns q = Σ f_i b_i in 1/Å for reduced coordinates f.
func (l Lattice) Cartesian(f Vec3) Vec3 { return l.recip.VecMul(f) }

// Reduced returns the reduced coordinates f_i = q·a_i/2π of a Cartesian q.
func (l Lattice) Reduced(q Vec3) Vec3 {
	return Vec3{q.Dot(l.A(0)) / (2 * math.Pi), q.Dot(l.A(1)) / (2 * math.Pi), q.Dot(l.A(2)) / (2 * math.Pi)}
}

// Point returns the lattice vector Σ n_i a_i in Å.
func (l Lattice) Point(n [3]int) Vec3 {
	return l.Vectors.VecMul(Vec3{float64(n[0]), float64(n[1]), float64(n[2])})
}

// Periodic reports how many lattice directions are periodic: 3, or 2 for a sheet.
func (l Lattice) Periodic() int {
	if l.Periodicity == Sheet {
		return 2
	}
	return 3
}
