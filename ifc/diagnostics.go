package ifc

// Location names an atom pair and a supercell vector (integer coordinates).
type Location struct {
	Atom, Atom2 int
	Cell        [3]int
}

// Diagnostics reports what Build had to remove or found suspect in its input. All sizes are
// absolute, in eV/Å²; Scale is the largest |C_ij(q)| of the input for comparison.
type Diagnostics struct {
	Scale float64
	// Hermiticity is the largest element of ½(C − C†) removed, at grid index HermiticityQ.
	Hermiticity  float64
	HermiticityQ int
	// TimeReversal is the largest element removed to make C(−q) = C(q)*, at grid index TimeReversalQ.
	TimeReversal  float64
	TimeReversalQ int
	// ImagPhi is the largest |Im Φ(R)| of the transform (discarded), at ImagPhiAt.
	ImagPhi   float64
	ImagPhiAt Location
	// SumRule is the largest |Σ_{κ',R} Φ_{κα,κ'β}(R)| of the short-range force constants before
	// any sum-rule correction.
	SumRule float64
}
