package grid

import (
	"math"
	"math/rand/v2"
	"sort"
	"testing"
)

// transformCell returns the cell with rows a'_i = Σ_j u_ij a_j.
func transformCell(u [3][3]int, a Mat3) Mat3 {
	var out Mat3
	for i := range out {
		for j := 0; j < 3; j++ {
			out[i] = Vec3(out[i]).Add(Vec3(a[j]).Scale(float64(u[i][j])))
		}
	}
	return out
}

func intDet(u [3][3]int) int {
	return u[0][0]*(u[1][1]*u[2][2]-u[1][2]*u[2][1]) -
		u[0][1]*(u[1][0]*u[2][2]-u[1][2]*u[2][0]) +
		u[0][2]*(u[1][0]*u[2][1]-u[1][1]*u[2][0])
}

// randomUnimodular returns a product of `steps` random elementary integer operations (add ±1
// or ±2 times one row to another, swap two rows, negate a row) acting on the first dim rows;
// its determinant is ±1 by construction.
func randomUnimodular(rng *rand.Rand, dim, steps int) [3][3]int {
	u := [3][3]int{{1, 0, 0}, {0, 1, 0}, {0, 0, 1}}
	for s := 0; s < steps; s++ {
		i, j := rng.IntN(dim), rng.IntN(dim)
		switch op := rng.IntN(5); {
		case i == j || op == 4:
			for k := range u[i] {
				u[i][k] = -u[i][k]
			}
		case op == 3:
			u[i], u[j] = u[j], u[i]
		default:
			f := 1 + rng.IntN(2)
			if rng.IntN(2) == 0 {
				f = -f
			}
			for k := range u[i] {
				u[i][k] += f * u[j][k]
			}
		}
	}
	return u
}

// successiveMinima returns λ1 ≤ … ≤ λdim of the lattice with basis rows a (first dim rows), by
// brute force: all lattice vectors with coefficients |n_i| ≤ box, sorted by length, taking each
// one that is linearly independent of those already taken. box must be large enough for a; the
// tests call it with nearly reduced base cells only.
func successiveMinima(a Mat3, dim, box int) []float64 {
	var vs []Vec3
	for i := -box; i <= box; i++ {
		for j := -box; j <= box; j++ {
			for k := -box; k <= box; k++ {
				if dim == 2 && k != 0 || i == 0 && j == 0 && k == 0 {
					continue
				}
				vs = append(vs, Vec3(a[0]).Scale(float64(i)).Add(Vec3(a[1]).Scale(float64(j))).Add(Vec3(a[2]).Scale(float64(k))))
			}
		}
	}
	sort.Slice(vs, func(x, y int) bool { return vs[x].Norm() < vs[y].Norm() })
	var taken []Vec3
	var out []float64
	for _, v := range vs {
		ok := false
		switch len(taken) {
		case 0:
			ok = true
		case 1:
			ok = taken[0].Cross(v).Norm() > 1e-9*v.Norm()*taken[0].Norm()
		case 2:
			n := taken[0].Cross(taken[1])
			ok = math.Abs(n.Dot(v)) > 1e-9*n.Norm()*v.Norm()
		}
		if ok {
			taken = append(taken, v)
			out = append(out, v.Norm())
			if len(out) == dim {
				break
			}
		}
	}
	return out
}

