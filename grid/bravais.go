package grid

import (
	"fmt"
	"math"
)

// Bravais is a Bravais lattice type: the five plane types of a sheet and the bulk types that
// have a built-in band path. Every other bulk lattice is Other.
type Bravais int

const (
	// Other is a bulk lattice of a type without a built-in path (triclinic, monoclinic,
	// rhombohedral, tetragonal I, centred orthorhombic), or one that matches no type within
	// ClassifyTol.
	Other Bravais = iota
	// Oblique is a plane lattice with no symmetry beyond the 180° rotation.
	Oblique
	// Rectangular is a primitive rectangular plane lattice (a ≠ b, 90°).
	Rectangular
	// CentredRectangular is a centred rectangular (rhombic) plane lattice.
	CentredRectangular
	// Square is the square plane lattice.
	Square
	// Hexagonal2D is the hexagonal plane lattice (a = b, 120°).
	Hexagonal2D
	// CubicP is the simple cubic lattice.
	CubicP
	// CubicF is the face-centred cubic lattice.
	CubicF
	// CubicI is the body-centred cubic lattice.
	CubicI
	// Hexagonal3D is the hexagonal bulk lattice (a = b, γ = 120°, c ⟂ a, b).
	Hexagonal3D
	// TetragonalP is the primitive tetragonal lattice.
	TetragonalP
	// OrthorhombicP is the primitive orthorhombic lattice.
	OrthorhombicP
)

// String returns the usual name of the type. Hexagonal2D and Hexagonal3D both print as
// "hexagonal"; tell them apart with Is2D.
func (b Bravais) String() string {
	switch b {
	case Oblique:
		return "oblique"
	case Rectangular:
		return "rectangular"
	case CentredRectangular:
		return "centred rectangular"
	case Square:
		return "square"
	case Hexagonal2D, Hexagonal3D:
		return "hexagonal"
	case CubicP:
		return "cubic P"
	case CubicF:
		return "cubic F"
	case CubicI:
		return "cubic I"
	case TetragonalP:
		return "tetragonal P"
	case OrthorhombicP:
		return "orthorhombic P"
	}
	return "other"
}

// Is2D reports whether b is one of the five plane lattice types.
func (b Bravais) Is2D() bool { return b >= Oblique && b <= Hexagonal2D }

// ClassifyTol is the tolerance of Classify: two lengths match when they differ by at most
// ClassifyTol relative to the larger, two angles when their cosines differ by at most ClassifyTol.
const ClassifyTol = 1e-5

// maxLatticeSearch bounds the number of lattice points Classify scans (up to the second-shortest
// reduced vector, so about 18 per unit of the ratio of the two shortest); only a cell whose two
// shortest independent vectors differ some 10⁵-fold in length reaches it.
const maxLatticeSearch = 2000000

// UnsupportedLatticeError reports a lattice whose type has no built-in band path.
type UnsupportedLatticeError struct {
	// Kind names the lattice type, e.g. "rhombohedral", "tetragonal I", "monoclinic".
	Kind string
	// Operations is the number of lattice point-group operations found within ClassifyTol.
	Operations int
}

// Error names the type and asks for an explicit path.
func (e *UnsupportedLatticeError) Error() string {
	return fmt.Sprintf("grid: %s lattice (%d point-group operations within relative tolerance %g) has no built-in band path; give one explicitly, e.g. --path \"G 0 0 0, X 0.5 0 0, ...\" (label and reduced coordinates of the input cell)",
		e.Kind, e.Operations, ClassifyTol)
}

// Classify returns the Bravais type of l. A sheet is classified from a1 and a2 alone; a bulk
// lattice of a type without a built-in path gives Other and an *UnsupportedLatticeError.
//
// Method: the cell is reduced (Reduce2D, Reduce3D), the lattice point group is found as the set
// of integer maps of the reduced basis that keep all lengths (relative ClassifyTol) and the
// cosines of all angles (absolute ClassifyTol), and its order decides the crystal family: 2, 4,
// 8, 12, 16, 24, 48 for triclinic, monoclinic, orthorhombic, rhombohedral, tetragonal,
// hexagonal, cubic lattices; 2, 4, 8, 12 for oblique, (centred) rectangular, square, hexagonal
// plane lattices (the orders of the lattice point groups, International Tables for
// Crystallography vol. A; from memory). The
// centring follows from the reduced cell: a primitive orthogonal lattice has an orthogonal
// Minkowski-reduced basis, and the number of shortest vectors separates the cubic lattices
// (6 for P, 12 for F, 8 for I). The result depends only on the lattice, not on the choice of
// primitive cell, its orientation or handedness.
func Classify(l Lattice) (Bravais, error) {
	c, err := classify(l)
	return c.kind, err
}

