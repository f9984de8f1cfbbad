package main

import (
	"fmt"
	"os"

	"github.com/spf13/pflag"

	"lamina/formats"
	"lamina/grid/units"
	"lamina/ifc"
)

// modelFlags are the options every command that builds a model shares.
type modelFlags struct {
	longRange ifc.LongRangeMode
	sumRules  ifc.SumRule
	lambda    float64
	keep      bool
}

func (m *modelFlags) register(fs *pflag.FlagSet) {
	fs.Var(&m.longRange, "long-range", "long-range dipole–dipole part: auto (2d kernel for sheets, 3d for bulk, when Born charges are present), off, 2d or 3d")
	fs.Var(&m.sumRules, "sum-rules", "acoustic sum-rule correction: translational or none")
	fs.BoolVar(&m.keep, "keep-charges", false, "use the Born charges as given instead of removing their mean (a residual total charge makes the acoustic branches go as √q)")
	fs.Float64Var(&m.lambda, "lambda", 0, "range-separation parameter Λ in 1/Å (0: chosen from the grid's supercell; see 'lamina info')")
}

// loaded is a grid file with the model built from it.
type loaded struct {
	path    string
	grid    *formats.Grid
	fc      *ifc.ForceConstants
	rep     ifc.Report
	sumRule ifc.SumRule
	keep    bool            // --keep-charges
	unit    units.Frequency // frequency unit of the tables written
}

// readGrid reads a grid or held-out file.
func readGrid(path string) (*formats.Grid, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	return formats.ReadGrid(f, path)
}

// loadModel reads the grid file at path and builds its interpolation model.
func loadModel(path string, m modelFlags) (*loaded, error) {
	if m.lambda < 0 {
		return nil, fmt.Errorf("--lambda %g: must be positive (or 0 for the default)", m.lambda)
	}
	g, err := readGrid(path)
	if err != nil {
		return nil, err
	}
	if g.Mesh == nil {
		return nil, fmt.Errorf("%s: no \"grid\" field: this is a held-out set, not a coarse grid", path)
	}
	fc, rep, err := ifc.NewModel(ifc.Input{
		Structure: g.Structure, Charges: g.Charges, Mesh: *g.Mesh, Phase: g.Phase, Samples: g.Samples,
	}, ifc.ModelOptions{LongRange: m.longRange, Lambda: m.lambda, SumRule: m.sumRules, KeepCharges: m.keep})
	if err != nil {
		return nil, fmt.Errorf("%s: %w", path, err)
	}
	return &loaded{path: path, grid: g, fc: fc, rep: rep, sumRule: m.sumRules, keep: m.keep}, nil
}
