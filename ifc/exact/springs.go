package exact

import (
	"math"
	"sort"

	"lamina/grid"
)

// Spring is a short-range bond between atom A in cell 0 and atom B in the cell
// R = Cell[0]a1 + Cell[1]a2 + Cell[2]a3, with force constants in eV/Å² along the bond
// (Longitudinal) and across it (Transverse). Its pair force constant is
//
//	Φ_{Aα,Bβ}(R) = −(k_L r̂r̂ + k_T (1 − r̂r̂))_{αβ},   r = R + τ_B − τ_A,
//
// with Φ_{B,A}(−R) its transpose and the on-site blocks of A and B from the acoustic sum rule. A
// Spring stands for the one bond: the bond seen from B (B → A in cell −R) must not be listed
// again. A = B with a non-zero Cell couples an atom to its own images (a chain).
type Spring struct {
	A, B         int
	Cell         [3]int
	Longitudinal float64
	Transverse   float64
}

// springBlock returns k_L r̂r̂ + k_T (1 − r̂r̂) for the bond vector r.
func springBlock(r grid.Vec3, kl, kt float64) grid.Mat3 {
	u := r.Scale(1 / r.Norm())
	var m grid.Mat3
	for a := 0; a < 3; a++ {
		for b := 0; b < 3; b++ {
			m[a][b] = (kl - kt) * u[a] * u[b]
		}
		m[a][a] += kt
	}
	return m
}

// bondVector returns R + τ_B − τ_A of spring sp in structure s.
func bondVector(s grid.Structure, sp Spring) grid.Vec3 {
	return s.Lattice.Point(sp.Cell).Add(s.Atoms[sp.B].Position).Sub(s.Atoms[sp.A].Position)
}

// shell returns one Spring for every bond between atoms a and b whose length lies in
// [dmin, dmax], each bond once (for a = b only one of the cells ±R), sorted by cell. It is the
// catalogue's way of listing nearest- and next-nearest-neighbour springs without counting them
// by hand.
func shell(s grid.Structure, a, b int, dmin, dmax, kl, kt float64) []Spring {
	recip := s.Lattice.Reciprocal()
	periodic := s.Lattice.Periodic()
	if periodic == 2 {
		recip = inPlaneReciprocal(s.Lattice)
	}
	delta := s.Atoms[b].Position.Sub(s.Atoms[a].Position)
	var out []Spring
	for _, c := range latticeCells(s.Lattice.Vectors, recip, periodic, delta, dmax) {
		if a == b {
			// Keep the cell whose first non-zero component is positive.
			if c == [3]int{} || !positive(c) {
				continue
			}
		}
		sp := Spring{A: a, B: b, Cell: c, Longitudinal: kl, Transverse: kt}
		if d := bondVector(s, sp).Norm(); d >= dmin && d <= dmax {
			out = append(out, sp)
		}
	}
	sort.Slice(out, func(i, j int) bool {
		ci, cj := out[i].Cell, out[j].Cell
		for k := 0; k < 3; k++ {
			if ci[k] != cj[k] {
				return ci[k] < cj[k]
			}
		}
		return false
	})
	return out
}

func positive(c [3]int) bool {
	for _, x := range c {
		if x != 0 {
			return x > 0
		}
	}
	return false
}

// addSprings adds the off-site spring terms Φ e^{iq·R} (and Φᵀ e^{−iq·R} seen from B) to dst.
func addSprings(dst []complex128, n int, blocks []springTerm, f grid.Vec3) {
	n3 := 3 * n
	for _, t := range blocks {
		p := phase(f, t.cell)
		pc := complex(real(p), -imag(p))
		for a := 0; a < 3; a++ {
			for b := 0; b < 3; b++ {
				v := complex(-t.k[a][b], 0)
				dst[(3*t.a+a)*n3+3*t.b+b] += v * p
				dst[(3*t.b+b)*n3+3*t.a+a] += v * pc
			}
		}
	}
}

// springTerm is a Spring with its 3×3 block precomputed.
type springTerm struct {
	a, b int
	cell [3]int
	k    grid.Mat3
}

func finite(x float64) bool { return !math.IsNaN(x) && !math.IsInf(x, 0) }