// conventional is a classified lattice with the conventional cell in which bzone.go tabulates
// the zone points: rows A1, A2, A3 in Cartesian Å. For cubic F and I it is the (non-primitive)
// cube; for sheets A3 = ẑ; for oblique and centred rectangular sheets it is the reduced cell.
type conventional struct {
	kind Bravais
	cell Mat3
}

func classify(l Lattice) (conventional, error) {
	if l.Periodicity == Sheet {
		return classify2D(l)
	}
	return classify3D(l)
}

// latticeVector is a lattice vector x = Σ n_i r_i of a reduced basis r.
type latticeVector struct {
	n [3]int
	x Vec3
}

// symOp is a point-group operation R of a lattice, as the integer matrix w of its action on the
// reduced basis: R r_i = Σ_j w[i][j] r_j.
type symOp struct {
	w          [3][3]int
	det, trace int
}

func sameLength(x, y float64) bool { return math.Abs(x-y) <= ClassifyTol*math.Max(x, y) }

func cosine(u, v Vec3) float64 { return u.Dot(v) / (u.Norm() * v.Norm()) }

// shortVectors lists the non-zero lattice vectors Σ n_i r_i with |x| ≤ rmax, summing over the
// first dim rows of r. The box |n_i| ≤ rmax·|r*_i|, with r*_i the dual basis (r*_i·r_j = δ_ij),
// holds every such vector since n_i = x·r*_i.
func shortVectors(r Mat3, dim int, rmax float64) ([]latticeVector, error) {
	dual := r.Inv().T()
	var nmax [3]int
	total := 1
	for i := 0; i < dim; i++ {
		nmax[i] = int(math.Floor(rmax*Vec3(dual[i]).Norm() + 1e-9))
		total *= 2*nmax[i] + 1
		if total > maxLatticeSearch {
			return nil, fmt.Errorf("grid: cell too elongated to classify (more than %d lattice points to search)", maxLatticeSearch)
		}
	}
	var out []latticeVector
	for i := -nmax[0]; i <= nmax[0]; i++ {
		for j := -nmax[1]; j <= nmax[1]; j++ {
			for k := -nmax[2]; k <= nmax[2]; k++ {
				n := [3]int{i, j, k}
				if n == [3]int{} {
					continue
				}
				if x := comb(r, n); x.Norm() <= rmax {
					out = append(out, latticeVector{n, x})
				}
			}
		}
	}
	return out, nil
}

// symmetries returns the point group of the lattice with reduced basis r (dim = 2: a plane
// lattice in r1, r2 with r3 = ẑ; dim = 3: bulk) and the lattice vectors up to |r2| it searched.
// An operation maps r1 and r2 onto lattice vectors u1, u2 of the same lengths and angle; in 3D
// it then maps r3 = α r1 + β r2 + γ r1×r2 onto α u1 + β u2 ± γ u1×u2 (the sign is det R), which
// must again be a lattice vector with the lengths and angles of r3. Every orthogonal map of
// the lattice onto itself is found once.
func symmetries(r Mat3, dim int) ([]symOp, []latticeVector, error) {
	r1, r2, r3 := row(r, 0), row(r, 1), row(r, 2)
	vecs, err := shortVectors(r, dim, r2.Norm()*(1+4*ClassifyTol))
	if err != nil {
		return nil, nil, err
	}
	var s1, s2 []latticeVector
	for _, v := range vecs {
		if sameLength(v.x.Norm(), r1.Norm()) {
			s1 = append(s1, v)
		}
		if sameLength(v.x.Norm(), r2.Norm()) {
			s2 = append(s2, v)
		}
	}
	c12 := cosine(r1, r2)
	// r3 in the frame (r1, r2, r1×r2).
	n12 := r1.Cross(r2)
	gamma := r3.Dot(n12) / n12.Dot(n12)
	p := r3.Sub(n12.Scale(gamma))
	g11, g12, g22 := r1.Dot(r1), r1.Dot(r2), r2.Dot(r2)
	h1, h2 := r1.Dot(p), r2.Dot(p)
	det := g11*g22 - g12*g12
	alpha, beta := (g22*h1-g12*h2)/det, (g11*h2-g12*h1)/det
	c13, c23 := cosine(r1, r3), cosine(r2, r3)
	dual := r.Inv().T()

	var ops []symOp
	for _, u1 := range s1 {
		for _, u2 := range s2 {
			if math.Abs(cosine(u1.x, u2.x)-c12) > ClassifyTol {
				continue
			}
			if dim == 2 {
				ops = append(ops, newSymOp([3][3]int{u1.n, u2.n, {0, 0, 1}}))
				continue
			}
			un := u1.x.Cross(u2.x)
			for _, sign := range []float64{1, -1} {
				x3 := u1.x.Scale(alpha).Add(u2.x.Scale(beta)).Add(un.Scale(sign * gamma))
				var m [3]int
				for i := range m {
					m[i] = int(math.Round(x3.Dot(Vec3(dual[i]))))
				}
				v3 := comb(r, m)
				if !sameLength(v3.Norm(), r3.Norm()) ||
					math.Abs(cosine(u1.x, v3)-c13) > ClassifyTol ||
					math.Abs(cosine(u2.x, v3)-c23) > ClassifyTol {
					continue
				}
				ops = append(ops, newSymOp([3][3]int{u1.n, u2.n, m}))
			}
		}
	}
	return ops, vecs, nil
}

