package grid

import (
	"errors"
	"math"
	"math/rand/v2"
	"strings"
	"testing"
)

// latticeCase is an invented model lattice of a known type. params holds the lengths (Å) that
// the known zone distances of path_test.go are written in: a, b, c of the conventional cell.
type latticeCase struct {
	name    string
	kind    Bravais
	cell    Mat3
	p       Periodicity
	a, b, c float64
}

// catalogue lists one lattice per supported type, built from its textbook primitive vectors.
// Sheets get a3 = 15 Å along z.
func catalogue() []latticeCase {
	s3 := math.Sqrt(3)
	z := Vec3{0, 0, 15}
	cube := func(a float64) Mat3 { return Mat3{{a, 0, 0}, {0, a, 0}, {0, 0, a}} }
	fcc := func(a float64) Mat3 { h := a / 2; return Mat3{{0, h, h}, {h, 0, h}, {h, h, 0}} }
	bcc := func(a float64) Mat3 { h := a / 2; return Mat3{{-h, h, h}, {h, -h, h}, {h, h, -h}} }
	return []latticeCase{
		{"oblique", Oblique, Mat3{{3, 0, 0}, {0.7, 3.9, 0}, z}, Sheet, 3, 3.9, 0},
		{"rectangular", Rectangular, Mat3{{2.7, 0, 0}, {0, 4.1, 0}, z}, Sheet, 2.7, 4.1, 0},
		// centred rectangular with conventional 3 × 4 Å: rhombic primitive cell (b < √3 a)
		{"centred rectangular", CentredRectangular, Mat3{{1.5, 2, 0}, {1.5, -2, 0}, z}, Sheet, 3, 4, 0},
		// conventional 2 × 5 Å: b > √3 a, so the reduced cell is not rhombic
		{"centred rectangular wide", CentredRectangular, Mat3{{2, 0, 0}, {1, 2.5, 0}, z}, Sheet, 2, 5, 0},
		{"square", Square, Mat3{{3.2, 0, 0}, {0, 3.2, 0}, z}, Sheet, 3.2, 3.2, 0},
		{"hexagonal 2d", Hexagonal2D, Mat3{{2.5, 0, 0}, {-1.25, 1.25 * s3, 0}, z}, Sheet, 2.5, 2.5, 0},
		{"cubic P", CubicP, cube(3.1), Bulk, 3.1, 3.1, 3.1},
		{"cubic F", CubicF, fcc(4.2), Bulk, 4.2, 4.2, 4.2},
		{"cubic I", CubicI, bcc(3.3), Bulk, 3.3, 3.3, 3.3},
		{"hexagonal 3d", Hexagonal3D, Mat3{{2.9, 0, 0}, {-1.45, 1.45 * s3, 0}, {0, 0, 4.7}}, Bulk, 2.9, 2.9, 4.7},
		// c < a: the 6-fold axis is the shortest lattice vector
		{"hexagonal 3d short c", Hexagonal3D, Mat3{{3.6, 0, 0}, {-1.8, 1.8 * s3, 0}, {0, 0, 2.1}}, Bulk, 3.6, 3.6, 2.1},
		{"tetragonal P", TetragonalP, Mat3{{3, 0, 0}, {0, 3, 0}, {0, 0, 4.4}}, Bulk, 3, 3, 4.4},
		{"tetragonal P short c", TetragonalP, Mat3{{3, 0, 0}, {0, 3, 0}, {0, 0, 2.2}}, Bulk, 3, 3, 2.2},
		{"orthorhombic P", OrthorhombicP, Mat3{{2.8, 0, 0}, {0, 3.6, 0}, {0, 0, 4.9}}, Bulk, 2.8, 3.6, 4.9},
	}
}

func mustLattice(t testing.TB, v Mat3, p Periodicity) Lattice {
	t.Helper()
	l, err := NewLattice(v, p)
	if err != nil {
		t.Fatalf("NewLattice(%v): %v", v, err)
	}
	return l
}

// rotationMatrix returns the rotation by angle about axis (Rodrigues' formula).
func rotationMatrix(axis Vec3, angle float64) Mat3 {
	n := axis.Scale(1 / axis.Norm())
	c, s := math.Cos(angle), math.Sin(angle)
	var r Mat3
	for i := 0; i < 3; i++ {
		for j := 0; j < 3; j++ {
			r[i][j] = n[i] * n[j] * (1 - c)
			if i == j {
				r[i][j] += c
			}
		}
	}
	r[0][1] -= s * n[2]
	r[0][2] += s * n[1]
	r[1][0] += s * n[2]
	r[1][2] -= s * n[0]
	r[2][0] -= s * n[1]
	r[2][1] += s * n[0]
	return r
}

