package grid

import (
	"math"
	"strings"
)

// zonePoint is a labelled point of the first Brillouin zone, Cartesian, 1/Å.
type zonePoint struct {
	label string
	q     Vec3
}

// zoneTable returns, for a lattice type with a tabulated zone, its special points as reduced
// coordinates of the reciprocal basis of the conventional cell of bravais.go (B_i·A_j = 2π δ_ij)
// and its default route ("|" marks a break). All are the textbook points, each checked by the
// tests to lie on the zone surface (face centres, edge midpoints, vertices) at its known
// distance from Γ:
//
//	square:        X = ½B1 (edge centre), M = ½(B1+B2) (corner)
//	rectangular:   X = ½B1 along the shorter real axis a (so |X| = π/a > |Y| = π/b), Y = ½B2, S = ½(B1+B2)
//	hexagonal 2d:  M = ½B1 (edge centre), K = ⅓(B1+B2) (corner), A1, A2 at 120°
//	cubic P:       X = (0,½,0) face, M = (½,½,0) edge, R = (½,½,½) corner, in units of 2π/a
//	cubic F:       X = (0,1,0) square face, L = (½,½,½) hexagonal face, W = (½,1,0) corner,
//	               K = (¾,¾,0) hexagon–hexagon edge, U = (¼,1,¼) square–hexagon edge, in 2π/a of the cube
//	cubic I:       H = (0,0,1) 4-face corner, N = (½,0,½) face, P = (½,½,½) 3-face corner, in 2π/a of the cube
//	hexagonal 3d:  M, K as in 2d, A = ½B3, L = M + A, H = K + A
//	tetragonal P:  X = ½B2, M = ½(B1+B2), Z = ½B3, R = X + Z, A = M + Z (c the odd axis)
//	orthorhombic P (a < b < c): X, Y, Z = ½B1, ½B2, ½B3, S = X+Y, U = X+Z, T = Y+Z, R = X+Y+Z
//
// Points joined by a segment that avoids Γ share a zone face or edge, so the segment runs on the
// zone surface (also a test).
func zoneTable(kind Bravais) (map[string]Vec3, string) {
	const h, t, q = 1.0 / 2, 1.0 / 3, 1.0 / 4
	switch kind {
	case Square:
		return map[string]Vec3{"X": {h, 0, 0}, "M": {h, h, 0}}, "G X M G"
	case Rectangular:
		return map[string]Vec3{"X": {h, 0, 0}, "Y": {0, h, 0}, "S": {h, h, 0}}, "G X S Y G S"
	case Hexagonal2D:
		return map[string]Vec3{"M": {h, 0, 0}, "K": {t, t, 0}}, "G M K G"
	case CubicP:
		return map[string]Vec3{"X": {0, h, 0}, "M": {h, h, 0}, "R": {h, h, h}}, "G X M G R X | M R"
	case CubicF:
		return map[string]Vec3{"X": {0, 1, 0}, "W": {h, 1, 0}, "K": {3 * q, 3 * q, 0}, "L": {h, h, h}, "U": {q, 1, q}},
			"G X W K G L U W L K | U X"
	case CubicI:
		return map[string]Vec3{"H": {0, 0, 1}, "N": {h, 0, h}, "P": {h, h, h}}, "G H N G P H | P N"
	case Hexagonal3D:
		return map[string]Vec3{"M": {h, 0, 0}, "K": {t, t, 0}, "A": {0, 0, h}, "L": {h, 0, h}, "H": {t, t, h}},
			"G M K G A L H A | L M | K H"
	case TetragonalP:
		return map[string]Vec3{"X": {0, h, 0}, "M": {h, h, 0}, "Z": {0, 0, h}, "R": {0, h, h}, "A": {h, h, h}},
			"G X M G Z R A Z | X R | M A"
	case OrthorhombicP:
		return map[string]Vec3{"X": {h, 0, 0}, "Y": {0, h, 0}, "Z": {0, 0, h}, "S": {h, h, 0},
			"U": {h, 0, h}, "T": {0, h, h}, "R": {h, h, h}}, "G X S Y G Z U R T Z | Y T | U X | S R"
	}
	return nil, ""
}

// zonePath returns the default path of a classified lattice as pieces of labelled Cartesian
// points. The lattice l (the input cell) only settles the choice among equivalent settings (see
// pick).
func (c conventional) zonePath(l Lattice) [][]zonePoint {
	b := c.cell.Inv().T().Scale(2 * math.Pi)
	var pts map[string]Vec3
	var route string
	switch c.kind {
	case Oblique:
		pts, route = obliqueZone(row(b, 0), row(b, 1), l.Reduced)
	case CentredRectangular:
		pts, route = centredRectangularZone(row(b, 0), row(b, 1), l.Reduced)
	default:
		frac, r := zoneTable(c.kind)
		pts, route = make(map[string]Vec3, len(frac)), r
		for k, f := range frac {
			pts[k] = b.VecMul(f)
		}
	}
	pts["G"] = Vec3{}
	var out [][]zonePoint
	for _, piece := range strings.Split(route, "|") {
		var p []zonePoint
		for _, label := range strings.Fields(piece) {
			p = append(p, zonePoint{label, pts[label]})
		}
		out = append(out, p)
	}
	return out
}

