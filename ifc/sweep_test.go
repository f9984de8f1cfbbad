package ifc_test

import (
	"context"
	"errors"
	"math/rand/v2"
	"testing"

	"lamina/grid"
	"lamina/ifc"
	"lamina/ifc/exact"
)

// Sweep returns the same rows in input order whatever the worker count, and stops on the
// first error of emit or on a cancelled context.
func TestSweepOrderAndErrors(t *testing.T) {
	m := exact.BuckledSheet()
	fc, _, err := ifc.NewModel(gridInput(m, grid.Mesh{N: [3]int{6, 6, 1}}), ifc.ModelOptions{})
	if err != nil {
		t.Fatal(err)
	}
	rng := rand.New(rand.NewPCG(13, 14))
	qs := make([]grid.Vec3, 700) // more than ten blocks
	for i := range qs {
		qs[i] = grid.Vec3{rng.Float64(), rng.Float64(), 0}
	}
	collect := func(workers int) [][]float64 {
		out := make([][]float64, 0, len(qs))
		err := fc.Sweep(context.Background(), qs, nil, workers, func(i int, f []float64) error {
			if i != len(out) {
				t.Fatalf("workers %d: row %d emitted at position %d", workers, i, len(out))
			}
			out = append(out, append([]float64(nil), f...))
			return nil
		})
		if err != nil {
			t.Fatal(err)
		}
		return out
	}
	serial := collect(1)
	for _, w := range []int{2, 3, 8} {
		par := collect(w)
		for i := range serial {
			for j := range serial[i] {
				// Same arithmetic in every worker: results agree bit for bit.
				if par[i][j] != serial[i][j] {
					t.Fatalf("workers %d: row %d differs: %v vs %v", w, i, par[i], serial[i])
				}
			}
		}
	}
	stop := errors.New("stop")
	for _, w := range []int{1, 3} {
		n := 0
		err := fc.Sweep(context.Background(), qs, nil, w, func(i int, f []float64) error {
			n++
			if i == 100 {
				return stop
			}
			return nil
		})
		if !errors.Is(err, stop) || n != 101 {
			t.Errorf("workers %d: err = %v after %d rows, want stop after 101", w, err, n)
		}
		ctx, cancel := context.WithCancel(context.Background())
		cancel()
		if err := fc.Sweep(ctx, qs, nil, w, func(int, []float64) error { return nil }); !errors.Is(err, context.Canceled) {
			t.Errorf("workers %d: cancelled sweep returned %v", w, err)
		}
	}
}
