package formats

import (
	"bytes"
	"errors"
	"io"
	"math"
	"math/rand/v2"
	"reflect"
	"strings"
	"testing"

	"lamina/grid"
	"lamina/ifc"
)

// floatBits lists every float of g as bits, so that a comparison also sees the sign of zero.
func floatBits(g *Grid) []uint64 {
	var out []uint64
	add := func(xs ...float64) {
		for _, x := range xs {
			out = append(out, math.Float64bits(x))
		}
	}
	addMat := func(m grid.Mat3) {
		for i := range m {
			add(m[i][:]...)
		}
	}
	addMat(g.Structure.Lattice.Vectors)
	for _, a := range g.Structure.Atoms {
		add(a.Mass)
		add(a.Position[:]...)
	}
	if g.Charges != nil {
		for _, z := range g.Charges.Z {
			addMat(z)
		}
		addMat(g.Charges.Epsilon)
	}
	for _, s := range g.Samples {
		add(s.Q[:]...)
		for _, c := range s.C {
			add(real(c), imag(c))
		}
	}
	return out
}

func TestRoundTrip(t *testing.T) {
	awkward := sheetGrid(t)
	// Values whose shortest decimal form is long, or that are special to a float printer:
	// 0.1 (not exact in binary), 1/3, a subnormal, −0, the largest and smallest floats.
	c := awkward.Samples[1].C
	c[0] = complex(0.1, 1.0/3)
	c[1] = complex(5e-324, math.Copysign(0, -1))
	c[2] = complex(math.MaxFloat64, -math.SmallestNonzeroFloat64)
	c[3] = complex(-2.2250738585072014e-308, 123456789.123456789)
	awkward.Structure.Atoms[0].Species = `A "quoted" \ <&>`

	cases := []struct {
		name string
		g    *Grid
	}{
		{"sheet with charges", sheetGrid(t)},
		{"awkward floats", awkward},
		{"bulk held-out", bulkHeldOut(t)},
	}
	for _, tc := range cases {
		for _, comp := range []Compression{None, Gzip, Zstd} {
			data := encode(t, tc.g, comp)
			switch comp {
			case Gzip:
				if !bytes.HasPrefix(data, gzipMagic) {
					t.Fatalf("%s/%v: output does not start with the gzip magic", tc.name, comp)
				}
			case Zstd:
				if !bytes.HasPrefix(data, zstdMagic) {
					t.Fatalf("%s/%v: output does not start with the zstd magic", tc.name, comp)
				}
			}
			got, err := ReadGrid(bytes.NewReader(data), tc.name)
			if err != nil {
				t.Fatalf("%s/%v: ReadGrid: %v", tc.name, comp, err)
			}
			if !reflect.DeepEqual(got, tc.g) {
				t.Errorf("%s/%v: ReadGrid(WriteGrid(g)) differs from g:\ngot  %+v\nwant %+v", tc.name, comp, got, tc.g)
			}
			if !reflect.DeepEqual(floatBits(got), floatBits(tc.g)) {
				t.Errorf("%s/%v: float bits differ after the round trip", tc.name, comp)
			}
		}
	}
}

func TestWriteGridRefuses(t *testing.T) {
	nan := sheetGrid(t)
	nan.Samples[2].C[7] = complex(0, math.NaN())
	short := sheetGrid(t)
	short.Samples[0].C = short.Samples[0].C[:35]
	inf := sheetGrid(t)
	inf.Charges.Epsilon[1][1] = math.Inf(1)
	count := sheetGrid(t)
	count.Charges.Z = count.Charges.Z[:1]
	empty := sheetGrid(t)
	empty.Samples = nil
	cases := []struct {
		name string
		g    *Grid
		kind error
	}{
		{"nil", nil, ErrValue},
		{"NaN in C", nan, ErrNonFinite},
		{"short C", short, ErrShape},
		{"Inf epsilon", inf, ErrNonFinite},
		{"Born count", count, ErrShape},
		{"no samples", empty, ErrShape},
	}
	for _, tc := range cases {
		var buf bytes.Buffer
		err := WriteGrid(&buf, tc.g)
		if !errors.Is(err, tc.kind) {
			t.Errorf("WriteGrid(%s) = %v, want %v", tc.name, err, tc.kind)
		}
		if buf.Len() != 0 {
			t.Errorf("WriteGrid(%s) wrote %d bytes before failing, want 0", tc.name, buf.Len())
		}
	}
}

