package main

import (
	"fmt"
	"os"
	"path/filepath"

	"github.com/spf13/cobra"
)

func newDemoCmd() *cobra.Command {
	var (
		dir     string
		points  int
		figures string
	)
	cmd := &cobra.Command{
		Use:   "demo [-o DIR]",
		Short: "Run the whole pipeline on built-in, exactly solvable model crystals",
		Long: `Generate coarse-grid files for built-in invented model crystals whose dynamical
matrix is known exactly (rigid ions or point dipoles with Coulomb interactions plus springs):
a buckled polar sheet on a 6×6 grid and two polar bulk crystals on 4×4×4 grids. Then
interpolate them, write band tables and figures to DIR, compare with the exact dispersion,
and draw, for the sheet, the exact bands near Γ beside the interpolations with the 2D kernel,
the 3D kernel and no long-range part.`,
		Example: `  lamina demo -o demo-out`,
		Args:    cobra.NoArgs,
		RunE: func(cmd *cobra.Command, args []string) error {
			if err := checkPoints(points); err != nil {
				return err
			}
			if points < 50 {
				return fmt.Errorf("--points %d: the demo's paths need at least 50", points)
			}
			if figures != "svg" && figures != "png" && figures != "pdf" {
				return fmt.Errorf("--figures %q: want svg, png or pdf", figures)
			}
			if err := os.MkdirAll(dir, 0o755); err != nil {
				return err
			}
			return runDemo(cmd, dir, points, figures)
		},
	}
	cmd.Flags().StringVarP(&dir, "output", "o", "lamina-demo", "directory for the generated grids, tables and figures")
	cmd.Flags().IntVar(&points, "points", 300, "points along each band path")
	cmd.Flags().StringVar(&figures, "figures", "svg", "figure format: svg, png or pdf")
	return cmd
}

// demoFile returns the path of the demo output name inside dir.
func demoFile(dir, name string) string { return filepath.Join(dir, name) }
