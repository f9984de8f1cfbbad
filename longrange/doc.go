// Package longrange holds the analytic long-range (dipole–dipole) part of the force constants:
// Born effective charges and dielectric data, the 3D Gonze–Lee Ewald sum for bulk crystals, the
// height-aware 2D Ewald point-dipole kernel for sheets with its in-plane screening correction,
// the choice of the range-separation parameter Λ, and the scaled complementary error function.
//
// Conventions (shared PHYSICS.md section 5): internal units Å, eV, e; matrices are 3N×3N,
// row-major, index 3κ+α, mass-unweighted (eV/Å²), in the "cell" phase convention with the
// phase exp(+i K·(τ_κ − τ_κ')) for K = q + G; q is Cartesian, in 1/Å. Kernels add into a caller's
// slice and keep the acoustic sum rule (a constant built from the q = 0 sum is subtracted, see
// Kernels below).
//
// A Kernel owns its buffers and is not safe for concurrent use: give each worker its own.
//
// # Kernels
//
// New builds a Kernel of kind Kernel3D or Kernel2D; Kernel.Add adds alpha·C^LR(q) to a caller's
// 3N×3N slice (dst first, no allocation per call; it panics only on a dst of the wrong length, a
// caller bug). Add folds q into the parallelepiped of reduced coordinates in [−½, ½] first, so any q
// may be passed; C^LR is periodic in the reciprocal lattice. The added matrix is exactly
// Hermitian and C^LR(−q) = C^LR(q)* to rounding.
//
//   - Kernel3D: (4π k_e/Ω) Σ_{K≠0} (K·Z_κ)_α (K·Z_κ')_β e^{−K·ε∞·K/4Λ²}/(K·ε∞·K) e^{iK·(τ_κ−τ_κ')}
//     with full tensors Z and ε∞, cut at K·ε∞·K/4Λ² ≤ 50 (Gonze & Lee, Phys. Rev. B 55, 10355
//     (1997)). At Γ (q within 1e-9 of a reciprocal lattice vector in reduced coordinates) the K = 0
//     term is left out unless a direction is given, which adds its direction-dependent limit.
//   - Kernel2D: the point-dipole kernel of a sheet with atoms at different heights, summed over
//     in-plane K with the slab Ewald functions ĝ(K, z), ∂_zĝ, ∂_z²ĝ (z = z_κ' − z_κ; written with
//     Erfcx so that no K|z| overflows), the K = 0 zz term kept at every q, plus the Keldysh-type
//     in-plane screening correction (Cudazzo et al., Phys. Rev. B 84, 085406 (2011)) when the cell's
//     in-plane ε differs from 1 or ε_env ≠ 1. The derivation of the signs is in ewald2d.go. Only
//     the in-plane part of q is used.
//
// Both kernels subtract from every C^raw(q) one real symmetric constant D whose block row sums are
// T_κ = Σ_κ' C^raw_{κκ'}(0), so that Σ_κ' C^LR_{κκ'}(0) = 0 (at Γ without direction in 3D). D is
// the symmetric part of T_κ on the diagonal blocks, which is the usual "minus the q = 0 sum over
// κ″ for κ = κ'" whenever T_κ is symmetric (any neutral two-atom cell), and carries the
// antisymmetric part of T_κ, if any, on the off-diagonal blocks so that Hermiticity is kept.
//
// The charges need not sum to zero, but callers should neutralize them first
// (Charges.Neutralize) and report what was removed.
//
// # Choice of Λ
//
// The real-space remainder that the kernel leaves to the interpolation decays like erfc(Λd)/d.
// DefaultLambda takes Λ·r_WS = 4.5·√λ_max(ε∞) in 3D (d measured in the metric ε∞⁻¹) and
// Λ·r_WS = 5 in 2D, r_WS being half the shortest non-zero vector of the grid's supercell (in-plane
// for sheets). The unscreened kernels give Λ-independent totals (kernel plus exact remainder); the
// 2D screening correction is leading order only and its result depends on Λ by design; 5 is the
// lower end of the allowed range, where it works best. WithLambda overrides the default.
//
// The package does no I/O and holds no mutable global state.
package longrange
