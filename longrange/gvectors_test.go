package longrange

import (
	"math"
	"testing"

	"lamina/grid"
)

// TestLatticeBall compares latticeBall with a brute-force scan of a much larger integer box on
// a skewed triclinic lattice (count, and every listed point inside the radius).
func TestLatticeBall(t *testing.T) {
	l := mustLattice(t, grid.Mat3{{3, 0, 0}, {2.6, 1.1, 0}, {-1.4, 0.9, 2.2}}, grid.Bulk)
	for _, r := range []float64{0.5, 3, 7.5} {
		got := latticeBall(l.Vectors, l.Reciprocal(), 3, r, nil)
		want := 0
		const box = 30
		for a := -box; a <= box; a++ {
			for b := -box; b <= box; b++ {
				for c := -box; c <= box; c++ {
					if l.Point([3]int{a, b, c}).Norm() <= r {
						want++
					}
				}
			}
		}
		if len(got) != want {
			t.Errorf("latticeBall(r=%g) has %d points, brute force %d", r, len(got), want)
		}
		for _, v := range got {
			if v.Norm() > r {
				t.Errorf("latticeBall(r=%g) lists %v, |v| = %g", r, v, v.Norm())
			}
		}
	}
	// shortestVector on the same lattice, against the brute-force minimum.
	best := math.Inf(1)
	for a := -6; a <= 6; a++ {
		for b := -6; b <= 6; b++ {
			for c := -6; c <= 6; c++ {
				if n := l.Point([3]int{a, b, c}).Norm(); n > 0 {
					best = math.Min(best, n)
				}
			}
		}
	}
	if got := shortestVector(l.Vectors, l.Reciprocal(), 3); math.Abs(got-best) > 1e-12 {
		t.Errorf("shortestVector = %v, brute force %v", got, best)
	}
}

// TestFold: folding removes reciprocal lattice vectors, lands in the half-open zone, detects Γ
// within 1e-9 in reduced coordinates, and drops q_z for a sheet.
func TestFold(t *testing.T) {
	l := mustLattice(t, grid.Mat3{{3, 0, 0}, {2.6, 1.1, 0}, {-1.4, 0.9, 2.2}}, grid.Bulk)
	geo := newGeometry(l, 3)
	for _, f := range []grid.Vec3{{0.2, -0.3, 0.45}, {1.2, 3.7, -2.55}, {2, -1, 4}, {3 + 1e-10, 0, -1}, {1e-8, 0, 0}} {
		qf, gamma := geo.fold(l.Cartesian(f))
		r := l.Reduced(qf)
		wantGamma := true
		var d grid.Vec3
		for i := 0; i < 3; i++ {
			d[i] = f[i] - math.Round(f[i])
			if math.Abs(d[i]) > 1e-9 {
				wantGamma = false
			}
		}
		if gamma != wantGamma || (gamma && qf != (grid.Vec3{})) {
			t.Errorf("fold(%v): gamma = %v (q = %v), want %v", f, gamma, qf, wantGamma)
			continue
		}
		for i := 0; i < 3 && !gamma; i++ {
			if math.Abs(r[i]-d[i]) > 1e-12 || math.Abs(r[i]) > 0.5 {
				t.Errorf("fold(%v) = reduced %v, want %v", f, r, d)
			}
		}
	}
	// Sheet: a3 tilted, q from Cartesian has a z part that the sheet geometry drops.
	s := mustLattice(t, grid.Mat3{{3, 0, 0}, {1.5, 2.6, 0}, {0.7, -0.4, 15}}, grid.Sheet)
	sg := newGeometry(s, 2)
	q := s.Cartesian(grid.Vec3{0.25, -0.1, 0})
	qf, _ := sg.fold(q)
	if qf[2] != 0 || math.Abs(qf[0]-q[0]) > 1e-15 || math.Abs(qf[1]-q[1]) > 1e-15 {
		t.Errorf("sheet fold(%v) = %v, want the in-plane part", q, qf)
	}
	// b1', b2' are in-plane and dual to a1, a2.
	for i := 0; i < 2; i++ {
		for j := 0; j < 2; j++ {
			want := 0.0
			if i == j {
				want = 2 * math.Pi
			}
			if got := grid.Vec3(sg.b[i]).Dot(grid.Vec3(sg.a[j])); math.Abs(got-want) > 1e-12 || sg.b[i][2] != 0 {
				t.Errorf("b%d'·a%d = %v, want %v (b' = %v)", i+1, j+1, got, want, sg.b[i])
			}
		}
	}
}
