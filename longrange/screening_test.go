package longrange

import (
	"math"
	"math/cmplx"
	"testing"

	"lamina/grid"
	"lamina/grid/units"
)

// TestScreeningTensor: r∥ = 2π α∥ = c (ε∥^cell − 1)/2 (Cudazzo et al., Phys. Rev. B 84, 085406
// (2011); PHYSICS.md §5) for c = 15 Å and ε∥^cell = [[3.2, 0.3], [0.3, 2.6]]:
// derived by hand, r∥ = [[16.5, 2.25], [2.25, 12]] Å. ε_zz does not enter.
func TestScreeningTensor(t *testing.T) {
	s, c := hexSheet(t, 0.3, generalZ, grid.Mat3{{3.2, 0.3, 0}, {0.3, 2.6, 0}, {0, 0, 5}})
	k := mustKernel(t, s, c, grid.Mesh{N: [3]int{6, 6, 1}}, Kernel2D, WithEnvironment(1.8))
	r, env := k.Screening()
	want := [2][2]float64{{16.5, 2.25}, {2.25, 12}}
	for i := 0; i < 2; i++ {
		for j := 0; j < 2; j++ {
			if math.Abs(r[i][j]-want[i][j]) > 1e-12 {
				t.Errorf("r∥[%d][%d] = %.15g, want %g", i, j, r[i][j], want[i][j])
			}
		}
	}
	if env != 1.8 {
		t.Errorf("ε_env = %v, want 1.8", env)
	}
}

// TestScreeningOff: with ε∥^cell = 1 and ε_env = 1 the correction vanishes and is skipped; the
// kernel is then identical whatever ε_zz^cell is (it enters neither part).
func TestScreeningOff(t *testing.T) {
	s, c1 := hexSheet(t, 0.3, generalZ, grid.Identity())
	_, c2 := hexSheet(t, 0.3, generalZ, grid.Mat3{{1, 0, 0}, {0, 1, 0}, {0, 0, 7.3}})
	mesh := grid.Mesh{N: [3]int{6, 6, 1}}
	k1, k2 := mustKernel(t, s, c1, mesh, Kernel2D), mustKernel(t, s, c2, mesh, Kernel2D)
	if k1.screen.on || k2.screen.on {
		t.Errorf("screening on for ε∥ = 1, ε_env = 1")
	}
	q := s.Lattice.Cartesian(grid.Vec3{0.2, 0.1, 0})
	if d := relDiff(lr(k2, q, grid.Vec3{}), lr(k1, q, grid.Vec3{})); d != 0 {
		t.Errorf("ε_zz changed the unscreened kernel by %.2g", d)
	}
	if r, env := k1.Screening(); r != ([2][2]float64{}) || env != 1 {
		t.Errorf("Screening() = %v, %v; want zero r∥ and ε_env = 1", r, env)
	}
}

// TestScreeningCorrection compares the screened minus the unscreened kernel (same Λ) with the
// correction of PHYSICS.md §5 evaluated here on its own (brute-force G box, anisotropic r∥,
// ε_env ≠ 1), ΔC = (2πk_e/A) Σ_G erfc(K/2Λ)(K·Z_κ)_α(K·Z_κ')_β[1/(Kε∥(K)) − 1/K]e^{iK·(τ_κ−τ_κ')}
// minus, on the diagonal blocks, the same sum at q = 0 over κ' (the literal acoustic-sum-rule
// term, which is what the kernel's constant reduces to for a neutral two-atom cell). The G box
// reaches K/2Λ = 8 (erfc(8) ≈ 1e-29); tolerance 1e-12 for rounding.
func TestScreeningCorrection(t *testing.T) {
	s, c := hexSheet(t, 0.3, generalZ, grid.Mat3{{3.2, 0.3, 0}, {0.3, 2.6, 0}, {0, 0, 5}})
	cu := c
	cu.Epsilon = grid.Identity()
	mesh := grid.Mesh{N: [3]int{6, 6, 1}}
	const env = 1.8
	ks := mustKernel(t, s, c, mesh, Kernel2D, WithEnvironment(env))
	ku := mustKernel(t, s, cu, mesh, Kernel2D, WithLambda(ks.Lambda()))
	lam := ks.Lambda()
	rpar, _ := ks.Screening()
	area := s.Lattice.Area()
	b := s.Lattice.Reciprocal()
	delta := func(q grid.Vec3) []complex128 {
		out := make([]complex128, 36)
		for n0 := -40; n0 <= 40; n0++ {
			for n1 := -40; n1 <= 40; n1++ {
				kv := q.Add(grid.Vec3(b[0]).Scale(float64(n0))).Add(grid.Vec3(b[1]).Scale(float64(n1)))
				kv[2] = 0
				kk := kv.Norm()
				if kk == 0 || kk > 16*lam {
					continue
				}
				krk := kv[0]*(rpar[0][0]*kv[0]+rpar[0][1]*kv[1]) + kv[1]*(rpar[1][0]*kv[0]+rpar[1][1]*kv[1])
				epar := env + krk/kk
				w := 2 * math.Pi * units.CoulombEVAngstrom / area * math.Erfc(kk/(2*lam)) * (1/(kk*epar) - 1/kk)
				for a := 0; a < 2; a++ {
					for bb := 0; bb < 2; bb++ {
						za, zb := c.Z[a].VecMul(kv), c.Z[bb].VecMul(kv)
						dt := s.Atoms[a].Position.Sub(s.Atoms[bb].Position)
						ph := cmplx.Exp(complex(0, kv[0]*dt[0]+kv[1]*dt[1]))
						for al := 0; al < 3; al++ {
							for be := 0; be < 3; be++ {
								out[(3*a+al)*6+3*bb+be] += complex(w*za[al]*zb[be], 0) * ph
							}
						}
					}
				}
			}
		}
		return out
	}
	d0 := delta(grid.Vec3{})
	for _, f := range []grid.Vec3{{0, 0, 0}, {0.13, -0.27, 0}, {0.5, 0.5, 0}, {1e-3, 0, 0}} {
		q := s.Lattice.Cartesian(f)
		want := delta(q)
		for a := 0; a < 2; a++ {
			for al := 0; al < 3; al++ {
				for be := 0; be < 3; be++ {
					for bb := 0; bb < 2; bb++ {
						want[(3*a+al)*6+3*a+be] -= d0[(3*a+al)*6+3*bb+be]
					}
				}
			}
		}
		got := lr(ks, q, grid.Vec3{})
		un := lr(ku, q, grid.Vec3{})
		for i := range got {
			got[i] -= un[i]
		}
		if d := relDiff(got, want); d > 1e-12 {
			t.Errorf("q=%v: screened − unscreened kernel differs from ΔC by %.2g relative (tol 1e-12)", f, d)
		}
	}
}

