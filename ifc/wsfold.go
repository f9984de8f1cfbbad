package ifc

import (
	"math"

	"lamina/grid"
)

// Wigner–Seitz folding tolerances: images whose atom–atom distance is within
// wsRelTol·d_min + wsAbsTol of the shortest one are kept (PHYSICS.md section 4).
const (
	wsRelTol = 1e-5
	wsAbsTol = 1e-6 // Å
)

// wsImage is one Wigner–Seitz image R+T of a supercell vector R for an atom pair.
type wsImage struct {
	cell   [3]int // integer coordinates of R+T in units of a1, a2, a3
	weight float64
}

// superBasis returns the integer coefficients (rows, in units of a_i) of a reduced basis of the
// supercell lattice spanned by n_i a_i (periodic directions only), so that a small search of
// images is enough also for skewed cells (grid.Reduce2D / grid.Reduce3D).
func superBasis(l grid.Lattice, mesh grid.Mesh) [][3]int {
	var sup grid.Mat3
	for i := 0; i < 3; i++ {
		sup[i] = l.A(i).Scale(float64(mesh.N[i]))
	}
	if l.Periodic() == 2 {
		_, m := grid.Reduce2D(grid.Vec3(sup[0]), grid.Vec3(sup[1]))
		out := make([][3]int, 2)
		for i := 0; i < 2; i++ {
			for j := 0; j < 2; j++ {
				out[i][j] = m[i][j] * mesh.N[j]
			}
		}
		return out
	}
	_, m := grid.Reduce3D(sup)
	out := make([][3]int, 3)
	for i := 0; i < 3; i++ {
		for j := 0; j < 3; j++ {
			out[i][j] = m[i][j] * mesh.N[j]
		}
	}
	return out
}

// wsShells is how many multiples of each reduced supercell vector the image search spans.
const wsShells = 2

// foldImages returns the Wigner–Seitz images of R (integer coordinates) for atoms at τ, τ'
// (Cartesian), with their weights. R is first shifted by the supercell vector that brings
// R + τ' − τ nearest to the origin in the reduced basis, then a small box of images is searched.
func foldImages(l grid.Lattice, basis [][3]int, r [3]int, tau, tau2 grid.Vec3, dst []wsImage) []wsImage {
	dst = dst[:0]
	p := len(basis)
	bv := make([]grid.Vec3, p)
	for i := range bv {
		bv[i] = l.Point(basis[i])
	}
	// Solve the Gram system for the coefficients of v in the reduced basis and round them.
	v := l.Point(r).Add(tau2).Sub(tau)
	shift := nearestCoefficients(bv, v)
	for i := 0; i < p; i++ {
		for d := 0; d < 3; d++ {
			r[d] -= shift[i] * basis[i][d]
		}
	}
	type cand struct {
		c [3]int
		d float64
	}
	var cands [125]cand // (2·wsShells+1)^3
	nc := 0
	dmin := math.Inf(1)
	var coef [3]int
	for coef[0] = -wsShells; coef[0] <= wsShells; coef[0]++ {
		for coef[1] = -wsShells; coef[1] <= wsShells; coef[1]++ {
			for coef[2] = -wsShells; coef[2] <= wsShells; coef[2]++ {
				if p < 3 && coef[2] != 0 {
					continue
				}
				c := r
				for i := 0; i < p; i++ {
					for d := 0; d < 3; d++ {
						c[d] += coef[i] * basis[i][d]
					}
				}
				dd := l.Point(c).Add(tau2).Sub(tau).Norm()
				cands[nc] = cand{c, dd}
				nc++
				dmin = math.Min(dmin, dd)
			}
		}
	}
	lim := dmin + wsRelTol*dmin + wsAbsTol
	for _, c := range cands[:nc] {
		if c.d <= lim {
			dst = append(dst, wsImage{cell: c.c})
		}
	}
	w := 1 / float64(len(dst))
	for i := range dst {
		dst[i].weight = w
	}
	return dst
}

// nearestCoefficients returns round(c) where Σ c_i b_i is the projection of v on span(b).
func nearestCoefficients(b []grid.Vec3, v grid.Vec3) [3]int {
	var out [3]int
	switch len(b) {
	case 2:
		g00, g01, g11 := b[0].Dot(b[0]), b[0].Dot(b[1]), b[1].Dot(b[1])
		r0, r1 := b[0].Dot(v), b[1].Dot(v)
		det := g00*g11 - g01*g01
		out[0] = int(math.Round((g11*r0 - g01*r1) / det))
		out[1] = int(math.Round((g00*r1 - g01*r0) / det))
	case 3:
		m := grid.Mat3{b[0], b[1], b[2]} // rows b_i; v = cᵀ m  =>  c = v m⁻¹
		c := m.Inv().VecMul(v)
		for i := range c {
			out[i] = int(math.Round(c[i]))
		}
	}
	return out
}
