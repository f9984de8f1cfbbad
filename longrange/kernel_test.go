package longrange

import (
	"math"
	"math/cmplx"
	"strings"
	"testing"

	"lamina/grid"
	"lamina/grid/units"
)

// Invented test crystals (no real materials): labels A, B, C, made-up masses and charges.

// hexSheet is a two-atom hexagonal sheet, a = 3 Å, B above A by buckle Å, with Z_A = z and
// Z_B = −z (neutral), cell height 15 Å.
func hexSheet(t testing.TB, buckle float64, z grid.Mat3, eps grid.Mat3) (grid.Structure, Charges) {
	const a = 3.0
	l := mustLattice(t, grid.Mat3{{a, 0, 0}, {a / 2, a * math.Sqrt(3) / 2, 0}, {0, 0, 15}}, grid.Sheet)
	b := l.A(0).Add(l.A(1)).Scale(1.0 / 3)
	b[2] = buckle
	s := grid.Structure{Lattice: l, Atoms: []grid.Atom{
		{Species: "A", Mass: 11, Position: grid.Vec3{0, 0, 0}},
		{Species: "B", Mass: 17, Position: b},
	}}
	return s, Charges{Z: []grid.Mat3{z, z.Scale(-1)}, Epsilon: eps}
}

// isoZ is an isotropic Born charge Z·1.
func isoZ(z float64) grid.Mat3 { return grid.Identity().Scale(z) }

// generalZ is a non-symmetric Born charge with all nine components non-zero.
var generalZ = grid.Mat3{{1.9, 0.35, -0.2}, {-0.15, 2.3, 0.4}, {0.25, -0.3, 0.8}}

// triclinic3D is a three-atom triclinic crystal with anisotropic ε∞ (off-diagonal components,
// eigenvalues about 2.4–4.6) and non-symmetric, neutral Born charges.
func triclinic3D(t testing.TB) (grid.Structure, Charges) {
	l := mustLattice(t, grid.Mat3{{4.0, 0, 0}, {0.7, 4.3, 0}, {-0.5, 0.4, 4.6}}, grid.Bulk)
	s := grid.Structure{Lattice: l, Atoms: []grid.Atom{
		{Species: "A", Mass: 23, Position: grid.Vec3{0, 0, 0}},
		{Species: "B", Mass: 31, Position: grid.Vec3{1.9, 1.1, 0.8}},
		{Species: "C", Mass: 7, Position: grid.Vec3{2.8, 3.0, 2.9}},
	}}
	z1 := grid.Mat3{{2.1, 0.3, -0.4}, {-0.2, 1.7, 0.5}, {0.6, -0.1, 2.4}}
	z2 := grid.Mat3{{-1.2, 0.45, 0.1}, {0.3, -0.8, -0.35}, {-0.25, 0.5, -1.6}}
	z3 := z1.Add(z2).Scale(-1)
	eps := grid.Mat3{{3.0, 0.4, -0.2}, {0.4, 4.5, 0.3}, {-0.2, 0.3, 2.5}}
	return s, Charges{Z: []grid.Mat3{z1, z2, z3}, Epsilon: eps}
}

func mustKernel(t testing.TB, s grid.Structure, c Charges, mesh grid.Mesh, k Kind, opts ...Option) *Kernel {
	t.Helper()
	kn, err := New(s, c, mesh, k, opts...)
	if err != nil {
		t.Fatalf("New(%v): %v", k, err)
	}
	return kn
}

// lr returns C^LR(q) as a new matrix.
func lr(k *Kernel, q, dir grid.Vec3) []complex128 {
	m := 3 * len(k.tau)
	dst := make([]complex128, m*m)
	k.Add(dst, q, dir, 1)
	return dst
}

// maxAbs returns the largest modulus in a.
func maxAbs(a []complex128) float64 {
	var m float64
	for _, v := range a {
		m = math.Max(m, cmplx.Abs(v))
	}
	return m
}

