package exact

import (
	"math"
	"testing"

	"gonum.org/v1/gonum/mat"

	"lamina/grid"
	"lamina/grid/units"
)

// TestMadelung checks the scalar Ewald potential against the Madelung constants of rock salt
// and CsCl (shared PHYSICS.md §8: handbook values, from memory), referred to the
// nearest-neighbour distance: V(+ site) = −M/d for charges ±1. Two η values each. Tolerance
// 1e-10 relative: the sums are converged to e^{−42} and the references quoted to 13 digits.
func TestMadelung(t *testing.T) {
	fcc, _ := grid.NewLattice(grid.Mat3{{0, 2.5, 2.5}, {2.5, 0, 2.5}, {2.5, 2.5, 0}}, grid.Bulk)
	sc, _ := grid.NewLattice(grid.Mat3{{3, 0, 0}, {0, 3, 0}, {0, 0, 3}}, grid.Bulk)
	for _, c := range []struct {
		name string
		s    grid.Structure
		dnn  float64
		want float64
	}{
		{"rock salt", grid.Structure{Lattice: fcc, Atoms: []grid.Atom{{Mass: 1}, {Mass: 1, Position: grid.Vec3{2.5, 0, 0}}}},
			2.5, 1.747564594633}, // handbook value, from memory (PHYSICS.md §8)
		{"CsCl", grid.Structure{Lattice: sc, Atoms: []grid.Atom{{Mass: 1}, {Mass: 1, Position: grid.Vec3{1.5, 1.5, 1.5}}}},
			1.5 * math.Sqrt(3), 1.762674773070}, // handbook value, from memory (PHYSICS.md §8)
	} {
		for _, eta := range []float64{0.4, 0.9} {
			v := sitePotentials(c.s, []float64{1, -1}, eta)
			for k, got := range []float64{-v[0] * c.dnn, v[1] * c.dnn} {
				if math.Abs(got-c.want) > 1e-10*c.want {
					t.Errorf("Madelung(%s, site %d, η=%g) = %.13f, want %.12f (rel %.2g > 1e-10)", c.name, k, eta, got, c.want, math.Abs(got-c.want)/c.want)
				}
				t.Logf("Madelung(%s, site %d, η=%g) = %.13f (rel %.2g)", c.name, k, eta, got, math.Abs(got-c.want)/c.want)
			}
		}
	}
}

// directBulkSum is the windowed direct lattice sum of the point-dipole force constants in a
// medium, Σ_R w(|r|) (−k_e) Z_κᵀ ∂∂φ(r) Z_κ' e^{iq·R}, with the Hessian of
// φ = 1/(√det ε · d), d = √(r·ε⁻¹·r), written out here: (3 (gr)(gr)ᵀ/d⁵ − g/d³)/√det ε, g = ε⁻¹.
// w = erfc((|r| − rc)/width)/2. In 3D the sum converges only conditionally; the window makes it
// converge at q away from the reciprocal lattice (see TestBulkDirectSum).
func directBulkSum(m *Model, f grid.Vec3, rc, width float64) []complex128 {
	g := m.Epsilon.Inv()
	pre := 1 / math.Sqrt(m.Epsilon.Det())
	hess := func(r grid.Vec3) grid.Mat3 {
		gr := g.MulVec(r)
		d2 := r.Dot(gr)
		d := math.Sqrt(d2)
		d3 := d2 * d
		var h grid.Mat3
		for a := 0; a < 3; a++ {
			for b := 0; b < 3; b++ {
				h[a][b] = pre * (3*gr[a]*gr[b]/(d3*d2) - g[a][b]/d3)
			}
		}
		return h
	}
	return windowedSum(m, f, 3, rc, width, hess)
}

// windowedSum is the direct sum Σ_R w(|r|) e^{iq·R} H(r) over the first periodic lattice
// directions, contracted as −k_e Z_κᵀ (Σ) Z_κ' per pair; width = 0 is a sharp cutoff at rc.
func windowedSum(m *Model, f grid.Vec3, periodic int, rc, width float64, hess func(grid.Vec3) grid.Mat3) []complex128 {
	s := m.Structure
	n := s.N()
	n3 := 3 * n
	out := make([]complex128, 9*n*n)
	rmax := rc + 7*width
	// |n_i| ≤ rmax·|b_i|/2π (+1 for the offset τ_κ' − τ_κ, shorter than a cell).
	var b grid.Mat3
	if periodic == 2 {
		b = inPlaneReciprocalTest(s.Lattice)
	} else {
		b = s.Lattice.Reciprocal()
	}
	var lim [3]int
	for i := 0; i < periodic; i++ {
		lim[i] = int(rmax*grid.Vec3(b[i]).Norm()/(2*math.Pi)) + 2
	}
	for k := 0; k < n; k++ {
		for kp := 0; kp < n; kp++ {
			d := s.Atoms[kp].Position.Sub(s.Atoms[k].Position)
			var acc [3][3]complex128
			for i := -lim[0]; i <= lim[0]; i++ {
				for j := -lim[1]; j <= lim[1]; j++ {
					for l := -lim[2]; l <= lim[2]; l++ {
						if k == kp && i == 0 && j == 0 && l == 0 {
							continue
						}
						r := s.Lattice.Point([3]int{i, j, l}).Add(d)
						rn := r.Norm()
						w := 1.0
						if width == 0 {
							if rn > rc {
								continue
							}
						} else {
							if rn > rmax {
								continue
							}
							w = math.Erfc((rn-rc)/width) / 2
						}
						sn, cs := math.Sincos(2 * math.Pi * (f[0]*float64(i) + f[1]*float64(j) + f[2]*float64(l)))
						h := hess(r)
						for a := 0; a < 3; a++ {
							for c := 0; c < 3; c++ {
								acc[a][c] += complex(w*h[a][c]*cs, w*h[a][c]*sn)
							}
						}
					}
				}
			}
			ke := units.CoulombEVAngstrom
			for a := 0; a < 3; a++ {
				for c := 0; c < 3; c++ {
					var v complex128
					for x := 0; x < 3; x++ {
						for y := 0; y < 3; y++ {
							v += complex(-ke*m.Z[k][x][a]*m.Z[kp][y][c], 0) * acc[x][y]
						}
					}
					out[(3*k+a)*n3+3*kp+c] = v
				}
			}
		}
	}
	return out
}