func newSymOp(w [3][3]int) symOp {
	det := w[0][0]*(w[1][1]*w[2][2]-w[1][2]*w[2][1]) -
		w[0][1]*(w[1][0]*w[2][2]-w[1][2]*w[2][0]) +
		w[0][2]*(w[1][0]*w[2][1]-w[1][1]*w[2][0])
	return symOp{w: w, det: det, trace: w[0][0] + w[1][1] + w[2][2]}
}

// axis returns the primitive integer coordinates n (in the reduced basis) of the lattice vector
// along the rotation axis of op, the solution of wᵀn = n, or the zero vector for the identity.
func (op symOp) axis() [3]int {
	var a [3][3]int // rows of wᵀ − 1
	for j := 0; j < 3; j++ {
		for i := 0; i < 3; i++ {
			a[j][i] = op.w[i][j]
		}
		a[j][j]--
	}
	for _, pr := range [3][2]int{{0, 1}, {0, 2}, {1, 2}} {
		u, v := a[pr[0]], a[pr[1]]
		c := [3]int{u[1]*v[2] - u[2]*v[1], u[2]*v[0] - u[0]*v[2], u[0]*v[1] - u[1]*v[0]}
		if c == [3]int{} {
			continue
		}
		g := gcdInt(gcdInt(absInt(c[0]), absInt(c[1])), absInt(c[2]))
		return [3]int{c[0] / g, c[1] / g, c[2] / g}
	}
	return [3]int{}
}

func absInt(i int) int {
	if i < 0 {
		return -i
	}
	return i
}

func gcdInt(a, b int) int {
	for b != 0 {
		a, b = b, a%b
	}
	return a
}

// rotationAxes returns the lattice vectors along the axes of the proper rotations of ops whose
// trace (1 + 2 cos θ) is trace, one per line.
func rotationAxes(r Mat3, ops []symOp, trace int) []Vec3 {
	var axes []Vec3
	for _, op := range ops {
		if op.det != 1 || op.trace != trace {
			continue
		}
		x := comb(r, op.axis())
		if x.Norm() == 0 {
			continue
		}
		dup := false
		for _, y := range axes {
			dup = dup || math.Abs(cosine(x, y)) > 1-ClassifyTol
		}
		if !dup {
			axes = append(axes, x)
		}
	}
	return axes
}

// pick returns the preferred one of several equivalent choices of a lattice vector. coords
// gives its integer coordinates (a lattice vector in the input basis, or a reciprocal lattice
// vector in the input reciprocal basis); the order is: fewest non-zero coordinates, smallest
// sum of their magnitudes, fewest negative ones, closest in direction to along (a Cartesian
// hint), a positive first non-zero coordinate, then the lowest index of that coordinate. Among
// equivalent choices this prefers the input's own basis vectors and, for a cell in a textbook
// orientation, the textbook axes, so that such a cell gets the textbook reduced coordinates. It
// only ever chooses between settings related by a lattice symmetry.
func pick(cands []Vec3, coords func(Vec3) Vec3, along Vec3) Vec3 {
	type key [6]float64
	keyOf := func(x Vec3) key {
		var k key
		first := -1
		for i, v := range coords(x) {
			v = math.Round(v)
			if v == 0 {
				continue
			}
			k[0]++
			k[1] += math.Abs(v)
			if v < 0 {
				k[2]++
			}
			if first < 0 {
				first = i
				if v < 0 {
					k[4] = 1
				}
			}
		}
		// Rounded so that directions equal up to rounding tie.
		k[3] = -math.Round(cosine(x, along)*1e9) / 1e9
		k[5] = float64(first)
		return k
	}
	less := func(a, b key) bool {
		for i := range a {
			if a[i] != b[i] {
				return a[i] < b[i]
			}
		}
		return false
	}
	best, bestKey := cands[0], keyOf(cands[0])
	for _, x := range cands[1:] {
		if k := keyOf(x); less(k, bestKey) {
			best, bestKey = x, k
		}
	}
	return best
}