// relDiff returns max|a − b| / max|b|.
func relDiff(a, b []complex128) float64 {
	var d float64
	for i := range a {
		d = math.Max(d, cmplx.Abs(a[i]-b[i]))
	}
	return d / maxAbs(b)
}

// shortRange is the test's own real-space sum of the short-range remainder of the dipole–dipole
// force constants, written from Φ_{κα,κ'β}(R) = −k_e Z_κᵀ [∂∂ f](d) Z_κ', d = R + τ_κ' − τ_κ,
// with f(r) = erfc(Λ·√(r·ε⁻¹·r)) / (√det ε · √(r·ε⁻¹·r)) (Gonze & Lee 1997's real-space term;
// ε = 1 for the sheet kernel) and, with u = ε⁻¹d and ρ = √(d·u),
//
//	∂_a∂_b f = [u_a u_b C(ρ) − (ε⁻¹)_ab B(ρ)] / √det ε,
//	B(ρ) = [erfc(Λρ)/ρ + (2Λ/√π) e^{−Λ²ρ²}] / ρ²,
//	C(ρ) = [3 erfc(Λρ)/ρ + (2Λ/√π)(3 + 2Λ²ρ²) e^{−Λ²ρ²}] / ρ⁴
//
// (derived: second derivatives of erfc(Λρ)/ρ). It returns Σ_{(κ',R)≠(κ,0)} Φ e^{iq·R} minus the
// acoustic-sum-rule constant built from T_κ = Σ_{κ',R} Φ the same way as the kernel's
// (symmetric part of T_κ on the diagonal block, (A_κ − A_κ')/N off it), which is linear in T, so
// that kernel + remainder is the full dipole sum with the physical on-site term. Terms with
// Λρ > 6.5 are left out: erfc(6.5)·(Λρ)⁴ < 1e-16 of the nearest-neighbour term. The lattice is
// walked by brute force over a box of integer coordinates, periodic = 3 or 2 (in-plane).
func shortRange(s grid.Structure, c Charges, periodic int, metric grid.Mat3, lambda float64, q grid.Vec3) []complex128 {
	n := s.N()
	m := 3 * n
	out := make([]complex128, m*m)
	einv := metric.Inv()
	sdet := math.Sqrt(metric.Det())
	ke := units.CoulombEVAngstrom
	rhoMax := 6.5 / lambda
	var frob float64
	for i := 0; i < 3; i++ {
		for j := 0; j < 3; j++ {
			frob += metric[i][j] * metric[i][j]
		}
	}
	var sep float64
	for _, a := range s.Atoms {
		for _, b := range s.Atoms {
			sep = math.Max(sep, b.Position.Sub(a.Position).Norm())
		}
	}
	rMax := math.Sqrt(math.Sqrt(frob))*rhoMax + sep // |r| ≤ √λ_max·ρ ≤ ‖ε‖_F^{1/2}·ρ
	recip := s.Lattice.Reciprocal()
	var lim [3]int
	for i := 0; i < periodic; i++ {
		lim[i] = int(rMax*grid.Vec3(recip[i]).Norm()/(2*math.Pi)) + 2
	}
	t := make([]grid.Mat3, n)
	for n0 := -lim[0]; n0 <= lim[0]; n0++ {
		for n1 := -lim[1]; n1 <= lim[1]; n1++ {
			for n2 := -lim[2]; n2 <= lim[2]; n2++ {
				r := s.Lattice.Point([3]int{n0, n1, n2})
				ph := cmplx.Exp(complex(0, q.Dot(r)))
				for a := 0; a < n; a++ {
					for b := 0; b < n; b++ {
						d := r.Add(s.Atoms[b].Position).Sub(s.Atoms[a].Position)
						u := einv.MulVec(d)
						rho := math.Sqrt(d.Dot(u))
						if rho == 0 || rho > rhoMax {
							continue
						}
						lr := lambda * rho
						g := 2 * lambda / math.SqrtPi * math.Exp(-lr*lr)
						bf := (math.Erfc(lr)/rho + g) / (rho * rho)
						cf := (3*math.Erfc(lr)/rho + g*(3+2*lr*lr)) / (rho * rho * rho * rho)
						var h grid.Mat3
						for i := 0; i < 3; i++ {
							for j := 0; j < 3; j++ {
								h[i][j] = (u[i]*u[j]*cf - einv[i][j]*bf) / sdet
							}
						}
						phi := c.Z[a].T().Mul(h).Mul(c.Z[b]).Scale(-ke)
						for al := 0; al < 3; al++ {
							for be := 0; be < 3; be++ {
								out[(3*a+al)*m+3*b+be] += complex(phi[al][be], 0) * ph
								t[a][al][be] += phi[al][be]
							}
						}
					}
				}
			}
		}
	}
	for a := 0; a < n; a++ {
		for b := 0; b < n; b++ {
			for al := 0; al < 3; al++ {
				for be := 0; be < 3; be++ {
					var d float64
					if a == b {
						d = (t[a][al][be] + t[a][be][al]) / 2
					} else {
						d = ((t[a][al][be] - t[a][be][al]) - (t[b][al][be] - t[b][be][al])) / 2 / float64(n)
					}
					out[(3*a+al)*m+3*b+be] -= complex(d, 0)
				}
			}
		}
	}
	return out
}

