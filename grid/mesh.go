package grid

import (
	"fmt"
	"math"
)

// Mesh is a Γ-centred n1×n2×n3 grid of q-points f_i = m_i/n_i, m_i = 0..n_i−1.
type Mesh struct {
	N [3]int
}

// Len returns n1·n2·n3.
func (m Mesh) Len() int { return m.N[0] * m.N[1] * m.N[2] }

// Validate checks that every n_i ≥ 1 and, for a sheet, n3 = 1.
func (m Mesh) Validate(p Periodicity) error {
	for i, n := range m.N {
		if n < 1 {
			return fmt.Errorf("grid: mesh n%d = %d, want ≥ 1", i+1, n)
		}
	}
	if p == Sheet && m.N[2] != 1 {
		return fmt.Errorf("grid: 2d mesh must have n3 = 1, got %d", m.N[2])
	}
	return nil
}

// Index returns the flat index (m1·n2 + m2)·n3 + m3 of the grid point with integer coordinates m.
func (m Mesh) Index(c [3]int) int { return (c[0]*m.N[1]+c[1])*m.N[2] + c[2] }

// Coord returns the integer coordinates of flat index i.
func (m Mesh) Coord(i int) [3]int {
	c3 := i % m.N[2]
	i /= m.N[2]
	return [3]int{i / m.N[1], i % m.N[1], c3}
}

// Point returns the reduced coordinates of flat index i, each in [0, 1).
func (m Mesh) Point(i int) Vec3 {
	c := m.Coord(i)
	return Vec3{float64(c[0]) / float64(m.N[0]), float64(c[1]) / float64(m.N[1]), float64(c[2]) / float64(m.N[2])}
}

// Match returns the flat index of the grid point equal to f modulo reciprocal lattice vectors,
// and false when f is farther than tol (in reduced units times n_i) from every grid point.
func (m Mesh) Match(f Vec3, tol float64) (int, bool) {
	var c [3]int
	for i := 0; i < 3; i++ {
		x := f[i] * float64(m.N[i])
		r := math.Round(x)
		if math.Abs(x-r) > tol || math.IsNaN(x) {
			return 0, false
		}
		c[i] = ((int(r) % m.N[i]) + m.N[i]) % m.N[i]
	}
	return m.Index(c), true
}