type failWriter struct{ after int }

func (w *failWriter) Write(p []byte) (int, error) {
	if len(p) > w.after {
		return 0, errors.New("disk full")
	}
	w.after -= len(p)
	return len(p), nil
}

func TestWriteGridReportsWriteError(t *testing.T) {
	if err := WriteGrid(&failWriter{after: 100}, sheetGrid(t)); err == nil || err.Error() != "disk full" {
		t.Errorf("WriteGrid to a failing writer = %v, want the writer's error", err)
	}
}

// TestUnits reads the same numbers in bohr, Ry and Ha and checks the conversion against the
// CODATA 2018 constants typed here (not taken from grid/units).
func TestUnits(t *testing.T) {
	const (
		bohr    = 0.529177210903  // Å, CODATA 2018
		rydberg = 13.605693122994 // eV, CODATA 2018 (half the hartree)
		hartree = 27.211386245988 // eV, CODATA 2018
		tol     = 4e-16           // relative: one or two roundings in a different operation order
		m00     = 2.5             // matrix element as written
		a       = 6.0             // lattice constant as written
		zpos    = 12.0            // atom height as written
	)
	cases := []struct {
		units          string
		length, energy float64 // Å and eV per file unit
		wantUnits      Units
	}{
		{`{"length": "bohr", "energy": "Ry"}`, bohr, rydberg, Units{"bohr", "Ry"}},
		{`{"length": "BOHR", "energy": "ha"}`, bohr, hartree, Units{"bohr", "Ha"}},
		{`{"energy": "Ha"}`, 1, hartree, Units{"angstrom", "Ha"}},
		{`{"length": "bohr"}`, bohr, 1, Units{"bohr", "eV"}},
		{`{}`, 1, 1, Units{"angstrom", "eV"}},
	}
	d := baseDoc().
		with("lattice", `[[6, 0, 0], [0, 6, 0], [0, 0, 30]]`).
		with("atoms", `[{"species": "A", "mass": 24, "position": [0, 0, 12]}, {"species": "B", "mass": 12, "position": [3, 3, 12]}]`)
	for _, tc := range cases {
		g, err := readString(d.with("units", tc.units).String())
		if err != nil {
			t.Fatalf("units %s: %v", tc.units, err)
		}
		if g.Units != tc.wantUnits {
			t.Errorf("units %s: Units = %+v, want %+v", tc.units, g.Units, tc.wantUnits)
		}
		check := func(what string, got, want float64) {
			if math.Abs(got-want) > tol*math.Abs(want) {
				t.Errorf("units %s: %s = %.17g, want %.17g", tc.units, what, got, want)
			}
		}
		check("a1x", g.Structure.Lattice.Vectors[0][0], a*tc.length)
		check("z of atom 0", g.Structure.Atoms[0].Position[2], zpos*tc.length)
		check("mass (always amu)", g.Structure.Atoms[0].Mass, 24)
		// re[0][1] = 1 and re[2][3] = 23 in the file (sampleJSON: 10i + j).
		factor := tc.energy / (tc.length * tc.length)
		check("C[0][1]", real(g.Samples[0].C[1]), 1*factor)
		check("C[2][3]", real(g.Samples[1].C[2*6+3]), 23*factor)
		check("Z unchanged", g.Charges.Z[0][0][0], 1.5)
	}
	// The headline conversion: 1 Ry/bohr² in eV/Å².
	g, err := readString(d.with("units", `{"length": "bohr", "energy": "Ry"}`).
		with("qpoints", `[{"q": [0,0,0], "re": `+matrixJSON(6, func(i, j int) float64 { return 1 })+`, "im": `+matrixJSON(6, func(i, j int) float64 { return 0 })+`}, `+sampleJSON("[0.5,0,0]")+`]`).String())
	if err != nil {
		t.Fatal(err)
	}
	want := rydberg / (bohr * bohr) // 48.5868... eV/Å², derived from the CODATA values above
	if got := real(g.Samples[0].C[0]); math.Abs(got-want) > tol*want {
		t.Errorf("1 Ry/bohr² = %.17g eV/Å², want %.17g", got, want)
	}
	// 1e307 Ry/bohr² is finite in the file but not in eV/Å² (×48.6 exceeds MaxFloat64 ≈ 1.8e308).
	huge := d.with("units", `{"length": "bohr", "energy": "Ry"}`).
		with("qpoints", `[{"q": [0,0,0], "re": `+matrixJSON(6, func(i, j int) float64 { return 1e307 })+`, "im": `+matrixJSON(6, func(i, j int) float64 { return 0 })+`}, `+sampleJSON("[0.5,0,0]")+`]`)
	if _, err := readString(huge.String()); findProblem(err, "qpoints[0]", ErrNonFinite) == nil {
		t.Errorf("overflow on conversion: %v, want ErrNonFinite at qpoints[0]", err)
	}
}

