package main

import (
	"bytes"
	"compress/gzip"
	"errors"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"lamina/formats"
	"lamina/grid"
	"lamina/ifc/exact"
)

// run executes the lamina command tree in-process with args and returns stdout and stderr.
func run(t *testing.T, args ...string) (string, string, error) {
	t.Helper()
	root := newRootCmd()
	var out, errb bytes.Buffer
	root.SetOut(&out)
	root.SetErr(&errb)
	root.SetArgs(args)
	err := root.Execute()
	return out.String(), errb.String(), err
}

// parseTable splits a lamina table into '#' lines and rows of fields.
func parseTable(t *testing.T, s string) (comments []string, rows [][]string) {
	t.Helper()
	for _, line := range strings.Split(strings.TrimRight(s, "\n"), "\n") {
		if strings.HasPrefix(line, "#") {
			if len(rows) > 0 {
				t.Fatalf("comment after data: %q", line)
			}
			comments = append(comments, line)
			continue
		}
		rows = append(rows, strings.Split(line, "\t"))
	}
	return comments, rows
}

func floats(t *testing.T, fields []string) []float64 {
	t.Helper()
	out := make([]float64, len(fields))
	for i, f := range fields {
		v, err := strconv.ParseFloat(f, 64)
		if err != nil {
			t.Fatalf("field %d %q: %v", i, f, err)
		}
		out[i] = v
	}
	return out
}

// The eval contract: '#' header naming the columns, one row per q-point in input order, q as
// given, 3N ascending frequencies with ≥ 8 significant digits; the values agree with the exact
// model the file was sampled from (package exact, independent of the pipeline).
func TestEvalMatchesExactSheet(t *testing.T) {
	out, _, err := run(t, "eval", "../../testdata/sheet-AB.json.gz", "--qpoints", "../../testdata/sheet-q.txt")
	if err != nil {
		t.Fatal(err)
	}
	comments, rows := parseTable(t, out)
	if len(comments) == 0 || !strings.Contains(comments[len(comments)-1], "f6[THz]") {
		t.Fatalf("header does not name the columns: %q", comments)
	}
	qs := []grid.Vec3{{0, 0, 0}, {0.013, 0.004, 0}, {1.0 / 3, 1.0 / 3, 0}, {0.5, 0, 0}, {-0.21, 0.37, 0}, {0.75, 0.1, 0}}
	if len(rows) != len(qs) {
		t.Fatalf("%d rows, want %d", len(rows), len(qs))
	}
	m := exact.BuckledSheet()
	for i, r := range rows {
		v := floats(t, r)
		if len(v) != 3+6 {
			t.Fatalf("row %d has %d fields", i, len(v))
		}
		for j := 0; j < 3; j++ {
			if math.Abs(v[j]-qs[i][j]) > 1e-9 {
				t.Errorf("row %d: q = %v, want %v", i, v[:3], qs[i])
			}
		}
		want := m.Frequencies(qs[i], grid.Vec3{})
		for j, f := range v[3:] {
			if j > 0 && f < v[3+j-1] {
				t.Errorf("row %d: frequencies not ascending: %v", i, v[3:])
			}
			// 1e-6 THz: acoustic modes at Γ are ±√(round-off); elsewhere ~1e-10 plus printing.
			if math.Abs(f-want[j]) > 1e-6 {
				t.Errorf("row %d mode %d: %.10g THz, exact %.10g", i, j, f, want[j])
			}
		}
	}
	// Units: cm-1 is THz × 33.35641 (CODATA-derived, PHYSICS.md section 1).
	cm, _, err := run(t, "eval", "../../testdata/sheet-AB.json.gz", "--qpoints", "../../testdata/sheet-q.txt", "--units", "cm-1")
	if err != nil {
		t.Fatal(err)
	}
	_, rcm := parseTable(t, cm)
	a, b := floats(t, rows[3]), floats(t, rcm[3])
	if math.Abs(b[8]/a[8]-33.35641) > 1e-5 {
		t.Errorf("cm-1/THz = %g", b[8]/a[8])
	}
}

