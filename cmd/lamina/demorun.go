package main

import (
	"fmt"
	"io"
	"math"

	"github.com/spf13/cobra"

	"lamina/formats"
	"lamina/grid"
	"lamina/grid/units"
	"lamina/ifc"
	"lamina/ifc/exact"
	"lamina/longrange"
)

// demoCase is one built-in model crystal and the coarse grid the demo samples it on.
type demoCase struct {
	model *exact.Model
	mesh  grid.Mesh
	path  string // explicit band path; "" for the automatic one
}

func demoCases() []demoCase {
	return []demoCase{
		{exact.BuckledSheet(), grid.Mesh{N: [3]int{6, 6, 1}}, ""},
		{exact.RockSalt(), grid.Mesh{N: [3]int{4, 4, 4}}, ""},
		// A triclinic cell has no standard path: walk Γ to the three zone-face centres.
		{exact.DipoleCrystal(), grid.Mesh{N: [3]int{4, 4, 4}}, "X 0.5 0 0, G 0 0 0, Y 0 0.5 0 | Z 0 0 0.5, G 0 0 0, R 0.5 0.5 0.5"},
	}
}

// modelGrid samples the exact model on the mesh as a lamina-grid value (cell phase).
func modelGrid(c demoCase) *formats.Grid {
	m := c.model
	g := &formats.Grid{Structure: m.Structure, Mesh: &c.mesh, Phase: ifc.CellPhase}
	if m.Z != nil {
		g.Charges = &longrange.Charges{Z: append([]grid.Mat3(nil), m.Z...), Epsilon: m.Epsilon}
	}
	for i := 0; i < c.mesh.Len(); i++ {
		q := c.mesh.Point(i)
		g.Samples = append(g.Samples, ifc.Sample{Q: q, C: m.Matrix(nil, q, grid.Vec3{})})
	}
	return g
}

// writeGridFile writes g to path, gzip-compressed when the name ends in .gz (atomically).
func writeGridFile(stdout io.Writer, path string, g *formats.Grid) error {
	return withOutput(stdout, path, func(w io.Writer) error {
		cw, err := formats.NewCompressedWriter(w, formats.CompressionFromName(path))
		if err != nil {
			return err
		}
		if err := formats.WriteGrid(cw, g); err != nil {
			cw.Close()
			return err
		}
		return cw.Close()
	})
}

func runDemo(cmd *cobra.Command, dir string, points int, figures string) error {
	out := cmd.OutOrStdout()
	fmt.Fprintf(out, "lamina demo: invented model crystals with exactly known dynamical matrices, written to %s\n", dir)
	for _, c := range demoCases() {
		m := c.model
		file := demoFile(dir, m.Name+".json.gz")
		if err := writeGridFile(out, file, modelGrid(c)); err != nil {
			return err
		}
		ld, err := loadModel(file, modelFlags{})
		if err != nil {
			return err
		}
		path, kind, err := demoPath(c)
		if err != nil {
			return fmt.Errorf("%s: %w", m.Name, err)
		}
		pts, err := path.Sample(m.Structure.Lattice, points)
		if err != nil {
			return err
		}
		got, err := pathFrequencies(cmd, ld.fc, pts)
		if err != nil {
			return err
		}
		want := exactFrequencies(m, pts)
		table, fig := demoFile(dir, m.Name+"-bands.tsv"), demoFile(dir, m.Name+"-bands."+figures)
		if err := writeBands(out, table, ld, pts, got); err != nil {
			return err
		}
		p, err := bandsFigure(
			bandSeries{Title: "exact", Points: pts, Freqs: want, Unit: units.THz},
			bandSeries{Title: fmt.Sprintf("interpolated from %d×%d×%d grid, %s kernel", c.mesh.N[0], c.mesh.N[1], c.mesh.N[2], ld.rep.Kernel), Points: pts, Freqs: got, Unit: units.THz, Dashed: true},
		)
		if err != nil {
			return err
		}
		if err := savePlot(out, p, fig, figures); err != nil {
			return err
		}
		fmt.Fprintf(out, "\n%s: %s, %d atoms, %s lattice, %d×%d×%d grid -> %s\n", m.Name, m.Structure.Lattice.Periodicity, m.Structure.N(), kind, c.mesh.N[0], c.mesh.N[1], c.mesh.N[2], file)
		fmt.Fprintf(out, "  long range: %s kernel, lambda = %.4g 1/Å; path %s\n", ld.rep.Kernel, ld.rep.Lambda, path)
		fmt.Fprintf(out, "  largest |interpolated - exact| along the path: %.2e THz (frequencies up to %.2f THz; zero modes at Γ not counted)\n", maxErr(got, want), maxAbsAll(want))
		fmt.Fprintf(out, "  bands: %s, figure: %s\n", table, fig)
		if m.Structure.Lattice.Periodicity == grid.Sheet {
			if err := nearGamma(cmd, dir, c, file, figures); err != nil {
				return err
			}
		}
	}
	return nil
}