func rotateCell(r Mat3, a Mat3) Mat3 {
	return Mat3{r.MulVec(Vec3(a[0])), r.MulVec(Vec3(a[1])), r.MulVec(Vec3(a[2]))}
}

// variant is another description of the same lattice: a rotation and a change of cell.
type variant struct {
	name string
	cell Mat3
	rot  Mat3 // the rotation applied to the catalogue cell
}

// variants returns settings of c's lattice that a classification must not tell apart:
// rotations (about z only for sheets), non-reduced cells (a1 + a2), swapped and negated vectors
// (left-handed cells), random unimodular changes of cell, and for hexagonal lattices the 60°
// setting.
func variants(c latticeCase, rng *rand.Rand) []variant {
	dim := 3
	if c.p == Sheet {
		dim = 2
	}
	a := c.cell
	id := Identity()
	vs := []variant{
		{"a1+a2", Mat3{Vec3(a[0]).Add(Vec3(a[1])), a[1], a[2]}, id},
		{"swap a1 a2", Mat3{a[1], a[0], a[2]}, id},
		{"-a1", Mat3{Vec3(a[0]).Scale(-1), a[1], a[2]}, id},
		{"a2-3a1", Mat3{a[0], Vec3(a[1]).Sub(Vec3(a[0]).Scale(3)), a[2]}, id},
	}
	if c.kind == Hexagonal2D || c.kind == Hexagonal3D {
		vs = append(vs, variant{"60°", Mat3{a[0], Vec3(a[0]).Add(Vec3(a[1])), a[2]}, id})
	}
	if dim == 3 {
		vs = append(vs, variant{"a3+a1-a2", Mat3{a[0], a[1], Vec3(a[2]).Add(Vec3(a[0])).Sub(Vec3(a[1]))}, id},
			variant{"cyclic", Mat3{a[1], a[2], a[0]}, id})
	}
	for k := 0; k < 4; k++ {
		u := randomUnimodular(rng, dim, 2+2*k)
		x := transformCell(u, a)
		axis := Vec3{0, 0, 1}
		if dim == 3 {
			axis = Vec3{rng.NormFloat64(), rng.NormFloat64(), rng.NormFloat64()}
		}
		rot := rotationMatrix(axis, 2*math.Pi*rng.Float64())
		vs = append(vs, variant{"random cell", x, id}, variant{"rotated random cell", rotateCell(rot, x), rot})
	}
	return vs
}

func TestClassifyCatalogue(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 1))
	for _, c := range catalogue() {
		got, err := Classify(mustLattice(t, c.cell, c.p))
		if err != nil || got != c.kind {
			t.Errorf("Classify(%s) = %v, %v; want %v", c.name, got, err, c.kind)
		}
		for _, v := range variants(c, rng) {
			got, err := Classify(mustLattice(t, v.cell, c.p))
			if err != nil || got != c.kind {
				t.Errorf("Classify(%s, %s %v) = %v, %v; want %v", c.name, v.name, v.cell, got, err, c.kind)
			}
		}
	}
}

// A sheet is classified from a1 and a2 alone: a tilted a3 of any length changes nothing.
func TestClassifySheetIgnoresA3(t *testing.T) {
	for _, c := range catalogue() {
		if c.p != Sheet {
			continue
		}
		cell := c.cell
		cell[2] = Vec3{1.3, -0.4, 11}
		got, err := Classify(mustLattice(t, cell, Sheet))
		if err != nil || got != c.kind {
			t.Errorf("Classify(%s with tilted a3) = %v, %v; want %v", c.name, got, err, c.kind)
		}
	}
}

