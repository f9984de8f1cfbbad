package longrange

import (
	"math"
	"testing"

	"lamina/grid"
)

// madelungCrystal is a lattice of point charges ±1 with the nearest-neighbour distance 1 Å; the
// Madelung constant is M = −d·φ(site) for the potential φ at the positive ion at site 0.
type madelungCrystal struct {
	lat grid.Lattice
	pos []grid.Vec3
	q   []float64
	// slab: sum with the 2D slab Ewald (in-plane periodicity only) instead of the 3D one.
	slab bool
}

func mustLattice(t testing.TB, v grid.Mat3, p grid.Periodicity) grid.Lattice {
	t.Helper()
	l, err := grid.NewLattice(v, p)
	if err != nil {
		t.Fatal(err)
	}
	return l
}

// rockSaltType: fcc a = 2d, ions at 0 and (d, 0, 0).
func rockSaltType(t testing.TB) madelungCrystal {
	return madelungCrystal{
		lat: mustLattice(t, grid.Mat3{{0, 1, 1}, {1, 0, 1}, {1, 1, 0}}, grid.Bulk),
		pos: []grid.Vec3{{0, 0, 0}, {1, 0, 0}},
		q:   []float64{1, -1},
	}
}

// csClType: simple cubic a = 2d/√3, ions at 0 and the body centre.
func csClType(t testing.TB) madelungCrystal {
	a := 2 / math.Sqrt(3)
	return madelungCrystal{
		lat: mustLattice(t, grid.Mat3{{a, 0, 0}, {0, a, 0}, {0, 0, a}}, grid.Bulk),
		pos: []grid.Vec3{{0, 0, 0}, {a / 2, a / 2, a / 2}},
		q:   []float64{1, -1},
	}
}

// zincBlendeType: fcc a = 4d/√3, ions at 0 and (a/4)(1, 1, 1).
func zincBlendeType(t testing.TB) madelungCrystal {
	h := 2 / math.Sqrt(3) // a/2
	return madelungCrystal{
		lat: mustLattice(t, grid.Mat3{{0, h, h}, {h, 0, h}, {h, h, 0}}, grid.Bulk),
		pos: []grid.Vec3{{0, 0, 0}, {h / 2, h / 2, h / 2}},
		q:   []float64{1, -1},
	}
}

// squareSheet: the 2D checkerboard of ±1 with spacing d, as a centred square cell (d, d), (−d, d).
func squareSheet(t testing.TB) madelungCrystal {
	return madelungCrystal{
		lat:  mustLattice(t, grid.Mat3{{1, 1, 0}, {-1, 1, 0}, {0, 0, 20}}, grid.Sheet),
		pos:  []grid.Vec3{{0, 0, 0}, {1, 0, 0}},
		q:    []float64{1, -1},
		slab: true,
	}
}

// layeredRockSaltType: rock salt as checkerboard layers z = n·d, n = −layers..layers, the charges of
// layer n multiplied by (−1)ⁿ, summed as one slab. A layer at height |z| ≥ d contributes through
// the G ≠ 0 terms only (each layer is neutral), which fall as e^{−|G|·|z|} with |G| ≥ 2π/(√2 d):
// 8 layers on each side leave e^{−4.44·9} ≈ 4e-18.
func layeredRockSaltType(t testing.TB) madelungCrystal {
	const layers = 8
	c := madelungCrystal{
		lat:  mustLattice(t, grid.Mat3{{1, 1, 0}, {-1, 1, 0}, {0, 0, 100}}, grid.Sheet),
		slab: true,
	}
	for n := 0; n <= 2*layers; n++ {
		// Layer 0 first so that site 0 is the positive ion at the origin.
		m := n
		if n > layers {
			m = layers - n
		}
		s := 1.0
		if m%2 != 0 {
			s = -1
		}
		z := float64(m)
		c.pos = append(c.pos, grid.Vec3{0, 0, z}, grid.Vec3{1, 0, z})
		c.q = append(c.q, s, -s)
	}
	return c
}

func (c madelungCrystal) madelung(lambda, cut float64) float64 {
	if c.slab {
		return -slabPotential(c.lat, c.pos, c.q, 0, lambda, cut)
	}
	return -ewaldPotential3D(c.lat, c.pos, c.q, 0, lambda, cut)
}

// TestMadelung is the catalogue of lattice sums (shared PHYSICS.md section 8, values "handbook
// value, from memory" / "published value, from memory", quoted to 12–13 digits). cut bounds
// both halves of the Ewald split: reciprocal terms with G²/4Λ² > cut and real-space terms with
// (Λr)² > cut are dropped, each of size ~e^{−cut}; Λ is in 1/d. The tolerances are relative.
func TestMadelung(t *testing.T) {
	const (
		rockSaltM = 1.747564594633 // NaCl structure, PHYSICS.md §8, handbook value, from memory
		csClM     = 1.762674773070 // CsCl structure, PHYSICS.md §8, handbook value, from memory
		zincM     = 1.638055053388 // zinc blende, PHYSICS.md §8, handbook value, from memory
		squareM   = 1.615542626713 // 2D square lattice, PHYSICS.md §8, published value, from memory
	)
	cases := []struct {
		name    string
		crystal func(testing.TB) madelungCrystal
		lambda  float64
		cut     float64
		want    float64
		tol     float64
	}{
		// cut = 20: e^{−20} ≈ 2e-9 per neglected term, a few shells of them: tolerance 1e-8.
		{"rock salt 3d", rockSaltType, 1.0, 20, rockSaltM, 1e-8},
		{"CsCl 3d", csClType, 1.0, 20, csClM, 1e-8},
		{"zinc blende 3d", zincBlendeType, 1.0, 20, zincM, 1e-8},
		{"square sheet 2d z=0", squareSheet, 1.0, 20, squareM, 1e-8},
		{"rock salt as layers 2d z≠0", layeredRockSaltType, 1.0, 20, rockSaltM, 1e-8},
		// Different Λ, same cut: the split point moves, the result does not.
		{"rock salt 3d, wide split", rockSaltType, 2.0, 20, rockSaltM, 1e-8},
		{"rock salt as layers, narrow split", layeredRockSaltType, 0.6, 20, rockSaltM, 1e-8},
		// cut = 36: e^{−36} ≈ 2e-16, so the sums converge to rounding; the references carry 12
		// decimals (±5e-13): tolerance 1e-12.
		{"rock salt 3d, converged", rockSaltType, 1.0, 36, rockSaltM, 1e-12},
		{"CsCl 3d, converged", csClType, 1.0, 36, csClM, 1e-12},
		{"zinc blende 3d, converged", zincBlendeType, 1.0, 36, zincM, 1e-12},
		{"square sheet, converged", squareSheet, 1.0, 36, squareM, 1e-12},
		{"rock salt as layers, converged", layeredRockSaltType, 1.0, 36, rockSaltM, 1e-12},
	}
	for _, c := range cases {
		got := c.crystal(t).madelung(c.lambda, c.cut)
		rel := math.Abs(got-c.want) / c.want
		if rel > c.tol {
			t.Errorf("Madelung(%s, Λ=%g, cut=%g) = %.13f, want %.12f (rel %.2g > tol %.2g)", c.name, c.lambda, c.cut, got, c.want, rel, c.tol)
		} else {
			t.Logf("Madelung(%s, Λ=%g, cut=%g) = %.13f (rel error %.2g)", c.name, c.lambda, c.cut, got, rel)
		}
	}
}