// checkProperties runs the symmetry checks every kernel must pass at the reduced q-points fs.
func checkProperties(t *testing.T, name string, k *Kernel, l grid.Lattice, fs []grid.Vec3) {
	t.Helper()
	n := len(k.tau)
	m := 3 * n
	var g grid.Vec3 // a reciprocal lattice vector
	for i := 0; i < l.Periodic(); i++ {
		g = g.Add(grid.Vec3(l.Reciprocal()[i]).Scale(float64(2 - 3*i)))
	}
	for _, f := range fs {
		q := l.Cartesian(f)
		c := lr(k, q, grid.Vec3{})
		// Exact Hermiticity: the upper triangle is mirrored.
		for i := 0; i < m; i++ {
			for j := 0; j < m; j++ {
				if c[i*m+j] != cmplx.Conj(c[j*m+i]) {
					t.Fatalf("%s q=%v: C[%d][%d] = %v, conj C[%d][%d] = %v: not exactly Hermitian", name, f, i, j, c[i*m+j], j, i, cmplx.Conj(c[j*m+i]))
				}
			}
		}
		// C(−q) = C(q)*: equal up to the order of the G sum (rounding, 1e-13 relative).
		cm := lr(k, q.Scale(-1), grid.Vec3{})
		for i := range cm {
			cm[i] = cmplx.Conj(cm[i])
		}
		if d := relDiff(cm, c); d > 1e-13 {
			t.Errorf("%s q=%v: C(−q)* differs from C(q) by %.2g relative (tol 1e-13, rounding)", name, f, d)
		}
		// Periodicity: C(q + G) = C(q) up to the rounding of the folded q (1e-12 relative).
		if d := relDiff(lr(k, q.Add(g), grid.Vec3{}), c); d > 1e-12 {
			t.Errorf("%s q=%v: C(q+G) differs from C(q) by %.2g relative (tol 1e-12, rounding)", name, f, d)
		}
		// Repeated calls give identical results.
		if d := relDiff(lr(k, q, grid.Vec3{}), c); d != 0 {
			t.Errorf("%s q=%v: a repeated call differs by %.2g", name, f, d)
		}
	}
	// Acoustic sum rule at q = 0 (dir = 0 in 3D): Σ_κ' C_{κα,κ'β}(0) = 0 to rounding of the sum.
	c := lr(k, grid.Vec3{}, grid.Vec3{})
	scale := maxAbs(c)
	for a := 0; a < n; a++ {
		for al := 0; al < 3; al++ {
			for be := 0; be < 3; be++ {
				var s complex128
				for b := 0; b < n; b++ {
					s += c[(3*a+al)*m+3*b+be]
				}
				if cmplx.Abs(s) > 1e-12*scale {
					t.Errorf("%s: Σ_κ' C[%d%c][κ'%c](0) = %.3g, want 0 (tol 1e-12·%.3g)", name, a, "xyz"[al], "xyz"[be], s, scale)
				}
			}
		}
	}
}

