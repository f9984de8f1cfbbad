package ifc

import (
	"errors"
	"math"
	"math/cmplx"
	"math/rand/v2"
	"testing"

	"lamina/grid"
)

// springModel is a test-only crystal of central springs, whose C(q) is computed here directly as
// Σ_R Φ(R) exp(+i q·R) (PHYSICS.md section 3), independently of Build's transform and folding.
type springModel struct {
	s       grid.Structure
	springs []testSpring
}

type testSpring struct {
	a, b int
	cell [3]int
	k    float64
}

func (m springModel) matrix(f grid.Vec3) []complex128 {
	n := m.s.N()
	dim := 3 * n
	c := make([]complex128, dim*dim)
	q := m.s.Lattice.Cartesian(f)
	add := func(k, k2 int, r grid.Vec3, blk [3][3]float64) {
		ph := cmplx.Exp(complex(0, q.Dot(r)))
		for a := 0; a < 3; a++ {
			for b := 0; b < 3; b++ {
				c[(3*k+a)*dim+3*k2+b] += complex(blk[a][b], 0) * ph
			}
		}
	}
	for _, sp := range m.springs {
		r := m.s.Lattice.Point(sp.cell)
		d := r.Add(m.s.Atoms[sp.b].Position).Sub(m.s.Atoms[sp.a].Position)
		u := d.Scale(1 / d.Norm())
		var blk, neg [3][3]float64
		for a := 0; a < 3; a++ {
			for b := 0; b < 3; b++ {
				blk[a][b] = sp.k * u[a] * u[b]
				neg[a][b] = -blk[a][b]
			}
		}
		add(sp.a, sp.b, r, neg)
		add(sp.b, sp.a, r.Scale(-1), neg)
		add(sp.a, sp.a, grid.Vec3{}, blk)
		add(sp.b, sp.b, grid.Vec3{}, blk)
	}
	return c
}

// obliqueSheet is a skewed two-atom sheet with nearest and next-nearest springs.
func obliqueSheet(t *testing.T) springModel {
	lat, err := grid.NewLattice(grid.Mat3{{3.1, 0, 0}, {1.2, 2.9, 0}, {0, 0.4, 18}}, grid.Sheet)
	if err != nil {
		t.Fatal(err)
	}
	s := grid.Structure{Lattice: lat, Atoms: []grid.Atom{
		{Species: "A", Mass: 20, Position: grid.Vec3{0, 0, 0}},
		{Species: "B", Mass: 31, Position: grid.Vec3{1.5, 1.0, 0.4}},
	}}
	m := springModel{s: s}
	for _, c := range [][3]int{{0, 0, 0}, {-1, 0, 0}, {0, -1, 0}, {-1, 1, 0}} {
		m.springs = append(m.springs, testSpring{0, 1, c, 5 + float64(c[0]+2*c[1])})
	}
	for _, c := range [][3]int{{1, 0, 0}, {0, 1, 0}, {1, -1, 0}} {
		m.springs = append(m.springs, testSpring{0, 0, c, 2}, testSpring{1, 1, c, 1.5})
	}
	return m
}

func (m springModel) samples(mesh grid.Mesh) []Sample {
	out := make([]Sample, mesh.Len())
	for i := range out {
		f := mesh.Point(i)
		out[i] = Sample{Q: f, C: m.matrix(f)}
	}
	return out
}

func maxDiff(a, b []complex128) float64 {
	d := 0.0
	for i := range a {
		d = math.Max(d, cmplx.Abs(a[i]-b[i]))
	}
	return d
}

// The interpolation reproduces every grid matrix exactly (PHYSICS.md section 4) and, for force
// constants that fit inside the Wigner–Seitz cell of the supercell, C(q) at any q.
func TestBuildReproducesSpringModel(t *testing.T) {
	m := obliqueSheet(t)
	mesh := grid.Mesh{N: [3]int{6, 5, 1}}
	fc, err := Build(m.s, mesh, CellPhase, m.samples(mesh), Options{SumRule: SumRuleNone})
	if err != nil {
		t.Fatal(err)
	}
	ev := fc.NewEvaluator()
	// Tolerance: round-off of a 30-term Fourier sum of elements of size ~20 eV/Å².
	const tol = 1e-11
	for i := 0; i < mesh.Len(); i++ {
		f := mesh.Point(i)
		if d := maxDiff(ev.Matrix(nil, f, grid.Vec3{}), m.matrix(f)); d > tol {
			t.Errorf("grid point %v: |ΔC| = %g", f, d)
		}
	}
	rng := rand.New(rand.NewPCG(1, 2))
	for i := 0; i < 50; i++ {
		f := grid.Vec3{rng.Float64()*2 - 1, rng.Float64()*2 - 1, 0}
		if d := maxDiff(ev.Matrix(nil, f, grid.Vec3{}), m.matrix(f)); d > tol {
			t.Errorf("off-grid q %v: |ΔC| = %g", f, d)
		}
	}
	if d := fc.Diagnostics(); d.Hermiticity > 1e-12 || d.ImagPhi > 1e-12 || d.SumRule > 1e-11 {
		t.Errorf("clean input reported as noisy: %+v", d)
	}
}