func TestClassifyUnsupported(t *testing.T) {
	// rhombohedral: three vectors of length 3 at α = 75° to each other, spread around z at
	// 120°; v_i·v_j = −rr²/2 + rz² = 9 cos α gives cz² = (1 + 2 cos α)/3 (derived).
	cz := math.Sqrt((1 + 2*math.Cos(75*math.Pi/180)) / 3)
	rz, rr := 3*cz, 3*math.Sqrt(1-cz*cz)
	var rho Mat3
	for i := 0; i < 3; i++ {
		phi := 2 * math.Pi * float64(i) / 3
		rho[i] = [3]float64{rr * math.Cos(phi), rr * math.Sin(phi), rz}
	}
	cases := []struct {
		name, kind string
		cell       Mat3
	}{
		{"triclinic", "triclinic", Mat3{{3.1, 0.2, -0.3}, {0.6, 3.7, 0.4}, {-0.5, 0.9, 4.4}}},
		{"monoclinic", "monoclinic", Mat3{{3, 0, 0}, {0, 4, 0}, {1.1, 0, 5}}},
		{"rhombohedral", "rhombohedral", rho},
		// body-centred tetragonal, conventional a = 3, c = 5
		{"tetragonal I", "tetragonal I", Mat3{{-1.5, 1.5, 2.5}, {1.5, -1.5, 2.5}, {1.5, 1.5, -2.5}}},
		// C-, I- and F-centred orthorhombic, conventional 3 × 4 × 5
		{"orthorhombic C", "centred orthorhombic", Mat3{{1.5, 2, 0}, {1.5, -2, 0}, {0, 0, 5}}},
		{"orthorhombic I", "centred orthorhombic", Mat3{{-1.5, 2, 2.5}, {1.5, -2, 2.5}, {1.5, 2, -2.5}}},
		{"orthorhombic F", "centred orthorhombic", Mat3{{0, 2, 2.5}, {1.5, 0, 2.5}, {1.5, 2, 0}}},
	}
	for _, c := range cases {
		l := mustLattice(t, c.cell, Bulk)
		got, err := Classify(l)
		var ue *UnsupportedLatticeError
		if got != Other || !errors.As(err, &ue) || !strings.Contains(ue.Kind, c.kind) {
			t.Errorf("Classify(%s) = %v, %v; want other with an error naming %q", c.name, got, err, c.kind)
			continue
		}
		if !strings.Contains(err.Error(), "--path") || !strings.HasPrefix(err.Error(), "grid: ") {
			t.Errorf("Classify(%s) error %q: want the grid: prefix and a --path hint", c.name, err)
		}
		if p, k, err2 := AutoPath(l); p != nil || k != Other || err2 == nil || err2.Error() != err.Error() {
			t.Errorf("AutoPath(%s) = %v, %v, %v; want nil, other, %v", c.name, p, k, err2, err)
		}
	}
}

// Departures larger than ClassifyTol lower the symmetry; smaller ones are forgiven.
func TestClassifyTolerance(t *testing.T) {
	s3 := math.Sqrt(3)
	cases := []struct {
		name string
		cell Mat3
		p    Periodicity
		want Bravais
	}{
		{"cube, c stretched 1e-7", Mat3{{3, 0, 0}, {0, 3, 0}, {0, 0, 3 * (1 + 1e-7)}}, Bulk, CubicP},
		{"cube, c stretched 1e-3", Mat3{{3, 0, 0}, {0, 3, 0}, {0, 0, 3 * (1 + 1e-3)}}, Bulk, TetragonalP},
		{"tetragonal, b stretched 1e-3", Mat3{{3, 0, 0}, {0, 3.003, 0}, {0, 0, 4.4}}, Bulk, OrthorhombicP},
		{"fcc, one vector 1e-7 longer", Mat3{{0, 2, 2}, {2, 0, 2}, {2 * (1 + 1e-7), 2 * (1 + 1e-7), 0}}, Bulk, CubicF},
		{"square, b stretched 1e-3", Mat3{{3, 0, 0}, {0, 3.003, 0}, {0, 0, 15}}, Sheet, Rectangular},
		{"hexagonal, a2 turned 1e-3 rad", Mat3{{2.5, 0, 0}, Vec3(rotationMatrix(Vec3{0, 0, 1}, 1e-3).MulVec(Vec3{-1.25, 1.25 * s3, 0})), {0, 0, 15}}, Sheet, CentredRectangular},
		{"rectangle, sheared 1e-3", Mat3{{2.7, 0, 0}, {0.0027, 4.1, 0}, {0, 0, 15}}, Sheet, Oblique},
	}
	for _, c := range cases {
		got, err := Classify(mustLattice(t, c.cell, c.p))
		if got != c.want || (err != nil) != (c.want == Other) {
			t.Errorf("Classify(%s) = %v, %v; want %v", c.name, got, err, c.want)
		}
	}
	// A 1e-3 distortion of the fcc cell leaves no cubic symmetry.
	got, _ := Classify(mustLattice(t, Mat3{{0, 2, 2}, {2, 0, 2}, {2.002, 2.002, 0}}, Bulk))
	if got == CubicF {
		t.Errorf("Classify(fcc distorted by 1e-3) = cubic F, want a lower symmetry")
	}
}

