// Package longrange holds the analytic long-range (dipole–dipole) part of the force constants:
// Born effective charges and dielectric data, the 3D Gonze–Lee Ewald sum for bulk crystals, the
// height-aware 2D Ewald point-dipole kernel for sheets with its in-plane screening correction,
// the choice of the range-separation parameter Λ, and the scaled complementary error function.
//
// Conventions (shared PHYSICS.md section 5): internal units Å, eV, e; matrices are 3N×3N,
// row-major, index 3κ+α, mass-unweighted (eV/Å²), in the "cell" phase convention with the
// phase exp(+i K·(τ_κ − τ_κ')) for K = q + G; q is Cartesian, in 1/Å. Kernels add into a caller's
// slice and keep the acoustic sum rule (the q = 0 self term is subtracted on the diagonal blocks).
//
// A Kernel owns its buffers and is not safe for concurrent use: give each worker its own.
package longrange