func TestHeldOutAndKeyOrder(t *testing.T) {
	// No "grid": a held-out set, q anywhere in the zone.
	d := baseDoc().without("grid").with("qpoints", "["+sampleJSON("[0.123, -0.4, 0]")+"]")
	g, err := readString(d.String())
	if err != nil {
		t.Fatal(err)
	}
	if g.Mesh != nil {
		t.Errorf("held-out set: Mesh = %v, want nil", g.Mesh)
	}
	if len(g.Samples) != 1 || g.Samples[0].Q != (grid.Vec3{0.123, -0.4, 0}) {
		t.Errorf("held-out set: samples %v", g.Samples)
	}
	// Key order is free: q-points first, format and version last.
	want, err := readString(baseDoc().String())
	if err != nil {
		t.Fatal(err)
	}
	rev := baseDoc()
	for i, j := 0, len(rev)-1; i < j; i, j = i+1, j-1 {
		rev[i], rev[j] = rev[j], rev[i]
	}
	got, err := readString(rev.String())
	if err != nil {
		t.Fatalf("reversed key order: %v", err)
	}
	if !reflect.DeepEqual(got, want) {
		t.Errorf("reversed key order reads differently")
	}
	// Charges optional (both absent); a grid q may be written off by a reciprocal vector.
	d = baseDoc().without("born_charges").without("epsilon").
		with("qpoints", "["+sampleJSON("[-1, 0, 0]")+", "+sampleJSON("[-0.5, 1, 0]")+"]")
	g, err = readString(d.String())
	if err != nil {
		t.Fatal(err)
	}
	if g.Charges != nil {
		t.Errorf("no charges in the file: Charges = %v, want nil", g.Charges)
	}
	if g.Samples[1].Q != (grid.Vec3{-0.5, 1, 0}) {
		t.Errorf("q must be kept as written, got %v", g.Samples[1].Q)
	}
	if g.Phase != ifc.CellPhase {
		t.Errorf("phase = %v, want cell", g.Phase)
	}
}

