package main

import (
	"errors"
	"fmt"
	"io"
	"math"
	"os"
	"runtime"

	"github.com/spf13/cobra"

	"lamina/formats"
	"lamina/grid"
	"lamina/grid/units"
	"lamina/ifc"
)

func newEvalCmd() *cobra.Command {
	var (
		mf      modelFlags
		qfile   string
		out     string
		unit    units.Frequency
		workers int
	)
	cmd := &cobra.Command{
		Use:   "eval INPUT --qpoints FILE",
		Short: "Frequencies at a list of q-points",
		Long: `Interpolate the grid file INPUT and print the phonon frequencies at every q-point of
FILE (three reduced coordinates per line; blank lines and lines starting with '#' are ignored).

Output is tab-separated: '#' header lines, then one line per q-point in input order:
q1 q2 q3 f_1 ... f_3N, frequencies ascending, imaginary modes as negative numbers.
At exactly q = 0 of a bulk polar crystal no direction is defined and the analytic
frequencies (without the macroscopic field) are printed.`,
		Example: `  lamina eval sheet.json.gz --qpoints path.txt --units cm-1 -o freqs.tsv`,
		Args:    cobra.ExactArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			if err := checkWorkers(workers); err != nil {
				return err
			}
			if err := checkNotInput(args[0], out); err != nil {
				return err
			}
			m, err := loadModel(args[0], mf)
			if err != nil {
				return err
			}
			qs, err := readQPoints(qfile)
			if err != nil {
				return err
			}
			sheet := m.grid.Structure.Lattice.Periodicity == grid.Sheet
			for i, q := range qs {
				if sheet && math.Abs(q[2]) > 1e-9 {
					return fmt.Errorf("%s: q-point %d (%v) has f3 = %g, but %s is a 2d sheet (only in-plane q exist)", qfile, i+1, q, q[2], args[0])
				}
				if err := checkReduced(q); err != nil {
					return fmt.Errorf("%s: q-point %d: %w", qfile, i+1, err)
				}
			}
			warn(cmd, m)
			return withOutput(cmd.OutOrStdout(), out, func(w io.Writer) error {
				t := formats.NewTable(w)
				if err := writeHeader(t, m, unit, "q1\tq2\tq3"); err != nil {
					return err
				}
				pr := newProgress(cmd.ErrOrStderr(), "eval", len(qs))
				err := m.fc.Sweep(cmd.Context(), qs, nil, workers, func(i int, f []float64) error {
					pr.step(i)
					return t.Row(nil, append(qs[i][:], convert(f, unit)...))
				})
				pr.done()
				if errors.Is(err, ifc.ErrNoConvergence) {
					return fmt.Errorf("%s, q-points of %s: %w (are the matrices sane? see 'lamina info')", args[0], qfile, err)
				}
				if err != nil {
					return err
				}
				return t.Flush()
			})
		},
	}
	mf.register(cmd.Flags())
	cmd.Flags().StringVar(&qfile, "qpoints", "", "file of q-points, three reduced coordinates per line (required)")
	cmd.Flags().StringVarP(&out, "output", "o", "", "output file (default: standard output); written only on success")
	cmd.Flags().Var(&unit, "units", "frequency unit: thz, cm-1 or mev")
	cmd.Flags().IntVar(&workers, "workers", runtime.NumCPU(), "goroutines evaluating q-points")
	_ = cmd.MarkFlagRequired("qpoints")
	return cmd
}

func readQPoints(path string) ([]grid.Vec3, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	return formats.ReadQPoints(f, path)
}

// convert returns the frequencies in THz converted to unit, in place.
func convert(f []float64, unit units.Frequency) []float64 {
	for i := range f {
		f[i] = unit.FromTHz(f[i])
	}
	return f
}