// directCoords returns the coordinates of a lattice vector x in the basis of l: n_i = x·b_i/2π.
func directCoords(l Lattice) func(Vec3) Vec3 {
	b := l.Reciprocal()
	return func(x Vec3) Vec3 {
		return Vec3{x.Dot(row(b, 0)), x.Dot(row(b, 1)), x.Dot(row(b, 2))}.Scale(1 / (2 * math.Pi))
	}
}

// signs returns ±v for each v.
func signs(vs ...Vec3) []Vec3 {
	var out []Vec3
	for _, v := range vs {
		out = append(out, v, v.Scale(-1))
	}
	return out
}

// shortest returns the vectors of vecs as short as the shortest one that passes keep.
func shortest(vecs []latticeVector, keep func(Vec3) bool) []Vec3 {
	min := math.Inf(1)
	for _, v := range vecs {
		if keep(v.x) {
			min = math.Min(min, v.x.Norm())
		}
	}
	var out []Vec3
	for _, v := range vecs {
		if keep(v.x) && sameLength(v.x.Norm(), min) {
			out = append(out, v.x)
		}
	}
	return out
}

func orthogonal(vs ...Vec3) bool {
	for i := range vs {
		for j := i + 1; j < len(vs); j++ {
			if math.Abs(cosine(vs[i], vs[j])) > ClassifyTol {
				return false
			}
		}
	}
	return true
}

func unrecognised(n int) (conventional, error) {
	return conventional{kind: Other}, &UnsupportedLatticeError{Kind: "unrecognised (near-symmetries within tolerance do not form a point group)", Operations: n}
}

func classify3D(l Lattice) (conventional, error) {
	r, _ := Reduce3D(l.Vectors)
	ops, vecs, err := symmetries(r, 3)
	if err != nil {
		return conventional{kind: Other}, err
	}
	n := len(ops)
	unsupported := func(kind string) (conventional, error) {
		return conventional{kind: Other}, &UnsupportedLatticeError{Kind: kind, Operations: n}
	}
	orth := orthogonal(row(r, 0), row(r, 1), row(r, 2))
	coords := directCoords(l)
	switch n {
	case 48:
		return cubic(l, r, ops, vecs)
	case 24:
		return hexagonal3D(l, r, ops, vecs)
	case 16:
		if !orth {
			return unsupported("tetragonal I")
		}
		l0, l1, l2 := row(r, 0).Norm(), row(r, 1).Norm(), row(r, 2).Norm()
		var u, v, c Vec3 // the equal pair and the odd axis
		switch {
		case sameLength(l0, l1) && !sameLength(l1, l2):
			u, v, c = row(r, 0), row(r, 1), row(r, 2)
		case sameLength(l1, l2) && !sameLength(l0, l1):
			u, v, c = row(r, 1), row(r, 2), row(r, 0)
		default:
			return unrecognised(n)
		}
		a1 := pick(signs(u, v), coords, Vec3{1, 0, 0})
		other := v
		if math.Abs(cosine(a1, v)) > 0.5 {
			other = u
		}
		a2 := pick(signs(other), coords, Vec3{0, 1, 0})
		return conventional{TetragonalP, Mat3{a1, a2, pick(signs(c), coords, Vec3{0, 0, 1})}}, nil
	case 12:
		return unsupported("rhombohedral")
	case 8:
		if orth {
			return conventional{OrthorhombicP, Mat3{pick(signs(row(r, 0)), coords, Vec3{1, 1, 1}), pick(signs(row(r, 1)), coords, Vec3{1, 1, 1}), pick(signs(row(r, 2)), coords, Vec3{1, 1, 1})}}, nil
		}
		return unsupported("centred orthorhombic (C, I or F)")
	case 4:
		return unsupported("monoclinic")
	case 2:
		return unsupported("triclinic")
	}
	return unrecognised(n)
}

