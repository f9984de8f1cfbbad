package longrange

import (
	"fmt"
	"math"
	"testing"

	"lamina/grid"
	"lamina/grid/units"
)

// TestSheetLambdaIndependence: for the unscreened sheet kernel, C^LR_Λ(q) plus the test's own
// real-space remainder (shortRange, ε = 1) is the full point-dipole lattice sum and must not
// depend on Λ over the allowed range Λ·r_WS = 4…8 (r_WS = 9 Å for the 6×6 grid of the 3 Å
// lattice). Both sums are converged far below the 1e-9 tolerance (reciprocal cut e^{−50},
// real-space cut erfc(6.5)), so 1e-9 leaves room for rounding only. Because the remainder is
// written in real space from Φ = −k_e Zᵀ∂∂(1/r)Z with the full 3D separation, a wrong sign of
// the cross term or dropped heights in the kernel would make the total depend on Λ.
func TestSheetLambdaIndependence(t *testing.T) {
	const rWS = 9.0 // Å: half of 6·3 Å
	mesh := grid.Mesh{N: [3]int{6, 6, 1}}
	fs := []grid.Vec3{{0, 0, 0}, {0.13, -0.27, 0}, {0.5, 0, 0}, {1.0 / 3, 1.0 / 3, 0}, {1.21, -0.7, 0}, {2e-4, 1e-4, 0}}
	for _, tc := range []struct {
		name   string
		buckle float64
		z      grid.Mat3
	}{
		{"buckled, ±Z isotropic", 0.3, isoZ(2.1)},
		{"buckled, general non-symmetric Z", 0.3, generalZ},
		{"flat, general Z", 0, generalZ},
	} {
		s, c := hexSheet(t, tc.buckle, tc.z, grid.Identity())
		if got := wsRadius(s.Lattice, mesh, 2); math.Abs(got-rWS) > 1e-12 {
			t.Fatalf("r_WS = %v, want %v", got, rWS)
		}
		lambdas := []float64{4 / rWS, 5 / rWS, 6 / rWS, 8 / rWS}
		for _, f := range fs {
			q := s.Lattice.Cartesian(f)
			var ref, lr0 []complex128
			worst := 0.0
			for i, lam := range lambdas {
				k := mustKernel(t, s, c, mesh, Kernel2D, WithLambda(lam))
				l := lr(k, q, grid.Vec3{})
				sr := shortRange(s, c, 2, grid.Identity(), lam, q)
				tot := make([]complex128, len(l))
				for j := range l {
					tot[j] = l[j] + sr[j]
				}
				if i == 0 {
					ref, lr0 = tot, l
					continue
				}
				worst = math.Max(worst, relDiff(tot, ref))
				// The kernel alone does depend on Λ (else this test could not fail).
				if d := relDiff(l, lr0); d < 1e-3 {
					t.Errorf("%s q=%v: C^LR at Λ=%.3g and %.3g differ by only %.2g", tc.name, f, lam, lambdas[0], d)
				}
			}
			if worst > 1e-9 {
				t.Errorf("%s q=%v: C^LR_Λ + remainder_Λ varies by %.2g relative over Λ·r_WS = 4…8 (tol 1e-9)", tc.name, f, worst)
			} else {
				t.Logf("%s q=%v: Λ-independence %.2g", tc.name, f, worst)
			}
		}
	}
}

// polarSlope returns e†[C(q) − C(0)]e/(|q|·√(M_κ M_κ')) for the mass-weighted pattern e of a
// two-atom cell, e_A = √M_B·v, e_B = −√M_A·v over √(M_A + M_B): the first-order change of ω² of
// that mode per |q|.
func polarSlope(k *Kernel, s grid.Structure, q grid.Vec3, v grid.Vec3) float64 {
	ma, mb := s.Atoms[0].Mass, s.Atoms[1].Mass
	var e [6]float64
	for i := 0; i < 3; i++ {
		e[i] = math.Sqrt(mb/(ma+mb)) * v[i] / math.Sqrt(ma)
		e[3+i] = -math.Sqrt(ma/(ma+mb)) * v[i] / math.Sqrt(mb)
	}
	c := lr(k, q, grid.Vec3{})
	c0 := lr(k, grid.Vec3{}, grid.Vec3{})
	var w complex128
	for i := 0; i < 6; i++ {
		for j := 0; j < 6; j++ {
			w += complex(e[i]*e[j], 0) * (c[i*6+j] - c0[i*6+j])
		}
	}
	return real(w) / q.Norm()
}

