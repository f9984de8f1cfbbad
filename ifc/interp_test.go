package ifc_test

import (
	"math"
	"math/rand/v2"
	"testing"

	"lamina/grid"
	"lamina/grid/units"
	"lamina/ifc"
	"lamina/ifc/exact"
	"lamina/longrange"
)

// These tests run the whole pipeline (neutral charges, long-range kernel, transform, folding,
// sum rule, evaluation, Hermitian solver) on the exactly solvable crystals of package exact,
// whose C(q) comes from Ewald sums and a diagonalization written independently of
// package longrange and of ifc's eigensolver. Rigid ions and point dipoles are represented
// exactly by the dipole kernels, so the only interpolation error left is the part of the
// real-space Ewald remainder beyond the supercell.

// gridInput samples an exact model on a Γ-centred mesh.
func gridInput(m *exact.Model, mesh grid.Mesh) ifc.Input {
	in := ifc.Input{Structure: m.Structure, Mesh: mesh, Phase: ifc.CellPhase}
	if m.Z != nil {
		in.Charges = &longrange.Charges{Z: append([]grid.Mat3(nil), m.Z...), Epsilon: m.Epsilon}
	}
	for i := 0; i < mesh.Len(); i++ {
		q := mesh.Point(i)
		in.Samples = append(in.Samples, ifc.Sample{Q: q, C: m.Matrix(nil, q, grid.Vec3{})})
	}
	return in
}

func build(t *testing.T, in ifc.Input, opt ifc.ModelOptions) (*ifc.ForceConstants, ifc.Report) {
	t.Helper()
	fc, rep, err := ifc.NewModel(in, opt)
	if err != nil {
		t.Fatal(err)
	}
	return fc, rep
}

// heldOut returns random q-points and, for each of three directions, points approaching Γ
// from |q| = 0.002 1/Å (reduced coordinates, with their Cartesian directions).
func heldOut(l grid.Lattice, rng *rand.Rand, n int) (qs, dirs []grid.Vec3) {
	p := l.Periodic()
	for i := 0; i < n; i++ {
		var f grid.Vec3
		for j := 0; j < p; j++ {
			f[j] = rng.Float64() - 0.5
		}
		qs = append(qs, f)
		dirs = append(dirs, grid.Vec3{})
	}
	for j := 0; j < 3; j++ {
		d := grid.Vec3{rng.NormFloat64(), rng.NormFloat64(), rng.NormFloat64()}
		if p == 2 {
			d[2] = 0
		}
		d = d.Scale(1 / d.Norm())
		for _, r := range []float64{0.002, 0.005, 0.01, 0.02, 0.05, 0.1} {
			qs = append(qs, l.Reduced(d.Scale(r)))
			dirs = append(dirs, d)
		}
	}
	return qs, dirs
}

// maxError returns the largest |f_interp − f_exact| (THz) over the q-points, split into the
// whole set and the points with |q| ≤ 0.1 1/Å.
func maxError(t *testing.T, fc *ifc.ForceConstants, m *exact.Model, qs, dirs []grid.Vec3) (all, nearGamma float64) {
	t.Helper()
	ev := fc.NewEvaluator()
	l := m.Structure.Lattice
	for i, q := range qs {
		got, err := ev.Frequencies(nil, q, dirs[i])
		if err != nil {
			t.Fatal(err)
		}
		want := m.Frequencies(q, dirs[i])
		for j := range got {
			e := math.Abs(got[j] - want[j])
			all = math.Max(all, e)
			if l.Cartesian(q).Norm() <= 0.1+1e-12 {
				nearGamma = math.Max(nearGamma, e)
			}
		}
	}
	return all, nearGamma
}

