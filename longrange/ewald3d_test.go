package longrange

import (
	"fmt"
	"math"
	"testing"

	"lamina/grid"
	"lamina/grid/units"
)

// TestBulkLambdaIndependence: the Gonze–Lee sum plus the test's own real-space remainder
// (shortRange with the anisotropic metric ε∞) is the full dipole–dipole sum and must not depend
// on Λ over the allowed range Λ·r_WS/√λ_max(ε∞) = 4…8, for a triclinic three-atom crystal with
// anisotropic ε∞ and non-symmetric Z. Both sums are converged far below the tolerance
// (e^{−50}, erfc(6.5)), so 1e-9 leaves room for rounding only.
func TestBulkLambdaIndependence(t *testing.T) {
	s, c := triclinic3D(t)
	mesh := grid.Mesh{N: [3]int{4, 4, 4}}
	base := DefaultLambda(s, c.Epsilon, mesh, Kernel3D) / lambdaRWS3D
	lambdas := []float64{4 * base, 5 * base, 6 * base, 8 * base}
	fs := []grid.Vec3{{0, 0, 0}, {0.13, -0.27, 0.41}, {0.5, 0.5, 0}, {1.3, 0.2, -0.7}, {1e-3, 0, 2e-3}}
	for _, f := range fs {
		q := s.Lattice.Cartesian(f)
		var ref, lr0 []complex128
		worst := 0.0
		for i, lam := range lambdas {
			k := mustKernel(t, s, c, mesh, Kernel3D, WithLambda(lam))
			l := lr(k, q, grid.Vec3{})
			sr := shortRange(s, c, 3, c.Epsilon, lam, q)
			tot := make([]complex128, len(l))
			for j := range l {
				tot[j] = l[j] + sr[j]
			}
			if i == 0 {
				ref, lr0 = tot, l
				continue
			}
			worst = math.Max(worst, relDiff(tot, ref))
			if d := relDiff(l, lr0); d < 1e-3 {
				t.Errorf("q=%v: C^LR at Λ=%.3g and %.3g differ by only %.2g", f, lam, lambdas[0], d)
			}
		}
		if worst > 1e-9 {
			t.Errorf("q=%v: C^LR_Λ + remainder_Λ varies by %.2g relative over Λ·r_WS/√λ_max = 4…8 (tol 1e-9)", f, worst)
		} else {
			t.Logf("q=%v: Λ-independence %.2g", f, worst)
		}
	}
}

// TestBulkNonAnalytic checks the Γ limit of the 3D kernel (Gonze & Lee, Phys. Rev. B 55, 10355
// (1997)): Add at q = 0 with a direction minus Add without one is
// (4π k_e/Ω)(d̂·Z_κ)_α(d̂·Z_κ')_β/(d̂·ε∞·d̂) (tolerance 1e-13: one term against a sum of ~1e4), and
// it is the limit of C(t·d̂) as t → 0. C(t·d̂) has O(t) terms (odd in t: the phase and the
// analytic part) and O(t²) ones; the mean of C(±t·d̂) keeps only the O(t²) ones, so its distance
// to the Γ value must fall 100× from t = 1e-3 to 1e-4 (allow 50×).
func TestBulkNonAnalytic(t *testing.T) {
	s, c := triclinic3D(t)
	k := mustKernel(t, s, c, grid.Mesh{N: [3]int{4, 4, 4}}, Kernel3D)
	n := s.N()
	m := 3 * n
	pref := 4 * math.Pi * units.CoulombEVAngstrom / s.Lattice.Volume()
	an := lr(k, grid.Vec3{}, grid.Vec3{})
	for _, dir := range []grid.Vec3{{1, 0, 0}, {0, 0, 3}, {1, 2, -0.5}, {-0.3, 0.8, 0.1}} {
		d := dir.Scale(1 / dir.Norm())
		na := lr(k, grid.Vec3{}, dir)
		// A reciprocal lattice vector as q is Γ too.
		naG := lr(k, s.Lattice.Cartesian(grid.Vec3{1, -2, 1}), dir)
		if dd := relDiff(naG, na); dd > 1e-12 {
			t.Errorf("dir=%v: Γ as q = G differs from q = 0 by %.2g", dir, dd)
		}
		want := make([]complex128, m*m)
		for a := 0; a < n; a++ {
			for b := 0; b < n; b++ {
				za, zb := c.Z[a].VecMul(d), c.Z[b].VecMul(d)
				for al := 0; al < 3; al++ {
					for be := 0; be < 3; be++ {
						want[(3*a+al)*m+3*b+be] = complex(pref*za[al]*zb[be]/c.Epsilon.Quad(d), 0)
					}
				}
			}
		}
		diff := make([]complex128, m*m)
		for i := range diff {
			diff[i] = na[i] - an[i]
		}
		if dd := relDiff(diff, want); dd > 1e-13 {
			t.Errorf("dir=%v: C(0, d̂) − C(0) differs from the Gonze–Lee term by %.2g relative (tol 1e-13)", dir, dd)
		}
		var errs [2]float64
		for i, tt := range []float64{1e-3, 1e-4} {
			cp := lr(k, d.Scale(tt), grid.Vec3{})
			cm := lr(k, d.Scale(-tt), grid.Vec3{})
			mean := make([]complex128, m*m)
			for j := range mean {
				mean[j] = (cp[j] + cm[j]) / 2
			}
			errs[i] = relDiff(mean, na)
		}
		if errs[1] > errs[0]/50 || errs[1] > 1e-6 {
			t.Errorf("dir=%v: mean of C(±t d̂) − C(0, d̂) = %.2g at t=1e-3, %.2g at t=1e-4: not O(t²)", dir, errs[0], errs[1])
		}
	}
}

