package formats

import (
	"bytes"
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"lamina/grid"
	"lamina/ifc"
	"lamina/longrange"
)

// Model crystals for the tests: invented species A and B, invented masses and charges.

// sheetGrid returns a buckled two-atom hexagonal sheet (a = 3 Å, cell height 20 Å) on a
// 3×3×1 grid with seeded random complex matrices, Born charges and a full dielectric tensor.
func sheetGrid(t testing.TB) *Grid {
	t.Helper()
	lat, err := grid.NewLattice(grid.Mat3{{3, 0, 0}, {-1.5, 1.5 * math.Sqrt(3), 0}, {0.4, 0, 20}}, grid.Sheet)
	if err != nil {
		t.Fatal(err)
	}
	s := grid.Structure{Lattice: lat, Atoms: []grid.Atom{
		{Species: "A", Mass: 24.305, Position: grid.Vec3{0, 0, 10}},
		{Species: "B", Mass: 15.999, Position: grid.Vec3{1.5, 0.5 * math.Sqrt(3), 10.7}},
	}}
	ch := &longrange.Charges{
		Z: []grid.Mat3{
			{{2.1, 0.05, 0}, {-0.05, 2.1, 0}, {0, 0, 0.3}},
			{{-2.1, -0.05, 0}, {0.05, -2.1, 0}, {0, 0, -0.3}},
		},
		Epsilon: grid.Mat3{{3.2, 0.1, 0}, {0.1, 3.2, 0}, {0, 0, 1.4}},
	}
	m := grid.Mesh{N: [3]int{3, 3, 1}}
	return &Grid{Structure: s, Charges: ch, Mesh: &m, Phase: ifc.AtomPhase,
		Samples: randomSamples(m, nil, 2, rand.New(rand.NewPCG(1, 1))), Units: Units{"angstrom", "eV"}}
}

// bulkHeldOut returns a one-atom orthorhombic crystal with matrices at arbitrary q and no
// charges (a held-out set).
func bulkHeldOut(t testing.TB) *Grid {
	t.Helper()
	lat, err := grid.NewLattice(grid.Mat3{{4, 0, 0}, {0, 4.5, 0}, {0, 0, 5}}, grid.Bulk)
	if err != nil {
		t.Fatal(err)
	}
	s := grid.Structure{Lattice: lat, Atoms: []grid.Atom{{Species: "A", Mass: 40, Position: grid.Vec3{0.1, 0.2, 0.3}}}}
	qs := []grid.Vec3{{0.1, 0.2, 0.3}, {-0.25, 0.5, 1.0 / 3}, {0, 0, 0}}
	return &Grid{Structure: s, Phase: ifc.CellPhase,
		Samples: randomSamples(grid.Mesh{}, qs, 1, rand.New(rand.NewPCG(2, 2))), Units: Units{"angstrom", "eV"}}
}

// randomSamples returns one sample per point of m (or per q of qs when m is empty) with
// random 3n×3n matrices.
func randomSamples(m grid.Mesh, qs []grid.Vec3, n int, rng *rand.Rand) []ifc.Sample {
	if m.Len() > 0 {
		qs = make([]grid.Vec3, m.Len())
		for i := range qs {
			qs[i] = m.Point(i)
		}
	}
	out := make([]ifc.Sample, len(qs))
	for i, q := range qs {
		c := make([]complex128, 9*n*n)
		for j := range c {
			c[j] = complex(rng.NormFloat64()*10, rng.NormFloat64())
		}
		out[i] = ifc.Sample{Q: q, C: c}
	}
	return out
}

// encode writes g with WriteGrid through the given compression.
func encode(t testing.TB, g *Grid, c Compression) []byte {
	t.Helper()
	var buf bytes.Buffer
	w, err := NewCompressedWriter(&buf, c)
	if err != nil {
		t.Fatal(err)
	}
	if err := WriteGrid(w, g); err != nil {
		t.Fatalf("WriteGrid: %v", err)
	}
	if err := w.Close(); err != nil {
		t.Fatal(err)
	}
	return buf.Bytes()
}

// compressBytes compresses data.
func compressBytes(t testing.TB, data []byte, c Compression) []byte {
	t.Helper()
	var buf bytes.Buffer
	w, err := NewCompressedWriter(&buf, c)
	if err != nil {
		t.Fatal(err)
	}
	if _, err := w.Write(data); err != nil {
		t.Fatal(err)
	}
	if err := w.Close(); err != nil {
		t.Fatal(err)
	}
	return buf.Bytes()
}

