package main

import (
	"fmt"
	"io"
	"path/filepath"
	"runtime"
	"strings"

	"github.com/spf13/cobra"

	"lamina/formats"
	"lamina/grid"
	"lamina/grid/units"
)

func newBandsCmd() *cobra.Command {
	var (
		mf       modelFlags
		pathSpec string
		points   int
		out      string
		plotPath string
		unit     units.Frequency
		workers  int
	)
	cmd := &cobra.Command{
		Use:   "bands INPUT -o bands.tsv",
		Short: "Phonon dispersion along a path through the Brillouin zone",
		Long: `Interpolate the grid file INPUT along a path of high-symmetry points and write a
tab-separated table: distance (1/Å), q1 q2 q3 (reduced), label ('-' between vertices),
then the 3N frequencies, ascending, imaginary modes negative.

--path auto picks the standard path of the lattice type (2D: oblique, rectangular, centred
rectangular, square, hexagonal; 3D: cubic P/F/I, hexagonal, tetragonal P, orthorhombic P).
An explicit path lists vertices as "LABEL f1 f2 f3" separated by commas; '|' marks a break.
The points of --points are shared among segments by length. At Γ two rows share one
distance, one per side, so a bulk polar crystal shows the LO–TO splitting of each direction.`,
		Example: `  lamina bands sheet.json.gz -o bands.tsv --plot bands.svg
  lamina bands bulk.json --path "G 0 0 0, X 0.5 0 0.5 | L 0.5 0.5 0.5, G 0 0 0" --units cm-1 -o b.tsv`,
		Args: cobra.ExactArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			if err := checkWorkers(workers); err != nil {
				return err
			}
			if err := checkPoints(points); err != nil {
				return err
			}
			for _, o := range []string{out, plotPath} {
				if err := checkNotInput(args[0], o); err != nil {
					return err
				}
			}
			format := strings.TrimPrefix(strings.ToLower(filepath.Ext(plotPath)), ".")
			if plotPath != "" && format != "svg" && format != "png" && format != "pdf" {
				return fmt.Errorf("--plot %s: unknown figure format %q (use .svg, .png or .pdf)", plotPath, format)
			}
			m, err := loadModel(args[0], mf)
			if err != nil {
				return err
			}
			lat := m.grid.Structure.Lattice
			var path grid.Path
			if pathSpec == "auto" {
				p, kind, err := grid.AutoPath(lat)
				if err != nil {
					return fmt.Errorf("%s: %w", args[0], err)
				}
				fmt.Fprintf(cmd.ErrOrStderr(), "lamina: %s lattice, path %s\n", kind, p)
				path = p
			} else if path, err = grid.ParsePath(pathSpec); err != nil {
				return fmt.Errorf("--path: %w", err)
			}
			for _, piece := range path {
				for _, v := range piece {
					if err := checkReduced(v.Q); err != nil {
						return fmt.Errorf("--path: vertex %s: %w", v.Label, err)
					}
				}
			}
			pts, err := path.Sample(lat, points)
			if err != nil {
				return fmt.Errorf("--path with --points %d: %w", points, err)
			}
			warn(cmd, m)
			qs, dirs := make([]grid.Vec3, len(pts)), make([]grid.Vec3, len(pts))
			for i, p := range pts {
				qs[i], dirs[i] = p.Q, p.Dir
			}
			freqs := make([][]float64, len(pts))
			err = m.fc.Sweep(cmd.Context(), qs, dirs, workers, func(i int, f []float64) error {
				freqs[i] = convert(append([]float64(nil), f...), unit)
				return nil
			})
			if err != nil {
				return err
			}
			m.unit = unit
			if err := writeBands(cmd.OutOrStdout(), out, m, pts, freqs); err != nil {
				return err
			}
			if plotPath != "" {
				p, err := bandsFigure(bandSeries{Title: filepath.Base(args[0]), Points: pts, Freqs: freqs, Unit: unit})
				if err != nil {
					return err
				}
				if err := savePlot(cmd.OutOrStdout(), p, plotPath, format); err != nil {
					return fmt.Errorf("--plot %s: %w", plotPath, err)
				}
			}
			return nil
		},
	}
	mf.register(cmd.Flags())
	cmd.Flags().StringVar(&pathSpec, "path", "auto", `path: auto, or vertices "LABEL f1 f2 f3, ..." with '|' for breaks`)
	cmd.Flags().IntVar(&points, "points", 300, "total number of points along the path")
	cmd.Flags().StringVarP(&out, "output", "o", "", "output table (default: standard output); written only on success")
	cmd.Flags().StringVar(&plotPath, "plot", "", "also draw the dispersion to this file (.svg, .png or .pdf)")
	cmd.Flags().Var(&unit, "units", "frequency unit: thz, cm-1 or mev")
	cmd.Flags().IntVar(&workers, "workers", runtime.NumCPU(), "goroutines evaluating q-points")
	return cmd
}

// writeBands writes the band table (atomically when path is a file): distance, q, label and
// the frequencies of each path point, in m.unit.
func writeBands(stdout io.Writer, path string, m *loaded, pts []grid.PathPoint, freqs [][]float64) error {
	return withOutput(stdout, path, func(w io.Writer) error {
		t := formats.NewTable(w)
		if err := writeHeader(t, m, m.unit, "distance[1/Å]\tq1\tq2\tq3\tlabel"); err != nil {
			return err
		}
		for i, p := range pts {
			label := p.Label
			if label == "" {
				label = "-"
			}
			text := []string{formats.FormatFloat(p.Dist), formats.FormatFloat(p.Q[0]), formats.FormatFloat(p.Q[1]), formats.FormatFloat(p.Q[2]), label}
			if err := t.Row(text, freqs[i]); err != nil {
				return err
			}
		}
		return t.Flush()
	})
}
