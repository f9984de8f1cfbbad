package formats

import (
	"bufio"
	"encoding/json"
	"fmt"
	"io"
	"math"
	"strconv"

	"lamina/grid"
)

// WriteGrid writes g as lamina-grid JSON in Å and eV (units written explicitly; g.Units is
// ignored), with the samples in g.Phase as they are. Floats are written with the shortest
// representation that reads back to the same float64 (strconv 'g', precision −1), so ReadGrid
// gives back identical values. Compression is chosen by the caller wrapping w (see
// NewCompressedWriter). g is checked before the first byte is written: at least one atom and one
// sample, C of length (3N)² for every sample, one Born tensor per atom, and every number finite
// (JSON cannot hold NaN or ±Inf). WriteGrid does not check the physics (lattice, heights, grid
// coverage): ReadGrid does, so a Grid that came from ReadGrid always writes.
func WriteGrid(w io.Writer, g *Grid) error {
	if err := checkWritable(g); err != nil {
		return err
	}
	bw := bufio.NewWriterSize(w, 64<<10)
	s := g.Structure
	n3 := 3 * s.N()
	var b []byte
	b = append(b, "{\n"...)
	b = fmt.Appendf(b, "  \"format\": %q,\n  \"version\": %d,\n", FormatName, FormatVersion)
	b = append(b, "  \"units\": {\"length\": \"angstrom\", \"energy\": \"eV\"},\n"...)
	b = fmt.Appendf(b, "  \"periodicity\": %q,\n", s.Lattice.Periodicity.String())
	b = append(b, "  \"lattice\": "...)
	b = appendMat3(b, s.Lattice.Vectors)
	b = append(b, ",\n  \"atoms\": [\n"...)
	for i, a := range s.Atoms {
		name, _ := json.Marshal(a.Species) // a string always marshals
		b = append(b, "    {\"species\": "...)
		b = append(b, name...)
		b = append(b, ", \"mass\": "...)
		b = appendFloat(b, a.Mass)
		b = append(b, ", \"position\": "...)
		b = appendVec(b, a.Position[:])
		b = append(b, '}')
		b = appendSep(b, i, s.N())
	}
	b = append(b, "  ],\n"...)
	if c := g.Charges; c != nil {
		b = append(b, "  \"born_charges\": [\n"...)
		for i, z := range c.Z {
			b = append(b, "    "...)
			b = appendMat3(b, z)
			b = appendSep(b, i, len(c.Z))
		}
		b = append(b, "  ],\n  \"epsilon\": "...)
		b = appendMat3(b, c.Epsilon)
		b = append(b, ",\n"...)
	}
	if m := g.Mesh; m != nil {
		b = fmt.Appendf(b, "  \"grid\": [%d, %d, %d],\n", m.N[0], m.N[1], m.N[2])
	}
	b = fmt.Appendf(b, "  \"phase\": %q,\n  \"qpoints\": [\n", g.Phase.String())
	if _, err := bw.Write(b); err != nil {
		return err
	}
	for i, smp := range g.Samples {
		b = append(b[:0], "    {\"q\": "...)
		b = appendVec(b, smp.Q[:])
		for part := range 2 {
			if part == 0 {
				b = append(b, ",\n     \"re\": [\n"...)
			} else {
				b = append(b, ",\n     \"im\": [\n"...)
			}
			for r := range n3 {
				b = append(b, "      ["...)
				for c, v := range smp.C[r*n3 : (r+1)*n3] {
					if c > 0 {
						b = append(b, ", "...)
					}
					x := real(v)
					if part == 1 {
						x = imag(v)
					}
					b = appendFloat(b, x)
				}
				b = append(b, ']')
				if r < n3-1 {
					b = append(b, ',')
				}
				b = append(b, '\n')
			}
			b = append(b, "     ]"...)
		}
		b = append(b, '}')
		b = appendSep(b, i, len(g.Samples))
		if _, err := bw.Write(b); err != nil {
			return err
		}
	}
	if _, err := bw.WriteString("  ]\n}\n"); err != nil {
		return err
	}
	return bw.Flush()
}

func appendFloat(b []byte, x float64) []byte { return strconv.AppendFloat(b, x, 'g', -1, 64) }

func appendVec(b []byte, v []float64) []byte {
	b = append(b, '[')
	for i, x := range v {
		if i > 0 {
			b = append(b, ", "...)
		}
		b = appendFloat(b, x)
	}
	return append(b, ']')
}

func appendMat3(b []byte, m grid.Mat3) []byte {
	b = append(b, '[')
	for i := range m {
		if i > 0 {
			b = append(b, ", "...)
		}
		b = appendVec(b, m[i][:])
	}
	return append(b, ']')
}

// appendSep ends element i of n of a one-per-line array.
func appendSep(b []byte, i, n int) []byte {
	if i < n-1 {
		b = append(b, ',')
	}
	return append(b, '\n')
}

func writeProblem(kind error, format string, args ...any) error {
	return newProblem(kind, "formats: write grid: "+format, args...)
}

func finite(x float64) bool { return !math.IsNaN(x) && !math.IsInf(x, 0) }

func finiteMat3(m grid.Mat3) bool {
	for i := range m {
		for j := range m[i] {
			if !finite(m[i][j]) {
				return false
			}
		}
	}
	return true
}

// checkWritable checks what WriteGrid needs to write a file that ReadGrid can parse.
func checkWritable(g *Grid) error {
	if g == nil {
		return writeProblem(ErrValue, "nil grid")
	}
	s := g.Structure
	n := s.N()
	switch {
	case n == 0:
		return writeProblem(ErrShape, "structure has no atoms")
	case len(g.Samples) == 0:
		return writeProblem(ErrShape, "no samples")
	case !finiteMat3(s.Lattice.Vectors):
		return writeProblem(ErrNonFinite, "lattice vectors not finite")
	}
	for i, a := range s.Atoms {
		if !finite(a.Mass) || !finite(a.Position[0]) || !finite(a.Position[1]) || !finite(a.Position[2]) {
			return writeProblem(ErrNonFinite, "atom %d (%s): mass or position not finite", i, a.Species)
		}
	}
	if c := g.Charges; c != nil {
		if len(c.Z) != n {
			return writeProblem(ErrShape, "%d Born charge tensors for %d atoms", len(c.Z), n)
		}
		for i, z := range c.Z {
			if !finiteMat3(z) {
				return writeProblem(ErrNonFinite, "Born charge of atom %d not finite", i)
			}
		}
		if !finiteMat3(c.Epsilon) {
			return writeProblem(ErrNonFinite, "epsilon not finite")
		}
	}
	if m := g.Mesh; m != nil && (m.N[0] < 1 || m.N[1] < 1 || m.N[2] < 1) {
		return writeProblem(ErrValue, "mesh %v has a non-positive size", m.N)
	}
	want := 9 * n * n
	for i, smp := range g.Samples {
		if len(smp.C) != want {
			return writeProblem(ErrShape, "sample %d: C has %d elements, want %d (3N×3N for %d atoms)", i, len(smp.C), want, n)
		}
		if !finite(smp.Q[0]) || !finite(smp.Q[1]) || !finite(smp.Q[2]) {
			return writeProblem(ErrNonFinite, "sample %d: q not finite", i)
		}
		for j, v := range smp.C {
			if !finite(real(v)) || !finite(imag(v)) {
				return writeProblem(ErrNonFinite, "sample %d: C[%d][%d] = %v not finite", i, j/(3*n), j%(3*n), v)
			}
		}
	}
	return nil
}