// problemsOf flattens an error returned by a reader into its *ParseError values.
func problemsOf(err error) []*ParseError {
	var out []*ParseError
	var walk func(error)
	walk = func(e error) {
		if pe, ok := e.(*ParseError); ok {
			out = append(out, pe)
			return
		}
		if j, ok := e.(interface{ Unwrap() []error }); ok {
			for _, x := range j.Unwrap() {
				walk(x)
			}
		}
	}
	walk(err)
	return out
}

// findProblem returns the problem at path that wraps kind, or nil.
func findProblem(err error, path string, kind error) *ParseError {
	for _, p := range problemsOf(err) {
		if p.Path == path && errors.Is(p, kind) {
			return p
		}
	}
	return nil
}

// member is one key and its raw JSON value; a document is an object with its keys in order.
type member struct{ key, val string }

type document []member

func (d document) String() string {
	var b strings.Builder
	b.WriteString("{\n")
	for i, m := range d {
		if i > 0 {
			b.WriteString(",\n")
		}
		fmt.Fprintf(&b, "  %q: %s", m.key, m.val)
	}
	b.WriteString("\n}\n")
	return b.String()
}

// with returns d with key set to val (replaced in place, or appended).
func (d document) with(key, val string) document {
	out := append(document(nil), d...)
	for i := range out {
		if out[i].key == key {
			out[i].val = val
			return out
		}
	}
	return append(out, member{key, val})
}

// without returns d without key.
func (d document) without(key string) document {
	var out document
	for _, m := range d {
		if m.key != key {
			out = append(out, m)
		}
	}
	return out
}

// first returns d with key moved to the front.
func (d document) first(key string) document {
	var out document
	for _, m := range d {
		if m.key == key {
			out = append(document{m}, out...)
		} else {
			out = append(out, m)
		}
	}
	return out
}

// matrixJSON writes an n×n matrix with elements f(i, j).
func matrixJSON(n int, f func(i, j int) float64) string {
	var b strings.Builder
	b.WriteString("[")
	for i := 0; i < n; i++ {
		if i > 0 {
			b.WriteString(", ")
		}
		b.WriteString("[")
		for j := 0; j < n; j++ {
			if j > 0 {
				b.WriteString(", ")
			}
			fmt.Fprintf(&b, "%g", f(i, j))
		}
		b.WriteString("]")
	}
	b.WriteString("]")
	return b.String()
}

// sampleJSON writes one q-point entry with 6×6 matrices re(i,j) = 10i + j, im = 0.
func sampleJSON(q string) string {
	re := matrixJSON(6, func(i, j int) float64 { return float64(10*i + j) })
	im := matrixJSON(6, func(i, j int) float64 { return 0 })
	return fmt.Sprintf(`{"q": %s, "re": %s, "im": %s}`, q, re, im)
}

// baseDoc is a small valid 2d file written by hand: two atoms (A, B), charges, 2×1×1 grid.
func baseDoc() document {
	return document{
		{"format", `"lamina-grid"`},
		{"version", `1`},
		{"periodicity", `"2d"`},
		{"lattice", `[[3, 0, 0], [0, 3, 0], [0, 0, 15]]`},
		{"atoms", `[{"species": "A", "mass": 24, "position": [0, 0, 7]}, {"species": "B", "mass": 12, "position": [1.5, 1.5, 7.5]}]`},
		{"born_charges", `[[[1.5, 0, 0], [0, 1.5, 0], [0, 0, 0.2]], [[-1.5, 0, 0], [0, -1.5, 0], [0, 0, -0.2]]]`},
		{"epsilon", `[[2.5, 0, 0], [0, 2.5, 0], [0, 0, 1.2]]`},
		{"grid", `[2, 1, 1]`},
		{"phase", `"cell"`},
		{"qpoints", "[\n" + sampleJSON("[0, 0, 0]") + ",\n" + sampleJSON("[0.5, 0, 0]") + "]"},
	}
}

func readString(s string, opts ...ReadOption) (*Grid, error) {
	return ReadGrid(strings.NewReader(s), "demo.json", opts...)
}