// The accuracy target: max error ≤ 1e-4 THz at held-out q-points, for a buckled polar
// sheet from a 6×6 grid, a rock-salt-like crystal and an anisotropic point-dipole crystal from
// 4×4×4 grids; with no long-range part the error near Γ is far larger.
func TestInterpolationMatchesExactModels(t *testing.T) {
	cases := []struct {
		model *exact.Model
		mesh  grid.Mesh
	}{
		{exact.BuckledSheet(), grid.Mesh{N: [3]int{6, 6, 1}}},
		{exact.DipoleSheet(), grid.Mesh{N: [3]int{6, 6, 1}}},
		{exact.RockSalt(), grid.Mesh{N: [3]int{4, 4, 4}}},
		{exact.DipoleCrystal(), grid.Mesh{N: [3]int{4, 4, 4}}},
	}
	// Target of the issue; the measured errors are ~1e-6 THz or below (see the log).
	const target = 1e-4 // THz
	for _, c := range cases {
		t.Run(c.model.Name, func(t *testing.T) {
			in := gridInput(c.model, c.mesh)
			rng := rand.New(rand.NewPCG(7, 8))
			n := 40
			if testing.Short() {
				n = 10
			}
			qs, dirs := heldOut(c.model.Structure.Lattice, rng, n)
			fc, rep := build(t, in, ifc.ModelOptions{})
			all, near := maxError(t, fc, c.model, qs, dirs)
			t.Logf("%s, kernel %s, Λ = %.4g 1/Å: max error %.2e THz (near Γ %.2e)", c.model.Name, rep.Kernel, rep.Lambda, all, near)
			if all > target {
				t.Errorf("max error %.3g THz > %g THz", all, target)
			}
			// At exactly the grid points the input is reproduced.
			ev := fc.NewEvaluator()
			for i := 0; i < c.mesh.Len(); i += 7 {
				q := c.mesh.Point(i)
				got, _ := ev.Frequencies(nil, q, grid.Vec3{})
				want := c.model.Frequencies(q, grid.Vec3{})
				for j := range got {
					// 1e-6 THz: the acoustic modes at Γ are ±√(round-off) ≈ 3e-7 THz in both
					// models; elsewhere the agreement is ~1e-11 THz.
					if math.Abs(got[j]-want[j]) > 1e-6 {
						t.Errorf("grid point %v mode %d: %.9g THz, exact %.9g", q, j, got[j], want[j])
					}
				}
			}
			off, _ := build(t, in, ifc.ModelOptions{LongRange: ifc.LongRangeOff})
			_, nearOff := maxError(t, off, c.model, qs, dirs)
			t.Logf("%s, --long-range off: max error near Γ %.2e THz", c.model.Name, nearOff)
			if nearOff < 100*near || nearOff < 0.01 {
				t.Errorf("without the long-range part the error near Γ is only %.3g THz (with it %.3g)", nearOff, near)
			}
		})
	}
}

// Results of the unscreened kernels do not depend on Λ within the allowed range (PHYSICS.md
// section 5); the input's phase convention and the order of its q-points do not matter.
func TestLambdaPhaseOrderIndependence(t *testing.T) {
	for _, c := range []struct {
		model   *exact.Model
		mesh    grid.Mesh
		lambdas []float64 // 1/Å, Λ·r_WS from about 5 to 8
	}{
		{exact.BuckledSheet(), grid.Mesh{N: [3]int{6, 6, 1}}, []float64{0.52, 0.7, 0.85}},
		{exact.DipoleCrystal(), grid.Mesh{N: [3]int{4, 4, 4}}, nil},
	} {
		in := gridInput(c.model, c.mesh)
		ref, rep := build(t, in, ifc.ModelOptions{})
		lambdas := c.lambdas
		if lambdas == nil {
			lambdas = []float64{rep.Lambda * 1.2, rep.Lambda * 1.5}
		}
		qs := []grid.Vec3{{0.013, 0.021, 0}, {0.31, -0.17, 0}, {0.5, 0.5, 0}}
		if c.model.Structure.Lattice.Periodicity == grid.Bulk {
			qs = append(qs, grid.Vec3{0.2, -0.1, 0.35})
		}
		e0 := ref.NewEvaluator()
		compare := func(name string, fc *ifc.ForceConstants, tol float64) {
			e := fc.NewEvaluator()
			for _, q := range qs {
				a, _ := e0.Frequencies(nil, q, grid.Vec3{})
				b, _ := e.Frequencies(nil, q, grid.Vec3{})
				for j := range a {
					if math.Abs(a[j]-b[j]) > tol {
						t.Errorf("%s %s q %v mode %d: %.10g vs %.10g THz", c.model.Name, name, q, j, a[j], b[j])
					}
				}
			}
		}
		for _, l := range lambdas {
			fc, _ := build(t, in, ifc.ModelOptions{Lambda: l})
			// 1e-6 THz: the remainder beyond the supercell changes with Λ but stays below that.
			compare("lambda", fc, 1e-6)
		}
		// Atom phase, q written as q+G, shuffled order.
		atom := in
		atom.Phase = ifc.AtomPhase
		atom.Samples = nil
		n := c.model.Structure.N()
		rng := rand.New(rand.NewPCG(9, 10))
		for _, s := range in.Samples {
			f := s.Q.Add(grid.Vec3{float64(rng.IntN(3) - 1), float64(rng.IntN(3) - 1), 0})
			q := c.model.Structure.Lattice.Cartesian(f)
			cm := c.model.Matrix(nil, f, grid.Vec3{})
			for k := 0; k < n; k++ {
				for k2 := 0; k2 < n; k2++ {
					d := c.model.Structure.Atoms[k2].Position.Sub(c.model.Structure.Atoms[k].Position)
					ph := complex(math.Cos(q.Dot(d)), math.Sin(q.Dot(d)))
					for a := 0; a < 3; a++ {
						for b := 0; b < 3; b++ {
							cm[(3*k+a)*3*n+3*k2+b] *= ph
						}
					}
				}
			}
			atom.Samples = append(atom.Samples, ifc.Sample{Q: f, C: cm})
		}
		rng.Shuffle(len(atom.Samples), func(i, j int) { atom.Samples[i], atom.Samples[j] = atom.Samples[j], atom.Samples[i] })
		fc, _ := build(t, atom, ifc.ModelOptions{})
		compare("atom phase, shuffled", fc, 1e-9)
	}
}