// TestScreeningLambdaDependence: the screening correction is leading-order only, so unlike the
// unscreened kernel (TestSheetLambdaIndependence) its total with the unscreened remainder
// depends on Λ by design (PHYSICS.md §5). With r∥ ≈ 1.2 Å the change between Λ·r_WS = 5 and 8
// must be well above rounding (> 1e-6 relative).
func TestScreeningLambdaDependence(t *testing.T) {
	// ε∥^cell = 1.16 in a 15 Å cell: r∥ = 15·0.16/2 = 1.2 Å.
	s, c := hexSheet(t, 0.3, isoZ(2.1), grid.Mat3{{1.16, 0, 0}, {0, 1.16, 0}, {0, 0, 1.05}})
	mesh := grid.Mesh{N: [3]int{6, 6, 1}}
	q := s.Lattice.Cartesian(grid.Vec3{0.1, 0.05, 0})
	total := func(lam float64) []complex128 {
		l := lr(mustKernel(t, s, c, mesh, Kernel2D, WithLambda(lam)), q, grid.Vec3{})
		sr := shortRange(s, c, 2, grid.Identity(), lam, q)
		for i := range l {
			l[i] += sr[i]
		}
		return l
	}
	if d := relDiff(total(8.0/9), total(5.0/9)); d < 1e-6 {
		t.Errorf("screened total changes by only %.2g between Λ·r_WS = 5 and 8, want a Λ dependence", d)
	} else {
		t.Logf("screened total changes by %.2g between Λ·r_WS = 5 and 8", d)
	}
}

// TestScreenedSlope: with r∥ = 1.2 Å the LO slope at q → 0 is still 2πk_eZ²/(Aμε_env)
// (ε∥(q) → ε_env; PHYSICS.md §5); the O(q) term now includes −r∥q/ε_env, which Richardson
// extrapolation from |q| = 1e-4 and 1e-3 removes, leaving O(q1·q2·r∥²) ≈ 1e-7: tolerance 1e-5.
func TestScreenedSlope(t *testing.T) {
	const z, env = 2.1, 1.5
	s, c := hexSheet(t, 0, isoZ(z), grid.Mat3{{1.16, 0, 0}, {0, 1.16, 0}, {0, 0, 1.05}})
	k := mustKernel(t, s, c, grid.Mesh{N: [3]int{6, 6, 1}}, Kernel2D, WithEnvironment(env))
	mu := s.Atoms[0].Mass * s.Atoms[1].Mass / (s.Atoms[0].Mass + s.Atoms[1].Mass)
	want := 2 * math.Pi * units.CoulombEVAngstrom * z * z / (s.Lattice.Area() * mu * env)
	qh := grid.Vec3{math.Cos(0.4), math.Sin(0.4), 0}
	ext := richardson(polarSlope(k, s, qh.Scale(1e-4), qh), 1e-4, polarSlope(k, s, qh.Scale(1e-3), qh), 1e-3)
	if rel := math.Abs(ext-want) / want; rel > 1e-5 {
		t.Errorf("screened LO slope %.10g, want %.10g (rel %.2g > 1e-5)", ext, want, rel)
	}
}