// richardson removes the O(q) term of a slope sampled at q1 and q2.
func richardson(s1, q1, s2, q2 float64) float64 { return (q2*s1 - q1*s2) / (q2 - q1) }

// TestSheetSmallQ checks the non-analytic small-q behaviour of a flat two-atom sheet with
// Z_A = −Z_B = Z·1 (PHYSICS.md §5, derived from the 2D Coulomb kernel; Royo & Stengel 2021):
//
//	ω²_LO(q) − ω²_LO(0) ≈ +(2π k_e Z²/(A μ ε_env)) |q|   (in-plane polar mode along q̂)
//	ω²_ZO(q) − ω²_ZO(0) ≈ −(2π k_e Z_zz²/(A μ)) |q|      (out-of-plane polar mode)
//
// and that the in-plane transverse pattern has no such slope. The slope is sampled at
// |q| = 1e-4 and 1e-3 1/Å; the leading correction is O(q) (erfc(q/2Λ) ≈ 1 − q/(Λ√π) and the
// analytic G ≠ 0 terms), so the raw value at 1e-4 must agree to 1e-3 and the Richardson
// extrapolation of the pair to 1e-6 (the remaining O(q1·q2) term).
func TestSheetSmallQ(t *testing.T) {
	const z = 2.1
	s, c := hexSheet(t, 0, isoZ(z), grid.Identity())
	ma, mb := s.Atoms[0].Mass, s.Atoms[1].Mass
	mu := ma * mb / (ma + mb)
	area := s.Lattice.Area()
	ke := units.CoulombEVAngstrom
	for _, env := range []float64{1, 2.5} {
		k := mustKernel(t, s, c, grid.Mesh{N: [3]int{6, 6, 1}}, Kernel2D, WithEnvironment(env))
		for _, th := range []float64{0, 0.3, 1.1} {
			qh := grid.Vec3{math.Cos(th), math.Sin(th), 0}
			tr := grid.Vec3{-qh[1], qh[0], 0}
			for _, mode := range []struct {
				name string
				v    grid.Vec3
				want float64
			}{
				{"LO", qh, 2 * math.Pi * ke * z * z / (area * mu * env)},
				{"ZO", grid.Vec3{0, 0, 1}, -2 * math.Pi * ke * z * z / (area * mu)},
			} {
				q1, q2 := 1e-4, 1e-3
				s1 := polarSlope(k, s, qh.Scale(q1), mode.v)
				s2 := polarSlope(k, s, qh.Scale(q2), mode.v)
				ext := richardson(s1, q1, s2, q2)
				if rel := math.Abs(s1-mode.want) / math.Abs(mode.want); rel > 1e-3 {
					t.Errorf("ε_env=%g θ=%g %s: slope at |q|=1e-4 = %.8g, want %.8g (rel %.2g > 1e-3)", env, th, mode.name, s1, mode.want, rel)
				}
				if rel := math.Abs(ext-mode.want) / math.Abs(mode.want); rel > 1e-6 {
					t.Errorf("ε_env=%g θ=%g %s: extrapolated slope %.10g, want %.10g (rel %.2g > 1e-6)", env, th, mode.name, ext, mode.want, rel)
				} else {
					t.Logf("ε_env=%g θ=%g %s: extrapolated slope rel error %.2g", env, th, mode.name, rel)
				}
			}
			// Transverse in-plane: (q̂·Z)·t̂ = 0, no |q| term.
			ext := richardson(polarSlope(k, s, qh.Scale(1e-4), tr), 1e-4, polarSlope(k, s, qh.Scale(1e-3), tr), 1e-3)
			scale := 2 * math.Pi * ke * z * z / (area * mu)
			if math.Abs(ext) > 1e-6*scale {
				t.Errorf("ε_env=%g θ=%g TO: extrapolated slope %.3g, want 0 (tol 1e-6·%.3g)", env, th, ext, scale)
			}
		}
	}
}