func TestReadGridErrors(t *testing.T) {
	base := baseDoc()
	six := func(f func(i, j int) float64) string { return matrixJSON(6, f) }
	zero := func(i, j int) float64 { return 0 }
	shortRow := strings.Replace(six(zero), "[0, 0, 0, 0, 0, 0]", "[0, 0, 0, 0, 0]", 1)
	shortRow = strings.Replace(shortRow, "[0, 0, 0, 0, 0, 0], [0, 0, 0, 0, 0, 0], [0, 0, 0, 0, 0]", "[0, 0, 0, 0, 0, 0], [0, 0, 0, 0, 0], [0, 0, 0, 0, 0, 0]", 1)
	qp := func(entries ...string) string { return "[" + strings.Join(entries, ", ") + "]" }
	entry := func(q, re, im string) string { return `{"q": ` + q + `, "re": ` + re + `, "im": ` + im + `}` }
	cases := []struct {
		name string
		doc  string
		path string
		kind error
	}{
		{"missing phase", base.without("phase").String(), "", ErrMissingKey},
		{"bad phase", base.with("phase", `"cel"`).String(), "phase", ErrValue},
		{"unknown key", base.with("colour", `"red"`).String(), "", ErrUnknownKey},
		{"misspelt epsilon", base.without("epsilon").with("epsilom", `[[1,0,0],[0,1,0],[0,0,1]]`).String(), "", ErrUnknownKey},
		{"born without epsilon", base.without("epsilon").String(), "born_charges", ErrMissingKey},
		{"epsilon without born", base.without("born_charges").String(), "epsilon", ErrMissingKey},
		{"duplicate key", strings.Replace(base.String(), "{\n", "{\n  \"phase\": \"atom\",\n", 1), "phase", ErrDuplicateKey},
		{"duplicate key in atom", base.with("atoms", `[{"species": "A", "mass": 24, "mass": 25, "position": [0, 0, 7]}, {"species": "B", "mass": 12, "position": [1.5, 1.5, 7.5]}]`).String(), "atoms[0].mass", ErrDuplicateKey},
		{"unknown key in q-point", base.with("qpoints", qp(`{"q": [0,0,0], "re": `+six(zero)+`, "im": `+six(zero)+`, "weight": 1}`, sampleJSON("[0.5,0,0]"))).String(), "qpoints[0]", ErrUnknownKey},
		{"short row", base.with("qpoints", qp(sampleJSON("[0,0,0]"), entry("[0.5,0,0]", shortRow, six(zero)))).String(), "qpoints[1].re", ErrShape},
		{"too few rows", base.with("qpoints", qp(sampleJSON("[0,0,0]"), entry("[0.5,0,0]", six(zero), matrixJSON(5, zero)))).String(), "qpoints[1].im", ErrShape},
		{"missing im", base.with("qpoints", qp(sampleJSON("[0,0,0]"), `{"q": [0.5,0,0], "re": `+six(zero)+`}`)).String(), "qpoints[1]", ErrMissingKey},
		{"missing re", base.with("qpoints", qp(sampleJSON("[0,0,0]"), `{"q": [0.5,0,0], "im": `+six(zero)+`}`)).String(), "qpoints[1]", ErrMissingKey},
		{"overflow", base.with("qpoints", qp(sampleJSON("[0,0,0]"), entry("[0.5,0,0]", strings.Replace(six(zero), "0, 0, 0, 0, 0, 0], [0, 0, 0", "0, 0, 0, 0, 0, 0], [0, 0, 1e999", 1), six(zero)))).String(), "qpoints[1].re[1][2]", ErrNonFinite},
		{"null in matrix", base.with("qpoints", qp(sampleJSON("[0,0,0]"), entry("[0.5,0,0]", six(zero), strings.Replace(six(zero), "[0, ", "[null, ", 1)))).String(), "qpoints[1].im[0][0]", ErrValue},
		{"string number", base.with("lattice", `[[3, 0, 0], [0, "3", 0], [0, 0, 15]]`).String(), "lattice[1][1]", ErrValue},
		{"null position", base.with("atoms", `[{"species": "A", "mass": 24, "position": [0, null, 7]}, {"species": "B", "mass": 12, "position": [1.5, 1.5, 7.5]}]`).String(), "atoms[0].position[1]", ErrValue},
		{"position length", base.with("atoms", `[{"species": "A", "mass": 24, "position": [0, 0, 7, 1]}, {"species": "B", "mass": 12, "position": [1.5, 1.5, 7.5]}]`).String(), "atoms[0].position", ErrShape},
		{"missing mass", base.with("atoms", `[{"species": "A", "position": [0, 0, 7]}, {"species": "B", "mass": 12, "position": [1.5, 1.5, 7.5]}]`).String(), "atoms[0]", ErrMissingKey},
		{"negative mass", base.with("atoms", `[{"species": "A", "mass": -24, "position": [0, 0, 7]}, {"species": "B", "mass": 12, "position": [1.5, 1.5, 7.5]}]`).String(), "atoms", ErrValue},
		{"atoms not array", base.with("atoms", `{"species": "A"}`).String(), "atoms", ErrValue},
		{"2d with n3 = 2", base.with("grid", `[2, 1, 2]`).String(), "grid", ErrValue},
		{"2d with f3 != 0", base.with("qpoints", qp(sampleJSON("[0,0,0]"), sampleJSON("[0.5,0,0.5]"))).String(), "qpoints[1].q", ErrValue},
		{"grid not integer", base.with("grid", `[2, 1.5, 1]`).String(), "grid[1]", ErrValue},
		{"grid zero", base.with("grid", `[2, 0, 1]`).String(), "grid[1]", ErrValue},
		{"q off grid", base.with("qpoints", qp(sampleJSON("[0,0,0]"), sampleJSON("[0.4,0,0]"))).String(), "qpoints[1].q", ErrValue},
		{"q twice", base.with("qpoints", qp(sampleJSON("[0,0,0]"), sampleJSON("[1,0,0]"))).String(), "qpoints[1].q", ErrValue},
		{"no q-points", base.with("qpoints", `[]`).String(), "qpoints", ErrValue},
		{"2d a1 out of plane", base.with("lattice", `[[3, 0, 0.5], [0, 3, 0], [0, 0, 15]]`).String(), "lattice", ErrValue},
		{"sheet split across cell", base.with("atoms", `[{"species": "A", "mass": 24, "position": [0, 0, 1]}, {"species": "B", "mass": 12, "position": [1.5, 1.5, 14]}]`).String(), "atoms", ErrValue},
		{"epsilon not positive", base.with("epsilon", `[[2.5, 0, 0], [0, -2.5, 0], [0, 0, 1.2]]`).String(), "epsilon", ErrValue},
		{"born count", base.with("born_charges", `[[[1.5, 0, 0], [0, 1.5, 0], [0, 0, 0.2]]]`).String(), "born_charges", ErrShape},
		{"bad periodicity", base.with("periodicity", `"1d"`).String(), "periodicity", ErrValue},
		{"bad unit", base.with("units", `{"length": "nm"}`).String(), "units.length", ErrValue},
		{"unknown unit key", base.with("units", `{"lenght": "bohr"}`).String(), "units", ErrUnknownKey},
		{"missing format", base.without("format").String(), "", ErrUnknownFormat},
		{"other format", base.with("format", `"other-grid"`).String(), "format", ErrUnknownFormat},
		{"format not string", base.with("format", `7`).String(), "format", ErrUnknownFormat},
		{"top-level array", `[1, 2]`, "", ErrUnknownFormat},
		{"version 2", base.with("version", `2`).String(), "version", ErrVersion},
		{"version string", base.with("version", `"1"`).String(), "version", ErrVersion},
		{"missing version", base.without("version").String(), "", ErrVersion},
		{"empty input", "", "", ErrSyntax},
		{"truncated", base.String()[:len(base.String())/2], "", ErrSyntax},
		{"trailing data", base.String() + "{}", "", ErrSyntax},
	}
	for _, tc := range cases {
		_, err := readString(tc.doc)
		if err == nil {
			t.Errorf("%s: ReadGrid succeeded, want %v at %q", tc.name, tc.kind, tc.path)
			continue
		}
		if p := findProblem(err, tc.path, tc.kind); p == nil {
			t.Errorf("%s: ReadGrid = %v\nwant a problem at %q wrapping %v", tc.name, err, tc.path, tc.kind)
		} else if p.File != "demo.json" {
			t.Errorf("%s: problem names file %q, want demo.json", tc.name, p.File)
		}
	}
}

