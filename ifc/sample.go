package ifc

import (
	"fmt"
	"strings"

	"lamina/grid"
)

// Phase is the phase convention of an input dynamical matrix (shared PHYSICS.md section 3).
type Phase int

const (
	// CellPhase: C(q) = Σ_R Φ(R) exp(+i q·R), the internal convention.
	CellPhase Phase = iota
	// AtomPhase: C^atom(q) = C(q) · exp(+i q·(τ_κ' − τ_κ)) elementwise.
	AtomPhase
)

// String returns "cell" or "atom", the spelling of the grid format.
func (p Phase) String() string {
	if p == AtomPhase {
		return "atom"
	}
	return "cell"
}

// ParsePhase parses "cell" or "atom".
func ParsePhase(s string) (Phase, error) {
	switch strings.ToLower(s) {
	case "cell":
		return CellPhase, nil
	case "atom":
		return AtomPhase, nil
	}
	return 0, fmt.Errorf("unknown phase convention %q (valid: cell, atom)", s)
}

// Sample is one input dynamical matrix.
type Sample struct {
	// Q is the q-point in reduced coordinates, as written in the input.
	Q grid.Vec3
	// C is the 3N×3N mass-unweighted matrix in eV/Å², row-major, index 3κ+α, in the phase
	// convention of the file it came from.
	C []complex128
}