// bands through Γ of a bulk polar crystal: two rows at Γ, each with the LO limit of its own
// segment, and every row equal to the exact model (with the segment direction at Γ).
func TestBandsRockSalt(t *testing.T) {
	dir := t.TempDir()
	table, fig := filepath.Join(dir, "b.tsv"), filepath.Join(dir, "b.svg")
	_, _, err := run(t, "bands", "../../testdata/rocksalt-AB.json.gz", "--path", "X 0.5 0 0.5, G 0 0 0, L 0.5 0.5 0.5", "--points", "41", "-o", table, "--plot", fig)
	if err != nil {
		t.Fatal(err)
	}
	data, err := os.ReadFile(table)
	if err != nil {
		t.Fatal(err)
	}
	if st, err := os.Stat(fig); err != nil || st.Size() == 0 {
		t.Errorf("figure not written: %v", err)
	}
	_, rows := parseTable(t, string(data))
	m := exact.RockSalt()
	lat := m.Structure.Lattice
	gammas := 0
	for i, r := range rows {
		d := floats(t, r[:4])
		q := grid.Vec3{d[1], d[2], d[3]}
		f := floats(t, r[5:])
		// The direction of each row: along its segment (X→Γ before Γ, Γ→L after).
		var dirv grid.Vec3
		if q.Norm() == 0 {
			gammas++
			if gammas == 1 {
				dirv = lat.Cartesian(grid.Vec3{0.5, 0, 0.5}).Scale(-1)
			} else {
				dirv = lat.Cartesian(grid.Vec3{0.5, 0.5, 0.5})
			}
			dirv = dirv.Scale(1 / dirv.Norm())
			if r[4] != "G" {
				t.Errorf("row %d: label %q at Γ", i, r[4])
			}
		}
		want := m.Frequencies(q, dirv)
		for j := range f {
			if math.Abs(f[j]-want[j]) > 1e-6 {
				t.Errorf("row %d q %v mode %d: %.10g THz, exact %.10g", i, q, j, f[j], want[j])
			}
		}
	}
	if gammas != 2 {
		t.Errorf("%d rows at Γ, want 2 (one per side)", gammas)
	}
}

// Bad input fails with one message naming the file and what is wrong, and -o leaves no file.
func TestErrorsNameTheProblem(t *testing.T) {
	dir := t.TempDir()
	g := readTestGrid(t, "../../testdata/sheet-AB.json.gz")
	// A grid with a missing point.
	g.Samples = g.Samples[:len(g.Samples)-1]
	missing := filepath.Join(dir, "missing.json")
	writeTestGrid(t, missing, g)
	out := filepath.Join(dir, "out.tsv")
	_, _, err := run(t, "eval", missing, "--qpoints", "../../testdata/sheet-q.txt", "-o", out)
	if err == nil || !strings.Contains(err.Error(), "missing.json") || !strings.Contains(err.Error(), "missing") {
		t.Errorf("missing grid point: err = %v", err)
	}
	if _, statErr := os.Stat(out); !errors.Is(statErr, os.ErrNotExist) {
		t.Errorf("failed eval left %s behind", out)
	}
	// A q-point with f3 ≠ 0 for a sheet.
	qf := filepath.Join(dir, "q.txt")
	os.WriteFile(qf, []byte("0.1 0 0.2\n"), 0o644)
	if _, _, err := run(t, "eval", "../../testdata/sheet-AB.json.gz", "--qpoints", qf); err == nil || !strings.Contains(err.Error(), "f3") {
		t.Errorf("2d q with f3: err = %v", err)
	}
	// A file without its phase.
	raw := filepath.Join(dir, "nophase.json")
	var buf bytes.Buffer
	if err := formats.WriteGrid(&buf, readTestGrid(t, "../../testdata/sheet-AB.json.gz")); err != nil {
		t.Fatal(err)
	}
	os.WriteFile(raw, bytes.Replace(buf.Bytes(), []byte(`"phase": "cell",`), nil, 1), 0o644)
	if bytes.Equal(buf.Bytes(), mustRead(t, raw)) {
		t.Fatal("test set-up: phase key not found in written grid")
	}
	if _, _, err := run(t, "info", raw); err == nil || !strings.Contains(err.Error(), "phase") || !strings.Contains(err.Error(), "nophase.json") {
		t.Errorf("no phase: err = %v", err)
	}
	// Bad enum values fail at flag parsing and list the valid ones.
	if _, _, err := run(t, "info", "../../testdata/sheet-AB.json.gz", "--long-range", "4d"); err == nil || !strings.Contains(err.Error(), "2d") {
		t.Errorf("bad --long-range: err = %v", err)
	}
}

