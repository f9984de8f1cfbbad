// Package grid holds the geometry of lamina: small vector algebra (Vec3, Mat3), lattices and
// their reciprocal lattices, the crystal structure (atoms with masses and Cartesian positions),
// Γ-centred q-point meshes, cell reduction and band paths.
//
// Units: lengths in Å, reciprocal vectors in 1/Å with b_i·a_j = 2π δ_ij (shared PHYSICS.md
// section 2), masses in amu. Lattice vectors are the rows of a Mat3. A q-point in reduced
// coordinates (f1, f2, f3) is q = Σ f_i b_i. For a sheet (periodicity Sheet) a1 and a2 lie in the xy plane,
// a3 sets the cell height c = Ω/A, and only in-plane q (f3 = 0) exist.
//
// Band paths (Path, AutoPath, Sample) hold vertices in reduced coordinates of the input cell;
// special points are placed geometrically on the reduced cell (Reduce2D, Reduce3D) and converted
// back, so any choice of primitive cell gives the same Cartesian points. Distances along a path
// are in 1/Å; Γ between two segments is sampled twice, once per side, each with its direction.
//
// The package does no I/O and holds no global state; values are safe to copy.
package grid