// TestReadGridMessages pins the wording of a few messages that users read.
func TestReadGridMessages(t *testing.T) {
	zero := func(i, j int) float64 { return 0 }
	re := strings.Replace(matrixJSON(6, zero), "[0, 0, 0, 0, 0, 0], [0, 0, 0, 0, 0, 0], [0, 0, 0, 0, 0, 0], [0, 0, 0, 0, 0, 0]",
		"[0, 0, 0, 0, 0, 0], [0, 0, 0, 0, 0, 0], [0, 0, 0, 0, 0, 0], [0, 0, 0, 0, 0]", 1)
	d := baseDoc().with("qpoints", `[`+sampleJSON("[0,0,0]")+`, {"q": [0.5,0,0], "re": `+re+`, "im": `+matrixJSON(6, zero)+`}]`)
	_, err := readString(d.String())
	if got, want := err.Error(), "demo.json: qpoints[1].re: row 3 has 5 values, want 6"; got != want {
		t.Errorf("short row message:\ngot  %s\nwant %s", got, want)
	}
	_, err = readString(baseDoc().without("epsilon").with("epsilom", `[[1,0,0],[0,1,0],[0,0,1]]`).String())
	if !strings.Contains(err.Error(), `unknown key "epsilom" (did you mean "epsilon"?)`) {
		t.Errorf("misspelt key: no suggestion in\n%v", err)
	}
	_, err = readString(baseDoc().without("phase").String())
	if !strings.Contains(err.Error(), "C(−q)") {
		t.Errorf("missing phase: message does not explain why it is required:\n%v", err)
	}
}

