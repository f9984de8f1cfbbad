package grid

import "math"

// maxReduceSteps bounds the reduction loops. Each step of a reduction shortens a vector of a
// discrete lattice, so the loops end long before this for any cell that NewLattice accepts; the
// bound only guards against an endless loop on a corrupted (non-finite) input.
const maxReduceSteps = 10000

// comb returns the lattice vector Σ_j c_j a_j, with a_j the rows of a.
func comb(a Mat3, c [3]int) Vec3 {
	return a.VecMul(Vec3{float64(c[0]), float64(c[1]), float64(c[2])})
}

// gaussPair Lagrange–Gauss reduces the pair of integer coefficient rows p, q (vectors
// comb(a, p), comb(a, q)) in place: afterwards |u| ≤ |v| and |u·v| ≤ |u|²/2 for u = comb(a, p),
// v = comb(a, q). Vectors are recomputed from the integer rows at every step, so rounding does
// not accumulate. A step is taken only when |u·v|/|u|² exceeds 1/2 by more than rounding: at
// exactly 1/2 (a 60° or 120° pair of equal vectors) the pair is already reduced, and stepping
// would only swap between the two equivalent choices forever.
func gaussPair(a Mat3, p, q *[3]int) {
	for step := 0; step < maxReduceSteps; step++ {
		u, v := comb(a, *p), comb(a, *q)
		if u.Dot(u) > v.Dot(v) {
			*p, *q = *q, *p
			u, v = v, u
		}
		t := u.Dot(v) / u.Dot(u)
		if !(math.Abs(t) > 0.5+1e-12) {
			return
		}
		k := int(math.Round(t))
		for j := range q {
			q[j] -= k * p[j]
		}
	}
}

// Reduce2D performs the Lagrange–Gauss reduction of the plane lattice spanned by a1 and a2 (the
// classical reduction of binary quadratic forms, restated as the two-dimensional case of the
// greedy algorithm in Nguyen & Stehlé 2009, cited at Reduce3D; from memory). It returns r with |r[0]| ≤ |r[1]| and |r[0]·r[1]| ≤ |r[0]|²/2, so that r[0] is a
// shortest non-zero lattice vector and r[1] a shortest one independent of it, and the unimodular
// integer matrix m with r[i] = Σ_j m[i][j] a_j. The orientation is kept: det m = +1 (r[1] is
// negated when needed, which leaves the pair reduced). a1 and a2 must be linearly independent.
func Reduce2D(a1, a2 Vec3) ([2]Vec3, [2][2]int) {
	a := Mat3{a1, a2, {}}
	p, q := [3]int{1, 0, 0}, [3]int{0, 1, 0}
	gaussPair(a, &p, &q)
	if p[0]*q[1]-p[1]*q[0] < 0 {
		q = [3]int{-q[0], -q[1], 0}
	}
	return [2]Vec3{comb(a, p), comb(a, q)}, [2][2]int{{p[0], p[1]}, {q[0], q[1]}}
}

// Reduce3D returns a Minkowski-reduced basis of the lattice whose basis vectors are the rows of
// a, and the unimodular integer matrix m with r_i = Σ_j m[i][j] a_j (rows r_i of the result).
//
// The method is the greedy reduction of Nguyen & Stehlé, "Low-dimensional lattice basis
// reduction revisited", ACM Trans. Algorithms 5, 46 (2009) (from memory): sort the vectors by
// length, Gauss-reduce the two shortest, replace the third by its distance vector to the closest
// point of the plane lattice they span, and repeat until the third stays the longest. In
// dimension three its output is Minkowski-reduced, so |r_1| ≤ |r_2| ≤ |r_3| are the successive
// minima of the lattice. Consequences used by Classify: a lattice with an orthogonal primitive
// basis (cubic P, tetragonal P, orthorhombic P) always comes back orthogonal, and every lattice
// symmetry maps r_1 and r_2 onto lattice vectors no longer than |r_2|.
//
// The orientation is kept (det m = +1, r_3 negated when needed). The rows of a must be linearly
// independent, as NewLattice guarantees.
func Reduce3D(a Mat3) (Mat3, [3][3]int) {
	m := [3][3]int{{1, 0, 0}, {0, 1, 0}, {0, 0, 1}}
	norm2 := func(i int) float64 { v := comb(a, m[i]); return v.Dot(v) }
	sortRows := func() {
		for i := 1; i < 3; i++ {
			for j := i; j > 0 && norm2(j) < norm2(j-1); j-- {
				m[j], m[j-1] = m[j-1], m[j]
			}
		}
	}
	for step := 0; step < maxReduceSteps; step++ {
		sortRows()
		gaussPair(a, &m[0], &m[1])
		b1, b2, b3 := comb(a, m[0]), comb(a, m[1]), comb(a, m[2])
		n1, n2 := closestInPlane(b1, b2, b3)
		for j := 0; j < 3; j++ {
			m[2][j] -= n1*m[0][j] + n2*m[1][j]
		}
		if norm2(2) >= b2.Dot(b2)*(1-1e-12) {
			break
		}
	}
	sortRows()
	var r Mat3
	for i := range r {
		r[i] = comb(a, m[i])
	}
	if m[0][0]*(m[1][1]*m[2][2]-m[1][2]*m[2][1])-m[0][1]*(m[1][0]*m[2][2]-m[1][2]*m[2][0])+m[0][2]*(m[1][0]*m[2][1]-m[1][1]*m[2][0]) < 0 {
		r[2] = row(r, 2).Scale(-1)
		for j := range m[2] {
			m[2][j] = -m[2][j]
		}
	}
	return r, m
}

// closestInPlane returns the integers (n1, n2) for which n1 b1 + n2 b2 is a point of the plane
// lattice spanned by the Gauss-reduced pair b1, b2 closest to t. It solves the 2×2 normal
// equations for the real coordinates of the projection of t and searches the integer points
// within two steps of their rounding: for a Gauss-reduced pair (angle between 60° and 120°) the
// closest point is among the immediate neighbours of that rounding, so the window is ample. The
// zero vector wins ties, so an already reduced t is left alone.
func closestInPlane(b1, b2, t Vec3) (int, int) {
	g11, g12, g22 := b1.Dot(b1), b1.Dot(b2), b2.Dot(b2)
	h1, h2 := b1.Dot(t), b2.Dot(t)
	det := g11*g22 - g12*g12
	y1 := (g22*h1 - g12*h2) / det
	y2 := (g11*h2 - g12*h1) / det
	c1, c2 := int(math.Round(y1)), int(math.Round(y2))
	best1, best2 := 0, 0
	bestD := t.Dot(t)
	for i := c1 - 2; i <= c1+2; i++ {
		for j := c2 - 2; j <= c2+2; j++ {
			d := t.Sub(b1.Scale(float64(i))).Sub(b2.Scale(float64(j)))
			if dd := d.Dot(d); dd < bestD*(1-1e-12) {
				best1, best2, bestD = i, j, dd
			}
		}
	}
	return best1, best2
}

// row returns row i of m as a vector.
func row(m Mat3, i int) Vec3 { return Vec3(m[i]) }
