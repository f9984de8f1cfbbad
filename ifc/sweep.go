package ifc

import (
	"context"
	"fmt"
	"sync"

	"lamina/grid"
)

// sweepBlock is how many q-points a worker takes at a time; the context is checked once per block.
const sweepBlock = 64

// Sweep evaluates the frequencies (THz, ascending) at every reduced q-point of qs and calls emit
// with them in input order, whatever the worker count; dirs, when not nil, gives the Cartesian
// direction of approach for each point (used by the 3D long-range limit at Γ). workers ≤ 1 is
// serial. The slice passed to emit is reused after emit returns. Sweep stops at the first error
// of emit, of the eigensolver or of ctx.
func (fc *ForceConstants) Sweep(ctx context.Context, qs, dirs []grid.Vec3, workers int, emit func(i int, freq []float64) error) error {
	if dirs != nil && len(dirs) != len(qs) {
		panic("ifc: Sweep dirs and qs differ in length")
	}
	dir := func(i int) grid.Vec3 {
		if dirs == nil {
			return grid.Vec3{}
		}
		return dirs[i]
	}
	dim := 3 * fc.structure.N()
	if workers <= 1 {
		ev := fc.NewEvaluator()
		freq := make([]float64, dim)
		for i, q := range qs {
			if i%sweepBlock == 0 {
				if err := ctx.Err(); err != nil {
					return err
				}
			}
			if _, err := ev.Frequencies(freq, q, dir(i)); err != nil {
				return fmt.Errorf("q-point %d (counting from 0) %v: %w", i, q, err)
			}
			if err := emit(i, freq); err != nil {
				return err
			}
		}
		return nil
	}
	// Blocks are computed by the workers and emitted in order by this goroutine.
	nb := (len(qs) + sweepBlock - 1) / sweepBlock
	workers = min(workers, nb)
	type result struct {
		freq []float64
		err  error
	}
	results := make([]chan result, nb)
	for b := range results {
		results[b] = make(chan result, 1)
	}
	ctx, cancel := context.WithCancel(ctx)
	next := make(chan int)
	var wg sync.WaitGroup
	for w := 0; w < workers; w++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			ev := fc.NewEvaluator()
			for b := range next {
				lo, hi := b*sweepBlock, min((b+1)*sweepBlock, len(qs))
				out := make([]float64, (hi-lo)*dim)
				var err error
				for i := lo; i < hi && err == nil; i++ {
					if _, e := ev.Frequencies(out[(i-lo)*dim:(i-lo+1)*dim], qs[i], dir(i)); e != nil {
						err = fmt.Errorf("q-point %d (counting from 0) %v: %w", i, qs[i], e)
					}
				}
				results[b] <- result{out, err}
			}
		}()
	}
	// At most 2·workers blocks are in flight or waiting to be emitted, which bounds memory.
	tokens := make(chan struct{}, 2*workers)
	go func() {
		defer close(next)
		for b := 0; b < nb; b++ {
			select {
			case tokens <- struct{}{}:
			case <-ctx.Done():
				return
			}
			select {
			case next <- b:
			case <-ctx.Done():
				return
			}
		}
	}()
	defer func() { cancel(); wg.Wait() }()
	for b := 0; b < nb; b++ {
		var r result
		select {
		case r = <-results[b]:
		case <-ctx.Done():
			return ctx.Err()
		}
		if r.err != nil {
			return r.err
		}
		for i := b * sweepBlock; i < min((b+1)*sweepBlock, len(qs)); i++ {
			j := i - b*sweepBlock
			if err := emit(i, r.freq[j*dim:(j+1)*dim]); err != nil {
				return err
			}
		}
		<-tokens
	}
	return nil
}
