// Package ifc turns dynamical matrices on a coarse Γ-centred q-grid into real-space force
// constants and evaluates the interpolated dynamical matrix, frequencies and eigenvectors at any
// q-point.
//
// Conventions (shared PHYSICS.md sections 3, 4 and 6):
//   - Units: Å, eV, amu; force constants and C(q) in eV/Å² (mass-unweighted); eigenvalues of the
//     mass-weighted D(q) = C(q)/sqrt(M_κ M_κ') in eV/(Å²·amu); frequencies in THz, imaginary modes
//     reported as negative numbers.
//   - Matrices are 3N×3N, row-major, index 3κ+α; the row belongs to the atom in cell 0, the
//     column to the atom in cell R.
//   - Internal phase convention "cell": C(q) = Σ_R Φ(R) exp(+i q·R). Inputs in the "atom"
//     convention are converted with the q as written before they are matched to grid points.
//   - The transform: Φ(R) = (1/N_q) Σ_q C(q) exp(−i q·R) over the full grid; the interpolation
//     C(q) = Σ_R Σ_T w Φ(R) exp(+i q·(R+T)) sums the Wigner–Seitz images R+T of each (κ, κ', R)
//     with weights w = 1/(number of images), which reproduces every grid matrix exactly.
//   - A long-range part (any value with an Add method, such as *longrange.Kernel) is subtracted
//     from each grid matrix before the transform and added back at every new q.
//
// Build validates and copies its inputs; it never modifies the caller's samples. A
// ForceConstants value is read-only after Build and may be shared by goroutines; each goroutine
// evaluates through its own Evaluator, which owns the per-q buffers and is not safe for
// concurrent use.
package ifc