// TestReadGridOnePass checks that independent problems are reported together, and capped.
func TestReadGridOnePass(t *testing.T) {
	d := baseDoc().with("colour", `"red"`).with("phase", `"sideways"`).with("grid", `[2, 1, 3]`)
	_, err := readString(d.String())
	for _, want := range []struct {
		path string
		kind error
	}{{"", ErrUnknownKey}, {"phase", ErrValue}, {"grid", ErrValue}} {
		if findProblem(err, want.path, want.kind) == nil {
			t.Errorf("one pass: no %v at %q in\n%v", want.kind, want.path, err)
		}
	}
	// 30 unknown keys: MaxReportedProblems shown, the rest counted.
	for i := range 30 {
		d = d.with("extra"+string(rune('a'+i%26))+string(rune('a'+i/26)), "0")
	}
	_, err = readString(d.String())
	if n := len(problemsOf(err)); n != MaxReportedProblems {
		t.Errorf("%d problems reported, want the cap %d", n, MaxReportedProblems)
	}
	if !strings.Contains(err.Error(), "more problems not shown") {
		t.Errorf("capped problems: no count of the rest in\n%v", err)
	}
}

// TestSyntaxPosition checks that a syntax error points at the offending byte.
func TestSyntaxPosition(t *testing.T) {
	good := baseDoc().String()
	cases := []struct {
		name, bad string
		at        func(s string) int // index of the offending byte
	}{
		// A ';' instead of a ',' inside a matrix row (found by the value scanner).
		{"in a value", strings.Replace(good, "[10, 11, 12", "[10; 11, 12", 1), func(s string) int { return strings.Index(s, ";") }},
		// A ']' where a key is expected (found by the token state machine).
		{"between keys", strings.Replace(good, `"grid":`, `]: "grid":`, 1), func(s string) int { return strings.Index(s, `]: "grid"`) }},
		// A bare word in a q vector, inside the streamed q-points.
		{"in a q-point", strings.Replace(good, `"q": [0.5, 0, 0]`, `"q": [0.5, 0, @]`, 1), func(s string) int { return strings.Index(s, "@") }},
	}
	// Truncated: the position is the end of the text.
	cut := good[:len(good)/2]
	_, err := readString(cut)
	var pe *ParseError
	if !errors.As(err, &pe) || !errors.Is(err, ErrSyntax) || pe.Offset != int64(len(cut)) || pe.Line != strings.Count(cut, "\n")+1 {
		t.Errorf("truncated at byte %d (line %d): %v", len(cut), strings.Count(cut, "\n")+1, err)
	}
	for _, tc := range cases {
		if tc.bad == good {
			t.Fatalf("%s: the replacement did not apply", tc.name)
		}
		_, err := readString(tc.bad)
		var pe *ParseError
		if !errors.As(err, &pe) || !errors.Is(err, ErrSyntax) {
			t.Fatalf("%s: ReadGrid = %v, want a syntax *ParseError", tc.name, err)
		}
		want := tc.at(tc.bad)
		wantLine := strings.Count(tc.bad[:want], "\n") + 1
		wantCol := want - strings.LastIndex(tc.bad[:want], "\n")
		if pe.Offset != int64(want) || pe.Line != wantLine || pe.Column != wantCol {
			t.Errorf("%s: error at byte %d, line %d, column %d; want byte %d, line %d, column %d (%v)",
				tc.name, pe.Offset, pe.Line, pe.Column, want, wantLine, wantCol, err)
		}
	}
}

