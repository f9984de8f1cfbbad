package exact

import (
	"math"
	"testing"

	"lamina/grid"
	"lamina/grid/units"
)

// nearGammaDirs are Cartesian directions for the checks next to Γ (in-plane ones for sheets).
var nearGammaDirs = []grid.Vec3{{1, 0, 0}, {0, 1, 0}, {1, 1, 0}, {0.3, -0.8, 0}, {-0.9, 0.25, 0},
	{0, 0, 1}, {0.5, 0.5, 0.7}, {-0.4, 0.2, 0.9}}

// stabilityTol is the most negative frequency accepted as real: at Γ-adjacent q the acoustic
// eigenvalues are computed to ~1e-15 of the largest, i.e. |f| ≲ 5e-7 THz.
const stabilityTol = -1e-6

// TestCatalogueStable samples every catalogue model on a dense mesh (24×24 for sheets,
// 10×10×10 for bulk), at 200 random points, and along eight directions at |q| = 0.002–0.05/Å
// next to Γ, and requires every frequency to be real (> −1e-6 THz).
func TestCatalogueStable(t *testing.T) {
	for _, m := range Catalogue() {
		sheet := m.Structure.Lattice.Periodicity == grid.Sheet
		n, n3 := 24, 1
		if !sheet {
			n, n3 = 10, 10
		}
		var qs []grid.Vec3
		for i := 0; i < n; i++ {
			for j := 0; j < n; j++ {
				for k := 0; k < n3; k++ {
					qs = append(qs, grid.Vec3{float64(i) / float64(n), float64(j) / float64(n), float64(k) / float64(n3)})
				}
			}
		}
		qs = append(qs, randomQ(m, 200, 11)...)
		for _, d := range nearGammaDirs {
			if sheet && d[2] != 0 {
				continue
			}
			for _, x := range []float64{0.002, 0.005, 0.01, 0.02, 0.05} {
				qs = append(qs, m.reduced(d.Scale(x/d.Norm())))
			}
		}
		lo, hi := math.Inf(1), math.Inf(-1)
		for _, f := range qs {
			fr := m.Frequencies(f, grid.Vec3{})
			if fr[0] < stabilityTol {
				t.Errorf("%s: imaginary mode %.4g THz at q=%v", m.Name, fr[0], f)
			}
			if f != (grid.Vec3{}) {
				lo = math.Min(lo, fr[0])
			}
			hi = math.Max(hi, fr[len(fr)-1])
		}
		t.Logf("%s: %d q-points, lowest %.4g THz (away from Γ), highest %.4g THz", m.Name, len(qs), lo, hi)
	}
}

// TestCatalogueSpectrum checks the design targets: optical modes at Γ between 2 and 25 THz, and
// for bulk a splitting of at least 1 THz between the analytic Γ and Γ along some direction.
func TestCatalogueSpectrum(t *testing.T) {
	for _, m := range Catalogue() {
		fr := m.Frequencies(grid.Vec3{}, grid.Vec3{})
		if fr[3] < 2 || fr[len(fr)-1] > 25 {
			t.Errorf("%s: optical modes at Γ span %.3f–%.3f THz, want within 2–25", m.Name, fr[3], fr[len(fr)-1])
		}
		t.Logf("%s Γ: %.4f", m.Name, fr)
		if m.bulk == nil {
			continue
		}
		split := 0.0
		for _, d := range nearGammaDirs {
			fd := m.Frequencies(grid.Vec3{}, d)
			for i := range fd {
				split = math.Max(split, fd[i]-fr[i])
			}
			t.Logf("%s Γ along %v: %.4f", m.Name, d, fd)
		}
		if split < 1 {
			t.Errorf("%s: largest LO–TO shift %.3f THz, want ≥ 1", m.Name, split)
		}
	}
}

