package main

import (
	"fmt"
	"strings"

	"github.com/spf13/cobra"

	"lamina/formats"
	"lamina/grid/units"
)

// writeHeader writes the '#' lines shared by eval and bands: the input, the treatment, the
// units, and a last line naming the columns (first the given leading columns).
func writeHeader(t *formats.Table, m *loaded, unit units.Frequency, lead string) error {
	g := m.grid
	lr := "none"
	if m.rep.Kernel != "none" {
		lr = fmt.Sprintf("%s kernel, lambda = %.6g 1/Å", m.rep.Kernel, m.rep.Lambda)
	}
	n := 3 * g.Structure.N()
	cols := make([]string, n)
	for i := range cols {
		cols[i] = fmt.Sprintf("f%d[%s]", i+1, unit.Label())
	}
	lines := []string{
		fmt.Sprintf("lamina: %s (%s, %d atoms, %d×%d×%d grid)", m.path, g.Structure.Lattice.Periodicity, g.Structure.N(), g.Mesh.N[0], g.Mesh.N[1], g.Mesh.N[2]),
		"long-range: " + lr,
		fmt.Sprintf("q1 q2 q3: reduced coordinates; frequencies in %s, ascending; imaginary modes are negative", unit.Label()),
		lead + "\t" + strings.Join(cols, "\t"),
	}
	for _, l := range lines {
		if err := t.Comment(l); err != nil {
			return err
		}
	}
	return nil
}

// warn prints the model's warnings to stderr.
func warn(cmd *cobra.Command, m *loaded) {
	for _, w := range m.rep.Warnings {
		fmt.Fprintf(cmd.ErrOrStderr(), "lamina: warning: %s: %s\n", m.path, w)
	}
}
