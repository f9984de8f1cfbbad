// Package exact is a catalogue of invented, exactly solvable model crystals: rigid ions and
// point dipoles coupled by the Coulomb law to every other ion of the crystal, plus short-range
// springs. Their dynamical matrices are known to near machine precision at every q, which makes
// them the outside reference the interpolation pipeline (lamina/ifc, lamina/longrange) is tested
// against, and the data of the built-in demo.
//
// The package is deliberately independent of the code it checks: it imports neither lamina/ifc
// nor lamina/longrange nor lamina/formats. Its lattice sums are its own Ewald methods, derived
// from the integral representation of 1/r (see ewald3d.go and ewald2d.go), and its frequencies
// come from gonum's real symmetric eigensolver applied to the 2n×2n real embedding of the
// Hermitian dynamical matrix, not from lamina's Hermitian solver.
//
// # Units and conventions
//
// Lengths in Å, masses in amu, charges in e, force constants and C(q) in eV/Å², frequencies in
// THz (shared PHYSICS.md sections 1–3). q-points are reduced coordinates, q = Σ f_i b_i; for a
// sheet only f1 and f2 are used and q lies in the xy plane.
//
// Force constants Φ_{κα,κ'β}(R) = ∂²E/∂u_{κα}(0)∂u_{κ'β}(R), R the lattice vector of the cell of
// atom κ'. Point dipoles p_κ = Z_κ·u_κ (Z[κ][α][β]: dipole component α per displacement β)
// interact through
//
//	Φ_{κα,κ'β}(R) = −k_e Σ_{γδ} Z_{κ,γα} Z_{κ',δβ} ∂_γ∂_δ φ(r),   r = R + τ_κ' − τ_κ,
//
// with φ(r) = 1/r in vacuum and φ(r) = 1/(√det ε · √(r·ε⁻¹·r)) in a bulk medium of dielectric
// tensor ε (for point charges Z = q·1 this is the second derivative of k_e q q'/|r| with respect
// to the two displacements, which enter r with opposite signs). A sheet is a 2D lattice: no
// periodic images along z, the atoms keep their heights.
//
// The dynamical matrix uses the "cell" phase: C_{κα,κ'β}(q) = Σ_R Φ_{κα,κ'β}(R) exp(+i q·R),
// a 3N×3N row-major slice with index 3κ+α, not mass-weighted. C(q+G) = C(q), C(−q) = C(q)*.
// The on-site blocks follow from the acoustic sum rule, Φ_{κα,κβ}(0) = −Σ_{(κ',R)≠(κ,0)}
// Φ_{κα,κ'β}(R). Point dipoles with non-symmetric Born charges would break Hermiticity of that
// on-site block and leave a first-order (∝ |q|, partly imaginary) acoustic term; the model
// therefore also holds antisymmetric "balancing" couplings on its spring bonds, fixed by two
// linear conditions (balance.go). They vanish for rigid ions and springs.
//
// Bulk at Γ (q ≡ 0 modulo G): the non-analytic K = 0 term is left out (the analytic part, as a
// first-principles run gives Γ) unless a Cartesian direction d is given, in which case the exact
// limit (4π k_e/Ω)(d̂·Z_κ)_α(d̂·Z_κ')_β/(d̂·ε·d̂) is added. Sheets are continuous at Γ and take no
// direction.
//
// # Lattice sums
//
// The Coulomb sums are Ewald sums with a parameter η (1/Å) chosen per model (√π/Ω^{1/3} bulk,
// √π/√A sheet) and tied to no grid; every part is converged to e^{−42}, so results do not depend
// on η to ~1e-14 (tested). Bulk: erfc(ηd)/d in real space with the metric d = √(r·ε⁻¹·r), the
// Gaussian-damped 4π/(Ω K·ε·K) in reciprocal space, and the R = 0 self term (ewald.go,
// ewald3d.go). Sheet: the split 1/r = (2/√π)(∫_0^η + ∫_η^∞) exp(−r²t²) dt, the part t > η in real
// space, the part t < η Fourier-summed over in-plane G with its transform at height z as a 1D
// integral over t evaluated by Gauss–Legendre quadrature (ewald2d.go, slabquad.go). Checks:
// direct lattice sums, Madelung constants, η-independence, Poisson's equation for the slab
// transform, the 3D LO–TO splitting and the 2D LO and ZO slopes at Γ.
//
// # Catalogue
//
//	BuckledSheet   "sheet-AB"    hexagonal rigid-ion sheet, buckled, 2 atoms
//	DipoleSheet    "sheet-ABC"   hexagonal point-dipole sheet, 3 atoms at three heights
//	RockSalt       "rocksalt-AB" fcc rigid ions in vacuum, 2 atoms
//	DipoleCrystal  "dipole-ABC"  triclinic point dipoles in an anisotropic medium, 3 atoms
//	Chain          "chain"       monatomic spring chain, no charges
//
// All are dynamically stable (tested on dense samplings and next to Γ); their springs are
// shorter than half the shortest vector of a 6×6 (sheet) or 4×4×4 (bulk) supercell. The
// acoustic flexural branch of the sheets is linear in |q| near Γ: the transverse spring
// constants act as a bond tension.
//
// # Concurrency
//
// A Model is read-only after construction: its methods may be called from several goroutines.
// Changing its exported fields afterwards does not update the cached lattice sums; build a new
// model with New instead.
package exact
