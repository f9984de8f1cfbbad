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