func TestKernelProperties(t *testing.T) {
	s2, c2 := hexSheet(t, 0.3, generalZ, grid.Mat3{{2.6, 0.2, 0}, {0.2, 3.1, 0}, {0, 0, 1.4}})
	mesh2 := grid.Mesh{N: [3]int{6, 6, 1}}
	fs2 := []grid.Vec3{{0, 0, 0}, {0.13, -0.27, 0}, {0.5, 0, 0}, {1.0 / 3, 1.0 / 3, 0}, {1.21, -0.7, 0}, {1e-4, 3e-4, 0}}
	checkProperties(t, "2d buckled, general Z", mustKernel(t, s2, c2, mesh2, Kernel2D), s2.Lattice, fs2)
	checkProperties(t, "2d buckled, screened, ε_env=1.7", mustKernel(t, s2, c2, mesh2, Kernel2D, WithEnvironment(1.7)), s2.Lattice, fs2)

	s3, c3 := triclinic3D(t)
	fs3 := []grid.Vec3{{0, 0, 0}, {0.13, -0.27, 0.41}, {0.5, 0.5, 0}, {1.3, 0.2, -0.7}, {1e-3, 0, 2e-3}}
	checkProperties(t, "3d triclinic", mustKernel(t, s3, c3, grid.Mesh{N: [3]int{4, 4, 4}}, Kernel3D), s3.Lattice, fs3)
}

// TestAddContract checks alpha scaling, accumulation into dst, independence from the caller's
// slices after New, and the panic on a wrong dst length.
func TestAddContract(t *testing.T) {
	s, c := triclinic3D(t)
	k := mustKernel(t, s, c, grid.Mesh{N: [3]int{4, 4, 4}}, Kernel3D)
	q := s.Lattice.Cartesian(grid.Vec3{0.2, -0.1, 0.35})
	one := lr(k, q, grid.Vec3{})
	c.Z[0][1][2] += 5 // the kernel keeps its own copy
	s.Atoms[1].Position[0] += 1
	if d := relDiff(lr(k, q, grid.Vec3{}), one); d != 0 {
		t.Errorf("changing the caller's charges and positions after New changed C^LR by %.2g", d)
	}
	m := 3 * s.N()
	dst := make([]complex128, m*m)
	k.Add(dst, q, grid.Vec3{}, 2.5)
	k.Add(dst, q, grid.Vec3{}, -1.5)
	if d := relDiff(dst, one); d > 1e-15 {
		t.Errorf("2.5·C + (−1.5)·C differs from C by %.2g relative", d)
	}
	k.Add(dst, q, grid.Vec3{}, -1)
	if r := maxAbs(dst) / maxAbs(one); r > 1e-15 {
		t.Errorf("C − C left %.2g relative", r)
	}
	defer func() {
		r := recover()
		if r == nil {
			t.Fatal("Add with a short dst did not panic")
		}
		if msg, _ := r.(string); !strings.Contains(msg, "len(dst)") {
			t.Errorf("panic message %q does not name len(dst)", msg)
		}
	}()
	k.Add(make([]complex128, m*m-1), q, grid.Vec3{}, 1)
}