func TestReadGridLimits(t *testing.T) {
	doc := baseDoc().String()
	n := int64(len(doc))
	if _, err := readString(doc, WithMaxBytes(n)); err != nil {
		t.Errorf("WithMaxBytes(len): %v, want success (the cap is inclusive)", err)
	}
	gz := compressBytes(t, []byte(doc), Gzip)
	zs := compressBytes(t, []byte(doc), Zstd)
	for _, in := range [][]byte{[]byte(doc), gz, zs} {
		if _, err := ReadGrid(bytes.NewReader(in), "demo.json", WithMaxBytes(n-1)); !errors.Is(err, ErrLimit) {
			t.Errorf("WithMaxBytes(len−1) = %v, want ErrLimit", err)
		}
	}
	if _, err := readString(doc, WithMaxAtoms(1)); findProblem(err, "atoms", ErrLimit) == nil {
		t.Errorf("WithMaxAtoms(1) on 2 atoms = %v, want ErrLimit at atoms", err)
	}
	if _, err := readString(doc, WithMaxQPoints(1)); findProblem(err, "qpoints", ErrLimit) == nil {
		t.Errorf("WithMaxQPoints(1) on 2 q-points = %v, want ErrLimit at qpoints", err)
	}
	big := baseDoc().with("grid", `[1000, 1000, 1000]`).String()
	if _, err := readString(big); findProblem(err, "grid", ErrLimit) == nil {
		t.Errorf("10⁹-point grid = %v, want ErrLimit at grid", err)
	}
	for _, opt := range []ReadOption{WithMaxBytes(0), WithMaxAtoms(-1), WithMaxQPoints(0)} {
		if _, err := readString(doc, opt); err == nil {
			t.Errorf("a non-positive limit was accepted")
		}
	}
}

func TestReadGridCompressedFaults(t *testing.T) {
	doc := []byte(baseDoc().String())
	gz := compressBytes(t, doc, Gzip)
	zs := compressBytes(t, doc, Zstd)
	corrupt := append([]byte(nil), gz...)
	corrupt[len(corrupt)/2] ^= 0xff
	cases := []struct {
		name string
		in   []byte
	}{
		{"gzip without trailer", gz[:len(gz)-6]},
		{"gzip cut in half", gz[:len(gz)/2]},
		{"gzip magic only", gz[:2]},
		{"gzip corrupt", corrupt},
		{"zstd cut short", zs[:len(zs)-5]},
		{"zstd cut in half", zs[:len(zs)/2]},
		{"zstd magic only", zs[:4]},
	}
	for _, tc := range cases {
		_, err := ReadGrid(bytes.NewReader(tc.in), "demo.json.gz")
		if !errors.Is(err, ErrCompression) {
			t.Errorf("%s: ReadGrid = %v, want ErrCompression", tc.name, err)
		}
	}
}

