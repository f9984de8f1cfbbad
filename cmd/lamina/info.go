package main

import (
	"fmt"
	"io"
	"math"
	"strings"
	"text/tabwriter"

	"github.com/spf13/cobra"

	"lamina/grid"
	"lamina/grid/units"
)

func newInfoCmd() *cobra.Command {
	var (
		mf   modelFlags
		unit units.Frequency
	)
	cmd := &cobra.Command{
		Use:   "info INPUT",
		Short: "Summary of a grid file and of the model built from it",
		Long: `Print the structure, periodicity, grid, Born charges and their neutrality error, the
dielectric data, the range-separation parameter Λ, what had to be removed to make the input
Hermitian and time-reversal symmetric, the imaginary part of the real-space force constants,
the acoustic sum-rule violation, and the frequencies at Γ (for a bulk polar crystal also the
LO frequencies for q along x, y and z).`,
		Example: `  lamina info sheet.json.gz`,
		Args:    cobra.ExactArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			m, err := loadModel(args[0], mf)
			if err != nil {
				return err
			}
			warn(cmd, m)
			tw := tabwriter.NewWriter(cmd.OutOrStdout(), 2, 4, 2, ' ', 0)
			if err := writeInfo(tw, m, unit); err != nil {
				return err
			}
			return tw.Flush()
		},
	}
	mf.register(cmd.Flags())
	cmd.Flags().Var(&unit, "units", "frequency unit: thz, cm-1 or mev")
	return cmd
}

func vec(v grid.Vec3) string { return fmt.Sprintf("%10.6f %10.6f %10.6f", v[0], v[1], v[2]) }

func writeInfo(w io.Writer, m *loaded, unit units.Frequency) error {
	g, s := m.grid, m.grid.Structure
	lat := s.Lattice
	p := func(format string, a ...any) { fmt.Fprintf(w, format+"\n", a...) }
	p("file\t%s", m.path)
	p("periodicity\t%s", lat.Periodicity)
	for i := 0; i < 3; i++ {
		p("a%d (Å)\t%s", i+1, vec(lat.A(i)))
	}
	if lat.Periodicity == grid.Sheet {
		p("area\t%.6g Å²", lat.Area())
		p("cell height c = Ω/A\t%.6g Å", lat.Height())
	} else {
		p("volume\t%.6g Å³", lat.Volume())
	}
	p("atoms\t%d", s.N())
	for k, a := range s.Atoms {
		p("  %d %s\tmass %.6g amu\tposition (Å) %s", k, a.Species, a.Mass, vec(a.Position))
	}
	p("grid\t%d×%d×%d, %d matrices, phase %q, units %s/%s", g.Mesh.N[0], g.Mesh.N[1], g.Mesh.N[2], len(g.Samples), g.Phase, g.Units.Length, g.Units.Energy)
	if m.rep.Charges != nil {
		var total grid.Mat3
		for _, z := range g.Charges.Z {
			total = total.Add(z)
		}
		worst := 0.0
		for a := 0; a < 3; a++ {
			for b := 0; b < 3; b++ {
				worst = math.Max(worst, math.Abs(total[a][b]))
			}
		}
		what := "the mean was removed"
		if m.keep {
			what = "kept: --keep-charges"
		}
		p("Born charges (e)\tneutrality error %.3g e (largest component of Σ Z; %s)", worst, what)
		for k, z := range g.Charges.Z {
			for a := 0; a < 3; a++ {
				lead := ""
				if a == 0 {
					lead = fmt.Sprintf("  %d %s", k, s.Atoms[k].Species)
				}
				p("%s\t%s", lead, vec(grid.Vec3(z[a])))
			}
		}
		for a := 0; a < 3; a++ {
			lead := ""
			if a == 0 {
				lead = "epsilon (high frequency)"
			}
			p("%s\t%s", lead, vec(grid.Vec3(g.Charges.Epsilon[a])))
		}
	} else {
		p("Born charges\tnone (no long-range part possible)")
	}
	if m.rep.Kernel == "none" {
		p("long range\tnone")
	} else {
		p("long range\t%s kernel, lambda = %.6g 1/Å", m.rep.Kernel, m.rep.Lambda)
	}
	if m.rep.Kernel == "2d" {
		r := m.rep.Screening
		p("in-plane screening 2πα∥ (Å)\t%.6g %.6g / %.6g %.6g (zero: unscreened), environment ε = %.4g", r[0][0], r[0][1], r[1][0], r[1][1], m.rep.EpsEnv)
	}
	d := m.fc.Diagnostics()
	p("largest |C(q)| of input\t%.4g eV/Å²", d.Scale)
	p("Hermiticity error removed\t%.3g eV/Å² (at grid point %v)", d.Hermiticity, g.Mesh.Point(d.HermiticityQ))
	p("C(-q) = C(q)* error removed\t%.3g eV/Å² (at grid point %v)", d.TimeReversal, g.Mesh.Point(d.TimeReversalQ))
	p("largest |Im Φ(R)|\t%.3g eV/Å² (atoms %d,%d, cell %v)", d.ImagPhi, d.ImagPhiAt.Atom, d.ImagPhiAt.Atom2, d.ImagPhiAt.Cell)
	p("acoustic sum-rule violation\t%.3g eV/Å² (before correction; correction: %s)", d.SumRule, m.sumRule)
	ev := m.fc.NewEvaluator()
	f, err := ev.Frequencies(nil, grid.Vec3{}, grid.Vec3{})
	if err != nil {
		return err
	}
	p("frequencies at Γ (%s)\t%s", unit.Label(), list(convert(f, unit)))
	if lat.Periodicity == grid.Bulk && m.rep.Kernel == "3d" {
		for a, name := range []string{"x", "y", "z"} {
			var dir grid.Vec3
			dir[a] = 1
			f, err := ev.Frequencies(nil, grid.Vec3{}, dir)
			if err != nil {
				return err
			}
			p("  q → 0 along %s (%s)\t%s", name, unit.Label(), list(convert(f, unit)))
		}
	}
	return nil
}

func list(f []float64) string {
	s := make([]string, len(f))
	for i, v := range f {
		s[i] = fmt.Sprintf("%.6f", v)
	}
	return strings.Join(s, " ")
}
