package exact

import (
	"math"
	"math/cmplx"
	"math/rand/v2"
	"strings"
	"sync"
	"testing"

	"lamina/grid"
)

// randomQ returns reduced q-points (f3 = 0 for a sheet) from a fixed seed.
func randomQ(m *Model, n int, seed uint64) []grid.Vec3 {
	rng := rand.New(rand.NewPCG(seed, 1))
	out := make([]grid.Vec3, n)
	for i := range out {
		out[i] = grid.Vec3{rng.Float64() - 0.5, rng.Float64() - 0.5, rng.Float64() - 0.5}
		if m.Structure.Lattice.Periodicity == grid.Sheet {
			out[i][2] = 0
		}
	}
	return out
}

func allModels() []*Model { return append(Catalogue(), Chain(12, 3, 2.5)) }

// TestMatrixSymmetries checks C = C†, C(−q) = C(q)* and C(q + G) = C(q) (the "cell" phase,
// PHYSICS.md §3) at random q. The matrices are computed independently at each q, so the
// tolerance is rounding of the lattice sums: 1e-12 of the largest entry.
func TestMatrixSymmetries(t *testing.T) {
	for _, m := range allModels() {
		n3 := 3 * m.Structure.N()
		for _, f := range randomQ(m, 6, 7) {
			c := m.Matrix(nil, f, grid.Vec3{})
			cm := m.Matrix(nil, f.Scale(-1), grid.Vec3{})
			g := grid.Vec3{2, -1, 1}
			if m.Structure.Lattice.Periodicity == grid.Sheet {
				g[2] = 0
			}
			cg := m.Matrix(nil, f.Add(g), grid.Vec3{})
			var herm, conj, per, scale float64
			for i := 0; i < n3; i++ {
				for j := 0; j < n3; j++ {
					x := c[i*n3+j]
					scale = math.Max(scale, cmplx.Abs(x))
					herm = math.Max(herm, cmplx.Abs(x-cmplx.Conj(c[j*n3+i])))
					conj = math.Max(conj, cmplx.Abs(cm[i*n3+j]-cmplx.Conj(x)))
					per = math.Max(per, cmplx.Abs(cg[i*n3+j]-x))
				}
			}
			for _, c := range []struct {
				name string
				v    float64
			}{{"C − C†", herm}, {"C(−q) − C(q)*", conj}, {"C(q+G) − C(q)", per}} {
				if c.v > 1e-12*scale {
					t.Errorf("%s q=%v: |%s| = %.3g (scale %.3g)", m.Name, f, c.name, c.v, scale)
				}
			}
		}
	}
}

// TestAcousticSumRule checks Σ_κ' C_κκ'(0) = 0 (PHYSICS.md §6, imposed by construction: the
// on-site blocks are computed from the other terms, so this tests the bookkeeping, not the
// Ewald sums) and three zero frequencies at Γ within 1e-6 THz (rounding of eigenvalues of
// size ~1 eV/(Å² amu) maps to ~15.6·√1e-15 ≈ 5e-7 THz).
func TestAcousticSumRule(t *testing.T) {
	for _, m := range allModels() {
		n := m.Structure.N()
		n3 := 3 * n
		c := m.Matrix(nil, grid.Vec3{}, grid.Vec3{})
		scale, worst := 0.0, 0.0
		for k := 0; k < n; k++ {
			for a := 0; a < 3; a++ {
				for b := 0; b < 3; b++ {
					var s complex128
					for kp := 0; kp < n; kp++ {
						s += c[(3*k+a)*n3+3*kp+b]
						scale = math.Max(scale, cmplx.Abs(c[(3*k+a)*n3+3*kp+b]))
					}
					worst = math.Max(worst, cmplx.Abs(s))
				}
			}
		}
		if worst > 1e-12*scale {
			t.Errorf("%s: acoustic sum rule violated by %.3g (scale %.3g)", m.Name, worst, scale)
		}
		fr := m.Frequencies(grid.Vec3{}, grid.Vec3{})
		for i := 0; i < 3; i++ {
			if math.Abs(fr[i]) > 1e-6 {
				t.Errorf("%s: acoustic frequency %d at Γ = %.3g THz, want 0 ± 1e-6", m.Name, i, fr[i])
			}
		}
		t.Logf("%s: sum rule residual %.2g of %.3g; acoustic Γ frequencies %.2g %.2g %.2g THz", m.Name, worst, scale, fr[0], fr[1], fr[2])
		// With a direction the acoustic modes stay at zero too: Σ_κ Z_κ = 0.
		if m.bulk != nil {
			fr := m.Frequencies(grid.Vec3{}, grid.Vec3{0.2, 0.5, -0.8})
			for i := 0; i < 3; i++ {
				if math.Abs(fr[i]) > 1e-6 {
					t.Errorf("%s: acoustic frequency %d at Γ with a direction = %.3g THz", m.Name, i, fr[i])
				}
			}
		}
	}
}

// TestMatrixDst checks that dst is filled, not accumulated into, that reuse gives the same
// result as a fresh slice, and that a wrong length panics.
func TestMatrixDst(t *testing.T) {
	m := DipoleSheet()
	f := grid.Vec3{0.2, 0.1, 0}
	want := m.Matrix(nil, f, grid.Vec3{})
	dst := make([]complex128, len(want))
	for i := range dst {
		dst[i] = complex(1e3, -7)
	}
	for rep := 0; rep < 2; rep++ {
		got := m.Matrix(dst, f, grid.Vec3{})
		if &got[0] != &dst[0] {
			t.Fatal("Matrix did not return dst")
		}
		for i := range got {
			if got[i] != want[i] {
				t.Fatalf("repeat %d: entry %d = %v, want %v", rep, i, got[i], want[i])
			}
		}
	}
	defer func() {
		if recover() == nil {
			t.Error("Matrix with a short dst did not panic")
		}
	}()
	m.Matrix(make([]complex128, 3), f, grid.Vec3{})
}

