package exact

import (
	"math"
	"testing"

	"lamina/grid"
)

// offSiteAsymmetry returns the largest antisymmetric part of the q = 0 off-site sums S_κ and the
// largest off-site entry.
func offSiteAsymmetry(m *Model) (anti, scale float64) {
	sums, scale := m.offSiteSums()
	for _, s := range sums {
		anti = math.Max(anti, axial(s).Norm())
	}
	return anti, scale
}

// firstMoment returns the largest component of T_{αβγ} = ∂_γ Im Σ_κκ' C^atom (Richardson).
func firstMoment(m *Model) float64 {
	worst := 0.0
	for g := 0; g < m.Structure.Lattice.Periodic(); g++ {
		var e grid.Vec3
		e[g] = 1
		d1 := m.momentDiff(e, balanceStep)
		d2 := m.momentDiff(e, balanceStep/2)
		t := d2.Scale(4.0 / 3).Add(d1.Scale(-1.0 / 3))
		for a := 0; a < 3; a++ {
			for b := 0; b < 3; b++ {
				worst = math.Max(worst, math.Abs(t[a][b]))
			}
		}
	}
	return worst
}

// TestBalance checks the two conditions of balance.go on the point-dipole models, and that they
// fail without the balancing couplings (so the couplings are needed and the check can fail).
// Tolerances: the asymmetry is solved to rounding (1e-12 of the largest off-site entry); the
// first moment is measured by finite differences with O(h⁴) ≈ 1e-11 error and rounding
// ~1e-15·|C|/h ≈ 1e-11, so 1e-8 of the unbalanced value.
func TestBalance(t *testing.T) {
	for _, m := range []*Model{DipoleSheet(), DipoleCrystal()} {
		if m.balancing == nil {
			t.Fatalf("%s: no balancing couplings", m.Name)
		}
		bare := *m
		bare.balancing = nil
		a0, sc := offSiteAsymmetry(&bare)
		t0 := firstMoment(&bare)
		a1, _ := offSiteAsymmetry(m)
		t1 := firstMoment(m)
		t.Logf("%s: asymmetry %.3g → %.3g, first moment %.3g → %.3g (scale %.3g)", m.Name, a0, a1, t0, t1, sc)
		if a0 < 1e-3*sc || t0 < 1e-3*sc {
			t.Errorf("%s: unbalanced asymmetry %.3g and moment %.3g are not significant: the check proves nothing", m.Name, a0, t0)
		}
		if a1 > 1e-12*sc {
			t.Errorf("%s: balanced off-site sums keep an antisymmetric part %.3g (> 1e-12·%.3g)", m.Name, a1, sc)
		}
		if t1 > 1e-8*t0 {
			t.Errorf("%s: balanced first moment %.3g (> 1e-8·%.3g)", m.Name, t1, t0)
		}
	}
	// Rigid ions with springs need nothing.
	for _, m := range []*Model{BuckledSheet(), RockSalt()} {
		if m.balancing != nil {
			t.Errorf("%s: rigid ions got balancing couplings", m.Name)
		}
	}
}

// TestBalanceAcoustic checks the consequence near Γ: with the couplings the acoustic branches of
// the point-dipole models are linear in |q| (f(2q)/f(q) = 2 within 2%, the O(q²) correction at
// |q| = 1e-3/Å), without them one of them is imaginary (ω² ∝ −|q|).
func TestBalanceAcoustic(t *testing.T) {
	for _, m := range []*Model{DipoleSheet(), DipoleCrystal()} {
		bare := *m
		bare.balancing = nil
		bare.fixed = make([]float64, len(m.fixed))
		bare.sumRule()
		d := grid.Vec3{0.6, 0.8, 0}
		q1 := m.reduced(d.Scale(1e-3))
		q2 := m.reduced(d.Scale(2e-3))
		f1 := m.Frequencies(q1, grid.Vec3{})
		f2 := m.Frequencies(q2, grid.Vec3{})
		for i := 0; i < 3; i++ {
			if r := f2[i] / f1[i]; math.Abs(r-2) > 0.04 {
				t.Errorf("%s: acoustic branch %d: f(2q)/f(q) = %.4f (%.4g, %.4g THz), want 2", m.Name, i, r, f1[i], f2[i])
			}
		}
		if fb := bare.Frequencies(q1, grid.Vec3{}); fb[0] > -1e-3 {
			t.Errorf("%s without balancing: lowest frequency %.3g THz, expected an imaginary branch", m.Name, fb[0])
		}
	}
}