// The operations found for each lattice form a group of the known order and keep the metric.
func TestLatticePointGroups(t *testing.T) {
	// Orders of the lattice point groups (holohedries): International Tables for
	// Crystallography vol. A, from memory.
	order := map[Bravais]int{Oblique: 2, Rectangular: 4, CentredRectangular: 4, Square: 8, Hexagonal2D: 12,
		CubicP: 48, CubicF: 48, CubicI: 48, Hexagonal3D: 24, TetragonalP: 16, OrthorhombicP: 8}
	extra := []latticeCase{
		{name: "monoclinic", cell: Mat3{{3, 0, 0}, {0, 4, 0}, {1.1, 0, 5}}, p: Bulk},
		{name: "tetragonal I", cell: Mat3{{-1.5, 1.5, 2.5}, {1.5, -1.5, 2.5}, {1.5, 1.5, -2.5}}, p: Bulk},
		{name: "orthorhombic F", cell: Mat3{{0, 2, 2.5}, {1.5, 0, 2.5}, {1.5, 2, 0}}, p: Bulk},
		{name: "triclinic", cell: Mat3{{3.1, 0.2, -0.3}, {0.6, 3.7, 0.4}, {-0.5, 0.9, 4.4}}, p: Bulk},
	}
	extraOrder := map[string]int{"monoclinic": 4, "tetragonal I": 16, "orthorhombic F": 8, "triclinic": 2}
	for _, c := range append(catalogue(), extra...) {
		want, ok := order[c.kind]
		if c.kind == Other {
			want, ok = extraOrder[c.name]
		}
		if !ok {
			t.Fatalf("no order for %s", c.name)
		}
		l := mustLattice(t, c.cell, c.p)
		var r Mat3
		dim := 3
		if c.p == Sheet {
			rr, _ := Reduce2D(l.A(0), l.A(1))
			r, dim = Mat3{rr[0], rr[1], {0, 0, 1}}, 2
		} else {
			r, _ = Reduce3D(l.Vectors)
		}
		ops, _, err := symmetries(r, dim)
		if err != nil || len(ops) != want {
			t.Errorf("%s: %d operations, %v; want %d", c.name, len(ops), err, want)
			continue
		}
		set := map[[3][3]int]bool{}
		for _, op := range ops {
			set[op.w] = true
			// w G wᵀ = G for the Gram matrix G of the reduced basis (lengths and angles kept).
			for i := 0; i < 3; i++ {
				for j := 0; j < 3; j++ {
					ui, uj := comb(r, op.w[i]), comb(r, op.w[j])
					if d := ui.Dot(uj) - Vec3(r[i]).Dot(Vec3(r[j])); math.Abs(d) > 1e-9*Vec3(r[2]).Dot(Vec3(r[2])) {
						t.Errorf("%s: operation %v changes the metric by %g", c.name, op.w, d)
					}
				}
			}
		}
		for _, a := range ops {
			for _, b := range ops {
				var p [3][3]int
				for i := 0; i < 3; i++ {
					for j := 0; j < 3; j++ {
						for k := 0; k < 3; k++ {
							p[i][j] += a.w[i][k] * b.w[k][j]
						}
					}
				}
				if !set[p] {
					t.Errorf("%s: product %v · %v is not an operation (not a group)", c.name, a.w, b.w)
				}
			}
		}
	}
}

func TestBravaisString(t *testing.T) {
	seen := map[string]Bravais{}
	for b := Other; b <= OrthorhombicP; b++ {
		s := b.String()
		if prev, dup := seen[s]; dup && !(s == "hexagonal" && prev == Hexagonal2D && b == Hexagonal3D) {
			t.Errorf("%d and %d both print as %q", prev, b, s)
		}
		seen[s] = b
		if want := b >= Oblique && b <= Hexagonal2D; b.Is2D() != want {
			t.Errorf("%v.Is2D() = %v, want %v", b, b.Is2D(), want)
		}
	}
	if Hexagonal2D == Hexagonal3D || !Hexagonal2D.Is2D() || Hexagonal3D.Is2D() {
		t.Errorf("2d and 3d hexagonal not distinguishable")
	}
}
