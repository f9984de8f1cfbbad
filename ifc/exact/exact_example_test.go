package exact_test

import (
	"fmt"

	"lamina/grid"
	"lamina/ifc/exact"
)

// A monatomic chain of 24 amu atoms 2.5 Å apart with 4 eV/Å² springs: the longitudinal branch
// is ω(q) = 2√(K/M)|sin(qa/2)| (Ashcroft & Mermin, ch. 22), the two transverse branches are
// zero. The printed values agree with that formula evaluated separately (15.6333042 THz per
// √(eV/(Å² amu))): 4.884778, 9.025892, 12.764539 THz.
func Example() {
	m := exact.Chain(24, 4, 2.5)
	for _, f := range []float64{0, 0.125, 0.25, 0.5} {
		fr := m.Frequencies(grid.Vec3{f, 0, 0}, grid.Vec3{})
		fmt.Printf("q = %.3f: %.4f %.4f %.4f THz\n", f, fr[0], fr[1], fr[2])
	}
	// Output:
	// q = 0.000: 0.0000 0.0000 0.0000 THz
	// q = 0.125: 0.0000 0.0000 4.8848 THz
	// q = 0.250: 0.0000 0.0000 9.0259 THz
	// q = 0.500: 0.0000 0.0000 12.7645 THz
}