// TestGammaDirection checks the Γ conventions: for bulk, the direction adds a term only at q ≡ 0
// (mod G), scale-invariantly in dir; a sheet ignores it.
func TestGammaDirection(t *testing.T) {
	m := DipoleCrystal()
	d := grid.Vec3{0.3, -0.2, 0.9}
	a := m.Matrix(nil, grid.Vec3{}, d)
	b := m.Matrix(nil, grid.Vec3{1, 0, -2}, d.Scale(5))
	if diff, s := maxAbsDiff(a, b); diff > 1e-12*s {
		t.Errorf("Γ with dir vs Γ+G with 5·dir differ by %.3g", diff)
	}
	if diff, _ := maxAbsDiff(a, m.Matrix(nil, grid.Vec3{}, grid.Vec3{})); diff < 1e-3 {
		t.Errorf("direction changed Γ by only %.3g", diff)
	}
	f := grid.Vec3{0.1, 0, 0}
	if diff, _ := maxAbsDiff(m.Matrix(nil, f, d), m.Matrix(nil, f, grid.Vec3{})); diff != 0 {
		t.Errorf("direction changed C away from Γ by %.3g", diff)
	}
	s := BuckledSheet()
	if diff, _ := maxAbsDiff(s.Matrix(nil, grid.Vec3{}, d), s.Matrix(nil, grid.Vec3{}, grid.Vec3{})); diff != 0 {
		t.Errorf("direction changed the sheet at Γ by %.3g", diff)
	}
	// Sheets: the K = 0 term makes C continuous at Γ; the first step away is O(|q|).
	c0 := s.Matrix(nil, grid.Vec3{}, grid.Vec3{})
	c1 := s.Matrix(nil, grid.Vec3{1e-7, 0, 0}, grid.Vec3{})
	if diff, sc := maxAbsDiff(c0, c1); diff > 1e-5*sc {
		t.Errorf("sheet C jumps by %.3g between Γ and |q| ~ 2e-7/Å", diff)
	}
}

// TestConcurrentUse checks that one model serves several goroutines (run with -race).
func TestConcurrentUse(t *testing.T) {
	m := BuckledSheet()
	qs := randomQ(m, 8, 3)
	want := make([][]complex128, len(qs))
	for i, f := range qs {
		want[i] = m.Matrix(nil, f, grid.Vec3{})
	}
	var wg sync.WaitGroup
	errs := make(chan string, len(qs))
	for i, f := range qs {
		wg.Add(1)
		go func() {
			defer wg.Done()
			got := m.Matrix(nil, f, grid.Vec3{})
			if d, _ := maxAbsDiff(got, want[i]); d != 0 {
				errs <- "concurrent Matrix differs"
			}
		}()
	}
	wg.Wait()
	close(errs)
	for e := range errs {
		t.Error(e)
	}
}

// TestBornCopies checks that Born hands out copies.
func TestBornCopies(t *testing.T) {
	m := RockSalt()
	z, eps := m.Born()
	z[0][0][0] = 99
	if m.Z[0][0][0] == 99 {
		t.Error("Born returned the model's own slice")
	}
	if eps != m.Epsilon {
		t.Error("Born returned a different epsilon")
	}
	if z, _ := Chain(1, 1, 1).Born(); z != nil {
		t.Error("Born of a springs-only model is not nil")
	}
}

// TestNewErrors checks that bad data are refused with an error that names the problem.
func TestNewErrors(t *testing.T) {
	good := RockSalt()
	s := good.Structure
	sheet := BuckledSheet()
	for _, c := range []struct {
		name    string
		s       grid.Structure
		z       []grid.Mat3
		eps     grid.Mat3
		springs []Spring
		want    string
	}{
		{"not neutral", s, []grid.Mat3{grid.Identity(), grid.Identity()}, grid.Identity(), good.Springs, "not neutral"},
		{"charge count", s, []grid.Mat3{grid.Identity()}, grid.Identity(), good.Springs, "Born charge tensors"},
		{"epsilon indefinite", s, good.Z, grid.Mat3{{1, 0, 0}, {0, -1, 0}, {0, 0, 1}}, good.Springs, "positive definite"},
		{"epsilon asymmetric", s, good.Z, grid.Mat3{{1, 0.5, 0}, {0, 1, 0}, {0, 0, 1}}, good.Springs, "not symmetric"},
		{"sheet in a medium", sheet.Structure, sheet.Z, grid.Identity().Scale(2), sheet.Springs, "unit matrix"},
		{"spring atom", s, good.Z, grid.Identity(), []Spring{{A: 0, B: 5, Longitudinal: 1}}, "joins atoms"},
		{"spring length", s, good.Z, grid.Identity(), []Spring{{A: 0, B: 0, Longitudinal: 1}}, "zero length"},
		{"sheet spring along a3", sheet.Structure, sheet.Z, grid.Identity(), []Spring{{A: 0, B: 1, Cell: [3]int{0, 0, 1}, Longitudinal: 1}}, "a3"},
		{"no bonds for balancing", DipoleCrystal().Structure, DipoleCrystal().Z, DipoleCrystal().Epsilon, nil, "springs"},
	} {
		_, err := New(c.name, c.s, c.z, c.eps, c.springs)
		if err == nil {
			t.Errorf("%s: New succeeded, want an error containing %q", c.name, c.want)
			continue
		}
		if !strings.HasPrefix(err.Error(), "exact: ") || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: error %q, want prefix \"exact: \" and %q", c.name, err, c.want)
		}
	}
}