// Forcing the 3D kernel on a sheet warns of its spurious splitting; info reports Λ.
func TestInfoAndWarnings(t *testing.T) {
	out, errs, err := run(t, "info", "../../testdata/sheet-AB.json.gz", "--long-range", "3d")
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(errs, "spurious") {
		t.Errorf("no warning for the 3D kernel on a sheet: %q", errs)
	}
	if !strings.Contains(out, "lambda =") || !strings.Contains(out, "sum-rule") {
		t.Errorf("info lacks Λ or the sum-rule line:\n%s", out)
	}
}

// Non-neutral Born charges are reported and, by default, neutralized (PHYSICS.md section 6).
func TestChargeNeutrality(t *testing.T) {
	g := readTestGrid(t, "../../testdata/sheet-AB.json.gz")
	g.Charges.Z[0][0][0] += 0.2
	path := filepath.Join(t.TempDir(), "charged.json.gz")
	writeTestGrid(t, path, g)
	out, errs, err := run(t, "info", path)
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(out, "neutrality error 0.2 e") || !strings.Contains(errs, "mean was removed") {
		t.Errorf("charge error not reported:\n%s\n%s", out, errs)
	}
	// Removing the mean restores the acoustic sum rule of the long-range part: three zero
	// modes at Γ (to the √round-off floor of 1e-6 THz).
	qf := filepath.Join(t.TempDir(), "g.txt")
	os.WriteFile(qf, []byte("0 0 0\n"), 0o644)
	ev, _, err := run(t, "eval", path, "--qpoints", qf)
	if err != nil {
		t.Fatal(err)
	}
	_, rows := parseTable(t, ev)
	for _, f := range floats(t, rows[0][3:6]) {
		if math.Abs(f) > 1e-6 {
			t.Errorf("acoustic mode at Γ %g THz after neutralization", f)
		}
	}
}

// The demo runs from scratch and writes its grids, tables and figures.
func TestDemo(t *testing.T) {
	if testing.Short() {
		t.Skip("demo takes a few seconds")
	}
	dir := t.TempDir()
	out, _, err := run(t, "demo", "-o", dir, "--points", "60")
	if err != nil {
		t.Fatal(err)
	}
	for _, f := range []string{"sheet-AB.json.gz", "sheet-AB-bands.tsv", "sheet-AB-bands.svg", "sheet-AB-near-gamma.svg", "rocksalt-AB-bands.tsv", "dipole-ABC-bands.svg"} {
		if st, err := os.Stat(filepath.Join(dir, f)); err != nil || st.Size() == 0 {
			t.Errorf("demo did not write %s", f)
		}
	}
	if !strings.Contains(out, "near-gamma") {
		t.Errorf("demo output does not point to the near-Γ figure:\n%s", out)
	}
}

// The committed testdata grids are what the demo generates now.
func TestTestdataCurrent(t *testing.T) {
	for _, c := range demoCases()[:2] {
		want := modelGrid(c)
		got := readTestGrid(t, "../../testdata/"+c.model.Name+".json.gz")
		if len(got.Samples) != len(want.Samples) {
			t.Fatalf("%s: %d samples, want %d", c.model.Name, len(got.Samples), len(want.Samples))
		}
		for i := range got.Samples {
			for j, v := range got.Samples[i].C {
				if d := v - want.Samples[i].C[j]; math.Hypot(real(d), imag(d)) > 1e-12 {
					t.Fatalf("%s: testdata is stale (sample %d element %d); regenerate it (testdata/README.md)", c.model.Name, i, j)
				}
			}
		}
	}
}

