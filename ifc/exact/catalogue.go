package exact

import (
	"fmt"
	"math"

	"lamina/grid"
)

// The catalogue. Every model is invented (species A, B, C; masses, charges and springs chosen
// for this package) and was checked to be dynamically stable over a dense sampling of its zone
// and near Γ (catalogue_test.go).

// BuckledSheet returns "sheet-AB": a two-atom hexagonal polar sheet, a = 3.2 Å, of rigid ions
// A (+1.3 e, 24 amu) and B (−1.3 e, 40 amu) on the two sublattices, buckled by 0.3 Å, in vacuum,
// with nearest-neighbour A–B springs and next-nearest A–A and B–B springs.
func BuckledSheet() *Model {
	const a, buckle, c = 3.2, 0.3, 20.0
	s := sheetStructure(a, c, []grid.Atom{
		{Species: "A", Mass: 24, Position: grid.Vec3{0, 0, buckle / 2}},
		{Species: "B", Mass: 40, Position: grid.Vec3{a / 2, a / (2 * math.Sqrt(3)), -buckle / 2}},
	})
	q := 1.3
	z := []grid.Mat3{grid.Identity().Scale(q), grid.Identity().Scale(-q)}
	dnn := math.Hypot(a/math.Sqrt(3), buckle)
	var sp []Spring
	sp = append(sp, shell(s, 0, 1, dnn-0.01, dnn+0.01, 9.0, 1.5)...)
	sp = append(sp, shell(s, 0, 0, a-0.01, a+0.01, 1.5, 0.4)...)
	sp = append(sp, shell(s, 1, 1, a-0.01, a+0.01, 1.2, 0.3)...)
	return mustModel("sheet-AB", s, z, grid.Identity(), sp)
}

// sheetStructure returns a hexagonal sheet a1 = (a, 0, 0), a2 = (a/2, a√3/2, 0), a3 = (0, 0, c).
func sheetStructure(a, c float64, atoms []grid.Atom) grid.Structure {
	l, err := grid.NewLattice(grid.Mat3{{a, 0, 0}, {a / 2, a * math.Sqrt(3) / 2, 0}, {0, 0, c}}, grid.Sheet)
	if err != nil {
		panic("exact: catalogue lattice: " + err.Error())
	}
	return grid.Structure{Lattice: l, Atoms: atoms}
}

// mustModel builds a catalogue model; its data are fixed, so an error is a bug of this package.
func mustModel(name string, s grid.Structure, z []grid.Mat3, eps grid.Mat3, sp []Spring) *Model {
	m, err := New(name, s, z, eps, sp)
	if err != nil {
		panic(fmt.Sprintf("exact: catalogue model %s: %v", name, err))
	}
	return m
}

// DipoleSheet returns "sheet-ABC": a three-atom hexagonal sheet, a = 3.3 Å, with its atoms at
// three heights (A at 0, B at +1.1 Å over the first hollow, C at −0.9 Å over the second) and
// general non-symmetric Born charges (C = −A − B, neutral), point dipoles in vacuum, with
// springs to the nearest A–B, A–C and B–C neighbours and to the same-species neighbours at a.
func DipoleSheet() *Model {
	const a, c = 3.3, 20.0
	s := sheetStructure(a, c, []grid.Atom{
		{Species: "A", Mass: 30, Position: grid.Vec3{0, 0, 0}},
		{Species: "B", Mass: 18, Position: grid.Vec3{a / 2, a / (2 * math.Sqrt(3)), 1.1}},
		{Species: "C", Mass: 45, Position: grid.Vec3{a, a / math.Sqrt(3), -0.9}},
	})
	za := grid.Mat3{{1.4, 0.25, -0.1}, {-0.15, 1.2, 0.2}, {0.3, -0.2, 0.9}}
	zb := grid.Mat3{{-0.6, 0.1, 0.2}, {0.05, -0.8, -0.15}, {-0.25, 0.1, -0.5}}
	zc := za.Add(zb).Scale(-1)
	var sp []Spring
	sp = append(sp, shell(s, 0, 1, 2.0, 2.4, 8.0, 1.5)...)
	sp = append(sp, shell(s, 0, 2, 2.0, 2.4, 7.0, 1.2)...)
	sp = append(sp, shell(s, 1, 2, 2.6, 3.0, 3.0, 0.6)...)
	for k := 0; k < 3; k++ {
		sp = append(sp, shell(s, k, k, a-0.01, a+0.01, 1.5, 0.4)...)
	}
	return mustModel("sheet-ABC", s, []grid.Mat3{za, zb, zc}, grid.Identity(), sp)
}