// superbase2D returns an obtuse superbase of the plane lattice spanned by b1 and b2, sorted by
// length: s0 + s1 + s2 = 0 and s_i·s_j ≤ 0 for i ≠ j. Its six vectors ±s_i are the neighbours
// whose bisectors bound the Wigner–Seitz cell, a hexagon with the edge facing s_i between the
// vertices equidistant from (0, s_i, −s_j) for the two j ≠ i (Conway & Sloane, "Low-dimensional
// lattices. VI. Voronoi reduction of three-dimensional lattices", Proc. R. Soc. Lond. A 436, 55
// (1992), whose two-dimensional case this is; from memory). A Gauss-reduced pair p, q with
// p·q ≤ 0 gives it as (p, q, −p−q).
func superbase2D(b1, b2 Vec3) [3]Vec3 {
	r, _ := Reduce2D(b1, b2)
	p, q := r[0], r[1]
	if p.Dot(q) > 0 {
		q = q.Scale(-1)
	}
	s := [3]Vec3{p, q, p.Add(q).Scale(-1)}
	for i := 1; i < 3; i++ {
		for j := i; j > 0 && s[j].Norm() < s[j-1].Norm(); j-- {
			s[j], s[j-1] = s[j-1], s[j]
		}
	}
	return s
}

// circumcentre returns the point of the plane of u and v equidistant from 0, u and v: x·u = |u|²/2
// and x·v = |v|²/2 with x = αu + βv.
func circumcentre(u, v Vec3) Vec3 {
	uu, uv, vv := u.Dot(u), u.Dot(v), v.Dot(v)
	det := uu*vv - uv*uv
	alpha := (vv*uu/2 - uv*vv/2) / det
	beta := (uu*vv/2 - uv*uu/2) / det
	return u.Scale(alpha).Add(v.Scale(beta))
}

// obliqueZone returns the special points of an oblique plane lattice with reciprocal vectors b1,
// b2, built from its hexagonal Brillouin zone. With the obtuse superbase (s0, s1, s2) sorted by
// length, g1 = s0 and g2 = s1 (so g1 + g2 = −s2, the longest):
//
//	X  = g1/2, the centre of the edge facing the shortest reciprocal vector
//	Y  = g2/2, the centre of the edge facing the second shortest
//	S  = (g1+g2)/2, the centre of the third edge (it shrinks to the corner S of the rectangular
//	     zone as the lattice becomes rectangular, hence the label)
//	H1 = the vertex between the X and S edges, H2 = the vertex between the S and Y edges
//
// The route G–X–H1–S–H2–Y–G runs out to the zone boundary and along half of it (the other half
// follows by inversion, the only symmetry).
//
// Of the two settings related by inversion, the one pick prefers for g1 (coords gives the
// reduced coordinates of a reciprocal lattice vector in the input cell) is taken.
func obliqueZone(b1, b2 Vec3, coords func(Vec3) Vec3) (map[string]Vec3, string) {
	s := superbase2D(b1, b2)
	g1, g2 := s[0], s[1]
	if pick(signs(g1), coords, Vec3{1, 1, 1}) != g1 {
		g1, g2 = g1.Scale(-1), g2.Scale(-1)
	}
	g12 := g1.Add(g2)
	return map[string]Vec3{
		"X":  g1.Scale(0.5),
		"Y":  g2.Scale(0.5),
		"S":  g12.Scale(0.5),
		"H1": circumcentre(g1, g12),
		"H2": circumcentre(g12, g2),
	}, "G X H1 S H2 Y G"
}

// centredRectangularZone returns the special points of a centred rectangular plane lattice. Two
// vectors p, q of its obtuse superbase have equal length (the mirror swaps them, ordered so that
// (p×q)_z > 0) and the third is −(p+q). The zone is a hexagon with mirror lines along p+q and
// perpendicular to it:
//
//	Y  = (p+q)/2, the centre of the edge crossed by the mirror line along p+q
//	X  = q/2, the centre of one of the four equivalent slanted edges
//	K  = the vertex joining the Y edge and the X edge
//	K1 = the other end of the X edge, on the second mirror line (equivalent to K by a mirror
//	     and a reciprocal lattice vector, but reached along a different line from Γ)
//
// The route G–Y–K–X–K1–G is the boundary of the irreducible quarter of the zone. Of the two
// settings related by inversion, the one pick prefers for q is taken.
func centredRectangularZone(b1, b2 Vec3, coords func(Vec3) Vec3) (map[string]Vec3, string) {
	s := superbase2D(b1, b2)
	var p, q Vec3
	if s[1].Norm()-s[0].Norm() < s[2].Norm()-s[1].Norm() {
		p, q = s[0], s[1]
	} else {
		p, q = s[1], s[2]
	}
	if p.Cross(q)[2] < 0 {
		p, q = q, p
	}
	if pick(signs(q), coords, Vec3{1, 1, 1}) != q {
		p, q = p.Scale(-1), q.Scale(-1)
	}
	pq := p.Add(q)
	return map[string]Vec3{
		"Y":  pq.Scale(0.5),
		"X":  q.Scale(0.5),
		"K":  circumcentre(pq, q),
		"K1": circumcentre(q, p.Scale(-1)),
	}, "G Y K X K1 G"
}