func TestReduce2DSuccessiveMinima(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 1))
	bases := map[string]Mat3{ // invented plane cells, already nearly reduced
		"oblique":   {{3, 0, 0}, {0.7, 3.9, 0}, {0, 0, 1}},
		"hexagonal": {{2.5, 0, 0}, {-1.25, 2.5 * math.Sqrt(3) / 2, 0}, {0, 0, 1}},
		"square":    {{3.2, 0, 0}, {0, 3.2, 0}, {0, 0, 1}},
		"rhombic":   {{1.5, 2, 0}, {1.5, -2, 0}, {0, 0, 1}},
		"needle":    {{1, 0, 0}, {0.3, 17, 0}, {0, 0, 1}},
	}
	for name, base := range bases {
		want := successiveMinima(base, 2, 6)
		for trial := 0; trial < 42; trial++ {
			u := randomUnimodular(rng, 2, 1+trial/4)
			switch trial { // two strongly skewed cells besides the random ones
			case 40:
				u = [3][3]int{{1, 37, 0}, {0, 1, 0}, {0, 0, 1}}
			case 41:
				u = [3][3]int{{29, 30, 0}, {28, 29, 0}, {0, 0, 1}}
			}
			a := transformCell(u, base)
			r, m := Reduce2D(Vec3(a[0]), Vec3(a[1]))
			if d := m[0][0]*m[1][1] - m[0][1]*m[1][0]; d != 1 {
				t.Errorf("%s trial %d: det m = %d, want +1", name, trial, d)
			}
			for i := 0; i < 2; i++ {
				// r_i = Σ m_ij a_j: exact integer combination, up to rounding of the sums.
				x := Vec3(a[0]).Scale(float64(m[i][0])).Add(Vec3(a[1]).Scale(float64(m[i][1])))
				if x.Sub(r[i]).Norm() > 1e-9*want[1] {
					t.Errorf("%s trial %d: r%d = %v, but m row gives %v", name, trial, i+1, r[i], x)
				}
				// Gauss-reduced pair attains the successive minima (derived: the two-dimensional
				// case of Minkowski reduction); tolerance: rounding of sums of a few terms.
				if math.Abs(r[i].Norm()-want[i]) > 1e-9*want[i] {
					t.Errorf("%s trial %d: |r%d| = %.12g, want λ%d = %.12g", name, trial, i+1, r[i].Norm(), i+1, want[i])
				}
			}
			if c := r[0].Dot(r[1]); math.Abs(c) > r[0].Dot(r[0])/2*(1+1e-9) {
				t.Errorf("%s trial %d: |r1·r2| = %g > |r1|²/2 = %g", name, trial, math.Abs(c), r[0].Dot(r[0])/2)
			}
			if s := Vec3(a[0]).Cross(Vec3(a[1]))[2] * r[0].Cross(r[1])[2]; s <= 0 {
				t.Errorf("%s trial %d: orientation of the pair changed", name, trial)
			}
		}
	}
}

func TestReduce3DSuccessiveMinima(t *testing.T) {
	rng := rand.New(rand.NewPCG(2, 1))
	s3 := math.Sqrt(3)
	bases := map[string]Mat3{ // invented cells, nearly reduced
		"fcc":       {{0, 2.1, 2.1}, {2.1, 0, 2.1}, {2.1, 2.1, 0}},
		"bcc":       {{-1.65, 1.65, 1.65}, {1.65, -1.65, 1.65}, {1.65, 1.65, -1.65}},
		"hexagonal": {{2.9, 0, 0}, {-1.45, 1.45 * s3, 0}, {0, 0, 4.7}},
		"triclinic": {{3.1, 0.2, -0.3}, {0.6, 3.7, 0.4}, {-0.5, 0.9, 4.4}},
		"flat":      {{2, 0, 0}, {0.4, 2.2, 0}, {0.3, -0.2, 9.5}},
	}
	for name, base := range bases {
		want := successiveMinima(base, 3, 4)
		for trial := 0; trial < 42; trial++ {
			u := randomUnimodular(rng, 3, 1+trial/3)
			switch trial { // two strongly skewed cells besides the random ones
			case 40:
				u = [3][3]int{{1, 40, 0}, {0, 1, 0}, {0, -25, 1}}
			case 41:
				u = [3][3]int{{1, 0, 0}, {31, 1, 0}, {17, 19, 1}}
			}
			a := transformCell(u, base)
			r, m := Reduce3D(a)
			if d := intDet(m); d != 1 {
				t.Errorf("%s trial %d: det m = %d, want +1", name, trial, d)
			}
			x := transformCell(m, a)
			for i := 0; i < 3; i++ {
				if Vec3(x[i]).Sub(Vec3(r[i])).Norm() > 1e-9*want[2] {
					t.Errorf("%s trial %d: r%d = %v, but m row gives %v", name, trial, i+1, r[i], x[i])
				}
				// Minkowski-reduced bases attain the successive minima in dimension 3 (derived from
				// the definition; Nguyen & Stehlé 2009 for the greedy algorithm, from memory).
				if n := Vec3(r[i]).Norm(); math.Abs(n-want[i]) > 1e-9*want[i] {
					t.Errorf("%s trial %d: |r%d| = %.12g, want λ%d = %.12g", name, trial, i+1, n, i+1, want[i])
				}
			}
			if a.Det()*r.Det() <= 0 {
				t.Errorf("%s trial %d: handedness changed (det a = %g, det r = %g)", name, trial, a.Det(), r.Det())
			}
		}
	}
}