type errReader struct{ err error }

func (r errReader) Read([]byte) (int, error) { return 0, r.err }

func TestReadGridSourceError(t *testing.T) {
	cause := errors.New("device gone")
	_, err := ReadGrid(errReader{cause}, "demo.json")
	if !errors.Is(err, cause) {
		t.Errorf("ReadGrid on a failing reader = %v, want it to wrap the reader's error", err)
	}
	// A failing source under gzip is still the source's error, not a corrupt stream.
	gz := compressBytes(t, []byte(baseDoc().String()), Gzip)
	_, err = ReadGrid(io.MultiReader(bytes.NewReader(gz[:40]), errReader{cause}), "demo.json.gz")
	if !errors.Is(err, cause) || errors.Is(err, ErrCompression) {
		t.Errorf("ReadGrid on a gzip source failing midway = %v, want the source's error", err)
	}
}

// benchmarkReadGrid reads a grid file of nAtoms atoms on a 6×6×1 grid.
func benchmarkReadGrid(b *testing.B, nAtoms int, c Compression) {
	g := sheetGrid(b)
	atoms := make([]grid.Atom, nAtoms)
	for i := range atoms {
		atoms[i] = grid.Atom{Species: "A", Mass: 24, Position: grid.Vec3{0.3 * float64(i), 0.1 * float64(i), 10}}
	}
	g.Structure.Atoms = atoms
	g.Charges = nil
	m := grid.Mesh{N: [3]int{6, 6, 1}}
	g.Mesh = &m
	g.Samples = randomSamples(m, nil, nAtoms, rand.New(rand.NewPCG(3, 3)))
	data := encode(b, g, c)
	plain := encode(b, g, None)
	b.SetBytes(int64(len(plain))) // decompressed bytes per second
	b.ReportAllocs()
	for b.Loop() {
		if _, err := ReadGrid(bytes.NewReader(data), "bench"); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkReadGrid(b *testing.B) {
	b.Run("2atoms", func(b *testing.B) { benchmarkReadGrid(b, 2, None) })
	b.Run("8atoms", func(b *testing.B) { benchmarkReadGrid(b, 8, None) })
	b.Run("8atoms-gzip", func(b *testing.B) { benchmarkReadGrid(b, 8, Gzip) })
	b.Run("8atoms-zstd", func(b *testing.B) { benchmarkReadGrid(b, 8, Zstd) })
}

func BenchmarkWriteGrid(b *testing.B) {
	g := sheetGrid(b)
	m := grid.Mesh{N: [3]int{6, 6, 1}}
	g.Mesh = &m
	g.Samples = randomSamples(m, nil, 2, rand.New(rand.NewPCG(3, 3)))
	b.SetBytes(int64(len(encode(b, g, None))))
	b.ReportAllocs()
	for b.Loop() {
		if err := WriteGrid(io.Discard, g); err != nil {
			b.Fatal(err)
		}
	}
}

// An empty atom list is one clear problem, not one per matrix; a leading UTF-8 byte-order
// mark is ignored.
func TestReadGridEmptyAtomsAndBOM(t *testing.T) {
	doc := baseDoc().with("atoms", `[]`).String()
	_, err := ReadGrid(strings.NewReader(doc), "empty.json")
	if err == nil || !strings.Contains(err.Error(), "atoms: no atoms") {
		t.Fatalf("atoms []: err = %v", err)
	}
	if n := strings.Count(err.Error(), "\n"); n > 2 {
		t.Errorf("atoms []: %d lines of errors, want the one about atoms:\n%v", n+1, err)
	}
	ok := baseDoc().String()
	if _, err := ReadGrid(strings.NewReader("\uFEFF"+ok), "bom.json"); err != nil {
		t.Errorf("file with a byte-order mark: %v", err)
	}
}
