package exact

import (
	"testing"

	"lamina/grid"
)

// BenchmarkMatrix measures one C(q) per catalogue model at a generic q, dst reused.
func BenchmarkMatrix(b *testing.B) {
	for _, m := range allModels() {
		b.Run(m.Name, func(b *testing.B) {
			dst := make([]complex128, 9*m.Structure.N()*m.Structure.N())
			b.ReportAllocs()
			for b.Loop() {
				m.Matrix(dst, grid.Vec3{0.123, 0.277, 0.05}, grid.Vec3{})
			}
		})
	}
}

// BenchmarkFrequencies measures C(q) plus the embedded eigensolver.
func BenchmarkFrequencies(b *testing.B) {
	for _, m := range allModels() {
		b.Run(m.Name, func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				m.Frequencies(grid.Vec3{0.123, 0.277, 0.05}, grid.Vec3{})
			}
		})
	}
}

// BenchmarkNew measures building a model (Ewald caches, balancing, sum rule).
func BenchmarkNew(b *testing.B) {
	for _, c := range []struct {
		name string
		f    func() *Model
	}{{"sheet-AB", BuckledSheet}, {"sheet-ABC", DipoleSheet}, {"rocksalt-AB", RockSalt}, {"dipole-ABC", DipoleCrystal}} {
		b.Run(c.name, func(b *testing.B) {
			for b.Loop() {
				c.f()
			}
		})
	}
}