// cubic sets up the cube of a cubic lattice: its edges are the shortest lattice vectors along
// the three 4-fold axes (length a for P, F and I alike), and the cell volume a³, a³/4 or a³/2
// must agree with the centring read from the number of shortest vectors.
func cubic(l Lattice, r Mat3, ops []symOp, vecs []latticeVector) (conventional, error) {
	nShort := 0
	for _, v := range vecs {
		if sameLength(v.x.Norm(), row(r, 0).Norm()) {
			nShort++
		}
	}
	var kind Bravais
	var perCube float64 // primitive cells per cube
	switch nShort {
	case 6:
		kind, perCube = CubicP, 1
	case 12:
		kind, perCube = CubicF, 4
	case 8:
		kind, perCube = CubicI, 2
	default:
		return unrecognised(len(ops))
	}
	axes := rotationAxes(r, ops, 1)
	if len(axes) != 3 || !orthogonal(axes...) {
		return unrecognised(len(ops))
	}
	a := axes[0].Norm()
	if !sameLength(a*a*a, perCube*l.Volume()) {
		return unrecognised(len(ops))
	}
	coords := directCoords(l)
	cands := signs(axes...)
	x := pick(cands, coords, Vec3{1, 0, 0})
	var rest []Vec3
	for _, v := range cands {
		if math.Abs(cosine(v, x)) < 0.5 {
			rest = append(rest, v)
		}
	}
	y := pick(rest, coords, Vec3{0, 1, 0})
	return conventional{kind, Mat3{x, y, x.Cross(y).Scale(1 / a)}}, nil
}

// hexagonal3D sets up the hexagonal cell: A3 the shortest lattice vector along the 6-fold axis,
// A1 a shortest lattice vector perpendicular to it and A2 the lattice vector at 120° from A1 with
// (A1×A2)·A3 > 0.
func hexagonal3D(l Lattice, r Mat3, ops []symOp, vecs []latticeVector) (conventional, error) {
	axes := rotationAxes(r, ops, 2)
	if len(axes) != 1 {
		return unrecognised(len(ops))
	}
	coords := directCoords(l)
	c := pick(signs(axes[0]), coords, Vec3{0, 0, 1})
	plane := shortest(vecs, func(x Vec3) bool { return math.Abs(cosine(x, c)) <= ClassifyTol })
	if len(plane) == 0 {
		return unrecognised(len(ops))
	}
	a1 := pick(plane, coords, Vec3{1, 0, 0})
	a2, ok := partner120(a1, c, vecs)
	if !ok {
		return unrecognised(len(ops))
	}
	return conventional{Hexagonal3D, Mat3{a1, a2, c}}, nil
}

// partner120 returns the lattice vector of vecs as long as a1, at 120° from it, with
// (a1×a2)·n > 0.
func partner120(a1, n Vec3, vecs []latticeVector) (Vec3, bool) {
	for _, v := range vecs {
		if sameLength(v.x.Norm(), a1.Norm()) && math.Abs(cosine(a1, v.x)+0.5) <= ClassifyTol && a1.Cross(v.x).Dot(n) > 0 {
			return v.x, true
		}
	}
	return Vec3{}, false
}

func classify2D(l Lattice) (conventional, error) {
	rr, _ := Reduce2D(l.A(0), l.A(1))
	z := Vec3{0, 0, 1}
	r := Mat3{rr[0], rr[1], z}
	ops, vecs, err := symmetries(r, 2)
	if err != nil {
		return conventional{kind: Other}, err
	}
	orth := orthogonal(rr[0], rr[1])
	coords := directCoords(l)
	all := func(Vec3) bool { return true }
	switch len(ops) {
	case 12:
		a1 := pick(shortest(vecs, all), coords, Vec3{1, 0, 0})
		if a2, ok := partner120(a1, z, vecs); ok {
			return conventional{Hexagonal2D, Mat3{a1, a2, z}}, nil
		}
	case 8:
		if orth {
			a1 := pick(shortest(vecs, all), coords, Vec3{1, 0, 0})
			a2 := pick(shortest(vecs, func(x Vec3) bool { return math.Abs(cosine(x, a1)) <= ClassifyTol }), coords, Vec3{0, 1, 0})
			return conventional{Square, Mat3{a1, a2, z}}, nil
		}
	case 4:
		if orth {
			return conventional{Rectangular, Mat3{pick(signs(rr[0]), coords, Vec3{1, 1, 1}), pick(signs(rr[1]), coords, Vec3{1, 1, 1}), z}}, nil
		}
		return conventional{CentredRectangular, r}, nil
	case 2:
		return conventional{Oblique, r}, nil
	}
	return unrecognised(len(ops))
}
