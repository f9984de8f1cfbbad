package ifc_test

import (
	"fmt"
	"testing"

	"lamina/grid"
	"lamina/ifc"
	"lamina/ifc/exact"
)

// After warm-up, evaluating frequencies allocates nothing per q-point (STYLE: the eval loop
// runs over meshes of millions of points), with and without the long-range kernel.
func TestEvaluatorAllocs(t *testing.T) {
	m := exact.BuckledSheet()
	for _, mode := range []ifc.LongRangeMode{ifc.LongRangeAuto, ifc.LongRangeOff} {
		fc, _, err := ifc.NewModel(gridInput(m, grid.Mesh{N: [3]int{6, 6, 1}}), ifc.ModelOptions{LongRange: mode})
		if err != nil {
			t.Fatal(err)
		}
		ev := fc.NewEvaluator()
		dst := make([]float64, ev.Dim())
		vec := make([]complex128, ev.Dim()*ev.Dim())
		q := grid.Vec3{0.12, 0.31, 0}
		allocs := testing.AllocsPerRun(50, func() {
			if _, err := ev.Frequencies(dst, q, grid.Vec3{}); err != nil {
				t.Fatal(err)
			}
			if _, _, err := ev.Modes(dst, vec, q, grid.Vec3{}); err != nil {
				t.Fatal(err)
			}
		})
		if allocs != 0 {
			t.Errorf("long range %s: %v allocations per q-point, want 0", mode, allocs)
		}
	}
}

func benchmarkFrequencies(b *testing.B, m *exact.Model, mesh grid.Mesh, mode ifc.LongRangeMode) {
	fc, _, err := ifc.NewModel(gridInput(m, mesh), ifc.ModelOptions{LongRange: mode})
	if err != nil {
		b.Fatal(err)
	}
	ev := fc.NewEvaluator()
	dst := make([]float64, ev.Dim())
	q := grid.Vec3{0.12, 0.31, 0.07}
	if m.Structure.Lattice.Periodicity == grid.Sheet {
		q[2] = 0
	}
	b.ReportAllocs()
	for b.Loop() {
		if _, err := ev.Frequencies(dst, q, grid.Vec3{}); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkFrequencies times one q-point (Fourier sum, long-range kernel, eigenvalues) for
// the exact models on their test grids, with and without the long-range part.
func BenchmarkFrequencies(b *testing.B) {
	for _, c := range []struct {
		m    *exact.Model
		mesh grid.Mesh
	}{
		{exact.BuckledSheet(), grid.Mesh{N: [3]int{6, 6, 1}}},
		{exact.DipoleSheet(), grid.Mesh{N: [3]int{6, 6, 1}}},
		{exact.RockSalt(), grid.Mesh{N: [3]int{4, 4, 4}}},
		{exact.DipoleCrystal(), grid.Mesh{N: [3]int{4, 4, 4}}},
	} {
		for _, mode := range []ifc.LongRangeMode{ifc.LongRangeAuto, ifc.LongRangeOff} {
			b.Run(fmt.Sprintf("%s/%s", c.m.Name, mode), func(b *testing.B) { benchmarkFrequencies(b, c.m, c.mesh, mode) })
		}
	}
}
