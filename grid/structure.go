package grid

import (
	"fmt"
	"math"
)

// Atom is one atom of the unit cell.
type Atom struct {
	Species  string
	Mass     float64 // amu
	Position Vec3    // Cartesian, Å; never wrapped into the cell
}

// Structure is a crystal: its lattice and the atoms of cell 0. Matrix index 3κ+α belongs to
// atom κ, Cartesian direction α.
type Structure struct {
	Lattice Lattice
	Atoms   []Atom
}

// N returns the number of atoms.
func (s Structure) N() int { return len(s.Atoms) }

// Validate checks masses and positions, and for a sheet that the atom heights are contiguous
// (no gap larger than half the cell height, the sign of a sheet split across the cell boundary).
func (s Structure) Validate() error {
	if len(s.Atoms) == 0 {
		return fmt.Errorf("grid: structure has no atoms")
	}
	for k, a := range s.Atoms {
		if !(a.Mass > 0) || math.IsInf(a.Mass, 0) {
			return fmt.Errorf("grid: atom %d (%s): mass %g amu is not positive and finite", k, a.Species, a.Mass)
		}
		for _, x := range a.Position {
			if math.IsNaN(x) || math.IsInf(x, 0) {
				return fmt.Errorf("grid: atom %d (%s): position is not finite", k, a.Species)
			}
		}
	}
	if err := s.checkSeparations(); err != nil {
		return err
	}
	if s.Lattice.Periodicity == Sheet {
		lo, hi := s.Atoms[0].Position[2], s.Atoms[0].Position[2]
		for _, a := range s.Atoms {
			lo = math.Min(lo, a.Position[2])
			hi = math.Max(hi, a.Position[2])
		}
		if c := s.Lattice.Height(); hi-lo > c/2 {
			return fmt.Errorf("grid: sheet spans %.4g Å in z, more than half the cell height %.4g Å: heights must be contiguous (unwrap a sheet split across the cell boundary)", hi-lo, c)
		}
	}
	return nil
}

// MinSeparation is the smallest distance (Å) allowed between two atoms, or between an atom and
// its own periodic image; closer ones are a broken structure (a duplicated atom, a position off
// by a lattice vector, a degenerate cell).
const MinSeparation = 0.1

// maxPairCheck bounds the atom count for the all-pairs separation check (N² work); larger
// structures check only each atom against its own images.
const maxPairCheck = 2000

// checkSeparations reports atoms closer than MinSeparation to another atom or to a periodic
// image of themselves, searching the images around the nearest one in a reduced basis.
func (s Structure) checkSeparations() error {
	l := s.Lattice
	p := l.Periodic()
	var red []Vec3
	if p == 2 {
		r, _ := Reduce2D(l.A(0), l.A(1))
		red = r[:]
	} else {
		r, _ := Reduce3D(l.Vectors)
		red = []Vec3{r[0], r[1], r[2]}
	}
	if m := red[0].Norm(); m < MinSeparation {
		return fmt.Errorf("grid: the lattice has a vector of length %.3g Å: the cell is degenerate", m)
	}
	// Coefficients of d in the reduced basis, via the Gram matrix of the periodic vectors.
	var gram Mat3
	for i := 0; i < p; i++ {
		for j := 0; j < p; j++ {
			gram[i][j] = red[i].Dot(red[j])
		}
	}
	if p == 2 {
		gram[2][2] = 1
	}
	ginv := gram.Inv()
	n := len(s.Atoms)
	for k := 0; k < n; k++ {
		for k2 := k; k2 < n; k2++ {
			if k2 != k && n > maxPairCheck {
				break
			}
			d := s.Atoms[k2].Position.Sub(s.Atoms[k].Position)
			var proj Vec3
			for i := 0; i < p; i++ {
				proj[i] = red[i].Dot(d)
			}
			c := ginv.MulVec(proj)
			var base [3]float64
			for i := 0; i < p; i++ {
				base[i] = math.Round(c[i])
			}
			var t [3]int
			lim := [3]int{1, 1, 1}
			if p == 2 {
				lim[2] = 0
			}
			for t[0] = -lim[0]; t[0] <= lim[0]; t[0]++ {
				for t[1] = -lim[1]; t[1] <= lim[1]; t[1]++ {
					for t[2] = -lim[2]; t[2] <= lim[2]; t[2]++ {
						v := d
						zero := true
						for i := 0; i < p; i++ {
							m := float64(t[i]) - base[i]
							if m != 0 {
								zero = false
							}
							v = v.Add(red[i].Scale(m))
						}
						if k == k2 && zero {
							continue
						}
						if dist := v.Norm(); dist < MinSeparation {
							if k == k2 {
								return fmt.Errorf("grid: atom %d (%s) is %.3g Å from its own periodic image: the cell is degenerate", k, s.Atoms[k].Species, dist)
							}
							return fmt.Errorf("grid: atoms %d (%s) and %d (%s) are %.3g Å apart (modulo lattice vectors): a duplicated atom or a position off by a lattice vector", k, s.Atoms[k].Species, k2, s.Atoms[k2].Species, dist)
						}
					}
				}
			}
		}
	}
	return nil
}
