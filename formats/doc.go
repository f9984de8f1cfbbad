// Package formats reads and writes lamina's files: the lamina-grid JSON format (dynamical
// matrices on a q-grid or a held-out set, with structure, Born charges and dielectric tensor),
// q-point lists, and tab-separated output tables. Unit conversion happens here, once, on
// reading; everything a reader returns is in lamina's internal units (Å, amu, eV, eV/Å², e).
//
// The package never opens files: readers take an io.Reader plus a name used in messages, and
// writers an io.Writer. Readers detect gzip (magic 1f 8b) and zstd (magic 28 b5 2f fd) input
// by its first bytes; writers leave compression to the caller (NewCompressedWriter,
// CompressionFromName).
//
// # The lamina-grid format, version 1
//
// A JSON object with these keys, in any order; unknown and duplicate keys are errors:
//
//	format        "lamina-grid" (required)
//	version       1 (required, an integer)
//	units         {"length": L, "energy": E}, optional, each key optional: L is "angstrom"
//	              (default) or "bohr" (0.529177210903 Å); E is "eV" (default), "Ry"
//	              (13.605693122994 eV) or "Ha" (27.211386245988 eV); case-insensitive.
//	              They apply to the lattice, the positions and the matrices (energy/length²).
//	periodicity   "2d" or "3d" (required)
//	lattice       [[a1x,a1y,a1z],[a2x,a2y,a2z],[a3x,a3y,a3z]], rows are the vectors (required)
//	atoms         [{"species": "A", "mass": 24.0, "position": [x,y,z]}, ...] (required);
//	              species a non-empty label, mass in amu, position Cartesian
//	born_charges  [Z_0, Z_1, ...], one full 3×3 tensor per atom, Z[α][β], in e (optional)
//	epsilon       full 3×3 high-frequency dielectric tensor (optional; present exactly when
//	              born_charges is)
//	grid          [n1, n2, n3], positive integers; absent for a held-out set (matrices at
//	              arbitrary q)
//	phase         "cell" or "atom" (required: the two conventions cannot be told apart from the
//	              data, and a matrix in the wrong one is really C(−q); shared PHYSICS.md section 3)
//	qpoints       [{"q": [f1,f2,f3], "re": [[...]], "im": [[...]]}, ...] (required, non-empty):
//	              q in reduced coordinates; re and im both required, each 3N rows of 3N numbers,
//	              row-major, index 3κ+α, mass-unweighted
//
// Checks made on reading, besides syntax, types and shapes: every number finite (a literal
// such as 1e999 that overflows a float64 is an error); the lattice valid (grid.NewLattice: for
// 2d, a1 and a2 in the xy plane); the structure valid (grid.Structure.Validate: positive masses,
// for 2d contiguous heights); the charges valid (longrange.Charges.Validate: one tensor per
// atom, ε symmetric positive definite), but not neutralized (the pipeline does that and
// reports it); for 2d, n3 = 1 and every |f3| ≤ 1e-9; with a grid, one q-point per grid point,
// each within 1e-5 grid steps of it (modulo reciprocal lattice vectors), none twice. Hermiticity
// of the matrices is left to the pipeline, which symmetrizes and reports.
//
// # Reading
//
// ReadGrid streams the input: it walks the top-level object token by token with a
// json.Decoder and decodes one q-point at a time, never holding the input text whole. Limits
// (ReadOption): decompressed size (WithMaxBytes, default 2 GiB), atoms (WithMaxAtoms, 10000),
// q-points (WithMaxQPoints, 1000000), each checked before the data is stored; zstd windows are
// capped at 32 MiB.
//
// Errors say where. Each problem is a *ParseError {File, Path, Line, Column, Offset, Err} that
// unwraps to one of the sentinels (ErrUnknownFormat, ErrVersion, ErrSyntax, ErrUnknownKey,
// ErrDuplicateKey, ErrMissingKey, ErrValue, ErrShape, ErrNonFinite, ErrLimit, ErrCompression),
// printed like
//
//	demo.json: qpoints[12].re: row 3 has 5 values, want 6
//	demo.json:14:9 (byte 312): invalid character ']' looking for beginning of value
//
// Problems of single values are collected and returned joined (errors.Join, at most
// MaxReportedProblems), so that a file can be fixed in one pass; syntax, stream and limit errors
// end the read. A file whose format or version is wrong reports only that. Nothing reachable
// from input data panics.
//
// # Writing
//
// WriteGrid writes Å and eV with the units stated, floats in the shortest form that reads back
// exactly. Table writes TSV rows through a bufio.Writer (numbers by FormatFloat, 10 significant
// digits) and refuses NaN and ±Inf before writing any of the row.
package formats