// TestSlabDerivatives checks ∂_zĝ and ∂_z²ĝ of slab against central differences of ĝ in z,
// and the Λ → ∞ limit ĝ → (2π/K) e^{−K|z|} (the in-plane transform of 1/r; erfc(K/2Λ ± Λz)
// → 0 or 2): both independent of the closed forms.
func TestSlabDerivatives(t *testing.T) {
	const h = 1e-4
	for _, tc := range []struct{ k, z, lambda float64 }{
		{0.7, 0.3, 0.5}, {2.0, -0.45, 0.8}, {5.0, 1.2, 1.1}, {0.05, 2.0, 0.6}, {3.0, 0, 0.9},
	} {
		g, dg, d2g := slab(tc.k, tc.z, tc.lambda)
		gp, _, _ := slab(tc.k, tc.z+h, tc.lambda)
		gm, _, _ := slab(tc.k, tc.z-h, tc.lambda)
		fd1 := (gp - gm) / (2 * h)
		fd2 := (gp - 2*g + gm) / (h * h)
		// Truncation h²/6·g‴ and rounding ~1e-16·g/h² set the tolerances.
		scale := math.Abs(g) + math.Abs(dg) + math.Abs(d2g)
		if math.Abs(fd1-dg) > 1e-7*scale {
			t.Errorf("∂zĝ(K=%g, z=%g, Λ=%g) = %.10g, differences give %.10g", tc.k, tc.z, tc.lambda, dg, fd1)
		}
		if math.Abs(fd2-d2g) > 1e-5*scale {
			t.Errorf("∂z²ĝ(K=%g, z=%g, Λ=%g) = %.10g, differences give %.10g", tc.k, tc.z, tc.lambda, d2g, fd2)
		}
	}
	for _, tc := range []struct{ k, z float64 }{{0.8, 0.5}, {2.5, -1.5}, {0.3, 4}} {
		g, dg, d2g := slab(tc.k, tc.z, 1e3)
		e := math.Exp(-tc.k * math.Abs(tc.z))
		want := [3]float64{2 * math.Pi / tc.k * e, -math.Copysign(2*math.Pi, tc.z) * e, 2 * math.Pi * tc.k * e}
		got := [3]float64{g, dg, d2g}
		for i := range got {
			if math.Abs(got[i]-want[i]) > 1e-12*math.Abs(want[i]) {
				t.Errorf("slab(K=%g, z=%g, Λ=1e3)[%d] = %.15g, want %.15g (Λ → ∞ limit)", tc.k, tc.z, i, got[i], want[i])
			}
		}
	}
	// Large K|z| (a thick multilayer): finite, and the z → −z symmetries hold exactly.
	for _, z := range []float64{30, -30, 200} {
		g, dg, d2g := slab(4, z, 0.5)
		gr, dgr, d2gr := slab(4, -z, 0.5)
		if math.IsNaN(g+dg+d2g) || math.IsInf(g+dg+d2g, 0) || g != gr || dg != -dgr || d2g != d2gr {
			t.Errorf("slab(4, %g, 0.5) = %v %v %v, mirrored %v %v %v", z, g, dg, d2g, gr, dgr, d2gr)
		}
	}
}

// TestSheetZeroTerm: at q = 0 the K = 0 zz term 4√πΛ(k_e/A) Z_zα Z_zβ e^{−Λ²z²} is present (its
// weight appears in C(0) but cancels under the acoustic sum rule); check it against the limit
// q → 0 of the kernel (continuous in 2D), to O(q).
func TestSheetZeroTerm(t *testing.T) {
	s, c := hexSheet(t, 0.3, generalZ, grid.Identity())
	k := mustKernel(t, s, c, grid.Mesh{N: [3]int{6, 6, 1}}, Kernel2D)
	c0 := lr(k, grid.Vec3{}, grid.Vec3{})
	c1 := lr(k, grid.Vec3{1e-7, -2e-7, 0}, grid.Vec3{1, 0, 0})
	if d := relDiff(c1, c0); d > 1e-5 {
		t.Errorf("C(|q| = 2e-7) differs from C(0) by %.2g relative, want a continuous limit (tol 1e-5)", d)
	}
	// dir is ignored in 2D.
	if d := relDiff(lr(k, grid.Vec3{}, grid.Vec3{1, 1, 0}), c0); d != 0 {
		t.Errorf("2d kernel at Γ depends on dir (%.2g)", d)
	}
}

func BenchmarkEwald2D(b *testing.B) {
	for _, lrws := range []float64{5, 8} {
		for _, buckle := range []float64{0, 0.3} {
			b.Run(fmt.Sprintf("lambdaRWS=%g/buckle=%g", lrws, buckle), func(b *testing.B) {
				s, c := hexSheet(b, buckle, generalZ, grid.Mat3{{2.6, 0, 0}, {0, 2.6, 0}, {0, 0, 1.4}})
				k := mustKernel(b, s, c, grid.Mesh{N: [3]int{6, 6, 1}}, Kernel2D, WithLambda(lrws/9))
				dst := make([]complex128, 36)
				q := s.Lattice.Cartesian(grid.Vec3{0.13, 0.21, 0})
				b.ReportAllocs()
				for b.Loop() {
					k.Add(dst, q, grid.Vec3{}, 1)
				}
				b.ReportMetric(float64(len(k.gs)), "G-vectors")
			})
		}
	}
}