// 2D sheet at long wavelength: the LO–TO splitting vanishes at Γ and ω²_LO − ω²_TO grows as
// (2π k_e Z²/(A μ ε_env))|q|; the out-of-plane polar mode falls as −(2π k_e Z_zz²/(A μ))|q|
// (PHYSICS.md section 5, first-order perturbation theory on the 2D kernel; Royo & Stengel,
// Phys. Rev. X 11, 041027 (2021)). Checked on the interpolated model of the buckled sheet.
func TestSheetLongWavelength(t *testing.T) {
	m := exact.BuckledSheet()
	fc, _ := build(t, gridInput(m, grid.Mesh{N: [3]int{6, 6, 1}}), ifc.ModelOptions{})
	ev := fc.NewEvaluator()
	l := m.Structure.Lattice
	z := m.Z[0][0][0] // rigid ions: Z = ±z·1
	mu := m.Structure.Atoms[0].Mass * m.Structure.Atoms[1].Mass / (m.Structure.Atoms[0].Mass + m.Structure.Atoms[1].Mass)
	slope := 2 * math.Pi * units.CoulombEVAngstrom * z * z / (l.Area() * mu) // eV/(Å·amu) per 1/Å
	// toLambda converts THz to eV/(Å²·amu), keeping the sign.
	toLambda := func(f float64) float64 {
		x := f / units.THzPerSqrtEig
		return math.Copysign(x*x, f)
	}
	f0, _ := ev.Frequencies(nil, grid.Vec3{}, grid.Vec3{})
	// Modes 3, 4: the in-plane optical pair (degenerate at Γ); mode 5: ZO (checked below).
	if d := math.Abs(f0[4] - f0[3]); d > 1e-6 {
		t.Errorf("LO–TO splitting at Γ of the sheet: %.3g THz, want 0", d)
	}
	for _, dir := range []grid.Vec3{{1, 0, 0}, {0.6, 0.8, 0}} {
		delta := func(r float64) (lo, zo float64) {
			f, _ := ev.Frequencies(nil, l.Reduced(dir.Scale(r)), dir)
			return toLambda(f[4]) - toLambda(f[3]), toLambda(f[5]) - toLambda(f0[5])
		}
		// Δ(q)/q = a + b q: eliminate b with two radii.
		const q1, q2 = 0.001, 0.002
		lo1, zo1 := delta(q1)
		lo2, zo2 := delta(q2)
		a := 2*lo1/q1 - lo2/q2
		az := 2*zo1/q1 - zo2/q2
		// 1e-3 relative: the O(q²) remainder left after the two-point elimination.
		if math.Abs(a-slope) > 1e-3*slope {
			t.Errorf("dir %v: LO slope %.6g, want 2πk_eZ²/(Aμ) = %.6g eV/(Å·amu)", dir, a, slope)
		}
		if math.Abs(az+slope) > 1e-3*slope {
			t.Errorf("dir %v: ZO slope %.6g, want −2πk_eZ_zz²/(Aμ) = %.6g", dir, az, -slope)
		}
	}
}

