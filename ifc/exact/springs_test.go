package exact

import (
	"math"
	"math/rand/v2"
	"testing"

	"lamina/grid"
	"lamina/grid/units"
)

// TestChainDispersion checks the monatomic chain against ω(q) = 2√(K/M)|sin(qa/2)| (Ashcroft &
// Mermin, Solid State Physics, ch. 22), with both transverse branches zero. Tolerance 1e-9
// relative (+1e-9 THz absolute): eigenvalues of a 3×3 diagonal problem, rounding only.
func TestChainDispersion(t *testing.T) {
	const mass, k, a = 28.0, 6.5, 2.7
	m := Chain(mass, k, a)
	for _, f := range []float64{0, 0.01, 0.125, 0.3, 0.5, 0.77, -0.4, 1.25} {
		fr := m.Frequencies(grid.Vec3{f, 0.3, -0.2}, grid.Vec3{})
		q := 2 * math.Pi * f / a
		want := 2 * math.Sqrt(k/mass) * math.Abs(math.Sin(q*a/2)) * units.THzPerSqrtEig
		if math.Abs(fr[2]-want) > 1e-9*want+1e-9 {
			t.Errorf("chain q=%g: ω = %.12f THz, want %.12f", f, fr[2], want)
		}
		if math.Abs(fr[0]) > 1e-9 || math.Abs(fr[1]) > 1e-9 {
			t.Errorf("chain q=%g: transverse branches %.3g, %.3g THz, want 0", f, fr[0], fr[1])
		}
	}
}

// TestSimpleCubicSprings checks springs with both constants on a simple cubic lattice, spacing
// a, mass M, nearest-neighbour k_L and k_T. Derived: the bonds along axis i add
// 2(1 − cos q_i a)(k_T 1 + (k_L − k_T) ê_iê_i), so D(q) is diagonal with
// ω²_α = (4/M)[k_L sin²(q_α a/2) + k_T Σ_{i≠α} sin²(q_i a/2)]. Tolerance 1e-12 of the largest ω².
func TestSimpleCubicSprings(t *testing.T) {
	const a, mass, kl, kt = 2.9, 17.0, 5.0, 1.3
	l, _ := grid.NewLattice(grid.Mat3{{a, 0, 0}, {0, a, 0}, {0, 0, a}}, grid.Bulk)
	s := grid.Structure{Lattice: l, Atoms: []grid.Atom{{Species: "A", Mass: mass}}}
	sp := shell(s, 0, 0, a-0.01, a+0.01, kl, kt)
	if len(sp) != 3 {
		t.Fatalf("simple cubic: %d nearest-neighbour bonds, want 3", len(sp))
	}
	m, err := New("sc", s, nil, grid.Identity(), sp)
	if err != nil {
		t.Fatal(err)
	}
	rng := rand.New(rand.NewPCG(5, 5))
	for rep := 0; rep < 10; rep++ {
		f := grid.Vec3{rng.Float64() - 0.5, rng.Float64() - 0.5, rng.Float64() - 0.5}
		var sn [3]float64
		for i := range sn {
			x := math.Sin(math.Pi * f[i])
			sn[i] = x * x
		}
		var want []float64
		for al := 0; al < 3; al++ {
			w := kl * sn[al]
			for i := 0; i < 3; i++ {
				if i != al {
					w += kt * sn[i]
				}
			}
			want = append(want, 4*w/mass)
		}
		// ascending order
		for i := 0; i < 3; i++ {
			for j := i + 1; j < 3; j++ {
				if want[j] < want[i] {
					want[i], want[j] = want[j], want[i]
				}
			}
		}
		got := hermitianEigenvalues(m.Matrix(nil, f, grid.Vec3{}), massWeights(m.Structure))
		for i := range got {
			if math.Abs(got[i]-want[i]) > 1e-12*want[2] {
				t.Errorf("q=%v mode %d: ω² = %.15g, want %.15g", f, i, got[i], want[i])
			}
		}
	}
}

// TestShellCounts checks the bond lists of the catalogue geometry against coordination numbers
// (each bond once; an atom's bonds to its own images count twice): rock salt 6 A–B and 12 A–A
// neighbours, honeycomb 3 A–B and 6 A–A.
func TestShellCounts(t *testing.T) {
	rs := RockSalt().Structure
	h := 2.5
	if n := len(shell(rs, 0, 1, h-0.01, h+0.01, 1, 1)); n != 6 {
		t.Errorf("rock salt A–B nearest neighbours: %d bonds, want 6", n)
	}
	if n := len(shell(rs, 0, 0, h*math.Sqrt2-0.01, h*math.Sqrt2+0.01, 1, 1)); n != 6 {
		t.Errorf("rock salt A–A next-nearest: %d bonds, want 6 (12 neighbours)", n)
	}
	bs := BuckledSheet().Structure
	dnn := bondVector(bs, Spring{A: 0, B: 1}).Norm()
	if n := len(shell(bs, 0, 1, dnn-0.01, dnn+0.01, 1, 1)); n != 3 {
		t.Errorf("honeycomb A–B nearest neighbours: %d bonds, want 3", n)
	}
	a := bs.Lattice.A(0).Norm()
	if n := len(shell(bs, 0, 0, a-0.01, a+0.01, 1, 1)); n != 3 {
		t.Errorf("honeycomb A–A next-nearest: %d bonds, want 3 (6 neighbours)", n)
	}
}