// TestSheetSlopes checks the non-analytic onset of the 2D long range on the buckled two-atom
// sheet (Z = ±q·1, reduced mass μ): ω²_LO(q) = ω²_TO + (2π k_e Z²/(A μ)) |q| + O(q²) for the
// in-plane LO and ω²_ZO(q) = ω²_ZO(0) − (2π k_e Z_zz²/(A μ)) |q| + O(q²) for the out-of-plane
// polar mode (PHYSICS.md §5, first-order perturbation theory on the 2D kernel; Royo & Stengel,
// Phys. Rev. X 11, 041027 (2021)). The slope is extrapolated from |q| = 1e-4 and 2e-4/Å
// (Richardson, error O(q²) ≈ 1e-8 relative); tolerance 1e-6 relative.
func TestSheetSlopes(t *testing.T) {
	m := BuckledSheet()
	zq := m.Z[0][0][0]
	ma, mb := m.Structure.Atoms[0].Mass, m.Structure.Atoms[1].Mass
	mu := ma * mb / (ma + mb)
	want := 2 * math.Pi * units.CoulombEVAngstrom * zq * zq / (m.Structure.Lattice.Area() * mu)
	lam := func(f float64) float64 { x := f / units.THzPerSqrtEig; return math.Copysign(x*x, f) }
	f0 := m.Frequencies(grid.Vec3{}, grid.Vec3{})
	for _, d := range []grid.Vec3{{1, 0, 0}, {0.6, 0.8, 0}, {-0.2, 0.9, 0}} {
		d = d.Scale(1 / d.Norm())
		slope := func(mode int, q float64) float64 {
			f := m.Frequencies(m.reduced(d.Scale(q)), grid.Vec3{})
			return (lam(f[mode]) - lam(f0[mode])) / q
		}
		const q = 1e-4
		lo := 2*slope(4, q) - slope(4, 2*q)
		zo := 2*slope(5, q) - slope(5, 2*q)
		if math.Abs(lo-want) > 1e-6*want {
			t.Errorf("dir %v: LO slope %.9g, want %.9g eV/(Å amu) (rel %.2g)", d, lo, want, math.Abs(lo-want)/want)
		}
		if math.Abs(zo+want) > 1e-6*want {
			t.Errorf("dir %v: ZO slope %.9g, want %.9g eV/(Å amu) (rel %.2g)", d, zo, -want, math.Abs(zo+want)/want)
		}
		t.Logf("dir %v: LO slope rel err %.2g, ZO %.2g", d, math.Abs(lo-want)/want, math.Abs(zo+want)/want)
	}
}

// TestCatalogueData checks the invariants every model promises: distinct names, neutral
// charges, identity ε for sheets, springs that fit in the Wigner–Seitz cell of the supercell the
// pipeline tests use (6×6 sheets, 4×4×4 bulk; half its shortest vector).
func TestCatalogueData(t *testing.T) {
	seen := map[string]bool{}
	for _, m := range Catalogue() {
		if seen[m.Name] {
			t.Errorf("duplicate model name %q", m.Name)
		}
		seen[m.Name] = true
		var sum grid.Mat3
		for _, z := range m.Z {
			sum = sum.Add(z)
		}
		for a := 0; a < 3; a++ {
			for b := 0; b < 3; b++ {
				if math.Abs(sum[a][b]) > 1e-14 {
					t.Errorf("%s: Σ Z[%d][%d] = %g", m.Name, a, b, sum[a][b])
				}
			}
		}
		l := m.Structure.Lattice
		mult := 4
		if l.Periodicity == grid.Sheet {
			mult = 6
			if m.Epsilon != grid.Identity() {
				t.Errorf("%s: sheet epsilon %v", m.Name, m.Epsilon)
			}
		}
		shortest := math.Inf(1)
		for i := -1; i <= 1; i++ {
			for j := -1; j <= 1; j++ {
				for k := -1; k <= 1; k++ {
					if l.Periodicity == grid.Sheet && k != 0 || i == 0 && j == 0 && k == 0 {
						continue
					}
					shortest = math.Min(shortest, l.Point([3]int{mult * i, mult * j, mult * k}).Norm())
				}
			}
		}
		longest := 0.0
		for _, sp := range m.Springs {
			longest = math.Max(longest, bondVector(m.Structure, sp).Norm())
		}
		if longest >= shortest/2 {
			t.Errorf("%s: longest spring %.3f Å does not fit in the supercell's Wigner–Seitz radius %.3f Å", m.Name, longest, shortest/2)
		}
		t.Logf("%s: %d springs, longest %.3f Å, Wigner–Seitz radius %.3f Å", m.Name, len(m.Springs), longest, shortest/2)
	}
}