// RockSalt returns "rocksalt-AB": rigid ions A (+1.5 e, 24 amu) at 0 and B (−1.5 e, 40 amu) at
// (2.5, 0, 0) Å on the primitive fcc cell of a 5 Å cubic lattice, in vacuum (ε = 1), with
// nearest-neighbour A–B springs and next-nearest A–A and B–B springs.
func RockSalt() *Model {
	const h = 2.5
	l, err := grid.NewLattice(grid.Mat3{{0, h, h}, {h, 0, h}, {h, h, 0}}, grid.Bulk)
	if err != nil {
		panic("exact: catalogue lattice: " + err.Error())
	}
	s := grid.Structure{Lattice: l, Atoms: []grid.Atom{
		{Species: "A", Mass: 24, Position: grid.Vec3{0, 0, 0}},
		{Species: "B", Mass: 40, Position: grid.Vec3{h, 0, 0}},
	}}
	q := 1.5
	z := []grid.Mat3{grid.Identity().Scale(q), grid.Identity().Scale(-q)}
	d2 := h * math.Sqrt2
	var sp []Spring
	sp = append(sp, shell(s, 0, 1, h-0.01, h+0.01, 2.5, 0.4)...)
	sp = append(sp, shell(s, 0, 0, d2-0.01, d2+0.01, 0.6, 1.0)...)
	sp = append(sp, shell(s, 1, 1, d2-0.01, d2+0.01, 0.6, 1.0)...)
	return mustModel("rocksalt-AB", s, z, grid.Identity(), sp)
}

// DipoleCrystal returns "dipole-ABC": a triclinic bulk crystal (a1 = (3.6, 0, 0),
// a2 = (0.4, 3.8, 0), a3 = (−0.3, 0.5, 4.1) Å) of three point dipoles A (30 amu), B (50 amu),
// C (16 amu) with general non-symmetric Born charges (C = −A − B, neutral) in a medium with an
// anisotropic, non-diagonal ε∞, with springs to every neighbour within 4.2 Å whose strength
// falls off with the bond length, k_L = 4 exp(−(d − 2.3 Å)/0.6 Å) eV/Å², k_T = 0.3 k_L.
func DipoleCrystal() *Model {
	l, err := grid.NewLattice(grid.Mat3{{3.6, 0, 0}, {0.4, 3.8, 0}, {-0.3, 0.5, 4.1}}, grid.Bulk)
	if err != nil {
		panic("exact: catalogue lattice: " + err.Error())
	}
	s := grid.Structure{Lattice: l, Atoms: []grid.Atom{
		{Species: "A", Mass: 30, Position: grid.Vec3{0, 0, 0}},
		{Species: "B", Mass: 50, Position: grid.Vec3{1.9, 2.1, 2.0}},
		{Species: "C", Mass: 16, Position: grid.Vec3{1.6, 0.1, 2.2}},
	}}
	za := grid.Mat3{{2.0, 0.3, -0.2}, {-0.1, 1.7, 0.35}, {0.25, -0.15, 2.2}}
	zb := grid.Mat3{{-1.1, 0.2, 0.1}, {0.15, -1.3, -0.2}, {-0.3, 0.05, -0.9}}
	zc := za.Add(zb).Scale(-1)
	eps := grid.Mat3{{1.7, 0.2, -0.1}, {0.2, 2.0, 0.15}, {-0.1, 0.15, 2.4}}
	var sp []Spring
	for a := 0; a < 3; a++ {
		for b := a; b < 3; b++ {
			for _, x := range shell(s, a, b, 0.5, 4.2, 0, 0) {
				d := bondVector(s, x).Norm()
				x.Longitudinal = 4 * math.Exp(-(d-2.3)/0.6)
				x.Transverse = 0.3 * x.Longitudinal
				sp = append(sp, x)
			}
		}
	}
	return mustModel("dipole-ABC", s, []grid.Mat3{za, zb, zc}, eps, sp)
}

// Chain returns "chain": a monatomic chain of atoms of mass (amu) spaced a (Å) along x, joined
// by nearest-neighbour springs k (eV/Å², longitudinal only), with no charges. It is stored as a
// bulk crystal with a2 = (0, 10a, 0) and a3 = (0, 0, 10a) and no springs along them, so its two
// transverse branches are zero at every q and the longitudinal one is
// ω(q) = 2√(k/M)|sin(q_x a/2)| (Ashcroft & Mermin, ch. 22). It panics on a non-positive argument.
func Chain(mass, k, a float64) *Model {
	if !(mass > 0) || !(k > 0) || !(a > 0) {
		panic(fmt.Sprintf("exact: Chain(%g, %g, %g): mass, spring and spacing must be positive", mass, k, a))
	}
	l, err := grid.NewLattice(grid.Mat3{{a, 0, 0}, {0, 10 * a, 0}, {0, 0, 10 * a}}, grid.Bulk)
	if err != nil {
		panic("exact: chain lattice: " + err.Error())
	}
	s := grid.Structure{Lattice: l, Atoms: []grid.Atom{{Species: "A", Mass: mass}}}
	return mustModel("chain", s, nil, grid.Identity(), []Spring{{A: 0, B: 0, Cell: [3]int{1, 0, 0}, Longitudinal: k}})
}

// Catalogue returns one fresh copy of every model with charges: BuckledSheet, DipoleSheet,
// RockSalt and DipoleCrystal, in that order.
func Catalogue() []*Model {
	return []*Model{BuckledSheet(), DipoleSheet(), RockSalt(), DipoleCrystal()}
}