// TestBulkLOTO checks the rigid-ion LO–TO splitting of a cubic two-atom crystal (Born & Huang,
// Dynamical Theory of Crystal Lattices (1954)): ω²_LO − ω²_TO = 4π k_e Z²/(Ω μ ε∞), as the
// mass-weighted projection of C(0, d̂) − C(0) on the polar pattern along d̂ (zero on a transverse
// one). Tolerance 1e-13: a single term.
func TestBulkLOTO(t *testing.T) {
	const a, z, eps = 4.1, 1.3, 2.7
	l := mustLattice(t, grid.Mat3{{a, 0, 0}, {0, a, 0}, {0, 0, a}}, grid.Bulk)
	s := grid.Structure{Lattice: l, Atoms: []grid.Atom{
		{Species: "A", Mass: 19, Position: grid.Vec3{}},
		{Species: "B", Mass: 41, Position: grid.Vec3{a / 2, a / 2, a / 2}},
	}}
	c := Charges{Z: []grid.Mat3{isoZ(z), isoZ(-z)}, Epsilon: grid.Identity().Scale(eps)}
	k := mustKernel(t, s, c, grid.Mesh{N: [3]int{4, 4, 4}}, Kernel3D)
	mu := 19.0 * 41 / 60
	want := 4 * math.Pi * units.CoulombEVAngstrom * z * z / (l.Volume() * mu * eps)
	d := grid.Vec3{1, 1, 0}.Scale(1 / math.Sqrt2)
	tr := grid.Vec3{0, 0, 1}
	an := lr(k, grid.Vec3{}, grid.Vec3{})
	na := lr(k, grid.Vec3{}, d)
	for i := range na {
		na[i] -= an[i]
	}
	project := func(v grid.Vec3) float64 {
		var e [6]float64
		for i := 0; i < 3; i++ {
			e[i] = math.Sqrt(41.0/60) * v[i] / math.Sqrt(19)
			e[3+i] = -math.Sqrt(19.0/60) * v[i] / math.Sqrt(41)
		}
		var w float64
		for i := 0; i < 6; i++ {
			for j := 0; j < 6; j++ {
				w += e[i] * e[j] * real(na[i*6+j])
			}
		}
		return w
	}
	if got := project(d); math.Abs(got-want) > 1e-13*want {
		t.Errorf("ω²_LO − ω²_TO = %.15g, want %.15g (Born–Huang)", got, want)
	}
	if got := project(tr); math.Abs(got) > 1e-13*want {
		t.Errorf("transverse shift = %.3g, want 0", got)
	}
}

func BenchmarkEwald3D(b *testing.B) {
	for _, lrws := range []float64{4.5, 8} {
		b.Run(fmt.Sprintf("lambdaRWS=%g", lrws), func(b *testing.B) {
			s, c := triclinic3D(b)
			mesh := grid.Mesh{N: [3]int{4, 4, 4}}
			lam := DefaultLambda(s, c.Epsilon, mesh, Kernel3D) * lrws / lambdaRWS3D
			k := mustKernel(b, s, c, mesh, Kernel3D, WithLambda(lam))
			m := 3 * s.N()
			dst := make([]complex128, m*m)
			q := s.Lattice.Cartesian(grid.Vec3{0.13, 0.21, -0.3})
			b.ReportAllocs()
			for b.Loop() {
				k.Add(dst, q, grid.Vec3{}, 1)
			}
			b.ReportMetric(float64(len(k.gs)), "G-vectors")
		})
	}
}