// inPlaneReciprocalTest returns the in-plane reciprocal vectors of a sheet, written out here.
func inPlaneReciprocalTest(l grid.Lattice) grid.Mat3 {
	a1, a2 := l.A(0), l.A(1)
	area := a1[0]*a2[1] - a1[1]*a2[0]
	return grid.Mat3{{2 * math.Pi * a2[1] / area, -2 * math.Pi * a2[0] / area, 0}, {-2 * math.Pi * a1[1] / area, 2 * math.Pi * a1[0] / area, 0}}
}

// TestBulkDirectSum compares the 3D Ewald sums with the windowed direct sum at q-points near the
// zone boundary. By Poisson summation the windowed sum differs from the lattice sum by (1/Ω) Σ_G
// of the transform of (1 − w)·∂∂φ at q + G, which decays like exp(−(width·|q + G|)²/4): at
// |q + G| ≳ 1/Å and width 10 Å that is ~1e-11; the window must also be 1 on the near
// neighbours, erfc(−rc/width)/2 = 1 − 1e-13 for rc = 5.5·width. Tolerance 1e-9 of the largest
// entry.
func TestBulkDirectSum(t *testing.T) {
	if testing.Short() {
		t.Skip("direct 3D lattice sums take ~1 s")
	}
	for _, m := range []*Model{RockSalt(), DipoleCrystal()} {
		for _, f := range []grid.Vec3{{0.5, 0.5, 0.5}, {0.45, 0.3, 0.55}} {
			got := coulombPairs(m, f)
			want := directBulkSum(m, f, 55, 10)
			d, s := maxAbsDiff(got, want)
			if d > 1e-9*s {
				t.Errorf("%s q=%v: Ewald vs windowed direct sum differ by %.3g (scale %.3g, rel %.2g > 1e-9)", m.Name, f, d, s, d/s)
			}
			t.Logf("%s q=%v: rel difference %.2g", m.Name, f, d/s)
		}
	}
}

// TestBulkEtaIndependence checks that η drops out of the bulk sums, at Γ (analytic part), next to
// Γ, at a generic point and at a zone-boundary point. Tolerance 1e-12 of the largest entry.
func TestBulkEtaIndependence(t *testing.T) {
	for _, m0 := range []*Model{RockSalt(), DipoleCrystal()} {
		worst := 0.0
		for _, sc := range []float64{0.6, 1.7} {
			m, err := newModel(m0.Name, m0.Structure, m0.Z, m0.Epsilon, m0.Springs, sc*m0.eta)
			if err != nil {
				t.Fatal(err)
			}
			for _, f := range []grid.Vec3{{0, 0, 0}, {1e-6, 0, 0}, {0.13, 0.27, -0.08}, {0.5, 0.5, 0.5}} {
				a := coulombPairs(m0, f)
				b := coulombPairs(m, f)
				d, s := maxAbsDiff(a, b)
				if d > 1e-12*s {
					t.Errorf("%s q=%v: η=%.3g vs η=%.3g differ by %.3g (rel %.2g > 1e-12)", m0.Name, f, m0.eta, m.eta, d, d/s)
				}
				worst = math.Max(worst, d/s)
			}
		}
		t.Logf("%s: η = %.4g/Å by default, largest relative change %.2g", m0.Name, m0.eta, worst)
	}
}