// 3D: ω²_LO − ω²_TO at Γ → 4π k_e Z²/(Ω μ ε∞) (Born & Huang, Dynamical Theory of Crystal
// Lattices (1954)), from the interpolated rock-salt model, for q → 0 along three directions;
// at exactly q = 0 with no direction the analytic (degenerate) frequencies come back.
func TestBulkLOTO(t *testing.T) {
	m := exact.RockSalt()
	fc, _ := build(t, gridInput(m, grid.Mesh{N: [3]int{4, 4, 4}}), ifc.ModelOptions{})
	ev := fc.NewEvaluator()
	z := m.Z[0][0][0]
	a, b := m.Structure.Atoms[0].Mass, m.Structure.Atoms[1].Mass
	mu := a * b / (a + b)
	want := 4 * math.Pi * units.CoulombEVAngstrom * z * z / (m.Structure.Lattice.Volume() * mu * m.Epsilon[0][0])
	sq := func(f float64) float64 { x := f / units.THzPerSqrtEig; return x * x }
	f0, _ := ev.Frequencies(nil, grid.Vec3{}, grid.Vec3{})
	if math.Abs(f0[5]-f0[3]) > 1e-6 {
		t.Errorf("analytic Γ optical modes not degenerate: %v", f0[3:])
	}
	for _, d := range []grid.Vec3{{1, 0, 0}, {0, 0, 1}, {1 / math.Sqrt(3), 1 / math.Sqrt(3), 1 / math.Sqrt(3)}} {
		f, _ := ev.Frequencies(nil, grid.Vec3{}, d)
		got := sq(f[5]) - sq(f[3])
		// 1e-6 relative: interpolation error ~1e-7 THz on ~10 THz modes.
		if math.Abs(got-want) > 1e-6*want {
			t.Errorf("dir %v: ω²_LO − ω²_TO = %.8g, want %.8g eV/(Å²·amu)", d, got, want)
		}
	}
}

// Forcing the 3D kernel on a sheet (allowed for comparison) puts a spurious finite LO–TO
// splitting at Γ, which the isolated sheet does not have (PHYSICS.md section 5), and NewModel
// warns about it.
func TestSheetWith3DKernel(t *testing.T) {
	m := exact.BuckledSheet()
	fc, rep := build(t, gridInput(m, grid.Mesh{N: [3]int{6, 6, 1}}), ifc.ModelOptions{LongRange: ifc.LongRange3D})
	if len(rep.Warnings) == 0 {
		t.Error("no warning for the 3D kernel on a sheet")
	}
	ev := fc.NewEvaluator()
	f, _ := ev.Frequencies(nil, grid.Vec3{}, grid.Vec3{1, 0, 0})
	exactF := m.Frequencies(grid.Vec3{}, grid.Vec3{1, 0, 0})
	// The exact in-plane optical pair is degenerate at Γ. The 3D kernel treats the sheet as a
	// bulk stack c apart and adds the bulk non-analytic term, so the pair splits by
	// ω²_LO − ω²_TO = 4πk_eZ²/(Ωμ) (Born & Huang 1954), ≈ 28 THz² (a 1.2 THz shift) here.
	if math.Abs(exactF[4]-exactF[3]) > 1e-6 {
		t.Fatalf("exact sheet has a splitting at Γ: %v", exactF)
	}
	z := m.Z[0][0][0]
	a, b := m.Structure.Atoms[0].Mass, m.Structure.Atoms[1].Mass
	want := 4 * math.Pi * units.CoulombEVAngstrom * z * z / (m.Structure.Lattice.Volume() * a * b / (a + b))
	sq := func(f float64) float64 { x := f / units.THzPerSqrtEig; return x * x }
	if got := sq(f[4]) - sq(f[3]); math.Abs(got-want) > 1e-6*want {
		t.Errorf("3D kernel on a sheet: splitting %.8g, want the bulk value %.8g eV/(Å²·amu)", got, want)
	}
}