func TestNewValidation(t *testing.T) {
	s2, c2 := hexSheet(t, 0.3, generalZ, grid.Identity())
	s3, c3 := triclinic3D(t)
	mesh2 := grid.Mesh{N: [3]int{6, 6, 1}}
	mesh3 := grid.Mesh{N: [3]int{4, 4, 4}}
	notPD := grid.Mat3{{1, 2, 0}, {2, 1, 0}, {0, 0, 1}} // eigenvalues −1, 3, 1
	bulkSheet := s2
	bulkSheet.Lattice = mustLattice(t, s2.Lattice.Vectors, grid.Bulk)
	lowInPlane := c2
	lowInPlane.Epsilon = grid.Mat3{{0.5, 0, 0}, {0, 2, 0}, {0, 0, 1}}
	cases := []struct {
		name string
		s    grid.Structure
		c    Charges
		mesh grid.Mesh
		kind Kind
		opts []Option
		want string
	}{
		{"epsilon not positive definite", s3, Charges{Z: c3.Z, Epsilon: notPD}, mesh3, Kernel3D, nil, "positive definite"},
		{"epsilon NaN", s3, Charges{Z: c3.Z, Epsilon: grid.Mat3{{math.NaN(), 0, 0}, {0, 1, 0}, {0, 0, 1}}}, mesh3, Kernel3D, nil, "not finite"},
		{"too few charges", s3, Charges{Z: c3.Z[:2], Epsilon: c3.Epsilon}, mesh3, Kernel3D, nil, "Born charge tensors"},
		{"2d kernel on a bulk lattice", bulkSheet, c2, grid.Mesh{N: [3]int{6, 6, 2}}, Kernel2D, nil, "sheet lattice"},
		{"lambda zero", s3, c3, mesh3, Kernel3D, []Option{WithLambda(0)}, "lambda"},
		{"lambda negative", s2, c2, mesh2, Kernel2D, []Option{WithLambda(-1)}, "lambda"},
		{"lambda NaN", s3, c3, mesh3, Kernel3D, []Option{WithLambda(math.NaN())}, "lambda"},
		{"lambda Inf", s3, c3, mesh3, Kernel3D, []Option{WithLambda(math.Inf(1))}, "lambda"},
		{"lambda absurdly large", s3, c3, mesh3, Kernel3D, []Option{WithLambda(1e3)}, "reciprocal vectors"},
		{"environment zero", s2, c2, mesh2, Kernel2D, []Option{WithEnvironment(0)}, "environment"},
		{"environment NaN", s2, c2, mesh2, Kernel2D, []Option{WithEnvironment(math.NaN())}, "environment"},
		{"environment for 3d", s3, c3, mesh3, Kernel3D, []Option{WithEnvironment(2)}, "2d kernel only"},
		{"mesh n1 = 0", s3, c3, grid.Mesh{N: [3]int{0, 4, 4}}, Kernel3D, nil, "mesh"},
		{"2d mesh with n3 = 2", s2, c2, grid.Mesh{N: [3]int{6, 6, 2}}, Kernel2D, nil, "n3"},
		{"unknown kind", s3, c3, mesh3, Kind(7), nil, "kind"},
		{"in-plane epsilon below 1", s2, lowInPlane, mesh2, Kernel2D, nil, "negative sheet polarizability"},
		{"no atoms", grid.Structure{Lattice: s3.Lattice}, Charges{Epsilon: c3.Epsilon}, mesh3, Kernel3D, nil, "no atoms"},
	}
	for _, tc := range cases {
		func() {
			defer func() {
				if r := recover(); r != nil {
					t.Errorf("New(%s) panicked: %v", tc.name, r)
				}
			}()
			k, err := New(tc.s, tc.c, tc.mesh, tc.kind, tc.opts...)
			if err == nil {
				t.Errorf("New(%s) = %v, nil; want an error mentioning %q", tc.name, k, tc.want)
				return
			}
			if !strings.Contains(err.Error(), tc.want) || !strings.HasPrefix(err.Error(), "longrange: ") {
				t.Errorf("New(%s) error %q, want prefix \"longrange: \" and %q", tc.name, err, tc.want)
			}
		}()
	}
	// Several problems are reported together.
	_, err := New(s3, Charges{Z: c3.Z[:1], Epsilon: c3.Epsilon}, grid.Mesh{N: [3]int{0, 4, 4}}, Kernel3D, WithLambda(-2))
	if err == nil || !strings.Contains(err.Error(), "Born charge") || !strings.Contains(err.Error(), "mesh") || !strings.Contains(err.Error(), "lambda") {
		t.Errorf("New with three problems: error %v, want all three reported", err)
	}
}