// The "atom" phase convention, q written as q+G, and any order of q-points give the same model
// (PHYSICS.md section 3).
func TestBuildPhaseAndOrder(t *testing.T) {
	m := obliqueSheet(t)
	mesh := grid.Mesh{N: [3]int{4, 4, 1}}
	ref, err := Build(m.s, mesh, CellPhase, m.samples(mesh), Options{})
	if err != nil {
		t.Fatal(err)
	}
	atom := m.samples(mesh)
	rng := rand.New(rand.NewPCG(3, 4))
	rng.Shuffle(len(atom), func(i, j int) { atom[i], atom[j] = atom[j], atom[i] })
	n := m.s.N()
	for i := range atom {
		// Write the point as q + G and convert with that q: C^atom = C·exp(+i q·(τ_κ'−τ_κ)).
		atom[i].Q = atom[i].Q.Add(grid.Vec3{float64(rng.IntN(3) - 1), float64(rng.IntN(3) - 1), 0})
		c := m.matrix(atom[i].Q)
		q := m.s.Lattice.Cartesian(atom[i].Q)
		for k := 0; k < n; k++ {
			for k2 := 0; k2 < n; k2++ {
				ph := cmplx.Exp(complex(0, q.Dot(m.s.Atoms[k2].Position.Sub(m.s.Atoms[k].Position))))
				for a := 0; a < 3; a++ {
					for b := 0; b < 3; b++ {
						c[(3*k+a)*3*n+3*k2+b] *= ph
					}
				}
			}
		}
		atom[i].C = c
	}
	got, err := Build(m.s, mesh, AtomPhase, atom, Options{})
	if err != nil {
		t.Fatal(err)
	}
	e1, e2 := ref.NewEvaluator(), got.NewEvaluator()
	for _, f := range []grid.Vec3{{0.1, 0.27, 0}, {-0.4, 0.05, 0}, {0.5, 0.5, 0}} {
		if d := maxDiff(e1.Matrix(nil, f, grid.Vec3{}), e2.Matrix(nil, f, grid.Vec3{})); d > 1e-11 {
			t.Errorf("q %v: atom-phase shuffled input differs by %g", f, d)
		}
	}
}

func TestBuildGridErrors(t *testing.T) {
	m := obliqueSheet(t)
	mesh := grid.Mesh{N: [3]int{3, 3, 1}}
	full := m.samples(mesh)
	if _, err := Build(m.s, mesh, CellPhase, full[1:], Options{}); !errors.Is(err, ErrIncomplete) {
		t.Errorf("missing point: err = %v, want ErrIncomplete", err)
	}
	dup := append(append([]Sample(nil), full...), Sample{Q: grid.Vec3{1, 0, 0}, C: full[0].C})
	if _, err := Build(m.s, mesh, CellPhase, dup, Options{}); !errors.Is(err, ErrDuplicate) {
		t.Errorf("duplicate point: err = %v, want ErrDuplicate", err)
	}
	off := append([]Sample(nil), full...)
	off[2] = Sample{Q: grid.Vec3{0.2, 0, 0}, C: full[2].C}
	if _, err := Build(m.s, mesh, CellPhase, off, Options{}); !errors.Is(err, ErrOffGrid) {
		t.Errorf("off-grid point: err = %v, want ErrOffGrid", err)
	}
	// A grid far larger than the matrices given fails before allocating per grid point.
	if _, err := Build(m.s, grid.Mesh{N: [3]int{4000, 4000, 1}}, CellPhase, full, Options{}); !errors.Is(err, ErrIncomplete) {
		t.Errorf("huge grid: err = %v, want ErrIncomplete", err)
	}
	bad := append([]Sample(nil), full...)
	bad[1] = Sample{Q: full[1].Q, C: full[1].C[:5]}
	if _, err := Build(m.s, mesh, CellPhase, bad, Options{}); !errors.Is(err, ErrShape) {
		t.Errorf("short matrix: err = %v, want ErrShape", err)
	}
}

