package longrange

import (
	"fmt"
	"math"

	"lamina/grid"
)

// Charges holds the Born effective charges and the high-frequency dielectric tensor.
type Charges struct {
	// Z[κ][α][β] is the dipole component α per unit displacement β of atom κ, in e.
	Z []grid.Mat3
	// Epsilon is the high-frequency (electronic) dielectric tensor ε∞ of the cell. For a sheet it
	// is the tensor of the simulation cell, whose in-plane block gives the sheet polarizability.
	Epsilon grid.Mat3
}

// Validate checks that there is one finite charge tensor per atom of n and that Epsilon is
// finite, symmetric (to 1e-6 relative) and positive definite.
func (c Charges) Validate(n int) error {
	if len(c.Z) != n {
		return fmt.Errorf("longrange: %d Born charge tensors for %d atoms", len(c.Z), n)
	}
	for k, z := range c.Z {
		for a := 0; a < 3; a++ {
			for b := 0; b < 3; b++ {
				if math.IsNaN(z[a][b]) || math.IsInf(z[a][b], 0) {
					return fmt.Errorf("longrange: Born charge of atom %d, component [%d][%d], is not finite", k, a, b)
				}
			}
		}
	}
	e := c.Epsilon
	scale := 0.0
	for a := 0; a < 3; a++ {
		for b := 0; b < 3; b++ {
			if math.IsNaN(e[a][b]) || math.IsInf(e[a][b], 0) {
				return fmt.Errorf("longrange: epsilon[%d][%d] is not finite", a, b)
			}
			scale = math.Max(scale, math.Abs(e[a][b]))
		}
	}
	for a := 0; a < 3; a++ {
		for b := a + 1; b < 3; b++ {
			if math.Abs(e[a][b]-e[b][a]) > 1e-6*scale {
				return fmt.Errorf("longrange: epsilon is not symmetric (epsilon[%d][%d] = %g, epsilon[%d][%d] = %g)", a, b, e[a][b], b, a, e[b][a])
			}
		}
	}
	if m := minEigenSym3(e); !(m > 0) {
		return fmt.Errorf("longrange: epsilon is not positive definite (min eigenvalue %.4g)", m)
	}
	return nil
}

// Neutralize returns a copy of c whose charges sum to zero, obtained by subtracting the mean
// charge tensor from every atom, and the largest absolute component of the total charge Σ_κ Z_κ
// that was removed.
func (c Charges) Neutralize() (Charges, float64) {
	n := len(c.Z)
	out := Charges{Z: make([]grid.Mat3, n), Epsilon: c.Epsilon}
	if n == 0 {
		return out, 0
	}
	var sum grid.Mat3
	for _, z := range c.Z {
		sum = sum.Add(z)
	}
	mean := sum.Scale(1 / float64(n))
	removed := 0.0
	for a := 0; a < 3; a++ {
		for b := 0; b < 3; b++ {
			removed = math.Max(removed, math.Abs(sum[a][b]))
		}
	}
	for k, z := range c.Z {
		out.Z[k] = z.Add(mean.Scale(-1))
	}
	return out, removed
}

// minEigenSym3 returns the smallest eigenvalue of the symmetric part of m (Jacobi rotations).
func minEigenSym3(m grid.Mat3) float64 {
	var a grid.Mat3
	for i := 0; i < 3; i++ {
		for j := 0; j < 3; j++ {
			a[i][j] = (m[i][j] + m[j][i]) / 2
		}
	}
	for sweep := 0; sweep < 50; sweep++ {
		off := a[0][1]*a[0][1] + a[0][2]*a[0][2] + a[1][2]*a[1][2]
		if off < 1e-30*(a[0][0]*a[0][0]+a[1][1]*a[1][1]+a[2][2]*a[2][2]) {
			break
		}
		for p := 0; p < 2; p++ {
			for q := p + 1; q < 3; q++ {
				if a[p][q] == 0 {
					continue
				}
				theta := (a[q][q] - a[p][p]) / (2 * a[p][q])
				t := math.Copysign(1, theta) / (math.Abs(theta) + math.Sqrt(theta*theta+1))
				c := 1 / math.Sqrt(t*t+1)
				s := t * c
				for k := 0; k < 3; k++ {
					akp, akq := a[k][p], a[k][q]
					a[k][p], a[k][q] = c*akp-s*akq, s*akp+c*akq
				}
				for k := 0; k < 3; k++ {
					apk, aqk := a[p][k], a[q][k]
					a[p][k], a[q][k] = c*apk-s*aqk, s*apk+c*aqk
				}
			}
		}
	}
	return math.Min(a[0][0], math.Min(a[1][1], a[2][2]))
}