// demoPath returns the case's band path and the name of its lattice type.
func demoPath(c demoCase) (grid.Path, string, error) {
	if c.path != "" {
		p, err := grid.ParsePath(c.path)
		return p, "triclinic", err
	}
	p, kind, err := grid.AutoPath(c.model.Structure.Lattice)
	return p, kind.String(), err
}

// nearGamma draws the sheet's exact bands near Γ beside the interpolations with the 2D kernel,
// the 3D kernel and no long-range part.
func nearGamma(cmd *cobra.Command, dir string, c demoCase, file, figures string) error {
	out := cmd.OutOrStdout()
	lat := c.model.Structure.Lattice
	// From 0.15 of the way to K, through Γ, to 0.15 of the way to M.
	path := grid.Path{{{Label: "→K", Q: grid.Vec3{0.05, 0.05, 0}}, {Label: "G"}, {Label: "→M", Q: grid.Vec3{0.075, 0, 0}}}}
	pts, err := path.Sample(lat, 161)
	if err != nil {
		return err
	}
	want := exactFrequencies(c.model, pts)
	series := []bandSeries{{Title: "exact", Points: pts, Freqs: want, Unit: units.THz}}
	fmt.Fprintf(out, "  near Γ (|q| ≤ %.3f 1/Å), largest |interpolated - exact|:\n", lat.Cartesian(grid.Vec3{0.075, 0, 0}).Norm())
	for _, mode := range []ifc.LongRangeMode{ifc.LongRange2D, ifc.LongRange3D, ifc.LongRangeOff} {
		ld, err := loadModel(file, modelFlags{longRange: mode})
		if err != nil {
			return err
		}
		got, err := pathFrequencies(cmd, ld.fc, pts)
		if err != nil {
			return err
		}
		name := map[ifc.LongRangeMode]string{ifc.LongRange2D: "2D kernel", ifc.LongRange3D: "3D kernel", ifc.LongRangeOff: "no long-range part"}[mode]
		series = append(series, bandSeries{Title: name, Points: pts, Freqs: got, Unit: units.THz, Dashed: true})
		fmt.Fprintf(out, "    %-20s %.2e THz\n", name, maxErr(got, want))
	}
	series[0].Title = "exact"
	p, err := bandsFigure(series...)
	if err != nil {
		return err
	}
	p.Title.Text = c.model.Name + " near Γ: 15% of the way to K and to M"
	fig := demoFile(dir, c.model.Name+"-near-gamma."+figures)
	if err := savePlot(out, p, fig, figures); err != nil {
		return err
	}
	fmt.Fprintf(out, "  near-Γ comparison figure: %s\n", fig)
	return nil
}

func pathFrequencies(cmd *cobra.Command, fc *ifc.ForceConstants, pts []grid.PathPoint) ([][]float64, error) {
	qs, dirs := make([]grid.Vec3, len(pts)), make([]grid.Vec3, len(pts))
	for i, p := range pts {
		qs[i], dirs[i] = p.Q, p.Dir
	}
	res := make([][]float64, len(pts))
	err := fc.Sweep(cmd.Context(), qs, dirs, 2, func(i int, f []float64) error {
		res[i] = append([]float64(nil), f...)
		return nil
	})
	return res, err
}

func exactFrequencies(m *exact.Model, pts []grid.PathPoint) [][]float64 {
	res := make([][]float64, len(pts))
	for i, p := range pts {
		res[i] = m.Frequencies(p.Q, p.Dir)
	}
	return res
}

// maxErr returns the largest |a − b| (THz). Modes where both are below 0.001 THz (the
// acoustic modes at Γ, which come out as ±√(round-off) ≈ 1e-7 THz in both) count as equal.
func maxErr(a, b [][]float64) float64 {
	e := 0.0
	for i := range a {
		for j := range a[i] {
			if math.Abs(a[i][j]) < 1e-3 && math.Abs(b[i][j]) < 1e-3 {
				continue
			}
			e = math.Max(e, math.Abs(a[i][j]-b[i][j]))
		}
	}
	return e
}

func maxAbsAll(a [][]float64) float64 {
	e := 0.0
	for _, r := range a {
		for _, v := range r {
			e = math.Max(e, math.Abs(v))
		}
	}
	return e
}