// Noise that breaks Hermiticity, time reversal and the sum rule is measured, removed, and the
// translational correction brings the three acoustic frequencies at Γ to zero (PHYSICS.md
// section 6); with no correction they stay finite.
func TestBuildNoiseAndSumRule(t *testing.T) {
	m := obliqueSheet(t)
	mesh := grid.Mesh{N: [3]int{4, 4, 1}}
	smp := m.samples(mesh)
	rng := rand.New(rand.NewPCG(5, 6))
	const noise = 1e-3
	for i := range smp {
		for j := range smp[i].C {
			smp[i].C[j] += complex(noise*(rng.Float64()-0.5), noise*(rng.Float64()-0.5))
		}
	}
	fc, err := Build(m.s, mesh, CellPhase, smp, Options{})
	if err != nil {
		t.Fatal(err)
	}
	d := fc.Diagnostics()
	if d.Hermiticity == 0 || d.Hermiticity > noise || d.TimeReversal == 0 || d.SumRule == 0 {
		t.Errorf("noise not reported: %+v", d)
	}
	f, err := fc.NewEvaluator().Frequencies(nil, grid.Vec3{}, grid.Vec3{})
	if err != nil {
		t.Fatal(err)
	}
	for _, v := range f[:3] {
		// 1e-6 THz: eigenvalues of a corrected C(0) vanish to round-off (1e-14 eV/Å² on ~30 eV/Å²).
		if math.Abs(v) > 1e-5 {
			t.Errorf("acoustic frequency at Γ with the sum rule: %g THz, want 0", v)
		}
	}
	raw, err := Build(m.s, mesh, CellPhase, smp, Options{SumRule: SumRuleNone})
	if err != nil {
		t.Fatal(err)
	}
	f, _ = raw.NewEvaluator().Frequencies(nil, grid.Vec3{}, grid.Vec3{})
	if math.Abs(f[0]) < 1e-3 && math.Abs(f[2]) < 1e-3 {
		t.Errorf("without the sum rule the noisy acoustic modes at Γ vanished: %v", f[:3])
	}
	// The corrected matrices stay Hermitian at a general q.
	c := fc.NewEvaluator().Matrix(nil, grid.Vec3{0.13, 0.31, 0}, grid.Vec3{})
	dim := 3 * m.s.N()
	for i := 0; i < dim; i++ {
		for j := 0; j < dim; j++ {
			if cmplx.Abs(c[i*dim+j]-cmplx.Conj(c[j*dim+i])) > 1e-13 {
				t.Fatalf("C(q) not Hermitian at (%d,%d)", i, j)
			}
		}
	}
}

// neighbourSprings returns a spring model with a spring between every pair of atoms closer than
// rc, found by a search over cells, with a distance-dependent constant.
func neighbourSprings(s grid.Structure, rc float64) springModel {
	m := springModel{s: s}
	n := s.N()
	const span = 40 // enough for the skewed bases below
	for a := 0; a < n; a++ {
		for b := 0; b < n; b++ {
			for i := -span; i <= span; i++ {
				for j := -span; j <= span; j++ {
					c := [3]int{i, j, 0}
					if a > b || (a == b && (i < 0 || (i == 0 && j <= 0))) {
						continue // each pair once
					}
					d := s.Lattice.Point(c).Add(s.Atoms[b].Position).Sub(s.Atoms[a].Position).Norm()
					if d > 0 && d <= rc {
						m.springs = append(m.springs, testSpring{a, b, c, 10 * math.Exp(-d)})
					}
				}
			}
		}
	}
	return m
}

// Wigner–Seitz folding needs no particular cell: the same sheet described by strongly skewed
// bases (a2' = a2 + 3a1; a1' = a1 + 3a2, a2' = 4a1 + 13a2 with a tilted a3) interpolates
// exactly too (PHYSICS.md section 4: "search enough shells for skewed cells"). Without the
// supercell reduction and the shift to the nearest image, the last basis fails.
func TestBuildSkewedCell(t *testing.T) {
	atoms := []grid.Atom{
		{Species: "A", Mass: 20, Position: grid.Vec3{0, 0, 0}},
		{Species: "B", Mass: 31, Position: grid.Vec3{1.4, 0.9, 0.3}},
	}
	a1, a2 := grid.Vec3{3, 0, 0}, grid.Vec3{0.8, 3.1, 0}
	for _, basis := range []grid.Mat3{
		{a1, a2, {0, 0, 15}},
		{a1, a2.Add(a1.Scale(3)), {0, 0, 15}},
		{a1.Add(a2.Scale(3)), a1.Scale(4).Add(a2.Scale(13)), {0.5, 0.2, 15}},
	} {
		lat, err := grid.NewLattice(basis, grid.Sheet)
		if err != nil {
			t.Fatal(err)
		}
		m := neighbourSprings(grid.Structure{Lattice: lat, Atoms: atoms}, 5.5)
		mesh := grid.Mesh{N: [3]int{6, 6, 1}}
		fc, err := Build(m.s, mesh, CellPhase, m.samples(mesh), Options{SumRule: SumRuleNone})
		if err != nil {
			t.Fatal(err)
		}
		ev := fc.NewEvaluator()
		rng := rand.New(rand.NewPCG(11, 12))
		for i := 0; i < 30; i++ {
			f := grid.Vec3{rng.Float64() - 0.5, rng.Float64() - 0.5, 0}
			// Same round-off bound as TestBuildReproducesSpringModel.
			if d := maxDiff(ev.Matrix(nil, f, grid.Vec3{}), m.matrix(f)); d > 1e-11 {
				t.Errorf("basis %v, q %v: |ΔC| = %g", basis, f, d)
			}
		}
	}
}