// TestBulkMediumTransform checks the anisotropic medium against vacuum. Derived: with
// r' = ε^{−1/2} r, φ_ε(r) = φ_vac(r')/√det ε, so ∂∂φ_ε = ε^{−1/2} (∂'∂'φ_vac) ε^{−1/2}/√det ε and the
// crystal (lattice, positions, Z, ε) has the same C(q), at the same reduced q, as the vacuum
// crystal with lattice and positions mapped by ε^{−1/2} and charges Z' = ε^{−1/2} Z/(det ε)^{1/4}.
// The non-analytic term along d matches the one along d' = ε^{1/2} d. Tolerance 1e-12 relative.
func TestBulkMediumTransform(t *testing.T) {
	m := DipoleCrystal()
	e := m.Epsilon
	var es mat.EigenSym
	if !es.Factorize(mat.NewSymDense(3, []float64{e[0][0], e[0][1], e[0][2], e[1][0], e[1][1], e[1][2], e[2][0], e[2][1], e[2][2]}), true) {
		t.Fatal("eigen decomposition of epsilon failed")
	}
	var v mat.Dense
	es.VectorsTo(&v)
	lam := es.Values(nil)
	// ε^{p} = V diag(λ^p) Vᵀ
	power := func(p float64) grid.Mat3 {
		var r grid.Mat3
		for i := 0; i < 3; i++ {
			for j := 0; j < 3; j++ {
				for k := 0; k < 3; k++ {
					r[i][j] += v.At(i, k) * math.Pow(lam[k], p) * v.At(j, k)
				}
			}
		}
		return r
	}
	mh, ph := power(-0.5), power(0.5)
	var vec grid.Mat3
	for i := 0; i < 3; i++ {
		vec[i] = mh.MulVec(m.Structure.Lattice.A(i))
	}
	l, err := grid.NewLattice(vec, grid.Bulk)
	if err != nil {
		t.Fatal(err)
	}
	s := grid.Structure{Lattice: l}
	for _, a := range m.Structure.Atoms {
		a.Position = mh.MulVec(a.Position)
		s.Atoms = append(s.Atoms, a)
	}
	z := make([]grid.Mat3, len(m.Z))
	for k := range z {
		z[k] = mh.Mul(m.Z[k]).Scale(math.Pow(e.Det(), -0.25))
	}
	// The springs only let the balancing couplings be built; the comparison is of Coulomb sums.
	vac, err := newModel("vacuum image", s, z, grid.Identity(), m.Springs, m.eta)
	if err != nil {
		t.Fatal(err)
	}
	for _, f := range []grid.Vec3{{0, 0, 0}, {0.13, 0.27, -0.08}, {0.5, 0.5, 0.5}} {
		d, sc := maxAbsDiff(coulombPairs(m, f), coulombPairs(vac, f))
		if d > 1e-12*sc {
			t.Errorf("q=%v: medium vs transformed vacuum crystal differ by %.3g (rel %.2g > 1e-12)", f, d, d/sc)
		}
	}
	dir := grid.Vec3{0.3, -0.5, 0.8}
	a := make([]complex128, len(m.fixed))
	b := make([]complex128, len(m.fixed))
	m.bulk.addNonAnalytic(a, dir)
	vac.bulk.addNonAnalytic(b, ph.MulVec(dir))
	if d, sc := maxAbsDiff(a, b); d > 1e-12*sc {
		t.Errorf("non-analytic term: medium vs transformed vacuum crystal differ by %.3g (rel %.2g)", d, d/sc)
	}
}

// TestRockSaltLOTO checks the splitting at Γ of the cubic rigid-ion crystal against
// ω²_LO − ω²_TO = 4π k_e Z²/(Ω μ ε∞) (Born & Huang, Dynamical Theory of Crystal Lattices (1954);
// PHYSICS.md §8), along three directions (cubic symmetry: the same for all). Tolerance 1e-9
// relative: ω² comes back from THz through the eigenvalues (rounding ~1e-14 of the largest).
func TestRockSaltLOTO(t *testing.T) {
	m := RockSalt()
	zq := m.Z[0][0][0]
	ma, mb := m.Structure.Atoms[0].Mass, m.Structure.Atoms[1].Mass
	mu := ma * mb / (ma + mb)
	want := 4 * math.Pi * units.CoulombEVAngstrom * zq * zq / (m.Structure.Lattice.Volume() * mu * m.Epsilon[0][0])
	lam := func(f float64) float64 { x := f / units.THzPerSqrtEig; return x * x }
	to := m.Frequencies(grid.Vec3{}, grid.Vec3{})
	for _, d := range []grid.Vec3{{1, 0, 0}, {1, 1, 0}, {0.3, -0.7, 0.5}} {
		fr := m.Frequencies(grid.Vec3{}, d)
		// Analytic part: TO triplet; with the field the top mode is LO, the other two stay TO.
		got := lam(fr[5]) - lam(to[5])
		t.Logf("dir %v: ω²_LO − ω²_TO rel error %.2g", d, math.Abs(got-want)/want)
		if math.Abs(got-want) > 1e-9*want {
			t.Errorf("dir %v: ω²_LO − ω²_TO = %.12g, want %.12g eV/(Å² amu) (rel %.2g > 1e-9)", d, got, want, math.Abs(got-want)/want)
		}
		for i := 3; i < 5; i++ {
			if math.Abs(lam(fr[i])-lam(to[i])) > 1e-9*want {
				t.Errorf("dir %v: TO mode %d moved from %.9f to %.9f THz", d, i, to[i], fr[i])
			}
		}
	}
	t.Logf("TO %.6f THz, LO %.6f THz", to[5], m.Frequencies(grid.Vec3{}, grid.Vec3{1, 0, 0})[5])
}
