package longrange

import (
	"math"

	"lamina/grid"
)

// latticeBall returns the vectors Σ n_i basis_i (first dims rows) of length at most radius for
// which keep (if not nil) is true. The basis is first reduced (grid.Reduce2D/Reduce3D), so the
// search box stays small even for a nearly degenerate cell; dual is unused by the search and
// kept for the callers' symmetry.
func latticeBall(basis, dual grid.Mat3, dims int, radius float64, keep func(grid.Vec3) bool) []grid.Vec3 {
	red, rdual := reducedBasis(basis, dims)
	var lim [3]int
	for i := 0; i < dims; i++ {
		lim[i] = int(math.Floor(radius*grid.Vec3(rdual[i]).Norm()/(2*math.Pi))) + 1
	}
	r2 := radius * radius
	var out []grid.Vec3
	for n0 := -lim[0]; n0 <= lim[0]; n0++ {
		for n1 := -lim[1]; n1 <= lim[1]; n1++ {
			for n2 := -lim[2]; n2 <= lim[2]; n2++ {
				v := red.VecMul(grid.Vec3{float64(n0), float64(n1), float64(n2)})
				if v.Dot(v) > r2 || (keep != nil && !keep(v)) {
					continue
				}
				out = append(out, v)
			}
		}
	}
	return out
}

// reducedBasis returns a reduced basis of the lattice spanned by the first dims rows of basis
// (other rows zero) and its dual (rows d_i with d_i·r_j = 2π δ_ij within the span).
func reducedBasis(basis grid.Mat3, dims int) (red, dual grid.Mat3) {
	if dims == 2 {
		r, _ := grid.Reduce2D(grid.Vec3(basis[0]), grid.Vec3(basis[1]))
		red[0], red[1] = r[0], r[1]
		// In-plane dual: solve with the Gram matrix.
		g00, g01, g11 := r[0].Dot(r[0]), r[0].Dot(r[1]), r[1].Dot(r[1])
		det := g00*g11 - g01*g01
		d0 := r[0].Scale(g11 / det).Sub(r[1].Scale(g01 / det))
		d1 := r[1].Scale(g00 / det).Sub(r[0].Scale(g01 / det))
		dual[0], dual[1] = d0.Scale(2*math.Pi), d1.Scale(2*math.Pi)
		return red, dual
	}
	red, _ = grid.Reduce3D(basis)
	dual = red.Inv().T().Scale(2 * math.Pi)
	return red, dual
}

// shortestVector returns the length of the shortest non-zero vector of the lattice spanned by the
// first dims rows of basis: the first vector of its reduced basis (Lagrange–Gauss in 2D,
// Minkowski-type in 3D, both of which start with a shortest vector), checked by a search of the
// ball of that radius.
func shortestVector(basis, dual grid.Mat3, dims int) float64 {
	red, _ := reducedBasis(basis, dims)
	best := grid.Vec3(red[0]).Norm()
	for _, v := range latticeBall(red, dual, dims, best*(1+1e-12), nil) {
		if n := v.Norm(); n > 0 && n < best {
			best = n
		}
	}
	return best
}

// geometry is the periodic part of a lattice that a kernel sums over: dims = 3 (bulk) or 2
// (in-plane vectors a1, a2 and their in-plane reciprocal vectors, the xy projections of b1, b2).
type geometry struct {
	dims  int
	a, b  grid.Mat3 // rows a_i and b_i, i < dims; the others zero
	qZone float64   // largest |q| of the zone folded by fold: the longest half-diagonal
}

func newGeometry(l grid.Lattice, dims int) geometry {
	g := geometry{dims: dims}
	recip := l.Reciprocal()
	for i := 0; i < dims; i++ {
		g.a[i] = l.Vectors[i]
		g.b[i] = recip[i]
		if dims == 2 {
			// b_i·a_j = 2π δ_ij for i, j ≤ 2 and a_j in-plane, so the projection keeps it.
			g.b[i][2] = 0
		}
	}
	// Corners Σ ±b_i/2 of the folded parallelepiped.
	for s := 0; s < 1<<dims; s++ {
		var c grid.Vec3
		for i := 0; i < dims; i++ {
			sign := 0.5
			if s&(1<<i) != 0 {
				sign = -0.5
			}
			c = c.Add(grid.Vec3(g.b[i]).Scale(sign))
		}
		g.qZone = math.Max(g.qZone, c.Norm())
	}
	return g
}

// gammaTol is the largest reduced-coordinate distance from a reciprocal lattice vector at which
// a q-point counts as Γ.
const gammaTol = 1e-9

// fold maps q (Cartesian, 1/Å) into the parallelepiped of reduced coordinates in [−½, ½] around
// 0 (in-plane for dims = 2: the z component of q is dropped). It reports gamma when every reduced
// coordinate lies within gammaTol of an integer, and then returns exactly 0.
func (g *geometry) fold(q grid.Vec3) (grid.Vec3, bool) {
	var f grid.Vec3
	gamma := true
	for i := 0; i < g.dims; i++ {
		x := q.Dot(grid.Vec3(g.a[i])) / (2 * math.Pi)
		f[i] = x - math.Round(x)
		if !(math.Abs(f[i]) <= gammaTol) {
			gamma = false
		}
	}
	if gamma {
		return grid.Vec3{}, true
	}
	return g.b.VecMul(f), false
}

// reciprocalList returns the reciprocal lattice vectors G of geo that a Gaussian-damped sum
// with range parameter lambda can need for any folded q: all G with √(G·ε·G) ≤ 2Λ√cut +
// √λ_max(ε)·margin, margin being the largest |q| that will be added to them. A term with
// K = q + G is then kept or dropped by its own exponent K·ε·K/4Λ² ≤ cut. eps is the metric
// (ε∞ in 3D, the identity for the sheet kernel); it must be positive definite.
func reciprocalList(geo geometry, eps grid.Mat3, lambda, cut, margin float64) []grid.Vec3 {
	re := 2*lambda*math.Sqrt(cut) + math.Sqrt(maxEigenSym3(eps))*margin
	re2 := re * re * (1 + 1e-12)
	radius := re / math.Sqrt(minEigenSym3(eps))
	return latticeBall(geo.b, geo.a, geo.dims, radius*(1+1e-12), func(g grid.Vec3) bool {
		return eps.Quad(g) <= re2
	})
}