func mustRead(t *testing.T, path string) []byte {
	t.Helper()
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	return b
}

func readTestGrid(t *testing.T, path string) *formats.Grid {
	t.Helper()
	g, err := readGrid(path)
	if err != nil {
		t.Fatal(err)
	}
	return g
}

func writeTestGrid(t *testing.T, path string, g *formats.Grid) {
	t.Helper()
	var buf bytes.Buffer
	zw := gzip.NewWriter(&buf)
	if err := formats.WriteGrid(zw, g); err != nil {
		t.Fatal(err)
	}
	zw.Close()
	if err := os.WriteFile(path, buf.Bytes(), 0o644); err != nil {
		t.Fatal(err)
	}
}

// Outputs: a symbolic link is written through (the link stays), the input is never
// overwritten, a bad figure name fails before anything is written, absurd flags are refused.
func TestOutputSafety(t *testing.T) {
	dir := t.TempDir()
	in := filepath.Join(dir, "in.json.gz")
	if err := os.WriteFile(in, mustRead(t, "../../testdata/sheet-AB.json.gz"), 0o644); err != nil {
		t.Fatal(err)
	}
	target, link := filepath.Join(dir, "target.tsv"), filepath.Join(dir, "link.tsv")
	os.WriteFile(target, []byte("old\n"), 0o644)
	if err := os.Symlink(target, link); err != nil {
		t.Fatal(err)
	}
	if _, _, err := run(t, "bands", in, "--points", "20", "-o", link); err != nil {
		t.Fatal(err)
	}
	if fi, err := os.Lstat(link); err != nil || fi.Mode()&os.ModeSymlink == 0 {
		t.Errorf("the symbolic link was replaced: %v", err)
	}
	if b := mustRead(t, target); !bytes.HasPrefix(b, []byte("# lamina")) {
		t.Errorf("link target not written: %q", b[:min(len(b), 20)])
	}
	before := mustRead(t, in)
	if _, _, err := run(t, "bands", in, "-o", in); err == nil {
		t.Error("bands -o INPUT accepted")
	}
	if !bytes.Equal(before, mustRead(t, in)) {
		t.Error("the input file was changed")
	}
	table := filepath.Join(dir, "t.tsv")
	if _, _, err := run(t, "bands", in, "-o", table, "--plot", filepath.Join(dir, "t.jpg")); err == nil || !strings.Contains(err.Error(), "jpg") {
		t.Errorf("--plot t.jpg: err = %v", err)
	}
	if _, err := os.Stat(table); !errors.Is(err, os.ErrNotExist) {
		t.Error("the table was written although the figure name was bad")
	}
	for _, args := range [][]string{
		{"bands", in, "--points", "0"},
		{"bands", in, "--points", "1000000000"},
		{"eval", in, "--qpoints", "../../testdata/sheet-q.txt", "--workers", "0"},
		{"bands", in, "-o", dir},
	} {
		if _, _, err := run(t, args...); err == nil {
			t.Errorf("%v accepted", args)
		}
	}
	// A Λ far below the default is allowed but reported.
	_, errs, err := run(t, "info", in, "--lambda", "0.05")
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(errs, "depend on lambda") {
		t.Errorf("no warning for a small lambda: %q", errs)
	}
}

// A sheet whose cell has in-plane ε∞ = 3 gets the in-plane screening length
// 2πα∥ = c(ε∥ − 1)/2 (PHYSICS.md section 5: α∥ = c(ε∥^cell − 1)/4π), here c = 20 Å → 20 Å.
func TestInfoScreening(t *testing.T) {
	g := readTestGrid(t, "../../testdata/sheet-AB.json.gz")
	g.Charges.Epsilon[0][0], g.Charges.Epsilon[1][1] = 3, 3
	path := filepath.Join(t.TempDir(), "screened.json.gz")
	writeTestGrid(t, path, g)
	out, _, err := run(t, "info", path)
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(out, "2πα∥ (Å)  20 0 / 0 20") {
		t.Errorf("screening length not reported as 20 Å:\n%s", out)
	}
}