func TestKindString(t *testing.T) {
	for _, k := range []Kind{Kernel3D, Kernel2D} {
		p, err := ParseKind(strings.ToUpper(k.String()))
		if err != nil || p != k {
			t.Errorf("ParseKind(%q) = %v, %v; want %v", k.String(), p, err, k)
		}
	}
	if Kernel3D.String() != "3d" || Kernel2D.String() != "2d" {
		t.Errorf("Kind strings %q, %q; want 3d, 2d", Kernel3D, Kernel2D)
	}
	if _, err := ParseKind("1d"); err == nil {
		t.Error("ParseKind(1d) succeeded")
	}
}

func TestKernelAccessors(t *testing.T) {
	s, c := triclinic3D(t)
	k := mustKernel(t, s, c, grid.Mesh{N: [3]int{4, 4, 4}}, Kernel3D, WithLambda(0.77))
	if k.Lambda() != 0.77 || k.Kind() != Kernel3D {
		t.Errorf("Lambda, Kind = %v, %v; want 0.77, 3d", k.Lambda(), k.Kind())
	}
	if r, e := k.Screening(); r != ([2][2]float64{}) || e != 0 {
		t.Errorf("Screening() of a 3d kernel = %v, %v; want zeros", r, e)
	}
	mesh := grid.Mesh{N: [3]int{4, 4, 4}}
	if got, want := mustKernel(t, s, c, mesh, Kernel3D).Lambda(), DefaultLambda(s, c.Epsilon, mesh, Kernel3D); got != want {
		t.Errorf("default Lambda() = %v, want DefaultLambda = %v", got, want)
	}
}

// TestAddAllocations pins zero allocations per Add after New (both kinds, Γ with a direction).
func TestAddAllocations(t *testing.T) {
	s2, c2 := hexSheet(t, 0.3, generalZ, grid.Mat3{{2.6, 0, 0}, {0, 2.6, 0}, {0, 0, 1.4}})
	s3, c3 := triclinic3D(t)
	for _, tc := range []struct {
		name string
		k    *Kernel
		q    grid.Vec3
		dir  grid.Vec3
	}{
		{"2d", mustKernel(t, s2, c2, grid.Mesh{N: [3]int{6, 6, 1}}, Kernel2D), grid.Vec3{0.1, 0.2, 0}, grid.Vec3{}},
		{"2d Γ", mustKernel(t, s2, c2, grid.Mesh{N: [3]int{6, 6, 1}}, Kernel2D), grid.Vec3{}, grid.Vec3{1, 0, 0}},
		{"3d", mustKernel(t, s3, c3, grid.Mesh{N: [3]int{4, 4, 4}}, Kernel3D), grid.Vec3{0.1, 0.2, 0.3}, grid.Vec3{}},
		{"3d Γ dir", mustKernel(t, s3, c3, grid.Mesh{N: [3]int{4, 4, 4}}, Kernel3D), grid.Vec3{}, grid.Vec3{0, 1, 1}},
	} {
		m := 3 * len(tc.k.tau)
		dst := make([]complex128, m*m)
		if a := testing.AllocsPerRun(20, func() { tc.k.Add(dst, tc.q, tc.dir, 1) }); a != 0 {
			t.Errorf("Add(%s) allocates %v times per call, want 0", tc.name, a)
		}
	}
}
